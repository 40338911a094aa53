package sparsemat

import "gonum.org/v1/gonum/mat"

// Leverage returns the rank-k leverage scores of the rows of a matrix whose
// leading k left (or right) singular vectors are the first k columns of u:
// ℓ_i = ‖u(i, 0:k)‖². With orthonormal columns they lie in [0, 1] and sum
// to k. Pass SVD.U for row (document) scores and SVD.V for column (term)
// scores. It panics if k exceeds the columns of u.
func Leverage(u *mat.Dense, k int) []float64 {
	r, c := u.Dims()
	if k > c {
		panic(mat.ErrShape)
	}
	out := make([]float64, r)
	for i := range r {
		row := u.RawRowView(i)[:k]
		var s float64
		for _, v := range row {
			s += v * v
		}
		out[i] = s
	}
	return out
}
