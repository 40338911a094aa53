package selection

import (
	"fmt"
	"math"

	"github.com/james-bowman/sparse"
	"gonum.org/v1/gonum/mat"

	"assay/sparsemat"
)

// GroupRule names how a document is attached to an exemplar.
type GroupRule string

// The rules. See [Explain].
const (
	// GroupShare attaches a document to the exemplar that carries the
	// largest part of what the exemplars reconstruct of it.
	GroupShare GroupRule = "share"
	// GroupCosine attaches a document to the exemplar it is most similar
	// to (cosine of the weighted rows).
	GroupCosine GroupRule = "cosine"
)

// Explanation says, for every row of A, how much of it the picked rows
// span and which picked row stands for it.
type Explanation struct {
	// Coverage is ‖P_R·a_i‖²/‖a_i‖² for every row a_i: the share of the
	// document that lies in the span of the exemplars (0 for a zero row).
	Coverage []float64
	// Group is, for every row, the index into CUR.Rows of its exemplar
	// (-1 for a zero row).
	Group []int
	// Score is the value the rule maximised for that row.
	Score []float64
}

// Explain computes coverage and groups for every row of a, with one sparse
// product A·Q_R and one A·Rᵀ (both m×r).
//
// With GroupShare, the projection of a_i on the span of the exemplars is
// written in their terms, P_R·a_i = Σ_j x_ij·r_j with x_i = a_i·R⁺, and row
// i goes to the exemplar j with the largest x_ij·⟨r_j, a_i⟩: these parts
// add up to ‖P_R·a_i‖², so the rule picks the exemplar through which most
// of the reconstructed document comes. With GroupCosine, row i goes to the
// exemplar with the largest ⟨r_j, a_i⟩/(‖r_j‖·‖a_i‖). Ties go to the
// exemplar picked first. An exemplar is always in its own group.
func Explain(a *sparse.CSR, cur *CUR, rule GroupRule) (Explanation, error) {
	if rule != GroupShare && rule != GroupCosine {
		return Explanation{}, fmt.Errorf("unknown group rule %q (allowed: share, cosine)", rule)
	}
	m, _ := a.Dims()
	r := len(cur.Rows)
	ex := Explanation{Coverage: make([]float64, m), Group: make([]int, m), Score: make([]float64, m)}
	rowSq := sparsemat.RowSqNorms(a)

	var rt mat.Dense
	rt.CloneFrom(cur.R.T()) // n×r
	var art mat.Dense
	sparsemat.MulDense(&art, a, &rt) // m×r: ⟨a_i, r_j⟩
	q, s, v := rangeBasis(mat.DenseCopyOf(&rt))
	var aq mat.Dense
	sparsemat.MulDense(&aq, a, q) // m×r': coordinates of P_R·a_i
	for i := range m {
		if rowSq[i] > 0 {
			row := aq.RawRowView(i)
			var c float64
			for _, x := range row {
				c += x * x
			}
			ex.Coverage[i] = math.Min(1, c/rowSq[i])
		}
	}
	// x_i = a_i·R⁺ = (a_i·Q_R)·S⁻¹·Vᵀ (R = V·S·Q_Rᵀ).
	var x mat.Dense
	if len(s) > 0 {
		scaled := mat.DenseCopyOf(&aq)
		_, rq := scaled.Dims()
		for i := range m {
			row := scaled.RawRowView(i)
			for t := range rq {
				row[t] /= s[t]
			}
		}
		x.Mul(scaled, v.T()) // m×r
	}
	rNorm := make([]float64, r)
	for j := range r {
		rNorm[j] = mat.Norm(cur.R.RowView(j), 2)
	}
	for i := range m {
		ex.Group[i] = -1
		if rowSq[i] == 0 {
			continue
		}
		best, bestScore := -1, math.Inf(-1)
		for j := range r {
			var sc float64
			switch rule {
			case GroupShare:
				if len(s) > 0 {
					sc = x.At(i, j) * art.At(i, j)
				}
			case GroupCosine:
				if rNorm[j] > 0 {
					sc = art.At(i, j) / (rNorm[j] * math.Sqrt(rowSq[i]))
				}
			}
			if sc > bestScore {
				best, bestScore = j, sc
			}
		}
		ex.Group[i], ex.Score[i] = best, bestScore
	}
	for j, p := range cur.Rows {
		ex.Group[p.Index] = j
	}
	return ex, nil
}

// TermCoverage returns, for each column j in cols, the share of the
// column A(:, j) that the projection onto the exemplars' span keeps:
// ‖(A·P_R)(:, j)‖²/‖A(:, j)‖² (0 for an empty column).
func TermCoverage(a *sparse.CSR, cur *CUR, cols []int) []float64 {
	var rt mat.Dense
	rt.CloneFrom(cur.R.T())
	q, _, _ := rangeBasis(&rt) // n×r'
	var aq mat.Dense
	sparsemat.MulDense(&aq, a, q) // m×r'
	var g mat.Dense
	g.Mul(aq.T(), &aq) // r'×r': Gram of A·Q_R
	colSq := sparsemat.ColSqNorms(a)
	out := make([]float64, len(cols))
	_, rq := q.Dims()
	for k, j := range cols {
		if colSq[j] == 0 {
			continue
		}
		// (A·P_R)(:, j) = (A·Q_R)·q_j with q_j the j-th row of Q_R.
		qj := mat.NewVecDense(rq, append([]float64(nil), q.RawRowView(j)[:rq]...))
		var gq mat.VecDense
		gq.MulVec(&g, qj)
		out[k] = math.Min(1, mat.Dot(qj, &gq)/colSq[j])
	}
	return out
}

// PrefixShares returns, for t = 1 … len(cur.Rows), the share of ‖A‖_F²
// that the span of the first t picked rows captures, in the order they
// were picked. It takes one Householder QR of Rᵀ in pick order (so the
// first t columns of Q span the first t rows) and one product A·Q: the
// share after t picks is Σ_{s≤t} ‖A·q_s‖²/‖A‖². A pick that adds no new
// direction (its diagonal in the QR factor is at or below ε times the
// largest one times its size) adds nothing.
func PrefixShares(a *sparse.CSR, cur *CUR) []float64 {
	r := len(cur.Rows)
	out := make([]float64, r)
	if r == 0 {
		return out
	}
	var rt mat.Dense
	rt.CloneFrom(cur.R.T()) // n×r, columns in pick order
	n, _ := rt.Dims()
	if n < r {
		// Fewer terms than picks: at most n directions; fall back to the
		// span of each prefix.
		for t := range r {
			out[t] = prefixSpan(a, cur, t+1)
		}
		return out
	}
	tri := sparsemat.HouseholderQR(&rt) // rt becomes Q, in pick order
	diag := make([]float64, r)
	var dmax float64
	for t := range r {
		diag[t] = math.Abs(tri.At(t, t))
		dmax = math.Max(dmax, diag[t])
	}
	var aq mat.Dense
	sparsemat.MulDense(&aq, a, &rt) // m×r
	total := sparsemat.FrobeniusSq(a)
	m, _ := aq.Dims()
	var acc float64
	tol := float64(max(n, r)) * epsilon * dmax
	for t := range r {
		if diag[t] > tol {
			var c float64
			for i := range m {
				v := aq.At(i, t)
				c += v * v
			}
			acc += c
		}
		out[t] = math.Min(1, acc/total)
	}
	return out
}

// prefixSpan is the captured share of the span of the first t picked rows.
func prefixSpan(a *sparse.CSR, cur *CUR, t int) float64 {
	var rt mat.Dense
	rt.CloneFrom(cur.R.Slice(0, t, 0, cur.R.RawMatrix().Cols).T())
	q, _, _ := rangeBasis(&rt)
	var aq mat.Dense
	sparsemat.MulDense(&aq, a, q)
	return frobSq(&aq) / sparsemat.FrobeniusSq(a)
}
