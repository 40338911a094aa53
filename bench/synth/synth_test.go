package synth

import (
	"math"
	"slices"
	"testing"

	"github.com/james-bowman/sparse"
)

// tolUnit: a row norm is a sum of at most a few hundred squares of numbers
// of order 1 scaled once; its rounding error is a few ulps, and 1e-12
// leaves a wide margin.
const tolUnit = 1e-12

// tolCount: exp of a ratio of two weights recovers an integer count to
// about 1e-14 relative for counts below 100; 1e-9 leaves a wide margin.
const tolCount = 1e-9

// checkInvariants verifies the CSR layout (strictly increasing columns in
// range, nnzPerRow a row, no stored zeros, finite values) and unit rows.
func checkInvariants(t *testing.T, a *sparse.CSR, m, n, nnzPerRow int) {
	t.Helper()
	raw := a.RawMatrix()
	if raw.I != m || raw.J != n {
		t.Fatalf("shape %d×%d, want %d×%d", raw.I, raw.J, m, n)
	}
	if len(raw.Indptr) != m+1 || raw.Indptr[0] != 0 {
		t.Fatalf("indptr length %d, first %d", len(raw.Indptr), raw.Indptr[0])
	}
	for i := range m {
		lo, hi := raw.Indptr[i], raw.Indptr[i+1]
		if hi-lo != nnzPerRow {
			t.Fatalf("row %d has %d entries, want %d", i, hi-lo, nnzPerRow)
		}
		var s float64
		for k := lo; k < hi; k++ {
			j, v := raw.Ind[k], raw.Data[k]
			if j < 0 || j >= n {
				t.Fatalf("row %d: column %d out of range", i, j)
			}
			if k > lo && j <= raw.Ind[k-1] {
				t.Fatalf("row %d: columns not strictly increasing at %d", i, k)
			}
			if v <= 0 || math.IsNaN(v) || math.IsInf(v, 0) {
				t.Fatalf("row %d column %d: weight %v", i, j, v)
			}
			s += v * v
		}
		if math.Abs(math.Sqrt(s)-1) > tolUnit {
			t.Fatalf("row %d has norm %.17g", i, math.Sqrt(s))
		}
	}
}

func docFreq(a *sparse.CSR) []int {
	raw := a.RawMatrix()
	df := make([]int, raw.J)
	for _, j := range raw.Ind[:raw.Indptr[raw.I]] {
		df[j]++
	}
	return df
}

func TestMatrixInvariants(t *testing.T) {
	for _, s := range []struct{ m, n, nnz int }{
		{500, 2000, 30}, // the common case: few columns a row
		{40, 50, 45},    // rows nearly full: the exponential-key fallback
		{7, 9, 9},       // every column in every row
		{3, 1, 1},       // a single column
	} {
		a := Matrix(s.m, s.n, s.nnz, 3)
		checkInvariants(t, a, s.m, s.n, s.nnz)
	}
}

func TestMatrixDeterministic(t *testing.T) {
	for _, s := range []struct{ m, n, nnz int }{{300, 1000, 20}, {30, 40, 35}} {
		a, b := Matrix(s.m, s.n, s.nnz, 11).RawMatrix(), Matrix(s.m, s.n, s.nnz, 11).RawMatrix()
		if !slices.Equal(a.Indptr, b.Indptr) || !slices.Equal(a.Ind, b.Ind) || !slices.Equal(a.Data, b.Data) {
			t.Fatalf("%v: same seed gave different matrices", s)
		}
		c := Matrix(s.m, s.n, s.nnz, 12).RawMatrix()
		if slices.Equal(a.Ind, c.Ind) && slices.Equal(a.Data, c.Data) {
			t.Fatalf("%v: seeds 11 and 12 gave the same matrix", s)
		}
	}
}

// TestMatrixZipf: column 0 has the largest document frequency, and the mean
// document frequency falls from one band of columns to the next
// ([0,10), [10,100), [100,1000), [1000,5000)). With weights (1+j)^−1.1
// the bands' means differ by factors of several, far beyond the sampling
// noise of 2000 rows.
func TestMatrixZipf(t *testing.T) {
	const m, n = 2000, 5000
	df := docFreq(Matrix(m, n, 20, 5))
	if mx := slices.Max(df); df[0] != mx {
		t.Fatalf("df[0] = %d, but the largest df is %d (column %d)", df[0], mx, slices.Index(df, mx))
	}
	bands := []int{0, 10, 100, 1000, n}
	prev := math.Inf(1)
	for b := 0; b+1 < len(bands); b++ {
		sum := 0
		for _, d := range df[bands[b]:bands[b+1]] {
			sum += d
		}
		mean := float64(sum) / float64(bands[b+1]-bands[b])
		if mean >= prev {
			t.Fatalf("mean df of columns [%d,%d) is %g, not below the previous band's %g", bands[b], bands[b+1], mean, prev)
		}
		prev = mean
	}
}

// TestMatrixWeights recovers the counts: within a row, a(i,j)/idf(j) is
// proportional to 1 + ln c with c a whole number. A row of 30 entries has
// a count of 1 with probability 1 − 0.4^30, so the row's smallest ratio is
// taken as c = 1 and every other ratio must give a whole c. This checks
// both the sublinear tf and that idf uses the realised document
// frequencies, smooth form ln((1+m)/(1+df)) + 1.
func TestMatrixWeights(t *testing.T) {
	const m, n, nnz = 400, 3000, 30
	a := Matrix(m, n, nnz, 9)
	df := docFreq(a)
	raw := a.RawMatrix()
	maxCount := 0
	for i := range m {
		lo, hi := raw.Indptr[i], raw.Indptr[i+1]
		tf := make([]float64, 0, hi-lo)
		for k := lo; k < hi; k++ {
			j := raw.Ind[k]
			tf = append(tf, raw.Data[k]/(math.Log(float64(1+m)/float64(1+df[j]))+1))
		}
		base := slices.Min(tf)
		for _, v := range tf {
			c := math.Exp(v/base - 1)
			if math.Abs(c-math.Round(c)) > tolCount*c {
				t.Fatalf("row %d: recovered count %.12g is not a whole number", i, c)
			}
			maxCount = max(maxCount, int(math.Round(c)))
		}
	}
	if maxCount < 3 {
		t.Fatalf("largest count %d: the geometric law should give counts of 3 and more", maxCount)
	}
}

func TestMatrixPanics(t *testing.T) {
	for _, s := range []struct{ m, n, nnz int }{{0, 5, 1}, {5, 0, 1}, {5, 5, 0}, {5, 5, 6}} {
		func() {
			defer func() {
				if recover() == nil {
					t.Errorf("Matrix(%d, %d, %d) did not panic", s.m, s.n, s.nnz)
				}
			}()
			Matrix(s.m, s.n, s.nnz, 1)
		}()
	}
}

// BenchmarkMatrix times the size the SVD comparison uses.
func BenchmarkMatrix(b *testing.B) {
	for b.Loop() {
		Matrix(100000, 50000, 100, 1)
	}
}
