// Package pdf extracts the text and title of a PDF file for package corpus.
//
// # Overview
//
// [Extract] is the only entry point. It keeps the third-party PDF library
// (github.com/ledongthuc/pdf) behind one function, so that the rest of
// the program never sees its types, its panics or its limits.
//
// The library parses the file's structure: the cross-reference table, the
// object graph, stream filters (FlateDecode, ASCII85Decode, the PNG Up
// predictor) and the simple-font encodings (WinAnsi, MacRoman, /Differences
// with its glyph-name table). Text is taken from the page content streams
// by our own reader of content-stream operators (ISO 32000-1 section 9.4),
// with our own reader of ToUnicode CMaps (section 9.10.3).
//
// # What is extracted
//
// Pages are read in page-tree order, and each page's text in the order of
// its content stream, which is the reading order for most producers but
// not for all (columns may interleave). A line break is put where the text
// moves to another line (half the font size or more up or down), a space
// where it moves along the same line or where a TJ array leaves a gap of a
// fifth of an em or more (common practice; producers rarely show the
// space glyph between words), a blank line between pages. Text in form
// XObjects is read; text drawn as images, or with composite fonts that
// have no ToUnicode CMap, is not; headers and footers are text like any
// other. The Info dictionary's /Title is returned as the title.
//
// # Limits
//
// No panic of the library leaves [Extract]: every call into it runs under
// recover, and its panics become [MalformedError]s. Some library failures
// cannot be recovered (huge allocations, loops, deep recursion), so the
// file is checked before the library sees it: object numbers and /Size at
// most 8,388,607, at most 4096 cross-reference sections with no /Prev
// loop, no loop of object streams. Every byte the library reads from the
// file, and every byte of the streams decompressed for text, counts
// towards a work budget of 64 times maxBytes; a file that needs more (an
// object reference loop, say) is malformed. Object streams (ISO 32000-1
// section 7.5.7) are decompressed by the library itself at each lookup,
// so the check measures each once, and a byte the library reads of one
// counts as the bytes it expands to. The cross-reference and object
// streams may expand to at most maxBytes together, the streams
// decompressed for text (content streams, form XObjects, CMaps) to at most
// maxBytes, and the text may be at most maxBytes long: beyond that the
// file is [ErrTooLarge].
// Encrypted files are not read, even those that open with an empty
// password.
package pdf

import (
	"bytes"
	"cmp"
	"errors"
	"fmt"
	"io"
	"math"
	"runtime"
	"slices"
	"strings"
	"unicode"
	"unicode/utf8"

	lib "github.com/ledongthuc/pdf"
)

// Errors returned by [Extract]; a file the library cannot parse gives a
// [*MalformedError].
var (
	// ErrNotPDF: "%PDF-" is not in the first 1024 bytes.
	ErrNotPDF = errors.New("not a PDF")
	// ErrEncrypted: the trailer has an /Encrypt entry.
	ErrEncrypted = errors.New("encrypted PDF")
	// ErrNoText: the pages hold no text with letters or digits, as in a
	// scanned document without a text layer.
	ErrNoText = errors.New("no text layer (image-only PDF?)")
	// ErrTooLarge: the decompressed streams or the text exceed maxBytes;
	// the error returned is a [*SizeError].
	ErrTooLarge = errors.New("PDF expands beyond the size limit")
)

// SizeError reports what went past the size limit; errors.Is(err,
// ErrTooLarge) holds for it.
type SizeError struct {
	What  string // "PDF streams", "PDF text", "PDF cross-reference streams"
	Limit int64
}

func (e *SizeError) Error() string { return fmt.Sprintf("%s expand beyond %d bytes", e.What, e.Limit) }

// Is makes errors.Is(err, ErrTooLarge) true.
func (e *SizeError) Is(target error) bool { return target == ErrTooLarge }

// MalformedError reports a file that is damaged, truncated or beyond the
// bounds [Extract] accepts.
type MalformedError struct {
	Reason string
}

func (e *MalformedError) Error() string { return "malformed PDF: " + e.Reason }

func malformed(reason string) error { return &MalformedError{Reason: reason} }

// Bounds; see the package documentation.
const (
	// sniffLen is how far into the file "%PDF-" is looked for. ISO 32000-1
	// section 7.5.2 puts the header on the first line; readers commonly
	// accept it within the first 1024 bytes (common practice).
	sniffLen = 1024
	// workFactor times maxBytes is the work budget.
	workFactor = 64
	// maxPageNodes bounds the nodes visited in the page tree.
	maxPageNodes = 1 << 17
	// maxTreeDepth bounds the depth of the page tree and of /Parent
	// chains; balanced trees of a million pages are 10 levels deep.
	maxTreeDepth = 64
	// maxFormDepth bounds form XObjects drawn inside one another.
	maxFormDepth = 8
	// maxDifferences bounds a font's /Differences array: it names at most
	// 256 codes, plus the numbers between them. The library scans the
	// whole array for every character shown.
	maxDifferences = 512
	// defaultMaxBytes is used when maxBytes is not positive.
	defaultMaxBytes = 20 << 20
)

// errTooMuchWork ends a reading that has used up its work budget.
var errTooMuchWork = errors.New("too much work")

// Extract returns the /Title of the Info dictionary ("" if none) and the
// text of the PDF file raw. It reads at most maxBytes of decompressed
// streams and returns at most maxBytes of text (a non-positive maxBytes
// means 20 MiB). The text may hold invalid UTF-8 where a font maps codes
// to no known encoding; control characters are replaced by spaces.
//
// Errors: [ErrNotPDF], [ErrEncrypted], [ErrNoText], a [*SizeError] (which
// is [ErrTooLarge]), or a [*MalformedError].
func Extract(raw []byte, maxBytes int64) (title, text string, err error) {
	if maxBytes <= 0 {
		maxBytes = defaultMaxBytes
	}
	start := bytes.Index(raw[:min(len(raw), sniffLen)], []byte("%PDF-"))
	if start < 0 {
		return "", "", ErrNotPDF
	}
	// Offsets count from the header when junk precedes it (common
	// practice), and whatever follows the last %%EOF is not part of the
	// file (ISO 32000-1 section 7.5.5).
	data := raw[start:]
	end := bytes.LastIndex(data, []byte("%%EOF"))
	if end < 0 {
		return "", "", malformed("no %%EOF marker at the end (truncated?)")
	}
	data = fixHeader(data[:end+len("%%EOF")])
	spans, err := checkXref(data, maxBytes)
	if err != nil {
		return "", "", err
	}
	x := &extractor{
		meter:      &meter{data: data, spans: spans, limit: workFactor * maxBytes},
		streamLeft: maxBytes,
		textLeft:   maxBytes,
		maxBytes:   maxBytes,
	}
	defer func() {
		if r := recover(); r != nil {
			title, text, err = "", "", x.panicError(r)
		}
	}()
	r, err := lib.NewReader(x.meter, int64(len(data)))
	if err != nil {
		return "", "", x.libError(err)
	}
	trailer := r.Trailer()
	if !trailer.Key("Encrypt").IsNull() {
		return "", "", ErrEncrypted
	}
	root := trailer.Key("Root").Key("Pages")
	if root.Kind() != lib.Dict {
		return "", "", malformed("no page tree")
	}
	var pages []lib.Value
	if err := x.collect(root, 0, &pages); err != nil {
		return "", "", err
	}
	var out strings.Builder
	for _, pg := range pages {
		w := &textWriter{left: &x.textLeft}
		x.page(pg, w)
		if t := strings.TrimSpace(w.b.String()); t != "" {
			if out.Len() > 0 {
				out.WriteString("\n\n")
			}
			out.WriteString(t)
		}
	}
	text = out.String()
	if !strings.ContainsFunc(text, func(r rune) bool { return unicode.IsLetter(r) || unicode.IsDigit(r) }) {
		if x.fail != "" {
			return "", "", malformed(x.fail)
		}
		return "", "", ErrNoText
	}
	return x.infoTitle(trailer), text, nil
}

// fixHeader lets the library read files whose header it refuses: it wants
// exactly "%PDF-1.0" to "%PDF-1.7" followed by an end of line, so a PDF 2.0
// header, or one followed by a space or a comment, is rewritten in a copy
// to "%PDF-1.7" and a line end. The bytes keep their offsets.
func fixHeader(data []byte) []byte {
	if len(data) < 9 {
		return data
	}
	okVersion := string(data[5:7]) == "1." && data[7] >= '0' && data[7] <= '7'
	okEnd := data[8] == '\r' || data[8] == '\n'
	if okVersion && okEnd {
		return data
	}
	digits := data[5] >= '0' && data[5] <= '9' && data[6] == '.' && data[7] >= '0' && data[7] <= '9'
	if !digits || !okEnd && data[8] != ' ' && data[8] != '\t' && data[8] != '%' {
		return data
	}
	c := bytes.Clone(data)
	copy(c[5:8], "1.7")
	c[8] = '\n'
	return c
}

// meter serves the file to the library and counts every byte it reads,
// plus what the extractor charges for decompressing; past the limit it
// panics with errTooMuchWork. The library re-reads objects on every
// lookup, so a reference loop shows up here as endless reading. A byte
// read inside an object stream's data counts as many bytes as that stream
// expands to per byte, since the library decompresses what it reads there.
type meter struct {
	data  []byte
	spans []span // sorted by start
	used  int64
	limit int64
}

// readCost is charged for every read besides its bytes, so that reads of
// nothing still count.
const readCost = 64

func (m *meter) ReadAt(p []byte, off int64) (int, error) {
	if off < 0 {
		return 0, errors.New("negative offset")
	}
	if off >= int64(len(m.data)) {
		m.charge(readCost)
		return 0, io.EOF
	}
	n := copy(p, m.data[off:])
	m.charge(int64(n) + readCost + m.expansion(off, off+int64(n)))
	if n < len(p) {
		return n, io.EOF
	}
	return n, nil
}

// expansion returns what reading [from, to) costs beyond its length: the
// overlap with each object stream times its weight less one.
func (m *meter) expansion(from, to int64) int64 {
	i, _ := slices.BinarySearchFunc(m.spans, from, func(s span, v int64) int { return cmp.Compare(s.end, v+1) })
	var extra int64
	for ; i < len(m.spans) && m.spans[i].start < to; i++ {
		s := m.spans[i]
		if lo, hi := max(from, s.start), min(to, s.end); hi > lo {
			extra += (hi - lo) * (s.weight - 1)
		}
	}
	return extra
}

func (m *meter) charge(n int64) {
	m.used += n
	if m.used > m.limit {
		panic(errTooMuchWork)
	}
}

// tooLarge is the panic value that ends a reading whose decompressed
// streams or text pass maxBytes.
type tooLarge struct{ what string }

// extractor holds the budgets of one Extract call.
type extractor struct {
	meter      *meter
	streamLeft int64 // decompressed bytes left for streams
	textLeft   int64 // text bytes left
	maxBytes   int64
	visits     int    // page-tree nodes visited
	fail       string // why the first unreadable stream could not be read
}

// panicError turns a panic from the library or the budgets into an error.
func (x *extractor) panicError(r any) error {
	switch v := r.(type) {
	case tooLarge:
		return &SizeError{What: v.what, Limit: x.maxBytes}
	case error:
		if errors.Is(v, errTooMuchWork) {
			return x.workError()
		}
		var re runtime.Error
		if errors.As(v, &re) {
			return malformed("the PDF library failed: " + v.Error())
		}
		return malformed(trimLibPrefix(v.Error()))
	}
	return malformed(trimLibPrefix(fmt.Sprint(r)))
}

func (x *extractor) workError() error {
	return malformed(fmt.Sprintf("reading it takes more than %d bytes of work (a reference loop?)", x.meter.limit))
}

// libError turns an error of lib.NewReader into ours.
func (x *extractor) libError(err error) error {
	switch {
	case errors.Is(err, errTooMuchWork):
		return x.workError()
	case errors.Is(err, lib.ErrInvalidPassword):
		return ErrEncrypted
	}
	return malformed(trimLibPrefix(err.Error()))
}

// trimLibPrefix drops the library's own "malformed PDF:" prefixes, which
// MalformedError adds back once.
func trimLibPrefix(s string) string {
	for _, p := range []string{"malformed PDF file: ", "malformed PDF: ", "not a PDF file: "} {
		s = strings.TrimPrefix(s, p)
	}
	return s
}

// collect appends the pages below node to out in page-tree order (ISO
// 32000-1 section 7.7.3).
func (x *extractor) collect(node lib.Value, depth int, out *[]lib.Value) error {
	if depth > maxTreeDepth {
		return malformed("the page tree is too deep (a loop?)")
	}
	if x.visits++; x.visits > maxPageNodes {
		return malformed("the page tree has too many nodes")
	}
	if node.Kind() != lib.Dict {
		return nil
	}
	kids := node.Key("Kids")
	if node.Key("Type").Name() == "Page" || kids.Kind() != lib.Array {
		*out = append(*out, node)
		return nil
	}
	for i := range kids.Len() {
		if err := x.collect(kids.Index(i), depth+1, out); err != nil {
			return err
		}
	}
	return nil
}

// inherited looks key up in the page and its ancestors (ISO 32000-1
// section 7.7.3.4), following at most maxTreeDepth /Parent links.
func inherited(pg lib.Value, key string) lib.Value {
	v := pg
	for range maxTreeDepth {
		if v.Kind() != lib.Dict {
			break
		}
		if r := v.Key(key); !r.IsNull() {
			return r
		}
		v = v.Key("Parent")
	}
	return lib.Value{}
}

// page writes the text of one page.
func (x *extractor) page(pg lib.Value, w *textWriter) {
	st := &gstate{saved: saved{ctm: identity}, res: inherited(pg, "Resources"), fonts: map[string]*font{}}
	contents := pg.Key("Contents")
	switch contents.Kind() {
	case lib.Stream:
		x.run(contents, st, w, 0)
	case lib.Array:
		// The parts of an array are one stream split at token boundaries
		// (ISO 32000-1 section 7.8.2); each is read on its own, so that
		// one damaged part does not lose the others.
		for i := range contents.Len() {
			if part := contents.Index(i); part.Kind() == lib.Stream {
				x.run(part, st, w, 0)
			}
		}
	}
}

// run reads the content stream s and writes its text. A panic of the
// library inside is recorded and ends this stream only; the budgets' panics
// go on up.
func (x *extractor) run(s lib.Value, st *gstate, w *textWriter, depth int) {
	defer func() {
		if r := recover(); r != nil {
			if x.fatal(r) {
				panic(r)
			}
			x.failed(r)
		}
	}()
	x.interpret(x.readStream(s), st, w, depth)
}

// fatal reports whether a panic value is one of the budgets'.
func (x *extractor) fatal(r any) bool {
	if _, ok := r.(tooLarge); ok {
		return true
	}
	err, ok := r.(error)
	return ok && errors.Is(err, errTooMuchWork)
}

func (x *extractor) failed(r any) {
	if x.fail == "" {
		x.fail = trimLibPrefix(fmt.Sprint(r))
	}
}

// readStream returns the decoded data of stream s, charging it to the
// stream and work budgets. A read error keeps the data before it.
func (x *extractor) readStream(s lib.Value) []byte {
	if err := checkParms(s.Key("DecodeParms")); err != "" {
		panic(err)
	}
	rd := s.Reader()
	b, err := io.ReadAll(io.LimitReader(rd, x.streamLeft+1))
	if int64(len(b)) > x.streamLeft {
		panic(tooLarge{"PDF streams"})
	}
	x.streamLeft -= int64(len(b))
	x.meter.charge(int64(len(b)))
	if err != nil && x.fail == "" {
		x.fail = "stream data: " + err.Error()
	}
	return b
}

// checkParms refuses predictor parameters that would make the library
// allocate without bound.
func checkParms(p lib.Value) string {
	var ps []lib.Value
	switch p.Kind() {
	case lib.Dict:
		ps = append(ps, p)
	case lib.Array:
		for i := range min(p.Len(), 16) {
			ps = append(ps, p.Index(i))
		}
	}
	for _, q := range ps {
		if c := q.Key("Columns"); !c.IsNull() && (c.Int64() < 1 || c.Int64() > maxColumns) {
			return "bad /Columns in a stream's /DecodeParms"
		}
	}
	return ""
}

// infoTitle returns the Info dictionary's /Title as clean text, "" when
// there is none or it cannot be read.
func (x *extractor) infoTitle(trailer lib.Value) (title string) {
	defer func() {
		if r := recover(); r != nil {
			if x.fatal(r) {
				panic(r)
			}
			title = ""
		}
	}()
	v := trailer.Key("Info").Key("Title")
	if v.Kind() != lib.String {
		return ""
	}
	s := v.Text() // PDFDocEncoding or UTF-16BE (ISO 32000-1 section 7.9.2.2)
	// PDF 2.0 adds UTF-8 with a byte order mark (ISO 32000-2 section
	// 7.9.2.2, from memory).
	if raw := v.RawString(); strings.HasPrefix(raw, "\xef\xbb\xbf") {
		s = raw[3:]
	}
	s = strings.ToValidUTF8(s, "\uFFFD")
	return strings.Join(strings.FieldsFunc(s, func(r rune) bool { return unicode.IsSpace(r) || unicode.IsControl(r) }), " ")
}

// textWriter collects the text of one page, putting line breaks and
// spaces where the text position moves.
type textWriter struct {
	b       strings.Builder
	left    *int64 // text bytes left in the whole file
	started bool
	lastY   float64
	gap     bool // moved along the line since the last text
	newLine bool // moved to the next line explicitly (T*, ', ")
}

// show writes text s drawn at device height y with the given font size.
func (w *textWriter) show(s string, y, size float64) {
	if s == "" {
		return
	}
	if w.started {
		switch {
		case w.newLine || math.Abs(y-w.lastY) >= max(size, 1)/2:
			w.put("\n")
		case w.gap:
			w.put(" ")
		}
	}
	w.put(clean(s))
	w.started, w.lastY, w.gap, w.newLine = true, y, false, false
}

func (w *textWriter) put(s string) {
	if s == " " || s == "\n" {
		if w.b.Len() == 0 {
			return
		}
		if last := w.b.String()[w.b.Len()-1]; last == ' ' || last == '\n' {
			return
		}
	}
	if *w.left -= int64(len(s)); *w.left < 0 {
		panic(tooLarge{"PDF text"})
	}
	w.b.WriteString(s)
}

// clean replaces control characters by spaces, keeping invalid UTF-8
// bytes as they are (the caller counts and repairs them).
func clean(s string) string {
	ok := true
	for i := 0; i < len(s); {
		r, n := utf8.DecodeRuneInString(s[i:])
		if (r != utf8.RuneError || n != 1) && unicode.IsControl(r) {
			ok = false
			break
		}
		i += n
	}
	if ok {
		return s
	}
	var b strings.Builder
	for i := 0; i < len(s); {
		r, n := utf8.DecodeRuneInString(s[i:])
		if (r != utf8.RuneError || n != 1) && unicode.IsControl(r) {
			b.WriteByte(' ')
		} else {
			b.WriteString(s[i : i+n])
		}
		i += n
	}
	return b.String()
}
