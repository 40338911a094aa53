package selection

import (
	"gonum.org/v1/gonum/mat"

	"assay/sparsemat"
)

// epsilon is the spacing of float64 values at 1, 2⁻⁵².
const epsilon = 0x1p-52

// rangeBasis factors a tall x (rows ≥ columns) as x = Q·diag(s)·Vᵀ over
// its numerical rank: a Householder QR of x (LAPACK dgeqrf/dorgqr through
// gonum), then the SVD of the small triangular factor. Q has orthonormal
// columns spanning the range of x; singular values at or below
// max(rows, cols)·ε·s₁ are dropped. For a wide x, pass its transpose.
func rangeBasis(x *mat.Dense) (q *mat.Dense, s []float64, v *mat.Dense) {
	r, c := x.Dims()
	if c > r {
		return wideBasis(x)
	}
	qf := mat.DenseCopyOf(x)
	tri := sparsemat.HouseholderQR(qf)
	var svd mat.SVD
	if !svd.Factorize(tri, mat.SVDFull) {
		return mat.NewDense(r, 1, nil), nil, mat.NewDense(c, 1, nil)
	}
	sv := svd.Values(nil)
	rank := NumericalRank(sv, r, c)
	if rank == 0 {
		return mat.NewDense(r, 1, nil), nil, mat.NewDense(c, 1, nil)
	}
	var u, vf mat.Dense
	svd.UTo(&u)
	svd.VTo(&vf)
	return sparsemat.MulInPlace(qf, u.Slice(0, c, 0, rank).(*mat.Dense)), sv[:rank], mat.DenseCopyOf(vf.Slice(0, c, 0, rank))
}

// wideBasis is rangeBasis for an x with fewer rows than columns, from the
// SVD of x itself (small: its rows are few).
func wideBasis(x *mat.Dense) (q *mat.Dense, s []float64, v *mat.Dense) {
	r, c := x.Dims()
	var svd mat.SVD
	if !svd.Factorize(x, mat.SVDThin) {
		return mat.NewDense(r, 1, nil), nil, mat.NewDense(c, 1, nil)
	}
	sv := svd.Values(nil)
	rank := NumericalRank(sv, r, c)
	if rank == 0 {
		return mat.NewDense(r, 1, nil), nil, mat.NewDense(c, 1, nil)
	}
	var u, vf mat.Dense
	svd.UTo(&u)
	svd.VTo(&vf)
	return mat.DenseCopyOf(u.Slice(0, r, 0, rank)), sv[:rank], mat.DenseCopyOf(vf.Slice(0, c, 0, rank))
}

// NumericalRank counts the singular values sv (largest first) of an r×c
// matrix above max(r, c)·ε·s₁, the tolerance of numpy's matrix_rank.
func NumericalRank(sv []float64, r, c int) int {
	if len(sv) == 0 || sv[0] <= 0 {
		return 0
	}
	tol := float64(max(r, c)) * epsilon * sv[0]
	rank := 0
	for _, x := range sv {
		if x > tol {
			rank++
		}
	}
	return rank
}

// Pinv returns the Moore–Penrose pseudo-inverse of w (r×c, giving c×r) and
// the numerical rank used. Singular values at or below
// max(r, c)·ε·σ_max (ε = 2⁻⁵²) count as zero. An all-zero or empty w gives
// a zero matrix and rank 0.
func Pinv(w *mat.Dense) (*mat.Dense, int) {
	r, c := w.Dims()
	out := mat.NewDense(c, r, nil)
	if r == 0 || c == 0 {
		return out, 0
	}
	var svd mat.SVD
	if !svd.Factorize(w, mat.SVDThin) {
		return out, 0 // not reached for finite input; zero is the safe core
	}
	s := svd.Values(nil)
	if len(s) == 0 || s[0] == 0 {
		return out, 0
	}
	var u, v mat.Dense
	svd.UTo(&u) // r×q
	svd.VTo(&v) // c×q
	rank := NumericalRank(s, r, c)
	// W⁺ = V_q · diag(1/s) · U_qᵀ over the kept singular values.
	for i := range c {
		for j := range r {
			var sum float64
			for t := range rank {
				sum += v.At(i, t) * u.At(j, t) / s[t]
			}
			out.Set(i, j, sum)
		}
	}
	return out, rank
}
