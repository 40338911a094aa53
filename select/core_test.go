package selection

import (
	"fmt"
	"math"
	"testing"

	"github.com/james-bowman/sparse"
	"gonum.org/v1/gonum/mat"

	"assay/sparsemat"
)

// tolCore: U from the package (QR of C and Rᵀ, then small SVDs) and the
// dense oracle C⁺·A·R⁺ (gonum SVD) are both backward stable, so they differ
// by about cond(C)·cond(R)·ε·‖U‖. The fixtures keep cond(C)·cond(R) below
// maxCond (checked), giving at most 1e-10 relative; 1e-8 relative to ‖U‖_F
// is the margin. A wrong factor, transpose or weight is off by O(1).
const tolCore = 1e-8

// maxCond bounds cond(C)·cond(R) on the fixtures of the U comparisons, the
// premise of tolCore.
const maxCond = 1e5

// tolErrSq: ErrorSq and the dense ‖A − CUR‖_F² both end in a sum of
// squares of a few thousand terms and a cancellation against ‖A‖²; each is
// within about 1e-13·‖A‖² of the exact value. 1e-10·‖A‖² is the margin.
const tolErrSq = 1e-10

// tolRatio: Ratio and Eta divide ErrorSq by ‖A − A_k‖² or Σ_{i≤k} σ_i²,
// both at least minShare·‖A‖² on the fixtures (checked), so an error of
// tolErrSq·‖A‖² moves them by at most tolErrSq/minShare = 1e-8.
const tolRatio = 1e-8

// minShare is the least share of ‖A‖² the fixtures have both inside and
// outside the leading k singular values (the premise of tolRatio).
const minShare = 0.01

// tolExpand: the trace expansion of the intersection core cancels terms as
// large as ‖A‖² + ‖CUR‖² (‖CUR‖ can far exceed ‖A‖ when W is badly
// conditioned); each of the c×r sums is within about 1e-13 of that scale,
// so 1e-9 relative to it is the margin.
const tolExpand = 1e-9

// allMethods lists every method with what it needs.
var allMethods = []Method{MethodNorm, MethodLeverage, MethodTop, MethodPivot, MethodGreedy}

// randomFixtures are small random matrices on which dense oracles are
// cheap.
var randomFixtures = []struct {
	name       string
	m, n       int
	density    float64
	seed       uint64
	rows, cols int
	k          int
}{
	{"30x20", 30, 20, 0.35, 1, 8, 6, 3},
	{"25x40", 25, 40, 0.3, 2, 6, 9, 4},
	{"60x15", 60, 15, 0.5, 3, 10, 5, 2},
}

func selectFor(t *testing.T, a *sparse.CSR, svd *sparsemat.SVD, method Method, core Core, rows, cols, k, coreRank int, seed uint64) *CUR {
	t.Helper()
	cur, err := Select(a, Options{Method: method, Core: core, Rows: rows, Cols: cols, Rank: k, CoreRank: coreRank, Seed: seed, SVD: svd, PowerIters: 1})
	if err != nil {
		t.Fatal(err)
	}
	return cur
}

// cond is σ_max/σ_min over the singular values above numpy's rank
// threshold.
func cond(t *testing.T, x mat.Matrix) float64 {
	t.Helper()
	_, s, _ := denseSVD(t, x)
	tol := numpyRankTol(x, s)
	last := s[0]
	for _, v := range s {
		if v > tol {
			last = v
		}
	}
	return s[0] / last
}

// checkU compares got with want relative to ‖want‖_F.
func checkU(t *testing.T, got, want *mat.Dense) {
	t.Helper()
	gr, gc := got.Dims()
	wr, wc := want.Dims()
	if gr != wr || gc != wc {
		t.Fatalf("U is %d×%d, want %d×%d", gr, gc, wr, wc)
	}
	var diff mat.Dense
	diff.Sub(got, want)
	if d, n := mat.Norm(&diff, 2), mat.Norm(want, 2); d > tolCore*math.Max(n, 1e-300) {
		t.Errorf("‖U − oracle‖ = %g, ‖oracle‖ = %g", d, n)
	}
}

// TestOptimalCoreMatchesDense: the default core is U = C⁺·A·R⁺, the
// minimiser of ‖A − C·U·R‖_F for fixed C and R (Stewart, "Four algorithms
// for the efficient computation of truncated pivoted QR approximations to
// a sparse matrix", Numer. Math. 83, 1999; from memory). The oracle is
// computed densely with gonum's SVD; ErrorSq must equal the dense
// ‖A − C·U·R‖_F², for every method.
func TestOptimalCoreMatchesDense(t *testing.T) {
	for _, f := range randomFixtures {
		a := randomCSR(f.m, f.n, f.density, f.seed)
		d := denseOf(a)
		svd := exactSVD(t, a)
		for _, method := range allMethods {
			t.Run(f.name+"/"+string(method), func(t *testing.T) {
				cur := selectFor(t, a, svd, method, "", f.rows, f.cols, f.k, 0, f.seed)
				if cur.Core != CoreOptimal {
					t.Errorf("default core %q, want %q", cur.Core, CoreOptimal)
				}
				if c := cond(t, cur.C) * cond(t, cur.R); c > maxCond {
					t.Fatalf("cond(C)·cond(R) = %g exceeds the premise of tolCore", c)
				}
				var left, want mat.Dense
				left.Mul(densePinv(t, cur.C), d)
				want.Mul(&left, densePinv(t, cur.R))
				checkU(t, cur.U, &want)
				fro := frob2(d)
				if got, w := ErrorSq(a, cur), errDense(d, cur); math.Abs(got-w) > tolErrSq*fro {
					t.Errorf("ErrorSq %.15g, dense ‖A − CUR‖² %.15g", got, w)
				}
				if want := min(denseRank(t, cur.C), denseRank(t, cur.R)); cur.CoreRank != want {
					t.Errorf("CoreRank %d, want min(rank C, rank R) = %d", cur.CoreRank, want)
				}
			})
		}
	}
}

// TestOptimalCoreZeroProjection: when the picked columns and rows lie in
// different diagonal blocks of A, Q_Cᵀ·A·Q_R is zero, so the optimal U is
// zero, the error is all of ‖A‖², and the core has rank 0. The picks are
// forced through MethodTop with hand-made singular vectors (column scores
// on columns 0, 1 of the first block; row scores on rows 2, 3 of the
// second).
func TestOptimalCoreZeroProjection(t *testing.T) {
	d := mat.NewDense(4, 4, []float64{
		1, 2, 0, 0,
		3, 1, 0, 0,
		0, 0, 2, 1,
		0, 0, 1, 3,
	})
	a := csrOf(d)
	svd := &sparsemat.SVD{
		Values: []float64{1, 1},
		U:      mat.NewDense(4, 2, []float64{0, 0, 0, 0, 1, 0, 0, 1}),
		V:      mat.NewDense(4, 2, []float64{1, 0, 0, 1, 0, 0, 0, 0}),
	}
	cur, err := Select(a, Options{Method: MethodTop, Rank: 2, Rows: 2, Cols: 2, SVD: svd})
	if err != nil {
		t.Fatal(err)
	}
	if fmt.Sprint(indices(cur.Cols), indices(cur.Rows)) != "[0 1] [2 3]" {
		t.Fatalf("fixture picks columns %v rows %v, want [0 1] and [2 3]", indices(cur.Cols), indices(cur.Rows))
	}
	if !mat.Equal(cur.U, mat.NewDense(2, 2, nil)) {
		t.Errorf("U = %v, want zero", mat.Formatted(cur.U))
	}
	if got, want := ErrorSq(a, cur), frob2(d); math.Abs(got-want) > tolErrSq*want {
		t.Errorf("ErrorSq %g, want ‖A‖² = %g", got, want)
	}
	if cur.CoreRank != 0 {
		t.Errorf("CoreRank %d for a zero projected core Q_Cᵀ·A·Q_R, want its rank, 0", cur.CoreRank)
	}
}

// checkRankK checks the optimal core truncated to rank k on a: U equals
// C⁺·[P_C·A·P_R]_k·R⁺, where P_C = C·C⁺ and P_R = R⁺·R and [·]_k is the
// best rank-k approximation (the rank-constrained minimiser of
// ‖A − C·X·R‖_F, Friedland and Torokhti, SIAM J. Matrix Anal. Appl. 29(2),
// 2007; from memory); C·U·R has rank ≤ k (gonum SVD, numpy's rule);
// ErrorSq equals the dense error; and by Eckart–Young (1936), no rank-k
// matrix beats A_k: ErrorSq ≥ ‖A − A_k‖² − tol, Ratio ≥ 1 − tol and
// Eta ≤ 1 + tol.
func checkRankK(t *testing.T, a *sparse.CSR, d *mat.Dense, svd *sparsemat.SVD, cur *CUR, k int, bestErr float64) {
	t.Helper()
	fro := frob2(d)
	if c := cond(t, cur.C) * cond(t, cur.R); c > maxCond {
		t.Fatalf("cond(C)·cond(R) = %g exceeds the premise of tolCore", c)
	}
	cp, rp := densePinv(t, cur.C), densePinv(t, cur.R)
	// P_C·A·P_R, multiplied in the order that keeps every factor thin.
	var cta, ccta, ar, core mat.Dense
	cta.Mul(cp, d)
	ccta.Mul(cur.C, &cta)
	ar.Mul(&ccta, rp)
	core.Mul(&ar, cur.R)
	cu, cs, cv := denseSVD(t, &core)
	if r := rankOf(&core, cs); r <= k {
		t.Fatalf("fixture: P_C·A·P_R has rank %d, not above k = %d", r, k)
	}
	best := mat.NewDense(core.RawMatrix().Rows, core.RawMatrix().Cols, nil)
	for i := range k {
		var outer mat.Dense
		outer.Outer(cs[i], cu.ColView(i), cv.ColView(i))
		best.Add(best, &outer)
	}
	var left, want mat.Dense
	left.Mul(cp, best)
	want.Mul(&left, rp)
	checkU(t, cur.U, &want)
	if cur.CoreRank != k {
		t.Errorf("CoreRank %d, want %d", cur.CoreRank, k)
	}
	prod := curDense(cur)
	_, s, _ := denseSVD(t, prod)
	if r := rankOf(prod, s); r > k {
		t.Errorf("C·U·R has rank %d > k = %d (σ_%d/σ_1 = %g)", r, k, k+1, s[k]/s[0])
	}
	errSq := ErrorSq(a, cur)
	if w := errDense(d, cur); math.Abs(errSq-w) > tolErrSq*fro {
		t.Errorf("ErrorSq %.15g, dense ‖A − CUR‖² %.15g", errSq, w)
	}
	if errSq < bestErr-tolErrSq*fro {
		t.Errorf("ErrorSq %.15g below the Eckart–Young bound ‖A − A_k‖² = %.15g", errSq, bestErr)
	}
	q := Measure(a, cur, svd, k)
	if r, ok := q.Ratio(); !ok || r < 1-tolRatio {
		t.Errorf("Ratio %.15g (ok %v), want ≥ 1", r, ok)
	}
	if e, ok := q.Eta(); !ok || e > 1+tolRatio {
		t.Errorf("Eta %.15g (ok %v), want ≤ 1", e, ok)
	}
}

// TestOptimalCoreRank: CoreRank = k on random matrices, for every method.
func TestOptimalCoreRank(t *testing.T) {
	for _, f := range randomFixtures {
		a := randomCSR(f.m, f.n, f.density, f.seed)
		d := denseOf(a)
		svd := exactSVD(t, a)
		bestErr := bestErrDense(t, d, f.k)
		if fro := frob2(d); bestErr < minShare*fro || fro-bestErr < minShare*fro {
			t.Fatalf("%s: fixture outside the premise of tolRatio", f.name)
		}
		for _, method := range allMethods {
			t.Run(f.name+"/"+string(method), func(t *testing.T) {
				cur := selectFor(t, a, svd, method, CoreOptimal, f.rows, f.cols, f.k, f.k, f.seed)
				checkRankK(t, a, d, svd, cur, f.k, bestErr)
			})
		}
	}
}

// TestOptimalCoreRankDemo: the same on the TF-IDF matrix of the demo
// corpus, with k = 5 and 20 rows and 30 columns.
func TestOptimalCoreRankDemo(t *testing.T) {
	a := loadDemo(t)
	d := denseOf(a)
	svd := exactSVD(t, a)
	const k = 5
	bestErr := bestErrDense(t, d, k)
	if fro := frob2(d); bestErr < minShare*fro || fro-bestErr < minShare*fro {
		t.Fatal("demo matrix outside the premise of tolRatio")
	}
	for _, method := range allMethods {
		t.Run(string(method), func(t *testing.T) {
			cur := selectFor(t, a, svd, method, CoreOptimal, 20, 30, k, k, 7)
			checkRankK(t, a, d, svd, cur, k, bestErr)
		})
	}
}

// TestIntersectionCore: U = W⁺, where W = D_R·A(I, J)·D_C is the
// intersection of the picked rows and columns with both scalings (Drineas,
// Kannan and Mahoney, SIAM J. Comput. 36(1), 2006). W is rebuilt here from
// the dense A and the pick weights, its pseudo-inverse taken with gonum's
// SVD; CoreRank is the rank of W; ErrorSq (the trace expansion) equals the
// dense ‖A − C·U·R‖_F².
func TestIntersectionCore(t *testing.T) {
	for _, f := range randomFixtures {
		a := randomCSR(f.m, f.n, f.density, f.seed)
		d := denseOf(a)
		svd := exactSVD(t, a)
		for _, method := range []Method{MethodNorm, MethodLeverage} {
			for _, draws := range []struct{ rows, cols int }{{f.rows, f.cols}, {2 * f.rows, f.cols}} {
				t.Run(fmt.Sprintf("%s/%s/r=%d/c=%d", f.name, method, draws.rows, draws.cols), func(t *testing.T) {
					cur := selectFor(t, a, svd, method, CoreIntersection, draws.rows, draws.cols, f.k, 0, f.seed)
					w := mat.NewDense(len(cur.Rows), len(cur.Cols), nil)
					for p, r := range cur.Rows {
						for q, c := range cur.Cols {
							w.Set(p, q, r.Weight*d.At(r.Index, c.Index)*c.Weight)
						}
					}
					if c := cond(t, w); c > maxCond {
						t.Fatalf("cond(W) = %g exceeds the premise of tolCore", c)
					}
					checkU(t, cur.U, densePinv(t, w))
					if r := denseRank(t, w); cur.CoreRank != r {
						t.Errorf("CoreRank %d, rank of W %d", cur.CoreRank, r)
					}
					got, want := ErrorSq(a, cur), errDense(d, cur)
					scale := frob2(d) + frob2(curDense(cur))
					if math.Abs(got-want) > tolExpand*scale {
						t.Errorf("ErrorSq %.15g, dense ‖A − CUR‖² %.15g", got, want)
					}
				})
			}
		}
	}
}

// checkQuality checks Measure against dense oracles: ‖A‖², the dense
// error, RowSpaceSq = ‖A·R⁺·R‖_F² (R⁺ from gonum's SVD), the best rank-k
// error and Σ_{i≤r} σ_i² from gonum's SVD; and DocsShare ≤ DocsBestShare +
// tol, since the span of r rows is an r-dimensional subspace and none
// captures more than the leading r right singular vectors (Eckart–Young
// 1936).
// s holds the singular values of A from gonum's dense SVD.
func checkQuality(t *testing.T, a *sparse.CSR, d *mat.Dense, s []float64, svd *sparsemat.SVD, cur *CUR, k int) {
	t.Helper()
	fro := frob2(d)
	var ar, arr mat.Dense
	ar.Mul(d, densePinv(t, cur.R))
	arr.Mul(&ar, cur.R)
	rowSpace := frob2(&arr)
	if got := RowSpaceSq(a, cur); math.Abs(got-rowSpace) > tolErrSq*fro {
		t.Errorf("RowSpaceSq %.15g, dense ‖A·R⁺·R‖² %.15g", got, rowSpace)
	}
	q := Measure(a, cur, svd, k)
	var docsBest, bestErr float64
	for i, v := range s {
		if i < len(cur.Rows) {
			docsBest += v * v
		}
		if i >= k {
			bestErr += v * v
		}
	}
	for _, c := range []struct {
		name      string
		got, want float64
	}{
		{"NormSq", q.NormSq, fro},
		{"DocsSq", q.DocsSq, rowSpace},
		{"DocsBestSq", q.DocsBestSq, docsBest},
		{"ErrSq", q.ErrSq, errDense(d, cur)},
		{"BestErrSq", q.BestErrSq, bestErr},
	} {
		if math.Abs(c.got-c.want) > tolErrSq*fro {
			t.Errorf("%s %.15g, dense %.15g", c.name, c.got, c.want)
		}
	}
	if q.DocsCount != len(cur.Rows) || q.Rank != k || q.ValuesExact != svd.Exact {
		t.Errorf("DocsCount %d Rank %d ValuesExact %v, want %d %d %v", q.DocsCount, q.Rank, q.ValuesExact, len(cur.Rows), k, svd.Exact)
	}
	if q.DocsShare() > q.DocsBestShare()+tolErrSq {
		t.Errorf("DocsShare %.15g exceeds DocsBestShare %.15g", q.DocsShare(), q.DocsBestShare())
	}
	if e, ok := q.EtaDocs(); !ok || e > 1+tolRatio {
		t.Errorf("EtaDocs %.15g (ok %v), want ≤ 1", e, ok)
	}
}

// TestQuality: checkQuality for every method and both cores on random
// matrices and on the demo TF-IDF matrix.
func TestQuality(t *testing.T) {
	type fixture struct {
		name       string
		a          *sparse.CSR
		rows, cols int
		k          int
	}
	var fs []fixture
	for _, f := range randomFixtures {
		fs = append(fs, fixture{f.name, randomCSR(f.m, f.n, f.density, f.seed), f.rows, f.cols, f.k})
	}
	fs = append(fs, fixture{"demo", loadDemo(t), 25, 40, 5})
	for _, f := range fs {
		d := denseOf(f.a)
		_, s, _ := denseSVD(t, d)
		svd := exactSVD(t, f.a)
		for _, method := range allMethods {
			for _, core := range []Core{CoreOptimal, CoreIntersection} {
				t.Run(fmt.Sprintf("%s/%s/%s", f.name, method, core), func(t *testing.T) {
					cur := selectFor(t, f.a, svd, method, core, f.rows, f.cols, f.k, 0, 5)
					checkQuality(t, f.a, d, s, svd, cur, f.k)
				})
			}
		}
	}
}

// TestQualityExactLowRank: on a matrix of exact rank 2 with k = 2, A_k is
// A itself, so the ratio ‖A − CUR‖/‖A − A_k‖ has no meaning and Ratio
// reports ok = false; Eta is still defined.
func TestQualityExactLowRank(t *testing.T) {
	a := csrOf(rankTwo())
	svd := exactSVD(t, a)
	cur := selectFor(t, a, svd, MethodTop, CoreOptimal, 3, 3, 2, 0, 1)
	q := Measure(a, cur, svd, 2)
	if _, ok := q.Ratio(); ok {
		t.Errorf("Ratio defined with ‖A − A_k‖² = %g", q.BestErrSq)
	}
	if _, ok := q.Eta(); !ok {
		t.Error("Eta undefined")
	}
	if q.BestErrSq > tolErrSq*q.NormSq {
		t.Errorf("best rank-2 error %g of a rank-2 matrix", q.BestErrSq)
	}
}
