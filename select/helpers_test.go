package selection

import (
	"encoding/json"
	"math"
	"math/rand/v2"
	"os"
	"sync"
	"testing"

	"github.com/james-bowman/sparse"
	"gonum.org/v1/gonum/mat"

	"assay/corpus"
	"assay/corpus/demo"
	"assay/sparsemat"
	"assay/textproc"
)

// Test helpers: matrix builders and dense gonum oracles. Nothing here
// calls the code under test except where a comment says so.

// eps is the spacing of float64 values at 1 (2⁻⁵²).
const eps = 0x1p-52

// randomCSR builds an m×n sparse matrix with about density·m·n entries
// uniform in (0, 1), from a seeded generator.
func randomCSR(m, n int, density float64, seed uint64) *sparse.CSR {
	rng := rand.New(rand.NewPCG(seed, 3))
	ia := []int{0}
	var ja []int
	var data []float64
	for range m {
		for j := range n {
			if rng.Float64() < density {
				ja = append(ja, j)
				data = append(data, rng.Float64()+0x1p-30) // never exactly zero
			}
		}
		ia = append(ia, len(ja))
	}
	return sparse.NewCSR(m, n, ia, ja, data)
}

// csrOf builds a CSR from a dense matrix, storing only the non-zeros.
func csrOf(d mat.Matrix) *sparse.CSR {
	m, n := d.Dims()
	ia := []int{0}
	var ja []int
	var data []float64
	for i := range m {
		for j := range n {
			if v := d.At(i, j); v != 0 {
				ja = append(ja, j)
				data = append(data, v)
			}
		}
		ia = append(ia, len(ja))
	}
	return sparse.NewCSR(m, n, ia, ja, data)
}

// denseOf returns a as a gonum Dense, element by element.
func denseOf(a *sparse.CSR) *mat.Dense {
	m, n := a.Dims()
	d := mat.NewDense(m, n, nil)
	raw := a.RawMatrix()
	for i := range m {
		for k := raw.Indptr[i]; k < raw.Indptr[i+1]; k++ {
			d.Set(i, raw.Ind[k], raw.Data[k])
		}
	}
	return d
}

// denseSVD is the thin SVD of x by gonum (LAPACK dgesvd), the oracle for
// every singular-value computation in these tests.
func denseSVD(t *testing.T, x mat.Matrix) (u *mat.Dense, s []float64, v *mat.Dense) {
	t.Helper()
	var svd mat.SVD
	if !svd.Factorize(x, mat.SVDThin) {
		t.Fatal("gonum SVD did not converge")
	}
	u, v = new(mat.Dense), new(mat.Dense)
	svd.UTo(u)
	svd.VTo(v)
	return u, svd.Values(nil), v
}

// numpyRankTol is the threshold numpy.linalg.matrix_rank uses by default:
// singular values at or below max(m, n)·ε·σ_max count as zero (numpy
// documentation of matrix_rank, from memory; the golden ranks confirm it).
func numpyRankTol(x mat.Matrix, s []float64) float64 {
	r, c := x.Dims()
	if len(s) == 0 {
		return 0
	}
	return float64(max(r, c)) * eps * s[0]
}

// denseRank is the numerical rank of x by the numpy matrix_rank rule.
func denseRank(t *testing.T, x mat.Matrix) int {
	t.Helper()
	_, s, _ := denseSVD(t, x)
	return rankOf(x, s)
}

// rankOf is the numerical rank of x, given its singular values s, by the
// numpy matrix_rank rule.
func rankOf(x mat.Matrix, s []float64) int {
	tol := numpyRankTol(x, s)
	rank := 0
	for _, v := range s {
		if v > tol {
			rank++
		}
	}
	return rank
}

// densePinv is the pseudo-inverse V·Σ⁺·Uᵀ from gonum's dense SVD, with
// the numpy matrix_rank threshold. It does not call Pinv.
func densePinv(t *testing.T, x mat.Matrix) *mat.Dense {
	t.Helper()
	r, c := x.Dims()
	u, s, v := denseSVD(t, x)
	tol := numpyRankTol(x, s)
	out := mat.NewDense(c, r, nil)
	for k, sv := range s {
		if sv <= tol || sv == 0 {
			break
		}
		var outer mat.Dense
		outer.Outer(1/sv, v.ColView(k), u.ColView(k))
		out.Add(out, &outer)
	}
	return out
}

// frob2 is ‖x‖_F² computed densely.
func frob2(x mat.Matrix) float64 {
	n := mat.Norm(x, 2)
	return n * n
}

// curDense is C·U·R as a dense m×n matrix.
func curDense(cur *CUR) *mat.Dense {
	var cu, out mat.Dense
	cu.Mul(cur.C, cur.U)
	out.Mul(&cu, cur.R)
	return &out
}

// errDense is ‖A − C·U·R‖_F² computed densely.
func errDense(a *mat.Dense, cur *CUR) float64 {
	var diff mat.Dense
	diff.Sub(a, curDense(cur))
	return frob2(&diff)
}

// bestErrDense is ‖A − A_k‖_F² from gonum's dense SVD: the sum of the
// squared singular values after the k-th (Eckart and Young, "The
// approximation of one matrix by another of lower rank", Psychometrika
// 1(3), 1936).
func bestErrDense(t *testing.T, a mat.Matrix, k int) float64 {
	t.Helper()
	_, s, _ := denseSVD(t, a)
	var e float64
	for _, v := range s[min(k, len(s)):] {
		e += v * v
	}
	return e
}

// bestRankK is the best rank-k approximation of x from gonum's dense SVD.
func bestRankK(t *testing.T, x mat.Matrix, k int) *mat.Dense {
	t.Helper()
	u, s, v := denseSVD(t, x)
	r, c := x.Dims()
	out := mat.NewDense(r, c, nil)
	for t := range min(k, len(s)) {
		var outer mat.Dense
		outer.Outer(s[t], u.ColView(t), v.ColView(t))
		out.Add(out, &outer)
	}
	return out
}

// exactSVD is the full exact SVD of a through sparsemat.TruncatedSVD: with
// Rank = min(m, n) ≤ sparsemat.ExactLimit it takes the exact Gram path.
func exactSVD(t *testing.T, a *sparse.CSR) *sparsemat.SVD {
	t.Helper()
	m, n := a.Dims()
	if min(m, n) > sparsemat.ExactLimit {
		t.Fatalf("%d×%d is beyond the exact SVD path", m, n)
	}
	svd, err := sparsemat.TruncatedSVD(a, sparsemat.SVDOptions{Rank: min(m, n)})
	if err != nil {
		t.Fatal(err)
	}
	if !svd.Exact {
		t.Fatal("TruncatedSVD did not take the exact path")
	}
	return svd
}

// indices returns the Index of every pick.
func indices(ps []Pick) []int {
	out := make([]int, len(ps))
	for i, p := range ps {
		out[i] = p.Index
	}
	return out
}

// linalgCase is one matrix of ../testdata/reference/linalg.golden.json,
// written by testdata/reference/gen_linalg.py with Debian python3-numpy
// 1.24.2.
type linalgCase struct {
	Name     string    `json:"name"`
	Rows     int       `json:"rows"`
	Cols     int       `json:"cols"`
	A        []float64 `json:"a"`
	Pinv     []float64 `json:"pinv"`
	Sing     []float64 `json:"singular_values"`
	Rank     int       `json:"rank"`
	Leverage []struct {
		K    int       `json:"k"`
		Rows []float64 `json:"rows"`
		Cols []float64 `json:"cols"`
	} `json:"leverage"`
}

func loadLinalg(t *testing.T) []linalgCase {
	t.Helper()
	raw, err := os.ReadFile("../testdata/reference/linalg.golden.json")
	if err != nil {
		t.Fatal(err)
	}
	var g struct {
		Matrices []linalgCase `json:"matrices"`
	}
	if err := json.Unmarshal(raw, &g); err != nil {
		t.Fatal(err)
	}
	if len(g.Matrices) == 0 {
		t.Fatal("no matrices in the golden file")
	}
	return g.Matrices
}

func (c linalgCase) dense() *mat.Dense {
	return mat.NewDense(c.Rows, c.Cols, append([]float64(nil), c.A...))
}

// demoMatrix is the TF-IDF matrix of the embedded demo corpus, built the
// way cmd/assay/analyze.go does with the default options (min-df 2 for a
// corpus of 20 documents or more, max-df 0.5, default weighting).
var demoMatrix = sync.OnceValues(func() (*sparse.CSR, error) {
	az := textproc.NewAnalyzer(textproc.Options{})
	var b sparsemat.Builder
	counts := make(map[string]int)
	_, err := corpus.Walk(demo.FS(), corpus.Options{}, func(d corpus.Document) error {
		clear(counts)
		az.Analyze(d.Text, func(stem, _ string) { counts[stem]++ })
		b.AddRow(counts)
		return nil
	})
	if err != nil {
		return nil, err
	}
	c, err := b.Build(sparsemat.Pruning{MinDF: 2, MaxDFShare: 0.5})
	if err != nil {
		return nil, err
	}
	return sparsemat.Weight(c, sparsemat.DefaultWeighting), nil
})

func loadDemo(t *testing.T) *sparse.CSR {
	t.Helper()
	a, err := demoMatrix()
	if err != nil {
		t.Fatal(err)
	}
	return a
}

// relDiff is |got − want| / max(|want|, floor).
func relDiff(got, want, floor float64) float64 {
	return math.Abs(got-want) / math.Max(math.Abs(want), floor)
}

// newRand is the seeded generator of the test fixtures.
func newRand(seed uint64) *rand.Rand { return rand.New(rand.NewPCG(seed, 0x7e57)) }

// fillNormal fills x with standard normals from rng, in row-major order.
func fillNormal(rng *rand.Rand, x *mat.Dense) {
	r, c := x.Dims()
	for i := range r {
		for j := range c {
			x.Set(i, j, rng.NormFloat64())
		}
	}
}
