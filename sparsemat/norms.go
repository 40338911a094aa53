package sparsemat

import "github.com/james-bowman/sparse"

// RowSqNorms returns the squared Euclidean norm of every row of a.
func RowSqNorms(a *sparse.CSR) []float64 {
	raw := a.RawMatrix()
	out := make([]float64, raw.I)
	for i := range out {
		var s float64
		for _, v := range raw.Data[raw.Indptr[i]:raw.Indptr[i+1]] {
			s += v * v
		}
		out[i] = s
	}
	return out
}

// ColSqNorms returns the squared Euclidean norm of every column of a,
// summed in row order.
func ColSqNorms(a *sparse.CSR) []float64 {
	raw := a.RawMatrix()
	out := make([]float64, raw.J)
	for k, j := range raw.Ind[:raw.Indptr[raw.I]] {
		v := raw.Data[k]
		out[j] += v * v
	}
	return out
}

// FrobeniusSq returns ‖a‖_F², summed in storage order.
func FrobeniusSq(a *sparse.CSR) float64 {
	raw := a.RawMatrix()
	var s float64
	for _, v := range raw.Data[:raw.Indptr[raw.I]] {
		s += v * v
	}
	return s
}

// Transpose returns aᵀ as a new CSR (a counting sort over the columns, so
// the rows of aᵀ keep increasing column indices).
func Transpose(a *sparse.CSR) *sparse.CSR {
	raw := a.RawMatrix()
	m, n := raw.I, raw.J
	nnz := raw.Indptr[m]
	ia := make([]int, n+1)
	for _, j := range raw.Ind[:nnz] {
		ia[j+1]++
	}
	for j := range n {
		ia[j+1] += ia[j]
	}
	next := append([]int(nil), ia[:n]...)
	ja := make([]int, nnz)
	data := make([]float64, nnz)
	for i := range m {
		for k := raw.Indptr[i]; k < raw.Indptr[i+1]; k++ {
			j := raw.Ind[k]
			p := next[j]
			ja[p] = i
			data[p] = raw.Data[k]
			next[j]++
		}
	}
	return sparse.NewCSR(n, m, ia, ja, data)
}
