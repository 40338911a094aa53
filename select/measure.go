package selection

import (
	"math"

	"github.com/james-bowman/sparse"
	"gonum.org/v1/gonum/mat"

	"assay/sparsemat"
)

// ErrorSq returns ‖A − C·U·R‖_F² without forming an m×n matrix. For the
// optimal core it is ‖A‖² − ‖Q_Cᵀ·A·Q_R‖² (see optimalCore); for the
// intersection core it comes from expanding the square,
//
//	‖A − CUR‖² = ‖A‖² − 2⟨CᵀARᵀ, U⟩ + ⟨CᵀC·U·RRᵀ, U⟩,
//
// where every matrix on the right is c×c, r×r or c×r and A·Rᵀ is one
// sparse-times-dense product. Rounding can make either slightly negative
// for a near-exact decomposition; the result is clamped at zero.
func ErrorSq(a *sparse.CSR, cur *CUR) float64 {
	normSq := sparsemat.FrobeniusSq(a)
	if cur.Core == CoreOptimal {
		return math.Max(0, normSq-cur.projected)
	}
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

// RowSpaceSq returns ‖A·R⁺R‖_F², the part of ‖A‖_F² that lies in the span
// of the picked rows: ‖A·Q_R‖_F² for an orthonormal basis Q_R of that span.
func RowSpaceSq(a *sparse.CSR, cur *CUR) float64 {
	if cur.rowSpace >= 0 {
		return cur.rowSpace
	}
	qr := cur.qr
	if qr == nil {
		var rt mat.Dense
		rt.CloneFrom(cur.R.T())
		qr, _, _ = rangeBasis(&rt)
		cur.qr = qr
	}
	var aq mat.Dense
	sparsemat.MulDense(&aq, a, qr)
	cur.rowSpace = frobSq(&aq)
	return cur.rowSpace
}

// Quality holds what a decomposition reconstructs, for the picked rows
// alone and for the joint C·U·R, beside the best possible of each size.
type Quality struct {
	// NormSq is ‖A‖_F².
	NormSq float64
	// DocsSq is ‖A·R⁺R‖_F²: what the span of the r picked rows captures.
	DocsSq float64
	// DocsCount is r, the number of distinct picked rows.
	DocsCount int
	// DocsBestSq is Σ_{i≤r} σ_i², the most any r-dimensional row space
	// captures (Eckart–Young).
	DocsBestSq float64
	// ErrSq is ‖A − CUR‖_F².
	ErrSq float64
	// Rank is k.
	Rank int
	// BestErrSq is ‖A − A_k‖_F² = ‖A‖_F² − Σ_{i≤k} σ_i², at least 0.
	BestErrSq float64
	// ValuesExact is false when the singular values come from a randomized
	// SVD: they are then lower bounds, and so are the "best" shares.
	ValuesExact bool
}

// Measure computes the quality of cur on a with rank k, given the leading
// singular values of a (at least max(k, len(cur.Rows)) of them, or all
// there are).
func Measure(a *sparse.CSR, cur *CUR, svd *sparsemat.SVD, k int) Quality {
	q := Quality{NormSq: sparsemat.FrobeniusSq(a), Rank: k, ValuesExact: svd.Exact}
	q.ErrSq = ErrorSq(a, cur)
	q.DocsSq = RowSpaceSq(a, cur)
	q.DocsCount = len(cur.Rows)
	q.DocsBestSq = sumSq(svd.Values, q.DocsCount)
	q.BestErrSq = math.Max(0, q.NormSq-sumSq(svd.Values, k))
	return q
}

func sumSq(v []float64, k int) float64 {
	var s float64
	for _, x := range v[:min(k, len(v))] {
		s += x * x
	}
	return s
}

// DocsShare is ‖A·R⁺R‖²/‖A‖²: the share of the corpus the picked documents
// span.
func (q Quality) DocsShare() float64 { return q.DocsSq / q.NormSq }

// DocsBestShare is Σ_{i≤r} σ_i²/‖A‖²: the most r documents' span could.
func (q Quality) DocsBestShare() float64 { return q.DocsBestSq / q.NormSq }

// EtaDocs is DocsShare/DocsBestShare (1 is the best possible); ok is false
// when the best share is zero.
func (q Quality) EtaDocs() (float64, bool) {
	if q.DocsBestSq <= 0 {
		return 0, false
	}
	return q.DocsSq / q.DocsBestSq, true
}

// RelErr is e = ‖A − CUR‖_F/‖A‖_F.
func (q Quality) RelErr() float64 { return math.Sqrt(q.ErrSq / q.NormSq) }

// Captured is 1 − e², negative when C·U·R is farther from A than zero is.
func (q Quality) Captured() float64 { return 1 - q.ErrSq/q.NormSq }

// BestRelErr is ‖A − A_k‖_F/‖A‖_F.
func (q Quality) BestRelErr() float64 { return math.Sqrt(q.BestErrSq / q.NormSq) }

// BestCaptured is the share the best rank-k approximation captures.
func (q Quality) BestCaptured() float64 { return 1 - q.BestErrSq/q.NormSq }

// Ratio is ρ = ‖A − CUR‖_F/‖A − A_k‖_F; ok is false when A_k is exact (to
// within 1e-12 of ‖A‖²), where the ratio has no meaning.
func (q Quality) Ratio() (float64, bool) {
	if q.BestErrSq <= 1e-12*q.NormSq {
		return 0, false
	}
	return math.Sqrt(q.ErrSq / q.BestErrSq), true
}

// Eta is η = (‖A‖² − ‖A−CUR‖²)/(‖A‖² − ‖A−A_k‖²): the captured share
// relative to the best rank-k one; ok is false when A_k captures nothing.
func (q Quality) Eta() (float64, bool) {
	best := q.NormSq - q.BestErrSq
	if best <= 0 {
		return 0, false
	}
	return (q.NormSq - q.ErrSq) / best, true
}
