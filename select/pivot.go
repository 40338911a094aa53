package selection

import (
	"math"
	"math/rand/v2"

	"github.com/james-bowman/sparse"
	"gonum.org/v1/gonum/mat"

	"assay/sparsemat"
)

// pivotPicks chooses columns, then rows, by sketching and LU with partial
// pivoting (Dong and Martinsson, "Simpler is better: a comparative study of
// randomized pivoting algorithms for CUR and interpolative decompositions",
// Adv. Comput. Math. 49(4), 2023):
//
//  1. X = G·A for a Gaussian c×m G, with power iterations X = G·(A·Aᵀ)^q·A
//     (re-orthonormalised between the products);
//  2. the column picks are the first c pivots of LU with partial pivoting
//     on Xᵀ;
//  3. the row picks are the first r pivots of LU with partial pivoting on
//     C = A(:, J) when r ≤ |J|; when more rows than columns are wanted, on
//     a row sketch Y = (A·Aᵀ)^q·A·H of width r instead (H Gaussian n×r).
//
// Both pivotings stop early, with fewer picks, when the pivots reach
// numerical zero.
func pivotPicks(a *sparse.CSR, c, r, power int, colRng, rowRng *rand.Rand) (cols, rows []Pick) {
	m, n := a.Dims()
	c, r = min(c, n, m), min(r, m)
	// Xᵀ = Aᵀ·Gᵀ, with Gᵀ an m×c Gaussian.
	g := gaussian(colRng, m, c)
	var xt mat.Dense
	sparsemat.MulDenseT(&xt, a, g) // n×c
	for range power {
		orthonormalCols(&xt)
		var y mat.Dense
		sparsemat.MulDense(&y, a, &xt) // m×c
		orthonormalCols(&y)
		xt.Reset()
		sparsemat.MulDenseT(&xt, a, &y)
	}
	cols = luPivots(&xt, c)
	if r <= len(cols) {
		withWeight := make([]Pick, len(cols))
		for i, p := range cols {
			withWeight[i] = p
			withWeight[i].Weight = 1
		}
		cmat := pickedCols(a, withWeight)
		rows = luPivots(cmat, r)
		return cols, rows
	}
	h := gaussian(rowRng, n, r)
	var y mat.Dense
	sparsemat.MulDense(&y, a, h) // m×r
	for range power {
		orthonormalCols(&y)
		var z mat.Dense
		sparsemat.MulDenseT(&z, a, &y)
		orthonormalCols(&z)
		y.Reset()
		sparsemat.MulDense(&y, a, &z)
	}
	return cols, luPivots(&y, r)
}

// gaussian returns an r×c matrix of independent standard normals, filled in
// row-major order from rng.
func gaussian(rng *rand.Rand, r, c int) *mat.Dense {
	d := mat.NewDense(r, c, nil)
	data := d.RawMatrix().Data
	for i := range data {
		data[i] = rng.NormFloat64()
	}
	return d
}

// orthonormalCols replaces x by an orthonormal basis of the span of its
// columns; when x is numerically rank-deficient the basis, and so x, has
// fewer columns (its rank).
func orthonormalCols(x *mat.Dense) {
	q, s, _ := rangeBasis(x)
	if len(s) == 0 {
		return // all zero: nothing to normalise
	}
	*x = *q
}

// luPivots runs Gaussian elimination with partial pivoting on the rows of
// x (N×l, not changed) and returns up to k pivot rows in the order chosen,
// each with the magnitude of its pivot as score and weight 1. At step t the
// pivot is the remaining row with the largest |x(i, t)| after elimination
// (ties: the smaller row index).
//
// It never takes more pivots than the numerical rank of x (singular values
// above max(N, l)·ε·s₁, from a QR of x and the SVD of its small factor):
// past the rank, the remaining rows lie in the span of those chosen and a
// "pivot" would be rounding noise, which can be hundreds of ε times the
// scale of x and so passes any fixed threshold. It also stops at a pivot
// of exactly zero.
func luPivots(x *mat.Dense, k int) []Pick {
	nr, l := x.Dims()
	k = min(k, l, nr)
	if k == 0 {
		return nil
	}
	if tall := nr >= l; tall {
		_, s, _ := rangeBasis(x)
		k = min(k, len(s))
	} else {
		var xt mat.Dense
		xt.CloneFrom(x.T())
		_, s, _ := rangeBasis(&xt)
		k = min(k, len(s))
	}
	w := mat.DenseCopyOf(x)
	perm := make([]int, nr)
	for i := range perm {
		perm[i] = i
	}
	var picks []Pick
	for t := range k {
		best, bestAbs := -1, -1.0
		for p := t; p < nr; p++ {
			if v := math.Abs(w.At(perm[p], t)); v > bestAbs || (v == bestAbs && perm[p] < perm[best]) {
				best, bestAbs = p, v
			}
		}
		if bestAbs == 0 {
			break
		}
		perm[t], perm[best] = perm[best], perm[t]
		piv := perm[t]
		picks = append(picks, Pick{Index: piv, Order: t, Count: 1, Score: bestAbs, Weight: 1})
		prow := w.RawRowView(piv)
		pv := prow[t]
		for p := t + 1; p < nr; p++ {
			row := w.RawRowView(perm[p])
			f := row[t] / pv
			if f == 0 {
				continue
			}
			for j := t; j < l; j++ {
				row[j] -= f * prow[j]
			}
		}
	}
	return picks
}
