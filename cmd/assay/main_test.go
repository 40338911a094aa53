package main

import (
	"bytes"
	"context"
	"encoding/json"
	"flag"
	"io/fs"
	"os"
	"path/filepath"
	"runtime"
	"strings"
	"testing"
	"testing/fstest"

	"github.com/spf13/pflag"

	"assay/corpus/demo"
)

var update = flag.Bool("update", false, "rewrite the golden files in testdata/")

// defaultFlags returns the pick flags as the command line sets them when
// none is given.
func defaultFlags(tb testing.TB) pickFlags {
	tb.Helper()
	var f pickFlags
	fl := pflag.NewFlagSet("pick", pflag.ContinueOnError)
	f.register(fl)
	if err := fl.Parse(nil); err != nil {
		tb.Fatal(err)
	}
	return f
}

// run executes assay in-process with a fixed version and returns the exit
// code, stdout and stderr.
func run(t *testing.T, args ...string) (int, string, string) {
	t.Helper()
	var out, errb bytes.Buffer
	app := &App{Out: &out, Err: &errb, Version: "test"}
	code := app.Run(context.Background(), args)
	return code, out.String(), errb.String()
}

// writeTree creates files under a new temporary folder.
func writeTree(t *testing.T, files map[string]string) string {
	t.Helper()
	dir := t.TempDir()
	for name, body := range files {
		p := filepath.Join(dir, filepath.FromSlash(name))
		if err := os.MkdirAll(filepath.Dir(p), 0o755); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(p, []byte(body), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	return dir
}

// smallCorpus is an invented corpus of three topics, small enough to read
// the golden output by eye.
var smallCorpus = map[string]string{
	"boats/ferry-timetable.txt": "Ferry timetable\nThe ferry leaves the harbour pier every hour. Ferry tickets are sold at the pier kiosk; the harbour master checks tickets.",
	"boats/ferry-repairs.txt":   "Ferry repairs\nThe ferry ramp at the pier needs repairs. The harbour crew will weld the ramp and paint the ferry hull.",
	"boats/harbour-notice.md":   "# Harbour notice\nBoats must not moor at the ferry pier. The harbour master fines boats moored at the pier overnight.",
	"garden/roses.txt":          "Pruning roses\nPrune roses in late winter. Cut each rose stem above a bud; feed the roses with compost in spring.",
	"garden/compost.txt":        "Making compost\nCompost needs green and brown waste. Turn the compost heap; worms turn garden waste into compost.",
	"garden/seeds.rst":          "Sowing seeds\n============\n\nSow seeds in spring in trays of compost. Keep the seeds moist; move seedlings to the garden when roses bloom.",
	"kitchen/bread.txt":         "Baking bread\nKnead the dough, let the dough rise, then bake the bread in a hot oven. Bread needs flour, water and yeast.",
	"kitchen/soup.txt":          "Winter soup\nChop onions and carrots, simmer them in stock, and bake bread to serve with the soup. Soup keeps for days.",
	"kitchen/oven.txt":          "Oven cleaning\nClean the oven after baking: the oven door and trays need soaking. Bread crumbs burn in a dirty oven.",
	"misc/notes.text":           "Meeting notes\nThe harbour crew and the kitchen staff met to plan the garden fete: bread, soup, roses and ferry rides.",
	"misc/image.png":            "\x89PNG\r\n\x1a\n\x00\x00",
	"misc/empty.txt":            "",
}

func TestGoldenSmallCorpus(t *testing.T) {
	dir := writeTree(t, smallCorpus)
	for _, format := range []string{"text", "json"} {
		t.Run(format, func(t *testing.T) {
			code, out, stderr := run(t, "pick", dir, "--docs", "4", "--terms", "6", "--format", format)
			if code != exitOK {
				t.Fatalf("exit %d: %s", code, stderr)
			}
			out = strings.ReplaceAll(out, dir, "DIR")
			golden := filepath.Join("testdata", "pick-small."+format+".golden")
			if *update {
				if err := os.WriteFile(golden, []byte(out), 0o644); err != nil {
					t.Fatal(err)
				}
			}
			want, err := os.ReadFile(golden)
			if err != nil {
				t.Fatalf("%v (run go test ./cmd/assay -run TestGolden -update)", err)
			}
			if out != string(want) {
				t.Errorf("output differs from %s (run with -update and review the diff):\n%s", golden, out)
			}
		})
	}
}

// TestJSONParsesBack decodes the JSON report and checks its schema and the
// consistency of its figures.
func TestJSONParsesBack(t *testing.T) {
	code, out, stderr := run(t, "demo", "--format", "json")
	if code != exitOK {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	var rep struct {
		Schema    string `json:"schema"`
		Exemplars []struct {
			ID    string  `json:"id"`
			Picks int     `json:"picks"`
			W     float64 `json:"weight"`
		} `json:"exemplars"`
		Terms []struct {
			Term, Stem string
			DF         int `json:"df"`
			Picks      int `json:"picks"`
		} `json:"terms"`
		Options struct {
			Docs, Terms, Rank int
		} `json:"options"`
		Figures struct {
			Documents struct {
				Count        int      `json:"count"`
				Captured     float64  `json:"captured"`
				BestCaptured float64  `json:"best_captured"`
				Eta          *float64 `json:"eta"`
			} `json:"documents"`
			Joint struct {
				RelErr       float64  `json:"relative_error"`
				Captured     float64  `json:"captured"`
				BestRelErr   float64  `json:"best_relative_error"`
				BestCaptured float64  `json:"best_captured"`
				Ratio        *float64 `json:"ratio"`
				Eta          *float64 `json:"eta"`
			} `json:"joint"`
			Values []float64 `json:"singular_values"`
		} `json:"figures"`
		Caution string `json:"caution"`
	}
	if err := json.Unmarshal([]byte(out), &rep); err != nil {
		t.Fatal(err)
	}
	if rep.Schema != reportSchema {
		t.Errorf("schema %q", rep.Schema)
	}
	sum := 0
	for _, e := range rep.Exemplars {
		sum += e.Picks
	}
	if sum != rep.Options.Docs {
		t.Errorf("exemplar picks sum to %d, want %d draws", sum, rep.Options.Docs)
	}
	sum = 0
	for _, x := range rep.Terms {
		sum += x.Picks
		if x.Term == "" || x.Stem == "" || x.DF < 1 {
			t.Errorf("bad term %+v", x)
		}
	}
	if sum != rep.Options.Terms {
		t.Errorf("term picks sum to %d, want %d draws", sum, rep.Options.Terms)
	}
	f := rep.Figures.Joint
	// captured = 1 − e², to the 6 significant digits printed.
	if d := f.Captured - (1 - f.RelErr*f.RelErr); d > 1e-5 || d < -1e-5 {
		t.Errorf("captured %g vs 1−e² = %g", f.Captured, 1-f.RelErr*f.RelErr)
	}
	// With r = c = k the CUR has rank at most k, so by Eckart–Young it
	// cannot beat the rank-k SVD: ρ ≥ 1 and η ≤ 1 (to the printed digits).
	if f.Ratio == nil || *f.Ratio < 1-1e-5 {
		t.Errorf("ratio %v below 1", f.Ratio)
	}
	if f.Eta == nil || *f.Eta > 1+1e-5 {
		t.Errorf("η %v above 1", f.Eta)
	}
	d := rep.Figures.Documents
	if d.Eta == nil || *d.Eta > 1+1e-5 || d.Captured > d.BestCaptured+1e-6 {
		t.Errorf("documents: captured %g, best %g, η %v: the span of r rows cannot beat the best r-dimensional one", d.Captured, d.BestCaptured, d.Eta)
	}
	if len(rep.Figures.Values) < max(rep.Options.Rank, d.Count) {
		t.Errorf("%d singular values for rank %d and %d documents", len(rep.Figures.Values), rep.Options.Rank, d.Count)
	}
	for i := 1; i < len(rep.Figures.Values); i++ {
		if rep.Figures.Values[i] > rep.Figures.Values[i-1] {
			t.Errorf("singular values not in decreasing order at %d", i)
		}
	}
	if !strings.Contains(rep.Caution, "does not replace the review") {
		t.Errorf("caution missing: %q", rep.Caution)
	}
}

// The same input, options and seed give byte-identical output for any
// GOMAXPROCS.
func TestDeterministicAcrossGOMAXPROCS(t *testing.T) {
	prev := runtime.GOMAXPROCS(0)
	defer runtime.GOMAXPROCS(prev)
	for _, method := range []string{"greedy", "pivot", "top", "leverage", "norm"} {
		var first string
		for _, p := range []int{1, 2, 8} {
			runtime.GOMAXPROCS(p)
			code, out, stderr := run(t, "demo", "--format", "json", "--method", method, "--docs", "15", "--terms", "30", "--seed", "5")
			if code != exitOK {
				t.Fatalf("%s, GOMAXPROCS %d: exit %d: %s", method, p, code, stderr)
			}
			if first == "" {
				first = out
			} else if out != first {
				t.Fatalf("%s: GOMAXPROCS %d output differs from GOMAXPROCS 1", method, p)
			}
		}
	}
}

// failingFS wraps a MapFS and fails to open one path, as an unreadable
// file does (tests may run as root, where file modes do not stop reads).
type failingFS struct {
	fstest.MapFS
	bad string
}

func (f failingFS) Open(name string) (fs.File, error) {
	if name == f.bad {
		return nil, &fs.PathError{Op: "open", Path: name, Err: fs.ErrPermission}
	}
	return f.MapFS.Open(name)
}

func TestBadInputListedAndSkipped(t *testing.T) {
	files := fstest.MapFS{}
	for name, body := range smallCorpus {
		files[name] = &fstest.MapFile{Data: []byte(body)}
	}
	files["bad/binary.txt"] = &fstest.MapFile{Data: []byte("abc\x00\x01\x02def")}
	files["bad/latin1.txt"] = &fstest.MapFile{Data: []byte("Caf\xe9 au lait, cr\xe8me br\xfbl\xe9e: the harbour caf\xe9 menu lists bread and soup and ferry rides.")}
	files["bad/locked.txt"] = &fstest.MapFile{Data: []byte("never read")}
	fsys := failingFS{MapFS: files, bad: "bad/locked.txt"}
	var out, errb bytes.Buffer
	app := &App{Out: &out, Err: &errb, Version: "test"}

	f := defaultFlags(t)
	f.format, f.docs, f.terms = "json", 3, 5
	opts, err := f.options("fixture")

	if err != nil {
		t.Fatal(err)
	}
	if err := runPick(context.Background(), app, fsys, opts); err != nil {
		t.Fatal(err)
	}
	var rep Report
	if err := json.Unmarshal(out.Bytes(), &rep); err != nil {
		t.Fatal(err)
	}
	reasons := map[string]string{}
	for _, s := range rep.Skipped {
		reasons[s.Path] = s.Reason
	}
	for path, want := range map[string]string{
		"bad/binary.txt": "binary",
		"bad/locked.txt": "permission denied",
		"misc/empty.txt": "empty file",
		"misc/image.png": "unsupported file type (.png)",
	} {
		if !strings.Contains(reasons[path], want) {
			t.Errorf("%s: reason %q, want it to contain %q", path, reasons[path], want)
		}
	}
	if _, skipped := reasons["bad/latin1.txt"]; skipped {
		t.Error("the Latin-1 file was skipped; it should be repaired and read")
	}
	if rep.Input.RepairedDocs != 1 {
		t.Errorf("%d documents repaired, want 1 (the Latin-1 file)", rep.Input.RepairedDocs)
	}
	if rep.Input.DocumentsRead != 11 {
		t.Errorf("%d documents read, want 10 good + 1 repaired", rep.Input.DocumentsRead)
	}
}

func TestExitCodes(t *testing.T) {
	empty := t.TempDir()
	onlyBad := writeTree(t, map[string]string{"a.bin": "\x00\x00", "b.txt": ""})
	good := writeTree(t, smallCorpus)
	cases := []struct {
		name string
		args []string
		code int
		msg  string
	}{
		{"empty folder", []string{"pick", empty}, exitFailure, "no readable documents"},
		{"only bad files", []string{"pick", onlyBad}, exitFailure, "2 files skipped"},
		{"missing folder", []string{"pick", filepath.Join(empty, "nope")}, exitFailure, "no such file"},
		{"file that is not a store", []string{"pick", filepath.Join(good, "kitchen", "bread.txt")}, exitFailure, "not an assay store"},
		{"no argument", []string{"pick"}, exitUsage, "one folder"},
		{"unknown flag", []string{"pick", good, "--nope"}, exitUsage, "unknown flag"},
		{"bad format", []string{"pick", good, "--format", "xml"}, exitUsage, "allowed: text, json"},
		{"bad docs", []string{"pick", good, "--docs", "0"}, exitUsage, "--docs"},
		{"bad max-df", []string{"pick", good, "--max-df", "1.5"}, exitUsage, "--max-df"},
		{"bad tf", []string{"pick", good, "--tf", "sqrt"}, exitUsage, "unknown tf"},
		{"demo with argument", []string{"demo", "x"}, exitUsage, "no arguments"},
		{"unknown command", []string{"frobnicate"}, exitUsage, "unknown command"},
		{"no terms left", []string{"pick", good, "--min-df", "50"}, exitFailure, "no terms left"},
		{"ok", []string{"pick", good}, exitOK, ""},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			code, _, stderr := run(t, c.args...)
			if code != c.code {
				t.Errorf("exit %d, want %d; stderr: %s", code, c.code, stderr)
			}
			if !strings.Contains(stderr, c.msg) {
				t.Errorf("stderr %q does not contain %q", stderr, c.msg)
			}
		})
	}
}

// Degenerate corpora: one document, identical documents, k above the rank.
// Each gives a clear message or a warning, never NaN (JSON encoding
// rejects NaN, so a clean exit proves there was none).
func TestDegenerateCorpora(t *testing.T) {
	one := writeTree(t, map[string]string{"only.txt": "River levels rose; the river gauge at the weir read high."})
	same := writeTree(t, map[string]string{
		"a.txt": "Otters and herons on the river bank.",
		"b.txt": "Otters and herons on the river bank.",
		"c.txt": "Otters and herons on the river bank.",
	})
	t.Run("single document", func(t *testing.T) {
		code, _, stderr := run(t, "pick", one, "--format", "json")
		if code != exitFailure || !strings.Contains(stderr, "no terms left") {
			t.Errorf("exit %d, stderr %q", code, stderr)
		}
		code, _, stderr = run(t, "pick", one, "--format", "json", "--max-df", "1")
		if code != exitOK {
			t.Errorf("with --max-df 1: exit %d, stderr %q", code, stderr)
		}
		if !strings.Contains(stderr, "lowered to 1") {
			t.Errorf("no warning that the rank was lowered: %q", stderr)
		}
	})
	t.Run("identical documents", func(t *testing.T) {
		code, out, stderr := run(t, "pick", same, "--format", "json", "--max-df", "1", "--rank", "3")
		if code != exitOK {
			t.Fatalf("exit %d: %s", code, stderr)
		}
		// Three copies collapse to one distinct document (rank 1).
		if !strings.Contains(stderr, "lowered to 1") || !strings.Contains(stderr, "ratio is undefined") {
			t.Errorf("warnings missing: %q", stderr)
		}
		if strings.Contains(out, "NaN") || strings.Contains(out, "Inf") {
			t.Error("NaN or Inf in output")
		}
	})
}

func TestHelpListsExamplesAndExitCodes(t *testing.T) {
	code, out, _ := run(t, "pick", "--help")
	if code != exitOK || !strings.Contains(out, "assay pick ./reports --docs 12 --terms 25") {
		t.Errorf("pick --help: exit %d, output lacks examples:\n%s", code, out)
	}
	_, out, _ = run(t, "--help")
	if !strings.Contains(out, "Exit codes") || !strings.Contains(out, "does not replace the review") {
		t.Errorf("root help lacks exit codes or the caution:\n%s", out)
	}
}

func TestDemoCorpusSize(t *testing.T) {
	n := 0
	err := fs.WalkDir(demo.FS(), ".", func(p string, d fs.DirEntry, err error) error {
		if err != nil {
			return err
		}
		if !d.IsDir() {
			n++
		}
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
	if n < 150 {
		t.Errorf("demo corpus has %d files, want at least 150", n)
	}
}
