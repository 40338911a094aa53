package textproc_test

import (
	"math/rand/v2"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"assay/textproc"
)

// benchSentences are invented sentences in the register of a regional
// authority's reports; every name in them is made up.
var benchSentences = []string{
	"The river gauge at Brannock Ford rose by 0.42 m overnight, and the duty officer issued a flood alert for the lower meadows.",
	"Volunteers filled 1,200 sandbags at the Cobbet End depot; the stock count will be repeated on Friday.",
	"Inspection of the embankment found seepage at four points, two of which need urgent repair before the winter high tides.",
	"Residents of Harls Reach reported discoloured tap water after the mains were flushed on 11 February.",
	"The laboratory's accreditation audit raised three minor findings, all concerning the calibration records of the turbidity meters.",
	"An otter spraint survey along the River Quill recorded fresh signs at nine of the twelve sites visited in spring.",
	"Controlled burning on Brindle Edge was postponed because the fire danger rating stayed above the agreed threshold.",
	"The payroll system outage lasted six hours; staff were paid on time after the backup was restored manually.",
	"Grant monitoring visits confirmed that the village hall roof was replaced within budget and ahead of schedule.",
	"Ferry services were suspended during the spring tides, and the diversion timetable for route 4 was corrected twice.",
	"Nitrate concentrations at the northern boreholes increased steadily, which the memo links to run-off from arable fields.",
	"Heron nests in the alder stand must not be disturbed between February and July, so tree felling was deferred.",
	"The committee noted the late submission of expense claims and asked managers to remind their teams of the deadline.",
	"Blue-green algae were seen at the reservoir's western arm; dog walkers are advised to keep their animals out of the water.",
	"Digitisation of the parish registers continues: 3,400 pages scanned, 2,950 transcribed and checked by volunteers.",
	"Phishing test results improved compared with September, though one in ten recipients still opened the fake invoice.",
}

// benchText builds about 20 KB of text from the sentences above, in a fixed
// pseudo-random order and with paragraph breaks, so that the benchmark sees
// a realistic mix of repeated and new tokens.
func benchText(size int) string {
	r := rand.New(rand.NewPCG(1, 1)) // fixed seed: the same text every run
	var b strings.Builder
	for n := 0; b.Len() < size; n++ {
		b.WriteString(benchSentences[r.IntN(len(benchSentences))])
		if n%5 == 4 {
			b.WriteString("\n\n")
		} else {
			b.WriteByte(' ')
		}
	}
	return b.String()
}

// BenchmarkAnalyze measures Analyze on ~20 KB of invented English. "warm"
// reuses one Analyzer, as the index does over a corpus; "cold" starts each
// iteration with an empty memo.
func BenchmarkAnalyze(b *testing.B) {
	text := benchText(20 << 10)
	b.Run("warm", func(b *testing.B) {
		a := textproc.NewAnalyzer(textproc.Options{Lang: textproc.English})
		n := 0
		b.SetBytes(int64(len(text)))
		b.ReportAllocs()
		for b.Loop() {
			a.Analyze(text, func(_, _ string) { n++ })
		}
		if n == 0 {
			b.Fatal("no terms")
		}
	})
	b.Run("cold", func(b *testing.B) {
		n := 0
		b.SetBytes(int64(len(text)))
		b.ReportAllocs()
		for b.Loop() {
			textproc.NewAnalyzer(textproc.Options{Lang: textproc.English}).Analyze(text, func(_, _ string) { n++ })
		}
		if n == 0 {
			b.Fatal("no terms")
		}
	})
}

// BenchmarkAnalyzeLanguages measures ingest throughput per language on the
// fixture paragraphs of testdata/langid/<language> (invented text), each
// paragraph analysed as one document, as the index does over a corpus:
// with the language detected per document (auto) or fixed, and with the
// stem memo on or off (Options.NoMemo). The analyzer is reused across
// iterations, so "memo=on" is the steady state of a large corpus whose
// vocabulary has been seen.
func BenchmarkAnalyzeLanguages(b *testing.B) {
	for _, l := range textproc.Languages() {
		docs := fixtureDocs(b, l)
		size := 0
		for _, d := range docs {
			size += len(d)
		}
		for _, mode := range []textproc.Language{textproc.Auto, l} {
			name := "detect=auto"
			if mode != textproc.Auto {
				name = "detect=fixed"
			}
			for _, noMemo := range []bool{false, true} {
				memo := "memo=on"
				if noMemo {
					memo = "memo=off"
				}
				b.Run("lang="+string(l)+"/"+name+"/"+memo, func(b *testing.B) {
					a := textproc.NewAnalyzer(textproc.Options{Lang: mode, NoMemo: noMemo})
					n := 0
					b.SetBytes(int64(size))
					b.ReportAllocs()
					for b.Loop() {
						for _, d := range docs {
							a.Analyze(d, func(_, _ string) { n++ })
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

// fixtureDocs reads the fixture paragraphs of language l, one per file.
func fixtureDocs(b testing.TB, l textproc.Language) []string {
	b.Helper()
	files, err := filepath.Glob(filepath.Join("testdata", "langid", string(l), "*.txt"))
	if err != nil {
		b.Fatal(err)
	}
	if len(files) == 0 {
		b.Skipf("no fixture paragraphs for %s", l)
	}
	var docs []string
	for _, f := range files {
		p, err := os.ReadFile(f)
		if err != nil {
			b.Fatal(err)
		}
		docs = append(docs, string(p))
	}
	return docs
}
