package main

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// A pick from an index gives the same report as the pick from the folder,
// byte for byte but for the two places that name the input (the source and
// the repeat command), for several formats and options; a second index of
// an unchanged folder reads nothing; a changed analysis option is refused.
func TestPickFromStore(t *testing.T) {
	files := nearFixture()
	for k, v := range smallCorpus {
		files["small/"+k] = v
	}
	dir := writeTree(t, files)
	st := filepath.Join(t.TempDir(), "x.assay")
	code, out, stderr := run(t, "index", dir, "--store", st)
	if code != exitOK || !strings.Contains(out, "added") {
		t.Fatalf("index: exit %d, %s %s", code, out, stderr)
	}
	for _, args := range [][]string{
		{"--format", "json"},
		{"--format", "text", "--docs", "5", "--method", "pivot"},
		{"--format", "csv", "--table", "groups", "--near-dup", "off"},
	} {
		c1, fromDir, e1 := run(t, append([]string{"pick", dir}, args...)...)
		c2, fromStore, e2 := run(t, append([]string{"pick", st}, args...)...)
		if c1 != exitOK || c2 != exitOK {
			t.Fatalf("%v: exit %d / %d: %s %s", args, c1, c2, e1, e2)
		}
		if strings.ReplaceAll(fromStore, st, dir) != fromDir {
			t.Errorf("%v: the pick from the store differs from the pick from the folder", args)
		}
	}
	code, out, _ = run(t, "index", dir, "--store", st)
	if code != exitOK || !strings.Contains(out, "0 added") || !strings.Contains(out, "0 documents read") {
		t.Errorf("second index: %q", out)
	}
	if code, _, stderr := run(t, "pick", st, "--lang", "english"); code != exitFailure || !strings.Contains(stderr, "other analysis options") {
		t.Errorf("other options: exit %d, %q", code, stderr)
	}
	if code, _, stderr := run(t, "index", dir, "--store", st, "--min-length", "3"); code != exitFailure || !strings.Contains(stderr, "rebuild") {
		t.Errorf("index with other options: exit %d, %q", code, stderr)
	}
	os.WriteFile(filepath.Join(dir, "reports", "new.txt"), []byte("A new report about the weir gauge and the depot."), 0o644)
	if code, out, _ := run(t, "index", dir, "--store", st); code != exitOK || !strings.Contains(out, "1 added") {
		t.Errorf("after adding a file: %q", out)
	}
}

// export from an index writes the same files as export from the folder.
func TestExportFromStore(t *testing.T) {
	dir := writeTree(t, smallCorpus)
	st := filepath.Join(t.TempDir(), "s.assay")
	if code, _, stderr := run(t, "index", dir, "--store", st); code != exitOK {
		t.Fatal(stderr)
	}
	out := t.TempDir()
	run(t, "export", dir, "--out", filepath.Join(out, "dir"))
	run(t, "export", st, "--out", filepath.Join(out, "st"))
	for _, ext := range []string{".terms.tsv", ".docs.tsv", ".mtx"} {
		a, _ := os.ReadFile(filepath.Join(out, "dir"+ext))
		b, _ := os.ReadFile(filepath.Join(out, "st"+ext))
		if ext == ".mtx" { // the comment line names the input
			a, b = dropLine(a, 1), dropLine(b, 1)
		}
		if len(a) == 0 || string(a) != string(b) {
			t.Errorf("%s differs between the folder and the store", ext)
		}
	}
}

func dropLine(b []byte, n int) []byte {
	lines := strings.SplitN(string(b), "\n", n+2)
	return []byte(strings.Join(append(lines[:n], lines[n+1:]...), "\n"))
}
