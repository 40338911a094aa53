package sparsemat

import (
	"encoding/binary"
	"errors"
	"fmt"
	"hash/maphash"
	"math/bits"
	"runtime"
	"slices"
	"strings"
	"sync"
	"sync/atomic"

	"github.com/james-bowman/sparse"
)

// errCountedOutside is the panic of a counted row holding an ID that the
// builder's vocabulary did not give (found by AddCounted or by Build).
const errCountedOutside = "sparsemat: AddCounted with a term ID outside the vocabulary"

// ErrNoTerms is returned by [Builder.Build] when pruning leaves no term.
var ErrNoTerms = errors.New("no terms left after pruning")

// Vocabulary gives terms provisional IDs. It is safe for concurrent use,
// so that the goroutines that analyse documents can turn terms into IDs
// themselves and hand the [Builder] rows of IDs. The IDs depend on the
// order terms are first asked for, and so on scheduling; the matrix that
// [Builder.Build] makes does not, because it orders the columns by term.
//
// The terms are split by a hash into vocabShards shards, each with its
// own lock, its own open-addressing table and its own run of IDs: the kth
// term of shard s has ID k·vocabShards + s. So a new term takes no lock
// but its shard's, and a term another goroutine has numbered is found
// without one (the table is read with atomic loads; a miss is checked
// again under the lock). The IDs are dense up to a few per cent: the
// shards fill about evenly, and the first terms asked for, the frequent
// ones, have the smallest IDs.
type Vocabulary struct {
	shards [vocabShards]vocabShard
}

const (
	vocabShardBits = 5
	vocabShards    = 1 << vocabShardBits
)

type vocabShard struct {
	mu    sync.Mutex
	tab   atomic.Pointer[vocabTable]
	terms []string     // by index in the shard; guarded by mu
	n     atomic.Int32 // len(terms), readable without mu
	_     [24]byte     // a cache line to each shard
}

// vocabTable is a shard's index: linear probing, at most half full. A slot
// is published by an atomic store of its word (the term's hash tag in the
// high half, its index in the shard plus one in the low half) after its
// key is written, and never changes afterwards; a larger table replaces
// the whole table.
type vocabTable struct {
	words []atomic.Uint64
	keys  []string
}

// vocabSeed seeds the hash of terms (which changes how the work is shared
// out and the provisional IDs, never the matrix).
var vocabSeed = maphash.MakeSeed()

// vocabFirstSlots is the size of a shard's first table: 32 shards of 1024
// slots take 768 KiB and hold 16,384 terms before the first doubling.
const vocabFirstSlots = 1024

// maxShardTerms bounds a shard so that every ID fits an int32.
const maxShardTerms = 1<<(31-vocabShardBits) - 1

// find returns the slot of a term with hash h: the slot that holds it and
// its index in the shard, or the empty slot where it belongs and -1.
func (t *vocabTable) find(term string, h uint64) (int, int32) {
	mask := uint64(len(t.words) - 1)
	tag := h >> 32
	for i := (h >> vocabShardBits) & mask; ; i = (i + 1) & mask {
		w := t.words[i].Load()
		if w == 0 {
			return int(i), -1
		}
		if w>>32 == tag && t.keys[i] == term {
			return int(i), int32(uint32(w)) - 1
		}
	}
}

// ID returns the ID of term, giving it one the first time. The string is
// kept, not copied.
func (v *Vocabulary) ID(term string) int32 {
	h := maphash.String(vocabSeed, term)
	s := int32(h & (vocabShards - 1))
	sh := &v.shards[s]
	if t := sh.tab.Load(); t != nil {
		if _, k := t.find(term, h); k >= 0 {
			return k<<vocabShardBits | s
		}
	}
	sh.mu.Lock()
	defer sh.mu.Unlock()
	t := sh.tab.Load()
	if t == nil {
		t = &vocabTable{words: make([]atomic.Uint64, vocabFirstSlots), keys: make([]string, vocabFirstSlots)}
		sh.tab.Store(t)
	}
	i, k := t.find(term, h)
	if k >= 0 {
		return k<<vocabShardBits | s
	}
	if len(sh.terms) == maxShardTerms {
		panic("sparsemat: more than 2³¹−1 terms")
	}
	if 2*(len(sh.terms)+1) > len(t.words) {
		t = t.grown()
		sh.tab.Store(t)
		i, _ = t.find(term, h)
	}
	k = int32(len(sh.terms))
	sh.terms = append(sh.terms, term)
	sh.n.Store(int32(len(sh.terms)))
	t.keys[i] = term
	t.words[i].Store(h>>32<<32 | uint64(k+1))
	return k<<vocabShardBits | s
}

// grown returns a table twice the size holding the same terms.
func (t *vocabTable) grown() *vocabTable {
	g := &vocabTable{words: make([]atomic.Uint64, 2*len(t.words)), keys: make([]string, 2*len(t.words))}
	for i := range t.words {
		if w := t.words[i].Load(); w != 0 {
			key := t.keys[i]
			j, _ := g.find(key, maphash.String(vocabSeed, key))
			g.keys[j] = key
			g.words[j].Store(w)
		}
	}
	return g
}

// valid reports whether id is an ID the vocabulary gave.
func (v *Vocabulary) valid(id int32) bool {
	return id >= 0 && id>>vocabShardBits < v.shards[id&(vocabShards-1)].n.Load()
}

// Term returns the term with ID id. It panics if no term has that ID.
func (v *Vocabulary) Term(id int32) string {
	if id < 0 {
		panic(fmt.Sprintf("sparsemat: no term has ID %d", id))
	}
	sh := &v.shards[id&(vocabShards-1)]
	sh.mu.Lock()
	defer sh.mu.Unlock()
	k := int(id >> vocabShardBits)
	if k >= len(sh.terms) {
		panic(fmt.Sprintf("sparsemat: no term has ID %d", id))
	}
	return sh.terms[k]
}

// Len returns the number of terms given an ID so far.
func (v *Vocabulary) Len() int {
	n := 0
	for i := range v.shards {
		n += int(v.shards[i].n.Load())
	}
	return n
}

// byID returns every term at the index of its ID ("" at the few indices
// between shards' runs, which are not IDs: see valid).
func (v *Vocabulary) byID() []string {
	size := 0
	for s := range v.shards {
		sh := &v.shards[s]
		sh.mu.Lock()
		if n := len(sh.terms); n > 0 {
			size = max(size, (n-1)<<vocabShardBits|s+1)
		}
		sh.mu.Unlock()
	}
	terms := make([]string, size)
	for s := range v.shards {
		sh := &v.shards[s]
		sh.mu.Lock()
		for k, t := range sh.terms {
			terms[k<<vocabShardBits|s] = t
		}
		sh.mu.Unlock()
	}
	return terms
}

// Builder accumulates the term counts of documents, one row at a time.
// The zero value is ready to use. It is not safe for concurrent use, but
// its [Vocabulary] is.
//
// Rows are kept compactly until [Builder.Build]: each entry as two
// unsigned varints (the term ID and the count minus one, see appendEntry),
// 3 to 4 bytes where an int32 pair takes 8, in slabs that are never copied
// to grow. Build decodes them, so adding a row costs little more than
// writing it down. A row that one of the builder's own row counters
// (NewRowCounter) made is not even copied: the builder takes the slab the
// counter wrote it in.
type Builder struct {
	vocab Vocabulary
	slabs [][]byte // encoded rows; a row never spans two slabs
	own   int      // 1 + index in slabs of the slab AddRow and the like write to; 0 for none yet
	// rowAt[i] is where row i starts: slab index << 32 | byte offset;
	// rowLen[i] its number of entries.
	rowAt  []uint64
	rowLen []int32
	ent    []entry // scratch of AddRow

	// The document frequencies that the builder's own row counters
	// (NewRowCounter) count as they make rows, which Build takes instead of
	// a pass over the rows when the rows added are exactly the rows those
	// counters made, each once (see dfFromCounters).
	cmu      sync.Mutex // guards counters
	counters []*RowCounter
	added    [][]uint64 // by counter: one bit per row it made, set when added
	nAdded   []int32    // by counter: its rows added
	foreign  bool       // a row came from elsewhere, or one came twice
	counted  bool       // the last Build took the counters' frequencies (for the tests)
}

type entry struct {
	id    int32
	count int32
}

// slabSize is the size of an encoding slab. A row longer than a slab
// gets a slab of its own.
const slabSize = 1 << 20

// rowSlabFirst is the size of a RowCounter's first slab.
const rowSlabFirst = 4 << 10

// Vocabulary returns the builder's vocabulary: the IDs that
// [Builder.AddRowIDs] and [Builder.AddCounted] take.
func (b *Builder) Vocabulary() *Vocabulary { return &b.vocab }

// AddRow adds one document with its term counts. Counts of zero or less
// are ignored.
func (b *Builder) AddRow(counts map[string]int) {
	b.foreign = true
	b.ent = b.ent[:0]
	for t, c := range counts {
		if c > 0 {
			b.ent = append(b.ent, entry{b.vocab.ID(t), int32(min(c, 1<<31-1))})
		}
	}
	dst := b.reserve(len(b.ent))
	for _, e := range b.ent {
		dst = appendEntry(dst, e.id, e.count)
	}
	b.commit(dst, len(b.ent))
}

// AddRowIDs adds one document given by the IDs of its terms in the
// builder's [Vocabulary], in strictly increasing order, and their counts,
// each at least 1. It panics if the IDs are not increasing or not in the
// vocabulary, or a count is less than 1.
func (b *Builder) AddRowIDs(cols, counts []int32) {
	if len(cols) != len(counts) {
		panic("sparsemat: AddRowIDs with columns and counts of different lengths")
	}
	b.foreign = true
	dst := b.reserve(len(cols))
	prev := int32(-1)
	for k, id := range cols {
		if id <= prev || counts[k] < 1 {
			panic("sparsemat: AddRowIDs with columns out of order or a count below 1")
		}
		if !b.vocab.valid(id) {
			panic("sparsemat: AddRowIDs with a term ID outside the vocabulary")
		}
		dst = appendEntry(dst, id, counts[k])
		prev = id
	}
	b.commit(dst, len(cols))
}

// AddCounted adds the row that a [RowCounter] made. The IDs must come
// from the builder's [Vocabulary]: AddCounted checks the largest, Build
// the others.
func (b *Builder) AddCounted(r Row) {
	if r.maxID >= 0 && !b.vocab.valid(r.maxID) {
		panic(errCountedOutside)
	}
	b.tally(r)
	if r.ctr != nil && r.ctr.b == b {
		// The builder's own counter: the row stays in the counter's slab,
		// which the builder adopts when it first sees it (the slab's id is
		// only read and written here, by the builder's goroutine, and the
		// bytes are read by Build, after every counter is done).
		sl := r.slab
		if sl.id < 0 {
			sl.id = int32(len(b.slabs))
			b.slabs = append(b.slabs, sl.whole)
		}
		b.rowAt = append(b.rowAt, uint64(sl.id)<<32|uint64(r.off))
		b.rowLen = append(b.rowLen, r.n)
		return
	}
	dst := b.reserve(int(r.n))
	dst = append(dst, r.enc...)
	b.commit(dst, int(r.n))
}

// NewRowCounter returns a RowCounter that also counts, by term ID, the
// document frequencies of the rows it makes, so that Build need not count
// them again: Build takes the counters' frequencies when the rows added
// to b are exactly the rows that b's counters made, each added once, and
// counts them from the rows otherwise (the result is the same either
// way). Every counter must be done making rows before Build runs. Unlike
// the rest of Builder, NewRowCounter is safe for concurrent use, so that
// each goroutine can make its own.
func (b *Builder) NewRowCounter() *RowCounter {
	b.cmu.Lock()
	defer b.cmu.Unlock()
	c := &RowCounter{b: b, part: len(b.counters)}
	b.counters = append(b.counters, c)
	return c
}

// tally notes which counter's row r is, for dfFromCounters.
func (b *Builder) tally(r Row) {
	c := r.ctr
	if c == nil || c.b != b {
		b.foreign = true
		return
	}
	for len(b.added) <= c.part {
		b.added = append(b.added, nil)
		b.nAdded = append(b.nAdded, 0)
	}
	bits := b.added[c.part]
	w := int(r.seq >> 6)
	if w >= len(bits) {
		bits = append(bits, make([]uint64, w+1-len(bits))...)
		b.added[c.part] = bits
	}
	bit := uint64(1) << (r.seq & 63)
	if bits[w]&bit != 0 {
		b.foreign = true // the same row twice
		return
	}
	bits[w] |= bit
	b.nAdded[c.part]++
}

// dfFromCounters returns the document frequencies of the rows added, by
// term ID below size, from the counters that made them, or nil when some
// row added was not made by one of b's counters, was added twice, or a
// row a counter made was not added.
func (b *Builder) dfFromCounters(size int) []int32 {
	b.cmu.Lock()
	counters := b.counters
	b.cmu.Unlock()
	if b.foreign || len(counters) == 0 {
		return nil
	}
	total := 0
	for k, c := range counters {
		n := int32(0)
		if k < len(b.nAdded) {
			n = b.nAdded[k]
		}
		if n != c.made {
			return nil
		}
		total += int(n)
	}
	if total != b.Rows() {
		return nil
	}
	df := make([]int32, size)
	for _, c := range counters {
		for id, cell := range c.cells {
			d := cell.df
			if d == 0 {
				continue
			}
			if id >= size {
				panic(errCountedOutside)
			}
			df[id] += d
		}
	}
	return df
}

// reserve returns the current slab with room for a row of n entries
// (at most 10 bytes each: two varints of 32-bit values), starting a new
// slab when needed.
func (b *Builder) reserve(n int) []byte {
	need := 10 * n
	if b.own == 0 || cap(b.slabs[b.own-1])-len(b.slabs[b.own-1]) < need {
		b.slabs = append(b.slabs, make([]byte, 0, max(slabSize, need)))
		b.own = len(b.slabs)
	}
	s := b.own - 1
	b.rowAt = append(b.rowAt, uint64(s)<<32|uint64(len(b.slabs[s])))
	return b.slabs[s]
}

// commit records the row just written into the current slab.
func (b *Builder) commit(slab []byte, n int) {
	b.slabs[b.own-1] = slab
	b.rowLen = append(b.rowLen, int32(n))
}

// Rows returns the number of rows added so far.
func (b *Builder) Rows() int { return len(b.rowLen) }

// decodeRow appends the entries of row i to buf.
func (b *Builder) decodeRow(i int, buf []entry) []entry {
	slab := b.slabs[b.rowAt[i]>>32]
	p := int(uint32(b.rowAt[i]))
	for range b.rowLen[i] {
		var id, c uint64
		id, p = uvarint(slab, p)
		c, p = uvarint(slab, p)
		buf = append(buf, entry{int32(id), int32(c) + 1})
	}
	return buf
}

// uvarint decodes the unsigned varint at b[p:] (written by appendEntry,
// so valid and at most 5 bytes) and returns it and the offset after it:
// binary.Uvarint's result, with the one-, two- and three-byte values
// (every count and the IDs of up to 2^21 terms) decoded without a loop.
func uvarint(b []byte, p int) (uint64, int) {
	x := uint64(b[p])
	if x < 0x80 {
		return x, p + 1
	}
	y := uint64(b[p+1])
	if y < 0x80 {
		return x&0x7f | y<<7, p + 2
	}
	z := uint64(b[p+2])
	if z < 0x80 {
		return x&0x7f | (y&0x7f)<<7 | z<<14, p + 3
	}
	v, n := binary.Uvarint(b[p:])
	return v, p + n
}

// pruneGapShare: Build fills the matrix in one pass over the rows when
// pruning drops at most one entry in pruneGapShare; the column-index and
// value arrays then keep room for the dropped entries, at most 1/8 more
// than the matrix needs. Measured: pruning (min-df 2, max-df 0.5) drops
// 5.5% of the entries of the generated 100,000-document corpus and 11.7%
// of SpamAssassin's; on the first the build after the walk went from
// 0.45 to 0.41 s (0.84 to 0.72 s of CPU), for 12 MiB more at the peak
// (359 against 347 MiB, bound 402).
const pruneGapShare = 8

// buildBlockRows is the number of rows a goroutine of Build takes at a
// time. Each row is computed by one goroutine on its own, so the split
// changes only the speed, never the result.
const buildBlockRows = 1024

// parallelRows calls fn(lo, hi, worker) for blocks of rows [lo, hi) on up
// to GOMAXPROCS goroutines; worker numbers the goroutine from 0.
func (b *Builder) parallelRows(fn func(lo, hi, worker int)) int {
	m := b.Rows()
	blocks := (m + buildBlockRows - 1) / buildBlockRows
	workers := max(min(runtime.GOMAXPROCS(0), blocks), 1)
	if workers == 1 {
		fn(0, m, 0)
		return 1
	}
	var next atomic.Int64
	var wg sync.WaitGroup
	for w := range workers {
		wg.Go(func() {
			for {
				k := int(next.Add(1) - 1)
				if k >= blocks {
					return
				}
				fn(k*buildBlockRows, min((k+1)*buildBlockRows, m), w)
			}
		})
	}
	wg.Wait()
	return workers
}

// Pruning says which terms to keep by document frequency.
type Pruning struct {
	// MinDF keeps terms found in at least MinDF documents (0 or 1: all).
	MinDF int
	// MaxDFShare keeps terms found in at most this share of the documents;
	// 0 means 1 (no upper limit). Must lie in (0, 1].
	MaxDFShare float64
}

// Counts is a document-term matrix of raw counts with its vocabulary.
type Counts struct {
	// Matrix holds the counts: one row per kept document, one column per
	// kept term.
	Matrix *sparse.CSR
	// Terms are the kept terms in column order (byte order).
	Terms []string
	// DF is the document frequency of each kept term, counted over all
	// documents added to the builder.
	DF []int
	// Rows maps each matrix row to the index of the document as it was
	// added to the builder.
	Rows []int
	// EmptyRows lists the added documents (by index) that kept no term
	// and so have no row.
	EmptyRows []int
	// IDs is the Vocabulary ID of each kept term, in column order.
	IDs []int32
	// VocabularySize is the number of distinct terms before pruning.
	VocabularySize int
	// Documents is the number of documents added, with or without a row.
	Documents int
}

// Build prunes the vocabulary and returns the count matrix. Documents left
// with no term are dropped from the matrix and listed in EmptyRows. It
// returns [ErrNoTerms] when no term survives, and an error for an invalid
// Pruning. The builder is unchanged and can be built again.
func (b *Builder) Build(p Pruning) (*Counts, error) {
	m := b.Rows()
	if p.MaxDFShare == 0 {
		p.MaxDFShare = 1
	}
	if p.MaxDFShare < 0 || p.MaxDFShare > 1 {
		return nil, fmt.Errorf("max-df share %g is outside (0, 1]", p.MaxDFShare)
	}
	if p.MinDF < 0 {
		return nil, fmt.Errorf("min-df %d is negative", p.MinDF)
	}
	terms := b.vocab.byID()

	// Document frequencies: from the row counters that made the rows, or
	// from the rows themselves, each goroutine counting into its own
	// array, the arrays summed.
	df := b.dfFromCounters(len(terms))
	b.counted = df != nil
	if df == nil {
		procs := runtime.GOMAXPROCS(0)
		dfs := make([][]int32, procs)
		used := b.parallelRows(func(lo, hi, w int) {
			if dfs[w] == nil {
				dfs[w] = make([]int32, len(terms))
			}
			var buf []entry
			for i := lo; i < hi; i++ {
				buf = b.decodeRow(i, buf[:0])
				for _, e := range buf {
					dfs[w][e.id]++
				}
			}
		})
		df = dfs[0]
		if df == nil {
			df = make([]int32, len(terms))
		}
		for w := 1; w < used; w++ {
			for id, d := range dfs[w] {
				df[id] += d
			}
			dfs[w] = nil
		}
	}
	maxDF := int(p.MaxDFShare * float64(m)) // floor, as scikit-learn does
	type kept struct {
		term string
		id   int32
	}
	keep := make([]kept, 0, len(terms)/2)
	vocabSize := 0
	for id, d := range df {
		if d == 0 {
			continue // given an ID but in no row, or no ID
		}
		if !b.vocab.valid(int32(id)) {
			panic(errCountedOutside)
		}
		vocabSize++
		if int(d) >= p.MinDF && int(d) <= maxDF {
			keep = append(keep, kept{terms[id], int32(id)})
		}
	}
	if len(keep) == 0 {
		return nil, ErrNoTerms
	}
	slices.SortFunc(keep, func(x, y kept) int { return strings.Compare(x.term, y.term) })
	newID := make([]int32, len(terms))
	for i := range newID {
		newID[i] = -1
	}
	c := &Counts{
		Terms:          make([]string, len(keep)),
		DF:             make([]int, len(keep)),
		IDs:            make([]int32, len(keep)),
		VocabularySize: vocabSize,
		Documents:      m,
	}
	nnz := 0
	for j, k := range keep {
		newID[k.id] = int32(j)
		c.Terms[j] = k.term
		c.IDs[j] = k.id
		c.DF[j] = int(df[k.id])
		nnz += int(df[k.id])
	}
	keep, df = nil, nil

	// Each row is remapped, sorted and written at start[i]. When pruning
	// drops few entries (one in pruneGapShare or fewer: the terms of one
	// document and a few in most of them), each row is written where it would
	// start unpruned and the rows are then moved up over the gaps, one
	// pass over the encoded rows instead of two. Otherwise a first pass
	// counts the kept entries of each row, so that every row is written in
	// its place and the arrays are never larger than the matrix.
	total := 0
	for _, n := range b.rowLen {
		total += int(n)
	}
	rowNNZ := make([]int32, m)
	start := make([]int, m)
	size := nnz
	if total-nnz <= total/pruneGapShare {
		size = total
		copy(rowNNZ, b.rowLen) // room for every entry; the fill sets the kept counts
	} else {
		b.parallelRows(func(lo, hi, _ int) {
			var buf []entry
			for i := lo; i < hi; i++ {
				buf = b.decodeRow(i, buf[:0])
				n := int32(0)
				for _, e := range buf {
					if newID[e.id] >= 0 {
						n++
					}
				}
				rowNNZ[i] = n
			}
		})
	}
	for i, s := 0, 0; i < m; i++ {
		start[i] = s
		s += int(rowNNZ[i])
	}
	ja := make([]int, size)
	data := make([]float64, size)
	idBits := bits.Len(uint(len(c.Terms) - 1))
	b.parallelRows(func(lo, hi, _ int) {
		var buf []entry
		var packed, tmp []uint64 // new ID << 32 | count, sorted
		for i := lo; i < hi; i++ {
			buf = b.decodeRow(i, buf[:0])
			packed = packed[:0]
			for _, e := range buf {
				if j := newID[e.id]; j >= 0 {
					packed = append(packed, uint64(j)<<32|uint64(uint32(e.count)))
				}
			}
			packed, tmp = sortEntries(packed, tmp, idBits)
			k := start[i]
			for _, v := range packed {
				ja[k] = int(v >> 32)
				data[k] = float64(uint32(v))
				k++
			}
			rowNNZ[i] = int32(len(packed))
		}
	})
	if size > nnz {
		at := 0
		for i, n := range rowNNZ {
			if s := start[i]; s != at {
				copy(ja[at:at+int(n)], ja[s:s+int(n)])
				copy(data[at:at+int(n)], data[s:s+int(n)])
			}
			at += int(n)
		}
		ja, data = ja[:nnz], data[:nnz]
	}
	start = nil
	ia := make([]int, 1, m+1)
	for i, n := range rowNNZ {
		if n == 0 {
			c.EmptyRows = append(c.EmptyRows, i)
			continue
		}
		ia = append(ia, ia[len(ia)-1]+int(n))
		c.Rows = append(c.Rows, i)
	}
	rowNNZ = nil
	if len(c.Rows) == 0 {
		return nil, ErrNoTerms
	}
	c.Matrix = sparse.NewCSR(len(c.Rows), len(c.Terms), ia, ja, data)
	return c, nil
}

// sortEntries sorts packed entries (column << 32 | count, columns below
// 1<<idBits and distinct) by column, using tmp as scratch, and returns
// the sorted slice and the scratch. Long rows are sorted by their columns'
// bytes, least significant first (a radix sort: a few passes without a
// comparison, where a comparison sort mispredicts about every other
// branch); short ones by insertion.
func sortEntries(packed, tmp []uint64, idBits int) ([]uint64, []uint64) {
	if len(packed) < 48 {
		slices.Sort(packed)
		return packed, tmp
	}
	tmp = slices.Grow(tmp[:0], len(packed))[:len(packed)]
	src, dst := packed, tmp
	for shift := 32; shift < 32+idBits; shift += 8 {
		var count [256]int
		for _, v := range src {
			count[byte(v>>shift)]++
		}
		pos := 0
		for d, n := range count {
			count[d] = pos
			pos += n
		}
		for _, v := range src {
			d := byte(v >> shift)
			dst[count[d]] = v
			count[d]++
		}
		src, dst = dst, src
	}
	return src, dst
}

// Row is one document's term counts as a [RowCounter] encodes them for
// [Builder.AddCounted]: compact, and read-only (its bytes sit in the
// counter's slab, beside the counter's other rows).
type Row struct {
	enc   []byte
	n     int32       // entries
	maxID int32       // -1 for an empty row
	ctr   *RowCounter // the counter that made it, when a builder's (NewRowCounter)
	seq   int32       // its number among ctr's rows
	slab  *rowSlab    // the slab enc is in
	off   int32       // where enc starts in it
}

// rowSlab is a block of memory a RowCounter encodes rows into, one after
// the other. whole is the block (all of its capacity) and never changes;
// id is its index in the slabs of the counter's builder once the builder
// has taken it, -1 before, and belongs to the builder's goroutine.
type rowSlab struct {
	whole []byte
	id    int32
}

// Len returns the number of distinct terms in the row.
func (r Row) Len() int { return int(r.n) }

// RowCounter counts the term IDs of one document at a time and encodes
// them as a [Row], so that the goroutine that analyses a document can do
// the counting and encoding and the one that owns the [Builder] only
// records where the row is (or copies its bytes, for a counter that is
// not the builder's). Its zero value is ready; it is not safe for
// concurrent use (give each goroutine its own).
type RowCounter struct {
	cells []rowCell // by term ID
	ids   []int32   // the row's distinct IDs
	buf   []byte    // the rows encoded so far in slab.whole
	slab  *rowSlab  // where Row writes
	// Of a counter made by Builder.NewRowCounter: the builder, the
	// counter's index in it and the rows made.
	b    *Builder
	part int
	made int32
}

// rowCell is what a RowCounter keeps of a term ID: its count in the
// current row (zero outside it) and, for a counter made by
// Builder.NewRowCounter, the number of rows made that hold it. The two
// are side by side because Row reads and writes both for every ID that
// AddAll has just counted: in one array, the second look-up finds the
// cache line the first brought in, where a second array of frequencies
// cost a cache miss for each term outside the cache.
type rowCell struct {
	count, df int32
}

// Add counts one occurrence of the term with ID id (at least 0).
func (c *RowCounter) Add(id int32) {
	if int(id) >= len(c.cells) {
		c.grow(id)
	}
	if c.cells[id].count == 0 {
		c.ids = append(c.ids, id)
	}
	c.cells[id].count++
}

// AddAll counts every ID of ids.
//
// Each ID is stored at the end of the row's distinct IDs whether or not
// the row has it already, and counted in only when it is new: whether an
// ID is new is irregular (about every other token), and a branch on it
// would be mispredicted often.
func (c *RowCounter) AddAll(ids []int32) {
	n := len(c.ids)
	out := slices.Grow(c.ids, len(ids))[:n+len(ids)]
	cells := c.cells
	for _, id := range ids {
		if int(id) >= len(cells) {
			c.grow(id)
			cells = c.cells
		}
		k := cells[id].count
		out[n] = id
		n += int(uint32(k-1) >> 31) // 1 when the row did not have id yet (k = 0)
		cells[id].count = k + 1
	}
	c.ids = out[:n]
}

// grow makes room in c.cells for the ID id.
func (c *RowCounter) grow(id int32) {
	c.cells = append(c.cells, make([]rowCell, max(int(id)+1-len(c.cells), len(c.cells)/2, 1024))...)
}

// Row returns the counted row and starts a new one. The row's bytes are
// written after the counter's earlier rows in a slab of its own, and never
// change afterwards.
func (c *RowCounter) Row() Row {
	if need := 10 * len(c.ids); c.slab == nil || cap(c.buf)-len(c.buf) < need {
		// Slabs start small (a counter may make one row) and double up to
		// slabSize.
		size := rowSlabFirst
		if c.slab != nil {
			size = min(2*cap(c.buf), slabSize)
		}
		c.buf = make([]byte, 0, max(size, need))
		c.slab = &rowSlab{whole: c.buf[:cap(c.buf)], id: -1}
	}
	start := len(c.buf)
	enc := c.buf
	maxID := int32(-1)
	df := int32(0)
	if c.b != nil {
		df = 1 // only the builder's counters count the frequencies
	}
	cells := c.cells
	for _, id := range c.ids {
		cell := &cells[id]
		enc = appendEntry(enc, id, cell.count)
		cell.count = 0
		cell.df += df
		maxID = max(maxID, id)
	}
	c.buf = enc
	r := Row{enc: enc[start:len(enc):len(enc)], n: int32(len(c.ids)), maxID: maxID, slab: c.slab, off: int32(start)}
	if c.b != nil {
		if c.made == 1<<31-1 {
			panic("sparsemat: more than 2³¹−1 rows from one RowCounter")
		}
		r.ctr, r.seq = c, c.made
		c.made++
	}
	c.ids = c.ids[:0]
	return r
}

// appendEntry encodes one entry of a row: the term ID and the count minus
// one, as unsigned varints. Rows are not sorted (Build sorts them once
// their final column numbers are known), and the first terms seen, which
// are the most frequent ones, have the smallest IDs, so most IDs take one
// or two bytes.
func appendEntry(dst []byte, id, count int32) []byte {
	dst = binary.AppendUvarint(dst, uint64(id))
	return binary.AppendUvarint(dst, uint64(count-1))
}
