package selection

import (
	"math"
	"testing"

	"gonum.org/v1/gonum/mat"
)

// tolExplain: coverage, shares and prefix sums are short sums of products
// of O(1) values computed two ways (QR bases against dense projectors);
// 1e-10 covers their rounding.
const tolExplain = 1e-10

// denseProjector returns the n×n orthogonal projector onto the row space
// of r (dense oracle, small sizes only).
func denseProjector(t *testing.T, r *mat.Dense) *mat.Dense {
	t.Helper()
	pinv := densePinv(t, r)
	var p mat.Dense
	p.Mul(pinv, r)
	return &p
}

// Coverage equals ‖a_i·P_R‖²/‖a_i‖² from a dense projector; the share rule's
// parts of each row add up to its covered part (the decomposition the rule
// rests on, see Explain); exemplars are in their own groups; the cosine
// rule equals a dense argmax of cosines.
func TestExplain(t *testing.T) {
	a := randomCSR(60, 40, 0.15, 21)
	d := denseOf(a)
	for _, method := range []Method{MethodNorm, MethodPivot} {
		cur, err := Select(a, Options{Method: method, Rows: 6, Cols: 8, Seed: 2, PowerIters: 1})
		if err != nil {
			t.Fatal(err)
		}
		p := denseProjector(t, cur.R)
		share, err := Explain(a, cur, GroupShare)
		if err != nil {
			t.Fatal(err)
		}
		cos, err := Explain(a, cur, GroupCosine)
		if err != nil {
			t.Fatal(err)
		}
		for i := range 60 {
			ai := mat.Row(nil, i, d)
			norm := mat.Dot(mat.NewVecDense(40, ai), mat.NewVecDense(40, ai))
			if norm == 0 {
				if share.Group[i] != -1 {
					t.Errorf("zero row %d in group %d", i, share.Group[i])
				}
				continue
			}
			var pa mat.VecDense
			pa.MulVec(p, mat.NewVecDense(40, ai))
			want := mat.Dot(&pa, &pa) / norm
			if math.Abs(share.Coverage[i]-want) > tolExplain {
				t.Errorf("%s row %d: coverage %g, dense %g", method, i, share.Coverage[i], want)
			}
			// Cosine oracle.
			best, bestCos := -1, math.Inf(-1)
			for j, pk := range cur.Rows {
				rj := mat.Row(nil, pk.Index, d)
				c := mat.Dot(mat.NewVecDense(40, ai), mat.NewVecDense(40, rj)) /
					math.Sqrt(norm*mat.Dot(mat.NewVecDense(40, rj), mat.NewVecDense(40, rj)))
				if c > bestCos+1e-12 {
					best, bestCos = j, c
				}
			}
			if !isExemplar(cur, i) && cos.Group[i] != best {
				t.Errorf("%s row %d: cosine group %d, dense argmax %d", method, i, cos.Group[i], best)
			}
		}
		for j, pk := range cur.Rows {
			if share.Group[pk.Index] != j || cos.Group[pk.Index] != j {
				t.Errorf("%s: exemplar %d is not in its own group", method, pk.Index)
			}
		}
	}
	if _, err := Explain(a, &CUR{}, "nearest"); err == nil {
		t.Error("unknown rule: no error")
	}
}

func isExemplar(cur *CUR, i int) bool {
	for _, p := range cur.Rows {
		if p.Index == i {
			return true
		}
	}
	return false
}

// TermCoverage equals ‖P_R applied to column j‖²/‖A(:, j)‖² computed with
// the dense projector: (A·P)(:, j).
func TestTermCoverage(t *testing.T) {
	a := randomCSR(50, 30, 0.2, 5)
	d := denseOf(a)
	cur, err := Select(a, Options{Method: MethodNorm, Rows: 5, Cols: 5, Seed: 1})
	if err != nil {
		t.Fatal(err)
	}
	p := denseProjector(t, cur.R)
	var ap mat.Dense
	ap.Mul(d, p)
	cols := []int{0, 3, 7, 29}
	got := TermCoverage(a, cur, cols)
	for k, j := range cols {
		num := mat.Norm(ap.ColView(j), 2)
		den := mat.Norm(d.ColView(j), 2)
		want := 0.0
		if den > 0 {
			want = num * num / (den * den)
		}
		if math.Abs(got[k]-want) > tolExplain {
			t.Errorf("column %d: coverage %g, dense %g", j, got[k], want)
		}
	}
}

// PrefixShares: the last value equals the captured share of all picks
// (RowSpaceSq), and for greedy each prefix equals the share of a separate
// run with that many rows (greedy's picks for t rows are the first t of
// its picks for more, given the same singular triplets).
func TestPrefixShares(t *testing.T) {
	a := loadDemo(t)
	svd := exactSVD(t, a)
	big, err := Select(a, Options{Method: MethodGreedy, Rows: 12, Cols: 5, SVD: svd})
	if err != nil {
		t.Fatal(err)
	}
	curve := PrefixShares(a, big)
	total := RowSpaceSq(a, big) / frob2(denseOf(a))
	if math.Abs(curve[len(curve)-1]-total) > tolExplain {
		t.Errorf("last prefix share %g, all picks %g", curve[len(curve)-1], total)
	}
	for r := 1; r <= 12; r++ {
		cur, err := Select(a, Options{Method: MethodGreedy, Rows: r, Cols: 5, SVD: svd})
		if err != nil {
			t.Fatal(err)
		}
		single := RowSpaceSq(a, cur) / frob2(denseOf(a))
		if math.Abs(curve[r-1]-single) > tolExplain {
			t.Errorf("prefix %d: %g, single run %g", r, curve[r-1], single)
		}
		if r > 1 && curve[r-1] < curve[r-2]-tolExplain {
			t.Errorf("prefix share fell at %d: %g < %g", r, curve[r-1], curve[r-2])
		}
	}
}
