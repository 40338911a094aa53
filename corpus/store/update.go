package store

import (
	"bytes"
	"cmp"
	"context"
	"crypto/sha256"
	"database/sql"
	"errors"
	"fmt"
	"hash"
	"io"
	"io/fs"
	"path"
	"slices"
	"strconv"
	"strings"
	"sync"
	"time"

	"assay/corpus"
)

// RacyWindow: a file whose modification time is later than RacyWindow
// before the start of the previous update is hashed by the next update
// even when its size, mode and time are unchanged, because a second write
// within the same tick of the file system's clock would not have changed
// its time. Two seconds covers the coarsest timestamps in common use (FAT
// keeps modification times to 2 s; HFS+ and many network file systems to
// 1 s; Linux file systems to a clock tick of a few milliseconds).
const RacyWindow = 2 * time.Second

// Analysis is what the caller's analyzer found in one document: every
// index term with its number of occurrences, every (term, surface form)
// pair with its number of occurrences, the language of analysis, and a
// signature. Counts must be at least 1.
type Analysis struct {
	Terms map[string]int
	Forms map[[2]string]int
	Lang  string
	// Sig is a signature of the document computed by the caller (for
	// instance the MinHash values of its word shingles), stored as given
	// and handed back by Load; nil stays nil.
	Sig []uint32
}

// UpdateOptions configures [Store.Update]. The zero value reads with the
// corpus defaults, one worker, no texts kept.
type UpdateOptions struct {
	// Read are the options of the corpus readers (the walk's Include and
	// Exclude among them).
	Read corpus.Options
	// Key is the canonical string of every option that shapes what is
	// stored: the reading options in Read and the analysis options of the
	// caller's analyzer. An update with another Key than the store's fails
	// with ErrOptionsChanged, unless Rebuild is set.
	Key string
	// Jobs is the number of goroutines that read and analyse files; < 1
	// means 1. What is stored does not depend on it.
	Jobs int
	// KeepText stores each document's text too. It is part of the store's
	// options: changing it needs Rebuild.
	KeepText bool
	// Rebuild empties the store first, whatever options it was built with,
	// in the same transaction as the new contents.
	Rebuild bool
	// Progress, when set, is called after each file is handled, in walk
	// order, from the goroutine that called Update.
	Progress func()
}

// Changes reports what [Store.Update] did. Paths are slash paths relative
// to the root, in walk order.
type Changes struct {
	// Added are the files (and unreadable folders) new since the last
	// update; Changed those read again because their size, mode or
	// modification time changed (and, where it could be compared, their
	// content); Removed those gone from the folder.
	Added, Changed, Removed []string
	// Unchanged counts the files kept as they were, Retimed those of them
	// whose modification time changed while their content did not (they
	// were hashed, not analysed).
	Unchanged, Retimed int
	// Rebuilt is set when the store was emptied first.
	Rebuilt bool
	// DocumentsRead counts the documents read and analysed by this update;
	// Documents and Files those in the store after it (Files counting
	// unreadable folders too).
	DocumentsRead, Documents, Files int
	// Skipped lists every file or part of one in the store that was not
	// read as a document, with the reason, in walk order (as corpus.Walk
	// would return them).
	Skipped []corpus.Skip
}

// String summarises the changes on one line.
func (c *Changes) String() string {
	s := fmt.Sprintf("%d added, %d changed, %d removed, %d unchanged", len(c.Added), len(c.Changed), len(c.Removed), c.Unchanged)
	if c.Retimed > 0 {
		s += fmt.Sprintf(" (%d with a new modification time only)", c.Retimed)
	}
	s += fmt.Sprintf("; %d documents read; the store holds %d documents of %d files, %d skipped", c.DocumentsRead, c.Documents, c.Files, len(c.Skipped))
	if c.Rebuilt {
		s += "; rebuilt"
	}
	return s
}

// Entry kinds in the files table.
const (
	kindFile      = 0
	kindWalkError = 1
)

// fileRow is a row of the files table, as an update finds it.
type fileRow struct {
	id          int64
	path        string
	kind        int
	size, mtime int64
	mode        uint32
	hash        []byte // sum[:], or nil when the content was not read
	sum         [32]byte
	reason      string // the skip of a kindWalkError entry
}

// action is what an update does with one entry of the walk.
type action int

const (
	actKeep      action = iota // unchanged: not read, not sent to a worker
	actCheck                   // same size, other time: hash it, compare
	actRead                    // new or changed: read and analyse
	actWalkError               // the walk could not read it
	actDecide                  // a file stated, to be decided on
)

// item is one entry of the walk.
type item struct {
	seq   int
	path  string
	entry fs.DirEntry
	act   action
	prev  *fileRow // nil for a new path
	size  int64    // -1: unknown
	mtime int64
	mode  uint32
	skip  corpus.Skip // of actWalkError
	// keptBefore counts the unchanged files the walk met since the
	// previous item it sent on.
	keptBefore int
}

// outcome is what a worker made of an item.
type outcome struct {
	item
	touched bool   // actCheck found the content unchanged
	hash    []byte // of the content read, nil when not read to its end
	docs    []corpus.Document
	ans     []Analysis
	texts   []string
	skips   []corpus.Skip
	err     error
}

// docOut is what the per-document work gives the collector.
type docOut struct {
	a    Analysis
	text string
}

// Update brings the store up to date with the folder fsys: it walks fsys as
// corpus.Walk does (lexical order; hidden files, Include and Exclude as
// there), keeps the files whose size, mode and modification time are
// unchanged without reading them, hashes those whose time alone changed
// (keeping them when the content is the same), reads and analyses the new
// and changed ones with the corpus readers, and removes the files that are
// gone. Each of Jobs workers gets its own analysis function from newWorker
// (called at most once per worker, and only when there is something to
// read), so it can keep state such as an analyzer.
//
// The whole update is one transaction: on an error, a cancelled ctx, a
// crash or a kill the store keeps its previous contents. Another update of
// the same store waits for this one (up to the busy timeout, then
// ErrBusy); loads go on reading the previous contents until it commits.
//
// When the store was built with another o.Key or o.KeepText, Update fails
// with ErrOptionsChanged unless o.Rebuild is set.
func (s *Store) Update(ctx context.Context, fsys fs.FS, o UpdateOptions, newWorker func() func(corpus.Document) Analysis) (*Changes, error) {
	if o.Read.MaxBytes <= 0 {
		o.Read.MaxBytes = corpus.DefaultMaxBytes
	}
	o.Jobs = max(o.Jobs, 1)
	tx, err := s.db.BeginTx(ctx, nil) // BEGIN IMMEDIATE (the _txlock of the DSN)
	if err != nil {
		return nil, fmt.Errorf("update %s: %w", s.path, classify(err))
	}
	defer tx.Rollback()
	u := &updater{ctx: ctx, tx: tx, fsys: fsys, o: o, newWorker: newWorker, ch: &Changes{}, ids: map[string]int64{}, lastID: -1}
	if err := u.run(); err != nil {
		return nil, fmt.Errorf("update %s: %w", s.path, err)
	}
	if err := tx.Commit(); err != nil {
		return nil, fmt.Errorf("update %s: commit: %w", s.path, classify(err))
	}
	return u.ch, nil
}

// updater holds the state of one Update.
type updater struct {
	ctx       context.Context
	tx        *sql.Tx
	fsys      fs.FS
	o         UpdateOptions
	newWorker func() func(corpus.Document) Analysis
	ch        *Changes

	prev          map[string]*fileRow
	prevIndexedAt int64
	seen          map[int64]bool
	ids           map[string]int64 // word -> id, of the words met so far
	lastID        int64            // the largest word id; -1 until read
	stmts         map[string]*sql.Stmt
}

func (u *updater) run() error {
	meta, err := readMeta(u.ctx, u.tx)
	if err != nil {
		return err
	}
	keep := boolString(u.o.KeepText)
	if built, ok := meta["options"]; ok && !u.o.Rebuild && (built != u.o.Key || meta["keep_text"] != keep) {
		return fmt.Errorf("%w: the store was built with %q (texts kept: %s), this update asks for %q (texts kept: %s); rebuild with --rebuild or use a new store",
			ErrOptionsChanged, built, yesNo(meta["keep_text"] == "1"), u.o.Key, yesNo(u.o.KeepText))
	}
	if u.o.Rebuild {
		for _, t := range []string{"texts", "documents", "skips", "files", "words"} {
			if _, err := u.tx.ExecContext(u.ctx, "DELETE FROM "+t); err != nil {
				return classify(err)
			}
		}
		u.ch.Rebuilt = true
	} else if v, ok := meta["indexed_at"]; ok {
		u.prevIndexedAt, _ = strconv.ParseInt(v, 10, 64)
	}
	startedAt := time.Now().UnixNano()
	if err := u.pipeline(); err != nil {
		return err
	}
	if err := u.removeUnseen(); err != nil {
		return err
	}
	for k, v := range map[string]string{"options": u.o.Key, "keep_text": keep, "indexed_at": strconv.FormatInt(startedAt, 10)} {
		if _, err := u.tx.ExecContext(u.ctx, "INSERT OR REPLACE INTO meta(name, value) VALUES(?, ?)", k, v); err != nil {
			return classify(err)
		}
	}
	return u.summarise()
}

func boolString(b bool) string {
	if b {
		return "1"
	}
	return "0"
}

func yesNo(b bool) string {
	if b {
		return "yes"
	}
	return "no"
}

// loadFiles reads the files table, and the skip of each walk-error
// entry.
func (u *updater) loadFiles() error {
	u.prev = map[string]*fileRow{}
	u.seen = map[int64]bool{}
	rows, err := u.tx.QueryContext(u.ctx, "SELECT id, path, kind, size, mtime_ns, mode, sha256 FROM files")
	if err != nil {
		return classify(err)
	}
	defer rows.Close()
	var errored []*fileRow
	for rows.Next() {
		r := &fileRow{}
		var h sql.RawBytes
		if err := rows.Scan(&r.id, &r.path, &r.kind, &r.size, &r.mtime, &r.mode, &h); err != nil {
			return classify(err)
		}
		if len(h) == len(r.sum) {
			copy(r.sum[:], h)
			r.hash = r.sum[:]
		}
		if r.kind == kindWalkError {
			errored = append(errored, r)
		}
		u.prev[r.path] = r
	}
	if err := rows.Err(); err != nil {
		return classify(err)
	}
	for _, r := range errored {
		if err := u.tx.QueryRowContext(u.ctx, "SELECT reason FROM skips WHERE file = ? AND pos = 0", r.id).Scan(&r.reason); err != nil && !errors.Is(err, sql.ErrNoRows) {
			return classify(err)
		}
	}
	return nil
}

// mtimeNS gives a modification time in Unix nanoseconds, 0 when it is
// unknown (the zero time) or outside what int64 nanoseconds hold.
func mtimeNS(t time.Time) int64 {
	if t.IsZero() || t.Year() < 1678 || t.Year() > 2261 {
		return 0
	}
	return t.UnixNano()
}

// stat fills in the size, time and mode of a file entry: of the file a
// symbolic link points to (as the readers see it), with ModeSymlink kept.
func (u *updater) stat(it *item) {
	it.size = -1
	var info fs.FileInfo
	var err error
	if it.entry.Type()&fs.ModeSymlink != 0 {
		info, err = fs.Stat(u.fsys, it.path)
	} else {
		info, err = it.entry.Info()
	}
	if err != nil {
		return
	}
	it.size = info.Size()
	it.mtime = mtimeNS(info.ModTime())
	it.mode = uint32(info.Mode() | it.entry.Type()&fs.ModeSymlink)
}

// decide chooses the action for a file entry from its stored row.
func (u *updater) decide(it *item) {
	p := it.prev
	it.act = actRead
	if p == nil || p.kind != kindFile || p.size < 0 || it.size < 0 || it.size != p.size || it.mode != p.mode {
		return
	}
	racy := it.mtime == 0 || p.mtime+int64(RacyWindow) > u.prevIndexedAt
	if it.mtime == p.mtime && !racy {
		it.act = actKeep
		return
	}
	if p.hash != nil && (fs.FileMode(it.mode) &^ fs.ModeSymlink).IsRegular() {
		it.act = actCheck
	}
}

// lookAhead is how many entries the walk may stat before the files table
// has been read (the two overlap).
const lookAhead = 1 << 16

// pipeline reads the files table while one goroutine walks the folder and
// states its files; that goroutine then decides what each file needs,
// counts the unchanged ones itself and hands the others to Jobs workers,
// whose outcomes the calling goroutine (which owns the transaction)
// applies to the database in walk order. At most 4·Jobs entries are in
// flight between the walk and the database.
func (u *updater) pipeline() error {
	jobs := u.o.Jobs
	tasks := make(chan item, jobs)
	results := make(chan outcome, jobs)
	inFlight := make(chan struct{}, 4*jobs)
	done := make(chan struct{})
	prevReady := make(chan struct{})
	errStop := errors.New("stop")
	var walkErr error
	var kept []int64 // ids of the unchanged files: the walker's until it ends
	keptTail := 0    // unchanged files after the last entry sent on
	opts := u.o.Read

	go func() { // the walker, filtering as corpus.WalkParallel does
		defer close(tasks)
		seq, run := 0, 0
		send := func(it item) bool {
			it.prev = u.prev[it.path]
			if it.act == actDecide {
				u.decide(&it)
			}
			if it.act == actKeep {
				kept = append(kept, it.prev.id)
				run++
				return true
			}
			it.keptBefore, run = run, 0
			select {
			case inFlight <- struct{}{}:
			case <-done:
				return false
			}
			it.seq = seq
			seq++
			select {
			case tasks <- it:
				return true
			case <-done:
				return false
			}
		}
		var early []item // entries met before the files table was read
		ready := false
		flush := func() bool {
			select {
			case <-prevReady:
			case <-done:
				return false
			}
			ready = true
			for _, e := range early {
				if !send(e) {
					return false
				}
			}
			early = nil
			return true
		}
		offer := func(it item) bool {
			if !ready {
				select {
				case <-prevReady:
				default:
					if len(early) < lookAhead {
						early = append(early, it)
						return true
					}
				}
				if !flush() {
					return false
				}
			}
			return send(it)
		}
		err := corpus.WalkFiles(u.fsys, opts, func(s corpus.Skip) error {
			if !offer(item{path: s.Path, act: actWalkError, size: -1, skip: s}) {
				return errStop
			}
			return nil
		}, func(p string, d fs.DirEntry) error {
			it := item{path: p, entry: d, act: actDecide}
			u.stat(&it)
			if !offer(it) {
				return errStop
			}
			return nil
		})
		if err == nil && !ready && !flush() {
			err = errStop
		}
		keptTail = run
		if err != nil && !errors.Is(err, errStop) {
			walkErr = err
		}
	}()

	var wg sync.WaitGroup
	for range jobs {
		wg.Go(func() {
			w := &worker{u: u}
			for it := range tasks {
				r := w.handle(it)
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

	var applyErr error
	stopped := false
	stop := func(err error) {
		applyErr = err
		stopped = true
		close(done)
	}
	progress := func(n int) {
		if u.o.Progress != nil {
			for range n {
				u.o.Progress()
			}
		}
	}
	if err := u.loadFiles(); err != nil {
		stop(err)
	} else {
		close(prevReady)
	}
	pending := map[int]outcome{}
	next := 0
	for r := range results {
		if stopped {
			continue
		}
		pending[r.seq] = r
		for !stopped {
			q, ok := pending[next]
			if !ok {
				break
			}
			delete(pending, next)
			next++
			<-inFlight
			progress(q.keptBefore)
			if err := u.ctx.Err(); err != nil {
				stop(err)
				break
			}
			if err := u.apply(&q); err != nil {
				stop(err)
				break
			}
			progress(1)
		}
	}
	if applyErr != nil {
		return applyErr
	}
	if walkErr != nil {
		return walkErr
	}
	if err := u.ctx.Err(); err != nil {
		return err
	}
	progress(keptTail)
	for _, id := range kept {
		u.seen[id] = true
	}
	u.ch.Unchanged += len(kept)
	return nil
}

// worker handles items in one goroutine, with its own analysis function.
type worker struct {
	u    *updater
	work func(corpus.Document) docOut
}

// handle works out one item: hashes it (actCheck) or reads and analyses it
// (actRead, and actCheck when the content changed).
func (w *worker) handle(it item) outcome {
	r := outcome{item: it}
	switch it.act {
	case actWalkError:
		r.skips = []corpus.Skip{it.skip}
		return r
	case actCheck:
		if h := hashFile(w.u.fsys, it.path, w.u.o.Read.MaxBytes); h != nil && bytes.Equal(h, it.prev.hash) {
			r.touched = true
			r.hash = h
			return r
		}
	}
	if w.work == nil {
		analyse := w.u.newWorker()
		keep := w.u.o.KeepText
		w.work = func(d corpus.Document) docOut {
			out := docOut{a: analyse(d)}
			if keep {
				out.text = d.Text
			}
			return out
		}
	}
	sfs := &singleFS{base: w.u.fsys, path: it.path, entry: it.entry}
	skips, err := corpus.WalkParallel(sfs, w.u.o.Read, 1,
		func() func(corpus.Document) docOut { return w.work },
		func(d corpus.Document, out docOut) error {
			r.docs = append(r.docs, d)
			r.ans = append(r.ans, out.a)
			r.texts = append(r.texts, out.text)
			return nil
		})
	r.skips, r.err, r.hash = skips, err, sfs.hash
	return r
}

// hashFile returns the SHA-256 of the file p, or nil when it cannot be
// read whole within maxBytes.
func hashFile(fsys fs.FS, p string, maxBytes int64) []byte {
	f, err := fsys.Open(p)
	if err != nil {
		return nil
	}
	defer f.Close()
	h := sha256.New()
	n, err := io.Copy(h, io.LimitReader(f, maxBytes+1))
	if err != nil || n > maxBytes {
		return nil
	}
	return h.Sum(nil)
}

// apply writes one outcome to the database.
func (u *updater) apply(r *outcome) error {
	if r.err != nil {
		return fmt.Errorf("read %s: %w", r.path, r.err)
	}
	if r.prev != nil {
		u.seen[r.prev.id] = true
	}
	switch {
	case r.touched:
		u.ch.Unchanged++
		if r.mtime == r.prev.mtime {
			return nil // hashed because the time could not be trusted
		}
		u.ch.Retimed++
		return u.exec("UPDATE files SET mtime_ns = ? WHERE id = ?", r.mtime, r.prev.id)
	case r.act == actWalkError && r.prev != nil && r.prev.kind == kindWalkError && r.prev.reason == r.skip.Reason:
		u.ch.Unchanged++
		return nil
	}
	kind := kindFile
	if r.act == actWalkError {
		kind = kindWalkError
	}
	var fileID int64
	if r.prev == nil {
		res, err := u.stmt("INSERT INTO files(walk_key, path, kind, size, mtime_ns, mode, sha256) VALUES(?, ?, ?, ?, ?, ?, ?)").
			ExecContext(u.ctx, walkKey(r.path), r.path, kind, r.size, r.mtime, r.mode, r.hash)
		if err != nil {
			return classify(err)
		}
		if fileID, err = res.LastInsertId(); err != nil {
			return err
		}
		u.ch.Added = append(u.ch.Added, r.path)
	} else {
		fileID = r.prev.id
		if err := u.exec("UPDATE files SET kind = ?, size = ?, mtime_ns = ?, mode = ?, sha256 = ? WHERE id = ?",
			kind, r.size, r.mtime, r.mode, r.hash, fileID); err != nil {
			return err
		}
		if err := u.exec("DELETE FROM documents WHERE file = ?", fileID); err != nil {
			return err
		}
		if err := u.exec("DELETE FROM skips WHERE file = ?", fileID); err != nil {
			return err
		}
		u.ch.Changed = append(u.ch.Changed, r.path)
	}
	for i, sk := range r.skips {
		if err := u.exec("INSERT INTO skips(file, pos, path, reason) VALUES(?, ?, ?, ?)", fileID, i, sk.Path, sk.Reason); err != nil {
			return err
		}
	}
	for i := range r.docs {
		if err := u.insertDoc(fileID, i, r.path, r.hash, &r.docs[i], &r.ans[i], r.texts[i]); err != nil {
			return err
		}
	}
	u.ch.DocumentsRead += len(r.docs)
	return nil
}

// insertDoc writes one document and, when texts are kept, its text.
func (u *updater) insertDoc(fileID int64, pos int, filePath string, fileHash []byte, d *corpus.Document, a *Analysis, text string) error {
	terms, forms, err := u.encode(d.ID, a)
	if err != nil {
		return err
	}
	var docID, hash any = d.ID, d.Hash[:]
	if d.ID == filePath {
		docID = nil
	}
	if bytes.Equal(d.Hash[:], fileHash) {
		hash = nil
	}
	var sig any
	if a.Sig != nil {
		sig = appendSig(make([]byte, 0, 4*len(a.Sig)), a.Sig)
	}
	res, err := u.stmt(`INSERT INTO documents(file, pos, doc_id, title, size, sha256, format, lang, repaired, container,
		mail_from, mail_to, mail_cc, mail_date, message_id, terms, forms, sig) VALUES(?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)`).
		ExecContext(u.ctx, fileID, pos, docID, d.Title, d.Size, hash, d.Format, a.Lang, d.Repaired, nullable(d.Container),
			nullable(d.Meta.From), nullable(d.Meta.To), nullable(d.Meta.Cc), nullable(d.Meta.Date), nullable(d.Meta.MessageID), terms, forms, sig)
	if err != nil {
		return classify(err)
	}
	if !u.o.KeepText {
		return nil
	}
	id, err := res.LastInsertId()
	if err != nil {
		return err
	}
	return u.exec("INSERT INTO texts(doc, text) VALUES(?, ?)", id, text)
}

// nullable stores "" as NULL.
func nullable(s string) any {
	if s == "" {
		return nil
	}
	return s
}

// encode interns the words of an analysis and encodes its two BLOBs. New
// words get ids in the order of the sorted terms, then of the sorted
// forms, so that the ids depend on nothing but the documents' order.
func (u *updater) encode(id string, a *Analysis) (terms, forms []byte, err error) {
	keys := make([]string, 0, len(a.Terms))
	for t := range a.Terms {
		keys = append(keys, t)
	}
	slices.Sort(keys)
	tc := make([]termCount, 0, len(keys))
	for _, t := range keys {
		n := a.Terms[t]
		if n < 1 {
			return nil, nil, fmt.Errorf("analysis of %s: count %d for term %q", id, n, t)
		}
		wid, err := u.intern(t)
		if err != nil {
			return nil, nil, err
		}
		tc = append(tc, termCount{wid, n})
	}
	slices.SortFunc(tc, func(x, y termCount) int { return cmp.Compare(x.id, y.id) })
	fkeys := make([][2]string, 0, len(a.Forms))
	for f := range a.Forms {
		fkeys = append(fkeys, f)
	}
	slices.SortFunc(fkeys, func(x, y [2]string) int {
		if c := strings.Compare(x[0], y[0]); c != 0 {
			return c
		}
		return strings.Compare(x[1], y[1])
	})
	fc := make([]formCount, 0, len(fkeys))
	for _, f := range fkeys {
		n := a.Forms[f]
		if n < 1 {
			return nil, nil, fmt.Errorf("analysis of %s: count %d for form %q of term %q", id, n, f[1], f[0])
		}
		tid, err := u.intern(f[0])
		if err != nil {
			return nil, nil, err
		}
		fid, err := u.intern(f[1])
		if err != nil {
			return nil, nil, err
		}
		fc = append(fc, formCount{tid, fid, n})
	}
	slices.SortFunc(fc, func(x, y formCount) int {
		if c := cmp.Compare(x.term, y.term); c != 0 {
			return c
		}
		return cmp.Compare(x.form, y.form)
	})
	return appendTerms(make([]byte, 0, 3*len(tc)), tc), appendForms(make([]byte, 0, 4*len(fc)), fc), nil
}

// intern returns the id of word w, adding it to the words table if new.
// Words are looked up one by one as documents need them (and kept), so an
// update that reads little does not read the whole vocabulary.
func (u *updater) intern(w string) (int64, error) {
	if id, ok := u.ids[w]; ok {
		return id, nil
	}
	var id int64
	err := u.stmt("SELECT id FROM words WHERE word = ?").QueryRowScan(u.ctx, []any{w}, &id)
	switch {
	case err == nil:
		u.ids[w] = id
		return id, nil
	case !errors.Is(err, sql.ErrNoRows):
		return 0, classify(err)
	}
	if u.lastID < 0 {
		if err := u.tx.QueryRowContext(u.ctx, "SELECT coalesce(max(id), 0) FROM words").Scan(&u.lastID); err != nil {
			return 0, classify(err)
		}
	}
	id = u.lastID + 1
	if err := u.exec("INSERT INTO words(id, word) VALUES(?, ?)", id, w); err != nil {
		return 0, err
	}
	u.lastID = id
	u.ids[w] = id
	return id, nil
}

// stmt returns the prepared statement of query in the transaction,
// preparing it the first time.
func (u *updater) stmt(query string) *preparedStmt {
	if u.stmts == nil {
		u.stmts = map[string]*sql.Stmt{}
	}
	st, ok := u.stmts[query]
	if !ok {
		var err error
		st, err = u.tx.PrepareContext(u.ctx, query)
		if err != nil {
			return &preparedStmt{err: classify(err)}
		}
		u.stmts[query] = st
	}
	return &preparedStmt{st: st}
}

// preparedStmt carries a statement or the error that preparing it gave.
type preparedStmt struct {
	st  *sql.Stmt
	err error
}

// ExecContext runs the statement.
func (p *preparedStmt) ExecContext(ctx context.Context, args ...any) (sql.Result, error) {
	if p.err != nil {
		return nil, p.err
	}
	return p.st.ExecContext(ctx, args...)
}

// QueryRowScan runs the statement as a query of one row into dest.
func (p *preparedStmt) QueryRowScan(ctx context.Context, args []any, dest ...any) error {
	if p.err != nil {
		return p.err
	}
	return p.st.QueryRowContext(ctx, args...).Scan(dest...)
}

// exec runs a prepared statement for its effect.
func (u *updater) exec(query string, args ...any) error {
	_, err := u.stmt(query).ExecContext(u.ctx, args...)
	return classify(err)
}

// removeUnseen deletes the files that the walk did not meet, in walk order
// (their documents, texts and skips go with them).
func (u *updater) removeUnseen() error {
	var gone []*fileRow
	for _, r := range u.prev {
		if !u.seen[r.id] {
			gone = append(gone, r)
		}
	}
	slices.SortFunc(gone, func(x, y *fileRow) int { return bytes.Compare(walkKey(x.path), walkKey(y.path)) })
	for _, r := range gone {
		if err := u.exec("DELETE FROM files WHERE id = ?", r.id); err != nil {
			return err
		}
		u.ch.Removed = append(u.ch.Removed, r.path)
	}
	return nil
}

// summarise fills in the counts and skips of the store after the update.
func (u *updater) summarise() error {
	for _, c := range []struct {
		n     *int
		query string
	}{{&u.ch.Documents, "SELECT count(*) FROM documents"}, {&u.ch.Files, "SELECT count(*) FROM files"}} {
		if err := u.tx.QueryRowContext(u.ctx, c.query).Scan(c.n); err != nil {
			return classify(err)
		}
	}
	skips, err := readSkips(u.ctx, u.tx)
	u.ch.Skipped = skips
	return err
}

// readSkips reads every skip in walk order.
func readSkips(ctx context.Context, q querier) ([]corpus.Skip, error) {
	rows, err := q.QueryContext(ctx, "SELECT s.path, s.reason FROM files f JOIN skips s ON s.file = f.id ORDER BY f.walk_key, s.pos")
	if err != nil {
		return nil, classify(err)
	}
	defer rows.Close()
	var skips []corpus.Skip
	for rows.Next() {
		var sk corpus.Skip
		if err := rows.Scan(&sk.Path, &sk.Reason); err != nil {
			return nil, classify(err)
		}
		skips = append(skips, sk)
	}
	return skips, classify(rows.Err())
}

// walkKey is the files table's ordering key of a slash path: the path with
// each "/" as a 0x00 byte. fs.WalkDir visits each folder's entries sorted
// by name and a folder's contents where the folder's name sorts, which is
// the order of the paths compared name by name; a 0x00 separator, lower
// than any byte of a name, makes the bytewise order of the keys that
// order ("a/z" before "a-b", while "a-b" < "a/z" as strings).
func walkKey(p string) []byte {
	k := []byte(p)
	for i, c := range k {
		if c == '/' {
			k[i] = 0
		}
	}
	return k
}

// singleFS shows one file of base, and the folders on the way to it: the
// view through which corpus.WalkParallel reads just that file, with the
// exact reader rules, IDs and skips of a walk of the whole folder. It
// hashes the file's content as the reader reads it.
type singleFS struct {
	base  fs.FS
	path  string      // the file shown
	entry fs.DirEntry // its entry in its folder, from the update's walk
	hash  []byte      // SHA-256 of its content, once read to its end
}

// ancestor reports whether the folder name lies on the way to the file.
func (f *singleFS) ancestor(name string) bool {
	return name == "." || strings.HasPrefix(f.path, name+"/")
}

// Open opens the shown file (only it), hashing what is read.
func (f *singleFS) Open(name string) (fs.File, error) {
	if name != f.path {
		return nil, &fs.PathError{Op: "open", Path: name, Err: fs.ErrNotExist}
	}
	file, err := f.base.Open(name)
	if err != nil {
		return nil, err
	}
	return &hashingFile{File: file, h: sha256.New(), owner: f}, nil
}

// Stat states the file from base, and the folders on the way as folders.
func (f *singleFS) Stat(name string) (fs.FileInfo, error) {
	if name == f.path {
		return fs.Stat(f.base, name)
	}
	if f.ancestor(name) {
		return dirInfo(path.Base(name)), nil
	}
	return nil, &fs.PathError{Op: "stat", Path: name, Err: fs.ErrNotExist}
}

// ReadDir lists the one entry of a folder on the way to the file.
func (f *singleFS) ReadDir(name string) ([]fs.DirEntry, error) {
	if !f.ancestor(name) {
		return nil, &fs.PathError{Op: "readdir", Path: name, Err: fs.ErrNotExist}
	}
	rest := f.path
	if name != "." {
		rest = f.path[len(name)+1:]
	}
	if i := strings.IndexByte(rest, '/'); i >= 0 {
		return []fs.DirEntry{fs.FileInfoToDirEntry(dirInfo(rest[:i]))}, nil
	}
	return []fs.DirEntry{f.entry}, nil
}

// hashingFile hashes what is read from it; at the end of the file it
// gives the hash to its singleFS.
type hashingFile struct {
	fs.File
	h     hash.Hash
	owner *singleFS
}

func (h *hashingFile) Read(b []byte) (int, error) {
	n, err := h.File.Read(b)
	h.h.Write(b[:n])
	if err == io.EOF {
		h.owner.hash = h.h.Sum(nil)
	}
	return n, err
}

// dirInfo is the FileInfo of a folder shown by singleFS.
type dirInfo string

func (d dirInfo) Name() string       { return string(d) }
func (d dirInfo) Size() int64        { return 0 }
func (d dirInfo) Mode() fs.FileMode  { return fs.ModeDir | 0o755 }
func (d dirInfo) ModTime() time.Time { return time.Time{} }
func (d dirInfo) IsDir() bool        { return true }
func (d dirInfo) Sys() any           { return nil }
