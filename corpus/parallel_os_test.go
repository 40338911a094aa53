package corpus_test

import (
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
	"strings"
	"syscall"
	"testing"
	"time"

	"assay/corpus"
)

// WalkParallel reads regular files with fewer system calls than Walk
// (corpus/parallel.go, readRegular; fewer still through RootFS) and hands
// everything else to Walk's reader: on real files through os.Root, as the
// command reads them, both must give the same documents and the same
// skips, with the same reasons.
// The fixture has plain files of several formats, an empty one, one over
// the size limit, a binary one, white space only, invalid UTF-8, links to
// a file, to a folder, out of the root and dangling, a named pipe (which
// must not be opened: that would block) and unsupported extensions.
func TestWalkParallelMatchesWalkOnDisk(t *testing.T) {
	dir := t.TempDir()
	outside := t.TempDir()
	writeFile(t, filepath.Join(outside, "secret.txt"), "Outside the corpus.")
	files := map[string]string{
		"a/plain.txt":      "Ferry notes\n\nThe ferry ran late twice.",
		"a/notes.md":       "# Weir\n\nThe weir gate was shut.",
		"a/page.html":      "<html><head><title>Gauge</title></head><body><p>Gauge read at noon.</p></body></html>",
		"a/msg.eml":        "Subject: Culvert\r\nFrom: a@example.org\r\n\r\nThe culvert is blocked.\r\n",
		"a/rows.csv":       "id,text\n1,alpha text\n2,beta text\n",
		"b/empty.txt":      "",
		"b/big.txt":        strings.Repeat("large file ", 200),
		"b/binary.txt":     "text\x00with a NUL",
		"b/blank.txt":      " \n\t\n",
		"b/latin1.txt":     "caf\xe9 cr\xe8me br\xfbl\xe9e and more ordinary words to stay under a tenth",
		"b/data.bin":       "not read",
		"c/noext":          "no extension",
		"c/sub/inside.rst": "Inside\n======\nA nested file.",
	}
	for p, data := range files {
		writeFile(t, filepath.Join(dir, p), data)
	}
	symlink(t, "../a/plain.txt", filepath.Join(dir, "c", "link.txt"))
	symlink(t, "sub", filepath.Join(dir, "c", "dirlink.txt"))
	symlink(t, filepath.Join(outside, "secret.txt"), filepath.Join(dir, "c", "escape.txt"))
	symlink(t, "missing.txt", filepath.Join(dir, "c", "dangling.txt"))
	if err := syscall.Mkfifo(filepath.Join(dir, "c", "pipe.txt"), 0o644); err != nil {
		t.Logf("no named pipe here: %v", err)
	}
	root, err := os.OpenRoot(dir)
	if err != nil {
		t.Fatal(err)
	}
	defer root.Close()
	opts := corpus.Options{MaxBytes: 1000}
	describe := func(d corpus.Document) string {
		return fmt.Sprintf("%s %x %d %q %s %d", d.ID, d.Hash, d.Size, d.Title, d.Format, d.Repaired)
	}
	var want []string
	wantSkips, err := corpus.Walk(root.FS(), opts, func(d corpus.Document) error {
		want = append(want, describe(d)+fmt.Sprintf(" %d", len(d.Text)))
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
	for _, run := range []struct {
		name string
		fsys fs.FS
		jobs int
	}{{"root.FS", root.FS(), 1}, {"root.FS", root.FS(), 4}, {"RootFS", corpus.RootFS(root), 1}, {"RootFS", corpus.RootFS(root), 4}} {
		jobs := run.jobs
		done := make(chan struct{})
		var got []string
		var skips []corpus.Skip
		go func() {
			defer close(done)
			skips, err = corpus.WalkParallel(run.fsys, opts, jobs,
				func() func(corpus.Document) int { return func(d corpus.Document) int { return len(d.Text) } },
				func(d corpus.Document, n int) error {
					got = append(got, describe(d)+fmt.Sprintf(" %d", n))
					return nil
				})
		}()
		select {
		case <-done:
		case <-time.After(walkTimeout):
			t.Fatalf("WalkParallel did not finish within %v (a named pipe opened?)", walkTimeout)
		}
		if err != nil {
			t.Fatal(err)
		}
		if strings.Join(got, "\n") != strings.Join(want, "\n") {
			t.Errorf("%s, %d jobs: documents\n%s\nWalk:\n%s", run.name, jobs, strings.Join(got, "\n"), strings.Join(want, "\n"))
		}
		if fmt.Sprint(skips) != fmt.Sprint(wantSkips) {
			t.Errorf("%s, %d jobs: skips\n%v\nWalk:\n%v", run.name, jobs, skips, wantSkips)
		}
	}
	if len(want) < 6 || len(wantSkips) < 8 {
		t.Errorf("the fixture gave %d documents and %d skips; expected more of both", len(want), len(wantSkips))
	}
	t.Logf("%d documents, skips: %v", len(want), wantSkips)
}
