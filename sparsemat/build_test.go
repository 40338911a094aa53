package sparsemat

import (
	"errors"
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
