package selection

import (
	"math"
	"math/rand/v2"
	"reflect"
	"runtime"
	"slices"
	"strings"
	"testing"

	"github.com/james-bowman/sparse"
	"gonum.org/v1/gonum/mat"

	"assay/sparsemat"
)

// TestDeterminism: for every method and both cores, Select gives the same
// picks (every field, floats compared by bits), the same C, R and U
// (mat.Equal) and the same ErrorSq and RowSpaceSq for GOMAXPROCS 1 and 4,
// as the package documentation promises. The matrix (3000×300, about
// 45,000 entries) is large enough that the sparse products split their
// work over several goroutines. The SVD is computed once, so only Select
// is under test.
func TestDeterminism(t *testing.T) {
	a := randomCSR(3000, 300, 0.05, 9)
	svd, err := sparsemat.TruncatedSVD(a, sparsemat.SVDOptions{Rank: 20})
	if err != nil {
		t.Fatal(err)
	}
	run := func(procs int, opts Options) (*CUR, float64, float64) {
		prev := runtime.GOMAXPROCS(procs)
		defer runtime.GOMAXPROCS(prev)
		cur, err := Select(a, opts)
		if err != nil {
			t.Fatal(err)
		}
		return cur, ErrorSq(a, cur), RowSpaceSq(a, cur)
	}
	for _, method := range allMethods {
		for _, core := range []Core{CoreOptimal, CoreIntersection} {
			t.Run(string(method)+"/"+string(core), func(t *testing.T) {
				opts := Options{Method: method, Core: core, Rows: 15, Cols: 25, Rank: 10, Seed: 77, SVD: svd, PowerIters: 1}
				one, err1, row1 := run(1, opts)
				four, err4, row4 := run(4, opts)
				if !reflect.DeepEqual(one.Rows, four.Rows) || !reflect.DeepEqual(one.Cols, four.Cols) {
					t.Fatalf("picks differ between GOMAXPROCS 1 and 4:\n%v %v\n%v %v", indices(one.Rows), indices(one.Cols), indices(four.Rows), indices(four.Cols))
				}
				if !mat.Equal(one.C, four.C) || !mat.Equal(one.R, four.R) {
					t.Error("C or R differs between GOMAXPROCS 1 and 4")
				}
				if !mat.Equal(one.U, four.U) {
					t.Error("U differs between GOMAXPROCS 1 and 4")
				}
				if err1 != err4 || row1 != row4 {
					t.Errorf("ErrorSq %v vs %v, RowSpaceSq %v vs %v", err1, err4, row1, row4)
				}
			})
		}
	}
}

// TestSeedsDiffer: for the sampling methods, seeds 77 and 78 give different
// picks (with 25 of 300 columns and 15 of 3000 rows drawn, equal picks
// would have a vanishing probability).
func TestSeedsDiffer(t *testing.T) {
	a := randomCSR(3000, 300, 0.05, 9)
	svd, err := sparsemat.TruncatedSVD(a, sparsemat.SVDOptions{Rank: 10})
	if err != nil {
		t.Fatal(err)
	}
	for _, method := range []Method{MethodNorm, MethodLeverage} {
		t.Run(string(method), func(t *testing.T) {
			x, err := Select(a, Options{Method: method, Rows: 15, Cols: 25, Rank: 10, Seed: 77, SVD: svd})
			if err != nil {
				t.Fatal(err)
			}
			y, err := Select(a, Options{Method: method, Rows: 15, Cols: 25, Rank: 10, Seed: 78, SVD: svd})
			if err != nil {
				t.Fatal(err)
			}
			if slices.Equal(indices(x.Rows), indices(y.Rows)) {
				t.Errorf("seeds 77 and 78 drew the same rows %v", indices(x.Rows))
			}
			if slices.Equal(indices(x.Cols), indices(y.Cols)) {
				t.Errorf("seeds 77 and 78 drew the same columns %v", indices(x.Cols))
			}
		})
	}
}

// TestDefaults: "" means MethodGreedy and CoreOptimal (the Options
// contract in select.go).
func TestDefaults(t *testing.T) {
	a := randomCSR(20, 15, 0.4, 4)
	cur, err := Select(a, Options{Rows: 3, Cols: 3, SVD: exactSVD(t, a)})
	if err != nil {
		t.Fatal(err)
	}
	if cur.Method != MethodGreedy || cur.Core != CoreOptimal {
		t.Errorf("defaults %q and %q, want %q and %q", cur.Method, cur.Core, MethodGreedy, CoreOptimal)
	}
	greedy, err := Select(a, Options{Method: MethodGreedy, Rows: 3, Cols: 3, SVD: exactSVD(t, a)})
	if err != nil {
		t.Fatal(err)
	}
	if !reflect.DeepEqual(cur.Rows, greedy.Rows) || !reflect.DeepEqual(cur.Cols, greedy.Cols) {
		t.Error("the default method picks differently from greedy")
	}
}

// TestSelectRejects: every documented error case returns an error (and
// does not panic), with a message naming the problem.
func TestSelectRejects(t *testing.T) {
	a := randomCSR(6, 5, 0.6, 1)
	svd, err := sparsemat.TruncatedSVD(a, sparsemat.SVDOptions{Rank: 3})
	if err != nil {
		t.Fatal(err)
	}
	ok := Options{Rows: 2, Cols: 2, Rank: 2, SVD: svd}
	with := func(f func(*Options)) Options {
		o := ok
		f(&o)
		return o
	}
	for _, c := range []struct {
		name string
		a    *sparse.CSR
		opts Options
		want string // a word the message must contain
	}{
		{"no-rows", sparse.NewCSR(0, 5, []int{0}, nil, nil), with(func(o *Options) { o.Method = MethodNorm }), "empty"},
		{"no-cols", sparse.NewCSR(3, 0, []int{0, 0, 0, 0}, nil, nil), with(func(o *Options) { o.Method = MethodNorm }), "empty"},
		{"all-zero", sparse.NewCSR(2, 2, []int{0, 0, 0}, nil, nil), with(func(o *Options) { o.Method = MethodNorm }), "zero"},
		{"rows-0", a, with(func(o *Options) { o.Method, o.Rows = MethodNorm, 0 }), "at least one"},
		{"cols-0", a, with(func(o *Options) { o.Method, o.Cols = MethodNorm, 0 }), "at least one"},
		{"rows-negative", a, with(func(o *Options) { o.Method, o.Rows = MethodPivot, -3 }), "at least one"},
		{"unknown-method", a, with(func(o *Options) { o.Method = "random" }), "unknown method"},
		{"unknown-method-no-svd", a, Options{Method: "random", Rows: 2, Cols: 2}, "unknown method"},
		{"unknown-core", a, with(func(o *Options) { o.Method, o.Core = MethodNorm, "pinv" }), "unknown core"},
		{"leverage-no-svd", a, with(func(o *Options) { o.Method, o.SVD = MethodLeverage, nil }), "singular vectors"},
		{"top-no-svd", a, with(func(o *Options) { o.Method, o.SVD = MethodTop, nil }), "singular vectors"},
		{"greedy-no-svd", a, with(func(o *Options) { o.Method, o.SVD = MethodGreedy, nil }), "singular vectors"},
		{"default-no-svd", a, with(func(o *Options) { o.Method, o.SVD = "", nil }), "singular vectors"},
		{"leverage-rank-0", a, with(func(o *Options) { o.Method, o.Rank = MethodLeverage, 0 }), "rank"},
		{"leverage-rank-negative", a, with(func(o *Options) { o.Method, o.Rank = MethodLeverage, -1 }), "rank"},
		{"leverage-rank-above", a, with(func(o *Options) { o.Method, o.Rank = MethodLeverage, 4 }), "rank"},
		{"top-rank-0", a, with(func(o *Options) { o.Method, o.Rank = MethodTop, 0 }), "rank"},
		{"top-rank-above", a, with(func(o *Options) { o.Method, o.Rank = MethodTop, 4 }), "rank"},
	} {
		t.Run(c.name, func(t *testing.T) {
			cur, err := Select(c.a, c.opts)
			if err == nil {
				t.Fatalf("no error (got %d rows, %d columns)", len(cur.Rows), len(cur.Cols))
			}
			if !strings.Contains(err.Error(), c.want) {
				t.Errorf("error %q does not mention %q", err, c.want)
			}
		})
	}
	// The boundaries are accepted: rank 1 and rank len(values).
	for _, rank := range []int{1, len(svd.Values)} {
		if _, err := Select(a, with(func(o *Options) { o.Method, o.Rank = MethodLeverage, rank })); err != nil {
			t.Errorf("rank %d rejected: %v", rank, err)
		}
	}
}

// denseMulVecT (the greedy step's Σ·Vᵀ·q) against gonum's Dgemv: the same
// bits for a matrix of one block (gemvBlock rows or fewer), since both add
// v_i·x(i, :) row by row; and the same bits for GOMAXPROCS 1 and 4. With
// three blocks the two differ by the rounding of a regrouped sum of
// 20,000 products below 0.25: about √n·ε·|w| ≈ 2e-13 for random rounding
// (|w| ≈ 10 here), 3e-9 at the worst-case bound n·ε·Σ|terms|; the check
// allows 1e-12·max(1, |w|), a margin of about 50 over the typical error
// (common practice, no outside source).
func TestDenseMulVecT(t *testing.T) {
	for _, rows := range []int{5000, 20000} {
		rng := rand.New(rand.NewPCG(uint64(rows), 3))
		x := mat.NewDense(rows, 7, nil)
		v := make([]float64, rows)
		for i := range rows {
			v[i] = rng.Float64() - 0.5
			for j := range 7 {
				x.Set(i, j, rng.Float64()-0.5)
			}
		}
		var want mat.VecDense
		want.MulVec(x.T(), mat.NewVecDense(rows, v))
		got := make([]float64, 7)
		prev := runtime.GOMAXPROCS(1)
		denseMulVecT(got, x, v)
		runtime.GOMAXPROCS(4)
		got4 := make([]float64, 7)
		denseMulVecT(got4, x, v)
		runtime.GOMAXPROCS(prev)
		for j := range 7 {
			w := want.AtVec(j)
			if math.Float64bits(got[j]) != math.Float64bits(got4[j]) {
				t.Fatalf("rows %d: entry %d differs between GOMAXPROCS 1 and 4", rows, j)
			}
			if rows <= gemvBlock && math.Float64bits(got[j]) != math.Float64bits(w) {
				t.Fatalf("rows %d (one block): entry %d = %v, Dgemv %v", rows, j, got[j], w)
			}
			if math.Abs(got[j]-w) > 1e-12*math.Max(1, math.Abs(w)) {
				t.Fatalf("rows %d: entry %d = %v, Dgemv %v", rows, j, got[j], w)
			}
		}
	}
}
