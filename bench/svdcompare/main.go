// Command svdcompare times assay's randomized truncated SVD on a synthetic
// TF-IDF-like matrix and compares its results with another tool's.
// bench/svd-vs-sklearn.sh runs it twice:
//
//	svdcompare -m 100000 -n 50000 -nnz 100 -mtx FILE.mtx -out assay.json
//	svdcompare compare assay.json sklearn.json [reference.json]
//
// The first form builds synth.Matrix(m, n, nnz, seed), writes it to FILE.mtx
// in Matrix Market format unless a file written for the same arguments is
// already there, then runs sparsemat.TruncatedSVD (randomized, rank 50,
// oversampling 10, 2 power iterations by default) -runs times and writes
// the run times, their median and the singular values as JSON. It also
// times one product Aᵀ·Y both ways the code can form it — MulDenseT on A,
// and MulDense on a stored transpose — and one product A·X (medians of at
// least 7 interleaved runs). -cpuprofile writes a CPU profile of the timed
// SVD runs.
//
// The second form reads such JSON files and prints a table: both medians,
// their ratio, and the largest relative difference between the singular
// values; with a reference file (values computed to high accuracy), the
// largest relative error of each tool's values against it.
package main

import (
	"bufio"
	"encoding/binary"
	"encoding/json"
	"flag"
	"fmt"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"runtime"
	"runtime/pprof"
	"slices"
	"strings"
	"time"

	"assay/bench/synth"
	"assay/sparsemat"

	"github.com/james-bowman/sparse"
	"gonum.org/v1/gonum/mat"
)

// Result is what one tool's timing run writes.
type Result struct {
	Tool          string    `json:"tool"`
	Matrix        string    `json:"matrix,omitempty"`
	Rows          int       `json:"rows"`
	Cols          int       `json:"cols"`
	NNZ           int       `json:"nnz"`
	Rank          int       `json:"rank"`
	Oversample    int       `json:"oversample"`
	PowerIters    int       `json:"power_iters"`
	Threads       int       `json:"threads,omitempty"`
	RunsSeconds   []float64 `json:"runs_seconds"`
	MedianSeconds float64   `json:"median_seconds"`
	SameEveryRun  bool      `json:"same_every_run"`
	Values        []float64 `json:"values"`
	// SharedOmegaValues are the values of one more run from the test
	// matrix scikit-learn draws (-omega), untimed.
	SharedOmegaValues []float64 `json:"shared_omega_values,omitempty"`
	Extra             any       `json:"extra,omitempty"`
}

func main() {
	if len(os.Args) > 1 && os.Args[1] == "compare" {
		if err := compare(os.Args[2:]); err != nil {
			fmt.Fprintln(os.Stderr, "svdcompare:", err)
			os.Exit(1)
		}
		return
	}
	m := flag.Int("m", 100000, "rows (documents)")
	n := flag.Int("n", 50000, "columns (terms)")
	nnz := flag.Int("nnz", 100, "stored entries a row")
	seed := flag.Uint64("seed", 1, "seed of the synthetic matrix")
	mtx := flag.String("mtx", "", "Matrix Market file to write (or reuse) for the other tool")
	out := flag.String("out", "", "JSON file for the results")
	runs := flag.Int("runs", 3, "timed runs")
	rank := flag.Int("rank", 50, "singular values wanted")
	over := flag.Int("oversample", 10, "extra sketch columns")
	iters := flag.Int("power-iters", 2, "power iterations")
	svdSeed := flag.Uint64("svd-seed", 0, "seed of the Gaussian test matrix")
	cpuProfile := flag.String("cpuprofile", "", "write a CPU profile of the timed runs to this file")
	omegaPath := flag.String("omega", "", "after the timed runs, run once more from this test matrix (raw little-endian float64, n×(rank+oversample), as sklearn_svd.py --omega-out writes it) and record those values as shared_omega_values")
	flag.Parse()
	if *mtx == "" || *out == "" || *runs < 1 || flag.NArg() != 0 {
		fmt.Fprintln(os.Stderr, "usage: svdcompare [flags] -mtx FILE -out FILE | svdcompare compare A.json B.json [REF.json]")
		flag.PrintDefaults()
		os.Exit(2)
	}
	opts := sparsemat.SVDOptions{Rank: *rank, Oversample: *over, PowerIters: *iters, Seed: *svdSeed, Randomized: true}
	sharedOmega = *omegaPath
	if err := run(*m, *n, *nnz, *seed, *mtx, *out, *runs, opts, *cpuProfile); err != nil {
		fmt.Fprintln(os.Stderr, "svdcompare:", err)
		os.Exit(1)
	}
}

func run(m, n, nnz int, seed uint64, mtxPath, out string, runs int, opts sparsemat.SVDOptions, cpuProfile string) error {
	t0 := time.Now()
	a := synth.Matrix(m, n, nnz, seed)
	fmt.Printf("assay: synth.Matrix(%d, %d, %d, %d): %d non-zeros in %.2f s\n", m, n, nnz, seed, a.NNZ(), time.Since(t0).Seconds())

	header := fmt.Sprintf("synth.Matrix m=%d n=%d nnzPerRow=%d seed=%d zipf=%g countRatio=%g", m, n, nnz, seed, synth.ZipfExponent, synth.CountRatio)
	if ok, err := sameHeader(mtxPath, header); err != nil {
		return err
	} else if ok {
		fmt.Printf("assay: reusing %s\n", mtxPath)
	} else {
		t0 = time.Now()
		if err := writeMTX(mtxPath, a, header); err != nil {
			return err
		}
		fmt.Printf("assay: wrote %s in %.2f s\n", mtxPath, time.Since(t0).Seconds())
	}

	res := Result{
		Tool: "assay sparsemat.TruncatedSVD (Go " + runtime.Version() + ")", Matrix: mtxPath,
		Rows: m, Cols: n, NNZ: a.NNZ(), Rank: opts.Rank, Oversample: opts.Oversample,
		PowerIters: opts.PowerIters, Threads: runtime.GOMAXPROCS(0), SameEveryRun: true,
	}
	if cpuProfile != "" {
		f, err := os.Create(cpuProfile)
		if err != nil {
			return err
		}
		defer f.Close()
		if err := pprof.StartCPUProfile(f); err != nil {
			return err
		}
	}
	for r := range runs {
		runtime.GC()
		t0 = time.Now()
		svd, err := sparsemat.TruncatedSVD(a, opts)
		dt := time.Since(t0).Seconds()
		if err != nil {
			return err
		}
		fmt.Printf("assay: run %d: %.3f s\n", r+1, dt)
		res.RunsSeconds = append(res.RunsSeconds, dt)
		if res.Values == nil {
			res.Values = svd.Values
		} else if !slices.Equal(res.Values, svd.Values) {
			res.SameEveryRun = false
		}
	}
	if cpuProfile != "" {
		pprof.StopCPUProfile()
	}
	res.MedianSeconds = median(res.RunsSeconds)
	fmt.Printf("assay: median %.3f s of %d runs (GOMAXPROCS %d)\n", res.MedianSeconds, runs, res.Threads)

	res.Extra = timeProducts(a, opts.Rank+opts.Oversample, max(runs, 7))

	if sharedOmega != "" {
		omega, err := readOmega(sharedOmega, n, opts.Rank+opts.Oversample)
		if err != nil {
			return err
		}
		o := opts
		o.TestMatrix = omega
		svd, err := sparsemat.TruncatedSVD(a, o)
		if err != nil {
			return err
		}
		res.SharedOmegaValues = svd.Values
		fmt.Printf("assay: values from the shared test matrix %s recorded\n", sharedOmega)
	}

	b, err := json.MarshalIndent(res, "", "  ")
	if err != nil {
		return err
	}
	return os.WriteFile(out, append(b, '\n'), 0o644)
}

// sharedOmega is the -omega flag: a test matrix written by sklearn_svd.py.
var sharedOmega string

// readOmega reads an r×c matrix of raw little-endian float64, row-major.
func readOmega(path string, r, c int) (*mat.Dense, error) {
	b, err := os.ReadFile(path)
	if err != nil {
		return nil, err
	}
	if len(b) != 8*r*c {
		return nil, fmt.Errorf("%s holds %d bytes, want %d for %d×%d", path, len(b), 8*r*c, r, c)
	}
	d := make([]float64, r*c)
	for i := range d {
		d[i] = math.Float64frombits(binary.LittleEndian.Uint64(b[8*i:]))
	}
	return mat.NewDense(r, c, d), nil
}

// Products holds the timings of one Aᵀ·Y product formed two ways.
type Products struct {
	Columns              int     `json:"columns"`
	TransposeSeconds     float64 `json:"transpose_seconds"`
	MulDenseTSeconds     float64 `json:"muldenset_median_seconds"`
	StoredTransposeSecs  float64 `json:"stored_transpose_muldense_median_seconds"`
	MulDenseSeconds      float64 `json:"muldense_a_y_median_seconds"`
	MaxAbsDiffTransposed float64 `json:"max_abs_difference"`
}

// timeProducts times Aᵀ·Y with MulDenseT on a and with MulDense on a
// stored transpose, and A·X with MulDense, for dense blocks of p columns,
// interleaved, runs times each.
func timeProducts(a *sparse.CSR, p, runs int) Products {
	m, n := a.Dims()
	y := gaussian(m, p, 7)
	x := gaussian(n, p, 8)
	var pr Products
	pr.Columns = p
	t0 := time.Now()
	at := sparsemat.Transpose(a)
	pr.TransposeSeconds = time.Since(t0).Seconds()
	var d1, d2, d3 mat.Dense
	var t1, t2, t3 []float64
	for range runs {
		t0 = time.Now()
		d1.Reset()
		sparsemat.MulDenseT(&d1, a, y)
		t1 = append(t1, time.Since(t0).Seconds())
		t0 = time.Now()
		d2.Reset()
		sparsemat.MulDense(&d2, at, y)
		t2 = append(t2, time.Since(t0).Seconds())
		t0 = time.Now()
		d3.Reset()
		sparsemat.MulDense(&d3, a, x)
		t3 = append(t3, time.Since(t0).Seconds())
	}
	pr.MulDenseTSeconds, pr.StoredTransposeSecs, pr.MulDenseSeconds = median(t1), median(t2), median(t3)
	for i, v := range d1.RawMatrix().Data {
		pr.MaxAbsDiffTransposed = max(pr.MaxAbsDiffTransposed, math.Abs(v-d2.RawMatrix().Data[i]))
	}
	fmt.Printf("assay: one product with %d columns, medians of %d: Aᵀ·Y by MulDenseT %.3f s, by MulDense on a stored transpose %.3f s (transposing took %.3f s once); A·X by MulDense %.3f s\n",
		p, runs, pr.MulDenseTSeconds, pr.StoredTransposeSecs, pr.TransposeSeconds, pr.MulDenseSeconds)
	return pr
}

func gaussian(r, c int, seed uint64) *mat.Dense {
	rng := newRand(seed)
	d := mat.NewDense(r, c, nil)
	for i := range d.RawMatrix().Data {
		d.RawMatrix().Data[i] = rng.NormFloat64()
	}
	return d
}

func newRand(seed uint64) *rand.Rand { return rand.New(rand.NewPCG(seed, 0x73766463)) }

// sameHeader reports whether path is a Matrix Market file whose first
// comment line is header (so it was written for the same arguments) and
// whose last line is complete.
func sameHeader(path, header string) (bool, error) {
	f, err := os.Open(path)
	if os.IsNotExist(err) {
		return false, nil
	} else if err != nil {
		return false, err
	}
	defer f.Close()
	br := bufio.NewReader(f)
	if _, err := br.ReadString('\n'); err != nil {
		return false, nil
	}
	line, err := br.ReadString('\n')
	if err != nil || strings.TrimSuffix(line, "\n") != "%"+header {
		return false, nil
	}
	st, err := f.Stat()
	if err != nil || st.Size() == 0 {
		return false, err
	}
	last := make([]byte, 1)
	if _, err := f.ReadAt(last, st.Size()-1); err != nil || last[0] != '\n' {
		return false, nil
	}
	return true, nil
}

// writeMTX writes a beside path and renames it into place.
func writeMTX(path string, a *sparse.CSR, header string) error {
	if err := os.MkdirAll(filepath.Dir(path), 0o755); err != nil {
		return err
	}
	tmp := path + ".partial"
	f, err := os.Create(tmp)
	if err != nil {
		return err
	}
	err = sparsemat.WriteMatrixMarket(f, a, header)
	if cerr := f.Close(); err == nil {
		err = cerr
	}
	if err != nil {
		os.Remove(tmp)
		return err
	}
	return os.Rename(tmp, path)
}

func median(xs []float64) float64 {
	s := slices.Clone(xs)
	slices.Sort(s)
	if len(s)%2 == 1 {
		return s[len(s)/2]
	}
	return (s[len(s)/2-1] + s[len(s)/2]) / 2
}

func readResult(path string) (*Result, error) {
	b, err := os.ReadFile(path)
	if err != nil {
		return nil, err
	}
	var r Result
	if err := json.Unmarshal(b, &r); err != nil {
		return nil, fmt.Errorf("%s: %w", path, err)
	}
	if len(r.Values) == 0 {
		return nil, fmt.Errorf("%s: no singular values", path)
	}
	return &r, nil
}

// maxRelDiff returns max_i |x_i − ref_i| / ref_i over the common length and
// the index where it occurs.
func maxRelDiff(x, ref []float64) (float64, int) {
	worst, at := 0.0, 0
	for i := range min(len(x), len(ref)) {
		if d := math.Abs(x[i]-ref[i]) / ref[i]; d > worst {
			worst, at = d, i
		}
	}
	return worst, at
}

func compare(args []string) error {
	if len(args) < 2 || len(args) > 3 {
		return fmt.Errorf("usage: svdcompare compare A.json B.json [REF.json]")
	}
	a, err := readResult(args[0])
	if err != nil {
		return err
	}
	b, err := readResult(args[1])
	if err != nil {
		return err
	}
	if a.Rows != b.Rows || a.Cols != b.Cols || a.NNZ != b.NNZ || len(a.Values) != len(b.Values) {
		return fmt.Errorf("the two runs are of different problems: %d×%d (%d nnz, k=%d) and %d×%d (%d nnz, k=%d)",
			a.Rows, a.Cols, a.NNZ, len(a.Values), b.Rows, b.Cols, b.NNZ, len(b.Values))
	}
	fmt.Printf("\nrandomized SVD of a %d×%d matrix, %d non-zeros: rank %d, oversampling %d, %d power iterations\n\n",
		a.Rows, a.Cols, a.NNZ, a.Rank, a.Oversample, a.PowerIters)
	w := max(len(a.Tool), len(b.Tool), 4)
	fmt.Printf("| %-*s | %9s | %s\n", w, "tool", "median s", "runs (s)")
	fmt.Printf("|%s|%s|%s\n", strings.Repeat("-", w+2), strings.Repeat("-", 11), strings.Repeat("-", 20))
	for _, r := range []*Result{a, b} {
		var rs []string
		for _, t := range r.RunsSeconds {
			rs = append(rs, fmt.Sprintf("%.2f", t))
		}
		fmt.Printf("| %-*s | %9.3f | %s\n", w, r.Tool, r.MedianSeconds, strings.Join(rs, " "))
	}
	fmt.Println()
	fmt.Printf("time ratio %s / %s: %.2f\n", short(a.Tool), short(b.Tool), a.MedianSeconds/b.MedianSeconds)
	d, at := maxRelDiff(a.Values, b.Values)
	fmt.Printf("max relative difference of the %d singular values: %.3g (σ%d: %.6g vs %.6g)\n", len(a.Values), d, at+1, a.Values[at], b.Values[at])
	fmt.Printf("σ1: %.10g vs %.10g; σ%d: %.6g vs %.6g\n", a.Values[0], b.Values[0], len(a.Values), a.Values[len(a.Values)-1], b.Values[len(b.Values)-1])
	fmt.Printf("same values every run: %s %v, %s %v\n", short(a.Tool), a.SameEveryRun, short(b.Tool), b.SameEveryRun)
	for _, pair := range [][2]*Result{{a, b}, {b, a}} {
		if shared := pair[0].SharedOmegaValues; len(shared) == len(pair[1].Values) {
			d, at := maxRelDiff(shared, pair[1].Values)
			fmt.Printf("from the identical test matrix Ω (%s's run with %s's Ω): max relative difference %.3g (at σ%d)\n",
				short(pair[0].Tool), short(pair[1].Tool), d, at+1)
		}
	}
	if len(args) == 3 {
		ref, err := readResult(args[2])
		if err != nil {
			return err
		}
		fmt.Printf("\nagainst the reference (%s):\n", ref.Tool)
		for _, r := range []*Result{a, b} {
			d, at := maxRelDiff(r.Values, ref.Values)
			d10, _ := maxRelDiff(r.Values[:min(10, len(r.Values))], ref.Values)
			under := 0
			for i := range min(len(r.Values), len(ref.Values)) {
				if r.Values[i] < ref.Values[i] {
					under++
				}
			}
			fmt.Printf("  %-8s max relative error %.3g (at σ%d), over σ1…σ10 %.3g; %d of %d values below the reference\n",
				short(r.Tool), d, at+1, d10, under, min(len(r.Values), len(ref.Values)))
		}
	}
	return nil
}

// short is the first word of a tool name.
func short(tool string) string {
	if f := strings.Fields(tool); len(f) > 0 {
		return f[0]
	}
	return tool
}
