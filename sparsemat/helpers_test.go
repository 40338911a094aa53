package sparsemat

import (
	"math/rand/v2"
	"testing"

	"github.com/james-bowman/sparse"
	"gonum.org/v1/gonum/mat"
)

// randomCSR builds an m×n CSR with about density·m·n non-zeros drawn from
// a seeded generator, directly from sorted column indices. Row emptyRow (if
// in range) and column emptyCol are left empty.
func randomCSR(m, n int, density float64, seed uint64, emptyRow, emptyCol int) *sparse.CSR {
	rng := rand.New(rand.NewPCG(seed, 1))
	ia := []int{0}
	var ja []int
	var data []float64
	for i := range m {
		for j := range n {
			if i == emptyRow || j == emptyCol || rng.Float64() >= density {
				continue
			}
			ja = append(ja, j)
			data = append(data, rng.NormFloat64())
		}
		ia = append(ia, len(ja))
	}
	return sparse.NewCSR(m, n, ia, ja, data)
}

// dense returns a as a gonum Dense, element by element (test oracle only).
func dense(a *sparse.CSR) *mat.Dense {
	m, n := a.Dims()
	d := mat.NewDense(m, n, nil)
	raw := a.RawMatrix()
	for i := range m {
		for k := raw.Indptr[i]; k < raw.Indptr[i+1]; k++ {
			d.Set(i, raw.Ind[k], raw.Data[k])
		}
	}
	return d
}

// checkCSR verifies the package invariants: increasing column indices in
// every row, indices in range, no stored zeros.
func checkCSR(t *testing.T, a *sparse.CSR) {
	t.Helper()
	raw := a.RawMatrix()
	if len(raw.Indptr) != raw.I+1 || raw.Indptr[0] != 0 {
		t.Fatalf("indptr has length %d for %d rows, first %d", len(raw.Indptr), raw.I, raw.Indptr[0])
	}
	for i := range raw.I {
		for k := raw.Indptr[i]; k < raw.Indptr[i+1]; k++ {
			if raw.Ind[k] < 0 || raw.Ind[k] >= raw.J {
				t.Fatalf("row %d: column %d out of range", i, raw.Ind[k])
			}
			if k > raw.Indptr[i] && raw.Ind[k] <= raw.Ind[k-1] {
				t.Fatalf("row %d: columns not increasing at %d", i, k)
			}
			if raw.Data[k] == 0 {
				t.Fatalf("row %d: explicit zero at column %d", i, raw.Ind[k])
			}
		}
	}
}
