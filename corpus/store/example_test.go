package store_test

import (
	"context"
	"fmt"
	"log"
	"os"
	"path/filepath"

	"assay/corpus"
	"assay/corpus/store"
	"assay/sparsemat"
	"assay/textproc"
)

// Indexing a folder into a store with the textproc analyzer, then building
// the count matrix and the display forms from the store, as a pick from a
// store does: the matrix, the display forms, the skips and the fingerprint
// equal those built by reading the folder directly.
func Example() {
	dir, _ := os.MkdirTemp("", "example")
	defer os.RemoveAll(dir)
	s, err := store.Open(filepath.Join(dir, "corpus.assay"))
	if err != nil {
		log.Fatal(err)
	}
	defer s.Close()

	// Each worker gets its own analyzer; Analysis holds what it found.
	newWorker := func() func(corpus.Document) store.Analysis {
		az := textproc.NewAnalyzer(textproc.Options{})
		return func(d corpus.Document) store.Analysis {
			a := store.Analysis{Terms: map[string]int{}, Forms: map[[2]string]int{}}
			a.Lang = string(az.Analyze(d.Text, func(term, surface string) {
				a.Terms[term]++
				a.Forms[[2]string{term, surface}]++
			}))
			return a
		}
	}
	folder := os.DirFS("testdata/corpus")
	ch, err := s.Update(context.Background(), folder, store.UpdateOptions{Key: "lang=auto stem=true", Jobs: 2}, newWorker)
	if err != nil {
		log.Fatal(err)
	}
	fmt.Println(ch)

	// A pick from the store.
	var b sparsemat.Builder
	var display textproc.DisplayForms
	snap, err := s.Load(context.Background(), func(d store.Doc) error {
		b.AddRow(d.Terms)
		for f, n := range d.Forms {
			display.AddN(f[0], f[1], n)
		}
		return nil
	})
	if err != nil {
		log.Fatal(err)
	}
	fromStore, _ := b.Build(sparsemat.Pruning{MinDF: 1, MaxDFShare: 1})

	// A pick from the folder.
	var b2 sparsemat.Builder
	var display2 textproc.DisplayForms
	var fp corpus.Fingerprint
	skips, _ := corpus.WalkParallel(folder, corpus.Options{}, 2, newWorker, func(d corpus.Document, a store.Analysis) error {
		b2.AddRow(a.Terms)
		for f, n := range a.Forms {
			display2.AddN(f[0], f[1], n)
		}
		fp.Add(&d)
		return nil
	})
	fromFolder, _ := b2.Build(sparsemat.Pruning{MinDF: 1, MaxDFShare: 1})

	sameForms := true
	for _, term := range fromFolder.Terms {
		sameForms = sameForms && display.Form(term) == display2.Form(term)
	}
	fmt.Println("documents:", snap.Documents, "skips:", len(snap.Skips), "same skips:", fmt.Sprint(snap.Skips) == fmt.Sprint(skips))
	fmt.Println("same fingerprint:", snap.Fingerprint == fp.String())
	fmt.Println("same matrix:", fmt.Sprint(fromStore.Matrix.RawMatrix(), fromStore.Terms, fromStore.DF) ==
		fmt.Sprint(fromFolder.Matrix.RawMatrix(), fromFolder.Terms, fromFolder.DF), "same display forms:", sameForms)
	// Output:
	// 13 added, 0 changed, 0 removed, 0 unchanged; 12 documents read; the store holds 12 documents of 13 files, 6 skipped
	// documents: 12 skips: 6 same skips: true
	// same fingerprint: true
	// same matrix: true same display forms: true
}
