package sparsemat

import (
	"math"
	"runtime"
	"sync"

	"github.com/james-bowman/sparse"
	"gonum.org/v1/gonum/mat"
)

// Gram returns the dense m×m matrix A·Aᵀ of an m×n sparse a, given its
// transpose at, computed sparse by sparse: row i of the result sums
// a_ij · (row j of aᵀ) over the stored a_ij. Rows are computed in parallel,
// each in a fixed order, so the bits do not depend on GOMAXPROCS. For
// Aᵀ·A call Gram(at, a).
func Gram(a, at *sparse.CSR) *mat.SymDense {
	raw, rawT := a.RawMatrix(), at.RawMatrix()
	m := raw.I
	g := mat.NewSymDense(m, nil)
	data := g.RawSymmetric().Data
	stride := g.RawSymmetric().Stride
	rowRange := func(lo, hi int) {
		for i := lo; i < hi; i++ {
			out := data[i*stride : i*stride+m]
			for k := raw.Indptr[i]; k < raw.Indptr[i+1]; k++ {
				v, j := raw.Data[k], raw.Ind[k]
				for t := rawT.Indptr[j]; t < rawT.Indptr[j+1]; t++ {
					out[rawT.Ind[t]] += v * rawT.Data[t]
				}
			}
		}
	}
	workers := runtime.GOMAXPROCS(0)
	if workers <= 1 || m < 64 {
		rowRange(0, m)
		return g
	}
	var wg sync.WaitGroup
	next := make(chan int, (m+63)/64)
	for lo := 0; lo < m; lo += 64 {
		next <- lo
	}
	close(next)
	for range workers {
		wg.Go(func() {
			for lo := range next {
				rowRange(lo, min(lo+64, m))
			}
		})
	}
	wg.Wait()
	return g
}

// gramSVD computes the leading k singular triplets exactly from the
// eigendecomposition of the smaller Gram matrix.
func gramSVD(a *sparse.CSR, k int) *SVD {
	m, n := a.Dims()
	wide := m <= n // A·Aᵀ is the smaller one
	at := Transpose(a)
	var g *mat.SymDense
	if wide {
		g = Gram(a, at)
	} else {
		g = Gram(at, a)
	}
	var eig mat.EigenSym
	if !eig.Factorize(g, true) {
		panic("sparsemat: eigendecomposition of a Gram matrix did not converge")
	}
	lambda := eig.Values(nil) // ascending
	var vecs mat.Dense
	eig.VectorsTo(&vecs)
	size := len(lambda)
	// Eigenvalues at or below max(m, n)·ε·λ_max are rounding noise of a
	// zero singular value (the Gram route turns ε·σ₁ noise into √ε·σ₁).
	zero := float64(max(m, n)) * 0x1p-52 * math.Max(lambda[size-1], 0)
	vals := make([]float64, k)
	small := mat.NewDense(size, k, nil) // singular vectors on the small side
	for t := range k {
		src := size - 1 - t
		if lambda[src] > zero {
			vals[t] = math.Sqrt(lambda[src])
		}
		for i := range size {
			small.Set(i, t, vecs.At(i, src))
		}
	}
	// The other side: A·v = σ·u, so u = A·v/σ (or v = Aᵀ·u/σ); columns for
	// σ = 0 stay zero.
	var other mat.Dense
	if wide {
		MulDense(&other, at, small) // n×k: Aᵀ·U
	} else {
		MulDense(&other, a, small) // m×k: A·V
	}
	r, _ := other.Dims()
	for t := range k {
		inv := 0.0
		if vals[t] > 0 {
			inv = 1 / vals[t]
		}
		for i := range r {
			other.Set(i, t, other.At(i, t)*inv)
		}
	}
	if wide {
		return &SVD{Values: vals, U: small, V: &other, Exact: true}
	}
	return &SVD{Values: vals, U: &other, V: small, Exact: true}
}
