package sparsemat

import (
	"fmt"
	"math/rand/v2"
	"slices"
	"sync"
	"testing"
)

// benchRows returns m documents as term-count maps over a Zipfian
// vocabulary of n terms (math/rand/v2 Zipf, s = 1.1, v = 2), each built
// from tokens draws (about 150 distinct terms a row at 220 draws), with a
// fixed seed, and the term strings.
func benchRows(m, n, tokens int) ([]map[string]int, []string) {
	r := rand.New(rand.NewPCG(5, 5))
	z := rand.NewZipf(r, 1.1, 2, uint64(n-1))
	terms := make([]string, n)
	for j := range terms {
		terms[j] = fmt.Sprintf("t%x", j*2654435761%(1<<32)) // not in rank order
	}
	rows := make([]map[string]int, m)
	for i := range rows {
		row := map[string]int{}
		for range tokens {
			row[terms[z.Uint64()]]++
		}
		rows[i] = row
	}
	return rows, terms
}

const benchM, benchN, benchTokens = 20000, 100000, 220

// BenchmarkBuild adds 20,000 rows of about 150 distinct terms each (a
// vocabulary of 100,000) to a Builder and builds the pruned count matrix
// (min-df 2, max-df 0.5): the work of the goroutine that owns the builder
// during an ingest. "api=map" adds each row as a term → count map (AddRow);
// "api=counted" as the Row a RowCounter made in an ingest worker
// (AddCounted; the vocabulary is filled first, as the workers would).
// MB/s is of the entries added, at 8 bytes each (an int32 term ID and an
// int32 count).
func BenchmarkBuild(b *testing.B) {
	maps, terms := benchRows(benchM, benchN, benchTokens)
	nnz := 0
	for _, r := range maps {
		nnz += len(r)
	}
	name := fmt.Sprintf("docs=%d/terms=%d/nnz=%d", benchM, benchN, nnz/benchM)
	b.Run(name+"/api=map", func(b *testing.B) {
		b.SetBytes(int64(8 * nnz))
		b.ReportAllocs()
		for b.Loop() {
			var bl Builder
			for _, r := range maps {
				bl.AddRow(r)
			}
			if _, err := bl.Build(Pruning{MinDF: 2, MaxDFShare: 0.5}); err != nil {
				b.Fatal(err)
			}
		}
	})
	b.Run(name+"/api=counted", func(b *testing.B) {
		var v Vocabulary
		for _, t := range terms {
			v.ID(t)
		}
		var rc RowCounter
		rows := make([]Row, len(maps))
		for i, r := range maps {
			for t, c := range r {
				for range c {
					rc.Add(v.ID(t))
				}
			}
			rows[i] = rc.Row()
		}
		b.SetBytes(int64(8 * nnz))
		b.ReportAllocs()
		for b.Loop() {
			var bl Builder
			for _, t := range terms {
				bl.Vocabulary().ID(t)
			}
			for _, r := range rows {
				bl.AddCounted(r)
			}
			if _, err := bl.Build(Pruning{MinDF: 2, MaxDFShare: 0.5}); err != nil {
				b.Fatal(err)
			}
		}
	})
}

// BenchmarkBuildPrune is the Build step alone on the same rows.
func BenchmarkBuildPrune(b *testing.B) { benchBuild(b, Pruning{MinDF: 2, MaxDFShare: 0.5}) }

// BenchmarkBuildPruneFew is BenchmarkBuildPrune with min-df 2 alone, which
// drops about 1% of the entries (the terms of a single row), as on the
// generated and SpamAssassin corpora (5.5% and 11.7%): the one-pass fill.
func BenchmarkBuildPruneFew(b *testing.B) { benchBuild(b, Pruning{MinDF: 2}) }

// benchBuild times Build with pruning p on the rows of BenchmarkBuild.
func benchBuild(b *testing.B, p Pruning) {
	maps, _ := benchRows(benchM, benchN, benchTokens)
	var bl Builder
	nnz := 0
	for _, r := range maps {
		bl.AddRow(r)
		nnz += len(r)
	}
	b.SetBytes(int64(8 * nnz))
	b.ReportAllocs()
	for b.Loop() {
		if _, err := bl.Build(p); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkRowCounter is the worker's side of AddCounted: counting a
// document's term IDs (220 draws, about 150 distinct) and encoding the
// row. MB/s is of the IDs counted, at 4 bytes each. "counter=builder" is
// a counter from Builder.NewRowCounter, which also counts the document
// frequencies, as an ingest worker's does; "counter=zero" the zero
// RowCounter.
func BenchmarkRowCounter(b *testing.B) {
	r := rand.New(rand.NewPCG(5, 6))
	z := rand.NewZipf(r, 1.1, 2, benchN-1)
	docs := make([][]int32, 1000)
	n := 0
	for i := range docs {
		for range benchTokens {
			docs[i] = append(docs[i], int32(z.Uint64()))
		}
		n += len(docs[i])
	}
	run := func(b *testing.B, rc *RowCounter) {
		b.SetBytes(int64(4 * n))
		b.ReportAllocs()
		for b.Loop() {
			for _, d := range docs {
				rc.AddAll(d)
				rc.Row()
			}
		}
	}
	b.Run("counter=zero", func(b *testing.B) { run(b, &RowCounter{}) })
	b.Run("counter=builder", func(b *testing.B) {
		var bl Builder
		run(b, bl.NewRowCounter())
	})
}

// BenchmarkWeight weights the pruned count matrix of BenchmarkBuild with
// the default weighting (log tf, smooth idf, L2 rows). MB/s is of the
// non-zeros, at 8 bytes each.
func BenchmarkWeight(b *testing.B) {
	maps, _ := benchRows(benchM, benchN, benchTokens)
	var bl Builder
	for _, r := range maps {
		bl.AddRow(r)
	}
	c, err := bl.Build(Pruning{MinDF: 2, MaxDFShare: 0.5})
	if err != nil {
		b.Fatal(err)
	}
	b.SetBytes(int64(8 * c.Matrix.NNZ()))
	for b.Loop() {
		Weight(c, DefaultWeighting)
	}
}

// BenchmarkVocabularyID numbers 100,000 distinct terms in a new Vocabulary
// from two goroutines at once, each asking for every term in its own
// order, as two ingest workers do when they meet a corpus's terms: half
// the calls add a term, half find one the other goroutine added. ns/op is
// per call.
func BenchmarkVocabularyID(b *testing.B) {
	_, terms := benchRows(1, benchN, 1)
	orders := [2][]string{slices.Clone(terms), slices.Clone(terms)}
	rand.New(rand.NewPCG(1, 2)).Shuffle(len(terms), func(i, j int) { orders[1][i], orders[1][j] = orders[1][j], orders[1][i] })
	b.ResetTimer()
	for i := 0; i < b.N; i += 2 * len(terms) {
		var v Vocabulary
		var wg sync.WaitGroup
		for _, order := range orders {
			wg.Go(func() {
				for _, t := range order {
					v.ID(t)
				}
			})
		}
		wg.Wait()
	}
}
