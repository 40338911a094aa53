package corpus

import (
	"errors"
	"io"
	"io/fs"
	"path"
	"strings"
	"sync"
)

// WalkParallel reads the corpus like [Walk], but as a bounded pipeline: one
// goroutine walks the folder in lexical order, jobs workers read and
// extract the files and run work on each document (a worker gets its own
// work function from newWorker, so it can keep state such as an analyzer),
// and the calling goroutine hands the results to collect in walk order,
// whatever order the workers finish in. The documents passed to collect
// have their Text dropped (work has seen it); skips come back in walk
// order. The output therefore does not depend on jobs.
//
// Memory stays bounded whatever the corpus size: at most filesInFlight·jobs
// files are between the walker and collect, and a worker starts on a file
// only while the files done but not yet collected came to at most
// bytesInFlight·jobs bytes (the file collect waits for is always
// started), so the results held for order are bounded by bytes as well as
// by files. An error from collect
// (other than [ErrStop], which ends the walk quietly) stops the walk and
// is returned. jobs < 1 means 1.
func WalkParallel[R any](fsys fs.FS, opts Options, jobs int, newWorker func() func(Document) R, collect func(Document, R) error) ([]Skip, error) {
	if opts.MaxBytes <= 0 {
		opts.MaxBytes = DefaultMaxBytes
	}
	jobs = max(jobs, 1)
	type task struct {
		seq  int
		path string
		d    fs.DirEntry
		skip *Skip // a walk error for this entry, nothing to read
	}
	type result struct {
		seq   int
		size  int // bytes of the file, counted by the gate
		docs  []Document
		rs    []R
		skips []Skip
	}
	tasks := make(chan task, filesInFlight*jobs)
	results := make(chan result, filesInFlight*jobs)
	inFlight := make(chan struct{}, filesInFlight*jobs)
	done := make(chan struct{})
	g := newGate(bytesInFlight * jobs)
	var rootErr error

	go func() { // the walker
		defer close(tasks)
		seq := 0
		send := func(t task) bool {
			select {
			case inFlight <- struct{}{}:
			case <-done:
				return false
			}
			t.seq = seq
			seq++
			select {
			case tasks <- t:
				return true
			case <-done:
				return false
			}
		}
		err := WalkFiles(fsys, opts, func(s Skip) error {
			if !send(task{path: s.Path, skip: &s}) {
				return ErrStop
			}
			return nil
		}, func(p string, d fs.DirEntry) error {
			if !send(task{path: p, d: d}) {
				return ErrStop
			}
			return nil
		})
		if err != nil && !errors.Is(err, ErrStop) {
			rootErr = err
		}
	}()

	var wg sync.WaitGroup
	for range jobs {
		wg.Go(func() {
			work := newWorker()
			var fr fileReader
			if f, ok := fsys.(fileReaderFS); ok {
				if fr = f.newFileReader(); fr != nil {
					defer fr.close()
				}
			}
			for t := range tasks {
				r := result{seq: t.seq}
				if t.skip != nil {
					r.skips = []Skip{*t.skip}
				} else if raw, rd, why := readRegular(fsys, fr, t.path, t.d, &opts); why != "" {
					r.skips = []Skip{{Path: t.path, Reason: why}}
				} else if g.admit(t.seq, len(raw)) {
					r.size = len(raw)
					r.docs, r.skips = extractOne(t.path, raw, rd, &opts)
					for i := range r.docs {
						r.rs = append(r.rs, work(r.docs[i]))
						r.docs[i].Text = ""
					}
				}
				select {
				case results <- r:
				case <-done:
				}
			}
		})
	}
	go func() {
		wg.Wait()
		close(results)
	}()

	var skips []Skip
	var collectErr error
	pending := map[int]result{}
	next := 0
	stopped := false
	for r := range results {
		if stopped {
			continue
		}
		pending[r.seq] = r
		for {
			q, ok := pending[next]
			if !ok {
				break
			}
			delete(pending, next)
			next++
			g.collected(next, q.size)
			<-inFlight
			skips = append(skips, q.skips...)
			for i, d := range q.docs {
				if err := collect(d, q.rs[i]); err != nil {
					if !errors.Is(err, ErrStop) {
						collectErr = err
					}
					stopped = true
					close(done)
					g.stop()
					break
				}
			}
			if stopped {
				break
			}
		}
	}
	if collectErr != nil {
		return skips, collectErr
	}
	if rootErr != nil {
		return skips, rootErr
	}
	return skips, nil
}

// The bounds of WalkParallel's pipeline, per job. Measured on the
// generated 100,000-document corpus (bench/ingestpipe, two workers, four
// interleaved triples of 3-run medians): 8 files in flight 3.32-3.47 s,
// 64 files 3.07-3.34 s (-5%), 256 no better than 64. With few files in
// flight a long document holds up the other worker, which soon has done
// every file up to the window's end; the byte bound is never reached on
// such a corpus, only where large files are done out of order.
const filesInFlight = 32

// bytesInFlight is a variable so that the tests can make it small.
var bytesInFlight = 32 << 20

// gate holds back WalkParallel's workers while the files they have done,
// and collect has not yet taken, come to more than a number of bytes. The
// file collect waits for (sequence number next) never waits, so the
// pipeline cannot stall.
type gate struct {
	mu      sync.Mutex
	cond    sync.Cond
	limit   int
	held    int // bytes of the files admitted and not collected
	next    int // the sequence number collect waits for
	stopped bool
}

func newGate(limit int) *gate {
	g := &gate{limit: limit}
	g.cond.L = &g.mu
	return g
}

// admit waits until the file with sequence number seq and size bytes may
// be worked on, and reports false if the walk stopped meanwhile.
func (g *gate) admit(seq, size int) bool {
	g.mu.Lock()
	defer g.mu.Unlock()
	for !g.stopped && seq != g.next && g.held > 0 && g.held+size > g.limit {
		g.cond.Wait()
	}
	g.held += size
	return !g.stopped
}

// collected records that collect took a file of size bytes, and now waits
// for sequence number next.
func (g *gate) collected(next, size int) {
	g.mu.Lock()
	g.held -= size
	g.next = next
	g.mu.Unlock()
	g.cond.Broadcast()
}

// stop releases every waiting worker.
func (g *gate) stop() {
	g.mu.Lock()
	g.stopped = true
	g.mu.Unlock()
	g.cond.Broadcast()
}

// extractOne extracts the documents of the file p, read as raw, as Walk
// does: its documents, and its skips (the parts of it, then the file
// itself).
func extractOne(p string, raw []byte, rd reader, opts *Options) ([]Document, []Skip) {
	docs, inner, err := extract(p, raw, rd, opts)
	if err != nil {
		return nil, append(inner, Skip{Path: p, Reason: err.Error()})
	}
	if len(docs) == 0 && len(inner) == 0 {
		inner = append(inner, Skip{Path: p, Reason: "no documents in the file"})
	}
	return docs, inner
}

// readRegular reads a file as [readFile] does, in fewer system calls when
// the directory entry says it is a plain regular file (not a symbolic
// link): through fr when the worker has one (see RootFS), else it opens
// the file, takes its size from the open file instead of looking the path
// up a second time, and reads it into a buffer of that size in one call
// (and one more to see the end of the file). Anything out of the ordinary
// (another kind of entry, an error, a size of zero or above the limit, a
// file that is not where its size says it ends) goes to readFile, which
// gives the same result or the same reason as it always does.
func readRegular(fsys fs.FS, fr fileReader, p string, d fs.DirEntry, opts *Options) ([]byte, reader, string) {
	rd, ok := readers[strings.ToLower(path.Ext(p))]
	if !ok || d == nil || !d.Type().IsRegular() {
		return readFile(fsys, p, d, *opts)
	}
	var raw []byte
	if fr != nil {
		raw, ok = fr.read(p, opts.MaxBytes)
	} else {
		f, err := fsys.Open(p)
		if err != nil {
			return readFile(fsys, p, d, *opts)
		}
		raw, ok = readSized(f, opts.MaxBytes)
		f.Close()
	}
	if !ok {
		return readFile(fsys, p, d, *opts)
	}
	if rd.text {
		if why := binaryReason(raw); why != "" {
			return nil, reader{}, why
		}
	}
	return raw, rd, ""
}

// readSized reads f whole when it is a regular file of a size from 1 to
// limit bytes that ends where its size says; ok is false otherwise.
func readSized(f fs.File, limit int64) (raw []byte, ok bool) {
	info, err := f.Stat()
	if err != nil || !info.Mode().IsRegular() || info.Size() <= 0 || info.Size() > limit {
		return nil, false
	}
	raw = make([]byte, info.Size())
	if _, err := io.ReadFull(f, raw); err != nil {
		return nil, false
	}
	var probe [1]byte
	if n, err := f.Read(probe[:]); n != 0 || err != io.EOF {
		return nil, false // the file is longer than its size said
	}
	return raw, true
}
