package textproc_test

import (
	"slices"
	"testing"

	"assay/textproc"
)

// add records each surface form of stem as many times as its count.
func add(d *textproc.DisplayForms, stem string, counts map[string]int) {
	for form, n := range counts {
		for range n {
			d.Add(stem, form)
		}
	}
}

// TestDisplayFormsForm checks the rule in the doc comment of Form: the most
// frequent surface form wins, ties go to the smaller string, a stem never
// seen is returned as it is. Counts are added from a map, so the insertion
// order differs from run to run; each case is repeated to catch a result
// that depends on it.
func TestDisplayFormsForm(t *testing.T) {
	tests := []struct {
		name   string
		counts map[string]int
		want   string
	}{
		{"single form", map[string]int{"flooded": 1}, "flooded"},
		{"most frequent wins", map[string]int{"floods": 2, "flooded": 1, "flooding": 3}, "flooding"},
		{"most frequent wins over smaller string", map[string]int{"flood": 1, "floods": 2}, "floods"},
		{"tie broken by the smaller string", map[string]int{"floods": 2, "flooded": 2, "flood": 1}, "flooded"},
		{"three-way tie", map[string]int{"floodings": 4, "flooding": 4, "flooded": 4}, "flooded"},
		// Byte order (Go string comparison): "é" is 0xC3 0xA9, above "z" (0x7A).
		{"tie in byte order", map[string]int{"\u00e9t\u00e9": 1, "zeta": 1}, "zeta"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			for range 20 {
				var d textproc.DisplayForms
				add(&d, "flood", tt.counts)
				if got := d.Form("flood"); got != tt.want {
					t.Fatalf("Form = %q, want %q (counts %v)", got, tt.want, tt.counts)
				}
			}
		})
	}
}

func TestDisplayFormsUnseen(t *testing.T) {
	var zero textproc.DisplayForms // the zero value is ready to use
	if got := zero.Form("weir"); got != "weir" {
		t.Errorf("zero DisplayForms: Form(%q) = %q, want the stem itself", "weir", got)
	}
	if got := zero.Forms("weir"); len(got) != 0 {
		t.Errorf("zero DisplayForms: Forms(%q) = %v, want none", "weir", got)
	}
	var d textproc.DisplayForms
	d.Add("flood", "flooded")
	if got := d.Form("otter"); got != "otter" {
		t.Errorf("Form(unseen %q) = %q, want the stem itself", "otter", got)
	}
	if got := d.Forms("otter"); len(got) != 0 {
		t.Errorf("Forms(unseen %q) = %v, want none", "otter", got)
	}
}

// TestDisplayFormsForms checks the order of Forms: most frequent first, ties
// by the smaller string (doc comment of Forms).
func TestDisplayFormsForms(t *testing.T) {
	var d textproc.DisplayForms
	add(&d, "flood", map[string]int{"flood": 1, "floods": 2, "flooded": 2, "flooding": 3})
	add(&d, "otter", map[string]int{"otters": 5}) // another stem must not leak in
	want := []textproc.FormCount{
		{Form: "flooding", Count: 3},
		{Form: "flooded", Count: 2},
		{Form: "floods", Count: 2},
		{Form: "flood", Count: 1},
	}
	if got := d.Forms("flood"); !slices.Equal(got, want) {
		t.Errorf("Forms = %v, want %v", got, want)
	}
	if got, want := d.Form("flood"), want[0].Form; got != want {
		t.Errorf("Form = %q, want the first of Forms, %q", got, want)
	}
}

// TestDisplayFormsFromAnalyze feeds Analyze's output into DisplayForms, the
// way the index uses them. Stems from Debian python3-snowballstemmer 2.2.0
// (English): 'flooded', 'flooding', 'floods' all stem to 'flood'.
func TestDisplayFormsFromAnalyze(t *testing.T) {
	var d textproc.DisplayForms
	a := textproc.NewAnalyzer(textproc.Options{Lang: textproc.English})
	a.Analyze("Flooded fields. FLOODING again; flooded roads, floods.", d.Add)
	want := []textproc.FormCount{
		{Form: "flooded", Count: 2},
		{Form: "flooding", Count: 1},
		{Form: "floods", Count: 1},
	}
	if got := d.Forms("flood"); !slices.Equal(got, want) {
		t.Errorf("Forms(flood) = %v, want %v", got, want)
	}
	if got := d.Form("flood"); got != "flooded" {
		t.Errorf("Form(flood) = %q, want %q", got, "flooded")
	}
}
