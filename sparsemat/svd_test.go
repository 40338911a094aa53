package sparsemat

import (
	"encoding/json"
	"fmt"
	"math"
	"os"
	"runtime"
	"slices"
	"testing"

	"github.com/james-bowman/sparse"
	"gonum.org/v1/gonum/mat"
)

// tolExactSVD: when the sketch spans the whole matrix the result is a
// backward-stable dense SVD of a small matrix; values of order 1 agree to
// about 1e-14, and 1e-10 leaves a wide margin (gonum's own SVD tests use
// 1e-10 for hand cases).
const tolExactSVD = 1e-10

// tolRandomizedSVD: with q = 2 power iterations and oversampling 10, on a
// matrix whose spectrum has a clear gap after k, the leading values agree
// to better than 1e-8 relative (Halko–Martinsson–Tropp 2011, §10.4, bound
// the error by a power 1/(2q+1) of the tail); 1e-6 is the check.
const tolRandomizedSVD = 1e-6

func denseSVD(t *testing.T, d *mat.Dense) []float64 {
	t.Helper()
	var s mat.SVD
	if !s.Factorize(d, mat.SVDNone) {
		t.Fatal("dense SVD failed")
	}
	return s.Values(nil)
}

// projector returns X·Xᵀ, which does not depend on the signs or the basis
// chosen for the column space of X.
func projector(x *mat.Dense) *mat.Dense {
	var p mat.Dense
	p.Mul(x, x.T())
	return &p
}

// TestTruncatedSVDExactPath: small matrices take the exact (Gram) path; values
// match gonum's dense SVD, subspaces match by projectors, and the
// Eckart–Young identity ‖A−A_k‖_F² = Σ_{i>k} σ_i² holds for the U, Σ, V
// returned.
func TestTruncatedSVDExactPath(t *testing.T) {
	for _, s := range []struct{ m, n, k int }{{6, 4, 2}, {4, 9, 3}, {30, 20, 5}, {1, 5, 1}, {5, 1, 1}} {
		t.Run(fmt.Sprintf("%dx%d/k=%d", s.m, s.n, s.k), func(t *testing.T) {
			a := randomCSR(s.m, s.n, 0.5, uint64(s.m+s.n), -1, -1)
			if FrobeniusSq(a) == 0 {
				t.Skip("random matrix came out empty")
			}
			svd, err := TruncatedSVD(a, SVDOptions{Rank: s.k, PowerIters: 2, Seed: 1})
			if err != nil {
				t.Fatal(err)
			}
			if !svd.Exact {
				t.Fatal("expected the exact path")
			}
			d := dense(a)
			want := denseSVD(t, d)
			for i, v := range svd.Values {
				if math.Abs(v-want[i]) > tolExactSVD {
					t.Errorf("σ_%d = %.15g, dense %.15g", i+1, v, want[i])
				}
			}
			// Eckart–Young: the rank-k truncation's error is the tail.
			var ak, us mat.Dense
			us.Mul(svd.U, mat.NewDiagDense(s.k, svd.Values))
			ak.Mul(&us, svd.V.T())
			var diff mat.Dense
			diff.Sub(d, &ak)
			got := math.Pow(mat.Norm(&diff, 2), 2)
			var tail float64
			for _, v := range want[s.k:] {
				tail += v * v
			}
			if math.Abs(got-tail) > tolExactSVD {
				t.Errorf("‖A−A_k‖² = %.15g, Σ tail σ² = %.15g", got, tail)
			}
			// Subspaces, by projectors: U_k U_kᵀ from the dense SVD.
			var full mat.SVD
			full.Factorize(d, mat.SVDThin)
			var uf mat.Dense
			full.UTo(&uf)
			uk := uf.Slice(0, s.m, 0, s.k).(*mat.Dense)
			if gap := want[s.k-1] - valueOr(want, s.k); gap > 1e-6 {
				if !mat.EqualApprox(projector(svd.U), projector(mat.DenseCopyOf(uk)), 1e-8) {
					t.Error("left singular subspace differs from the dense SVD's")
				}
			}
		})
	}
}

func valueOr(v []float64, i int) float64 {
	if i < len(v) {
		return v[i]
	}
	return 0
}

// lowRankPlusNoise builds an m×n sparse matrix with a planted spectrum:
// rank-r signal with singular values about 10…1 plus small noise on the
// same pattern, so a randomized SVD has a gap to find.
func lowRankPlusNoise(m, n, r int) *sparse.CSR {
	u := randomDense(m, r, 21)
	v := randomDense(n, r, 22)
	ia := []int{0}
	var ja []int
	var data []float64
	noise := randomDense(m, n, 23)
	for i := range m {
		for j := range n {
			var s float64
			for t := range r {
				s += u.At(i, t) * v.At(j, t) * float64(r-t)
			}
			ja = append(ja, j)
			data = append(data, s+1e-3*noise.At(i, j))
		}
		ia = append(ia, len(ja))
	}
	return sparse.NewCSR(m, n, ia, ja, data)
}

func TestTruncatedSVDRandomizedPath(t *testing.T) {
	a := lowRankPlusNoise(300, 200, 5)
	svd, err := TruncatedSVD(a, SVDOptions{Rank: 5, PowerIters: 2, Seed: 3, Randomized: true})
	if err != nil {
		t.Fatal(err)
	}
	if svd.Exact {
		t.Fatal("expected the randomized path for k=5 on 300×200")
	}
	want := denseSVD(t, dense(a))
	for i, v := range svd.Values {
		if rel := math.Abs(v-want[i]) / want[i]; rel > tolRandomizedSVD {
			t.Errorf("σ_%d = %.12g, dense %.12g (relative %g)", i+1, v, want[i], rel)
		}
	}
	// Orthonormal columns (common practice check).
	var utu mat.Dense
	utu.Mul(svd.U.T(), svd.U)
	if !mat.EqualApprox(&utu, eye(5), 1e-12) {
		t.Error("UᵀU is not the identity")
	}
}

func eye(n int) *mat.Dense {
	d := mat.NewDense(n, n, nil)
	for i := range n {
		d.Set(i, i, 1)
	}
	return d
}

type linalgGolden struct {
	Matrices []struct {
		Name           string    `json:"name"`
		Rows           int       `json:"rows"`
		Cols           int       `json:"cols"`
		A              []float64 `json:"a"`
		SingularValues []float64 `json:"singular_values"`
		Rank           int       `json:"rank"`
	} `json:"matrices"`
}

// TestTruncatedSVDMatchesNumpy compares the singular values with
// numpy.linalg.svd (Debian python3-numpy 1.24.2); the golden file was
// written by testdata/reference/gen_linalg.py.
func TestTruncatedSVDMatchesNumpy(t *testing.T) {
	raw, err := os.ReadFile("../testdata/reference/linalg.golden.json")
	if err != nil {
		t.Fatal(err)
	}
	var g linalgGolden
	if err := json.Unmarshal(raw, &g); err != nil {
		t.Fatal(err)
	}
	for _, c := range g.Matrices {
		for _, randomized := range []bool{false, true} {
			t.Run(fmt.Sprintf("%s/randomized=%v", c.Name, randomized), func(t *testing.T) {
				a := csrFromDense(c.Rows, c.Cols, c.A)
				if c.Rank == 0 {
					if a.NNZ() != 0 {
						t.Fatal("rank-0 matrix has non-zeros")
					}
					return
				}
				svd, err := TruncatedSVD(a, SVDOptions{Rank: min(c.Rows, c.Cols), PowerIters: 2, Seed: 1, Randomized: randomized})
				if err != nil {
					t.Fatal(err)
				}
				for i, want := range c.SingularValues {
					if math.Abs(svd.Values[i]-want) > tolExactSVD*math.Max(1, want) {
						t.Errorf("σ_%d = %.15g, numpy %.15g", i+1, svd.Values[i], want)
					}
				}
			})
		}
	}
}

// csrFromDense builds a CSR from a row-major slice, leaving out zeros.
func csrFromDense(m, n int, d []float64) *sparse.CSR {
	ia := []int{0}
	var ja []int
	var data []float64
	for i := range m {
		for j := range n {
			if v := d[i*n+j]; v != 0 {
				ja = append(ja, j)
				data = append(data, v)
			}
		}
		ia = append(ia, len(ja))
	}
	return sparse.NewCSR(m, n, ia, ja, data)
}

func TestTruncatedSVDErrors(t *testing.T) {
	a := randomCSR(4, 4, 1, 1, -1, -1)
	if _, err := TruncatedSVD(a, SVDOptions{Rank: 0}); err == nil {
		t.Error("rank 0: no error")
	}
	if _, err := TruncatedSVD(a, SVDOptions{Rank: 1, PowerIters: -1}); err == nil {
		t.Error("negative power iterations: no error")
	}
	e := sparse.NewCSR(0, 3, []int{0}, nil, nil)
	if _, err := TruncatedSVD(e, SVDOptions{Rank: 1}); err == nil {
		t.Error("empty matrix: no error")
	}
}

// orthonormalize must give orthonormal columns spanning the input's column
// space: checked against Householder QR (an independent
// route through LAPACK), on a well-conditioned block, an ill-conditioned
// one (columns scaled over six orders of magnitude) and a rank-deficient
// one, which takes the Householder fallback.
func TestOrthonormalize(t *testing.T) {
	const tolOrtho = 1e-12            // orthogonality to working precision, times a few n
	well := randomDense(9000, 12, 31) // more than two row blocks
	ill := mat.DenseCopyOf(well)
	for j := range 12 {
		for i := range 9000 {
			ill.Set(i, j, ill.At(i, j)*math.Pow(10, -float64(j)/2))
		}
	}
	deficient := mat.DenseCopyOf(well)
	for i := range 9000 {
		deficient.Set(i, 11, deficient.At(i, 0)+deficient.At(i, 1))
	}
	for name, y := range map[string]*mat.Dense{"well": well, "ill": ill, "deficient": deficient} {
		t.Run(name, func(t *testing.T) {
			got := mat.DenseCopyOf(y)
			orthonormalize(got)
			var qtq mat.Dense
			qtq.Mul(got.T(), got)
			if !mat.EqualApprox(&qtq, eye(12), tolOrtho) {
				t.Fatal("columns are not orthonormal")
			}
			if name == "deficient" {
				return // the 12th direction is arbitrary
			}
			// Same span: M = Q_refᵀ·Q is orthogonal exactly when the two
			// orthonormal bases span the same space (MᵀM = I).
			ref := mat.DenseCopyOf(y)
			householder(ref)
			var m, mtm mat.Dense
			m.Mul(ref.T(), got)
			mtm.Mul(m.T(), &m)
			if !mat.EqualApprox(&mtm, eye(12), 1e-9) {
				t.Fatal("span differs from Householder QR's")
			}
		})
	}
}

// A given test matrix replaces the Gaussian one: the same Ω gives the same
// bits, a different Ω (here: scaled columns, same span) the same values to
// rounding, since the range finder depends only on span(A·Ω); a test
// matrix of the wrong shape is an error.
func TestTruncatedSVDTestMatrix(t *testing.T) {
	a := lowRankPlusNoise(300, 200, 5)
	omega := randomDense(200, 15, 41)
	first, err := TruncatedSVD(a, SVDOptions{Rank: 5, PowerIters: 2, TestMatrix: omega})
	if err != nil {
		t.Fatal(err)
	}
	again, _ := TruncatedSVD(a, SVDOptions{Rank: 5, PowerIters: 2, TestMatrix: omega})
	if !slices.Equal(first.Values, again.Values) {
		t.Fatal("the same test matrix gave different values")
	}
	scaled := mat.DenseCopyOf(omega)
	for j := range 15 {
		for i := range 200 {
			scaled.Set(i, j, scaled.At(i, j)*float64(j+1))
		}
	}
	other, _ := TruncatedSVD(a, SVDOptions{Rank: 5, PowerIters: 2, TestMatrix: scaled})
	for i := range 5 {
		if math.Abs(other.Values[i]-first.Values[i]) > 1e-12*first.Values[0] {
			t.Errorf("σ_%d: %g vs %g from a test matrix of the same span", i+1, other.Values[i], first.Values[i])
		}
	}
	if _, err := TruncatedSVD(a, SVDOptions{Rank: 5, TestMatrix: randomDense(199, 15, 1)}); err == nil {
		t.Error("a test matrix with the wrong number of rows gave no error")
	}
}

// The randomized SVD (parallel products, block-parallel CholeskyQR2) and
// the exact Gram path give the same bits for GOMAXPROCS 1 and 8.
func TestTruncatedSVDDeterministic(t *testing.T) {
	a := randomCSR(9000, 1200, 0.01, 17, -1, -1) // several row blocks of every kernel
	b := randomCSR(700, 3000, 0.01, 18, -1, -1)  // the exact Gram path
	prev := runtime.GOMAXPROCS(1)
	defer runtime.GOMAXPROCS(prev)
	one, _ := TruncatedSVD(a, SVDOptions{Rank: 20, PowerIters: 2, Seed: 4})
	oneG, _ := TruncatedSVD(b, SVDOptions{Rank: 20})
	runtime.GOMAXPROCS(8)
	eight, _ := TruncatedSVD(a, SVDOptions{Rank: 20, PowerIters: 2, Seed: 4})
	eightG, _ := TruncatedSVD(b, SVDOptions{Rank: 20})
	if one.Exact || !oneG.Exact {
		t.Fatal("wrong paths taken")
	}
	if !slices.Equal(one.Values, eight.Values) || !mat.Equal(one.U, eight.U) || !mat.Equal(one.V, eight.V) {
		t.Error("randomized SVD: GOMAXPROCS 1 and 8 differ")
	}
	if !slices.Equal(oneG.Values, eightG.Values) || !mat.Equal(oneG.U, eightG.U) {
		t.Error("exact SVD: GOMAXPROCS 1 and 8 differ")
	}
}
