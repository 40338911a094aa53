// Command scale times the whole selection on a large synthetic matrix and
// reports peak memory against the size of the CSR itself.
//
//	go run ./bench/scale [-m 100000] [-n 50000] [-nnz 100] [-k 50] [-method greedy] [-runs 3]
//
// For each run it times, separately: the reference SVD (randomized, the
// rank the command line would use for the method), the picks, the optimal
// core and the exact error, and the figures. It prints the median of the
// runs and the peak resident memory (VmHWM from /proc/self/status) beside
// the CSR's own bytes (indptr, indices and values).
package main

import (
	"flag"
	"fmt"
	"os"
	"runtime"
	"runtime/debug"
	"runtime/pprof"
	"slices"
	"strings"
	"time"

	"github.com/james-bowman/sparse"

	"assay/bench/synth"
	selection "assay/select"
	"assay/sparsemat"
)

func main() {
	m := flag.Int("m", 100000, "documents (rows)")
	n := flag.Int("n", 50000, "terms (columns)")
	nnz := flag.Int("nnz", 100, "non-zeros per row")
	k := flag.Int("k", 50, "rank k; r = c = k picks")
	method := flag.String("method", "greedy", "selection method")
	runs := flag.Int("runs", 3, "timed runs (the median is reported)")
	power := flag.Int("power-iters", sparsemat.DefaultPowerIters, "power iterations")
	profile := flag.String("cpuprofile", "", "write a CPU profile of the timed runs to this file")
	nearDup := flag.Bool("neardup", false, "also time the near-copy search: MinHash signatures of each row's column set and NearDuplicates at cosine 0.9")
	flag.Parse()

	t0 := time.Now()
	a := synth.Matrix(*m, *n, *nnz, 1)
	gen := time.Since(t0)
	raw := a.RawMatrix()
	csrBytes := int64(len(raw.Indptr))*8 + int64(len(raw.Ind))*8 + int64(len(raw.Data))*8
	runtime.GC()
	debug.FreeOSMemory()
	base := rssKB("VmRSS")
	fmt.Printf("matrix %d×%d, %d non-zeros, CSR %.0f MiB, generated in %.2f s; resident before selection %.0f MiB\n",
		*m, *n, a.NNZ(), mib(csrBytes), gen.Seconds(), float64(base)/1024)

	needSVD := *method != string(selection.MethodNorm) && *method != string(selection.MethodPivot)
	svdRank := min(selection.ReferenceRank(*k, *k, *k), *m, *n) // as the command line
	if *profile != "" {
		f, err := os.Create(*profile)
		check(err)
		check(pprof.StartCPUProfile(f))
		defer pprof.StopCPUProfile()
	}
	if *nearDup {
		timeNearDup(a)
	}
	debug.SetGCPercent(20) // as the command line does in its numerical phase
	var svdT, selT, msrT, totalT []float64
	var q selection.Quality
	for run := range *runs {
		start := time.Now()
		svd, err := sparsemat.TruncatedSVD(a, sparsemat.SVDOptions{Rank: svdRank, PowerIters: *power, Seed: uint64(run + 1)})
		check(err)
		svdT = append(svdT, time.Since(start).Seconds())
		if os.Getenv("SCALE_LIVE") != "" {
			fmt.Printf("  live after SVD: %.0f MiB\n", liveMiB())
		}
		s := time.Now()
		// As the command line does: Select gets the only reference to the
		// singular vectors, and drops it once the picks are made.
		vectors := &sparsemat.SVD{Values: svd.Values, U: svd.U, V: svd.V, Exact: svd.Exact}
		svd.U, svd.V = nil, nil
		cur, err := selection.Select(a, selection.Options{
			Method: selection.Method(*method), Rows: *k, Cols: *k, Rank: *k, Seed: uint64(run + 1), SVD: vectors, PowerIters: 1,
		})
		vectors = nil
		check(err)
		selT = append(selT, time.Since(s).Seconds())
		if os.Getenv("SCALE_LIVE") != "" {
			fmt.Printf("  live after select: %.0f MiB\n", liveMiB())
		}
		s = time.Now()
		q = selection.Measure(a, cur, svd, *k)
		msrT = append(msrT, time.Since(s).Seconds())
		totalT = append(totalT, time.Since(start).Seconds())
		svd, cur = nil, nil // a run of the command line does not overlap the next
	}
	peak := rssKB("VmHWM")
	eta, _ := q.EtaDocs()
	etaJ, _ := q.Eta()
	fmt.Printf("method %s, k = r = c = %d, reference SVD rank %d (needed by the method: %v), GOMAXPROCS %d, %d runs (medians):\n",
		*method, *k, svdRank, needSVD, runtime.GOMAXPROCS(0), *runs)
	fmt.Printf("  SVD %.2f s, select %.2f s, measure %.2f s, total %.2f s\n", median(svdT), median(selT), median(msrT), median(totalT))
	fmt.Printf("  η_docs %.3f, joint η %.3f\n", eta, etaJ)
	fmt.Printf("  peak resident %.0f MiB = %.2f × the CSR (%.2f × counting only what selection added to the %.0f MiB resident before)\n",
		float64(peak)/1024, float64(peak)*1024/float64(csrBytes), float64(peak-base)*1024/float64(csrBytes), float64(base)/1024)
}

// liveMiB collects garbage and returns the live heap.
func liveMiB() float64 {
	runtime.GC()
	var ms runtime.MemStats
	runtime.ReadMemStats(&ms)
	return float64(ms.HeapAlloc) / (1 << 20)
}

// timeNearDup times the signatures (here of each row's set of columns; the
// command line hashes three-word shingles while it analyses) and the
// candidate search with cosine confirmation.
func timeNearDup(a *sparse.CSR) {
	raw := a.RawMatrix()
	m := raw.I
	t0 := time.Now()
	sig := make([]uint32, m*selection.MinHashes)
	items := make([]uint64, 0, 256)
	for i := range m {
		items = items[:0]
		for _, j := range raw.Ind[raw.Indptr[i]:raw.Indptr[i+1]] {
			items = append(items, uint64(j))
		}
		selection.MinHash(sig[i*selection.MinHashes:(i+1)*selection.MinHashes], items, 1)
	}
	sigT := time.Since(t0)
	t0 = time.Now()
	clusters := selection.NearDuplicates(a, sig, 0.9)
	fmt.Printf("near-copies: signatures %.2f s (one goroutine), search and cosine checks %.2f s, %d clusters\n",
		sigT.Seconds(), time.Since(t0).Seconds(), len(clusters))
}

func median(v []float64) float64 {
	s := slices.Clone(v)
	slices.Sort(s)
	return s[len(s)/2]
}

func mib(b int64) float64 { return float64(b) / (1 << 20) }

// rssKB reads a memory line (VmRSS, VmHWM) of /proc/self/status, in KiB.
func rssKB(key string) int64 {
	b, err := os.ReadFile("/proc/self/status")
	if err != nil {
		return 0
	}
	for _, line := range strings.Split(string(b), "\n") {
		if v, ok := strings.CutPrefix(line, key+":"); ok {
			var kb int64
			fmt.Sscan(strings.TrimSuffix(strings.TrimSpace(v), " kB"), &kb)
			return kb
		}
	}
	return 0
}

func check(err error) {
	if err != nil {
		fmt.Fprintln(os.Stderr, "scale:", err)
		os.Exit(1)
	}
}
