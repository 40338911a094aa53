package corpus

import (
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
	dir := t.TempDir()
	write := func(p, data string) {
		t.Helper()
		p = filepath.Join(dir, p)
		if err := os.MkdirAll(filepath.Dir(p), 0o755); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(p, []byte(data), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	write("top.txt", "at the root")
	write("a/one.txt", "first")
	write("a/two.txt", "second")
	write("a/b/deep.txt", "nested")
	write("a/empty.txt", "")
	write("a/big.txt", "0123456789abcdef")
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
	defer root.Close()
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
