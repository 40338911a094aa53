package selection

import (
	"math"
	"runtime"
	"slices"
	"sync"
	"sync/atomic"

	"github.com/james-bowman/sparse"
	"gonum.org/v1/gonum/floats"
	"gonum.org/v1/gonum/mat"

	"assay/sparsemat"
)

// The greedy method grows the set of picked rows one at a time, each time
// taking the row that adds the most to the captured share ‖A·P_S‖_F², where
// P_S projects onto the span of the rows picked so far. Adding row i, with
// residual ã_i = a_i − P_S·a_i, adds ‖A·ã_i‖²/‖ã_i‖².
//
// The denominator is computed exactly. The numerator uses the leading
// singular triplets as a proxy for A: ‖A_l·ã_i‖² = ‖Σ_l·V_lᵀ·ã_i‖², where l
// is the number of triplets given. For every candidate the l-vector
// d_i = Σ_l·V_lᵀ·ã_i starts as row i of U_l·Σ_l² and loses one rank-one
// term per pick, so each step costs one sparse product with the new basis
// vector plus O(m·l) dense work. This is greedy subset selection in the
// spirit of Farahat, Ghodsi and Kamel ("An efficient greedy method for
// unsupervised feature selection", ICDM 2011), on a low-rank proxy instead
// of a random projection. Columns are picked the same way on Aᵀ.

// greedySide describes one side (rows or columns) to the greedy loop.
type greedySide struct {
	count  int                                // candidates
	dim    int                                // length of a candidate vector
	sq     []float64                          // squared norm of each candidate
	d      *mat.Dense                         // count×l: U_l·Σ_l² (rows) or V_l·Σ_l² (columns); updated in place
	basis  *mat.Dense                         // dim×l: V_l (rows) or U_l (columns)
	values []float64                          // Σ_l
	vector func(i int, dst []float64)         // dense candidate i into dst (length dim)
	apply  func(q *mat.Dense, dst *mat.Dense) // dst = A·q (rows) or Aᵀ·q (columns)
	// near, when set, says whether a candidate is too close to one of the
	// candidates picked so far to be picked itself.
	near func(cand int, picked []Pick) bool
}

func greedyRows(a *sparse.CSR, svd *sparsemat.SVD, r int, maxCos float64) []Pick {
	m, n := a.Dims()
	raw := a.RawMatrix()
	sq := sparsemat.RowSqNorms(a)
	var near func(int, []Pick) bool
	if maxCos > 0 {
		norms := sqrtAll(slices.Clone(sq))
		near = func(cand int, picked []Pick) bool {
			return nearAny(raw.Indptr, raw.Ind, raw.Data, norms, cand, picked, maxCos)
		}
	}
	return greedy(greedySide{
		near:  near,
		count: m, dim: n, sq: sq,
		d:     scaledBy(svd.U, svd.Values, 2),
		basis: svd.V, values: svd.Values,
		vector: func(i int, dst []float64) {
			clear(dst)
			for k := raw.Indptr[i]; k < raw.Indptr[i+1]; k++ {
				dst[raw.Ind[k]] = raw.Data[k]
			}
		},
		apply: func(q, dst *mat.Dense) { sparsemat.MulDense(dst, a, q) },
	}, min(r, m), sparsemat.FrobeniusSq(a))
}

func greedyCols(a *sparse.CSR, svd *sparsemat.SVD, c int) []Pick {
	m, n := a.Dims()
	raw := a.RawMatrix()
	return greedy(greedySide{
		count: n, dim: m, sq: sparsemat.ColSqNorms(a),
		d:     scaledBy(svd.V, svd.Values, 2),
		basis: svd.U, values: svd.Values,
		vector: func(j int, dst []float64) {
			// A binary search in every row, in parallel over blocks of
			// rows (each entry of dst is written by one goroutine).
			forBlocks((m+candidateBlock-1)/candidateBlock, func(b int) {
				for i := b * candidateBlock; i < min((b+1)*candidateBlock, m); i++ {
					lo, hi := raw.Indptr[i], raw.Indptr[i+1]
					dst[i] = 0
					if k, ok := slices.BinarySearch(raw.Ind[lo:hi], j); ok {
						dst[i] = raw.Data[lo+k]
					}
				}
			})
		},
		apply: func(q, dst *mat.Dense) { sparsemat.MulDenseT(dst, a, q) },
	}, min(c, n), sparsemat.FrobeniusSq(a))
}

// candidateBlock is the number of candidates per block of the parallel
// loops in greedy; fixed, so that choices do not depend on GOMAXPROCS.
const candidateBlock = 2048

// forBlocks runs fn for every block index over GOMAXPROCS goroutines.
func forBlocks(blocks int, fn func(b int)) {
	workers := min(runtime.GOMAXPROCS(0), blocks)
	if workers <= 1 {
		for b := range blocks {
			fn(b)
		}
		return
	}
	var next atomic.Int64
	var wg sync.WaitGroup
	for range workers {
		wg.Go(func() {
			for b := int(next.Add(1) - 1); b < blocks; b = int(next.Add(1) - 1) {
				fn(b)
			}
		})
	}
	wg.Wait()
}

// gemvBlock is the number of rows of x per partial sum in denseMulVecT:
// fixed, so that the bits do not depend on GOMAXPROCS; a matrix of at most
// this many rows is summed as one block, row by row, as gonum's Dgemv
// does.
const gemvBlock = 8192

// denseMulVecT sets w = xᵀ·v for the dense x (rows × len(w), at least one
// row), in parallel: each block of gemvBlock rows adds v_i·x(i, :) into
// its own partial sum in row order, and the partial sums are added in
// block order.
func denseMulVecT(w []float64, x *mat.Dense, v []float64) {
	raw := x.RawMatrix()
	blocks := (raw.Rows + gemvBlock - 1) / gemvBlock
	partial := make([][]float64, blocks)
	forBlocks(blocks, func(b int) {
		sum := make([]float64, len(w))
		for i := b * gemvBlock; i < min((b+1)*gemvBlock, raw.Rows); i++ {
			if v[i] != 0 {
				floats.AddScaled(sum, v[i], raw.Data[i*raw.Stride:i*raw.Stride+len(w)])
			}
		}
		partial[b] = sum
	})
	copy(w, partial[0])
	for _, sum := range partial[1:] {
		floats.Add(w, sum)
	}
}

// scaledBy returns x with column t multiplied by values[t]^power.
func scaledBy(x *mat.Dense, values []float64, power int) *mat.Dense {
	out := mat.DenseCopyOf(x)
	r, c := out.Dims()
	for t := range min(c, len(values)) {
		f := math.Pow(values[t], float64(power))
		for i := range r {
			out.Set(i, t, out.At(i, t)*f)
		}
	}
	return out
}

// greedy runs the greedy loop for k picks; total is ‖A‖_F², to report each
// pick's gain as a share.
func greedy(s greedySide, k int, total float64) []Pick {
	_, l := s.d.Dims()
	d := s.d
	resid := append([]float64(nil), s.sq...)
	taken := make([]bool, s.count)
	var basis [][]float64 // orthonormal basis of the picked vectors
	q := mat.NewDense(s.dim, 1, nil)
	var aq mat.Dense
	w := make([]float64, l)
	vec := make([]float64, s.dim)
	var picks []Pick
	blocks := (s.count + candidateBlock - 1) / candidateBlock
	blockBest := make([]int, blocks)
	blockGain := make([]float64, blocks)
	// scan returns the best candidate of block b and its gain (-1 if none).
	scan := func(b int) (int, float64) {
		best, bestGain := -1, 0.0
		for i := b * candidateBlock; i < min((b+1)*candidateBlock, s.count); i++ {
			// A candidate already in the span (to rounding) adds nothing.
			if taken[i] || resid[i] <= 1e-12*s.sq[i] || resid[i] <= 0 {
				continue
			}
			di := d.RawRowView(i)
			if g := floats.Dot(di, di) / resid[i]; g > bestGain {
				best, bestGain = i, g
			}
		}
		return best, bestGain
	}
	// The best candidate of each fixed block, then the first best block:
	// the same choice for any number of goroutines. After the first step
	// the blocks' bests come from the pass that updates d.
	forBlocks(blocks, func(b int) { blockBest[b], blockGain[b] = scan(b) })
	for step := range k {
		var best int
		var bestGain float64
		for {
			best, bestGain = -1, 0.0
			for b := range blocks {
				if blockBest[b] >= 0 && blockGain[b] > bestGain {
					best, bestGain = blockBest[b], blockGain[b]
				}
			}
			if best < 0 || s.near == nil || !s.near(best, picks) {
				break
			}
			// Too close to a pick: ruled out for good, and its block's
			// best found again. Checking only the winner costs a few
			// sparse dot products a step, where ruling out every close
			// candidate at each pick would cost a pass over the matrix;
			// the picks are the same.
			taken[best] = true
			b := best / candidateBlock
			blockBest[b], blockGain[b] = scan(b)
		}
		if best < 0 {
			break
		}
		taken[best] = true
		// New basis vector: the residual of the candidate, orthogonalised
		// twice against the basis (classical Gram–Schmidt, repeated for
		// stability).
		s.vector(best, vec)
		for range 2 {
			for _, b := range basis {
				floats.AddScaled(vec, -floats.Dot(b, vec), b)
			}
		}
		norm := floats.Norm(vec, 2)
		if norm == 0 {
			// Nothing new (the scan's threshold should have ruled it
			// out): its block's best is found again without it.
			b := best / candidateBlock
			blockBest[b], blockGain[b] = scan(b)
			continue
		}
		floats.Scale(1/norm, vec)
		basis = append(basis, append([]float64(nil), vec...))
		picks = append(picks, Pick{Index: best, Order: step, Count: 1, Score: bestGain / total, Weight: 1})
		// p = A·q for every candidate: its coordinate along the new vector.
		copy(q.RawMatrix().Data, vec)
		aq.Reset()
		s.apply(q, &aq)
		p := aq.RawMatrix().Data
		// w = Σ_l·V_lᵀ·q.
		denseMulVecT(w, s.basis, vec)
		for t := range w {
			w[t] *= s.values[t]
		}
		// Update every candidate and find the blocks' bests for the next
		// step in the same pass over d (one read of d a step instead of
		// two; the gains are those scan computes).
		forBlocks(blocks, func(b int) {
			for i := b * candidateBlock; i < min((b+1)*candidateBlock, s.count); i++ {
				if taken[i] || p[i] == 0 {
					continue
				}
				resid[i] -= p[i] * p[i]
				floats.AddScaled(d.RawRowView(i), -p[i], w)
			}
			blockBest[b], blockGain[b] = scan(b)
		})
	}
	return picks
}
