package sparsemat

import (
	"errors"
	"fmt"
	"math"
	"math/rand/v2"

	"github.com/james-bowman/sparse"
	"gonum.org/v1/gonum/lapack/lapack64"
	"gonum.org/v1/gonum/mat"
)

// ExactLimit is the largest min(m, n) for which [TruncatedSVD] computes
// the exact SVD (an eigendecomposition of an ExactLimit² Gram matrix takes
// about a second here: 0.25 s at 500, 2.4 s at 1000).
const ExactLimit = 800

// DefaultPowerIters is the number of power iterations of [TruncatedSVD]
// when the caller has no reason to choose.
const DefaultPowerIters = 2

// SVDOptions configures [TruncatedSVD].
type SVDOptions struct {
	// Rank is the number k of singular triplets wanted (k ≥ 1).
	Rank int
	// Oversample is the number of extra sketch columns; 0 means
	// max(10, ⌈0.1·k⌉).
	Oversample int
	// PowerIters is the number q of power iterations (0 is allowed).
	PowerIters int
	// Seed drives the Gaussian test matrix.
	Seed uint64
	// Randomized forces the randomized algorithm even when min(m, n) ≤
	// ExactLimit (for tests and benchmarks).
	Randomized bool
}

// SVD holds the leading singular triplets of a matrix: A ≈ U·diag(Values)·Vᵀ.
type SVD struct {
	// Values are the singular values, largest first.
	Values []float64
	// U is m×k with orthonormal columns (left singular vectors).
	U *mat.Dense
	// V is n×k with orthonormal columns (right singular vectors).
	V *mat.Dense
	// Exact is true when the sketch spanned the whole row or column space,
	// so the values are exact up to rounding.
	Exact bool
}

// TruncatedSVD computes the leading opts.Rank singular triplets of a by the
// randomized range finder with power iterations (Halko, Martinsson and
// Tropp, "Finding structure with randomness", SIAM Review 53(2), 2011,
// algorithms 4.4 and 5.1). at must be the transpose of a.
//
// The sketch has l = k + oversample columns (at most min(m, n)).
//
// When min(m, n) ≤ [ExactLimit] it computes the SVD exactly instead, from
// the eigendecomposition of the smaller Gram matrix (A·Aᵀ or Aᵀ·A, formed
// sparse-by-sparse, never from a dense A): text spectra decay slowly, and
// on the demo corpus two power iterations under-estimate the rank-12
// captured share by 3% (0.260 against 0.2675), which would flatter every
// figure measured against it. The Gram route squares the condition number,
// which loses accuracy only in singular values below √ε·σ₁ — far below
// anything the figures use.
//
// It returns an error when a is empty or the rank is out of range; Rank is
// clamped to min(m, n).
func TruncatedSVD(a, at *sparse.CSR, opts SVDOptions) (*SVD, error) {
	m, n := a.Dims()
	if m == 0 || n == 0 {
		return nil, errors.New("svd of an empty matrix")
	}
	if opts.Rank < 1 {
		return nil, fmt.Errorf("svd rank %d is less than 1", opts.Rank)
	}
	if opts.PowerIters < 0 {
		return nil, fmt.Errorf("power iterations %d is negative", opts.PowerIters)
	}
	small := min(m, n)
	k := min(opts.Rank, small)
	if small <= ExactLimit && !opts.Randomized {
		return gramSVD(a, at, k), nil
	}
	p := opts.Oversample
	if p <= 0 {
		p = max(10, (k+9)/10)
	}
	l := min(k+p, small)
	exact := l == small

	omega := mat.NewDense(n, l, nil)
	rng := rand.New(rand.NewPCG(opts.Seed, 0x5eed5eed))
	od := omega.RawMatrix().Data
	for i := range od {
		od[i] = rng.NormFloat64()
	}

	var y, z mat.Dense
	MulDense(&y, a, omega) // m×l
	orthonormalize(&y)
	for range opts.PowerIters {
		z.Reset()
		MulDense(&z, at, &y) // n×l
		orthonormalize(&z)
		y.Reset()
		MulDense(&y, a, &z)
		orthonormalize(&y)
	}
	// Bᵀ = Aᵀ·Q is n×l; its thin SVD Bᵀ = Ũ Σ Ṽᵀ gives A ≈ (Q Ṽ) Σ Ũᵀ.
	var bt mat.Dense
	MulDense(&bt, at, &y)
	var svd mat.SVD
	if !svd.Factorize(&bt, mat.SVDThin) {
		return nil, errors.New("svd of the projected matrix did not converge")
	}
	vals := svd.Values(nil)
	var ut, vt mat.Dense
	svd.UTo(&ut) // n×l
	svd.VTo(&vt) // l×l
	var u mat.Dense
	u.Mul(&y, &vt) // m×l dense × dense
	out := &SVD{
		Values: vals[:k],
		U:      mat.DenseCopyOf(u.Slice(0, m, 0, k)),
		V:      mat.DenseCopyOf(ut.Slice(0, n, 0, k)),
		Exact:  exact,
	}
	for i, v := range out.Values {
		if v < 0 || math.IsNaN(v) {
			out.Values[i] = 0
		}
	}
	return out, nil
}

// orthonormalize replaces the columns of y (rows ≥ columns) by an
// orthonormal basis of their span, from a Householder QR (LAPACK dgeqrf and
// dorgqr through gonum).
func orthonormalize(y *mat.Dense) {
	r, c := y.Dims()
	if c > r {
		panic("sparsemat: orthonormalize needs rows ≥ columns")
	}
	g := y.RawMatrix()
	tau := make([]float64, c)
	work := make([]float64, 1)
	lapack64.Geqrf(g, tau, work, -1)
	work = make([]float64, int(work[0]))
	lapack64.Geqrf(g, tau, work, len(work))
	lapack64.Orgqr(g, tau, work, -1)
	if n := int(work[0]); n > len(work) {
		work = make([]float64, n)
	}
	lapack64.Orgqr(g, tau, work, len(work))
}
