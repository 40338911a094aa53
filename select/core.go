package selection

import (
	"github.com/james-bowman/sparse"
	"gonum.org/v1/gonum/mat"

	"assay/sparsemat"
)

// optimalCore sets cur.U = C⁺·A·R⁺, the U that minimises ‖A − C·U·R‖_F for
// the picked C and R, through QR factorisations of C and Rᵀ:
//
//	C  = Q_C·S_C·V_Cᵀ,  Rᵀ = Q_R·S_R·V_Rᵀ   (QR, then the SVD of the small factor)
//	M  = Q_Cᵀ·A·Q_R                         (one sparse product, A·Q_R)
//	U  = V_C·S_C⁻¹·M·S_R⁻¹·V_Rᵀ
//
// With rank > 0 and rank below the rank of M, M is replaced by its best
// rank-`rank` approximation M_k first. Since C·U·R = Q_C·M·Q_Rᵀ is then a
// projection of A, ‖A − CUR‖² = ‖A‖² − ‖M‖² (or ‖A‖² − ‖M_k‖²): exact, with
// no m×n matrix.
func optimalCore(a *sparse.CSR, cur *CUR, rank int) {
	qc, sc, vc := rangeBasis(cur.C)
	var rt mat.Dense
	rt.CloneFrom(cur.R.T())
	qr, sr, vr := rangeBasis(&rt)
	cur.qr = qr
	if len(sc) == 0 || len(sr) == 0 {
		cur.U = mat.NewDense(len(cur.Cols), len(cur.Rows), nil)
		return
	}
	var aqr, m mat.Dense
	sparsemat.MulDense(&aqr, a, qr) // m×r'
	cur.rowSpace = frobSq(&aqr)     // ‖A·R⁺R‖², for the figures
	m.Mul(qc.T(), &aqr)             // c'×r'
	mr, mc := m.Dims()
	// The rank of the core is the numerical rank of M (singular values
	// above max(c', r')·ε·s₁); with a CoreRank below it, M becomes its best
	// rank-CoreRank approximation.
	var svd mat.SVD
	coreRank := 0
	if svd.Factorize(&m, mat.SVDThin) {
		vals := svd.Values(nil)
		coreRank = NumericalRank(vals, mr, mc)
		if rank > 0 && rank < coreRank {
			var u, v mat.Dense
			svd.UTo(&u)
			svd.VTo(&v)
			var us mat.Dense
			us.Mul(u.Slice(0, mr, 0, rank), mat.NewDiagDense(rank, vals[:rank]))
			m.Reset()
			m.Mul(&us, v.Slice(0, mc, 0, rank).T())
			coreRank = rank
		}
	}
	cur.projected = frobSq(&m)
	cur.CoreRank = coreRank
	// U = V_C·S_C⁻¹·M·S_R⁻¹·V_Rᵀ.
	scaled := mat.DenseCopyOf(&m)
	for i := range mr {
		for j := range mc {
			scaled.Set(i, j, scaled.At(i, j)/(sc[i]*sr[j]))
		}
	}
	var left mat.Dense
	left.Mul(vc, scaled)
	cur.U = new(mat.Dense)
	cur.U.Mul(&left, vr.T())
}

// frobSq returns ‖x‖_F².
func frobSq(x *mat.Dense) float64 {
	r, c := x.Dims()
	var s float64
	for i := range r {
		for _, v := range x.RawRowView(i)[:c] {
			s += v * v
		}
	}
	return s
}
