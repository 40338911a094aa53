package textproc_test

import (
	"strings"
	"testing"

	"assay/textproc"
)

// benchInputs are the texts of the tokenizer and normaliser benchmarks:
// invented English prose (benchText), 200 pseudo-word documents
// (pseudoCorpus), the same prose with typographic quotes, dashes and
// accented words in every sentence (most of a document ASCII, some not),
// and the fixture paragraphs of all seven languages.
func benchInputs(b *testing.B) []struct{ name, text string } {
	prose := benchText(64 << 10)
	typo := strings.NewReplacer("'s", "\u2019s", ", ", " \u2014 ", "The ", "The caf\u00e9 ", "river", "r\u00edver").Replace(prose)
	var multi strings.Builder
	for _, l := range textproc.Languages() {
		for _, d := range fixtureDocs(b, l) {
			multi.WriteString(d)
			multi.WriteByte('\n')
		}
	}
	return []struct{ name, text string }{
		{"english", prose},
		{"pseudo", strings.Join(pseudoCorpus(200, 3), "\n\n")},
		{"typographic", typo},
		{"multilingual", multi.String()},
	}
}

// BenchmarkTokenize measures the tokenizer alone on normalised text (the
// analyzer's buffers reused), and BenchmarkNormalize the NFC and case
// folding step that precedes it; MB/s is of the input.
func BenchmarkTokenize(b *testing.B) {
	a := textproc.NewAnalyzer(textproc.Options{})
	for _, in := range benchInputs(b) {
		text := a.Normalize(in.text)
		b.Run(in.name, func(b *testing.B) {
			var t textproc.BenchTokenizer
			n := 0
			b.SetBytes(int64(len(text)))
			b.ReportAllocs()
			for b.Loop() {
				n += t.Run(text)
			}
			if n == 0 {
				b.Fatal("no tokens")
			}
		})
	}
}

func BenchmarkNormalize(b *testing.B) {
	a := textproc.NewAnalyzer(textproc.Options{})
	for _, in := range benchInputs(b) {
		b.Run(in.name, func(b *testing.B) {
			n := 0
			b.SetBytes(int64(len(in.text)))
			b.ReportAllocs()
			for b.Loop() {
				n += len(a.Normalize(in.text))
			}
			if n == 0 {
				b.Fatal("no text")
			}
		})
	}
}
