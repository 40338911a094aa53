package selection

import (
	"fmt"
	"math"
	"reflect"
	"slices"
	"sort"
	"testing"

	"gonum.org/v1/gonum/mat"

	"assay/sparsemat"
)

// tolGain: greedy gains are ratios ‖A·ã‖²/‖ã‖² of sums of a few hundred
// products of O(1) numbers, computed along two different routes (the SVD
// proxy and a dense product); they agree to about 1e-13 relative. 1e-9
// relative to ‖A‖_F² stays far below the gaps between candidates that the
// tests rely on (each checked to exceed tolGapCheck).
const tolGain = 1e-9

// tolGapCheck is the smallest relative gap between the best and second
// best candidate for which an index comparison is meaningful: well above
// tolGain, so rounding cannot swap them.
const tolGapCheck = 1e-6

// TestTopMatchesNumpyOrder: MethodTop picks the largest rank-k leverage
// scores in decreasing order. The expected order is numpy's leverage
// scores (golden, numpy 1.24.2) sorted in decreasing order; only cases
// whose consecutive golden scores differ by more than tolGapCheck are
// compared by index (the others by score). Each pick has weight 1 and
// count 1, its score is the golden leverage score, and no index repeats.
func TestTopMatchesNumpyOrder(t *testing.T) {
	for _, c := range loadLinalg(t) {
		a := csrOf(c.dense())
		for _, lev := range c.Leverage {
			t.Run(fmt.Sprintf("%s/k=%d", c.Name, lev.K), func(t *testing.T) {
				svd := exactSVD(t, a)
				count := func(n int) int { return max(1, n-1) } // all but one where possible
				cur, err := Select(a, Options{Method: MethodTop, Rank: lev.K, Rows: count(c.Rows), Cols: count(c.Cols), SVD: svd})
				if err != nil {
					t.Fatal(err)
				}
				checkTop(t, "columns", cur.Cols, lev.Cols, count(c.Cols))
				checkTop(t, "rows", cur.Rows, lev.Rows, count(c.Rows))
			})
		}
	}
}

func checkTop(t *testing.T, side string, picks []Pick, golden []float64, count int) {
	t.Helper()
	order := make([]int, len(golden))
	for i := range order {
		order[i] = i
	}
	sort.SliceStable(order, func(x, y int) bool { return golden[order[x]] > golden[order[y]] })
	// Indices with a golden score that is zero to rounding are not picked.
	positive := 0
	for _, i := range order {
		if golden[i] > tolLeverage {
			positive++
		}
	}
	want := order[:min(count, positive)]
	if len(picks) != len(want) {
		t.Fatalf("%s: %d picks %v, want %d %v", side, len(picks), indices(picks), len(want), want)
	}
	seen := map[int]bool{}
	for k, p := range picks {
		if seen[p.Index] {
			t.Errorf("%s: index %d picked twice", side, p.Index)
		}
		seen[p.Index] = true
		if p.Order != k || p.Count != 1 || p.Weight != 1 {
			t.Errorf("%s pick %d: order %d count %d weight %g, want %d, 1, 1", side, k, p.Order, p.Count, p.Weight, k)
		}
		if math.Abs(p.Score-golden[p.Index]) > tolLeverage {
			t.Errorf("%s %d: score %.15g, numpy leverage %.15g", side, p.Index, p.Score, golden[p.Index])
		}
		if k > 0 && p.Score > picks[k-1].Score {
			t.Errorf("%s: scores not decreasing at pick %d", side, k)
		}
		// Compare by index only where the golden order is unambiguous.
		separated := (k == 0 || golden[want[k-1]]-golden[want[k]] > tolGapCheck) &&
			(k+1 >= len(order) || golden[want[k]]-golden[order[k+1]] > tolGapCheck)
		if separated && p.Index != want[k] {
			t.Errorf("%s pick %d: index %d, numpy order gives %d (picks %v, want %v)", side, k, p.Index, want[k], indices(picks), want)
		}
	}
}

// TestTopTiesAndZeros: with hand-made singular vectors whose leverage
// scores tie exactly, ties go to the smaller index, and a score of zero is
// never picked (the contract in select.go's largest; no outside source).
// V (5×2) has orthonormal columns (0.5, 0, 0.5, √½, 0) and e₂, so the column
// scores are 0.25, 1, 0.25, ½, 0; U (4×2) has columns ½(1,1,1,1) and
// ½(1,−1,1,−1), so every row score is exactly ½.
func TestTopTiesAndZeros(t *testing.T) {
	a := csrOf(mat.NewDense(4, 5, []float64{
		1, 0, 2, 0, 0,
		0, 3, 0, 1, 0,
		4, 0, 0, 0, 5,
		0, 0, 1, 1, 1,
	}))
	r := math.Sqrt(0.5)
	svd := &sparsemat.SVD{
		Values: []float64{2, 1},
		U: mat.NewDense(4, 2, []float64{
			0.5, 0.5,
			0.5, -0.5,
			0.5, 0.5,
			0.5, -0.5,
		}),
		V: mat.NewDense(5, 2, []float64{
			0.5, 0,
			0, 1,
			0.5, 0,
			r, 0,
			0, 0,
		}),
	}
	cur, err := Select(a, Options{Method: MethodTop, Rank: 2, Rows: 3, Cols: 5, SVD: svd})
	if err != nil {
		t.Fatal(err)
	}
	if got, want := indices(cur.Cols), []int{1, 3, 0, 2}; !slices.Equal(got, want) {
		t.Errorf("columns %v, want %v (1 > ½ > 0.25 = 0.25, zero left out)", got, want)
	}
	if got, want := indices(cur.Rows), []int{0, 1, 2}; !slices.Equal(got, want) {
		t.Errorf("rows %v, want %v (all tied: smallest indices first)", got, want)
	}
}

// rankTwo is an 8×6 integer matrix of exact rank 2: u₁v₁ᵀ + u₂v₂ᵀ.
func rankTwo() *mat.Dense {
	u1 := []float64{1, 2, 0, -1, 3, 1, 0, 2}
	v1 := []float64{2, 0, 1, 1, -1, 3}
	u2 := []float64{0, 1, 1, 2, -1, 0, 3, 1}
	v2 := []float64{1, 2, 0, -2, 1, 1}
	d := mat.NewDense(8, 6, nil)
	for i := range 8 {
		for j := range 6 {
			d.Set(i, j, u1[i]*v1[j]+u2[i]*v2[j])
		}
	}
	return d
}

// TestPivotStopsAtRank: on a matrix of exact rank 2, LU with partial
// pivoting has no third non-zero pivot (after two elimination steps the
// remaining rows are zero to rounding), so asking for 5 columns and 5 rows
// gives at most 2 of each, on both row paths (rows from C, and rows from
// the row sketch when more rows than columns are wanted), and C and R keep
// full rank (gonum SVD, numpy's rank rule). This is what the doc comments
// of pivotPicks and luPivots promise ("stop early … when the pivots reach
// numerical zero"); partial-pivoting LU for CUR: Dong and Martinsson, Adv.
// Comput. Math. 49(4), 2023. 40 seeds, with and without power iterations.
func TestPivotStopsAtRank(t *testing.T) {
	d := rankTwo()
	if r := denseRank(t, d); r != 2 {
		t.Fatalf("fixture has rank %d, want 2", r)
	}
	a := csrOf(d)
	for _, s := range []struct {
		name       string
		rows, cols int
	}{
		{"rows5-cols5", 5, 5}, // 2 columns, then rows from the row sketch
		{"rows2-cols5", 2, 5}, // rows from C
		{"rows5-cols1", 5, 1}, // row sketch
		{"rows3-cols3", 3, 3}, // row sketch
	} {
		for _, power := range []int{0, 2} {
			for seed := range uint64(40) {
				t.Run(fmt.Sprintf("%s/q=%d/seed=%d", s.name, power, seed), func(t *testing.T) {
					cur, err := Select(a, Options{Method: MethodPivot, Rows: s.rows, Cols: s.cols, PowerIters: power, Seed: seed})
					if err != nil {
						t.Fatal(err)
					}
					if len(cur.Cols) > 2 || len(cur.Rows) > 2 {
						t.Errorf("%d columns %v and %d rows %v from a rank-2 matrix", len(cur.Cols), indices(cur.Cols), len(cur.Rows), indices(cur.Rows))
					}
					if len(cur.Cols) != min(s.cols, 2) || len(cur.Rows) != min(s.rows, 2) {
						t.Errorf("%d columns and %d rows, want %d and %d", len(cur.Cols), len(cur.Rows), min(s.cols, 2), min(s.rows, 2))
					}
					if r := denseRank(t, cur.C); r != len(cur.Cols) {
						t.Errorf("C has rank %d with %d columns", r, len(cur.Cols))
					}
					if r := denseRank(t, cur.R); r != len(cur.Rows) {
						t.Errorf("R has rank %d with %d rows", r, len(cur.Rows))
					}
					checkDistinct(t, cur)
				})
			}
		}
	}
}

// TestPivotFullRank: on full-rank random matrices the pivot picks are as
// many as asked (up to min(m, n)) and linearly independent: C and R have
// full column and row rank (gonum SVD, numpy rank rule). LU with partial
// pivoting never picks a row that is in the span of the rows picked before
// (its pivot would be zero). The same seed gives the same picks.
func TestPivotFullRank(t *testing.T) {
	for _, s := range []struct {
		m, n, rows, cols, power int
		seed                    uint64
	}{
		{20, 15, 8, 10, 0, 1},
		{20, 15, 12, 5, 1, 2}, // more rows than columns: the row sketch
		{30, 12, 12, 12, 2, 3},
		{10, 25, 10, 10, 0, 4},
	} {
		t.Run(fmt.Sprintf("%dx%d/r=%d/c=%d/q=%d", s.m, s.n, s.rows, s.cols, s.power), func(t *testing.T) {
			a := randomCSR(s.m, s.n, 0.5, s.seed)
			if r := denseRank(t, denseOf(a)); r != min(s.m, s.n) {
				t.Fatalf("fixture has rank %d", r)
			}
			opts := Options{Method: MethodPivot, Rows: s.rows, Cols: s.cols, PowerIters: s.power, Seed: s.seed}
			cur, err := Select(a, opts)
			if err != nil {
				t.Fatal(err)
			}
			if len(cur.Cols) != min(s.cols, s.n, s.m) || len(cur.Rows) != min(s.rows, s.m) {
				t.Errorf("%d columns and %d rows, asked %d and %d", len(cur.Cols), len(cur.Rows), s.cols, s.rows)
			}
			if r := denseRank(t, cur.C); r != len(cur.Cols) {
				t.Errorf("rank of C is %d with %d picked columns", r, len(cur.Cols))
			}
			if r := denseRank(t, cur.R); r != len(cur.Rows) {
				t.Errorf("rank of R is %d with %d picked rows", r, len(cur.Rows))
			}
			checkDistinct(t, cur)
			again, err := Select(a, opts)
			if err != nil {
				t.Fatal(err)
			}
			if !reflect.DeepEqual(cur.Cols, again.Cols) || !reflect.DeepEqual(cur.Rows, again.Rows) {
				t.Error("the same seed gave different picks")
			}
		})
	}
}

// checkDistinct checks that no index repeats and that Order counts 0, 1, …
func checkDistinct(t *testing.T, cur *CUR) {
	t.Helper()
	for side, ps := range map[string][]Pick{"rows": cur.Rows, "columns": cur.Cols} {
		seen := map[int]bool{}
		for k, p := range ps {
			if seen[p.Index] {
				t.Errorf("%s: index %d picked twice", side, p.Index)
			}
			seen[p.Index] = true
			if p.Order != k {
				t.Errorf("%s pick %d has Order %d", side, k, p.Order)
			}
		}
	}
}

// greedyGains returns, for every row i of x, the dense gain
// ‖X·ã_i‖²/‖ã_i‖² of adding it to the span of the rows in picked, where
// ã_i is the part of row i orthogonal to that span (gonum QR-free: the
// projector comes from densePinv). Rows in picked get −1.
func greedyGains(t *testing.T, x *mat.Dense, picked []int) []float64 {
	t.Helper()
	m, n := x.Dims()
	proj := mat.NewDense(n, n, nil) // projector onto the span of the picked rows
	if len(picked) > 0 {
		s := mat.NewDense(len(picked), n, nil)
		for k, i := range picked {
			s.SetRow(k, x.RawRowView(i))
		}
		proj.Mul(densePinv(t, s), s)
	}
	gains := make([]float64, m)
	for i := range m {
		if slices.Contains(picked, i) {
			gains[i] = -1
			continue
		}
		ai := mat.NewVecDense(n, append([]float64(nil), x.RawRowView(i)...))
		var p, res, xr mat.VecDense
		p.MulVec(proj, ai)
		res.SubVec(ai, &p)
		den := mat.Dot(&res, &res)
		if den <= 1e-12*mat.Dot(ai, ai) {
			gains[i] = 0
			continue
		}
		xr.MulVec(x, &res)
		gains[i] = mat.Dot(&xr, &xr) / den
	}
	return gains
}

// argmaxGap returns the index of the largest value and its relative lead
// over the second largest.
func argmaxGap(v []float64) (int, float64) {
	best, second := -1, math.Inf(-1)
	for i, x := range v {
		if best < 0 || x > v[best] {
			if best >= 0 {
				second = v[best]
			}
			best = i
		} else if x > second {
			second = x
		}
	}
	return best, (v[best] - second) / v[best]
}

// TestGreedyFirstPick: with the exact full SVD as its proxy, the first
// greedy row maximises ‖A·a_i‖²/‖a_i‖² over all rows, and the first greedy
// column maximises ‖Aᵀ·a_j‖²/‖a_j‖² over all columns, both computed densely
// with gonum (oracle); the pick's Score is that gain over ‖A‖_F².
func TestGreedyFirstPick(t *testing.T) {
	for _, s := range []struct {
		m, n    int
		density float64
		seed    uint64
	}{{30, 20, 0.3, 1}, {25, 40, 0.2, 2}, {60, 15, 0.5, 3}} {
		t.Run(fmt.Sprintf("%dx%d", s.m, s.n), func(t *testing.T) {
			a := randomCSR(s.m, s.n, s.density, s.seed)
			d := denseOf(a)
			cur, err := Select(a, Options{Method: MethodGreedy, Rows: 1, Cols: 1, SVD: exactSVD(t, a)})
			if err != nil {
				t.Fatal(err)
			}
			fro := frob2(d)
			var dt mat.Dense
			dt.CloneFrom(d.T())
			for _, side := range []struct {
				name  string
				x     *mat.Dense
				picks []Pick
			}{{"row", d, cur.Rows}, {"column", &dt, cur.Cols}} {
				gains := greedyGains(t, side.x, nil)
				best, gap := argmaxGap(gains)
				if gap <= tolGapCheck {
					t.Fatalf("%s: fixture too close to a tie (gap %g)", side.name, gap)
				}
				if len(side.picks) != 1 {
					t.Fatalf("%s: %d picks, want 1", side.name, len(side.picks))
				}
				p := side.picks[0]
				if p.Index != best {
					t.Errorf("first %s %d (gain %g), dense argmax %d (gain %g)", side.name, p.Index, gains[p.Index], best, gains[best])
				}
				if math.Abs(p.Score-gains[best]/fro) > tolGain {
					t.Errorf("first %s score %.15g, want gain/‖A‖² = %.15g", side.name, p.Score, gains[best]/fro)
				}
				if p.Weight != 1 || p.Count != 1 {
					t.Errorf("first %s weight %g count %d, want 1 and 1", side.name, p.Weight, p.Count)
				}
			}
		})
	}
}

// TestGreedyGrowth: with the exact full SVD as proxy, greedy rows for
// Rows = 1, 2, … are nested (each run extends the previous one, as greedy
// growth must), each new row has the largest dense gain given the rows
// before it (gonum oracle; greedy subset selection, common practice), the
// captured share RowSpaceSq never decreases, and each increment of
// RowSpaceSq equals the new pick's Score·‖A‖_F².
func TestGreedyGrowth(t *testing.T) {
	a := randomCSR(40, 30, 0.25, 11)
	d := denseOf(a)
	svd := exactSVD(t, a)
	fro := frob2(d)
	var prev []int
	prevShare := 0.0
	for r := 1; r <= 10; r++ {
		cur, err := Select(a, Options{Method: MethodGreedy, Rows: r, Cols: 1, SVD: svd})
		if err != nil {
			t.Fatal(err)
		}
		got := indices(cur.Rows)
		if len(got) != r || !slices.Equal(got[:r-1], prev) {
			t.Fatalf("Rows = %d gave %v, not %v plus one", r, got, prev)
		}
		gains := greedyGains(t, d, prev)
		best, gap := argmaxGap(gains)
		last := cur.Rows[r-1]
		if gains[last.Index] < gains[best]*(1-tolGain) {
			t.Errorf("step %d: picked %d with dense gain %g, best is %d with %g", r, last.Index, gains[last.Index], best, gains[best])
		} else if gap > tolGapCheck && last.Index != best {
			t.Errorf("step %d: picked %d, dense argmax %d", r, last.Index, best)
		}
		share := RowSpaceSq(a, cur) / fro
		if share < prevShare-tolGain {
			t.Errorf("step %d: captured share fell from %.15g to %.15g", r, prevShare, share)
		}
		if math.Abs((share-prevShare)-last.Score) > tolGain {
			t.Errorf("step %d: share grew by %.15g, pick score %.15g", r, share-prevShare, last.Score)
		}
		prev, prevShare = got, share
	}
	t.Logf("10 greedy rows capture %.4f of ‖A‖²", prevShare)
}

// TestGreedyClusters: 4 clusters of near-identical rows (a base row plus
// noise of 1%), each on its own block of columns, with cluster strengths
// 1, 1.5, 2 and 3. Once one row of a cluster is in the span, the other
// rows of that cluster add almost nothing, so 4 greedy rows come one from
// each cluster (common practice: a planted-structure check).
func TestGreedyClusters(t *testing.T) {
	const perCluster, block = 6, 5
	strength := []float64{1, 1.5, 2, 3}
	rng := newRand(99)
	m, n := perCluster*len(strength), block*len(strength)
	d := mat.NewDense(m, n, nil)
	cluster := make([]int, m)
	for c, s := range strength {
		base := make([]float64, block)
		for j := range base {
			base[j] = s * (0.5 + rng.Float64())
		}
		for k := range perCluster {
			i := c*perCluster + k
			cluster[i] = c
			for j := range block {
				d.Set(i, c*block+j, base[j]*(1+0.01*rng.NormFloat64()))
			}
		}
	}
	a := csrOf(d)
	for _, proxy := range []int{min(m, n), 4} {
		t.Run(fmt.Sprintf("proxy-rank=%d", proxy), func(t *testing.T) {
			svd, err := sparsemat.TruncatedSVD(a, sparsemat.SVDOptions{Rank: proxy})
			if err != nil {
				t.Fatal(err)
			}
			cur, err := Select(a, Options{Method: MethodGreedy, Rows: 4, Cols: 4, SVD: svd})
			if err != nil {
				t.Fatal(err)
			}
			seen := map[int]bool{}
			for _, p := range cur.Rows {
				seen[cluster[p.Index]] = true
			}
			if len(seen) != 4 {
				t.Errorf("greedy rows %v cover clusters %v, want all 4", indices(cur.Rows), seen)
			}
			blocks := map[int]bool{}
			for _, p := range cur.Cols {
				blocks[p.Index/block] = true
			}
			if len(blocks) != 4 {
				t.Errorf("greedy columns %v cover blocks %v, want all 4", indices(cur.Cols), blocks)
			}
		})
	}
}
