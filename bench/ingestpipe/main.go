// Command ingestpipe times the ingest of a folder (walk, read, analyse,
// count, build the pruned count matrix) the way the command line's pick
// does it, with two designs of the worker/collector split side by side:
//
//	go run ./bench/ingestpipe -dir DIR [-collector ids|maps] [-lang english] [-no-stem] [-jobs N] [-minhash] [-runs 3]
//
// "maps" is the design of cmd/assay/analyze.go: each worker counts a
// document's terms and its (term, surface form) pairs in two maps, and the
// collector (one goroutine, in walk order) turns the first into a row with
// sparsemat.Builder.AddRow and adds the second to textproc.DisplayForms.
// "ids" is the design this command proposes: workers analyse with
// textproc.Analyzer.AnalyzeIDs, whose terms are numbered by the builder's
// shared sparsemat.Vocabulary, count the IDs with a sparsemat.RowCounter,
// and the collector only appends the encoded row (Builder.AddCounted);
// each analyzer keeps its own surface-form counts, summed under term IDs
// after the walk (AddFormsByID; the counts are sums, so the order does not
// matter) and handed, for the kept terms only, to a DisplayForms once the
// matrix is built (FormsByID.AddTo), and the memory of the analyzers' memos is handed
// back to the system before the matrix is built (-free; debug.FreeOSMemory
// takes about 30 ms at 100,000 documents), so that the peak is the matrix
// and not the memos and the matrix. Set INGESTPIPE_PHASES=1 to print the
// resident memory after each step. -minhash adds the MinHash signature of each
// document's word shingles, as analyze.go computes it for the near-copy
// search (selection.TermHash of each term, selection.Shingles,
// selection.MinHash with the command's seed).
//
// It prints, per run, the time and MB/s of raw input (the sum of the sizes
// of the documents read), and then the medians, the peak resident memory
// (VmHWM) against the CSR's size and the vocabulary's, and a checksum of
// everything the matrix and the display forms hold: the two designs, and
// any -jobs, must print the same checksum.
package main

import (
	"crypto/sha256"
	"encoding/binary"
	"flag"
	"fmt"
	"io/fs"
	"math"
	"os"
	"runtime"
	"runtime/debug"
	"runtime/pprof"
	"slices"
	"strings"
	"sync"
	"syscall"
	"time"

	"assay/corpus"
	selection "assay/select"
	"assay/sparsemat"
	"assay/textproc"
)

// ingestMinHashSeed is the command's MinHash seed (cmd/assay, minHashSeed).
const ingestMinHashSeed = 0x5a55a1

// freeOS is the -free flag.
var freeOS bool

type result struct {
	counts  *sparsemat.Counts
	display *textproc.DisplayForms
	docs    int
	bytes   int64
	sigs    selection.Signatures
	fp      string
}

func main() {
	dir := flag.String("dir", "", "corpus folder")
	collector := flag.String("collector", "ids", "ids or maps (see the package documentation)")
	lang := flag.String("lang", "english", "language (auto, english, …)")
	noStem := flag.Bool("no-stem", false, "do not stem")
	jobs := flag.Int("jobs", runtime.GOMAXPROCS(0), "workers")
	minhash := flag.Bool("minhash", false, "compute the MinHash signature of each document, as analyze.go does")
	runs := flag.Int("runs", 3, "timed runs")
	cpuprofile := flag.String("cpuprofile", "", "write a CPU profile of the runs")
	flag.BoolVar(&freeOS, "free", true, "with -collector ids: hand the analyzers' memory back to the system (debug.FreeOSMemory) before building the matrix")
	flag.Parse()
	if *dir == "" {
		fmt.Fprintln(os.Stderr, "usage: ingestpipe -dir DIR [flags]")
		os.Exit(2)
	}
	l, err := textproc.ParseLanguage(*lang)
	if err != nil {
		fmt.Fprintln(os.Stderr, err)
		os.Exit(2)
	}
	root, err := os.OpenRoot(*dir)
	if err != nil {
		fmt.Fprintln(os.Stderr, err)
		os.Exit(1)
	}
	opts := textproc.Options{NoStem: *noStem, Lang: l}
	if *cpuprofile != "" {
		f, err := os.Create(*cpuprofile)
		if err != nil {
			fmt.Fprintln(os.Stderr, err)
			os.Exit(1)
		}
		pprof.StartCPUProfile(f)
		defer pprof.StopCPUProfile()
	}
	var times []float64
	var last *result
	for r := range *runs {
		last = nil
		runtime.GC()
		start, cpu0 := time.Now(), cpuSeconds()
		phaseStart, phaseCPU = start, cpu0
		var res *result
		if *collector == "maps" {
			res, err = ingestMaps(corpus.RootFS(root), opts, *jobs, *minhash)
		} else {
			res, err = ingestIDs(corpus.RootFS(root), opts, *jobs, *minhash)
		}
		if err != nil {
			fmt.Fprintln(os.Stderr, err)
			os.Exit(1)
		}
		t := time.Since(start).Seconds()
		times = append(times, t)
		fmt.Printf("run %d: %d documents, %.1f MB in %.3f s: %.1f MB/s (CPU %.2f s)\n", r+1, res.docs, float64(res.bytes)/1e6, t, float64(res.bytes)/1e6/t, cpuSeconds()-cpu0)
		last = res
	}
	peak := rssKB("VmHWM")
	c := last.counts
	nnz := len(c.Matrix.RawMatrix().Data)
	csr := 8*(len(c.Rows)+1) + 16*nnz
	vocab := 0
	for _, t := range c.Terms {
		vocab += len(t) + 16 + 8 // the string, its header and the DF
	}
	slices.Sort(times)
	med := times[len(times)/2]
	fmt.Printf("collector %s, lang %s, stem %v, jobs %d, minhash %v, free %v, GOMAXPROCS %d\n", *collector, l, !*noStem, *jobs, *minhash, freeOS && *collector == "ids", runtime.GOMAXPROCS(0))
	fmt.Printf("median %.3f s, %.1f MB/s; %d × %d, %d non-zeros, vocabulary %d\n", med, float64(last.bytes)/1e6/med, len(c.Rows), len(c.Terms), nnz, c.VocabularySize)
	fmt.Printf("peak resident %.0f MiB; CSR %.0f MiB, kept vocabulary %.1f MiB; 1.5 × (CSR + vocabulary) + 64 MiB = %.0f MiB\n",
		float64(peak)/1024, float64(csr)/(1<<20), float64(vocab)/(1<<20), 1.5*float64(csr+vocab)/(1<<20)+64)
	fmt.Printf("checksum %s\n", checksum(last))
}

// ingestMaps is the worker and collector of cmd/assay/analyze.go.
func ingestMaps(fsys fs.FS, opts textproc.Options, jobs int, minhash bool) (*result, error) {
	type analysed struct {
		counts map[string]int
		forms  map[[2]string]int
		sig    []uint32
	}
	var b sparsemat.Builder
	res := &result{display: &textproc.DisplayForms{}}
	var fp corpus.Fingerprint
	newWorker := func() func(corpus.Document) analysed {
		az := textproc.NewAnalyzer(opts)
		var seq []uint64
		return func(d corpus.Document) analysed {
			r := analysed{counts: map[string]int{}, forms: map[[2]string]int{}}
			seq = seq[:0]
			az.Analyze(d.Text, func(term, surface string) {
				r.counts[term]++
				r.forms[[2]string{term, surface}]++
				if minhash {
					seq = append(seq, selection.TermHash(term))
				}
			})
			if minhash {
				r.sig = make([]uint32, selection.MinHashes)
				selection.MinHashTerms(r.sig, seq, ingestMinHashSeed)
			}
			return r
		}
	}
	_, err := corpus.WalkParallel(fsys, corpus.Options{}, jobs, newWorker, func(d corpus.Document, r analysed) error {
		b.AddRow(r.counts)
		for f, n := range r.forms {
			res.display.AddN(f[0], f[1], n)
		}
		res.tally(&fp, &d, r.sig)
		return nil
	})
	if err != nil {
		return nil, err
	}
	res.fp = fp.String()
	res.counts, err = b.Build(sparsemat.Pruning{MinDF: 2, MaxDFShare: 0.5})
	return res, err
}

// ingestIDs is the proposed worker and collector.
func ingestIDs(fsys fs.FS, opts textproc.Options, jobs int, minhash bool) (*result, error) {
	type analysed struct {
		row sparsemat.Row
		sig []uint32
	}
	var b sparsemat.Builder
	res := &result{display: &textproc.DisplayForms{}}
	var fp corpus.Fingerprint
	opts.TermID = b.Vocabulary().ID
	var mu sync.Mutex
	var analyzers []*textproc.Analyzer
	newWorker := func() func(corpus.Document) analysed {
		az := textproc.NewAnalyzer(opts)
		mu.Lock()
		analyzers = append(analyzers, az)
		mu.Unlock()
		var ids []int32
		rc := b.NewRowCounter()
		var termHash []uint64 // by term ID, for -minhash
		var seq []uint64
		var sigs selection.SignatureSlab // as in analyze.go
		return func(d corpus.Document) analysed {
			ids, _ = az.AnalyzeIDs(d.Text, ids[:0])
			rc.AddAll(ids)
			r := analysed{row: rc.Row()}
			if minhash {
				seq = seq[:0]
				for _, id := range ids {
					for int(id) >= len(termHash) {
						termHash = append(termHash, 0)
					}
					if termHash[id] == 0 {
						termHash[id] = selection.TermHash(b.Vocabulary().Term(id))
					}
					seq = append(seq, termHash[id])
				}
				r.sig = sigs.Next()
				selection.MinHashTerms(r.sig, seq, ingestMinHashSeed)
			}
			return r
		}
	}
	_, err := corpus.WalkParallel(fsys, corpus.Options{}, jobs, newWorker, func(d corpus.Document, r analysed) error {
		b.AddCounted(r.row)
		res.tally(&fp, &d, r.sig)
		return nil
	})
	if err != nil {
		return nil, err
	}
	phase("walked")
	var forms textproc.FormsByID
	for _, az := range analyzers {
		az.AddFormsByID(&forms)
	}
	analyzers = nil
	phase("forms counted")
	if freeOS {
		t := time.Now()
		debug.FreeOSMemory()
		phase(fmt.Sprintf("freed in %.3f s", time.Since(t).Seconds()))
	}
	res.fp = fp.String()
	res.counts, err = b.Build(sparsemat.Pruning{MinDF: 2, MaxDFShare: 0.5})
	if err != nil {
		return nil, err
	}
	forms.AddTo(res.display, res.counts.Terms, res.counts.IDs)
	phase("built")
	return res, nil
}

// tally adds a collected document to the result: its fingerprint, count,
// size and signature.
func (r *result) tally(fp *corpus.Fingerprint, d *corpus.Document, sig []uint32) {
	fp.Add(d)
	r.docs++
	r.bytes += d.Size
	if sig != nil {
		r.sigs.Add(sig)
	}
}

// phaseStart and phaseCPU are when the current run began and the CPU
// time used before it, for phase.
var (
	phaseStart time.Time
	phaseCPU   float64
)

// phase prints the resident memory and the heap at a step of the ingest,
// when INGESTPIPE_PHASES is set.
func phase(name string) {
	if os.Getenv("INGESTPIPE_PHASES") == "" {
		return
	}
	var ms runtime.MemStats
	runtime.ReadMemStats(&ms)
	fmt.Printf("  %s at %.3f s (CPU %.2f s): resident %d MiB (peak %d MiB), heap in use %d MiB, live after last GC %d MiB\n", name, time.Since(phaseStart).Seconds(), cpuSeconds()-phaseCPU, rssKB("VmRSS")/1024, rssKB("VmHWM")/1024, ms.HeapInuse>>20, ms.HeapAlloc>>20)
}

// checksum hashes the matrix, its terms, DF and rows, the display form
// and form counts of every kept term, the signatures and the fingerprint.
func checksum(r *result) string {
	h := sha256.New()
	c := r.counts
	raw := c.Matrix.RawMatrix()
	w := func(v ...int) {
		for _, x := range v {
			h.Write(binary.LittleEndian.AppendUint64(nil, uint64(x)))
		}
	}
	w(raw.I, raw.J, c.VocabularySize, c.Documents)
	w(raw.Indptr...)
	w(raw.Ind...)
	for _, x := range raw.Data {
		w(int(math.Float64bits(x)))
	}
	w(c.DF...)
	w(c.Rows...)
	w(c.EmptyRows...)
	for _, t := range c.Terms {
		h.Write([]byte(t + "\x00" + r.display.Form(t) + "\x00"))
		for _, f := range r.display.Forms(t) {
			h.Write([]byte(f.Form))
			w(f.Count)
		}
	}
	for i := range r.sigs.Len() {
		for _, s := range r.sigs.At(i) {
			w(int(s))
		}
	}
	h.Write([]byte(r.fp))
	return fmt.Sprintf("%x", h.Sum(nil)[:12])
}

// cpuSeconds returns the user and system CPU time of the process.
func cpuSeconds() float64 {
	var ru syscall.Rusage
	syscall.Getrusage(syscall.RUSAGE_SELF, &ru)
	return float64(ru.Utime.Nano()+ru.Stime.Nano()) / 1e9
}

func rssKB(field string) int {
	b, err := os.ReadFile("/proc/self/status")
	if err != nil {
		return 0
	}
	for _, line := range strings.Split(string(b), "\n") {
		if strings.HasPrefix(line, field+":") {
			var n int
			fmt.Sscanf(strings.TrimPrefix(line, field+":"), "%d", &n)
			return n
		}
	}
	return 0
}
