package textproc_test

import (
	"io/fs"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"sync"
	"testing"

	"assay/textproc"
)

// pseudoFunctionWords are real English function words, every one on the
// English stop list; all other words of pseudoCorpus are made up.
var pseudoFunctionWords = strings.Fields(`the of and to a in is that for it as was with be by on not
he this are or his from at which but have an they you were her she there been has their we if`)

// pseudoCorpus returns n invented documents in the shape of bench/gen's
// corpus, smaller: a vocabulary of 20,000 pronounceable pseudo-words
// (syllables glued together) of which half have an "-s", "-ed" or "-ing"
// variant, drawn with a Zipf law (math/rand/v2 Zipf, s = 1.1, v = 2); 40%
// function words; 1.5% numbers; 0.3% fresh words never seen before; a
// capital at the start of each sentence; lengths log-normal with median
// 250 words (σ = 0.9). The seed fixes everything, so each run sees the
// same text.
func pseudoCorpus(n int, seed uint64) []string {
	r := rand.New(rand.NewPCG(seed, 2))
	syl := func() string {
		const on, vo, co = "bcdfghklmnprstvwz", "aeiou", "nrlstm"
		b := []byte{on[r.IntN(len(on))], vo[r.IntN(len(vo))]}
		if r.IntN(3) == 0 {
			b = append(b, co[r.IntN(len(co))])
		}
		return string(b)
	}
	word := func(k int) string {
		var b strings.Builder
		for range k {
			b.WriteString(syl())
		}
		return b.String()
	}
	const vocab = 20000
	lemmas := make([][]string, vocab)
	for i := range lemmas {
		w := word(1 + min(i/500, 1) + r.IntN(2))
		lemmas[i] = []string{w}
		if r.IntN(2) == 0 {
			lemmas[i] = append(lemmas[i], w+[]string{"s", "ed", "ing"}[r.IntN(3)])
		}
	}
	z := rand.NewZipf(r, 1.1, 2, vocab-1)
	docs := make([]string, n)
	var b strings.Builder
	for d := range docs {
		b.Reset()
		words := min(max(int(math.Exp(math.Log(250)+0.9*r.NormFloat64())), 20), 20000)
		for k := range words {
			var w string
			switch u := r.Float64(); {
			case u < 0.40:
				w = pseudoFunctionWords[r.IntN(len(pseudoFunctionWords))]
			case u < 0.415:
				w = string(rune('0'+r.IntN(10))) + string(rune('0'+r.IntN(10)))
			case u < 0.418:
				w = word(3)
			default:
				l := lemmas[z.Uint64()]
				w = l[r.IntN(len(l))]
			}
			if k%12 == 0 {
				b.WriteString(strings.ToUpper(w[:1]) + w[1:])
			} else {
				b.WriteString(w)
			}
			switch {
			case k%12 == 11:
				b.WriteString(". ")
			case r.IntN(12) == 0:
				b.WriteString(", ")
			default:
				b.WriteByte(' ')
			}
		}
		docs[d] = b.String()
	}
	return docs
}

func corpusBytes(docs []string) int64 {
	n := 0
	for _, d := range docs {
		n += len(d)
	}
	return int64(n)
}

// BenchmarkAnalyzeCorpus measures Analyze over 2,000 invented documents
// with a large Zipfian vocabulary (pseudoCorpus), as one ingest worker
// sees a corpus: "memo=cold" starts each pass with a new Analyzer, so
// the memo fills as it goes (a run over a fresh corpus); "memo=warm"
// reuses one Analyzer across passes (the steady state of a long run);
// "memo=off" analyses and stems every token afresh (Options.NoMemo). The
// language is fixed to English or detected per document (auto), with
// stemming on or off. "api=ids" runs AnalyzeIDs instead of Analyze, with
// terms numbered by a mutex-guarded map as an ingest's shared vocabulary
// numbers them.
func BenchmarkAnalyzeCorpus(b *testing.B) {
	docs := pseudoCorpus(2000, 1)
	b.Run("api=ids", func(b *testing.B) {
		for _, memo := range []string{"cold", "warm"} {
			b.Run("lang=english/stem=on/memo="+memo, func(b *testing.B) {
				var mu sync.Mutex
				vocab := map[string]int32{}
				termID := func(t string) int32 {
					mu.Lock()
					defer mu.Unlock()
					id, ok := vocab[t]
					if !ok {
						id = int32(len(vocab))
						vocab[t] = id
					}
					return id
				}
				opts := textproc.Options{Lang: textproc.English, TermID: termID}
				a := textproc.NewAnalyzer(opts)
				var ids []int32
				n := 0
				b.SetBytes(corpusBytes(docs))
				b.ReportAllocs()
				for b.Loop() {
					if memo == "cold" {
						a = textproc.NewAnalyzer(opts)
					}
					for _, d := range docs {
						ids, _ = a.AnalyzeIDs(d, ids[:0])
						n += len(ids)
					}
				}
				if n == 0 {
					b.Fatal("no terms")
				}
			})
		}
	})
	for _, lang := range []textproc.Language{textproc.English, textproc.Auto} {
		for _, noStem := range []bool{false, true} {
			for _, memo := range []string{"cold", "warm", "off"} {
				if memo == "off" && noStem {
					continue
				}
				stem := "on"
				if noStem {
					stem = "off"
				}
				b.Run("lang="+string(lang)+"/stem="+stem+"/memo="+memo, func(b *testing.B) {
					opts := textproc.Options{Lang: lang, NoStem: noStem, NoMemo: memo == "off"}
					a := textproc.NewAnalyzer(opts)
					n := 0
					emit := func(_, _ string) { n++ }
					b.SetBytes(corpusBytes(docs))
					b.ReportAllocs()
					for b.Loop() {
						if memo == "cold" {
							a = textproc.NewAnalyzer(opts)
						}
						for _, d := range docs {
							a.Analyze(d, emit)
						}
					}
					if n == 0 {
						b.Fatal("no terms")
					}
				})
			}
		}
	}
}

// BenchmarkAnalyzeFolder runs AnalyzeIDs (stemming on; the language fixed
// to English, and detected per document) over the first 40,000 files, in
// byte order of their paths, of the folder that ASSAY_ANALYZE_DIR names,
// with a memo warmed by one pass over them: one ingest worker's steady
// state on a real corpus, say bench/gen's or SpamAssassin's
// (bench/README.md). It is skipped when the variable is unset. MB/s is of
// the files' bytes.
func BenchmarkAnalyzeFolder(b *testing.B) {
	root := os.Getenv("ASSAY_ANALYZE_DIR")
	if root == "" {
		b.Skip("ASSAY_ANALYZE_DIR is not set")
	}
	var files []string
	err := filepath.WalkDir(root, func(p string, d fs.DirEntry, err error) error {
		if err == nil && d.Type().IsRegular() {
			files = append(files, p)
		}
		return err
	})
	if err != nil {
		b.Fatal(err)
	}
	slices.Sort(files)
	var docs []string
	for _, f := range files[:min(len(files), 40000)] {
		text, err := os.ReadFile(f)
		if err != nil {
			b.Fatal(err)
		}
		docs = append(docs, string(text))
	}
	for _, lang := range []textproc.Language{textproc.English, textproc.Auto} {
		b.Run("lang="+string(lang), func(b *testing.B) {
			vocab := map[string]int32{}
			a := textproc.NewAnalyzer(textproc.Options{Lang: lang, TermID: func(t string) int32 {
				id, ok := vocab[t]
				if !ok {
					id = int32(len(vocab))
					vocab[t] = id
				}
				return id
			}})
			var ids []int32
			for _, d := range docs {
				ids, _ = a.AnalyzeIDs(d, ids[:0])
			}
			b.SetBytes(corpusBytes(docs))
			b.ReportAllocs()
			for b.Loop() {
				for _, d := range docs {
					ids, _ = a.AnalyzeIDs(d, ids[:0])
				}
			}
		})
	}
}
