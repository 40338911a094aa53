package selection

import (
	"math"
	"testing"

	"github.com/james-bowman/sparse"

	"assay/sparsemat"
)

// guaranteeSeeds is the number of independent runs per matrix.
const guaranteeSeeds = 200

// guaranteeShare is the least share of runs that must meet the bound. The
// relative-error theorem holds with probability at least 1 − δ for a δ its
// constants fix; 0.98 leaves room for the simplified constant while still
// failing a sampler or core that is broken (one that meets the bound in
// 196 runs of 200 or fewer).
const guaranteeShare = 0.98

// plantedMatrix is a 300×200 sparse matrix with a planted rank-10 signal
// plus noise: each of 10 topics owns a random set of 30 columns with
// positive loadings; every row takes one or two topics at random, topic t
// with weight about 10·0.8^t; independent standard normal noise sits on
// 10% of the entries, enough that it, and not only the topics after the
// fifth, makes up ‖A − A_5‖.
func plantedMatrix() *sparse.CSR {
	const m, n, topics = 300, 200, 10
	rng := newRand(2008)
	load := make([][]float64, topics) // topic -> column loadings (n)
	for t := range topics {
		load[t] = make([]float64, n)
		for _, j := range rng.Perm(n)[:30] {
			load[t][j] = 0.5 + rng.Float64()
		}
	}
	dense := make([]float64, m*n)
	for i := range m {
		for range 1 + rng.IntN(2) {
			t := rng.IntN(topics)
			w := 10 * math.Pow(0.8, float64(t)) * (0.5 + rng.Float64())
			for j, l := range load[t] {
				dense[i*n+j] += w * l
			}
		}
		for j := range n {
			if rng.Float64() < 0.1 {
				dense[i*n+j] += rng.NormFloat64()
			}
		}
	}
	ia := []int{0}
	var ja []int
	var data []float64
	for i := range m {
		for j := range n {
			if v := dense[i*n+j]; v != 0 {
				ja = append(ja, j)
				data = append(data, v)
			}
		}
		ia = append(ia, len(ja))
	}
	return sparse.NewCSR(m, n, ia, ja, data)
}

// TestRelativeErrorGuarantee: with c = r = ⌈k·ln k/ε²⌉ columns and rows
// drawn by rank-k leverage scores and the optimal core, the CUR satisfies
// ‖A − CUR‖_F ≤ (2 + ε)·‖A − A_k‖_F with high probability — the simplified
// statement with constant 1 in the sample sizes, as commonly taught; the
// full theorem, with its constants, is in Drineas, Mahoney and
// Muthukrishnan, "Relative-error CUR matrix decompositions", SIAM J.
// Matrix Anal. Appl. 30(2), 2008. Over 200 seeds, on the planted matrix and
// on the demo TF-IDF matrix (k = 5, ε = 0.5, so c = r = 33), at least 98%
// of the runs must meet the bound. A_k comes from the exact SVD
// (sparsemat.TruncatedSVD's Gram path), cross-checked against gonum's
// dense SVD.
func TestRelativeErrorGuarantee(t *testing.T) {
	const k, epsilon = 5, 0.5
	for _, f := range []struct {
		name string
		a    func(t *testing.T) *sparse.CSR
	}{
		{"planted-300x200", func(*testing.T) *sparse.CSR { return plantedMatrix() }},
		{"demo", loadDemo},
	} {
		t.Run(f.name, func(t *testing.T) {
			a := f.a(t)
			m, n := a.Dims()
			c := int(math.Ceil(k * math.Log(k) / (epsilon * epsilon)))
			cols, rows := min(c, n), min(c, m)
			svd, err := sparsemat.TruncatedSVD(a, sparsemat.SVDOptions{Rank: k})
			if err != nil {
				t.Fatal(err)
			}
			if !svd.Exact {
				t.Fatal("the SVD did not take the exact path")
			}
			fro := sparsemat.FrobeniusSq(a)
			bestErr := fro
			for _, s := range svd.Values {
				bestErr -= s * s
			}
			if dense := bestErrDense(t, denseOf(a), k); math.Abs(bestErr-dense) > tolErrSq*fro {
				t.Fatalf("‖A − A_k‖² %.15g from the Gram SVD, %.15g from gonum", bestErr, dense)
			}
			bound := (2 + epsilon) * math.Sqrt(bestErr)
			met := 0
			var sum, worst float64
			for seed := range uint64(guaranteeSeeds) {
				cur, err := Select(a, Options{Method: MethodLeverage, Rank: k, Rows: rows, Cols: cols, Seed: seed, SVD: svd})
				if err != nil {
					t.Fatal(err)
				}
				e := math.Sqrt(ErrorSq(a, cur))
				if e <= bound {
					met++
				}
				ratio := e / math.Sqrt(bestErr)
				sum += ratio
				worst = math.Max(worst, ratio)
			}
			share := float64(met) / guaranteeSeeds
			t.Logf("c = r = %d/%d, k = %d, ε = %g: %d of %d runs meet ‖A−CUR‖ ≤ (2+ε)‖A−A_k‖ (share %.3f); ratio ‖A−CUR‖/‖A−A_k‖ mean %.3f, worst %.3f",
				cols, rows, k, epsilon, met, guaranteeSeeds, share, sum/guaranteeSeeds, worst)
			if share < guaranteeShare {
				t.Errorf("share %.3f of runs meet the bound, want at least %g", share, guaranteeShare)
			}
		})
	}
}
