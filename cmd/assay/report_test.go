package main

import (
	"bufio"
	"bytes"
	"encoding/csv"
	"encoding/json"
	"os"
	"path/filepath"
	"sort"
	"strconv"
	"strings"
	"testing"

	"golang.org/x/net/html"
)

// demoGoldenArgs is the run the golden reports of the demo corpus record.
var demoGoldenArgs = []string{"demo", "--docs", "12", "--terms", "15", "--seed", "3"}

// TestGoldenDemo compares every output format on the demo corpus with its
// golden file (regenerate with `go test ./cmd/assay -run TestGolden
// -update` and review the diff).
func TestGoldenDemo(t *testing.T) {
	cases := map[string][]string{
		"text":          {"--format", "text"},
		"json":          {"--format", "json"},
		"markdown":      {"--format", "markdown"},
		"csv-exemplars": {"--format", "csv", "--table", "exemplars"},
		"csv-terms":     {"--format", "csv", "--table", "terms"},
		"csv-groups":    {"--format", "csv", "--table", "groups"},
		"csv-missed":    {"--format", "csv", "--table", "missed"},
		"csv-curve":     {"--format", "csv", "--table", "curve"},
	}
	names := make([]string, 0, len(cases))
	for n := range cases {
		names = append(names, n)
	}
	sort.Strings(names)
	for _, name := range names {
		t.Run(name, func(t *testing.T) {
			code, out, stderr := run(t, append(append([]string{}, demoGoldenArgs...), cases[name]...)...)
			if code != exitOK {
				t.Fatalf("exit %d: %s", code, stderr)
			}
			golden := filepath.Join("testdata", "demo-"+name+".golden")
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
				t.Errorf("output differs from %s (run with -update and review the diff)", golden)
			}
		})
	}
}

// TestJSONSchema decodes the report into its own type with unknown fields
// refused (so the README's field list and the type agree), and checks the
// list fields are present as arrays.
func TestJSONSchema(t *testing.T) {
	code, out, stderr := run(t, append(append([]string{}, demoGoldenArgs...), "--format", "json")...)
	if code != exitOK {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	dec := json.NewDecoder(strings.NewReader(out))
	dec.DisallowUnknownFields()
	var rep Report
	if err := dec.Decode(&rep); err != nil {
		t.Fatal(err)
	}
	var raw map[string]any
	json.Unmarshal([]byte(out), &raw)
	for _, key := range []string{"exemplars", "terms", "missed", "curve", "skipped", "warnings"} {
		if _, ok := raw[key].([]any); !ok {
			t.Errorf("%s is %T, want an array", key, raw[key])
		}
	}
	if rep.Schema != reportSchema || len(rep.Curve) != rep.Options.CurveMax || len(rep.Missed) != rep.Options.Missed {
		t.Errorf("schema %q, curve %d of %d, missed %d of %d", rep.Schema, len(rep.Curve), rep.Options.CurveMax, len(rep.Missed), rep.Options.Missed)
	}
	sizes := 0
	for _, e := range rep.Exemplars {
		sizes += e.Group.Size
		if len(e.Group.KeyTerms) == 0 {
			t.Errorf("%s: no key terms", e.ID)
		}
	}
	if sizes != rep.Input.DocumentsUsed {
		t.Errorf("groups hold %d documents, want every one of the %d used", sizes, rep.Input.DocumentsUsed)
	}
}

// demoTopics reads the scenario's topic of every demo document from the
// test-only manifest testdata/demo-topics.tsv (the folder a document sits
// in; "other" for the one-off outliers and the multilingual folder).
func demoTopics(t *testing.T) map[string]string {
	t.Helper()
	f, err := os.Open(filepath.Join("testdata", "demo-topics.tsv"))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	topics := map[string]string{}
	sc := bufio.NewScanner(f)
	for sc.Scan() {
		id, topic, ok := strings.Cut(sc.Text(), "\t")
		if ok {
			topics[id] = topic
		}
	}
	return topics
}

// groupsOf reads the CSV groups table: document → exemplar.
func groupsOf(t *testing.T, out string) map[string]string {
	t.Helper()
	rows, err := csv.NewReader(strings.NewReader(out)).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	if len(rows) == 0 || strings.Join(rows[0], ",") != "id,language,exemplar,score,coverage" {
		t.Fatalf("groups header %v", rows[:1])
	}
	g := map[string]string{}
	for _, r := range rows[1:] {
		g[r[0]] = r[2]
	}
	return g
}

// majorities returns the majority label of every group (ties: the
// smaller label).
func majorities(groups map[string]string, label func(string) string) map[string]string {
	counts := map[string]map[string]int{}
	for doc, ex := range groups {
		if counts[ex] == nil {
			counts[ex] = map[string]int{}
		}
		counts[ex][label(doc)]++
	}
	out := map[string]string{}
	for ex, c := range counts {
		best, bestN := "", -1
		for l, n := range c {
			if n > bestN || (n == bestN && l < best) {
				best, bestN = l, n
			}
		}
		out[ex] = best
	}
	return out
}

// Every topic of the scenario is the majority topic of at least one group
// when 20 documents are picked (the demo has 10 topics).
func TestGroupsCoverTopics(t *testing.T) {
	topics := demoTopics(t)
	code, out, stderr := run(t, "demo", "--docs", "20", "--format", "csv", "--table", "groups")
	if code != exitOK {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	groups := groupsOf(t, out)
	if len(groups) != len(topics) {
		t.Fatalf("%d documents in groups, %d in the manifest", len(groups), len(topics))
	}
	have := map[string]bool{}
	for _, topic := range majorities(groups, func(id string) string { return topics[id] }) {
		have[topic] = true
	}
	for _, topic := range topics {
		if topic != "other" && !have[topic] {
			t.Errorf("topic %s is the majority of no group", topic)
		}
	}
}

// The curve: non-decreasing for the deterministic methods, and its point
// at r documents equals the documents figure of a run with r documents.
func TestCurve(t *testing.T) {
	for _, method := range []string{"greedy", "top"} {
		r := runJSONReport(t, "demo", "--method", method, "--docs", "8", "--curve-max", "24")
		if len(r.Curve) != 24 {
			t.Fatalf("%s: %d curve points", method, len(r.Curve))
		}
		for i := 1; i < len(r.Curve); i++ {
			if r.Curve[i].Captured < r.Curve[i-1].Captured {
				t.Errorf("%s: the curve falls at %d documents", method, i+1)
			}
			if r.Curve[i].Captured > r.Curve[i].BestCaptured+1e-6 {
				t.Errorf("%s: %d documents beat the best %d-dimensional summary", method, i+1, i+1)
			}
		}
		if got, want := r.Curve[7].Captured, r.Figures.Documents.Captured; got != want {
			t.Errorf("%s: curve at 8 documents %v, the run's figure %v", method, got, want)
		}
	}
}

func runJSONReport(t *testing.T, args ...string) Report {
	t.Helper()
	code, out, stderr := run(t, append(args, "--format", "json")...)
	if code != exitOK {
		t.Fatalf("%v: exit %d: %s", args, code, stderr)
	}
	var rep Report
	if err := json.Unmarshal([]byte(out), &rep); err != nil {
		t.Fatal(err)
	}
	return rep
}

// The HTML report is one self-contained page: its sections and four
// inline SVG charts are there, and nothing is loaded from elsewhere (no
// script, no external src or href, no @import).
func TestHTMLReport(t *testing.T) {
	code, out, stderr := run(t, "demo", "--format", "html")
	if code != exitOK {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	doc, err := html.Parse(strings.NewReader(out))
	if err != nil {
		t.Fatal(err)
	}
	sections, svgs := map[string]bool{}, 0
	var walk func(*html.Node)
	walk = func(n *html.Node) {
		if n.Type == html.ElementNode {
			switch n.Data {
			case "section":
				for _, a := range n.Attr {
					if a.Key == "id" {
						sections[a.Val] = true
					}
				}
			case "svg":
				svgs++
			case "script", "link", "iframe", "img":
				t.Errorf("<%s> in a self-contained report", n.Data)
			}
			for _, a := range n.Attr {
				if (a.Key == "src" || a.Key == "href") && strings.Contains(a.Val, "//") {
					t.Errorf("external reference %s=%q", a.Key, a.Val)
				}
			}
		}
		for c := n.FirstChild; c != nil; c = c.NextSibling {
			walk(c)
		}
	}
	walk(doc)
	for _, id := range []string{"summary", "exemplars", "terms", "missed", "curve", "skipped", "run"} {
		if !sections[id] {
			t.Errorf("section %q missing", id)
		}
	}
	if svgs != 4 {
		t.Errorf("%d SVG charts, want 4", svgs)
	}
	if strings.Contains(out, "@import") || strings.Contains(out, "url(http") {
		t.Error("the style loads something from elsewhere")
	}
	if !strings.Contains(out, cautionSampling) {
		t.Error("the caution is missing")
	}
}

// --out writes the report to a file and nothing to standard output.
func TestOutFile(t *testing.T) {
	path := filepath.Join(t.TempDir(), "r.md")
	code, out, stderr := run(t, "demo", "--format", "markdown", "--out", path)
	if code != exitOK || out != "" {
		t.Fatalf("exit %d, stdout %q, stderr %s", code, out, stderr)
	}
	b, err := os.ReadFile(path)
	if err != nil || !bytes.HasPrefix(b, []byte("# Exemplar documents")) {
		t.Fatalf("file: %v %q", err, b[:min(40, len(b))])
	}
	if code, _, _ := run(t, "demo", "--format", "text", "--table", "curve"); code != exitUsage {
		t.Errorf("--table without csv: exit %d", code)
	}
}

// TestBrownGenres: on the Brown corpus (fetched by bench/fetch-corpora.sh;
// set ASSAY_BROWN to its folder of .txt files), 30 picked documents span at
// least 10 of the 15 genres (the second letter of a file name is its
// genre). The majority genre of each group is logged.
func TestBrownGenres(t *testing.T) {
	dir := os.Getenv("ASSAY_BROWN")
	if dir == "" {
		t.Skip("set ASSAY_BROWN to the Brown corpus folder (bench/fetch-corpora.sh writes it to ~/.cache/assay-corpora/brown)")
	}
	r := runJSONReport(t, "pick", dir, "--docs", "30")
	genre := func(id string) string { return string(filepath.Base(id)[1]) }
	genres := map[string]bool{}
	for _, e := range r.Exemplars {
		genres[genre(e.ID)] = true
	}
	if len(genres) < 10 {
		t.Errorf("30 exemplars span %d genres, want at least 10", len(genres))
	}
	code, out, _ := run(t, "pick", dir, "--docs", "30", "--format", "csv", "--table", "groups")
	if code != exitOK {
		t.Fatal("groups table failed")
	}
	maj := majorities(groupsOf(t, out), genre)
	var lines []string
	for ex, g := range maj {
		lines = append(lines, ex+" → "+g)
	}
	sort.Strings(lines)
	t.Logf("%d exemplar genres; group majority genres:\n%s", len(genres), strings.Join(lines, "\n"))
	t.Logf("distinct majority genres: %s", strconv.Itoa(len(distinct(maj))))
}

func distinct(m map[string]string) map[string]bool {
	out := map[string]bool{}
	for _, v := range m {
		out[v] = true
	}
	return out
}

// TestSpamAssassinPicks: on the SpamAssassin public corpus laid out as
// .eml files (bench/fetch-corpora.sh writes ~/.cache/assay-corpora/
// spamassassin-eml; set ASSAY_SPAMASSASSIN_EML to it), the run reads at
// least 99% of the messages and 30 picked documents include both ham
// (easy-ham-*, hard-ham-*) and spam (spam-*) messages.
func TestSpamAssassinPicks(t *testing.T) {
	dir := os.Getenv("ASSAY_SPAMASSASSIN_EML")
	if dir == "" {
		t.Skip("set ASSAY_SPAMASSASSIN_EML to the .eml folder that bench/fetch-corpora.sh writes")
	}
	r := runJSONReport(t, "pick", dir, "--docs", "30", "--curve-max", "30")
	files := 0
	filepath.WalkDir(dir, func(_ string, d os.DirEntry, err error) error {
		if err == nil && !d.IsDir() && strings.HasSuffix(d.Name(), ".eml") {
			files++
		}
		return nil
	})
	read := r.Input.DocumentsRead
	if float64(read) < 0.99*float64(files) {
		t.Errorf("%d documents read from %d messages, want at least 99%%", read, files)
	}
	ham, spam := 0, 0
	for _, e := range r.Exemplars {
		if strings.HasPrefix(e.ID, "spam-") {
			spam++
		} else {
			ham++
		}
	}
	if ham == 0 || spam == 0 {
		t.Errorf("30 picks hold %d ham and %d spam messages, want both", ham, spam)
	}
	t.Logf("%d messages, %d documents read (attachments included), %d skipped; picks: %d ham, %d spam; η_docs %v",
		files, read, r.Input.FilesSkipped, ham, spam, *r.Figures.Documents.Eta)
}

// Colour only on a terminal and never with NO_COLOR; the words are the
// same either way, and the width of a terminal is honoured.
func TestTextColourAndWidth(t *testing.T) {
	render := func(app *App) string {
		var out, errb bytes.Buffer
		app.Out, app.Err, app.Version = &out, &errb, "test"
		if code := app.Run(t.Context(), []string{"demo", "--docs", "5"}); code != exitOK {
			t.Fatalf("exit %d: %s", code, errb.String())
		}
		return out.String()
	}
	plain := render(&App{})
	colour := render(&App{OutTerminal: true, Width: 100})
	noColour := render(&App{OutTerminal: true, Width: 100, NoColor: true})
	narrow := render(&App{OutTerminal: true, Width: 60, NoColor: true})
	if strings.Contains(plain, "\x1b[") || strings.Contains(noColour, "\x1b[") {
		t.Error("escape codes without a terminal or with NO_COLOR")
	}
	if !strings.Contains(colour, "\x1b[1m") {
		t.Error("no bold headings on a terminal")
	}
	if strings.ReplaceAll(strings.ReplaceAll(colour, "\x1b[1m", ""), "\x1b[0m", "") != noColour {
		t.Error("colour changed the words")
	}
	for _, line := range strings.Split(narrow, "\n") {
		if strings.HasPrefix(line, "     key terms:") && len([]rune(line)) > 60 {
			t.Errorf("line wider than the 60-column terminal: %q", line)
		}
	}
}

// The output does not depend on --jobs (the pipeline restores walk order).
func TestJobsDoNotChangeOutput(t *testing.T) {
	var first string
	for _, jobs := range []string{"1", "3", "8"} {
		code, out, stderr := run(t, "demo", "--format", "json", "--jobs", jobs)
		if code != exitOK {
			t.Fatalf("--jobs %s: exit %d: %s", jobs, code, stderr)
		}
		if first == "" {
			first = out
		} else if out != first {
			t.Fatalf("--jobs %s changes the output", jobs)
		}
	}
	if code, _, _ := run(t, "demo", "--jobs", "0"); code != exitUsage {
		t.Errorf("--jobs 0: exit %d, want 2", code)
	}
}
