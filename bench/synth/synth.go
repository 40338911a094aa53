// Package synth makes synthetic sparse matrices shaped like TF-IDF
// document-term matrices, for benchmarks at sizes that no test corpus
// reaches.
//
// # The distribution
//
// [Matrix] builds an m×n matrix, rows = documents, columns = terms. Every
// row holds exactly nnzPerRow distinct columns, drawn without replacement
// with weight
//
//	w(j) = (1 + j)^(−ZipfExponent),   j = 0 … n−1,
//
// so column 0 stands for the most common term and the document frequency
// falls with the column index, as word frequencies do. "Without
// replacement" means successive sampling: the first column of a row is
// drawn with probability w(j)/Σw, each next one from the columns not yet
// in the row, again in proportion to w. (In practice a Zipf draw is
// repeated until it gives a new column; when a row fills up so much that
// repeats dominate, the rest of the row is chosen by exponential keys —
// each free column j gets E_j/w(j) with E_j ~ Exp(1), the smallest keys
// win — which has exactly the same distribution.)
//
// Each chosen entry has a count c ≥ 1 from a geometric law,
//
//	P(c) = (1 − CountRatio) · CountRatio^(c−1)      (mean 1/(1 − CountRatio) ≈ 1.67),
//
// and the stored weight is the default TF-IDF of the project,
//
//	a(i, j) = (1 + ln c) · idf(j),   idf(j) = ln((1 + m) / (1 + df(j))) + 1,
//
// where df(j) is the number of rows that realised column j. Every row is
// then scaled to unit Euclidean length. Columns that no row drew stay
// empty.
//
// Because each row draws its columns without replacement, the heaviest
// columns are in almost every row (df close to m, idf close to 1), like
// stop words that were not pruned; the long tail is sparse.
//
// # Layout and determinism
//
// The CSR is built directly: column indices increase strictly within a
// row, there are no duplicates and no stored zeros. All randomness comes
// from one math/rand/v2 PCG stream seeded with the seed, consumed in row
// order, so the same arguments give a bit-identical matrix on any machine
// and for any GOMAXPROCS.
package synth

import (
	"fmt"
	"math"
	"math/rand/v2"
	"slices"

	"github.com/james-bowman/sparse"
)

// ZipfExponent is the exponent s of the column weights (1 + j)^(−s).
const ZipfExponent = 1.1

// CountRatio is the ratio q of the geometric count law P(c) = (1−q)·q^(c−1).
const CountRatio = 0.4

// stream is the PCG stream constant of this package's random source.
const stream = 0x73796e74685f7631

// Matrix returns an m×n TF-IDF-like CSR matrix with nnzPerRow stored
// entries in every row, drawn as the package documentation describes. It
// panics unless m ≥ 1, n ≥ 1 and 1 ≤ nnzPerRow ≤ n.
//
// Time is about linear in m·nnzPerRow while nnzPerRow is a small share of
// n (100000×50000 with 100 a row takes a few seconds); rows that take most
// of the columns fall back to an O(n log n) step per row.
func Matrix(m, n, nnzPerRow int, seed uint64) *sparse.CSR {
	if m < 1 || n < 1 || nnzPerRow < 1 || nnzPerRow > n {
		panic(fmt.Sprintf("synth: bad shape m=%d n=%d nnzPerRow=%d", m, n, nnzPerRow))
	}
	rng := rand.New(rand.NewPCG(seed, stream))
	var zipf *rand.Zipf
	if n > 1 {
		zipf = rand.NewZipf(rng, ZipfExponent, 1, uint64(n-1))
	}
	// A row gives up on repeated Zipf draws after this many repeats.
	budget := 8*nnzPerRow + 64

	nnz := m * nnzPerRow
	ia := make([]int, m+1)
	ja := make([]int, nnz)
	data := make([]float64, nnz)
	df := make([]int, n)
	seen := make([]int, n) // seen[j] == i+1: column j is in row i
	var keys []key

	for i := range m {
		cols := ja[i*nnzPerRow : i*nnzPerRow : (i+1)*nnzPerRow]
		repeats := 0
		for len(cols) < nnzPerRow && repeats <= budget {
			j := 0
			if zipf != nil {
				j = int(zipf.Uint64())
			}
			if seen[j] == i+1 {
				repeats++
				continue
			}
			seen[j] = i + 1
			cols = append(cols, j)
		}
		if len(cols) < nnzPerRow {
			keys = keys[:0]
			for j := range n {
				if seen[j] != i+1 {
					keys = append(keys, key{rng.ExpFloat64() * math.Pow(1+float64(j), ZipfExponent), j})
				}
			}
			slices.SortFunc(keys, func(x, y key) int {
				if c := cmpFloat(x.k, y.k); c != 0 {
					return c
				}
				return x.j - y.j
			})
			for _, kj := range keys[:nnzPerRow-len(cols)] {
				seen[kj.j] = i + 1
				cols = append(cols, kj.j)
			}
		}
		slices.Sort(cols)
		for p, j := range cols {
			c := 1
			for rng.Float64() < CountRatio {
				c++
			}
			data[i*nnzPerRow+p] = 1 + math.Log(float64(c))
			df[j]++
		}
		ia[i+1] = (i + 1) * nnzPerRow
	}

	idf := make([]float64, n)
	for j, d := range df {
		idf[j] = math.Log(float64(1+m)/float64(1+d)) + 1
	}
	for i := range m {
		row := data[ia[i]:ia[i+1]]
		var s float64
		for p, j := range ja[ia[i]:ia[i+1]] {
			row[p] *= idf[j]
			s += row[p] * row[p]
		}
		inv := 1 / math.Sqrt(s)
		for p := range row {
			row[p] *= inv
		}
	}
	return sparse.NewCSR(m, n, ia, ja, data)
}

// key is a column with its exponential key.
type key struct {
	k float64
	j int
}

func cmpFloat(a, b float64) int {
	switch {
	case a < b:
		return -1
	case a > b:
		return 1
	}
	return 0
}
