package sparsemat

import (
	"fmt"
	"testing"

	"gonum.org/v1/gonum/mat"
)

// BenchmarkMulDense multiplies a sparse matrix by a dense one over the raw
// CSR arrays, on a grid of sizes.
func BenchmarkMulDense(b *testing.B) {
	for _, s := range []struct{ m, n, nnzRow, p int }{{2000, 20000, 100, 50}, {20000, 50000, 100, 20}, {20000, 60000, 145, 160}} {
		b.Run(fmt.Sprintf("docs=%d/terms=%d/nnz=%d/p=%d", s.m, s.n, s.nnzRow, s.p), func(b *testing.B) {
			a := randomCSR(s.m, s.n, float64(s.nnzRow)/float64(s.n), 1, -1, -1)
			x := randomDense(s.n, s.p, 2)
			var dst mat.Dense
			b.ReportAllocs()
			for b.Loop() {
				dst.Reset()
				MulDense(&dst, a, x)
			}
		})
	}
}

// BenchmarkGuardGonumReceiver is the trap MulDense avoids: a gonum Dense
// receiver with a sparse operand falls back to element-wise At calls. On
// the same 500×5000 (50 non-zeros a row) × 5000×20 product it runs about
// three orders of magnitude slower than BenchmarkGuardMulDense; if the two
// ever come close, something routes our products through the slow path.
func BenchmarkGuardGonumReceiver(b *testing.B) {
	a := randomCSR(500, 5000, 0.01, 1, -1, -1)
	x := randomDense(5000, 20, 2)
	var dst mat.Dense
	for b.Loop() {
		dst.Reset()
		dst.Mul(a, x)
	}
}

// BenchmarkGuardMulDense is the fast path on the guard's product.
func BenchmarkGuardMulDense(b *testing.B) {
	a := randomCSR(500, 5000, 0.01, 1, -1, -1)
	x := randomDense(5000, 20, 2)
	var dst mat.Dense
	for b.Loop() {
		dst.Reset()
		MulDense(&dst, a, x)
	}
}

// BenchmarkTruncatedSVD times the exact (Gram) and randomized paths at
// the largest size the exact path takes.
func BenchmarkTruncatedSVD(b *testing.B) {
	a := randomCSR(ExactLimit, 20000, 0.005, 3, -1, -1)
	for _, randomized := range []bool{false, true} {
		b.Run(fmt.Sprintf("docs=%d/terms=20000/k=20/randomized=%v", ExactLimit, randomized), func(b *testing.B) {
			for b.Loop() {
				if _, err := TruncatedSVD(a, SVDOptions{Rank: 20, PowerIters: 2, Seed: 1, Randomized: randomized}); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

// BenchmarkMulDenseT compares aᵀ·y without a transpose against the product
// with a stored transpose, side by side.
//
// p=1 is the product of one greedy step on the column side (the shape of
// a 100,000-document corpus there).
func BenchmarkMulDenseT(b *testing.B) {
	for _, s := range []struct{ m, n, nnzRow, p int }{{20000, 50000, 100, 60}, {100000, 60000, 146, 1}} {
		a := randomCSR(s.m, s.n, float64(s.nnzRow)/float64(s.n), 1, -1, -1)
		y := randomDense(s.m, s.p, 2)
		at := Transpose(a)
		name := fmt.Sprintf("docs=%d/terms=%d/nnz=%d/p=%d", s.m, s.n, s.nnzRow, s.p)
		b.Run(name+"/MulDenseT", func(b *testing.B) {
			var dst mat.Dense
			for b.Loop() {
				dst.Reset()
				MulDenseT(&dst, a, y)
			}
		})
		b.Run(name+"/MulDense-of-transpose", func(b *testing.B) {
			var dst mat.Dense
			for b.Loop() {
				dst.Reset()
				MulDense(&dst, at, y)
			}
		})
	}
}

// BenchmarkOrthonormalize compares CholeskyQR2 with Householder QR on the
// block shape of a randomized SVD of a 100,000-document corpus.
func BenchmarkOrthonormalize(b *testing.B) {
	y0 := randomDense(100000, 60, 3)
	b.Run("choleskyQR2", func(b *testing.B) {
		for b.Loop() {
			orthonormalize(mat.DenseCopyOf(y0))
		}
	})
	b.Run("householder", func(b *testing.B) {
		for b.Loop() {
			householder(mat.DenseCopyOf(y0))
		}
	})
}
