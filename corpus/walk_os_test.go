//go:build unix

package corpus_test

import (
	"crypto/sha256"
	"os"
	"path/filepath"
	"strings"
	"syscall"
	"testing"
	"time"

	"assay/corpus"
)

// walkTimeout bounds a walk over a tiny tree; a walk that follows a link
// loop or opens a pipe would block far longer (for ever).
const walkTimeout = 10 * time.Second

// walkRoot walks dir through os.Root, as the command does, and fails the
// test instead of hanging when the walk does not finish.
func walkRoot(t *testing.T, dir string) ([]corpus.Document, []corpus.Skip) {
	t.Helper()
	root, err := os.OpenRoot(dir)
	if err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() { root.Close() })
	type result struct {
		docs  []corpus.Document
		skips []corpus.Skip
		err   error
	}
	done := make(chan result, 1)
	go func() {
		var r result
		r.skips, r.err = corpus.Walk(root.FS(), corpus.Options{}, func(d corpus.Document) error {
			r.docs = append(r.docs, d)
			return nil
		})
		done <- r
	}()
	select {
	case r := <-done:
		if r.err != nil {
			t.Fatalf("Walk: %v", r.err)
		}
		return r.docs, r.skips
	case <-time.After(walkTimeout):
		t.Fatalf("Walk did not finish within %v", walkTimeout)
		return nil, nil
	}
}

func writeFile(t *testing.T, p, data string) {
	t.Helper()
	if err := os.MkdirAll(filepath.Dir(p), 0o755); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(p, []byte(data), 0o644); err != nil {
		t.Fatal(err)
	}
}

func symlink(t *testing.T, target, link string) {
	t.Helper()
	if err := os.Symlink(target, link); err != nil {
		t.Fatal(err)
	}
}

// TestWalkSymlinks checks symbolic links on the real OS (doc.go: links to
// folders are never followed; os.Root refuses paths that escape the root,
// per the os.Root documentation).
func TestWalkSymlinks(t *testing.T) {
	dir := t.TempDir()
	outside := t.TempDir()
	writeFile(t, filepath.Join(outside, "secret.txt"), "Outside the corpus.")
	writeFile(t, filepath.Join(dir, "a.txt"), "Alpha notes\n\nAbout the weir.")
	writeFile(t, filepath.Join(dir, "loop", "inside.md"), "# Inside the loop folder")
	symlink(t, "..", filepath.Join(dir, "loop", "up"))            // to its parent
	symlink(t, ".", filepath.Join(dir, "loop", "self"))           // to its own folder
	symlink(t, "../loop", filepath.Join(dir, "loop", "again.md")) // to a folder, text extension
	symlink(t, "knot.txt", filepath.Join(dir, "knot.txt"))        // to itself
	symlink(t, "a.txt", filepath.Join(dir, "link.txt"))           // to a file inside
	symlink(t, filepath.Join(outside, "secret.txt"), filepath.Join(dir, "out.txt"))

	docs, skips := walkRoot(t, dir)
	t.Logf("skips: %q", skips)

	byID := map[string]corpus.Document{}
	for _, d := range docs {
		byID[d.ID] = d
	}
	if len(docs) != 3 {
		t.Errorf("documents %q, want a.txt, link.txt and loop/inside.md", ids(docs))
	}
	t.Run("link to a file inside is read", func(t *testing.T) {
		d, ok := byID["link.txt"]
		if !ok {
			t.Fatalf("link.txt not read; skips %q", skips)
		}
		if want := sha256.Sum256([]byte("Alpha notes\n\nAbout the weir.")); d.Hash != want || d.Title != "Alpha notes" {
			t.Errorf("link.txt = %+v, want the content of a.txt", d)
		}
	})
	for _, p := range []string{"loop/up", "loop/self", "loop/again.md"} {
		t.Run(p, func(t *testing.T) {
			if r := reasonOf(skips, p); r != "symbolic link to a folder (not followed)" {
				t.Errorf("skip reason for %s = %q, want %q", p, r, "symbolic link to a folder (not followed)")
			}
		})
	}
	for _, p := range []string{"out.txt", "knot.txt"} {
		t.Run(p, func(t *testing.T) {
			if r := reasonOf(skips, p); !strings.HasPrefix(r, "unreadable") {
				t.Errorf("skip reason for %s = %q, want an unreadable reason", p, r)
			}
		})
	}
	for _, d := range docs {
		if strings.Contains(d.Text, "Outside the corpus") {
			t.Errorf("%s: text from outside the root was read", d.ID)
		}
		if strings.Count(d.ID, "/") > 1 {
			t.Errorf("%s: a folder link was followed", d.ID)
		}
	}
}

// TestWalkNamedPipe checks that a named pipe is skipped without being
// opened: opening a FIFO for reading blocks until a writer comes (fifo(7)),
// so a regression shows as a timeout.
func TestWalkNamedPipe(t *testing.T) {
	dir := t.TempDir()
	writeFile(t, filepath.Join(dir, "a.txt"), "Before the pipe.")
	writeFile(t, filepath.Join(dir, "z.txt"), "After the pipe.")
	for _, name := range []string{"pipe.txt", "pipe"} {
		if err := syscall.Mkfifo(filepath.Join(dir, name), 0o644); err != nil {
			t.Skipf("cannot make a named pipe here: %v", err)
		}
	}
	docs, skips := walkRoot(t, dir)
	t.Logf("skips: %q", skips)
	if got, want := ids(docs), []string{"a.txt", "z.txt"}; len(got) != 2 || got[0] != want[0] || got[1] != want[1] {
		t.Errorf("documents %q, want %q", got, want)
	}
	if r := reasonOf(skips, "pipe.txt"); !strings.HasPrefix(r, "not a regular file") {
		t.Errorf("skip reason for pipe.txt = %q, want %q", r, "not a regular file ...")
	}
	if r := reasonOf(skips, "pipe"); r == "" {
		t.Errorf("pipe without extension not listed as skipped")
	}
}
