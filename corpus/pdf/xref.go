package pdf

import (
	"bytes"
	"cmp"
	"compress/zlib"
	"errors"
	"fmt"
	"io"
	"maps"
	"slices"
)

// The cross-reference check runs before the library opens a file. The
// library sizes its object table from numbers in the file and follows
// /Prev links and object streams without limits, so a few changed bytes
// could make it allocate gigabytes, loop for ever or recurse until the
// stack overflows; none of these is a panic that recover could catch. The
// check reads the same sections the library will read (ISO 32000-1 section
// 7.5.4 tables, 7.5.5 trailers, 7.5.8 cross-reference streams) and refuses
// the file when one of them is out of bounds. It also tells an encrypted
// file by the /Encrypt entry of its trailer (ISO 32000-1 section 7.6.1).

// maxObjects bounds object numbers and /Size. ISO 32000-1 Annex C gives
// 8,388,607 as the largest number of indirect objects a conforming reader
// need handle (from memory); the library's table then stays under 300 MB.
const maxObjects = 8_388_607

// maxSections bounds the /Prev chain; real files carry one section per
// incremental update.
const maxSections = 4096

// maxFieldWidth bounds each /W field of a cross-reference stream: the
// library decodes a field into an int, so more than 8 bytes is nonsense.
const maxFieldWidth = 8

// maxColumns bounds /Columns of a predictor: the library allocates a row
// of that many bytes.
const maxColumns = 1 << 20

// maxObjStmChain bounds how many object streams one lookup may pass
// through; the library resolves each by recursion.
const maxObjStmChain = 16

// xrefEntry is one object's place: in the file at offset (inStream
// false) or inside the object stream numbered stream.
type xrefEntry struct {
	inStream bool
	stream   uint32
	offset   int64
}

// span is the data of an object stream in the file, and how many bytes it
// expands to for each byte of it (at least 1).
type span struct {
	start, end int64
	weight     int64
}

// checkXref checks the cross-reference sections of data, which ends at
// its last %%EOF. It returns ErrEncrypted for an encrypted file, a
// *MalformedError for sections out of bounds, a *SizeError when the
// cross-reference and object streams expand beyond maxBytes, and
// otherwise the spans of the object streams, sorted.
func checkXref(data []byte, maxBytes int64) ([]span, error) {
	spans, err := checkSections(data, maxBytes)
	if se, ok := err.(*SizeError); ok {
		se.Limit = maxBytes
	}
	return spans, err
}

func checkSections(data []byte, maxBytes int64) ([]span, error) {
	tail := data[max(0, len(data)-1024):]
	i := bytes.LastIndex(tail, []byte("startxref"))
	if i < 0 {
		return nil, malformed("no startxref line at the end (truncated?)")
	}
	lx := &lexer{b: tail, pos: i + len("startxref")}
	off, ok := lx.token().(int64)
	if !ok {
		return nil, malformed("startxref is not followed by an offset")
	}
	table := map[uint32]xrefEntry{}
	seen := map[int64]bool{}
	budget := maxBytes
	for first := true; ; first = false {
		if seen[off] {
			return nil, malformed("the cross-reference sections form a loop (/Prev)")
		}
		if len(seen) >= maxSections {
			return nil, malformed("too many cross-reference sections")
		}
		seen[off] = true
		if off < 0 || off >= int64(len(data)) {
			return nil, malformed(fmt.Sprintf("cross-reference offset %d is outside the file", off))
		}
		trailer, err := readSection(data, int(off), table, &budget)
		if err != nil {
			return nil, err
		}
		if first {
			if v, ok := trailer["Encrypt"]; ok && v != nil {
				return nil, ErrEncrypted
			}
		}
		prev, ok := trailer["Prev"]
		if !ok || prev == nil {
			break
		}
		if off, ok = prev.(int64); !ok {
			return nil, malformed("/Prev is not an offset")
		}
	}
	// A lookup in an object stream first resolves the stream itself; if
	// that one is in an object stream too, the library recurses, without
	// end when the chain loops.
	for _, e := range table {
		for n := 0; e.inStream; n++ {
			if n >= maxObjStmChain {
				return nil, malformed("object streams are nested in a loop")
			}
			e = table[e.stream]
		}
	}
	return objStmSpans(data, table, &budget)
}

// readSection reads the cross-reference section at off, a table or a
// stream, into table (entries already there are newer and win, as in the
// library), and returns its trailer dictionary.
func readSection(data []byte, off int, table map[uint32]xrefEntry, budget *int64) (map[pdfName]any, error) {
	lx := &lexer{b: data, pos: off}
	t := lx.token()
	if t == pdfKeyword("xref") {
		return readTable(lx, table)
	}
	if _, ok := t.(int64); !ok {
		return nil, malformed(fmt.Sprintf("no cross-reference section at offset %d", off))
	}
	lx.pos = off
	_, obj, pos := lx.indirect()
	dict, ok := obj.(map[pdfName]any)
	if !ok || pos < 0 || dict["Type"] != pdfName("XRef") {
		return nil, malformed(fmt.Sprintf("no cross-reference stream at offset %d", off))
	}
	return dict, readXrefStream(data, pos, dict, table, budget)
}

// readTable reads a cross-reference table after its "xref" keyword
// (ISO 32000-1 section 7.5.4): subsections "first count", then count
// entries "offset generation n|f", then the trailer dictionary.
func readTable(lx *lexer, table map[uint32]xrefEntry) (map[pdfName]any, error) {
	for {
		t := lx.token()
		if t == pdfKeyword("trailer") {
			break
		}
		start, ok1 := t.(int64)
		n, ok2 := lx.token().(int64)
		if !ok1 || !ok2 || start < 0 || n < 0 {
			return nil, malformed("bad cross-reference subsection header")
		}
		if start+n > maxObjects {
			return nil, malformed(fmt.Sprintf("object numbers up to %d (more than %d)", start+n, maxObjects))
		}
		for i := range n {
			off, ok1 := lx.token().(int64)
			_, ok2 := lx.token().(int64)
			kind := lx.token()
			if !ok1 || !ok2 || kind != pdfKeyword("n") && kind != pdfKeyword("f") {
				return nil, malformed("bad cross-reference entry")
			}
			id := uint32(start + i)
			if _, ok := table[id]; !ok && kind == pdfKeyword("n") {
				table[id] = xrefEntry{offset: off}
			}
		}
	}
	trailer, ok := lx.object(0).(map[pdfName]any)
	if !ok {
		return nil, malformed("the cross-reference table has no trailer dictionary")
	}
	if err := checkSize(trailer); err != nil {
		return nil, err
	}
	return trailer, nil
}

func checkSize(dict map[pdfName]any) error {
	size, ok := dict["Size"].(int64)
	if !ok {
		return malformed("the trailer has no /Size")
	}
	if size < 0 || size > maxObjects {
		return malformed(fmt.Sprintf("/Size %d is out of bounds", size))
	}
	return nil
}

// readXrefStream checks a cross-reference stream's dictionary and reads its
// entries (ISO 32000-1 section 7.5.8.2, Tables 17 and 18).
func readXrefStream(data []byte, pos int, dict map[pdfName]any, table map[uint32]xrefEntry, budget *int64) error {
	if err := checkSize(dict); err != nil {
		return err
	}
	size := dict["Size"].(int64)
	index := []any{int64(0), size}
	if v, ok := dict["Index"]; ok {
		if index, ok = v.([]any); !ok || len(index)%2 != 0 {
			return malformed("bad /Index in the cross-reference stream")
		}
	}
	wa, ok := dict["W"].([]any)
	if !ok || len(wa) < 3 {
		return malformed("bad /W in the cross-reference stream")
	}
	var w []int
	rowLen := 0
	for _, x := range wa {
		n, ok := x.(int64)
		if !ok || n < 0 || n > maxFieldWidth {
			return malformed("bad /W in the cross-reference stream")
		}
		w = append(w, int(n))
		rowLen += int(n)
	}
	var need int64
	for i := 0; i < len(index); i += 2 {
		start, ok1 := index[i].(int64)
		n, ok2 := index[i+1].(int64)
		if !ok1 || !ok2 || start < 0 || n < 0 || start+n > maxObjects {
			return malformed("bad /Index in the cross-reference stream")
		}
		need += n * int64(rowLen)
	}
	if need > *budget {
		return &SizeError{What: "PDF cross-reference streams", Limit: *budget}
	}
	*budget -= need
	length, ok := dict["Length"].(int64)
	if !ok || length < 0 || length > int64(len(data)-pos) {
		return malformed("bad /Length of the cross-reference stream")
	}
	rd, err := decodedStream(data[pos:pos+int(length)], dict)
	if err != nil {
		return err
	}
	rows := make([]byte, need)
	if _, err := io.ReadFull(rd, rows); err != nil {
		return malformed("cross-reference stream: " + err.Error())
	}
	field := func(row []byte, i int) uint64 {
		start := 0
		for _, n := range w[:i] {
			start += n
		}
		var x uint64
		for _, b := range row[start : start+w[i]] {
			x = x<<8 | uint64(b)
		}
		return x
	}
	for i := 0; i < len(index); i += 2 {
		start, n := index[i].(int64), index[i+1].(int64)
		for j := range n {
			row := rows[:rowLen]
			rows = rows[rowLen:]
			id := uint32(start + j)
			if _, ok := table[id]; ok {
				continue
			}
			kind := uint64(1) // a missing type field means type 1 (Table 17)
			if w[0] > 0 {
				kind = field(row, 0)
			}
			switch kind {
			case 1:
				table[id] = xrefEntry{offset: int64(field(row, 1))}
			case 2:
				table[id] = xrefEntry{inStream: true, stream: uint32(field(row, 1))}
			}
		}
	}
	return nil
}

// decodedStream undoes the filters of a cross-reference stream as far as
// the library does: none, FlateDecode, and the PNG predictor of
// DecodeParms (ISO 32000-1 section 7.4.4.4).
func decodedStream(raw []byte, dict map[pdfName]any) (io.Reader, error) {
	filter := dict["Filter"]
	if a, ok := filter.([]any); ok && len(a) == 1 {
		filter = a[0]
	}
	switch filter {
	case nil:
		return bytes.NewReader(raw), nil
	case pdfName("FlateDecode"):
	default:
		return nil, malformed(fmt.Sprintf("unsupported filter %v on the cross-reference stream", filter))
	}
	zr, err := zlib.NewReader(bytes.NewReader(raw))
	if err != nil {
		return nil, malformed("cross-reference stream: " + err.Error())
	}
	parms := dict["DecodeParms"]
	if a, ok := parms.([]any); ok && len(a) == 1 {
		parms = a[0]
	}
	p, _ := parms.(map[pdfName]any)
	pred, _ := p["Predictor"].(int64)
	if pred < 10 {
		return zr, nil
	}
	cols, _ := p["Columns"].(int64)
	if cols < 1 || cols > maxColumns {
		return nil, malformed("bad /Columns of the cross-reference stream")
	}
	return &pngRows{r: zr, prev: make([]byte, cols), row: make([]byte, cols+1)}, nil
}

// pngRows undoes the PNG "None" and "Up" row filters, the ones
// cross-reference streams use (ISO 32000-1 section 7.4.4.4 refers to the
// PNG specification for them).
type pngRows struct {
	r         io.Reader
	prev, row []byte
	pending   []byte
}

func (p *pngRows) Read(b []byte) (int, error) {
	n := 0
	for n < len(b) {
		if len(p.pending) == 0 {
			if _, err := io.ReadFull(p.r, p.row); err != nil {
				return n, err
			}
			switch p.row[0] {
			case 0:
				copy(p.prev, p.row[1:])
			case 2:
				for i, c := range p.row[1:] {
					p.prev[i] += c
				}
			default:
				return n, errors.New("unsupported PNG row filter")
			}
			p.pending = p.prev
		}
		m := copy(b[n:], p.pending)
		p.pending = p.pending[m:]
		n += m
	}
	return n, nil
}

// objStmSpans measures the object streams that entries of table lie in
// (ISO 32000-1 section 7.5.7): the library decompresses one again at every
// lookup of an object inside it, so reads of its data are charged at its
// expansion ratio (see meter). Each is decompressed once here, all of them
// together at most budget bytes.
func objStmSpans(data []byte, table map[uint32]xrefEntry, budget *int64) ([]span, error) {
	ids := map[uint32]bool{}
	for _, e := range table {
		if e.inStream {
			ids[e.stream] = true
		}
	}
	sorted := slices.Sorted(maps.Keys(ids))
	var spans []span
	for _, id := range sorted {
		e, ok := table[id]
		if !ok || e.inStream || e.offset <= 0 || e.offset >= int64(len(data)) {
			continue // the library finds no stream there and fails
		}
		lx := &lexer{b: data, pos: int(e.offset)}
		_, obj, pos := lx.indirect()
		dict, ok := obj.(map[pdfName]any)
		if !ok || pos < 0 {
			continue
		}
		end := streamEnd(data, pos, dict["Length"], table)
		n, err := decodedLen(data[pos:end], dict, *budget)
		if err != nil {
			return nil, err
		}
		*budget -= n
		w := int64(1)
		if end > pos {
			w = max(1, (n+int64(end-pos)-1)/int64(end-pos))
		}
		spans = append(spans, span{start: int64(pos), end: int64(end), weight: w})
	}
	slices.SortFunc(spans, func(a, b span) int { return cmp.Compare(a.start, b.start) })
	return spans, nil
}

// streamEnd returns where the data of the stream starting at pos ends: by
// its /Length, direct or an indirect integer, else at "endstream".
func streamEnd(data []byte, pos int, length any, table map[uint32]xrefEntry) int {
	n, ok := length.(int64)
	if ref, isRef := length.(objRef); isRef {
		if e, found := table[ref.id]; found && !e.inStream && e.offset > 0 && e.offset < int64(len(data)) {
			lx := &lexer{b: data, pos: int(e.offset)}
			_, v, _ := lx.indirect()
			n, ok = v.(int64)
		}
	}
	if ok && n >= 0 && n <= int64(len(data)-pos) {
		return pos + int(n)
	}
	if i := bytes.Index(data[pos:], []byte("endstream")); i >= 0 {
		return pos + i
	}
	return len(data)
}

// decodedLen returns how many bytes the stream data raw decompresses to,
// refusing more than budget; data without FlateDecode counts as itself.
func decodedLen(raw []byte, dict map[pdfName]any, budget int64) (int64, error) {
	filter := dict["Filter"]
	if a, ok := filter.([]any); ok && len(a) > 0 {
		filter = a[0]
	}
	if filter != pdfName("FlateDecode") {
		return int64(len(raw)), nil
	}
	zr, err := zlib.NewReader(bytes.NewReader(raw))
	if err != nil {
		return 0, nil // the library cannot read it either
	}
	n, _ := io.Copy(io.Discard, io.LimitReader(zr, budget+1))
	if n > budget {
		return 0, &SizeError{What: "PDF object streams"}
	}
	return n, nil
}
