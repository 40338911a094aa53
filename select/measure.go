package selection

import (
	"math"

	"github.com/james-bowman/sparse"
	"gonum.org/v1/gonum/mat"

	"assay/sparsemat"
)

// ErrorSq returns ‖A − C·U·R‖_F² from the expansion in the package
// documentation, without forming an m×n matrix. Rounding can make the
// expansion slightly negative for a near-exact decomposition; the result is
// clamped at zero.
func ErrorSq(a *sparse.CSR, cur *CUR) float64 {
	normSq := sparsemat.FrobeniusSq(a)
	var rt mat.Dense
	rt.CloneFrom(cur.R.T()) // n×r
	var art mat.Dense
	sparsemat.MulDense(&art, a, &rt) // m×r
	var ctart, ctc, rrt mat.Dense
	ctart.Mul(cur.C.T(), &art) // c×r
	ctc.Mul(cur.C.T(), cur.C)  // c×c
	rrt.Mul(cur.R, cur.R.T())  // r×r
	var cu, curr mat.Dense
	cu.Mul(&ctc, cur.U) // c×r
	curr.Mul(&cu, &rrt) // c×r
	cross := frobDot(&ctart, cur.U)
	self := frobDot(&curr, cur.U)
	return math.Max(0, normSq-2*cross+self)
}

// frobDot returns Σ a_ij·b_ij.
func frobDot(a, b *mat.Dense) float64 {
	r, c := a.Dims()
	var s float64
	for i := range r {
		for j := range c {
			s += a.At(i, j) * b.At(i, j)
		}
	}
	return s
}

// Figures are a decomposition's reconstruction figures beside the best
// rank-k approximation.
type Figures struct {
	// NormSq is ‖A‖_F².
	NormSq float64
	// ErrSq is ‖A − CUR‖_F².
	ErrSq float64
	// Rank is k.
	Rank int
	// BestErrSq is ‖A − A_k‖_F² = ‖A‖_F² − Σ_{i≤k} σ_i², at least 0.
	BestErrSq float64
}

// NewFigures computes the figures from ‖A‖², ‖A − CUR‖² and the leading
// singular values (at least k of them).
func NewFigures(normSq, errSq float64, singular []float64, k int) Figures {
	var top float64
	for _, s := range singular[:min(k, len(singular))] {
		top += s * s
	}
	return Figures{NormSq: normSq, ErrSq: errSq, Rank: k, BestErrSq: math.Max(0, normSq-top)}
}

// RelErr is ‖A − CUR‖_F/‖A‖_F.
func (f Figures) RelErr() float64 { return math.Sqrt(f.ErrSq / f.NormSq) }

// Captured is the share of ‖A‖_F² the decomposition captures, 1 − e².
// It is negative when the decomposition is farther from A than zero is.
func (f Figures) Captured() float64 { return 1 - f.ErrSq/f.NormSq }

// BestRelErr is ‖A − A_k‖_F/‖A‖_F.
func (f Figures) BestRelErr() float64 { return math.Sqrt(f.BestErrSq / f.NormSq) }

// BestCaptured is the share the best rank-k approximation captures.
func (f Figures) BestCaptured() float64 { return 1 - f.BestErrSq/f.NormSq }

// Ratio is ‖A − CUR‖_F/‖A − A_k‖_F; ok is false when A_k is exact (to
// within 1e-12 of ‖A‖²), where the ratio has no meaning.
func (f Figures) Ratio() (ratio float64, ok bool) {
	if f.BestErrSq <= 1e-12*f.NormSq {
		return 0, false
	}
	return math.Sqrt(f.ErrSq / f.BestErrSq), true
}
