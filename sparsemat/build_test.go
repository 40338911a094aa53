package sparsemat

import (
	"errors"
	"fmt"
	"math/rand/v2"
	"slices"
	"testing"
)

func TestBuildPrunesAndOrders(t *testing.T) {
	var b Builder
	docs := []map[string]int{
		{"river": 2, "flood": 1, "gauge": 1},
		{"river": 1, "otter": 3},
		{"zzz": 1}, // only a term that min-df removes
		{"river": 1, "flood": 4, "otter": 1},
	}
	for _, d := range docs {
		b.AddRow(d)
	}
	// df: river 3, flood 2, otter 2, gauge 1, zzz 1. With MinDF 2 and
	// MaxDFShare 0.5 (at most floor(0.5·4) = 2 documents, the rule
	// scikit-learn's max_df uses), only flood and otter survive.
	c, err := b.Build(Pruning{MinDF: 2, MaxDFShare: 0.5})
	if err != nil {
		t.Fatal(err)
	}
	if want := []string{"flood", "otter"}; !slices.Equal(c.Terms, want) {
		t.Fatalf("terms %v, want %v (byte order)", c.Terms, want)
	}
	if want := []int{2, 2}; !slices.Equal(c.DF, want) {
		t.Fatalf("df %v, want %v", c.DF, want)
	}
	for j, id := range c.IDs {
		if got := b.Vocabulary().Term(id); got != c.Terms[j] {
			t.Fatalf("IDs[%d] = %d, the vocabulary's %q, want the ID of %q", j, id, got, c.Terms[j])
		}
	}
	if len(c.IDs) != len(c.Terms) {
		t.Fatalf("%d IDs for %d terms", len(c.IDs), len(c.Terms))
	}
	// Documents 0, 1 and 3 keep a term; document 2 keeps none.
	if want := []int{0, 1, 3}; !slices.Equal(c.Rows, want) {
		t.Fatalf("rows %v, want %v", c.Rows, want)
	}
	if want := []int{2}; !slices.Equal(c.EmptyRows, want) {
		t.Fatalf("empty rows %v, want %v", c.EmptyRows, want)
	}
	if c.VocabularySize != 5 || c.Documents != 4 {
		t.Fatalf("vocabulary %d documents %d, want 5 and 4", c.VocabularySize, c.Documents)
	}
	checkCSR(t, c.Matrix)
	want := [][]float64{{1, 0}, {0, 3}, {4, 1}}
	for i, row := range want {
		for j, v := range row {
			if got := c.Matrix.At(i, j); got != v {
				t.Errorf("count (%d,%d) = %g, want %g", i, j, got, v)
			}
		}
	}
}

func TestBuildNoTerms(t *testing.T) {
	var b Builder
	b.AddRow(map[string]int{"a": 1})
	b.AddRow(map[string]int{"b": 1})
	if _, err := b.Build(Pruning{MinDF: 2}); !errors.Is(err, ErrNoTerms) {
		t.Fatalf("err = %v, want ErrNoTerms", err)
	}
	var empty Builder
	if _, err := empty.Build(Pruning{}); !errors.Is(err, ErrNoTerms) {
		t.Fatalf("empty builder: err = %v, want ErrNoTerms", err)
	}
}

func TestBuildRejectsBadPruning(t *testing.T) {
	var b Builder
	b.AddRow(map[string]int{"a": 1})
	for _, p := range []Pruning{{MaxDFShare: 1.5}, {MaxDFShare: -0.1}, {MinDF: -1}} {
		if _, err := b.Build(p); err == nil {
			t.Errorf("Build(%+v) gave no error", p)
		}
	}
}

// The column order must not depend on the order terms were first seen.
func TestBuildIndependentOfInsertionOrder(t *testing.T) {
	var b1, b2 Builder
	b1.AddRow(map[string]int{"b": 1, "a": 2})
	b1.AddRow(map[string]int{"c": 1})
	b2.AddRow(map[string]int{"c": 5})
	b2.AddRow(map[string]int{"a": 2, "b": 1})
	c1, _ := b1.Build(Pruning{})
	c2, _ := b2.Build(Pruning{})
	if !slices.Equal(c1.Terms, c2.Terms) {
		t.Fatalf("terms %v vs %v", c1.Terms, c2.Terms)
	}
	if c1.Matrix.At(0, 0) != 2 || c2.Matrix.At(1, 0) != 2 {
		t.Fatal("the count of a is not in column 0")
	}
}

// Build against the matrix computed straight from its definition (df by
// counting documents, kept terms in byte order, each row's kept counts),
// with pruning that drops no entry, a few (the one-pass fill that moves
// rows up over gaps) and many (the fill after a counting pass). Common
// practice, no outside source.
func TestBuildMatchesDirectCount(t *testing.T) {
	r := rand.New(rand.NewPCG(3, 9))
	docs := make([]map[string]int, 3000)
	for i := range docs {
		d := map[string]int{}
		for range 1 + r.IntN(40) {
			// Frequent terms, a common one, and terms of one document.
			switch x := r.IntN(100); {
			case x < 2:
				d[fmt.Sprintf("once%d-%d", i, x)]++
			case x < 10:
				d["common"] += 1 + r.IntN(3)
			default:
				d[fmt.Sprintf("w%d", r.IntN(400))]++
			}
		}
		if i%97 == 0 {
			d = map[string]int{fmt.Sprintf("alone%d", i): 2} // a row that min-df empties
		}
		docs[i] = d
	}
	var b Builder
	for _, d := range docs {
		b.AddRow(d)
	}
	for _, tc := range []struct {
		name   string
		p      Pruning
		lo, hi float64 // share of the entries pruning drops
	}{
		{"none", Pruning{}, 0, 0},
		{"few", Pruning{MinDF: 2}, 1e-6, 1.0 / pruneGapShare},
		{"many", Pruning{MinDF: 2, MaxDFShare: 0.045}, 1.0 / pruneGapShare, 1},
	} {
		t.Run(tc.name, func(t *testing.T) {
			df := map[string]int{}
			total := 0
			for _, d := range docs {
				for term := range d {
					df[term]++
					total++
				}
			}
			maxDF := len(docs)
			if tc.p.MaxDFShare > 0 {
				maxDF = int(tc.p.MaxDFShare * float64(len(docs)))
			}
			var terms []string
			for term, n := range df {
				if n >= tc.p.MinDF && n <= maxDF {
					terms = append(terms, term)
				}
			}
			slices.Sort(terms)
			col := map[string]int{}
			kept := 0
			for j, term := range terms {
				col[term] = j
				kept += df[term]
			}
			if share := float64(total-kept) / float64(total); share < tc.lo || share > tc.hi {
				t.Fatalf("pruning drops %.4f of the entries, outside [%g, %g]: the case does not test what it says", share, tc.lo, tc.hi)
			}
			c, err := b.Build(tc.p)
			if err != nil {
				t.Fatal(err)
			}
			if !slices.Equal(c.Terms, terms) {
				t.Fatalf("%d terms, want %d", len(c.Terms), len(terms))
			}
			checkCSR(t, c.Matrix)
			raw := c.Matrix.RawMatrix()
			var rows, empty, ia, ja []int
			var data []float64
			ia = append(ia, 0)
			for i, d := range docs {
				var js []int
				for term := range d {
					if j, ok := col[term]; ok {
						js = append(js, j)
					}
				}
				if len(js) == 0 {
					empty = append(empty, i)
					continue
				}
				slices.Sort(js)
				for _, j := range js {
					ja = append(ja, j)
					data = append(data, float64(d[terms[j]]))
				}
				ia = append(ia, len(ja))
				rows = append(rows, i)
			}
			if !slices.Equal(c.Rows, rows) || !slices.Equal(c.EmptyRows, empty) {
				t.Fatalf("rows %d, empty %v; want %d, %v", len(c.Rows), c.EmptyRows, len(rows), empty)
			}
			if !slices.Equal(raw.Indptr, ia) || !slices.Equal(raw.Ind, ja) || !slices.Equal(raw.Data, data) {
				t.Fatal("the matrix differs from the direct count")
			}
		})
	}
}
