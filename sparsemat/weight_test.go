package sparsemat

import (
	"encoding/json"
	"fmt"
	"math"
	"math/rand/v2"
	"os"
	"runtime"
	"slices"
	"strings"
	"testing"

	"github.com/james-bowman/sparse"
)

// tolSklearn: scikit-learn and this package evaluate the same closed-form
// expressions in float64, in a slightly different order; 1e-12 leaves room
// for a few ulps on values of order 1.
const tolSklearn = 1e-12

type tfidfGolden struct {
	Generator  string   `json:"generator"`
	Source     string   `json:"source"`
	Vocabulary []string `json:"vocabulary"`
	Cases      []struct {
		Name        string      `json:"name"`
		SublinearTF bool        `json:"sublinear_tf"`
		SmoothIDF   bool        `json:"smooth_idf"`
		Norm        string      `json:"norm"`
		IDF         []float64   `json:"idf"`
		Matrix      [][]float64 `json:"matrix"`
	} `json:"cases"`
}

// TestWeightMatchesScikitLearn compares the weights with scikit-learn's
// TfidfVectorizer (Debian python3-sklearn 1.2.1) on a fixture of
// pre-analysed tokens; testdata/reference/gen_tfidf.py wrote the golden.
func TestWeightMatchesScikitLearn(t *testing.T) {
	raw, err := os.ReadFile("../testdata/reference/tfidf.golden.json")
	if err != nil {
		t.Fatal(err)
	}
	var g tfidfGolden
	if err := json.Unmarshal(raw, &g); err != nil {
		t.Fatal(err)
	}
	text, err := os.ReadFile("../testdata/reference/tfidf-docs.txt")
	if err != nil {
		t.Fatal(err)
	}
	var b Builder
	for line := range strings.Lines(strings.TrimSpace(string(text))) {
		counts := map[string]int{}
		for _, tok := range strings.Split(strings.TrimSpace(line), " ") {
			counts[tok]++
		}
		b.AddRow(counts)
	}
	c, err := b.Build(Pruning{})
	if err != nil {
		t.Fatal(err)
	}
	if strings.Join(c.Terms, " ") != strings.Join(g.Vocabulary, " ") {
		t.Fatalf("vocabulary\n got %v\nwant %v", c.Terms, g.Vocabulary)
	}
	for _, tc := range g.Cases {
		t.Run(tc.Name, func(t *testing.T) {
			w := Weighting{TF: TFRaw, IDF: IDFPlain, Norm: Norm(tc.Norm)}
			if tc.SublinearTF {
				w.TF = TFLog
			}
			if tc.SmoothIDF {
				w.IDF = IDFSmooth
			}
			idf := IDFValues(c, w.IDF)
			for j, want := range tc.IDF {
				if math.Abs(idf[j]-want) > tolSklearn {
					t.Errorf("idf[%s] = %.17g, want %.17g", c.Terms[j], idf[j], want)
				}
			}
			fresh, err := b.Build(Pruning{}) // WeightInPlace takes its counts
			if err != nil {
				t.Fatal(err)
			}
			for _, a := range []*sparse.CSR{Weight(c, w), WeightInPlace(fresh, w)} {
				checkCSR(t, a)
				for i, row := range tc.Matrix {
					for j, want := range row {
						if got := a.At(i, j); math.Abs(got-want) > tolSklearn {
							t.Errorf("a(%d,%s) = %.17g, want %.17g", i, c.Terms[j], got, want)
						}
					}
				}
			}
		})
	}
}

// Properties of the default weighting (common practice, no outside source):
// unit rows, non-negative weights, idf falling as df rises.
func TestWeightProperties(t *testing.T) {
	var b Builder
	b.AddRow(map[string]int{"a": 3, "b": 1})
	b.AddRow(map[string]int{"a": 1})
	b.AddRow(map[string]int{"a": 1, "b": 2, "c": 7})
	c, _ := b.Build(Pruning{})
	a := Weight(c, DefaultWeighting)
	for i, s := range RowSqNorms(a) {
		if math.Abs(s-1) > 1e-15 {
			t.Errorf("row %d squared norm %g, want 1", i, s)
		}
	}
	idf := IDFValues(c, IDFSmooth)
	if !(idf[0] < idf[1] && idf[1] < idf[2]) {
		t.Errorf("idf %v should fall as df rises (df 3, 2, 1)", idf)
	}
	raw := a.RawMatrix()
	for _, v := range raw.Data {
		if v <= 0 {
			t.Errorf("weight %g is not positive", v)
		}
	}
}

func TestWeightingValidate(t *testing.T) {
	if err := DefaultWeighting.Validate(); err != nil {
		t.Fatal(err)
	}
	bad := []Weighting{
		{TF: "sqrt", IDF: IDFSmooth, Norm: NormL2},
		{TF: TFLog, IDF: "prob", Norm: NormL2},
		{TF: TFLog, IDF: IDFSmooth, Norm: "max"},
	}
	for _, w := range bad {
		if err := w.Validate(); err == nil {
			t.Errorf("%v: no error", w)
		}
	}
}

// TestWeightBlocksSameBits weights a matrix of several blocks of rows with
// one goroutine and with eight: the rows are weighted on their own, so the
// bits must be the same (the determinism rule of the package), and each
// row must be the serial formula's (tf·idf, then the L2 norm).
func TestWeightBlocksSameBits(t *testing.T) {
	b := randomCountsBuilder(rand.New(rand.NewPCG(13, 14)), 10000, 400)
	c, err := b.Build(Pruning{})
	if err != nil {
		t.Fatal(err)
	}
	plainWeighting := Weighting{TF: TFRaw, IDF: IDFSmooth, Norm: NormL2}
	defer runtime.GOMAXPROCS(runtime.GOMAXPROCS(1))
	one := Weight(c, plainWeighting).RawMatrix().Data
	runtime.GOMAXPROCS(8)
	eight := Weight(c, plainWeighting).RawMatrix().Data
	if !slices.Equal(one, eight) {
		t.Fatal("GOMAXPROCS 1 and 8 weigh differently")
	}
	raw := c.Matrix.RawMatrix()
	idf := IDFValues(c, plainWeighting.IDF)
	for _, i := range []int{0, 4095, 4096, 9999 - len(c.EmptyRows)} {
		lo, hi := raw.Indptr[i], raw.Indptr[i+1]
		var s float64
		for k := lo; k < hi; k++ {
			v := raw.Data[k] * idf[raw.Ind[k]]
			s += v * v
		}
		for k := lo; k < hi; k++ {
			if want := raw.Data[k] * idf[raw.Ind[k]] / math.Sqrt(s); one[k] != want {
				t.Fatalf("row %d entry %d: %g, want %g", i, k, one[k], want)
			}
		}
	}
}

// Weight shares the pattern of the counts and leaves their values alone, so
// that one Counts can be weighted again, in any weighting, with the same
// result as the first time (common practice, no outside source).
func TestWeightSharesPatternKeepsCounts(t *testing.T) {
	var b Builder
	b.AddRow(map[string]int{"a": 3, "b": 1})
	b.AddRow(map[string]int{"a": 1, "d": 4})
	b.AddRow(map[string]int{"a": 1, "b": 2, "c": 7})
	c, err := b.Build(Pruning{})
	if err != nil {
		t.Fatal(err)
	}
	raw := c.Matrix.RawMatrix()
	counts := append([]float64(nil), raw.Data...)
	first := append([]float64(nil), Weight(c, DefaultWeighting).RawMatrix().Data...)
	other := Weight(c, Weighting{TF: TFRaw, IDF: IDFNone, Norm: NormNone}).RawMatrix()
	if !slices.Equal(other.Data, counts) {
		t.Errorf("raw, unweighted values %v, want the counts %v", other.Data, counts)
	}
	if &other.Ind[0] != &raw.Ind[0] || &other.Indptr[0] != &raw.Indptr[0] {
		t.Error("the weighted matrix has its own copy of the pattern")
	}
	if !slices.Equal(raw.Data, counts) {
		t.Errorf("counts after weighting %v, want %v", raw.Data, counts)
	}
	if again := Weight(c, DefaultWeighting).RawMatrix().Data; !slices.Equal(again, first) {
		t.Errorf("second default weighting %v, want %v", again, first)
	}
}

// WeightInPlace gives Weight's values bit for bit, in every weighting,
// over the counts' own array, and takes the counts' matrix (common
// practice, no outside source: the same arithmetic in the same order).
func TestWeightInPlaceSameBits(t *testing.T) {
	b := randomCountsBuilder(rand.New(rand.NewPCG(15, 16)), 5000, 300)
	b.AddRow(map[string]int{"t1": 1}) // a row of one term
	for _, tf := range []TF{TFLog, TFRaw, TFBinary} {
		for _, idf := range []IDF{IDFSmooth, IDFPlain, IDFNone} {
			for _, norm := range []Norm{NormL2, NormL1, NormNone} {
				w := Weighting{TF: tf, IDF: idf, Norm: norm}
				c, err := b.Build(Pruning{})
				if err != nil {
					t.Fatal(err)
				}
				want := Weight(c, w).RawMatrix().Data
				counts := c.Matrix.RawMatrix().Data
				got := WeightInPlace(c, w)
				if c.Matrix != nil {
					t.Fatalf("%v: the counts still hold their matrix", w)
				}
				raw := got.RawMatrix()
				if &raw.Data[0] != &counts[0] {
					t.Fatalf("%v: weighted into a new array", w)
				}
				if !slices.Equal(raw.Data, want) {
					t.Fatalf("%v: in place differs from Weight", w)
				}
			}
		}
	}
}

// randomCountsBuilder returns a builder of rows documents, each of one to
// twelve of terms distinct terms with counts of one to five.
func randomCountsBuilder(r *rand.Rand, rows, terms int) *Builder {
	b := &Builder{}
	for range rows {
		row := map[string]int{}
		for range 1 + r.IntN(12) {
			row[fmt.Sprintf("t%d", r.IntN(terms))] = 1 + r.IntN(5)
		}
		b.AddRow(row)
	}
	return b
}
