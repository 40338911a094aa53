package pdf

import (
	"bytes"
	"math"
	"unicode/utf8"

	lib "github.com/ledongthuc/pdf"
)

// matrix is an affine transform [a b c d e f] (ISO 32000-1 section 8.3.3):
// a point (x, y) maps to (a·x + c·y + e, b·x + d·y + f).
type matrix [6]float64

var identity = matrix{1, 0, 0, 1, 0, 0}

// mul returns m × n: first m, then n.
func (m matrix) mul(n matrix) matrix {
	return matrix{
		m[0]*n[0] + m[1]*n[2],
		m[0]*n[1] + m[1]*n[3],
		m[2]*n[0] + m[3]*n[2],
		m[2]*n[1] + m[3]*n[3],
		m[4]*n[0] + m[5]*n[2] + n[4],
		m[4]*n[1] + m[5]*n[3] + n[5],
	}
}

func translate(tx, ty float64) matrix { return matrix{1, 0, 0, 1, tx, ty} }

// saved is the part of the graphics state that q and Q save and restore
// (ISO 32000-1 section 8.4.2) and that matters for placing text.
type saved struct {
	ctm     matrix
	font    *font
	size    float64 // Tf size
	leading float64 // TL
}

// maxSaveDepth bounds nested q operators; deeper ones are counted but not
// saved.
const maxSaveDepth = 256

// gstate is the state of one content stream being read.
type gstate struct {
	saved
	res    lib.Value // the resource dictionary
	fonts  map[string]*font
	stack  []saved
	extra  int // q operators beyond maxSaveDepth
	tm     matrix
	tlm    matrix
	inText bool
}

// maxOperands bounds the operands kept before an operator; content
// streams use at most a handful (a TJ array is one operand).
const maxOperands = 64

// tjSpace is the TJ adjustment, in thousandths of an em, at or beyond which
// a gap counts as a space between words (common practice; an inter-word
// space is a quarter to a third of an em, kerning a few hundredths).
const tjSpace = 200

// formCost is charged to the work budget for each form XObject drawn, so
// that forms drawing each other many times cannot run for ever.
const formCost = 1024

// interpret reads the content stream b (ISO 32000-1 section 7.8.2) and
// writes the text it shows. A syntax error ends the stream, keeping what
// was read.
func (x *extractor) interpret(b []byte, st *gstate, w *textWriter, depth int) {
	lx := &lexer{b: b, content: true}
	var args []any
	for {
		t := lx.object(0)
		if t == nil {
			if lx.err != "" && x.fail == "" {
				x.fail = "content stream: " + lx.err
			}
			return
		}
		op, ok := t.(pdfKeyword)
		if !ok || op == tokDictClose || op == tokArrClose {
			if len(args) < maxOperands {
				args = append(args, t)
			}
			continue
		}
		x.operator(string(op), args, st, w, depth)
		if op == "ID" {
			skipInlineImage(lx)
		}
		args = args[:0]
	}
}

// skipInlineImage moves past the data of an inline image, which follows
// "ID" and one white-space byte and ends at "EI" between white space
// (ISO 32000-1 section 8.9.7).
func skipInlineImage(lx *lexer) {
	b := lx.b
	for i := lx.pos + 1; i+1 < len(b); i++ {
		i1 := bytes.Index(b[i:], []byte("EI"))
		if i1 < 0 {
			break
		}
		i += i1
		if isWhite(b[i-1]) && (i+2 == len(b) || isWhite(b[i+2]) || isDelimiter(b[i+2])) {
			lx.pos = i + 2
			return
		}
	}
	lx.pos = len(b)
}

func num(args []any, i int) float64 {
	if i >= len(args) {
		return 0
	}
	switch v := args[i].(type) {
	case int64:
		return float64(v)
	case float64:
		return v
	}
	return 0
}

func argMatrix(args []any) matrix {
	var m matrix
	for i := range m {
		m[i] = num(args, i)
	}
	return m
}

// operator carries out one content-stream operator. Only those that show
// text or move it are read: graphics state (Table 57: q, Q, cm), text
// state (Table 105: Tf, TL), text objects and positioning (Tables 107,
// 108: BT, ET, Td, TD, Tm, T*), text showing (Table 109: Tj, TJ, ', ")
// and XObjects (Do, section 8.8). The rest are ignored.
func (x *extractor) operator(op string, args []any, st *gstate, w *textWriter, depth int) {
	switch op {
	case "q":
		if len(st.stack) < maxSaveDepth {
			st.stack = append(st.stack, st.saved)
		} else {
			st.extra++
		}
	case "Q":
		switch {
		case st.extra > 0:
			st.extra--
		case len(st.stack) > 0:
			st.saved = st.stack[len(st.stack)-1]
			st.stack = st.stack[:len(st.stack)-1]
		}
	case "cm":
		if len(args) == 6 {
			st.ctm = argMatrix(args).mul(st.ctm)
		}
	case "BT":
		st.tm, st.tlm, st.inText = identity, identity, true
	case "ET":
		st.inText = false
	case "Tf":
		if len(args) == 2 {
			name, _ := args[0].(pdfName)
			st.font = x.font(st, string(name))
			st.size = num(args, 1)
		}
	case "TL":
		st.leading = num(args, 0)
	case "Td", "TD":
		if op == "TD" {
			st.leading = -num(args, 1)
		}
		st.tlm = translate(num(args, 0), num(args, 1)).mul(st.tlm)
		st.tm = st.tlm
		w.gap = true
	case "Tm":
		if len(args) == 6 {
			st.tm = argMatrix(args)
			st.tlm = st.tm
			w.gap = true
		}
	case "T*":
		st.nextLine(w)
	case "Tj":
		if len(args) == 1 {
			x.show(args[0], st, w)
		}
	case "'":
		if len(args) == 1 {
			st.nextLine(w)
			x.show(args[0], st, w)
		}
	case "\"":
		if len(args) == 3 {
			st.nextLine(w)
			x.show(args[2], st, w)
		}
	case "TJ":
		if len(args) == 1 {
			parts, _ := args[0].([]any)
			for _, p := range parts {
				switch v := p.(type) {
				case string:
					x.show(v, st, w)
				case int64, float64:
					if num([]any{v}, 0) <= -tjSpace {
						w.gap = true
					}
				}
			}
		}
	case "Do":
		if len(args) == 1 {
			name, _ := args[0].(pdfName)
			x.form(st, string(name), w, depth)
		}
	}
}

// nextLine moves to the start of the next line (T*).
func (st *gstate) nextLine(w *textWriter) {
	st.tlm = translate(0, -st.leading).mul(st.tlm)
	st.tm = st.tlm
	w.newLine = true
}

// show writes a string operand in the current font at the current text
// position.
func (x *extractor) show(arg any, st *gstate, w *textWriter) {
	s, ok := arg.(string)
	if !ok || s == "" {
		return
	}
	trm := st.tm.mul(st.ctm)
	size := math.Abs(st.size) * math.Hypot(trm[2], trm[3])
	w.show(st.font.decode(s), trm[5], size)
}

// form reads the text of the form XObject named name (ISO 32000-1 section
// 8.10): its stream, drawn with its /Matrix, with its own resources or
// else the current ones.
func (x *extractor) form(st *gstate, name string, w *textWriter, depth int) {
	if depth >= maxFormDepth {
		return
	}
	xo := st.res.Key("XObject").Key(name)
	if xo.Kind() != lib.Stream || xo.Key("Subtype").Name() != "Form" {
		return
	}
	x.meter.charge(formCost)
	sub := &gstate{res: st.res, fonts: st.fonts}
	sub.saved = st.saved
	if res := xo.Key("Resources"); res.Kind() == lib.Dict {
		sub.res, sub.fonts = res, map[string]*font{}
	}
	if m := xo.Key("Matrix"); m.Kind() == lib.Array && m.Len() == 6 {
		var fm matrix
		for i := range fm {
			fm[i] = m.Index(i).Float64()
		}
		sub.ctm = fm.mul(st.ctm)
	}
	x.run(xo, sub, w, depth+1)
}

// font is how one font's codes become text.
type font struct {
	cmap  *cmap            // the ToUnicode CMap, when there is one
	enc   lib.TextEncoding // the library's simple-font encoding, or
	codes bool             // a composite font without ToUnicode: no text
}

// font returns the font named name in the current resources, loading it
// the first time.
func (x *extractor) font(st *gstate, name string) *font {
	if f, ok := st.fonts[name]; ok {
		return f
	}
	f := x.loadFont(st.res.Key("Font").Key(name))
	if len(st.fonts) < 1024 {
		st.fonts[name] = f
	}
	return f
}

// loadFont prefers a font's ToUnicode CMap (ISO 32000-1 section 9.10.2
// names it as the first way to Unicode), then the library's reading of a
// simple font's /Encoding. The library's encoder is used only where it
// would not read the CMap itself.
func (x *extractor) loadFont(v lib.Value) (f *font) {
	f = &font{}
	if v.Kind() != lib.Dict {
		return f
	}
	tu := v.Key("ToUnicode")
	if tu.Kind() == lib.Stream {
		if m := x.readCMap(tu); m != nil {
			f.cmap = m
			return f
		}
	}
	if v.Key("Subtype").Name() == "Type0" {
		f.codes = true
		return f
	}
	enc := v.Key("Encoding")
	switch {
	case enc.Kind() == lib.Dict:
		if enc.Key("Differences").Len() > maxDifferences {
			return f
		}
	case enc.Kind() == lib.Name && enc.Name() != "Identity-H":
	case tu.Kind() == lib.Stream:
		return f // the library would read the CMap we could not
	}
	lf := &lib.Font{V: v}
	f.enc = lf.Encoder()
	return f
}

// readCMap reads and parses a ToUnicode stream; nil if it cannot be read.
func (x *extractor) readCMap(tu lib.Value) (m *cmap) {
	defer func() {
		if r := recover(); r != nil {
			if x.fatal(r) {
				panic(r)
			}
			m = nil
		}
	}()
	return parseCMap(x.readStream(tu))
}

// decode turns a shown string into text. Without a font or an encoding,
// or where the encoding gives no valid UTF-8, bytes are read as Latin-1.
func (f *font) decode(raw string) string {
	switch {
	case f == nil:
		return latin1(raw)
	case f.cmap != nil:
		return f.cmap.decode(raw)
	case f.codes:
		return ""
	case f.enc != nil:
		if s := f.enc.Decode(raw); utf8.ValidString(s) {
			return s
		}
	}
	return latin1(raw)
}

func latin1(s string) string {
	r := make([]rune, len(s))
	for i := 0; i < len(s); i++ {
		r[i] = rune(s[i])
	}
	return string(r)
}
