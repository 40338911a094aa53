// Command gen writes a synthetic corpus of plain-text documents for ingest
// benchmarks:
//
//	go run ./bench/gen -n 100000 -out DIR [-seed 1] [-per 1000]
//
// Every word of the text comes from a generated vocabulary of pronounceable
// pseudo-words (syllables glued together), never from real text; the only
// real words are a short list of function words, each of them on assay's
// English stop list (checked at start-up with textproc.IsEnglishStopWord),
// so that stop-word removal and language detection do the work they do on
// real English.
//
// # The model
//
//   - Vocabulary: -vocab (50,000) distinct lemmas of one to three syllables;
//     the more frequent a lemma, the shorter it tends to be. A lemma has
//     inflected variants so that stemming matters: "-s" (half of the
//     lemmas), "-ed" (30%), "-ing" (30%), "-ion" (15%). A draw of a lemma
//     gives its bare form with probability 0.55, otherwise one of its
//     variants, uniformly. With the variants the vocabulary holds about
//     110,000 surface forms.
//
//   - Frequencies: lemma ranks follow a Zipf law, P(rank r) ∝ 1/r, over the
//     whole vocabulary ("background" words).
//
//   - Topics: -topics (200) lists of 400 lemmas each, drawn uniformly from
//     ranks 200 and above; each document takes one to three topics, and a
//     quarter of its words come from them (Zipf, P(r) ∝ 1/r, within a
//     list). This gives the matrix the low-rank structure that picking
//     exemplars looks for.
//
//   - Word mix: 40% function words (Zipf, P(r) ∝ 1/r^0.9, over the list
//     below), 25% topic words, 1.5% numbers (one to four digits), 0.3%
//     fresh words made up on the spot (names and typos: the long tail of a
//     real vocabulary), the rest background words.
//
//   - Document length in words: log-normal, exp(μ + σ·Z) with μ = ln 250
//     and σ = 0.9 (median 250 words, mean about 375), cut to [20, 20000].
//
//   - Layout: a title line of three to eight capitalised topic words, a
//     blank line, then paragraphs of three to seven sentences of 6 to 25
//     words; the first word of a sentence is capitalised, 8% of the other
//     words are followed by a comma, a sentence ends with a full stop.
//     Lines are not wrapped: one paragraph, one line.
//
//   - Files: DIR/<folder>/<doc>.txt with -per (1,000) files a folder, the
//     folder and file numbers zero-padded: 000/000000.txt, 000/000001.txt,
//     …, 001/001000.txt.
//
//   - Near-copies (-near F, default 0): each document after the first is,
//     with probability F, a near-copy of one of the 1,000 before it (the
//     text that document has without -near, each word replaced by a
//     background word with probability 0.03, one line added at the end),
//     for benchmarking the near-copy search. With F = 0 the corpus is
//     what it always was.
//
// # Determinism
//
// The vocabulary and the topics come from a PCG stream seeded with -seed;
// document i from its own PCG stream seeded with (-seed, i). The files are
// written by several goroutines, but each file depends only on the seed
// and its number, so the same flags give byte-identical corpora on any
// machine and for any GOMAXPROCS. Any existing files of the same names are
// overwritten; other files in DIR are left alone.
package main

import (
	"flag"
	"fmt"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"runtime"
	"sort"
	"sync"
	"sync/atomic"
	"time"

	"assay/textproc"
)

// The parameters of the model (see the package documentation).
const (
	topicSize    = 400
	topicMinRank = 200
	shareStop    = 0.40
	shareTopic   = 0.25
	shareNumber  = 0.015
	shareFresh   = 0.003
	bareForm     = 0.55
	lenMu        = 5.521460917862246 // ln 250
	lenSigma     = 0.9
	minWords     = 20
	maxWords     = 20000
	commaShare   = 0.08
)

// functionWords are the real words of the text, in a rough order of
// frequency; every one is on textproc's English stop list.
var functionWords = []string{
	"the", "of", "and", "to", "a", "in", "is", "that", "for", "it", "as",
	"was", "with", "be", "by", "on", "not", "he", "this", "are", "or",
	"his", "from", "at", "which", "but", "have", "an", "they", "you",
	"were", "her", "she", "there", "been", "has", "their", "we", "if",
	"would", "all", "will", "so", "no", "when", "who", "more", "can",
	"than", "its", "into", "only", "other", "some", "these", "could",
	"them", "then", "what", "about", "should", "through", "those", "after",
	"any", "most", "very", "such", "our", "each", "between", "before",
	"under", "over", "again", "while", "because", "both", "same", "own",
}

var (
	onsets = []string{"b", "c", "d", "f", "g", "h", "j", "k", "l", "m", "n", "p", "r", "s", "t", "v", "w", "z",
		"br", "cl", "dr", "fr", "gr", "pl", "st", "tr", "sh", "ch", "th", "sk", "bl", "qu", ""}
	vowels = []string{"a", "e", "i", "o", "u", "a", "e", "i", "o", "ai", "ea", "ou", "y"}
	codas  = []string{"", "", "", "", "n", "r", "l", "s", "t", "m", "k", "nd", "st", "rn", "x"}
)

// lemma is one entry of the vocabulary: its bare form and its variants.
type lemma struct {
	forms []string // forms[0] is the bare form
}

// model is everything fixed by the seed before the documents are drawn.
type model struct {
	lemmas    []lemma
	bgCDF     []float64 // Zipf over the lemmas
	topics    [][]int32 // lemma indices
	topicCDF  []float64 // Zipf over a topic list
	stopCDF   []float64 // over functionWords
	seed      uint64
	perFolder int
	nameWidth int     // digits of a file number
	dirWidth  int     // digits of a folder number
	near      float64 // -near
}

// zipfCDF returns the cumulative distribution of P(r) ∝ 1/r^s, r = 1 … n.
func zipfCDF(n int, s float64) []float64 {
	cdf := make([]float64, n)
	sum := 0.0
	for r := range n {
		sum += math.Pow(float64(r+1), -s)
		cdf[r] = sum
	}
	for r := range cdf {
		cdf[r] /= sum
	}
	cdf[n-1] = 1
	return cdf
}

// draw returns an index from cdf.
func draw(rng *rand.Rand, cdf []float64) int {
	u := rng.Float64()
	return min(sort.SearchFloat64s(cdf, u), len(cdf)-1)
}

// pseudoWord returns a word of syl syllables.
func pseudoWord(rng *rand.Rand, syl int) string {
	var b []byte
	for i := range syl {
		b = append(b, onsets[rng.IntN(len(onsets))]...)
		b = append(b, vowels[rng.IntN(len(vowels))]...)
		if i == syl-1 || rng.IntN(3) == 0 {
			b = append(b, codas[rng.IntN(len(codas))]...)
		}
	}
	return string(b)
}

// syllables returns the syllable count of the lemma of Zipf rank r (from
// 0): frequent words are short.
func syllables(rng *rand.Rand, r int) int {
	switch {
	case r < 300:
		return 1 + rng.IntN(2)
	case r < 5000:
		return 2
	default:
		return 2 + rng.IntN(2)
	}
}

// inflect returns the variant of w with suffix suf, with the spelling
// rules of English regular inflection that the stemmer undoes.
func inflect(w, suf string) string {
	last := w[len(w)-1]
	switch suf {
	case "s":
		if last == 's' || last == 'x' {
			return w + "es"
		}
	case "ed":
		if last == 'e' {
			return w + "d"
		}
	case "ing", "ion":
		if last == 'e' && len(w) > 3 {
			return w[:len(w)-1] + suf
		}
	}
	return w + suf
}

func newModel(vocab, topics int, seed uint64) *model {
	rng := rand.New(rand.NewPCG(seed, 0x766f636162756c61)) // "vocabula"
	for _, w := range functionWords {
		if !textproc.IsEnglishStopWord(w) {
			panic("gen: " + w + " is not on the English stop list")
		}
	}
	seen := map[string]bool{}
	for _, w := range functionWords {
		seen[w] = true
	}
	m := &model{seed: seed}
	for r := 0; len(m.lemmas) < vocab; r++ {
		w := pseudoWord(rng, syllables(rng, len(m.lemmas)))
		if len(w) < 2 || seen[w] || textproc.IsEnglishStopWord(w) {
			continue
		}
		l := lemma{forms: []string{w}}
		for _, v := range []struct {
			suf string
			p   float64
		}{{"s", 0.5}, {"ed", 0.3}, {"ing", 0.3}, {"ion", 0.15}} {
			if rng.Float64() < v.p {
				if f := inflect(w, v.suf); !seen[f] {
					l.forms = append(l.forms, f)
				}
			}
		}
		for _, f := range l.forms {
			seen[f] = true
		}
		m.lemmas = append(m.lemmas, l)
	}
	m.bgCDF = zipfCDF(vocab, 1.0)
	m.topicCDF = zipfCDF(topicSize, 1.0)
	m.stopCDF = zipfCDF(len(functionWords), 0.9)
	for range topics {
		t := make([]int32, topicSize)
		for i := range t {
			t[i] = int32(topicMinRank + rng.IntN(vocab-topicMinRank))
		}
		m.topics = append(m.topics, t)
	}
	return m
}

// form returns a surface form of lemma i.
func (m *model) form(rng *rand.Rand, i int) string {
	f := m.lemmas[i].forms
	if len(f) == 1 || rng.Float64() < bareForm {
		return f[0]
	}
	return f[1+rng.IntN(len(f)-1)]
}

// appendTitle appends w with its first letter in upper case.
func appendTitle(b []byte, w string) []byte {
	b = append(b, w...)
	if c := b[len(b)-len(w)]; 'a' <= c && c <= 'z' {
		b[len(b)-len(w)] = c - 'a' + 'A'
	}
	return b
}

// document returns the text of document i.
func (m *model) document(i int, b []byte) []byte {
	rng := rand.New(rand.NewPCG(m.seed, uint64(i)))
	n := int(math.Round(math.Exp(lenMu + lenSigma*rng.NormFloat64())))
	n = min(max(n, minWords), maxWords)
	var topics [3][]int32
	nt := 1 + rng.IntN(3)
	for t := range nt {
		topics[t] = m.topics[rng.IntN(len(m.topics))]
	}
	topicWord := func() string {
		t := topics[rng.IntN(nt)]
		return m.form(rng, int(t[draw(rng, m.topicCDF)]))
	}
	// The title.
	for k := range 3 + rng.IntN(6) {
		if k > 0 {
			b = append(b, ' ')
		}
		b = appendTitle(b, topicWord())
	}
	b = append(b, "\n\n"...)
	var num [4]byte
	for n > 0 {
		sentences := 3 + rng.IntN(5)
		for s := 0; s < sentences && n > 0; s++ {
			words := min(6+rng.IntN(20), n)
			n -= words
			for k := range words {
				var w string
				u := rng.Float64()
				switch {
				case u < shareStop:
					w = functionWords[draw(rng, m.stopCDF)]
				case u < shareStop+shareTopic:
					w = topicWord()
				case u < shareStop+shareTopic+shareNumber:
					d := 1 + rng.IntN(4)
					for j := range d {
						num[j] = byte('0' + rng.IntN(10))
					}
					w = string(num[:d])
				case u < shareStop+shareTopic+shareNumber+shareFresh:
					w = pseudoWord(rng, 2+rng.IntN(3))
				default:
					w = m.form(rng, draw(rng, m.bgCDF))
				}
				if k == 0 {
					b = appendTitle(b, w)
				} else {
					b = append(b, w...)
				}
				switch {
				case k == words-1:
					b = append(b, '.')
				case rng.Float64() < commaShare:
					b = append(b, ',')
				}
				if k < words-1 {
					b = append(b, ' ')
				}
			}
			if s < sentences-1 && n > 0 {
				b = append(b, ' ')
			}
		}
		b = append(b, '\n')
		if n > 0 {
			b = append(b, '\n')
		}
	}
	return b
}

// nearCopyOf returns, when document i is to be a near-copy (-near), the
// earlier document it copies; else -1. The choice comes from a stream of
// its own, so -near 0 gives the corpus it always gave.
func (m *model) nearCopyOf(i int) int {
	if m.near <= 0 || i == 0 {
		return -1
	}
	rng := rand.New(rand.NewPCG(m.seed^0x6e656172, uint64(i)))
	if rng.Float64() >= m.near {
		return -1
	}
	return max(0, i-1000) + rng.IntN(min(i, 1000))
}

// nearCopy writes into b document j's text with small edits, for
// document i: each word is replaced by a background word with
// probability 0.03, and one line is added at the end.
func (m *model) nearCopy(i, j int, b []byte) []byte {
	src := m.document(j, nil)
	rng := rand.New(rand.NewPCG(m.seed^0x65646974, uint64(i)))
	start := 0
	for k := 0; k <= len(src); k++ {
		if k < len(src) && src[k] != ' ' && src[k] != '\n' {
			continue
		}
		if k > start && rng.Float64() < 0.03 {
			b = append(b, m.form(rng, draw(rng, m.bgCDF))...)
		} else {
			b = append(b, src[start:k]...)
		}
		if k < len(src) {
			b = append(b, src[k])
		}
		start = k + 1
	}
	return fmt.Appendf(b, "\nCopy %d of note %d.\n", i, j)
}

// path returns the slash-free relative path of document i.
func (m *model) path(i int) string {
	return filepath.Join(fmt.Sprintf("%0*d", m.dirWidth, i/m.perFolder), fmt.Sprintf("%0*d.txt", m.nameWidth, i))
}

func digits(n int) int {
	d := 1
	for ; n >= 10; n /= 10 {
		d++
	}
	return d
}

func main() {
	n := flag.Int("n", 10000, "number of documents")
	out := flag.String("out", "", "folder to write the corpus into (created if missing)")
	seed := flag.Uint64("seed", 1, "random seed; the same seed gives the same corpus")
	per := flag.Int("per", 1000, "files per folder")
	vocab := flag.Int("vocab", 50000, "lemmas in the vocabulary")
	topics := flag.Int("topics", 200, "topics")
	near := flag.Float64("near", 0, "share of documents that are near-copies of one of the 1,000 documents before them (3% of the words replaced, one line added)")
	flag.Parse()
	if *out == "" || *n < 1 || *per < 1 || *vocab < topicMinRank+topicSize || *topics < 1 || *near < 0 || *near >= 1 {
		fmt.Fprintln(os.Stderr, "usage: gen -n N -out DIR [-seed S] [-per 1000] [-vocab 50000] [-topics 200] [-near 0]")
		os.Exit(2)
	}
	start := time.Now()
	m := newModel(*vocab, *topics, *seed)
	m.perFolder = *per
	m.near = *near
	m.nameWidth = max(6, digits(*n-1))
	m.dirWidth = max(3, digits((*n-1) / *per))
	for f := 0; f <= (*n-1) / *per; f++ {
		if err := os.MkdirAll(filepath.Join(*out, fmt.Sprintf("%0*d", m.dirWidth, f)), 0o755); err != nil {
			fmt.Fprintln(os.Stderr, "gen:", err)
			os.Exit(1)
		}
	}
	var next, bytes atomic.Int64
	var wg sync.WaitGroup
	var errOnce sync.Once
	var firstErr error
	for range runtime.GOMAXPROCS(0) {
		wg.Go(func() {
			var buf []byte
			for {
				i := int(next.Add(1) - 1)
				if i >= *n {
					return
				}
				if j := m.nearCopyOf(i); j >= 0 {
					buf = m.nearCopy(i, j, buf[:0])
				} else {
					buf = m.document(i, buf[:0])
				}
				bytes.Add(int64(len(buf)))
				if err := writeFile(filepath.Join(*out, m.path(i)), buf); err != nil {
					errOnce.Do(func() { firstErr = err })
					return
				}
			}
		})
	}
	wg.Wait()
	if firstErr != nil {
		fmt.Fprintln(os.Stderr, "gen:", firstErr)
		os.Exit(1)
	}
	forms := 0
	for _, l := range m.lemmas {
		forms += len(l.forms)
	}
	fmt.Printf("gen: %d documents, %d bytes (%.1f MB), %d lemmas, %d surface forms, seed %d, in %s\n",
		*n, bytes.Load(), float64(bytes.Load())/1e6, len(m.lemmas), forms, *seed, time.Since(start).Round(time.Millisecond))
}

func writeFile(name string, data []byte) error {
	return os.WriteFile(name, data, 0o644)
}
