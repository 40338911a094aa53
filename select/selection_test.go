package selection

import (
	"encoding/json"
	"fmt"
	"math"
	"math/rand/v2"
	"os"
	"runtime"
	"testing"

	"github.com/james-bowman/sparse"
	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/stat/distuv"

	"assay/sparsemat"
)

// tolPinv: numpy and gonum both compute the pseudo-inverse from an SVD in
// float64; on the fixture's entries (order 1–10) they agree to about 1e-14.
// 1e-10 leaves room for the larger condition numbers of the random cases.
const tolPinv = 1e-10

type linalgCase struct {
	Name string    `json:"name"`
	Rows int       `json:"rows"`
	Cols int       `json:"cols"`
	A    []float64 `json:"a"`
	Pinv []float64 `json:"pinv"`
	Rank int       `json:"rank"`
}

func loadLinalg(t *testing.T) []linalgCase {
	t.Helper()
	raw, err := os.ReadFile("../testdata/reference/linalg.golden.json")
	if err != nil {
		t.Fatal(err)
	}
	var g struct {
		Matrices []linalgCase `json:"matrices"`
	}
	if err := json.Unmarshal(raw, &g); err != nil {
		t.Fatal(err)
	}
	return g.Matrices
}

// TestPinvMatchesNumpy compares Pinv with numpy.linalg.pinv (Debian
// python3-numpy 1.24.2; golden written by testdata/reference/gen_linalg.py)
// on full-rank, rank-deficient, wide, rank-one and zero matrices, and checks
// the rank against numpy.linalg.matrix_rank.
func TestPinvMatchesNumpy(t *testing.T) {
	for _, c := range loadLinalg(t) {
		t.Run(c.Name, func(t *testing.T) {
			w := mat.NewDense(c.Rows, c.Cols, append([]float64(nil), c.A...))
			got, rank := Pinv(w)
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

// checkPenrose checks the four conditions that define the pseudo-inverse
// X of W (Penrose, "A generalized inverse for matrices", 1955):
// WXW = W, XWX = X, (WX)ᵀ = WX, (XW)ᵀ = XW.
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

// TestDrawChiSquare: 200,000 draws from a fixed distribution over 8
// categories (one of weight zero) with a fixed seed; Pearson's statistic
// over the 7 possible categories must stay below the 0.999 quantile of the
// χ² distribution with 6 degrees of freedom (gonum distuv.ChiSquared;
// about 22.46). The weight-zero category must never be drawn.
func TestDrawChiSquare(t *testing.T) {
	weights := []float64{4, 1, 0, 2, 8, 0.5, 3, 1.5}
	const draws = 200000
	rng := rand.New(rand.NewPCG(42, 7))
	picks, err := Draw(rng, weights, draws)
	if err != nil {
		t.Fatal(err)
	}
	var total float64
	for _, w := range weights {
		total += w
	}
	counts := make([]int, len(weights))
	sum := 0
	for _, p := range picks {
		counts[p.Index] = p.Count
		sum += p.Count
		if math.Abs(p.Prob-weights[p.Index]/total) > 1e-15 {
			t.Errorf("index %d: prob %g, want %g", p.Index, p.Prob, weights[p.Index]/total)
		}
		if want := math.Sqrt(float64(p.Count) / (draws * p.Prob)); math.Abs(p.Weight-want) > 1e-12 {
			t.Errorf("index %d: weight %g, want √(count/(c·p)) = %g", p.Index, p.Weight, want)
		}
	}
	if sum != draws {
		t.Fatalf("counts sum to %d, want %d", sum, draws)
	}
	if counts[2] != 0 {
		t.Fatalf("the zero-weight category was drawn %d times", counts[2])
	}
	var chi2 float64
	cats := 0
	for i, w := range weights {
		if w == 0 {
			continue
		}
		cats++
		e := draws * w / total
		d := float64(counts[i]) - e
		chi2 += d * d / e
	}
	limit := distuv.ChiSquared{K: float64(cats - 1)}.Quantile(0.999)
	if chi2 > limit {
		t.Errorf("χ² = %.2f over %d categories exceeds the 0.999 quantile %.2f", chi2, cats, limit)
	}
	t.Logf("χ² = %.2f (0.999 quantile with %d d.f.: %.2f)", chi2, cats-1, limit)
}

func TestDrawAllZero(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 1))
	if _, err := Draw(rng, []float64{0, 0}, 3); err == nil {
		t.Fatal("no error for all-zero weights")
	}
	if _, err := Draw(rng, []float64{1, -1}, 3); err == nil {
		t.Fatal("no error for a negative weight")
	}
}

func randomCSR(m, n int, density float64, seed uint64) *sparse.CSR {
	rng := rand.New(rand.NewPCG(seed, 3))
	ia := []int{0}
	var ja []int
	var data []float64
	for range m {
		for j := range n {
			if rng.Float64() < density {
				ja = append(ja, j)
				data = append(data, rng.Float64())
			}
		}
		ia = append(ia, len(ja))
	}
	return sparse.NewCSR(m, n, ia, ja, data)
}

func denseOf(a *sparse.CSR) *mat.Dense {
	m, n := a.Dims()
	d := mat.NewDense(m, n, nil)
	a.DoNonZero(func(i, j int, v float64) { d.Set(i, j, v) })
	return d
}

// TestErrorSqMatchesDense: the trace expansion equals ‖A − CUR‖_F²
// computed densely, on small random matrices and picks. Tolerance: the
// expansion cancels terms of size up to ‖A‖² + ‖CUR‖²; 1e-9 relative to
// that covers the rounding of a few hundred products.
func TestErrorSqMatchesDense(t *testing.T) {
	for _, s := range []struct {
		m, n, r, c int
		seed       uint64
	}{{12, 9, 4, 5, 1}, {30, 40, 8, 6, 2}, {7, 3, 7, 3, 3}, {50, 20, 3, 12, 4}} {
		t.Run(fmt.Sprintf("%dx%d/r=%d/c=%d", s.m, s.n, s.r, s.c), func(t *testing.T) {
			a := randomCSR(s.m, s.n, 0.4, s.seed)
			cur, err := SquaredNorm(a, Options{Rows: s.r, Cols: s.c, Seed: s.seed})
			if err != nil {
				t.Fatal(err)
			}
			got := ErrorSq(a, cur)
			var cu, prod, diff mat.Dense
			cu.Mul(cur.C, cur.U)
			prod.Mul(&cu, cur.R)
			diff.Sub(denseOf(a), &prod)
			want := math.Pow(mat.Norm(&diff, 2), 2)
			scale := sparsemat.FrobeniusSq(a) + math.Pow(mat.Norm(&prod, 2), 2)
			if math.Abs(got-want) > 1e-9*scale {
				t.Errorf("ErrorSq = %.15g, dense %.15g", got, want)
			}
		})
	}
}

// The picks, their weights and U are identical for GOMAXPROCS 1 and 4.
func TestSquaredNormDeterministic(t *testing.T) {
	a := randomCSR(400, 300, 0.05, 9)
	prev := runtime.GOMAXPROCS(1)
	one, err1 := SquaredNorm(a, Options{Rows: 15, Cols: 25, Seed: 77})
	runtime.GOMAXPROCS(4)
	four, err4 := SquaredNorm(a, Options{Rows: 15, Cols: 25, Seed: 77})
	runtime.GOMAXPROCS(prev)
	if err1 != nil || err4 != nil {
		t.Fatal(err1, err4)
	}
	if fmt.Sprint(one.Rows, one.Cols) != fmt.Sprint(four.Rows, four.Cols) {
		t.Fatal("picks differ between GOMAXPROCS 1 and 4")
	}
	if !mat.Equal(one.U, four.U) {
		t.Fatal("U differs between GOMAXPROCS 1 and 4")
	}
	if ErrorSq(a, one) != ErrorSq(a, four) {
		t.Fatal("error differs between GOMAXPROCS 1 and 4")
	}
	other, _ := SquaredNorm(a, Options{Rows: 15, Cols: 25, Seed: 78})
	if fmt.Sprint(one.Rows) == fmt.Sprint(other.Rows) && fmt.Sprint(one.Cols) == fmt.Sprint(other.Cols) {
		t.Error("seeds 77 and 78 gave the same picks")
	}
}

// With uniform row norms (L2-normalised rows), row probabilities are 1/m:
// the README states that squared-norm row sampling is then uniform.
func TestSquaredNormUniformRowsAfterL2(t *testing.T) {
	var b sparsemat.Builder
	b.AddRow(map[string]int{"a": 1, "b": 2})
	b.AddRow(map[string]int{"b": 5})
	b.AddRow(map[string]int{"a": 3, "c": 1})
	c, _ := b.Build(sparsemat.Pruning{})
	a := sparsemat.Weight(c, sparsemat.DefaultWeighting)
	cur, err := SquaredNorm(a, Options{Rows: 50, Cols: 2, Seed: 1})
	if err != nil {
		t.Fatal(err)
	}
	for _, p := range cur.Rows {
		if math.Abs(p.Prob-1.0/3) > 1e-15 {
			t.Errorf("row %d prob %g, want 1/3", p.Index, p.Prob)
		}
	}
}

func TestSquaredNormRejects(t *testing.T) {
	zero := sparse.NewCSR(2, 2, []int{0, 0, 0}, nil, nil)
	if _, err := SquaredNorm(zero, Options{Rows: 1, Cols: 1}); err == nil {
		t.Error("all-zero matrix: no error")
	}
	a := randomCSR(3, 3, 1, 1)
	if _, err := SquaredNorm(a, Options{Rows: 0, Cols: 1}); err == nil {
		t.Error("zero row draws: no error")
	}
}

// Figures: Eckart–Young gives ‖A−A_k‖² = ‖A‖² − Σ_{i≤k} σ_i²; the ratio is
// undefined when that is zero.
func TestFigures(t *testing.T) {
	f := NewFigures(10, 4, []float64{2, 1, 0.5}, 2)
	if f.BestErrSq != 5 {
		t.Errorf("best err² %g, want 10 − 4 − 1 = 5", f.BestErrSq)
	}
	if math.Abs(f.Captured()-0.6) > 1e-15 || math.Abs(f.BestCaptured()-0.5) > 1e-15 {
		t.Errorf("captured %g best %g, want 0.6 and 0.5", f.Captured(), f.BestCaptured())
	}
	if r, ok := f.Ratio(); !ok || math.Abs(r-math.Sqrt(4.0/5)) > 1e-15 {
		t.Errorf("ratio %g %v", r, ok)
	}
	exact := NewFigures(5, 0, []float64{2, 1}, 2)
	if _, ok := exact.Ratio(); ok {
		t.Error("ratio defined for an exact rank-k approximation")
	}
}
