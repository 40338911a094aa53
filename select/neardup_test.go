package selection

import (
	"math"
	"math/rand/v2"
	"runtime"
	"slices"
	"testing"

	"github.com/james-bowman/sparse"
)

// shingleSet returns a set of n item hashes drawn from a seeded stream.
func shingleSet(rng *rand.Rand, n int) []uint64 {
	out := make([]uint64, n)
	for i := range out {
		out[i] = rng.Uint64()
	}
	return out
}

// MinHash estimates Jaccard similarity: over pairs of sets with known
// overlap, the estimate stays within 4 standard errors √(J(1−J)/128) of
// the exact Jaccard (Broder 1997: each place agrees with probability J, so
// the share of agreeing places is a binomial mean; 4 standard errors fail
// with probability about 6e-5 a pair, and the seeds are fixed), and the
// mean error over all pairs is near zero (unbiased).
func TestMinHashEstimatesJaccard(t *testing.T) {
	rng := rand.New(rand.NewPCG(5, 6))
	var sumErr float64
	pairs := 0
	for _, shared := range []int{0, 50, 100, 200, 300, 380, 400} {
		for rep := range 10 {
			common := shingleSet(rng, shared)
			a := append(append([]uint64{}, common...), shingleSet(rng, 400-shared)...)
			b := append(append([]uint64{}, common...), shingleSet(rng, 400-shared)...)
			exact := float64(shared) / float64(800-shared)
			sig := make([]uint32, 2*MinHashes)
			MinHash(sig[:MinHashes], a, uint64(rep))
			MinHash(sig[MinHashes:], b, uint64(rep))
			est := EstimateJaccard(sig, 0, 1)
			se := math.Sqrt(exact * (1 - exact) / MinHashes)
			if math.Abs(est-exact) > 4*se+1e-12 {
				t.Errorf("shared %d: estimate %.3f, exact %.3f (4 standard errors %.3f)", shared, est, exact, 4*se)
			}
			sumErr += est - exact
			pairs++
		}
	}
	if mean := sumErr / float64(pairs); math.Abs(mean) > 0.02 {
		t.Errorf("mean estimation error %.4f: biased", mean)
	}
}

// rowsCSR builds a CSR from dense rows (zeros left out).
func rowsCSR(rows [][]float64) *sparse.CSR {
	ia := []int{0}
	var ja []int
	var data []float64
	for _, r := range rows {
		for j, v := range r {
			if v != 0 {
				ja = append(ja, j)
				data = append(data, v)
			}
		}
		ia = append(ia, len(ja))
	}
	return sparse.NewCSR(len(rows), len(rows[0]), ia, ja, data)
}

// NearDuplicates joins rows that are candidates by their signatures and
// close by cosine, and only those: identical signatures with a cosine
// below the threshold stay apart (two texts that look alike only after
// pruning), and close rows with unrelated signatures are not compared.
func TestNearDuplicatesNeedsBoth(t *testing.T) {
	a := rowsCSR([][]float64{
		{1, 1, 0, 0, 0},    // 0
		{1, 1, 0.05, 0, 0}, // 1: cosine 0.999 with 0
		{0, 0, 1, 1, 0},    // 2
		{0, 0, 1, 0, 1},    // 3: cosine 0.5 with 2
		{0, 0, 0, 1, 1},    // 4: cosine 0.5 with 2
	})
	rng := rand.New(rand.NewPCG(1, 2))
	same := shingleSet(rng, 50)
	sig := make([]uint32, 5*MinHashes)
	MinHash(sig[0*MinHashes:1*MinHashes], same, 1)
	MinHash(sig[1*MinHashes:2*MinHashes], same, 1)
	MinHash(sig[2*MinHashes:3*MinHashes], same, 1) // same shingles as 3, low cosine
	MinHash(sig[3*MinHashes:4*MinHashes], same, 1)
	MinHash(sig[4*MinHashes:5*MinHashes], shingleSet(rng, 50), 1)
	got := NearDuplicates(a, sig, 0.9)
	if len(got) != 1 || len(got[0]) != 2 || got[0][0] != 0 || got[0][1] != 1 {
		t.Fatalf("clusters %v, want [[0 1]]", got)
	}
}

// MaxCosine: greedy never picks two rows at or above the threshold, on a
// matrix of planted near-copies (each base row copied four times with small
// noise); and without it, it can.
func TestGreedyMaxCosine(t *testing.T) {
	rng := rand.New(rand.NewPCG(9, 9))
	var rows [][]float64
	for base := range 6 {
		b := make([]float64, 40)
		for j := range b {
			if rng.Float64() < 0.3 {
				b[j] = rng.Float64()
			}
		}
		b[base] = 2 // keep the bases apart
		for range 4 {
			r := append([]float64(nil), b...)
			for j := range r {
				if r[j] != 0 {
					r[j] *= 1 + 0.02*rng.NormFloat64()
				}
			}
			rows = append(rows, r)
		}
	}
	a := rowsCSR(rows)
	svd := exactSVD(t, a)
	cur, err := Select(a, Options{Method: MethodGreedy, Rows: 6, Cols: 6, SVD: svd, MaxCosine: 0.9})
	if err != nil {
		t.Fatal(err)
	}
	idx := indices(cur.Rows)
	if c, i, j := MaxPairCosine(a, idx); c >= 0.9 {
		t.Errorf("picks %d and %d have cosine %.3f ≥ 0.9", i, j, c)
	}
	if len(idx) != 6 {
		t.Errorf("%d picks, want one of each of the 6 bases", len(idx))
	}
	for _, m := range []Method{MethodNorm, MethodTop} {
		cur, err := Select(a, Options{Method: m, Rows: 12, Cols: 6, Rank: 6, SVD: svd, MaxCosine: 0.9, Seed: 3})
		if err != nil {
			t.Fatal(err)
		}
		if c, i, j := MaxPairCosine(a, indices(cur.Rows)); c >= 0.9 {
			t.Errorf("%s: picks %d and %d have cosine %.3f ≥ 0.9", m, i, j, c)
		}
	}
}

// nearDuplicatesByMaps is NearDuplicates with its buckets gathered in maps,
// band after band in first-seen order: the plain reading of the bucketing
// that the sorted version replaces. Common practice, no outside source: a
// second, simpler implementation of the same definition.
func nearDuplicatesByMaps(a *sparse.CSR, sig []uint32, threshold float64) [][]int {
	m, _ := a.Dims()
	norms := rowNorms(a)
	parent := make([]int, m)
	for i := range parent {
		parent[i] = i
	}
	find := func(x int) int {
		for parent[x] != x {
			x = parent[x]
		}
		return x
	}
	raw := a.RawMatrix()
	checked := map[[2]int]bool{}
	try := func(x, y int) {
		if checked[[2]int{x, y}] {
			return
		}
		checked[[2]int{x, y}] = true
		if EstimateJaccard(sig, x, y) >= minCandidateJaccard && rowDot(raw.Indptr, raw.Ind, raw.Data, x, y)/(norms[x]*norms[y]) >= threshold {
			rx, ry := find(x), find(y)
			parent[max(rx, ry)] = min(rx, ry)
		}
	}
	for band := range MinHashBands {
		buckets := map[uint64][]int{}
		var order []uint64
		for i := range m {
			if norms[i] == 0 {
				continue
			}
			key := bandKey(sig[i*MinHashes+band*MinHashRows : i*MinHashes+(band+1)*MinHashRows])
			if _, ok := buckets[key]; !ok {
				order = append(order, key)
			}
			buckets[key] = append(buckets[key], i)
		}
		for _, key := range order {
			rows := buckets[key]
			for t := 1; t < len(rows); t++ {
				try(rows[0], rows[t])
				if t > 1 {
					try(rows[t-1], rows[t])
				}
			}
		}
	}
	groups := map[int][]int{}
	for i := range m {
		groups[find(i)] = append(groups[find(i)], i)
	}
	var out [][]int
	for i := range m {
		if g := groups[i]; len(g) > 1 {
			out = append(out, g)
		}
	}
	return out
}

// The sorted buckets give the clusters the map-based ones give, on rows
// whose band values come from a small alphabet (so that buckets are large
// and hold unrelated rows), with rows of zero norm among them and rows
// planted as noisy copies of others. Run on one core and on several, with
// more rows than one block of the key pass.
func TestNearDuplicatesMatchesMapBuckets(t *testing.T) {
	rng := rand.New(rand.NewPCG(7, 8))
	const m, n = 20000, 40
	rows := make([][]float64, m)
	sig := make([]uint32, m*MinHashes)
	for i := range rows {
		rows[i] = make([]float64, n)
		switch {
		case i%11 == 5: // zero norm: never in a cluster
		case i%7 == 3 && i > 100: // a noisy copy of an earlier row and its signature
			src := rng.IntN(i)
			copy(rows[i], rows[src])
			rows[i][rng.IntN(n)] += rng.Float64()
			copy(sig[i*MinHashes:(i+1)*MinHashes], sig[src*MinHashes:(src+1)*MinHashes])
			sig[i*MinHashes+rng.IntN(MinHashes)] ^= 1
			continue
		default:
			for k := 0; k < 6; k++ {
				rows[i][rng.IntN(n)] = 1 + rng.Float64()
			}
		}
		for k := range MinHashes {
			sig[i*MinHashes+k] = uint32(rng.IntN(3)) // 81 values a band: large buckets
		}
	}
	a := rowsCSR(rows)
	want := nearDuplicatesByMaps(a, sig, 0.8)
	if len(want) < 100 {
		t.Fatalf("only %d clusters in the reference: the test data plants too few", len(want))
	}
	for _, procs := range []int{1, 4} {
		prev := runtime.GOMAXPROCS(procs)
		got := NearDuplicates(a, sig, 0.8)
		runtime.GOMAXPROCS(prev)
		if !slices.EqualFunc(got, want, slices.Equal[[]int]) {
			t.Fatalf("GOMAXPROCS=%d: %d clusters, want %d (first %v, want %v)", procs, len(got), len(want), got[:min(3, len(got))], want[:min(3, len(want))])
		}
	}
}
