package main

import (
	"github.com/james-bowman/sparse"

	selection "assay/select"
	"assay/sparsemat"
)

// nearDups is the matrix the picking runs on when near-copies are merged,
// and the way back to the matrix of every distinct document.
type nearDups struct {
	sel       *sparse.CSR // the matrix picks are made on (a itself when nothing is merged)
	from      []int       // row of sel → row of a (nil when sel is a)
	clusters  [][]int     // clusters of rows of a, each sorted
	clusterOf map[int][]int
	copies    int // rows of a merged into another
}

// nearDupsOf finds the near-copies of the distinct documents of a (rows
// with cosine at least --near-dup, MinHash candidates confirmed by cosine)
// and merges each cluster into one row for the picking.
func nearDupsOf(a *sparse.CSR, an *analysis, docOf func(row int) int, opts pickOptions) nearDups {
	nd := nearDups{sel: a, clusterOf: map[int][]int{}}
	m, _ := a.Dims()
	if opts.NearDup <= 0 || m < 2 || an.sigs.Len() != len(an.docs) {
		return nd
	}
	// The signature of each row of a: that of the document it stands for.
	sig := make([]uint32, m*selection.MinHashes)
	for i := range m {
		copy(sig[i*selection.MinHashes:], an.sigs.At(docOf(i)))
	}
	nd.clusters = selection.NearDuplicates(a, sig, opts.NearDup)
	if len(nd.clusters) == 0 {
		return nd
	}
	for _, c := range nd.clusters {
		nd.copies += len(c) - 1
		for _, i := range c {
			nd.clusterOf[i] = c
		}
	}
	nd.sel, nd.from = sparsemat.MergeRows(a, nd.clusters)
	return nd
}

// pick selects on the merged matrix and returns the decomposition of a
// made of the same picks.
func (nd nearDups) pick(a *sparse.CSR, opts selection.Options) (*selection.CUR, error) {
	cur, err := selection.Select(nd.sel, opts)
	if err != nil || nd.from == nil {
		return cur, err
	}
	rows := make([]selection.Pick, len(cur.Rows))
	for i, p := range cur.Rows {
		p.Index = nd.from[p.Index]
		rows[i] = p
	}
	return selection.Rebuild(a, cur.Method, rows, cur.Cols, cur.Core, opts.CoreRank), nil
}

// nearCopies lists the documents merged with an exemplar's row (its
// cluster but itself), with their exact copies.
func (v view) nearCopies(cluster []int) []string {
	out := []string{}
	if len(cluster) == 0 {
		return out
	}
	for _, row := range cluster[1:] {
		out = append(out, v.doc(row).ID)
		out = append(out, v.copies(row)...)
	}
	return out
}
