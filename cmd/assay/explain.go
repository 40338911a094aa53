package main

import (
	"cmp"
	"slices"
	"sort"

	"github.com/james-bowman/sparse"

	selection "assay/select"
	"assay/sparsemat"
)

// Sizes of the per-group and per-document lists in the report.
const (
	groupKeyTerms = 5
	groupMembers  = 3
	missedTerms   = 5
	coverageBins  = 10
)

// view maps rows of the collapsed matrix back to documents.
type view struct {
	an       *analysis
	a        *sparse.CSR // collapsed weighted matrix
	groups   [][]int     // collapsed row -> rows of the full matrix (nil: no copies)
	survivor func(row int) int
}

// doc returns the document of a collapsed row.
func (v view) doc(row int) docInfo { return v.an.docs[v.an.counts.Rows[v.survivor(row)]] }

// copies returns the IDs of the exact copies a collapsed row stands for,
// besides its own document.
func (v view) copies(row int) []string {
	out := []string{}
	if v.groups != nil {
		for _, r := range v.groups[row][1:] {
			out = append(out, v.an.docs[v.an.counts.Rows[r]].ID)
		}
	}
	return out
}

// weight is how many documents a collapsed row stands for.
func (v view) weight(row int) int {
	if v.groups == nil {
		return 1
	}
	return len(v.groups[row])
}

// groupsOf describes the group of every exemplar, in the order of
// cur.Rows.
func (v view) groupsOf(cur *selection.CUR, ex selection.Explanation) []groupOut {
	r := len(cur.Rows)
	_, n := v.a.Dims()
	out := make([]groupOut, r)
	members := make([][]int, r)
	mass := make([]float64, r)
	termSum := make([][]float64, r)
	for j := range r {
		termSum[j] = make([]float64, n)
	}
	raw := v.a.RawMatrix()
	total := sparsemat.FrobeniusSq(v.a)
	for i, g := range ex.Group {
		if g < 0 {
			continue
		}
		out[g].Size += v.weight(i)
		members[g] = append(members[g], i)
		for k := raw.Indptr[i]; k < raw.Indptr[i+1]; k++ {
			w := raw.Data[k]
			mass[g] += w * w
			termSum[g][raw.Ind[k]] += w
		}
	}
	for j, p := range cur.Rows {
		out[j].Share = num(mass[j] / total)
		out[j].KeyTerms = v.topTerms(termSum[j], groupKeyTerms)
		ms := members[j]
		slices.SortStableFunc(ms, func(x, y int) int {
			if c := cmp.Compare(ex.Score[y], ex.Score[x]); c != 0 {
				return c
			}
			return cmp.Compare(v.doc(x).ID, v.doc(y).ID)
		})
		out[j].Members = []string{}
		for _, i := range ms {
			if i == p.Index {
				continue
			}
			if len(out[j].Members) == groupMembers {
				break
			}
			out[j].Members = append(out[j].Members, v.doc(i).ID)
		}
	}
	return out
}

// topTerms returns the display words of the count heaviest terms of a
// dense term-weight vector (ties: the smaller column).
func (v view) topTerms(weights []float64, count int) []string {
	idx := make([]int, 0, len(weights))
	for j, w := range weights {
		if w > 0 {
			idx = append(idx, j)
		}
	}
	slices.SortStableFunc(idx, func(x, y int) int { return cmp.Compare(weights[y], weights[x]) })
	out := []string{}
	for _, j := range idx[:min(count, len(idx))] {
		out = append(out, v.an.display.Form(v.an.counts.Terms[j]))
	}
	return out
}

// rowTerms returns the display words of the count heaviest terms of a
// collapsed row.
func (v view) rowTerms(row, count int) []string {
	raw := v.a.RawMatrix()
	_, n := v.a.Dims()
	w := make([]float64, n)
	for k := raw.Indptr[row]; k < raw.Indptr[row+1]; k++ {
		w[raw.Ind[k]] = raw.Data[k]
	}
	return v.topTerms(w, count)
}

// missed lists the count documents the exemplars cover least, exemplars
// left out, lowest coverage first (ties by ID).
func (v view) missed(cur *selection.CUR, ex selection.Explanation, count int) []missedOut {
	picked := map[int]bool{}
	for _, p := range cur.Rows {
		picked[p.Index] = true
	}
	var rows []int
	for i, g := range ex.Group {
		if g >= 0 && !picked[i] {
			rows = append(rows, i)
		}
	}
	sort.SliceStable(rows, func(x, y int) bool {
		cx, cy := ex.Coverage[rows[x]], ex.Coverage[rows[y]]
		if cx != cy {
			return cx < cy
		}
		return v.doc(rows[x]).ID < v.doc(rows[y]).ID
	})
	out := []missedOut{}
	for _, i := range rows[:min(count, len(rows))] {
		d := v.doc(i)
		out = append(out, missedOut{
			ID: d.ID, Title: d.Title, Language: string(d.Lang), Coverage: num(ex.Coverage[i]),
			TopTerms: v.rowTerms(i, missedTerms), Group: v.doc(cur.Rows[ex.Group[i]].Index).ID,
		})
	}
	return out
}

// coverage summarises per-document coverage, each collapsed row counted
// as many times as the documents it stands for.
func (v view) coverage(ex selection.Explanation) coverageFig {
	var vals []float64
	fig := coverageFig{Histogram: make([]int, coverageBins)}
	var sum float64
	for i, g := range ex.Group {
		if g < 0 {
			continue
		}
		c := ex.Coverage[i]
		for range v.weight(i) {
			vals = append(vals, c)
			sum += c
			fig.Histogram[min(int(c*coverageBins), coverageBins-1)]++
		}
	}
	if len(vals) == 0 {
		return fig
	}
	slices.Sort(vals)
	fig.Mean = num(sum / float64(len(vals)))
	mid := len(vals) / 2
	if len(vals)%2 == 1 {
		fig.Median = num(vals[mid])
	} else {
		fig.Median = num((vals[mid-1] + vals[mid]) / 2)
	}
	return fig
}

// pickPos returns the position in picks of the pick with the given index.
func pickPos(picks []selection.Pick, index int) int {
	for i, p := range picks {
		if p.Index == index {
			return i
		}
	}
	return -1
}

// sumSq returns Σ_{i<k} v_i².
func sumSq(v []float64, k int) float64 {
	var s float64
	for _, x := range v[:min(k, len(v))] {
		s += x * x
	}
	return s
}

// assignments lists every document (exact copies included) with its
// exemplar, in document order.
func (v view) assignments(cur *selection.CUR, ex selection.Explanation) []assignOut {
	var out []assignOut
	for i, g := range ex.Group {
		if g < 0 {
			continue
		}
		exemplar := v.doc(cur.Rows[g].Index).ID
		rows := []int{v.survivor(i)}
		if v.groups != nil {
			rows = v.groups[i]
		}
		for _, r := range rows {
			d := v.an.docs[v.an.counts.Rows[r]]
			out = append(out, assignOut{ID: d.ID, Language: string(d.Lang), Exemplar: exemplar, Score: num(ex.Score[i]), Coverage: num(ex.Coverage[i])})
		}
	}
	sort.SliceStable(out, func(a, b int) bool { return out[a].ID < out[b].ID })
	return out
}
