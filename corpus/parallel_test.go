package corpus_test

import (
	"errors"
	"fmt"
	"io/fs"
	"testing"
	"testing/fstest"

	"assay/corpus"
	"assay/corpus/demo"
)

// WalkParallel gives the documents (in the same order, with the same
// hashes) and the skips of Walk for any number of workers, on the demo
// corpus and on a fixture of bad files (a property of the pipeline: it
// restores walk order; no outside source).
func TestWalkParallelMatchesWalk(t *testing.T) {
	bad := fstest.MapFS{
		"a/one.txt":     {Data: []byte("First document about ferries.")},
		"a/two.bin":     {Data: []byte{0, 1, 2}},
		"b/empty.txt":   {Data: nil},
		"b/three.md":    {Data: []byte("# Third\nAbout floods.")},
		"c/rec.csv":     {Data: []byte("id,text\n1,alpha text\n2,\"broken\n")},
		"c/four.txt":    {Data: []byte("\x00binary")},
		"d/five.rst":    {Data: []byte("Five\n====\nOtters.")},
		".hidden/x.txt": {Data: []byte("hidden")},
	}
	for name, fsys := range map[string]fs.FS{"bad files": bad, "demo": demo.FS()} {
		var want []string
		wantSkips, err := corpus.Walk(fsys, corpus.Options{}, func(d corpus.Document) error {
			want = append(want, fmt.Sprintf("%s %x %d", d.ID, d.Hash, len(d.Text)))
			return nil
		})
		if err != nil {
			t.Fatal(err)
		}
		for _, jobs := range []int{1, 3, 8} {
			var got []string
			skips, err := corpus.WalkParallel(fsys, corpus.Options{}, jobs,
				func() func(corpus.Document) int { return func(d corpus.Document) int { return len(d.Text) } },
				func(d corpus.Document, n int) error {
					got = append(got, fmt.Sprintf("%s %x %d", d.ID, d.Hash, n))
					return nil
				})
			if err != nil {
				t.Fatal(err)
			}
			if fmt.Sprint(got) != fmt.Sprint(want) {
				t.Errorf("%s, %d jobs: documents differ from Walk", name, jobs)
			}
			if fmt.Sprint(skips) != fmt.Sprint(wantSkips) {
				t.Errorf("%s, %d jobs: skips %v, Walk %v", name, jobs, skips, wantSkips)
			}
		}
	}
}

// An error from collect stops the walk and is returned; ErrStop stops it
// quietly; the pipeline's goroutines end either way (the race detector
// and the test's own end would show a leak as a hang).
func TestWalkParallelStops(t *testing.T) {
	boom := errors.New("boom")
	for _, stop := range []error{boom, corpus.ErrStop} {
		n := 0
		_, err := corpus.WalkParallel(demo.FS(), corpus.Options{}, 4,
			func() func(corpus.Document) int { return func(corpus.Document) int { return 0 } },
			func(corpus.Document, int) error {
				n++
				if n == 5 {
					return stop
				}
				return nil
			})
		if n != 5 {
			t.Errorf("collect called %d times after stopping at 5", n)
		}
		if stop == boom && !errors.Is(err, boom) || stop == corpus.ErrStop && err != nil {
			t.Errorf("stop %v: err %v", stop, err)
		}
	}
}
