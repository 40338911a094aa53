package main

import (
	"context"
	"encoding/json"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"

	"assay/sparsemat"
)

// debianPython is the interpreter Debian's python3-scipy installs into.
const debianPython = "/usr/bin/python3"

// TestExportReadByScipy writes a corpus with `assay export` and reads the
// Matrix Market file back with scipy.io.mmread (Debian python3-scipy), an
// independent reader of the format; every value must round-trip exactly,
// since the writer prints the shortest decimal that parses to the same
// float64. The terms and documents files must line up with the matrix.
func TestExportReadByScipy(t *testing.T) {
	if err := exec.Command(debianPython, "-c", "import scipy.io").Run(); err != nil {
		t.Skipf("needs %s with scipy (apt-get install python3-scipy): %v", debianPython, err)
	}
	dir := writeTree(t, smallCorpus)
	prefix := filepath.Join(t.TempDir(), "small")
	code, out, stderr := run(t, "export", dir, "--out", prefix)
	if code != exitOK {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	if !strings.Contains(out, "10 documents × 84 terms") {
		t.Errorf("summary line: %q", out)
	}
	script := `
import json, sys, scipy.io
a = scipy.io.mmread(sys.argv[1]).tocsr()
a.sort_indices()
print(json.dumps({"shape": a.shape, "indptr": a.indptr.tolist(), "indices": a.indices.tolist(), "data": [repr(float(x)) for x in a.data]}))
`
	raw, err := exec.Command(debianPython, "-c", script, prefix+".mtx").Output()
	if err != nil {
		t.Fatalf("scipy: %v", err)
	}
	var got struct {
		Shape   [2]int   `json:"shape"`
		Indptr  []int    `json:"indptr"`
		Indices []int    `json:"indices"`
		Data    []string `json:"data"`
	}
	if err := json.Unmarshal(raw, &got); err != nil {
		t.Fatal(err)
	}
	f := defaultFlags(t)
	opts, _ := f.options(dir)
	fsys, _ := openFolder(dir)
	an, err := analyze(context.Background(), fsys, opts)
	if err != nil {
		t.Fatal(err)
	}
	want := sparsemat.Weight(an.counts, opts.Weight).RawMatrix()
	if got.Shape != [2]int{want.I, want.J} {
		t.Fatalf("shape %v, want %d×%d", got.Shape, want.I, want.J)
	}
	for i, p := range want.Indptr {
		if got.Indptr[i] != p {
			t.Fatalf("row pointer %d: %d, want %d", i, got.Indptr[i], p)
		}
	}
	for k, j := range want.Ind {
		if got.Indices[k] != j || got.Data[k] != pyRepr(want.Data[k]) {
			t.Fatalf("entry %d: column %d value %s, want %d %s", k, got.Indices[k], got.Data[k], j, pyRepr(want.Data[k]))
		}
	}
	for _, name := range []string{".terms.tsv", ".docs.tsv"} {
		b, err := os.ReadFile(prefix + name)
		if err != nil {
			t.Fatal(err)
		}
		lines := strings.Split(strings.TrimSuffix(string(b), "\n"), "\n")
		n := want.J
		if name == ".docs.tsv" {
			n = want.I
		}
		if len(lines) != n {
			t.Errorf("%s has %d lines, want %d", name, len(lines), n)
		}
	}
}

// pyRepr formats v as Python's repr of a float does for these values (the
// shortest round-tripping decimal; both use it).
func pyRepr(v float64) string {
	b, _ := json.Marshal(v)
	s := string(b)
	if !strings.ContainsAny(s, ".e") {
		s += ".0"
	}
	return s
}

func TestExportUsage(t *testing.T) {
	dir := writeTree(t, smallCorpus)
	if code, _, stderr := run(t, "export", dir); code != exitUsage || !strings.Contains(stderr, "--out") {
		t.Errorf("no --out: exit %d, %q", code, stderr)
	}
	if code, _, _ := run(t, "export", dir, "--out", "x", "--format", "csv"); code != exitUsage {
		t.Errorf("bad format: exit %d", code)
	}
	if code, _, _ := run(t, "export", filepath.Join(dir, "nope"), "--out", filepath.Join(t.TempDir(), "x")); code != exitFailure {
		t.Errorf("missing folder: exit %d", code)
	}
}
