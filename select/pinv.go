package selection

import (
	"gonum.org/v1/gonum/mat"
)

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
		// Not reached for finite input; a zero core is the safe answer.
		return out, 0
	}
	s := svd.Values(nil)
	if len(s) == 0 || s[0] == 0 {
		return out, 0
	}
	tol := float64(max(r, c)) * epsilon * s[0]
	var u, v mat.Dense
	svd.UTo(&u) // r×q
	svd.VTo(&v) // c×q
	rank := 0
	for _, x := range s {
		if x > tol {
			rank++
		}
	}
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

// epsilon is the spacing of float64 values at 1, 2⁻⁵².
const epsilon = 0x1p-52
