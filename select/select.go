package selection

import (
	"errors"
	"fmt"
	"math/rand/v2"
	"slices"

	"github.com/james-bowman/sparse"
	"gonum.org/v1/gonum/mat"

	"assay/sparsemat"
)

// Method names a way of choosing rows and columns.
type Method string

// The methods. See the package documentation for each.
const (
	MethodNorm     Method = "norm"     // squared-norm sampling with replacement
	MethodLeverage Method = "leverage" // rank-k leverage-score sampling with replacement
	MethodTop      Method = "top"      // the largest rank-k leverage scores
	MethodPivot    Method = "pivot"    // sketch, then LU with partial pivoting
	MethodGreedy   Method = "greedy"   // greedy growth of the captured share
)

// Methods lists every method, in the order help texts show them.
var Methods = []Method{MethodGreedy, MethodPivot, MethodTop, MethodLeverage, MethodNorm}

// Core names a way of computing U.
type Core string

// The cores.
const (
	CoreOptimal      Core = "optimal"      // U = C⁺·A·R⁺
	CoreIntersection Core = "intersection" // U = W⁺
)

// Options configures [Select].
type Options struct {
	// Method chooses the rows and columns; "" means MethodGreedy.
	Method Method
	// Rows is the number r of row draws or picks (documents); Cols the
	// number c of column draws or picks (terms). Both at least 1.
	Rows, Cols int
	// Rank is k, the rank of the leverage scores (leverage, top).
	Rank int
	// Seed drives every random choice.
	Seed uint64
	// Core chooses U; "" means CoreOptimal.
	Core Core
	// CoreRank, when positive, truncates the optimal core to that rank
	// (the best rank-CoreRank approximation of Q_Cᵀ·A·Q_R).
	CoreRank int
	// SVD holds leading singular triplets of A: at least Rank of them for
	// leverage and top; greedy uses all it holds as its proxy. Not needed
	// by norm and pivot. Select only reads it, and holds no reference to
	// it once the picks are made.
	SVD *sparsemat.SVD
	// PowerIters is the number of power iterations of the pivot sketch.
	PowerIters int
	// MaxCosine, when positive, keeps any two picked rows below this
	// cosine: greedy rules out every near-copy of a pick as it goes; the
	// other methods drop, in pick order, a pick too close to an earlier
	// one (so they may return fewer rows).
	MaxCosine float64
	// ProxyRank, when positive, limits greedy's proxy of A to the first
	// ProxyRank singular triplets of SVD (fewer triplets: faster steps).
	ProxyRank int
}

// CUR is a decomposition A ≈ C·U·R made of actual columns and rows of A.
type CUR struct {
	Method Method
	Core   Core
	// Rows are the picked rows (R) and Cols the picked columns (C), in the
	// order chosen.
	Rows, Cols []Pick
	// C is m×len(Cols): the picked columns of A, each times its Weight.
	C *mat.Dense
	// R is len(Rows)×n: the picked rows of A, each times its Weight.
	R *mat.Dense
	// U is len(Cols)×len(Rows).
	U *mat.Dense
	// CoreRank is the rank of the core: of W for the intersection core, of
	// the (possibly truncated) projected core for the optimal one.
	CoreRank int

	// projected holds ‖Q_Cᵀ·A·Q_R‖² (after truncation) for the optimal
	// core, which gives the exact error; 0 for the intersection core.
	projected float64
	// qr is an orthonormal basis of the span of the picked rows (n×·).
	qr *mat.Dense
	// rowSpace caches ‖A·Q_R‖² once computed (negative: not yet).
	rowSpace float64
}

// Select picks rows and columns of a by opts.Method and computes U by
// opts.Core. It returns an error for an empty or all-zero matrix, bad
// counts, an unknown method or core, or a missing SVD.
func Select(a *sparse.CSR, opts Options) (*CUR, error) {
	if opts.Method == "" {
		opts.Method = MethodGreedy
	}
	if opts.Core == "" {
		opts.Core = CoreOptimal
	}
	m, n := a.Dims()
	switch {
	case m == 0 || n == 0:
		return nil, errors.New("the matrix is empty")
	case opts.Rows < 1 || opts.Cols < 1:
		return nil, fmt.Errorf("need at least one row and one column (got %d and %d)", opts.Rows, opts.Cols)
	case sparsemat.FrobeniusSq(a) == 0:
		return nil, errors.New("the matrix is all zeros")
	case opts.Core != CoreOptimal && opts.Core != CoreIntersection:
		return nil, fmt.Errorf("unknown core %q (allowed: optimal, intersection)", opts.Core)
	}
	needSVD := opts.Method == MethodLeverage || opts.Method == MethodTop || opts.Method == MethodGreedy
	if needSVD {
		if opts.SVD == nil {
			return nil, fmt.Errorf("method %s needs the leading singular vectors", opts.Method)
		}
		if opts.Method != MethodGreedy && (opts.Rank < 1 || opts.Rank > len(opts.SVD.Values)) {
			return nil, fmt.Errorf("method %s: rank %d outside 1…%d", opts.Method, opts.Rank, len(opts.SVD.Values))
		}
	}
	colRng := rand.New(rand.NewPCG(opts.Seed, streamCols))
	rowRng := rand.New(rand.NewPCG(opts.Seed, streamRows))
	var rows, cols []Pick
	var err error
	switch opts.Method {
	case MethodNorm:
		if cols, err = Draw(colRng, sparsemat.ColSqNorms(a), opts.Cols); err == nil {
			rows, err = Draw(rowRng, sparsemat.RowSqNorms(a), opts.Rows)
		}
	case MethodLeverage:
		if cols, err = Draw(colRng, sparsemat.Leverage(opts.SVD.V, opts.Rank), opts.Cols); err == nil {
			rows, err = Draw(rowRng, sparsemat.Leverage(opts.SVD.U, opts.Rank), opts.Rows)
		}
	case MethodTop:
		cols = largest(sparsemat.Leverage(opts.SVD.V, opts.Rank), opts.Cols)
		rows = largest(sparsemat.Leverage(opts.SVD.U, opts.Rank), opts.Rows)
	case MethodPivot:
		cols, rows = pivotPicks(a, opts.Cols, opts.Rows, opts.PowerIters, colRng, rowRng)
	case MethodGreedy:
		proxy := opts.SVD
		if l := opts.ProxyRank; l > 0 && l < len(proxy.Values) {
			proxy = &sparsemat.SVD{
				Values: proxy.Values[:l],
				U:      proxy.U.Slice(0, proxy.U.RawMatrix().Rows, 0, l).(*mat.Dense),
				V:      proxy.V.Slice(0, proxy.V.RawMatrix().Rows, 0, l).(*mat.Dense),
				Exact:  proxy.Exact,
			}
		}
		rows = greedyRows(a, proxy, opts.Rows, opts.MaxCosine)
		cols = greedyCols(a, proxy, opts.Cols)
	default:
		return nil, fmt.Errorf("unknown method %q", opts.Method)
	}
	if err != nil {
		return nil, err
	}
	// The singular vectors are not needed past this point; dropping this
	// reference lets a caller that kept none free them before the core is
	// built (on a 100,000-document corpus they are as large as C and R).
	opts.SVD = nil
	if opts.MaxCosine > 0 && opts.Method != MethodGreedy {
		rows = dropNear(a, rows, opts.MaxCosine)
	}
	return Rebuild(a, opts.Method, rows, cols, opts.Core, opts.CoreRank), nil
}

// Rebuild returns the CUR of a made of the given picks (Index values are
// rows and columns of a), with the core computed as [Select] computes it.
// It lets picks made on one matrix (say, with near-copies merged) be
// measured on another with the same columns (the matrix they stand for).
func Rebuild(a *sparse.CSR, method Method, rows, cols []Pick, core Core, coreRank int) *CUR {
	if core == "" {
		core = CoreOptimal
	}
	cur := &CUR{Method: method, Core: core, Rows: rows, Cols: cols, rowSpace: -1}
	cur.C = pickedCols(a, cols)
	cur.R = pickedRows(a, rows)
	if core == CoreIntersection {
		cur.U, cur.CoreRank = Pinv(intersection(cur.C, rows))
	} else {
		optimalCore(a, cur, coreRank)
	}
	return cur
}

// ReferenceRank is the number of singular triplets to compute for a run
// with rank k and r row and c column picks: K = max(k, r, c) plus
// min(K, 20) more. The extra triplets sharpen the randomized values the
// figures use (SpamAssassin corpus, r = c = k = 20: best 20-document share
// 0.1554 with 20 triplets, 0.1569 with 40) and give greedy a better proxy
// of A (η_docs 0.610 → 0.655 there); past 20 extra they cost time (on a
// 100,000×50,000 matrix at K = 50, the SVD takes 5.7 s with 50 extra)
// for little gain.
func ReferenceRank(k, r, c int) int {
	K := max(k, r, c)
	return K + min(K, 20)
}

// Random streams: columns and rows are drawn from independent streams of
// the same seed, so changing r does not change the column picks.
const (
	streamCols = 0xc01
	streamRows = 0x20f
)

// largest returns the count indices with the largest scores (ties: the
// smaller index), in decreasing score order, each with weight 1. Indices
// of score zero are not picked.
func largest(scores []float64, count int) []Pick {
	idx := make([]int, len(scores))
	for i := range idx {
		idx[i] = i
	}
	slices.SortStableFunc(idx, func(a, b int) int {
		switch {
		case scores[a] > scores[b]:
			return -1
		case scores[a] < scores[b]:
			return 1
		}
		return 0
	})
	var out []Pick
	for _, i := range idx[:min(count, len(idx))] {
		if scores[i] <= 0 {
			break
		}
		out = append(out, Pick{Index: i, Order: len(out), Count: 1, Score: scores[i], Weight: 1})
	}
	return out
}
