package main

import (
	"context"
	"errors"
	"fmt"
	"io/fs"
	"runtime/debug"
	"runtime/metrics"
	"slices"
	"sync"

	"assay/corpus"
	selection "assay/select"
	"assay/sparsemat"
	"assay/textproc"
)

// docInfo is what the report needs of a document once its text is gone.
type docInfo struct {
	ID       string
	Title    string
	Size     int64
	Repaired int
	Format   string
	Meta     corpus.Meta
	Lang     textproc.Language
}

// analysis is a corpus read and turned into a count matrix.
type analysis struct {
	docs        []docInfo // every document read, in walk order
	skips       []corpus.Skip
	counts      *sparsemat.Counts
	display     textproc.DisplayForms
	fingerprint string
	minDF       int // the min-df used (derived when not given)
	// sigs holds the MinHash signature of every document read, in order,
	// when near-copies are looked for.
	sigs selection.Signatures
}

// analysed is what a worker found in one document.
type analysed struct {
	counts map[string]int    // term -> occurrences
	forms  map[[2]string]int // (term, surface form) -> occurrences
	lang   textproc.Language
	sig    []uint32 // MinHash signature of the word shingles (nil when near-copies are not looked for)
}

// minHashSeed seeds the MinHash functions of the near-copy search. It is a
// constant, not --seed: a signature belongs to the document, like its term
// counts, so it can be kept in an index and reused by picks with any seed.
const minHashSeed = 0x5a55a1

// errNoDocuments is returned when a folder holds nothing readable.
var errNoDocuments = errors.New("no readable documents")

// analyze walks fsys, analyses each document as it is read (the text is
// dropped straight after), and builds the pruned count matrix.
//
// The workers do all the per-document work: each has its own analyzer,
// which numbers terms through the builder's shared, concurrency-safe
// vocabulary (asked once per distinct token, thanks to the memo), counts
// the numbers into an encoded row and computes the MinHash signature; the
// collector, which restores walk order, only appends bytes. The surface
// forms are counted inside each analyzer and summed once the walk is done.
// The provisional term numbers depend on scheduling, but the matrix does
// not: Build orders the columns by term, so the output is the same for
// any --jobs.
func analyze(ctx context.Context, fsys fs.FS, opts pickOptions) (*analysis, error) {
	readOpts := opts.Read
	readOpts.MaxBytes = opts.MaxBytes
	col := &collector{an: &analysis{}, opts: opts}
	vocab := col.b.Vocabulary()
	azOpts := analyzerOptions(opts)
	azOpts.TermID = vocab.ID
	withSig := opts.NearDup > 0
	var (
		mu        sync.Mutex
		analyzers []*textproc.Analyzer
	)
	newWorker := func() func(corpus.Document) rowResult {
		az := textproc.NewAnalyzer(azOpts)
		mu.Lock()
		analyzers = append(analyzers, az)
		mu.Unlock()
		rc := col.b.NewRowCounter() // counts the document frequencies too
		var (
			ids      []int32
			termHash []uint64 // fnv64 of each term, by provisional ID
			seq      []uint64
			sigs     selection.SignatureSlab
		)
		return func(d corpus.Document) rowResult {
			var r rowResult
			ids, r.lang = az.AnalyzeIDs(d.Text, ids[:0])
			rc.AddAll(ids)
			r.row = rc.Row()
			if withSig {
				seq = seq[:0]
				for _, id := range ids {
					if int(id) >= len(termHash) {
						termHash = append(termHash, make([]uint64, int(id)+1-len(termHash)+len(termHash)/2)...)
					}
					if termHash[id] == 0 {
						termHash[id] = selection.TermHash(vocab.Term(id))
					}
					seq = append(seq, termHash[id])
				}
				r.sig = sigs.Next() // the collector copies it
				selection.MinHashTerms(r.sig, seq, minHashSeed)
			}
			return r
		}
	}
	floor := startGCFloor()
	defer floor.stop()
	skips, err := corpus.WalkParallel(fsys, readOpts, opts.Jobs, newWorker, func(d corpus.Document, r rowResult) error {
		if err := ctx.Err(); err != nil {
			return err
		}
		floor.check()
		col.b.AddCounted(r.row)
		col.record(d, r.lang, r.sig)
		return nil
	})
	if err != nil {
		return nil, fmt.Errorf("read %s: %w", opts.Source, err)
	}
	for _, az := range analyzers {
		az.AddFormsByID(&col.forms)
	}
	analyzers = nil // the memos can go before the matrix is built
	return col.finish(skips, col.fp.String())
}

// The collector's GOGC while the live heap of a read is small: a read
// starts from an empty heap, and at the default of 100 the collector runs
// over and over while the memos and rows grow. Measured (assay pick
// --lang english --near-dup off, timings.read, 4 interleaved runs,
// medians): generated 10,000 documents 0.78 → 0.73 s, SpamAssassin 0.645
// → 0.597 s, generated 100,000 4.07 → 3.89 s; peak resident memory of the
// whole pick up by 5–7% (15 MiB, 10 MiB, 57 MiB). Once the live heap (as
// the last collection measured it) passes gcFloorBytes the default comes
// back, so a large read's heap grows as it did.
const (
	gcFloorPercent = 300
	gcFloorBytes   = 64 << 20
	gcFloorEvery   = 256 // documents between two looks at the heap
)

// gcFloor raises GOGC for the start of a read; see gcFloorPercent.
type gcFloor struct {
	prev   int // GOGC before, restored by stop
	n      int
	done   bool
	sample []metrics.Sample
}

func startGCFloor() *gcFloor {
	return &gcFloor{prev: debug.SetGCPercent(gcFloorPercent), sample: []metrics.Sample{{Name: "/gc/heap/live:bytes"}}}
}

// check looks at the live heap every gcFloorEvery documents and gives the
// collector its GOGC back once the heap is past the floor.
func (f *gcFloor) check() {
	if f.done {
		return
	}
	if f.n++; f.n%gcFloorEvery != 0 {
		return
	}
	metrics.Read(f.sample)
	if s := f.sample[0]; s.Value.Kind() == metrics.KindUint64 && s.Value.Uint64() < gcFloorBytes {
		return
	}
	debug.SetGCPercent(f.prev)
	f.done = true
}

func (f *gcFloor) stop() {
	if !f.done {
		debug.SetGCPercent(f.prev)
		f.done = true
	}
}

// rowResult is what a worker of analyze found in one document.
type rowResult struct {
	row  sparsemat.Row
	lang textproc.Language
	sig  []uint32 // nil when near-copies are not looked for
}

// analyzerOptions are the text analysis options of a pick or an index.
func analyzerOptions(opts pickOptions) textproc.Options {
	return textproc.Options{MinLength: opts.MinLen, KeepNumbers: opts.Numbers, NoStem: opts.NoStem, Lang: opts.Lang}
}

// docWorker returns the constructor of the per-worker analysis function:
// term counts, surface forms, language and the MinHash signature of a
// document's word shingles.
func docWorker(opts pickOptions) func() func(corpus.Document) analysed {
	azOpts := analyzerOptions(opts)
	return func() func(corpus.Document) analysed {
		az := textproc.NewAnalyzer(azOpts)
		var seq []uint64
		return func(d corpus.Document) analysed {
			r := analysed{counts: map[string]int{}, forms: map[[2]string]int{}}
			seq = seq[:0]
			r.lang = az.Analyze(d.Text, func(term, surface string) {
				r.counts[term]++
				r.forms[[2]string{term, surface}]++
				seq = append(seq, selection.TermHash(term))
			})
			r.sig = make([]uint32, selection.MinHashes)
			selection.MinHashTerms(r.sig, seq, minHashSeed)
			return r
		}
	}
}

// collector gathers the analysed documents, in walk order, into the count
// matrix and the per-document record a pick needs.
type collector struct {
	an   *analysis
	opts pickOptions
	b    sparsemat.Builder
	fp   corpus.Fingerprint
	// forms are the surface forms by vocabulary ID; finish hands those of
	// the kept terms to an.display.
	forms textproc.FormsByID
	// docs are the documents recorded, in chunks of docChunk that finish
	// joins into an.docs with one allocation of the exact size; one slice
	// grown by append allocated 87 MB on the way to the 16 MB of 100,000
	// documents, on this one goroutine.
	docs [][]docInfo
}

// docChunk is the number of documents in a chunk of collector.docs.
const docChunk = 4096

// record notes what the report needs of document d, whose terms are in
// the builder already.
func (c *collector) record(d corpus.Document, lang textproc.Language, sig []uint32) {
	c.fp.Add(&d)
	if c.opts.progress != nil {
		c.opts.progress()
	}
	if len(c.docs) == 0 || len(c.docs[len(c.docs)-1]) == docChunk {
		c.docs = append(c.docs, make([]docInfo, 0, docChunk))
	}
	last := &c.docs[len(c.docs)-1]
	*last = append(*last, docInfo{ID: d.ID, Title: d.Title, Size: d.Size, Repaired: d.Repaired, Format: d.Format, Meta: d.Meta, Lang: lang})
	if sig != nil {
		c.an.sigs.Add(sig)
	}
}

// finish prunes the vocabulary and builds the count matrix.
func (c *collector) finish(skips []corpus.Skip, fingerprint string) (*analysis, error) {
	an, opts := c.an, c.opts
	an.skips = skips
	an.fingerprint = fingerprint
	an.docs = slices.Concat(c.docs...)
	c.docs = nil
	if len(an.docs) == 0 {
		return nil, fmt.Errorf("%s: %w (%d files skipped)", opts.Source, errNoDocuments, len(skips))
	}
	an.minDF = opts.MinDF
	if an.minDF < 0 {
		an.minDF = 1
		if len(an.docs) >= minDFThreshold {
			an.minDF = 2
		}
	}
	counts, err := c.b.Build(sparsemat.Pruning{MinDF: an.minDF, MaxDFShare: opts.MaxDF})
	if errors.Is(err, sparsemat.ErrNoTerms) {
		return nil, fmt.Errorf("%s: no terms left after analysis and pruning (%d documents, min-df %d, max-df %g); try --min-df 1 or a larger --max-df", opts.Source, len(an.docs), an.minDF, opts.MaxDF)
	}
	if err != nil {
		return nil, fmt.Errorf("build matrix: %w", err)
	}
	an.counts = counts
	c.forms.AddTo(&an.display, counts.Terms, counts.IDs)
	c.forms = textproc.FormsByID{}
	for _, i := range counts.EmptyRows {
		an.skips = append(an.skips, corpus.Skip{Path: an.docs[i].ID, Reason: "no terms left after analysis and pruning"})
	}
	return an, nil
}
