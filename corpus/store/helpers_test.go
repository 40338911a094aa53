package store

import (
	"context"
	"fmt"
	"hash/fnv"
	"io/fs"
	"os"
	"path/filepath"
	"slices"
	"sync"
	"sync/atomic"
	"testing"
	"time"

	"assay/corpus"
	"assay/textproc"
)

// analyzerWorker returns a newWorker that analyses documents as
// cmd/assay's analyze does: one textproc analyzer per worker, every term
// and (term, surface form) counted.
func analyzerWorker(opts textproc.Options) func() func(corpus.Document) Analysis {
	return func() func(corpus.Document) Analysis {
		az := textproc.NewAnalyzer(opts)
		return func(d corpus.Document) Analysis {
			a := Analysis{Terms: map[string]int{}, Forms: map[[2]string]int{}}
			a.Lang = string(az.Analyze(d.Text, func(term, surface string) {
				a.Terms[term]++
				a.Forms[[2]string{term, surface}]++
			}))
			a.Sig = testSig(a.Terms)
			return a
		}
	}
}

// testSig is a stand-in for a document signature: for each of 8 seeds,
// the least FNV-1a hash of seed and term over the terms (nil for a
// document without terms).
func testSig(terms map[string]int) []uint32 {
	if len(terms) == 0 {
		return nil
	}
	sig := make([]uint32, 8)
	for k := range sig {
		sig[k] = ^uint32(0)
		for t := range terms {
			h := fnv.New32a()
			h.Write([]byte{byte(k)})
			h.Write([]byte(t))
			sig[k] = min(sig[k], h.Sum32())
		}
	}
	return sig
}

// counting wraps a newWorker and records the IDs of the documents
// analysed, from every worker.
type counting struct {
	mu  sync.Mutex
	ids []string
}

func (c *counting) wrap(newWorker func() func(corpus.Document) Analysis) func() func(corpus.Document) Analysis {
	return func() func(corpus.Document) Analysis {
		work := newWorker()
		return func(d corpus.Document) Analysis {
			c.mu.Lock()
			c.ids = append(c.ids, d.ID)
			c.mu.Unlock()
			return work(d)
		}
	}
}

// take returns the IDs recorded so far, sorted, and forgets them.
func (c *counting) take() []string {
	c.mu.Lock()
	defer c.mu.Unlock()
	ids := c.ids
	c.ids = nil
	slices.Sort(ids)
	return ids
}

// openCounter is an fs.FS that counts the files opened through it (folders
// are listed through ReadDir, which it does not count).
type openCounter struct {
	base  fs.FS
	opens atomic.Int64
	mu    sync.Mutex
	paths []string
}

func (o *openCounter) Open(name string) (fs.File, error) {
	o.opens.Add(1)
	o.mu.Lock()
	o.paths = append(o.paths, name)
	o.mu.Unlock()
	return o.base.Open(name)
}

func (o *openCounter) ReadDir(name string) ([]fs.DirEntry, error) { return fs.ReadDir(o.base, name) }
func (o *openCounter) Stat(name string) (fs.FileInfo, error)      { return fs.Stat(o.base, name) }

// take returns the paths opened so far, sorted, and forgets them.
func (o *openCounter) take() []string {
	o.mu.Lock()
	defer o.mu.Unlock()
	p := o.paths
	o.paths = nil
	o.opens.Store(0)
	slices.Sort(p)
	return p
}

// line renders a document and its analysis as one canonical line: every
// field of what a pick uses (fmt prints maps sorted by key).
func line(d *corpus.Document, a *Analysis) string {
	return fmt.Sprintf("%s|%q|%d|%x|%s|%s|%d|%s|%+v|%v|%v|%v|%q",
		d.ID, d.Title, d.Size, d.Hash, d.Format, a.Lang, d.Repaired, d.Container, d.Meta, a.Terms, a.Forms, a.Sig, d.Text)
}

// corpusView is a corpus as a pick sees it.
type corpusView struct {
	lines       []string
	skips       []corpus.Skip
	fingerprint string
}

// direct reads fsys as cmd/assay's analyze does (corpus.WalkParallel with
// the analysis in the workers), keeping texts when keepText is set.
func direct(t testing.TB, fsys fs.FS, opts corpus.Options, newWorker func() func(corpus.Document) Analysis, keepText bool) corpusView {
	t.Helper()
	type out struct {
		a    Analysis
		text string
	}
	var v corpusView
	var fp corpus.Fingerprint
	skips, err := corpus.WalkParallel(fsys, opts, 3, func() func(corpus.Document) out {
		work := newWorker()
		return func(d corpus.Document) out {
			o := out{a: work(d)}
			if keepText {
				o.text = d.Text
			}
			return o
		}
	}, func(d corpus.Document, o out) error {
		d.Text = o.text
		fp.Add(&d)
		v.lines = append(v.lines, line(&d, &o.a))
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
	v.skips, v.fingerprint = skips, fp.String()
	return v
}

// loadView loads the whole store.
func loadView(t testing.TB, s *Store) corpusView {
	t.Helper()
	var v corpusView
	snap, err := s.Load(context.Background(), func(d Doc) error {
		v.lines = append(v.lines, line(&d.Document, &d.Analysis))
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
	if snap.Documents != len(v.lines) {
		t.Errorf("snapshot says %d documents, fn saw %d", snap.Documents, len(v.lines))
	}
	v.skips, v.fingerprint = snap.Skips, snap.Fingerprint
	return v
}

// sameView reports the first difference between two views.
func sameView(t testing.TB, what string, got, want corpusView) {
	t.Helper()
	if len(got.lines) != len(want.lines) {
		t.Errorf("%s: %d documents, want %d", what, len(got.lines), len(want.lines))
	}
	for i := range min(len(got.lines), len(want.lines)) {
		if got.lines[i] != want.lines[i] {
			t.Errorf("%s: document %d:\n got %s\nwant %s", what, i, got.lines[i], want.lines[i])
			break
		}
	}
	if fmt.Sprint(got.skips) != fmt.Sprint(want.skips) {
		t.Errorf("%s: skips\n got %v\nwant %v", what, got.skips, want.skips)
	}
	if got.fingerprint != want.fingerprint {
		t.Errorf("%s: fingerprint %s, want %s", what, got.fingerprint, want.fingerprint)
	}
}

// copyTree copies the folder src to dst, giving every file and folder the
// modification time mtime.
func copyTree(t testing.TB, src, dst string, mtime time.Time) {
	t.Helper()
	err := filepath.WalkDir(src, func(p string, d fs.DirEntry, err error) error {
		if err != nil {
			return err
		}
		rel, _ := filepath.Rel(src, p)
		out := filepath.Join(dst, rel)
		if d.IsDir() {
			return os.MkdirAll(out, 0o755)
		}
		data, err := os.ReadFile(p)
		if err != nil {
			return err
		}
		if err := os.WriteFile(out, data, 0o644); err != nil {
			return err
		}
		return os.Chtimes(out, mtime, mtime)
	})
	if err != nil {
		t.Fatal(err)
	}
}

// openStore opens (creating) a store in a new temporary folder.
func openStore(t testing.TB) (*Store, string) {
	t.Helper()
	p := filepath.Join(t.TempDir(), "corpus.assay")
	s, err := Open(p)
	if err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() { s.Close() })
	return s, p
}

// update runs Update and fails the test on an error.
func update(t testing.TB, s *Store, fsys fs.FS, o UpdateOptions, newWorker func() func(corpus.Document) Analysis) *Changes {
	t.Helper()
	ch, err := s.Update(context.Background(), fsys, o, newWorker)
	if err != nil {
		t.Fatal(err)
	}
	return ch
}

// testKey is the options key of the tests' default analysis.
const testKey = "lang=auto min-length=2 keep-numbers=false stem=true max-bytes=20971520 strip-quoted=true attachments=true text-field= id-field= title-field= include= exclude="

// past is a modification time well outside the racy window of any update
// a test runs: a folder indexed long after it was written.
var past = time.Now().Add(-time.Hour).Truncate(time.Second)
