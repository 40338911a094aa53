package sparsemat

import (
	"math"
	"testing"

	"gonum.org/v1/gonum/floats"
	"gonum.org/v1/gonum/mat"
)

// Every output entry of MulDense keeps the bits of the plain kernel, which
// adds raw.Data[k]·x[j,:] to the output row with floats.AddScaled entry by
// entry in storage order (the kernel the reports were made with): a guard
// for any faster kernel (grouping columns, unrolling), which must not
// change a figure. Several widths (common practice: a reference
// implementation in the test, no outside source).
func TestMulDenseKeepsBits(t *testing.T) {
	a := randomCSR(300, 900, 0.05, 3, -1, -1)
	raw := a.RawMatrix()
	for _, p := range []int{2, 7, 8, 9, 16, 23, 40} {
		x := randomDense(900, p, uint64(p))
		want := make([]float64, 300*p)
		for i := range 300 {
			out := want[i*p : (i+1)*p]
			for k := raw.Indptr[i]; k < raw.Indptr[i+1]; k++ {
				j := raw.Ind[k]
				floats.AddScaled(out, raw.Data[k], x.RawMatrix().Data[j*p:(j+1)*p])
			}
		}
		var got mat.Dense
		MulDense(&got, a, x)
		g := got.RawMatrix()
		for i := range 300 {
			for c := range p {
				if w, v := want[i*p+c], g.Data[i*g.Stride+c]; math.Float64bits(w) != math.Float64bits(v) {
					t.Fatalf("p=%d: entry (%d,%d) = %v, plain kernel %v", p, i, c, v, w)
				}
			}
		}
	}
}
