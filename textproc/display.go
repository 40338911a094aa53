package textproc

import (
	"slices"
	"sort"
)

// DisplayForms counts the surface forms seen for each index term, to show
// every term as a real word. Terms are keyed with their language (see
// [SplitTerm]), so the forms of "fr:maison" are French surface words only.
// The zero value is ready to use.
type DisplayForms struct {
	index map[string]int32 // stem -> index in sets
	sets  []formSet
}

// formSet holds the forms of one stem: most stems have one or two, so the
// first is kept inline and the others in a short list (a map per stem
// would take several times the memory).
type formSet struct {
	first FormCount
	more  []FormCount
}

// Add records one occurrence of surface as a form of stem.
func (d *DisplayForms) Add(stem, surface string) { d.AddN(stem, surface, 1) }

// AddN records n occurrences of surface as a form of stem.
func (d *DisplayForms) AddN(stem, surface string, n int) {
	i, ok := d.index[stem]
	if !ok {
		if d.index == nil {
			d.index = make(map[string]int32)
		}
		i = int32(len(d.sets))
		d.index[stem] = i
		d.sets = append(d.sets, formSet{first: FormCount{Form: surface, Count: n}})
		return
	}
	d.sets[i].add(surface, n)
}

// add records n occurrences of surface in a set that has a first form.
func (set *formSet) add(surface string, n int) {
	if set.first.Form == surface {
		set.first.Count += n
		return
	}
	for k := range set.more {
		if set.more[k].Form == surface {
			set.more[k].Count += n
			return
		}
	}
	set.more = append(set.more, FormCount{Form: surface, Count: n})
}

// FormsByID counts surface forms under term IDs, the numbers that
// Options.TermID gives (see [Analyzer.AddFormsByID]), where a
// [DisplayForms] counts them under the terms. Summing the forms of
// several analyzers then costs an index into a slice for each distinct
// form, not a look-up of its term in a map; [FormsByID.AddTo] hands the
// terms a caller keeps to a DisplayForms. The zero value is ready to use.
type FormsByID struct {
	sets []formSet // by term ID; a set with no form has first.Count 0
}

// AddN records n > 0 occurrences of surface as a form of the term with ID
// id >= 0.
func (f *FormsByID) AddN(id int32, surface string, n int) {
	f.reserve(id)
	set := &f.sets[id]
	if set.first.Count == 0 {
		set.first = FormCount{Form: surface, Count: n}
		return
	}
	set.add(surface, n)
}

// reserve makes room for the IDs up to id.
func (f *FormsByID) reserve(id int32) {
	if int(id) >= len(f.sets) {
		f.sets = slices.Grow(f.sets, int(id)+1-len(f.sets))
		f.sets = f.sets[:cap(f.sets)] // never shortened: the tail is zero
	}
}

// AddTo adds to d the forms of terms[k] counted under ids[k], for every k
// (the terms must be distinct, and so must the IDs). The counts are sums,
// as with [DisplayForms.AddN].
func (f *FormsByID) AddTo(d *DisplayForms, terms []string, ids []int32) {
	if d.index == nil {
		d.index = make(map[string]int32, len(terms))
		d.sets = slices.Grow(d.sets, len(terms))
	}
	for k, term := range terms {
		id := ids[k]
		if int(id) >= len(f.sets) || f.sets[id].first.Count == 0 {
			continue
		}
		set := &f.sets[id]
		if _, ok := d.index[term]; !ok {
			d.index[term] = int32(len(d.sets))
			d.sets = append(d.sets, formSet{first: set.first, more: slices.Clone(set.more)})
			continue
		}
		d.AddN(term, set.first.Form, set.first.Count)
		for _, fc := range set.more {
			d.AddN(term, fc.Form, fc.Count)
		}
	}
}

// Form returns the most frequent surface form of stem, ties broken by the
// smaller string; a stem never seen is returned bare, without its language
// key (see [SplitTerm]).
func (d *DisplayForms) Form(stem string) string {
	_, best := SplitTerm(stem)
	i, ok := d.index[stem]
	if !ok {
		return best
	}
	set := &d.sets[i]
	bestN := 0
	for k := -1; k < len(set.more); k++ {
		f := set.first
		if k >= 0 {
			f = set.more[k]
		}
		if f.Count > bestN || (f.Count == bestN && f.Form < best) {
			best, bestN = f.Form, f.Count
		}
	}
	return best
}

// Forms returns every surface form of stem with its count, most frequent
// first, ties by the smaller string.
func (d *DisplayForms) Forms(stem string) []FormCount {
	i, ok := d.index[stem]
	if !ok {
		return []FormCount{}
	}
	set := &d.sets[i]
	out := append([]FormCount{set.first}, set.more...)
	sort.Slice(out, func(i, j int) bool {
		if out[i].Count != out[j].Count {
			return out[i].Count > out[j].Count
		}
		return out[i].Form < out[j].Form
	})
	return out
}

// Len returns the number of stems with a form.
func (d *DisplayForms) Len() int { return len(d.sets) }

// FormCount is one surface form of a stem and how often it was seen.
type FormCount struct {
	Form  string
	Count int
}
