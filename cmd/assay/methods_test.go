package main

import (
	"encoding/json"
	"strings"
	"testing"
)

type smallReport struct {
	Options struct {
		Docs, Terms, Rank int
		Method            string `json:"method"`
	} `json:"options"`
	Exemplars []struct {
		ID         string   `json:"id"`
		Duplicates []string `json:"duplicates"`
	} `json:"exemplars"`
	Input struct {
		Used     int `json:"documents_used"`
		Distinct int `json:"documents_distinct"`
	} `json:"input"`
	Figures struct {
		Documents struct {
			Count    int     `json:"count"`
			Captured float64 `json:"captured"`
		} `json:"documents"`
		CoreRank int `json:"core_rank"`
	} `json:"figures"`
	Warnings []string `json:"warnings"`
}

func runJSON(t *testing.T, args ...string) smallReport {
	t.Helper()
	code, out, stderr := run(t, append(args, "--format", "json")...)
	if code != exitOK {
		t.Fatalf("%v: exit %d: %s", args, code, stderr)
	}
	var r smallReport
	if err := json.Unmarshal([]byte(out), &r); err != nil {
		t.Fatal(err)
	}
	return r
}

// Every method runs from the command line and reports what it was asked.
func TestEveryMethod(t *testing.T) {
	for _, m := range []string{"greedy", "pivot", "top", "leverage", "norm"} {
		for _, core := range []string{"optimal", "intersection"} {
			r := runJSON(t, "demo", "--method", m, "--core", core, "--docs", "8", "--terms", "12")
			if r.Options.Method != m || len(r.Exemplars) == 0 || len(r.Exemplars) > 8 {
				t.Errorf("%s/%s: method %q, %d exemplars", m, core, r.Options.Method, len(r.Exemplars))
			}
		}
	}
}

// --accuracy ε sets c = r = ⌈k·ln k/ε²⌉: with k = 4 and ε = 0.5,
// ⌈4·ln 4/0.25⌉ = ⌈22.18⌉ = 23 (arithmetic by hand).
func TestAccuracySizing(t *testing.T) {
	r := runJSON(t, "demo", "--rank", "4", "--accuracy", "0.5")
	if r.Options.Docs != 23 || r.Options.Terms != 23 {
		t.Errorf("docs %d terms %d, want 23 and 23", r.Options.Docs, r.Options.Terms)
	}
	if !strings.Contains(strings.Join(r.Warnings, " "), "⌈k·ln k/ε²⌉ = 23") {
		t.Errorf("the sizing is not stated: %v", r.Warnings)
	}
}

// --target-share finds the smallest r whose picks reach the share: the
// answer must reach it and r − 1 must not (checked by running both).
func TestTargetShare(t *testing.T) {
	const target = 0.3
	r := runJSON(t, "demo", "--target-share", "0.3")
	n := r.Figures.Documents.Count
	if r.Figures.Documents.Captured < target {
		t.Fatalf("%d documents capture %g, below the target %g", n, r.Figures.Documents.Captured, target)
	}
	prev := runJSON(t, "demo", "--docs", itoa(n-1))
	if prev.Figures.Documents.Captured >= target {
		t.Errorf("%d documents already capture %g ≥ %g", n-1, prev.Figures.Documents.Captured, target)
	}
	code, _, stderr := run(t, "demo", "--target-share", "1.5")
	if code != exitUsage || !strings.Contains(stderr, "--target-share") {
		t.Errorf("target 1.5: exit %d, %q", code, stderr)
	}
}

func itoa(n int) string {
	b, _ := json.Marshal(n)
	return string(b)
}

// Exact duplicates are merged before picking: the demo corpus holds two
// files copied byte for byte, so it has two fewer distinct documents, and
// an exemplar that has a copy lists it.
func TestDuplicatesCollapsed(t *testing.T) {
	r := runJSON(t, "demo", "--docs", "164", "--terms", "20", "--method", "top", "--rank", "20")
	if r.Input.Used-r.Input.Distinct != 2 {
		t.Fatalf("%d used, %d distinct: want the two copies merged", r.Input.Used, r.Input.Distinct)
	}
	seen := map[string]bool{}
	dups := 0
	for _, e := range r.Exemplars {
		if seen[e.ID] {
			t.Errorf("%s picked twice", e.ID)
		}
		seen[e.ID] = true
		dups += len(e.Duplicates)
		// The copies are named "x.txt" and "x-copy.txt"; the first in walk
		// order ("x-copy.txt": '-' sorts before '.') stands for both.
		for _, d := range e.Duplicates {
			if strings.TrimSuffix(e.ID, "-copy.txt")+".txt" != d {
				t.Errorf("%s lists %s as a copy", e.ID, d)
			}
		}
	}
	if dups != 2 {
		t.Errorf("%d duplicates listed under the exemplars, want 2", dups)
	}
}

// With --truncate-core the core has rank at most k.
func TestTruncateCore(t *testing.T) {
	r := runJSON(t, "demo", "--docs", "20", "--terms", "20", "--rank", "5", "--truncate-core")
	if r.Figures.CoreRank > 5 {
		t.Errorf("core rank %d above k = 5", r.Figures.CoreRank)
	}
	code, _, _ := run(t, "demo", "--truncate-core", "--core", "intersection")
	if code != exitUsage {
		t.Errorf("--truncate-core with the intersection core: exit %d, want 2", code)
	}
}
