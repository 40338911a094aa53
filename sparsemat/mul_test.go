package sparsemat

import (
	"fmt"
	"math"
	"math/rand/v2"
	"runtime"
	"testing"

	"gonum.org/v1/gonum/mat"
)

// tolProduct: a sparse row product sums at most n terms of size O(1) in a
// different order from the dense oracle; 1e-12 covers that rounding.
const tolProduct = 1e-12

func randomDense(r, c int, seed uint64) *mat.Dense {
	rng := rand.New(rand.NewPCG(seed, 2))
	d := mat.NewDense(r, c, nil)
	for i := range r {
		for j := range c {
			d.Set(i, j, rng.NormFloat64())
		}
	}
	return d
}

// TestMulDenseOracle compares MulDense with gonum's dense product (the
// oracle) over shapes including 1×n, n×1, empty rows and empty columns,
// and checks the inputs are unchanged.
func TestMulDenseOracle(t *testing.T) {
	shapes := []struct{ m, n, p int }{{1, 7, 3}, {7, 1, 2}, {5, 5, 1}, {40, 30, 6}, {300, 200, 9}, {2000, 50, 4}}
	for _, s := range shapes {
		for _, density := range []float64{0.02, 0.3} {
			t.Run(fmt.Sprintf("m=%d/n=%d/p=%d/density=%g", s.m, s.n, s.p, density), func(t *testing.T) {
				a := randomCSR(s.m, s.n, density, uint64(s.m*s.n), s.m/2, s.n/3)
				x := randomDense(s.n, s.p, 9)
				before := mat.DenseCopyOf(x)
				abefore := dense(a)
				var got mat.Dense
				MulDense(&got, a, x)
				var want mat.Dense
				want.Mul(abefore, x)
				if !mat.EqualApprox(&got, &want, tolProduct) {
					t.Fatalf("a·x differs from the dense product")
				}
				var gotT mat.Dense
				y := randomDense(s.m, s.p, 10)
				MulDense(&gotT, Transpose(a), y)
				var wantT mat.Dense
				wantT.Mul(abefore.T(), y)
				if !mat.EqualApprox(&gotT, &wantT, tolProduct) {
					t.Fatalf("Transpose(a)·y differs from the dense product")
				}
				var gotT2 mat.Dense
				MulDenseT(&gotT2, a, y)
				if !mat.EqualApprox(&gotT2, &wantT, tolProduct) {
					t.Fatalf("MulDenseT differs from the dense product")
				}
				if !mat.Equal(x, before) || !mat.Equal(dense(a), abefore) {
					t.Fatal("an input changed")
				}
			})
		}
	}
}

// The product is bit-identical for any number of goroutines.
func TestMulDenseDeterministic(t *testing.T) {
	a := randomCSR(3000, 400, 0.05, 5, -1, -1)
	x := randomDense(400, 8, 6)
	y := randomDense(3000, 8, 7)
	var one, many, oneT, manyT mat.Dense
	prev := runtime.GOMAXPROCS(1)
	MulDense(&one, a, x)
	MulDenseT(&oneT, a, y)
	runtime.GOMAXPROCS(8)
	MulDense(&many, a, x)
	MulDenseT(&manyT, a, y)
	runtime.GOMAXPROCS(prev)
	if !mat.Equal(&one, &many) {
		t.Fatal("MulDense: GOMAXPROCS 1 and 8 give different bits")
	}
	if !mat.Equal(&oneT, &manyT) {
		t.Fatal("MulDenseT: GOMAXPROCS 1 and 8 give different bits")
	}
}

// aᵀ·y for one vector is split into row blocks with partial sums above
// vecBlockNNZ values (lowered here so that a small matrix is split into
// the most blocks): it must agree with the dense product (tolerance as in
// TestMulDenseOracle), give the same bits for GOMAXPROCS 1 and 8, and be
// the plain scatter, bit for bit, when the matrix is one block (common
// practice: a reference implementation in the test, no outside source).
func TestMulDenseTVectorBlocks(t *testing.T) {
	a := randomCSR(3000, 400, 0.05, 11, 7, 13)
	y := randomDense(3000, 1, 12)
	var want mat.Dense
	want.Mul(dense(a).T(), y)
	saved := vecBlockNNZ
	defer func() { vecBlockNNZ = saved }()
	vecBlockNNZ = 1000 // about 60,000 values: the most blocks, vecBlocks
	prev := runtime.GOMAXPROCS(1)
	var one, many mat.Dense
	MulDenseT(&one, a, y)
	runtime.GOMAXPROCS(8)
	MulDenseT(&many, a, y)
	runtime.GOMAXPROCS(prev)
	if !mat.EqualApprox(&one, &want, tolProduct) {
		t.Fatal("blocked aᵀ·y differs from the dense product")
	}
	if !mat.Equal(&one, &many) {
		t.Fatal("blocked aᵀ·y: GOMAXPROCS 1 and 8 give different bits")
	}
	vecBlockNNZ = saved // one block
	var single mat.Dense
	MulDenseT(&single, a, y)
	raw := a.RawMatrix()
	plain := make([]float64, 400)
	for i := range 3000 {
		for k := raw.Indptr[i]; k < raw.Indptr[i+1]; k++ {
			plain[raw.Ind[k]] += raw.Data[k] * y.At(i, 0)
		}
	}
	for j, w := range plain {
		if v := single.At(j, 0); math.Float64bits(v) != math.Float64bits(w) {
			t.Fatalf("one block: entry %d = %v, plain scatter %v", j, v, w)
		}
	}
}

func TestTransposeInvariants(t *testing.T) {
	a := randomCSR(30, 20, 0.2, 4, 3, 5)
	at := Transpose(a)
	checkCSR(t, at)
	if !mat.Equal(dense(at), dense(a).T()) {
		t.Fatal("Transpose differs from the dense transpose")
	}
}

func TestNormsOracle(t *testing.T) {
	a := randomCSR(25, 15, 0.3, 8, 2, 4)
	d := dense(a)
	rows, cols := RowSqNorms(a), ColSqNorms(a)
	var total float64
	for i := range 25 {
		r := mat.Norm(d.RowView(i), 2)
		if diff := rows[i] - r*r; diff > tolProduct || diff < -tolProduct {
			t.Errorf("row %d: %g vs %g", i, rows[i], r*r)
		}
		total += rows[i]
	}
	for j := range 15 {
		c := mat.Norm(d.ColView(j), 2)
		if diff := cols[j] - c*c; diff > tolProduct || diff < -tolProduct {
			t.Errorf("col %d: %g vs %g", j, cols[j], c*c)
		}
	}
	f := mat.Norm(d, 2)
	if diff := FrobeniusSq(a) - f*f; diff > tolProduct || diff < -tolProduct {
		t.Errorf("frobenius² %g vs %g", FrobeniusSq(a), f*f)
	}
}
