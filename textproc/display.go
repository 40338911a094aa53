package textproc

import "sort"

// DisplayForms counts the surface forms seen for each index term, to show
// every term as a real word. Terms are keyed with their language (see
// [SplitTerm]), so the forms of "fr:maison" are French surface words only.
// The zero value is ready to use.
type DisplayForms struct {
	forms map[string]map[string]int
}

// Add records one occurrence of surface as a form of stem.
func (d *DisplayForms) Add(stem, surface string) { d.AddN(stem, surface, 1) }

// AddN records n occurrences of surface as a form of stem.
func (d *DisplayForms) AddN(stem, surface string, n int) {
	if d.forms == nil {
		d.forms = make(map[string]map[string]int)
	}
	m := d.forms[stem]
	if m == nil {
		m = make(map[string]int, 1)
		d.forms[stem] = m
	}
	m[surface] += n
}

// Form returns the most frequent surface form of stem, ties broken by the
// smaller string; a stem never seen is returned bare, without its language
// key (see [SplitTerm]).
func (d *DisplayForms) Form(stem string) string {
	_, best := SplitTerm(stem)
	bestN := 0
	for s, n := range d.forms[stem] {
		if n > bestN || (n == bestN && s < best) {
			best, bestN = s, n
		}
	}
	return best
}

// Forms returns every surface form of stem with its count, most frequent
// first, ties by the smaller string.
func (d *DisplayForms) Forms(stem string) []FormCount {
	out := make([]FormCount, 0, len(d.forms[stem]))
	for s, n := range d.forms[stem] {
		out = append(out, FormCount{Form: s, Count: n})
	}
	sort.Slice(out, func(i, j int) bool {
		if out[i].Count != out[j].Count {
			return out[i].Count > out[j].Count
		}
		return out[i].Form < out[j].Form
	})
	return out
}

// FormCount is one surface form of a stem and how often it was seen.
type FormCount struct {
	Form  string
	Count int
}
