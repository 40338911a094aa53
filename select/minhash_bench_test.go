package selection

import (
	"math/rand/v2"
	"slices"
	"testing"

	"github.com/james-bowman/sparse"
)

// BenchmarkMinHash signs a document of 250 shingles, about the median
// length of the generated benchmark corpus after stop words (bench/gen);
// the bytes are the 8-byte shingle hashes.
func BenchmarkMinHash(b *testing.B) {
	rng := rand.New(rand.NewPCG(1, 2))
	items := make([]uint64, 250)
	for i := range items {
		items[i] = rng.Uint64()
	}
	dst := make([]uint32, MinHashes)
	b.SetBytes(int64(8 * len(items)))
	b.ReportAllocs()
	for b.Loop() {
		MinHash(dst, items, 7)
	}
}

// BenchmarkSignDocument signs a document of 252 term hashes (250
// shingles) the two ways: by building its shingles and then hashing them,
// and by MinHashTerms, which hashes each shingle as it is formed. The
// bytes are the 8-byte term hashes.
func BenchmarkSignDocument(b *testing.B) {
	rng := rand.New(rand.NewPCG(3, 4))
	terms := make([]uint64, 252)
	for i := range terms {
		terms[i] = rng.Uint64N(400) // a few repeats, as in a real text
	}
	dst := make([]uint32, MinHashes)
	b.Run("shingles-then-minhash", func(b *testing.B) {
		b.SetBytes(int64(8 * len(terms)))
		b.ReportAllocs()
		for b.Loop() {
			MinHash(dst, Shingles(terms), 7)
		}
	})
	b.Run("minhash-terms", func(b *testing.B) {
		b.SetBytes(int64(8 * len(terms)))
		b.ReportAllocs()
		for b.Loop() {
			MinHashTerms(dst, terms, 7)
		}
	})
}

// BenchmarkNearDuplicates runs the near-copy search over 200,000 rows of
// 20 terms each with signatures of 300 random shingles, 1% of the rows
// planted as copies of others (so a few buckets hold pairs): the
// bucketing is most of the cost, as on a real corpus with few copies.
func BenchmarkNearDuplicates(b *testing.B) {
	rng := rand.New(rand.NewPCG(3, 4))
	const m, n, perRow = 200000, 50000, 20
	ia := make([]int, 1, m+1)
	var ja []int
	var data []float64
	sig := make([]uint32, m*MinHashes)
	items := make([]uint64, 300)
	for i := range m {
		if i > 0 && i%100 == 0 {
			src := rng.IntN(i)
			ja = append(ja, ja[ia[src]:ia[src+1]]...)
			data = append(data, data[ia[src]:ia[src+1]]...)
			copy(sig[i*MinHashes:(i+1)*MinHashes], sig[src*MinHashes:(src+1)*MinHashes])
		} else {
			cols := map[int]bool{}
			for len(cols) < perRow {
				cols[rng.IntN(n)] = true
			}
			start := len(ja)
			for c := range cols {
				ja = append(ja, c)
			}
			slices.Sort(ja[start:])
			for range ja[start:] {
				data = append(data, 1+rng.Float64())
			}
			for k := range items {
				items[k] = rng.Uint64()
			}
			MinHash(sig[i*MinHashes:(i+1)*MinHashes], items, 7)
		}
		ia = append(ia, len(ja))
	}
	a := sparse.NewCSR(m, n, ia, ja, data)
	b.SetBytes(int64(4 * len(sig)))
	b.ReportAllocs()
	for b.Loop() {
		if c := NearDuplicates(a, sig, 0.9); len(c) < m/200 {
			b.Fatalf("%d clusters, want at least %d", len(c), m/200)
		}
	}
}
