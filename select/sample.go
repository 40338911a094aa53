package selection

import (
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"sort"

	"github.com/james-bowman/sparse"
	"gonum.org/v1/gonum/mat"
)

// Pick is one distinct row or column in a CUR, with how it was chosen.
type Pick struct {
	// Index is the row or column of A.
	Index int
	// Order is the position of the pick in the order the method chose it
	// (the first draw that gave it, for the sampling methods), from 0.
	Order int
	// Count is how many draws gave this index (1 for deterministic methods).
	Count int
	// Score is what the method ranked by: the probability of one draw for
	// the sampling methods (norm, leverage), the rank-k leverage score for
	// top, the magnitude of the pivot for pivot, and the share of ‖A‖_F²
	// the pick added for greedy.
	Score float64
	// Weight is the scale applied to the row or column in C or R:
	// √Count/√(draws·p) for the sampling methods, 1 for the others.
	Weight float64
}

// Draw samples draws indices with replacement from the distribution
// proportional to weights (which need not sum to 1; negative weights are
// not allowed) and returns the distinct indices drawn with their counts and
// scales, in the order first drawn. It returns an error when every weight
// is zero.
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
	pos := make(map[int]int)
	var picks []Pick
	for range draws {
		u := rng.Float64() * total
		i := sort.SearchFloat64s(cum, u)
		// SearchFloat64s finds the first cum ≥ u; step past entries whose
		// weight is zero or whose cumulative value equals u exactly.
		for i < len(cum)-1 && (cum[i] <= u || weights[i] == 0) {
			i++
		}
		if p, ok := pos[i]; ok {
			picks[p].Count++
			continue
		}
		pos[i] = len(picks)
		picks = append(picks, Pick{Index: i, Order: len(picks), Count: 1, Score: weights[i] / total})
	}
	for k := range picks {
		picks[k].Weight = math.Sqrt(float64(picks[k].Count) / (float64(draws) * picks[k].Score))
	}
	return picks, nil
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
