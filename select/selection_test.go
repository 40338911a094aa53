package selection

import (
	"fmt"
	"math"
	"testing"

	"gonum.org/v1/gonum/floats"
	"gonum.org/v1/gonum/mat"

	"assay/sparsemat"
)

// tolPinv: numpy and gonum both compute the pseudo-inverse from an SVD in
// float64; on the fixture's entries (order 1–10, condition numbers below
// 100) they agree to about 1e-14. 1e-10 leaves room for the random cases
// below (condition numbers up to about 20) and for the products in the
// Penrose conditions, which square the entries' scale.
const tolPinv = 1e-10

// tolLeverage: the leverage scores come from sparsemat.TruncatedSVD's Gram
// route (an eigendecomposition of AᵀA or AAᵀ). A perturbation δ of the
// Gram matrix moves the leading k-dimensional eigenspace by about
// δ/gap (Davis–Kahan); with δ ≈ n·ε·σ₁² and the golden matrices' gaps
// σ_k² − σ_{k+1}² ≥ 0.05·σ₁² (checked in the test), that is below 1e-13.
// 1e-9 is a safe margin that still catches any wrong sign, index or k.
const tolLeverage = 1e-9

// TestPinvMatchesNumpy compares Pinv with numpy.linalg.pinv (Debian
// python3-numpy 1.24.2; golden written by testdata/reference/gen_linalg.py)
// on full-rank, rank-deficient, wide, rank-one, zero and random matrices,
// checks the rank against numpy.linalg.matrix_rank, and checks the four
// Penrose conditions.
func TestPinvMatchesNumpy(t *testing.T) {
	for _, c := range loadLinalg(t) {
		t.Run(c.Name, func(t *testing.T) {
			w := c.dense()
			orig := mat.DenseCopyOf(w)
			got, rank := Pinv(w)
			if !mat.Equal(w, orig) {
				t.Error("Pinv changed its input")
			}
			if r, cc := got.Dims(); r != c.Cols || cc != c.Rows {
				t.Fatalf("pinv is %d×%d, want %d×%d", r, cc, c.Cols, c.Rows)
			}
			want := mat.NewDense(c.Cols, c.Rows, c.Pinv)
			if !mat.EqualApprox(got, want, tolPinv) {
				t.Errorf("pinv\n got %v\nwant %v", mat.Formatted(got), mat.Formatted(want))
			}
			if rank != c.Rank {
				t.Errorf("rank %d, numpy matrix_rank %d", rank, c.Rank)
			}
			checkPenrose(t, w, got)
		})
	}
}

// TestPinvPenroseRandom checks the four Penrose conditions (Penrose, "A
// generalized inverse for matrices", Proc. Cambridge Philos. Soc. 51(3),
// 1955) on seeded random matrices, tall, wide and of planted low rank, and
// the rank against gonum's dense SVD with numpy's matrix_rank threshold.
func TestPinvPenroseRandom(t *testing.T) {
	for _, s := range []struct {
		name       string
		m, n, rank int
	}{
		{"tall-12x5", 12, 5, 5},
		{"wide-4x9", 4, 9, 4},
		{"square-7x7-rank3", 7, 7, 3},
		{"tall-20x8-rank2", 20, 8, 2},
		{"row-1x6", 1, 6, 1},
		{"column-6x1", 6, 1, 1},
	} {
		t.Run(s.name, func(t *testing.T) {
			rng := newRand(uint64(s.m*100 + s.n))
			left := mat.NewDense(s.m, s.rank, nil)
			right := mat.NewDense(s.rank, s.n, nil)
			fillNormal(rng, left)
			fillNormal(rng, right)
			var w mat.Dense
			w.Mul(left, right)
			x, rank := Pinv(&w)
			if rank != s.rank {
				t.Errorf("rank %d, planted %d", rank, s.rank)
			}
			if dr := denseRank(t, &w); rank != dr {
				t.Errorf("rank %d, gonum SVD with numpy threshold %d", rank, dr)
			}
			checkPenrose(t, &w, x)
		})
	}
}

// checkPenrose checks the four conditions that define the pseudo-inverse
// X of W (Penrose 1955): WXW = W, XWX = X, (WX)ᵀ = WX, (XW)ᵀ = XW.
func checkPenrose(t *testing.T, w, x *mat.Dense) {
	t.Helper()
	var wx, xw, wxw, xwx mat.Dense
	wx.Mul(w, x)
	xw.Mul(x, w)
	wxw.Mul(&wx, w)
	xwx.Mul(&xw, x)
	if !mat.EqualApprox(&wxw, w, tolPinv) {
		t.Error("Penrose 1: WXW ≠ W")
	}
	if !mat.EqualApprox(&xwx, x, tolPinv) {
		t.Error("Penrose 2: XWX ≠ X")
	}
	if !mat.EqualApprox(&wx, wx.T(), tolPinv) {
		t.Error("Penrose 3: WX not symmetric")
	}
	if !mat.EqualApprox(&xw, xw.T(), tolPinv) {
		t.Error("Penrose 4: XW not symmetric")
	}
}

// TestLeverageMatchesNumpy: sparsemat.Leverage on the SVD that
// sparsemat.TruncatedSVD computes from a CSR of each golden matrix equals
// numpy's rank-k leverage scores (squared row norms of U[:, :k] and
// squared column norms of Vt[:k, :], numpy 1.24.2 via gen_linalg.py).
// Each set sums to k: the columns of U_k and V_k are orthonormal, so the
// squared Frobenius norm of each is k (the definition; common practice).
func TestLeverageMatchesNumpy(t *testing.T) {
	for _, c := range loadLinalg(t) {
		if len(c.Leverage) == 0 {
			continue
		}
		a := csrOf(c.dense())
		for _, lev := range c.Leverage {
			t.Run(fmt.Sprintf("%s/k=%d", c.Name, lev.K), func(t *testing.T) {
				// The leading eigenspace of the Gram matrix is well
				// separated on every golden case (the bound on tolLeverage).
				if lev.K < len(c.Sing) {
					gap := (c.Sing[lev.K-1]*c.Sing[lev.K-1] - c.Sing[lev.K]*c.Sing[lev.K]) / (c.Sing[0] * c.Sing[0])
					if gap < 0.05 {
						t.Fatalf("relative gap %g after σ_%d is below what tolLeverage assumes", gap, lev.K)
					}
				}
				svd, err := sparsemat.TruncatedSVD(a, sparsemat.SVDOptions{Rank: lev.K})
				if err != nil {
					t.Fatal(err)
				}
				rows := sparsemat.Leverage(svd.U, lev.K)
				cols := sparsemat.Leverage(svd.V, lev.K)
				if !floats.EqualApprox(rows, lev.Rows, tolLeverage) {
					t.Errorf("row leverage\n got %v\nwant %v", rows, lev.Rows)
				}
				if !floats.EqualApprox(cols, lev.Cols, tolLeverage) {
					t.Errorf("column leverage\n got %v\nwant %v", cols, lev.Cols)
				}
				for side, l := range map[string][]float64{"rows": rows, "cols": cols} {
					if s := floats.Sum(l); math.Abs(s-float64(lev.K)) > tolLeverage {
						t.Errorf("%s leverage sums to %.15g, want k = %d", side, s, lev.K)
					}
				}
			})
		}
	}
}
