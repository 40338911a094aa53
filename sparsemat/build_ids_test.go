package sparsemat

import (
	"encoding/binary"
	"fmt"
	"math/rand/v2"
	"reflect"
	"slices"
	"sync"
	"testing"
)

// The three ways of adding rows (term → count maps, sorted ID rows, rows
// made by a RowCounter) must build the same matrix, whatever order the
// vocabulary gave out its IDs in: Build orders the columns by term.
func TestAddPathsBuildTheSameMatrix(t *testing.T) {
	r := rand.New(rand.NewPCG(9, 9))
	terms := make([]string, 300)
	for j := range terms {
		terms[j] = fmt.Sprintf("w%03d", j)
	}
	docs := make([]map[string]int, 200)
	for i := range docs {
		docs[i] = map[string]int{}
		if i%37 == 5 {
			continue // an empty document
		}
		for range 1 + r.IntN(40) {
			docs[i][terms[min(r.IntN(300), r.IntN(300))]] += 1 + r.IntN(3)
		}
		if i%50 == 7 {
			docs[i]["big"] = 1<<31 - 1 // the largest count
		}
	}
	var byMap, byIDs, byCounter, byOwn Builder
	for _, d := range docs {
		byMap.AddRow(d)
	}
	// IDs given out in another order than the maps' first sight.
	perm := r.Perm(len(terms))
	for _, p := range perm {
		byIDs.Vocabulary().ID(terms[p])
		byCounter.Vocabulary().ID(terms[p])
		byOwn.Vocabulary().ID(terms[p])
	}
	// sortedRow returns d as sorted IDs of b's vocabulary and counts.
	sortedRow := func(b *Builder, d map[string]int) (cols, counts []int32) {
		for term := range d {
			cols = append(cols, b.Vocabulary().ID(term))
		}
		slices.Sort(cols)
		for _, id := range cols {
			counts = append(counts, int32(d[b.vocab.Term(id)]))
		}
		return cols, counts
	}
	// byOwn takes rows from two of its own counters in turn (which it
	// does not copy), between rows of AddRowIDs (which it does).
	var rc RowCounter
	own := []*RowCounter{byOwn.NewRowCounter(), byOwn.NewRowCounter()}
	var ownRows []Row
	for i, d := range docs {
		byIDs.AddRowIDs(sortedRow(&byIDs, d))
		if _, ok := d["big"]; ok {
			// A RowCounter counts one occurrence at a time; this row
			// goes through AddRowIDs.
			byCounter.AddRowIDs(sortedRow(&byCounter, d))
			byOwn.AddRowIDs(sortedRow(&byOwn, d))
			continue
		}
		oc := own[i%2]
		for term, c := range d {
			for range c {
				rc.Add(byCounter.Vocabulary().ID(term))
				oc.Add(byOwn.Vocabulary().ID(term))
			}
		}
		byCounter.AddCounted(rc.Row())
		row := oc.Row()
		byOwn.AddCounted(row)
		ownRows = append(ownRows, row)
	}
	for _, row := range ownRows {
		if row.n > 0 && !slices.ContainsFunc(byOwn.slabs, func(s []byte) bool { return &s[0] == &row.slab.whole[0] }) {
			t.Fatal("a row of the builder's own counter was copied")
		}
	}
	for _, p := range []Pruning{{}, {MinDF: 2, MaxDFShare: 0.5}, {MinDF: 3, MaxDFShare: 0.9}} {
		want, err := byMap.Build(p)
		if err != nil {
			t.Fatal(err)
		}
		checkCSR(t, want.Matrix)
		for name, b := range map[string]*Builder{"AddRowIDs": &byIDs, "AddCounted": &byCounter, "AddCounted, own counters": &byOwn} {
			got, err := b.Build(p)
			if err != nil {
				t.Fatal(err)
			}
			if !reflect.DeepEqual(got.Matrix.RawMatrix(), want.Matrix.RawMatrix()) ||
				!slices.Equal(got.Terms, want.Terms) || !slices.Equal(got.DF, want.DF) ||
				!slices.Equal(got.Rows, want.Rows) || !slices.Equal(got.EmptyRows, want.EmptyRows) ||
				got.VocabularySize != want.VocabularySize || got.Documents != want.Documents {
				t.Errorf("%s, %+v: the matrix differs from AddRow's", name, p)
			}
		}
	}
}

// A term given an ID but found in no row is not part of the vocabulary,
// even with MinDF 0.
func TestBuildIgnoresUnusedIDs(t *testing.T) {
	var b Builder
	b.Vocabulary().ID("unused")
	id := b.Vocabulary().ID("used")
	b.AddRowIDs([]int32{id}, []int32{2})
	c, err := b.Build(Pruning{})
	if err != nil {
		t.Fatal(err)
	}
	if !slices.Equal(c.Terms, []string{"used"}) || c.VocabularySize != 1 {
		t.Fatalf("terms %v, vocabulary %d; want [used] and 1", c.Terms, c.VocabularySize)
	}
}

func TestAddRowIDsPanics(t *testing.T) {
	// lo and hi are the IDs of "a" and "b", in order; unknown is an ID
	// the vocabulary did not give, below hi when there is one.
	for name, f := range map[string]func(b *Builder, lo, hi, unknown int32){
		"out of order":     func(b *Builder, lo, hi, _ int32) { b.AddRowIDs([]int32{hi, lo}, []int32{1, 1}) },
		"repeated":         func(b *Builder, lo, _, _ int32) { b.AddRowIDs([]int32{lo, lo}, []int32{1, 1}) },
		"zero count":       func(b *Builder, lo, _, _ int32) { b.AddRowIDs([]int32{lo}, []int32{0}) },
		"unknown ID":       func(b *Builder, _, _, u int32) { b.AddRowIDs([]int32{u}, []int32{1}) },
		"unknown first ID": func(b *Builder, _, hi, u int32) { b.AddRowIDs([]int32{u, hi + 1<<vocabShardBits}, []int32{1, 1}) },
		"negative ID":      func(b *Builder, _, _, _ int32) { b.AddRowIDs([]int32{-1}, []int32{1}) },
		"lengths":          func(b *Builder, lo, _, _ int32) { b.AddRowIDs([]int32{lo}, nil) },
		"counted unknown ID": func(b *Builder, _, hi, _ int32) {
			var rc RowCounter
			rc.Add(hi + 9<<vocabShardBits)
			b.AddCounted(rc.Row())
		},
	} {
		t.Run(name, func(t *testing.T) {
			var b Builder
			lo, hi := b.Vocabulary().ID("a"), b.Vocabulary().ID("b")
			if lo > hi {
				lo, hi = hi, lo
			}
			unknown := int32(0)
			for b.vocab.valid(unknown) {
				unknown++
			}
			defer func() {
				if recover() == nil {
					t.Error("no panic")
				}
			}()
			f(&b, lo, hi, unknown)
		})
	}
}

// AddCounted checks only a row's largest ID; Build must refuse a row with
// a smaller ID that the vocabulary did not give (IDs are not dense: each
// shard of the vocabulary has its own run).
func TestBuildFindsUnknownIDs(t *testing.T) {
	var b Builder
	v := b.Vocabulary()
	var ids []int32
	hole := int32(-1)
	for i := 0; hole < 0; i++ {
		if i == 10000 {
			t.Fatal("no ID below the largest is free after 10,000 terms")
		}
		ids = append(ids, v.ID(fmt.Sprint("t", i)))
		for id := range slices.Max(ids) {
			if !v.valid(id) {
				hole = id
				break
			}
		}
	}
	var rc RowCounter
	rc.Add(hole)
	rc.Add(slices.Max(ids))
	b.AddCounted(rc.Row()) // the largest ID is valid: accepted
	defer func() {
		if recover() == nil {
			t.Error("Build accepted a row holding an ID the vocabulary never gave")
		}
	}()
	b.Build(Pruning{})
}

// Goroutines may ask for IDs at the same time (run with -race), while the
// shards' tables grow under them; every term gets one ID, distinct terms
// distinct IDs, and Term gives each ID's term back.
func TestVocabularyConcurrent(t *testing.T) {
	var v Vocabulary
	var wg sync.WaitGroup
	got := make([][]int32, 4)
	for g := range got {
		wg.Go(func() {
			for j := range 20000 {
				got[g] = append(got[g], v.ID(fmt.Sprint((j*7+g*13)%20000)))
			}
		})
	}
	wg.Wait()
	if v.Len() != 20000 {
		t.Fatalf("%d IDs for 20000 terms", v.Len())
	}
	for g := range got {
		for j, id := range got[g] {
			term := fmt.Sprint((j*7 + g*13) % 20000)
			if want := v.ID(term); id != want {
				t.Fatalf("term %d: ID %d, then %d", j, id, want)
			}
			if v.Term(id) != term {
				t.Fatalf("ID %d is %q, want %q", id, v.Term(id), term)
			}
		}
	}
}

// AddAll must encode the same rows as Add one ID at a time: the same
// entries in the same order (first sight), through rows that repeat IDs,
// rows of one ID, empty slices, and IDs far past the counter's array
// (which make it grow in the middle of a slice). Common practice, no
// outside source.
func TestAddAllMatchesAdd(t *testing.T) {
	r := rand.New(rand.NewPCG(13, 14))
	var one, all RowCounter
	for i := range 500 {
		var ids []int32
		switch i % 5 {
		case 0: // empty
		case 1:
			ids = []int32{int32(r.IntN(50))}
		default:
			for range r.IntN(300) {
				id := int32(min(r.IntN(2000), r.IntN(2000)))
				if r.IntN(100) == 0 {
					id = int32(r.IntN(1 << 20)) // past the array so far
				}
				ids = append(ids, id)
			}
		}
		for _, id := range ids {
			one.Add(id)
		}
		all.AddAll(ids[:len(ids)/2])
		all.AddAll(ids[len(ids)/2:])
		want, got := one.Row(), all.Row()
		if !slices.Equal(got.enc, want.enc) || got.n != want.n || got.maxID != want.maxID {
			t.Fatalf("row %d: AddAll gives %d entries %x, Add %d entries %x", i, got.n, got.enc, want.n, want.enc)
		}
	}
}

// An empty row is a document without terms: it is listed in EmptyRows.
func TestRowCounterEmptyRow(t *testing.T) {
	var b Builder
	var rc RowCounter
	rc.Add(b.Vocabulary().ID("a"))
	b.AddCounted(rc.Row())
	b.AddCounted(rc.Row()) // nothing counted since
	c, err := b.Build(Pruning{})
	if err != nil {
		t.Fatal(err)
	}
	if !slices.Equal(c.EmptyRows, []int{1}) || c.Matrix.At(0, 0) != 1 {
		t.Fatalf("empty rows %v, count %g", c.EmptyRows, c.Matrix.At(0, 0))
	}
}

// sortEntries must sort like slices.Sort, at every length and width.
func TestSortEntries(t *testing.T) {
	r := rand.New(rand.NewPCG(11, 12))
	var tmp []uint64
	for _, idBits := range []int{1, 7, 8, 9, 16, 17, 24, 31} {
		for _, n := range []int{0, 1, 2, 47, 48, 49, 150, 1000} {
			n = min(n, 1<<idBits)
			cols := r.Perm(1 << min(idBits, 16))
			var packed []uint64
			for k := range n {
				col := uint64(cols[k%len(cols)])
				if idBits > 16 {
					col = col<<(idBits-16) | uint64(k)>>(16-min(16, idBits-16))&(1<<(idBits-16)-1)
				}
				packed = append(packed, col<<32|uint64(r.Uint32()))
			}
			slices.SortFunc(packed, func(x, y uint64) int { return int(int64(x>>32) - int64(y>>32)) })
			want := slices.Clone(packed)
			r.Shuffle(len(packed), func(i, j int) { packed[i], packed[j] = packed[j], packed[i] })
			var got []uint64
			got, tmp = sortEntries(packed, tmp, idBits)
			for k := range got {
				if got[k]>>32 != want[k]>>32 {
					t.Fatalf("idBits %d, n %d: column %d at %d, want %d", idBits, n, got[k]>>32, k, want[k]>>32)
				}
			}
		}
	}
}

// TestUvarint checks the decoder of Build against binary.Uvarint (the
// standard library's, whose encoding appendEntry writes) on the values
// around every length boundary of the encoding up to 2^32, and on random
// ones, each followed by other bytes.
func TestUvarint(t *testing.T) {
	var vals []uint64
	for shift := 0; shift <= 32; shift++ {
		for _, d := range []int64{-2, -1, 0, 1} {
			if v := int64(1)<<shift + d; v >= 0 && v < 1<<32 {
				vals = append(vals, uint64(v))
			}
		}
	}
	r := rand.New(rand.NewPCG(9, 10))
	for range 10000 {
		vals = append(vals, uint64(r.Uint32()>>r.UintN(32)))
	}
	for _, v := range vals {
		b := binary.AppendUvarint(nil, v)
		b = append(b, 0xff, 0x01, 0x7f)
		want, n := binary.Uvarint(b)
		got, p := uvarint(b, 0)
		if got != want || p != n {
			t.Fatalf("uvarint(%x) = %d, %d; binary.Uvarint %d, %d", b, got, p, want, n)
		}
	}
}

// Build takes the document frequencies that a builder's own row counters
// (NewRowCounter) counted only when the rows added are exactly the rows
// they made, each once; in every other case it counts them from the rows.
// Either way the result must be the matrix of the rows added, which a
// builder fed the same rows through term maps gives.
func TestCounterFrequencies(t *testing.T) {
	r := rand.New(rand.NewPCG(4, 4))
	docs := make([]map[string]int, 300)
	for i := range docs {
		docs[i] = map[string]int{}
		for range r.IntN(30) {
			docs[i][fmt.Sprint("t", min(r.IntN(200), r.IntN(200)))]++
		}
	}
	// rows makes every document's row with three counters of b, taking
	// turns (from three goroutines at once, as ingest workers would).
	rows := func(b *Builder) []Row {
		out := make([]Row, len(docs))
		var wg sync.WaitGroup
		for g := range 3 {
			wg.Go(func() {
				c := b.NewRowCounter()
				for i := g; i < len(docs); i += 3 {
					for term, n := range docs[i] {
						for range n {
							c.Add(b.Vocabulary().ID(term))
						}
					}
					out[i] = c.Row()
				}
			})
		}
		wg.Wait()
		return out
	}
	build := func(b *Builder) *Counts {
		c, err := b.Build(Pruning{MinDF: 2, MaxDFShare: 0.6})
		if err != nil {
			t.Fatal(err)
		}
		return c
	}
	// want builds the rows of docs[i] for i in order, then extra, through
	// term maps.
	want := func(order []int, extra map[string]int) *Counts {
		var b Builder
		for _, i := range order {
			b.AddRow(docs[i])
		}
		if extra != nil {
			b.AddRow(extra)
		}
		return build(&b)
	}
	same := func(name string, got, want *Counts) {
		t.Helper()
		if !slices.Equal(got.Terms, want.Terms) || !slices.Equal(got.DF, want.DF) || !slices.Equal(got.Rows, want.Rows) ||
			!reflect.DeepEqual(got.Matrix.RawMatrix(), want.Matrix.RawMatrix()) {
			t.Fatalf("%s: the matrix differs from the rows' own", name)
		}
	}
	all := make([]int, len(docs))
	for i := range all {
		all[i] = i
	}
	cases := []struct {
		name    string
		order   func() []int // the documents whose rows are added, in order
		extra   func(b *Builder, rs []Row)
		row     map[string]int // the extra row's terms, nil when it is not checked
		counted bool
	}{
		{"every row once", func() []int { return all }, nil, nil, true},
		{"every row once, shuffled", func() []int {
			o := slices.Clone(all)
			r.Shuffle(len(o), func(i, j int) { o[i], o[j] = o[j], o[i] })
			return o
		}, nil, nil, true},
		{"a row left out", func() []int { return all[1:] }, nil, nil, false},
		{"a row twice, another left out", func() []int { o := slices.Clone(all); o[5] = 6; return o }, nil, nil, false},
		{"a row of a plain counter", func() []int { return all }, func(b *Builder, _ []Row) {
			var c RowCounter
			c.Add(b.Vocabulary().ID("t0"))
			b.AddCounted(c.Row())
		}, map[string]int{"t0": 1}, false},
		{"a row through AddRowIDs", func() []int { return all }, func(b *Builder, _ []Row) {
			b.AddRowIDs([]int32{b.Vocabulary().ID("t1")}, []int32{2})
		}, map[string]int{"t1": 2}, false},
		{"a row of another builder's counter", func() []int { return all }, func(b *Builder, _ []Row) {
			var other Builder
			c := other.NewRowCounter()
			b.Vocabulary().ID("t2") // the same shard here, so other's ID is valid here too
			c.Add(other.Vocabulary().ID("t2"))
			b.AddCounted(c.Row()) // other's ID may be another term's here: only the path is checked
		}, nil, false},
	}
	for _, tc := range cases {
		var b Builder
		rs := rows(&b)
		order := tc.order()
		for _, i := range order {
			b.AddCounted(rs[i])
		}
		if tc.extra != nil {
			tc.extra(&b, rs)
		}
		got := build(&b)
		if b.counted != tc.counted {
			t.Fatalf("%s: frequencies from the counters %v, want %v", tc.name, b.counted, tc.counted)
		}
		if tc.extra == nil || tc.row != nil {
			same(tc.name, got, want(order, tc.row))
		}
	}
}
