package selection

import (
	"fmt"
	"math"
	"math/rand/v2"
	"slices"
	"testing"

	"gonum.org/v1/gonum/stat/distuv"

	"assay/sparsemat"
)

// tolProb: Score is w/Σw, one division after a sum of at most a few dozen
// positive terms, so it is within a few ε of the exact ratio; 1e-14
// relative allows that and nothing else.
const tolProb = 1e-14

// chiSquareLevel is the upper quantile the goodness-of-fit statistics are
// held to. With fixed seeds each test is deterministic; a correct sampler
// passes a given seed with probability 0.999, a sampler off by a few
// percent on 100,000 draws fails almost surely.
const chiSquareLevel = 0.999

// pearson returns Pearson's χ² statistic of counts against the
// probabilities p (categories of probability zero must have count zero and
// are left out) and the number of degrees of freedom, one less than the
// number of categories of positive probability.
func pearson(t *testing.T, counts []int, p []float64) (chi2 float64, df int) {
	t.Helper()
	total := 0
	for _, c := range counts {
		total += c
	}
	for i, pi := range p {
		if pi == 0 {
			if counts[i] != 0 {
				t.Errorf("category %d of probability 0 drawn %d times", i, counts[i])
			}
			continue
		}
		e := float64(total) * pi
		d := float64(counts[i]) - e
		chi2 += d * d / e
		df++
	}
	return chi2, df - 1
}

// chiSquareLimit is the chiSquareLevel quantile of the χ² distribution
// with df degrees of freedom, from gonum's distuv.ChiSquared.
func chiSquareLimit(df int) float64 {
	return distuv.ChiSquared{K: float64(df)}.Quantile(chiSquareLevel)
}

// TestDraw: 200,000 draws with a fixed seed from weights with zeros at the
// start, in the middle and at the end. Pearson's χ² over the categories of
// positive weight must stay below the 0.999 quantile of χ² with (categories
// − 1) degrees of freedom (gonum distuv.ChiSquared; Pearson's test, common
// practice). Weight-zero entries are never drawn; Score is w/Σw; Weight is
// √(count/(draws·p)) (Drineas, Kannan and Mahoney, SIAM J. Comput. 36(1),
// 2006: a column drawn t times of c draws is scaled by √t/√(c·p)); Order
// runs 0, 1, 2, …; counts sum to the draws.
func TestDraw(t *testing.T) {
	weights := []float64{0, 4, 1, 0, 2, 8, 0.5, 3, 1.5, 0}
	const draws = 200000
	picks, err := Draw(rand.New(rand.NewPCG(42, 7)), weights, draws)
	if err != nil {
		t.Fatal(err)
	}
	total := 0.0
	for _, w := range weights {
		total += w
	}
	counts := make([]int, len(weights))
	sum := 0
	for k, p := range picks {
		if p.Order != k {
			t.Errorf("pick %d has Order %d", k, p.Order)
		}
		if counts[p.Index] != 0 {
			t.Errorf("index %d appears twice", p.Index)
		}
		counts[p.Index] = p.Count
		sum += p.Count
		want := weights[p.Index] / total
		if relDiff(p.Score, want, 0) > tolProb {
			t.Errorf("index %d: score %g, want w/Σw = %g", p.Index, p.Score, want)
		}
		if w := math.Sqrt(float64(p.Count) / (draws * want)); relDiff(p.Weight, w, 0) > tolProb {
			t.Errorf("index %d: weight %g, want √(count/(draws·p)) = %g", p.Index, p.Weight, w)
		}
	}
	if sum != draws {
		t.Fatalf("counts sum to %d, want %d", sum, draws)
	}
	p := make([]float64, len(weights))
	for i, w := range weights {
		p[i] = w / total
	}
	chi2, df := pearson(t, counts, p)
	if limit := chiSquareLimit(df); chi2 > limit {
		t.Errorf("χ² = %.2f with %d d.f. exceeds the %g quantile %.2f", chi2, df, chiSquareLevel, limit)
	} else {
		t.Logf("χ² = %.2f (%g quantile with %d d.f.: %.2f)", chi2, chiSquareLevel, df, limit)
	}
}

// TestDrawFirstDrawnOrder: the picks come in the order first drawn. The
// draws of a shorter run from the same seed are the start of a longer run,
// so the distinct indices of every shorter run must be a prefix of those
// of the longer one, with counts no larger (a consequence of the
// documented order; an order by index or by count fails it).
func TestDrawFirstDrawnOrder(t *testing.T) {
	weights := []float64{1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1}
	const long = 40
	full, err := Draw(rand.New(rand.NewPCG(5, 5)), weights, long)
	if err != nil {
		t.Fatal(err)
	}
	if slices.IsSorted(indices(full)) {
		t.Fatalf("fixture too weak: the first-drawn order %v is also sorted by index", indices(full))
	}
	for draws := 1; draws < long; draws++ {
		short, err := Draw(rand.New(rand.NewPCG(5, 5)), weights, draws)
		if err != nil {
			t.Fatal(err)
		}
		if len(short) > len(full) || !slices.Equal(indices(short), indices(full)[:len(short)]) {
			t.Fatalf("%d draws gave %v, not a prefix of %v", draws, indices(short), indices(full))
		}
		for k, p := range short {
			if p.Count > full[k].Count {
				t.Fatalf("%d draws: index %d counted %d, more than %d in %d draws", draws, p.Index, p.Count, full[k].Count, long)
			}
		}
	}
	if full[0].Count < 1 {
		t.Fatal("first pick has no count")
	}
}

func TestDrawRejects(t *testing.T) {
	for _, c := range []struct {
		name    string
		weights []float64
	}{
		{"all-zero", []float64{0, 0, 0}},
		{"empty", nil},
		{"negative", []float64{1, -1, 2}},
		{"NaN", []float64{1, math.NaN()}},
	} {
		t.Run(c.name, func(t *testing.T) {
			if _, err := Draw(rand.New(rand.NewPCG(1, 1)), c.weights, 3); err == nil {
				t.Fatalf("no error for weights %v", c.weights)
			}
		})
	}
}

// TestNormUniformRowsAfterL2: rows of an L2-normalised TF-IDF matrix all
// have norm 1, so squared-norm row sampling (p_i = ‖a_i‖²/‖A‖_F², Drineas,
// Kannan and Mahoney 2006) gives every row the probability 1/m. Column
// probabilities are ‖A(:,j)‖²/‖A‖_F², computed densely here.
func TestNormUniformRowsAfterL2(t *testing.T) {
	var b sparsemat.Builder
	b.AddRow(map[string]int{"alder": 1, "birch": 2})
	b.AddRow(map[string]int{"birch": 5})
	b.AddRow(map[string]int{"alder": 3, "cedar": 1})
	b.AddRow(map[string]int{"cedar": 2, "birch": 1, "alder": 1})
	c, err := b.Build(sparsemat.Pruning{})
	if err != nil {
		t.Fatal(err)
	}
	a := sparsemat.Weight(c, sparsemat.DefaultWeighting)
	cur, err := Select(a, Options{Method: MethodNorm, Rows: 200, Cols: 200, Seed: 1})
	if err != nil {
		t.Fatal(err)
	}
	if len(cur.Rows) != 4 {
		t.Fatalf("200 draws over 4 rows gave %d distinct rows", len(cur.Rows))
	}
	for _, p := range cur.Rows {
		if relDiff(p.Score, 0.25, 0) > tolProb {
			t.Errorf("row %d probability %.17g, want 1/4", p.Index, p.Score)
		}
	}
	d := denseOf(a)
	fro := frob2(d)
	for _, p := range cur.Cols {
		want := frob2(d.ColView(p.Index)) / fro
		if relDiff(p.Score, want, 0) > tolProb {
			t.Errorf("column %d probability %.17g, want ‖A(:,j)‖²/‖A‖² = %.17g", p.Index, p.Score, want)
		}
	}
}

// TestLeverageMethodScores: MethodLeverage draws column j with probability
// ℓ_j/k and row i with ℓ_i/k, the rank-k leverage scores of V and U over k
// (Drineas, Mahoney and Muthukrishnan, "Relative-error CUR matrix
// decompositions", SIAM J. Matrix Anal. Appl. 30(2), 2008). Each Pick.Score
// must equal numpy's leverage score over k (golden, numpy 1.24.2), and each
// Weight √(count/(draws·p)).
func TestLeverageMethodScores(t *testing.T) {
	for _, c := range loadLinalg(t) {
		a := csrOf(c.dense())
		for _, lev := range c.Leverage {
			t.Run(fmt.Sprintf("%s/k=%d", c.Name, lev.K), func(t *testing.T) {
				svd := exactSVD(t, a)
				const draws = 50
				cur, err := Select(a, Options{Method: MethodLeverage, Rank: lev.K, Rows: draws, Cols: draws, Seed: 3, SVD: svd})
				if err != nil {
					t.Fatal(err)
				}
				check := func(side string, ps []Pick, want []float64) {
					n := 0
					for _, p := range ps {
						n += p.Count
						w := want[p.Index] / float64(lev.K)
						if math.Abs(p.Score-w) > tolLeverage {
							t.Errorf("%s %d: score %.15g, want ℓ/k = %.15g", side, p.Index, p.Score, w)
						}
						if ww := math.Sqrt(float64(p.Count) / (draws * p.Score)); relDiff(p.Weight, ww, 0) > tolProb {
							t.Errorf("%s %d: weight %g, want %g", side, p.Index, p.Weight, ww)
						}
					}
					if n != draws {
						t.Errorf("%s counts sum to %d, want %d", side, n, draws)
					}
				}
				check("column", cur.Cols, lev.Cols)
				check("row", cur.Rows, lev.Rows)
			})
		}
	}
}

// TestLeverageMethodChiSquare: 100,000 column draws and 100,000 row draws
// by MethodLeverage on the golden random-8x6 matrix with k = 2; the counts
// must fit numpy's ℓ/k (Drineas, Mahoney and Muthukrishnan 2008) by
// Pearson's χ² at the 0.999 quantile (gonum distuv.ChiSquared).
func TestLeverageMethodChiSquare(t *testing.T) {
	var c *linalgCase
	for _, g := range loadLinalg(t) {
		if g.Name == "random-8x6" {
			c = &g
		}
	}
	if c == nil {
		t.Fatal("random-8x6 missing from the golden file")
	}
	lev := c.Leverage[1]
	if lev.K != 2 {
		t.Fatalf("golden leverage entry has k = %d, want 2", lev.K)
	}
	a := csrOf(c.dense())
	const draws = 100000
	cur, err := Select(a, Options{Method: MethodLeverage, Rank: 2, Rows: draws, Cols: draws, Seed: 2024, SVD: exactSVD(t, a)})
	if err != nil {
		t.Fatal(err)
	}
	for _, side := range []struct {
		name  string
		picks []Pick
		lev   []float64
	}{{"columns", cur.Cols, lev.Cols}, {"rows", cur.Rows, lev.Rows}} {
		t.Run(side.name, func(t *testing.T) {
			counts := make([]int, len(side.lev))
			p := make([]float64, len(side.lev))
			for i, l := range side.lev {
				p[i] = l / 2
			}
			for _, pk := range side.picks {
				counts[pk.Index] = pk.Count
			}
			chi2, df := pearson(t, counts, p)
			limit := chiSquareLimit(df)
			if chi2 > limit {
				t.Errorf("χ² = %.2f with %d d.f. exceeds the %g quantile %.2f (counts %v)", chi2, df, chiSquareLevel, limit, counts)
			}
			t.Logf("χ² = %.2f (%g quantile with %d d.f.: %.2f)", chi2, chiSquareLevel, df, limit)
		})
	}
}
