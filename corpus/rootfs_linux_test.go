package corpus

import (
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
	"syscall"
	"testing"
)

// TestDirReader checks the workers' reader of RootFS on its own: it must
// read plain files in nested folders, and refuse (ok false, so that the
// caller takes the usual path) everything else: a symbolic link to a
// file, a path through a linked folder, a named pipe (without blocking),
// a folder, an empty file, a file over the limit, a missing one and a
// path that is not a clean path of the walk. Common practice, no outside
// source.
func TestDirReader(t *testing.T) {
	root := linkFixture(t, map[string]string{
		"top.txt": "at the root", "a/one.txt": "first", "a/two.txt": "second",
		"a/b/deep.txt": "nested", "a/empty.txt": "", "a/big.txt": "0123456789abcdef",
	})
	fr := RootFS(root).(fileReaderFS).newFileReader()
	if fr == nil {
		t.Fatal("no reader")
	}
	defer fr.close()
	for _, tt := range []struct {
		path, want string
		ok         bool
	}{
		{"a/one.txt", "first", true},
		{"a/two.txt", "second", true},
		{"top.txt", "at the root", true},
		{"a/b/deep.txt", "nested", true},
		{"a/one.txt", "first", true},
		{"a/link.txt", "", false},
		{"alink/one.txt", "", false},
		{"a/pipe.txt", "", false},
		{"a/b", "", false},
		{"a/empty.txt", "", false},
		{"a/big.txt", "", false},
		{"a/missing.txt", "", false},
		{"a/../top.txt", "", false},
		{"/top.txt", "", false},
		{".", "", false},
	} {
		raw, ok := fr.read(tt.path, 12)
		if ok != tt.ok || string(raw) != tt.want {
			t.Errorf("read(%q) = %q, %v; want %q, %v", tt.path, raw, ok, tt.want, tt.ok)
		}
	}
}

// TestRootFSReadDir compares the folder listings of RootFS (read from the
// folders' records) with root.FS's on a fixture of files, folders, links
// and a named pipe: the same names in the same order, the same types, the
// same Info. The records' path must be the one taken (readDirFast ok), or
// the comparison would test root.FS against itself.
func TestRootFSReadDir(t *testing.T) {
	files := map[string]string{}
	for _, p := range []string{"b.txt", "a/one.txt", "a/b/deep.txt", "c/x.md", "Z.txt", "a/.hidden"} {
		files[p] = "text of " + p
	}
	root := linkFixture(t, files)
	fast := RootFS(root).(*rootFS)
	for _, name := range []string{".", "a", "a/b", "c"} {
		got, ok := fast.readDirFast(name)
		if !ok {
			t.Fatalf("readDirFast(%q) not ok", name)
		}
		want, err := fs.ReadDir(root.FS(), name)
		if err != nil {
			t.Fatal(err)
		}
		if len(got) != len(want) {
			t.Fatalf("%s: %d entries, root.FS %d", name, len(got), len(want))
		}
		for i := range got {
			g, w := got[i], want[i]
			gi, gerr := g.Info()
			wi, werr := w.Info()
			if gerr != nil || werr != nil {
				t.Fatalf("%s/%s: Info errors %v, %v", name, g.Name(), gerr, werr)
			}
			if g.Name() != w.Name() || g.Type() != w.Type() || g.IsDir() != w.IsDir() ||
				gi.Mode() != wi.Mode() || gi.Size() != wi.Size() || gi.Name() != wi.Name() {
				t.Errorf("%s entry %d: %v (%v), root.FS %v (%v)", name, i, g, gi.Mode(), w, wi.Mode())
			}
		}
	}
	for _, name := range []string{"missing", "alink", "b.txt", "../x", "/a"} {
		if _, ok := fast.readDirFast(name); ok {
			t.Errorf("readDirFast(%q) ok, want the usual path", name)
		}
		_, gerr := fast.ReadDir(name)
		_, werr := fs.ReadDir(root.FS(), name)
		if fmt.Sprint(gerr) != fmt.Sprint(werr) {
			t.Errorf("ReadDir(%q): error %v, root.FS %v", name, gerr, werr)
		}
	}
}

// linkFixture writes files (path → content) into a new folder, adds the
// links a/link.txt → one.txt and alink → a and the named pipe
// a/pipe.txt, and opens the folder as a root, closed with the test.
func linkFixture(t *testing.T, files map[string]string) *os.Root {
	t.Helper()
	dir := t.TempDir()
	for p, data := range files {
		p = filepath.Join(dir, p)
		if err := os.MkdirAll(filepath.Dir(p), 0o755); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(p, []byte(data), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	if err := os.Symlink("one.txt", filepath.Join(dir, "a", "link.txt")); err != nil {
		t.Fatal(err)
	}
	if err := os.Symlink("a", filepath.Join(dir, "alink")); err != nil {
		t.Fatal(err)
	}
	if err := syscall.Mkfifo(filepath.Join(dir, "a", "pipe.txt"), 0o644); err != nil {
		t.Fatal(err)
	}
	root, err := os.OpenRoot(dir)
	if err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() { root.Close() })
	return root
}
