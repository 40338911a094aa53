package textproc_test

import (
	"fmt"
	"slices"
	"syscall"
	"testing"
	"time"

	"assay/textproc"
)

func cpuNow() time.Duration {
	var ru syscall.Rusage
	syscall.Getrusage(syscall.RUSAGE_SELF, &ru)
	return time.Duration(ru.Utime.Nano() + ru.Stime.Nano())
}

func TestZZCPU(t *testing.T) {
	for _, l := range textproc.Languages() {
		docs := fixtureDocs(t, l)
		size := 0
		for _, d := range docs {
			size += len(d)
		}
		line := fmt.Sprintf("%-10s", l)
		for _, mode := range []textproc.Language{textproc.Auto, l} {
			for _, noMemo := range []bool{false, true} {
				a := textproc.NewAnalyzer(textproc.Options{Lang: mode, NoMemo: noMemo})
				for _, d := range docs {
					a.Analyze(d, func(_, _ string) {})
				}
				var rates []float64
				for range 7 {
					const passes = 100
					c0 := cpuNow()
					for range passes {
						for _, d := range docs {
							a.Analyze(d, func(_, _ string) {})
						}
					}
					rates = append(rates, float64(size*passes)/1e6/(cpuNow()-c0).Seconds())
				}
				slices.Sort(rates)
				line += fmt.Sprintf(" %6.1f", rates[3])
			}
		}
		fmt.Println(line, size)
	}
}
