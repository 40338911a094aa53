package textproc_test

import (
	"fmt"

	"assay/textproc"
)

// French stems from python3-snowballstemmer 2.2.0: barrage → barrag,
// surveille → surveil, monte → mont, lentement → lent.
func ExampleAnalyzer_Analyze() {
	a := textproc.NewAnalyzer(textproc.Options{}) // detect each document's language
	lang := a.Analyze("L'eau du barrage qu'on surveille monte lentement.", func(term, surface string) {
		l, stem := textproc.SplitTerm(term)
		fmt.Printf("%-12s %-8s %-8s %s\n", term, l.Code(), stem, surface)
	})
	fmt.Println("document:", lang)
	// Output:
	// fr:eau       fr       eau      eau
	// fr:barrag    fr       barrag   barrage
	// fr:surveil   fr       surveil  surveille
	// fr:mont      fr       mont     monte
	// fr:lent      fr       lent     lentement
	// document: french
}
