package textproc_test

import (
	"fmt"
	"runtime"
	"testing"

	"assay/textproc"
)

// BenchmarkDisplayForms records the forms of 100,000 stems (one form for
// two stems in three, two or three for the others, as stemming English
// gives), then asks for every stem's display form. B/op is the memory the
// forms take.
func BenchmarkDisplayForms(b *testing.B) {
	stems := make([]string, 100000)
	forms := make([][]string, len(stems))
	for i := range stems {
		stems[i] = fmt.Sprintf("st%06d", i)
		forms[i] = []string{stems[i] + "s"}
		for k := range i % 3 / 2 * (1 + i%2) {
			forms[i] = append(forms[i], fmt.Sprintf("%sed%d", stems[i], k))
		}
	}
	build := func() *textproc.DisplayForms {
		d := new(textproc.DisplayForms)
		for i, s := range stems {
			for k, f := range forms[i] {
				d.AddN(s, f, 1+k)
			}
		}
		return d
	}
	// The memory the forms keep, beside what building them allocates.
	var before, after runtime.MemStats
	runtime.GC()
	runtime.ReadMemStats(&before)
	kept := build()
	runtime.GC()
	runtime.ReadMemStats(&after)
	runtime.KeepAlive(kept)
	b.ReportAllocs()
	for b.Loop() {
		d := build()
		for _, s := range stems {
			if d.Form(s) == "" {
				b.Fatal("no form")
			}
		}
	}
	b.ReportMetric(float64(after.HeapAlloc-before.HeapAlloc)/float64(len(stems)), "retained-B/stem")
}
