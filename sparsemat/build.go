package sparsemat

import (
	"errors"
	"fmt"
	"slices"
	"sort"

	"github.com/james-bowman/sparse"
)

// ErrNoTerms is returned by [Builder.Build] when pruning leaves no term.
var ErrNoTerms = errors.New("no terms left after pruning")

// Builder accumulates the term counts of documents, one row at a time.
// The zero value is ready to use. It is not safe for concurrent use.
type Builder struct {
	ids    map[string]int32 // term -> provisional ID (order first seen)
	terms  []string         // provisional ID -> term
	df     []int
	rowPtr []int
	cols   []int32
	counts []int32
	ent    []entry
}

type entry struct {
	id    int32
	count int32
}

// AddRow adds one document with its term counts. Counts of zero or less
// are ignored.
func (b *Builder) AddRow(counts map[string]int) {
	if b.ids == nil {
		b.ids = make(map[string]int32)
		b.rowPtr = []int{0}
	}
	b.ent = b.ent[:0]
	for t, c := range counts {
		if c <= 0 {
			continue
		}
		id, ok := b.ids[t]
		if !ok {
			id = int32(len(b.terms))
			b.ids[t] = id
			b.terms = append(b.terms, t)
			b.df = append(b.df, 0)
		}
		b.df[id]++
		b.ent = append(b.ent, entry{id, int32(min(c, 1<<31-1))})
	}
	slices.SortFunc(b.ent, func(x, y entry) int { return int(x.id - y.id) })
	for _, e := range b.ent {
		b.cols = append(b.cols, e.id)
		b.counts = append(b.counts, e.count)
	}
	b.rowPtr = append(b.rowPtr, len(b.cols))
}

// Rows returns the number of rows added so far.
func (b *Builder) Rows() int { return max(len(b.rowPtr)-1, 0) }

// Pruning says which terms to keep by document frequency.
type Pruning struct {
	// MinDF keeps terms found in at least MinDF documents (0 or 1: all).
	MinDF int
	// MaxDFShare keeps terms found in at most this share of the documents;
	// 0 means 1 (no upper limit). Must lie in (0, 1].
	MaxDFShare float64
}

// Counts is a document-term matrix of raw counts with its vocabulary.
type Counts struct {
	// Matrix holds the counts: one row per kept document, one column per
	// kept term.
	Matrix *sparse.CSR
	// Terms are the kept terms in column order (byte order).
	Terms []string
	// DF is the document frequency of each kept term, counted over all
	// documents added to the builder.
	DF []int
	// Rows maps each matrix row to the index of the document as it was
	// added to the builder.
	Rows []int
	// EmptyRows lists the added documents (by index) that kept no term
	// and so have no row.
	EmptyRows []int
	// VocabularySize is the number of distinct terms before pruning.
	VocabularySize int
	// Documents is the number of documents added, with or without a row.
	Documents int
}

// Build prunes the vocabulary and returns the count matrix. Documents left
// with no term are dropped from the matrix and listed in EmptyRows. It
// returns [ErrNoTerms] when no term survives, and an error for an invalid
// Pruning.
func (b *Builder) Build(p Pruning) (*Counts, error) {
	m := b.Rows()
	if p.MaxDFShare == 0 {
		p.MaxDFShare = 1
	}
	if p.MaxDFShare < 0 || p.MaxDFShare > 1 {
		return nil, fmt.Errorf("max-df share %g is outside (0, 1]", p.MaxDFShare)
	}
	if p.MinDF < 0 {
		return nil, fmt.Errorf("min-df %d is negative", p.MinDF)
	}
	maxDF := int(p.MaxDFShare * float64(m)) // floor, as scikit-learn does
	keep := make([]int32, 0, len(b.terms))
	for id := range b.terms {
		if d := b.df[id]; d >= p.MinDF && d <= maxDF {
			keep = append(keep, int32(id))
		}
	}
	sort.Slice(keep, func(i, j int) bool { return b.terms[keep[i]] < b.terms[keep[j]] })
	if len(keep) == 0 {
		return nil, ErrNoTerms
	}
	newID := make([]int32, len(b.terms))
	for i := range newID {
		newID[i] = -1
	}
	c := &Counts{
		Terms:          make([]string, len(keep)),
		DF:             make([]int, len(keep)),
		VocabularySize: len(b.terms),
		Documents:      m,
	}
	for j, id := range keep {
		newID[id] = int32(j)
		c.Terms[j] = b.terms[id]
		c.DF[j] = b.df[id]
	}
	nnz := 0
	for _, id := range b.cols {
		if newID[id] >= 0 {
			nnz++
		}
	}
	ia := make([]int, 1, m+1)
	ja := make([]int, 0, nnz)
	data := make([]float64, 0, nnz)
	var row []entry
	for i := range m {
		row = row[:0]
		for k := b.rowPtr[i]; k < b.rowPtr[i+1]; k++ {
			if j := newID[b.cols[k]]; j >= 0 {
				row = append(row, entry{j, b.counts[k]})
			}
		}
		if len(row) == 0 {
			c.EmptyRows = append(c.EmptyRows, i)
			continue
		}
		slices.SortFunc(row, func(x, y entry) int { return int(x.id - y.id) })
		for _, e := range row {
			ja = append(ja, int(e.id))
			data = append(data, float64(e.count))
		}
		ia = append(ia, len(ja))
		c.Rows = append(c.Rows, i)
	}
	if len(c.Rows) == 0 {
		return nil, ErrNoTerms
	}
	c.Matrix = sparse.NewCSR(len(c.Rows), len(keep), ia, ja, data)
	return c, nil
}
