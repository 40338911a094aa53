//go:build unix

package store

import (
	"os"
	"path/filepath"
	"slices"
	"syscall"
	"testing"
	"time"

	"assay/corpus"
	"assay/textproc"
)

// Special files and symbolic links on a real file system. A named pipe is
// skipped as corpus.Walk skips it and is never opened, not even to hash it
// on a later update (opening a pipe with no writer blocks: POSIX open(2)
// on a FIFO). A link to a file is read through the link, and a change of
// the file it points to is found (its size and time are the target's,
// as stat(2) gives them); a link to a folder is skipped, not followed.
func TestSpecialFiles(t *testing.T) {
	dir := t.TempDir()
	write := func(name, text string) {
		p := filepath.Join(dir, name)
		os.MkdirAll(filepath.Dir(p), 0o755)
		os.WriteFile(p, []byte(text), 0o644)
		os.Chtimes(p, past, past)
	}
	write("target/memo.txt", "The depot closes early on Friday.")
	write("plain.txt", "Volunteers meet at the boathouse.")
	if err := syscall.Mkfifo(filepath.Join(dir, "pipe.txt"), 0o644); err != nil {
		t.Skipf("no named pipes here: %v", err)
	}
	os.Symlink(filepath.Join(dir, "target", "memo.txt"), filepath.Join(dir, "link.txt"))
	os.Symlink(filepath.Join(dir, "target"), filepath.Join(dir, "loop"))
	nw := analyzerWorker(textproc.Options{})
	fsys := &openCounter{base: os.DirFS(dir)}
	s, _ := openStore(t)
	var cnt counting
	update(t, s, fsys, UpdateOptions{Key: testKey}, cnt.wrap(nw))
	if opened := fsys.take(); slices.Contains(opened, "pipe.txt") {
		t.Fatalf("the pipe was opened")
	}
	want := direct(t, os.DirFS(dir), corpus.Options{}, nw, false)
	sameView(t, "special files", loadView(t, s), want)

	cnt.take()
	update(t, s, fsys, UpdateOptions{Key: testKey}, cnt.wrap(nw))
	if opened, got := fsys.take(), cnt.take(); len(opened) != 0 || len(got) != 0 {
		t.Errorf("nothing changed: opened %q, analysed %q", opened, got)
	}

	write("target/memo.txt", "The depot closes early on Friday and Saturday.")
	later := past.Add(time.Minute)
	os.Chtimes(filepath.Join(dir, "target", "memo.txt"), later, later)
	update(t, s, fsys, UpdateOptions{Key: testKey}, cnt.wrap(nw))
	if got := cnt.take(); !slices.Equal(got, []string{"link.txt", "target/memo.txt"}) {
		t.Errorf("the link's target changed: analysed %q", got)
	}
	if opened := fsys.take(); slices.Contains(opened, "pipe.txt") {
		t.Errorf("the pipe was opened")
	}
	sameView(t, "target changed", loadView(t, s), direct(t, os.DirFS(dir), corpus.Options{}, nw, false))
}
