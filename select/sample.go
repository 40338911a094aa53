package selection

import (
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"sort"

	"github.com/james-bowman/sparse"
	"gonum.org/v1/gonum/mat"

	"assay/sparsemat"
)

// Options configures a sampling method.
type Options struct {
	// Rows is the number r of row draws (documents); Cols the number c of
	// column draws (terms). Both must be at least 1.
	Rows, Cols int
	// Seed drives every random draw.
	Seed uint64
}

// Pick is one distinct row or column in a CUR, with how it was drawn.
type Pick struct {
	// Index is the row or column of A.
	Index int
	// Count is how many of the draws gave this index.
	Count int
	// Prob is the probability of this index in one draw.
	Prob float64
	// Weight is the scale applied to the row or column: √Count/√(draws·Prob).
	Weight float64
}

// CUR is a decomposition A ≈ C·U·R made of actual columns and rows of A.
type CUR struct {
	// Rows are the picked rows (R), in increasing index order.
	Rows []Pick
	// Cols are the picked columns (C), in increasing index order.
	Cols []Pick
	// C is m×len(Cols): the picked columns of A, each times its Weight.
	C *mat.Dense
	// R is len(Rows)×n: the picked rows of A, each times its Weight.
	R *mat.Dense
	// U is len(Cols)×len(Rows).
	U *mat.Dense
	// CoreRank is the numerical rank of the core that was inverted.
	CoreRank int
}

// Draw samples draws indices with replacement from the distribution
// proportional to weights (which need not sum to 1; negative weights are
// not allowed) and returns the distinct indices drawn with their counts,
// in increasing index order. It returns an error when every weight is zero.
func Draw(rng *rand.Rand, weights []float64, draws int) ([]Pick, error) {
	cum := make([]float64, len(weights))
	var total float64
	for i, w := range weights {
		if w < 0 || math.IsNaN(w) {
			return nil, fmt.Errorf("sampling weight %d is %g", i, w)
		}
		total += w
		cum[i] = total
	}
	if total <= 0 {
		return nil, errors.New("every sampling weight is zero")
	}
	counts := make(map[int]int)
	for range draws {
		u := rng.Float64() * total
		i := sort.SearchFloat64s(cum, u)
		// SearchFloat64s finds the first cum ≥ u; step past zero-weight
		// entries that share the same cumulative value (u = cum[i]).
		for i < len(cum)-1 && (cum[i] <= u || weights[i] == 0) {
			i++
		}
		counts[i]++
	}
	picks := make([]Pick, 0, len(counts))
	for i, c := range counts {
		p := weights[i] / total
		picks = append(picks, Pick{
			Index:  i,
			Count:  c,
			Prob:   p,
			Weight: math.Sqrt(float64(c) / (float64(draws) * p)),
		})
	}
	sort.Slice(picks, func(a, b int) bool { return picks[a].Index < picks[b].Index })
	return picks, nil
}

// Random streams: columns and rows are drawn from independent streams of
// the same seed, so changing r does not change the column picks.
const (
	streamCols = 0xc01
	streamRows = 0x20f
)

// SquaredNorm picks columns and rows of a by squared-norm sampling and sets
// U = W⁺, as described in the package documentation. It returns an error
// for an empty or all-zero matrix or non-positive draw counts.
func SquaredNorm(a *sparse.CSR, opts Options) (*CUR, error) {
	if err := checkInput(a, opts); err != nil {
		return nil, err
	}
	colRng := rand.New(rand.NewPCG(opts.Seed, streamCols))
	rowRng := rand.New(rand.NewPCG(opts.Seed, streamRows))
	cols, err := Draw(colRng, sparsemat.ColSqNorms(a), opts.Cols)
	if err != nil {
		return nil, fmt.Errorf("draw terms: %w", err)
	}
	rows, err := Draw(rowRng, sparsemat.RowSqNorms(a), opts.Rows)
	if err != nil {
		return nil, fmt.Errorf("draw documents: %w", err)
	}
	cur := &CUR{Rows: rows, Cols: cols}
	cur.C = pickedCols(a, cols)
	cur.R = pickedRows(a, rows)
	w := intersection(cur.C, rows)
	cur.U, cur.CoreRank = Pinv(w)
	return cur, nil
}

func checkInput(a *sparse.CSR, opts Options) error {
	m, n := a.Dims()
	if m == 0 || n == 0 {
		return errors.New("the matrix is empty")
	}
	if opts.Rows < 1 || opts.Cols < 1 {
		return fmt.Errorf("need at least one row and one column draw (got %d and %d)", opts.Rows, opts.Cols)
	}
	if sparsemat.FrobeniusSq(a) == 0 {
		return errors.New("the matrix is all zeros")
	}
	return nil
}

// pickedCols returns the m×len(cols) dense matrix of the picked columns of
// a, each scaled by its weight.
func pickedCols(a *sparse.CSR, cols []Pick) *mat.Dense {
	m, n := a.Dims()
	pos := make([]int, n)
	for j := range pos {
		pos[j] = -1
	}
	for p, c := range cols {
		pos[c.Index] = p
	}
	out := mat.NewDense(m, len(cols), nil)
	raw := a.RawMatrix()
	for i := range m {
		for k := raw.Indptr[i]; k < raw.Indptr[i+1]; k++ {
			if p := pos[raw.Ind[k]]; p >= 0 {
				out.Set(i, p, raw.Data[k]*cols[p].Weight)
			}
		}
	}
	return out
}

// pickedRows returns the len(rows)×n dense matrix of the picked rows of a,
// each scaled by its weight.
func pickedRows(a *sparse.CSR, rows []Pick) *mat.Dense {
	_, n := a.Dims()
	out := mat.NewDense(len(rows), n, nil)
	raw := a.RawMatrix()
	for p, r := range rows {
		for k := raw.Indptr[r.Index]; k < raw.Indptr[r.Index+1]; k++ {
			out.Set(p, raw.Ind[k], raw.Data[k]*r.Weight)
		}
	}
	return out
}

// intersection returns W: the picked rows of the scaled C, each times its
// row weight.
func intersection(c *mat.Dense, rows []Pick) *mat.Dense {
	_, nc := c.Dims()
	w := mat.NewDense(len(rows), nc, nil)
	for p, r := range rows {
		for j := range nc {
			w.Set(p, j, c.At(r.Index, j)*r.Weight)
		}
	}
	return w
}
