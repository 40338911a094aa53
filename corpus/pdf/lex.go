package pdf

import (
	"bytes"
	"strconv"
)

// This file holds a small reader of PDF objects (ISO 32000-1 section 7.3)
// used only by the cross-reference check in xref.go, before the library
// sees the file. It reads dictionaries, arrays, numbers, names, strings and
// references, which is all a trailer or a cross-reference stream holds.

// objRef is an indirect reference "id gen R" (ISO 32000-1 section 7.3.10).
type objRef struct {
	id  uint32
	gen uint16
}

// pdfName is a name object without its slash, #xx escapes decoded.
type pdfName string

// pdfKeyword is a bare word that is not a number, name or boolean: obj,
// endobj, R, stream, xref, trailer, null and the like.
type pdfKeyword string

// delimiter tokens.
const (
	tokDictOpen  pdfKeyword = "<<"
	tokDictClose pdfKeyword = ">>"
	tokArrOpen   pdfKeyword = "["
	tokArrClose  pdfKeyword = "]"
)

// maxNesting bounds how deep dictionaries and arrays may nest in what the
// check reads; real trailers nest two or three levels.
const maxNesting = 64

// lexer reads tokens from b starting at pos. Its methods report a syntax
// problem by setting err; after that every token is nil.
type lexer struct {
	b   []byte
	pos int
	err string
	// content is set for content streams and CMaps (ISO 32000-1 sections
	// 7.8.2 and 9.10.3): "{" and "}" are words there, and "id gen R" is
	// not a reference.
	content bool
}

func isWhite(c byte) bool {
	switch c {
	case 0, '\t', '\n', '\f', '\r', ' ':
		return true
	}
	return false
}

func isDelimiter(c byte) bool {
	switch c {
	case '<', '>', '(', ')', '[', ']', '{', '}', '/', '%':
		return true
	}
	return false
}

func unhexDigit(c byte) int {
	switch {
	case '0' <= c && c <= '9':
		return int(c - '0')
	case 'a' <= c && c <= 'f':
		return int(c-'a') + 10
	case 'A' <= c && c <= 'F':
		return int(c-'A') + 10
	}
	return -1
}

func (lx *lexer) fail(msg string) any {
	if lx.err == "" {
		lx.err = msg
	}
	lx.pos = len(lx.b)
	return nil
}

// skipWhite skips white space and comments.
func (lx *lexer) skipWhite() {
	for lx.pos < len(lx.b) {
		c := lx.b[lx.pos]
		switch {
		case isWhite(c):
			lx.pos++
		case c == '%':
			for lx.pos < len(lx.b) && lx.b[lx.pos] != '\r' && lx.b[lx.pos] != '\n' {
				lx.pos++
			}
		default:
			return
		}
	}
}

// token returns the next token: int64, float64, bool, string (a string
// object's bytes), pdfName, pdfKeyword, or nil at the end or on an error.
func (lx *lexer) token() any {
	lx.skipWhite()
	if lx.err != "" || lx.pos >= len(lx.b) {
		return nil
	}
	c := lx.b[lx.pos]
	switch c {
	case '<':
		if lx.pos+1 < len(lx.b) && lx.b[lx.pos+1] == '<' {
			lx.pos += 2
			return tokDictOpen
		}
		return lx.hexString()
	case '>':
		if lx.pos+1 < len(lx.b) && lx.b[lx.pos+1] == '>' {
			lx.pos += 2
			return tokDictClose
		}
		return lx.fail("stray >")
	case '[':
		lx.pos++
		return tokArrOpen
	case ']':
		lx.pos++
		return tokArrClose
	case '(':
		return lx.literalString()
	case '/':
		return lx.name()
	case '{', '}':
		if lx.content {
			lx.pos++
			return pdfKeyword(lx.b[lx.pos-1 : lx.pos])
		}
		return lx.fail("unexpected " + string(c))
	case ')':
		return lx.fail("unexpected )")
	}
	start := lx.pos
	for lx.pos < len(lx.b) && !isWhite(lx.b[lx.pos]) && !isDelimiter(lx.b[lx.pos]) {
		lx.pos++
	}
	w := string(lx.b[start:lx.pos])
	switch w {
	case "true":
		return true
	case "false":
		return false
	}
	if n, err := strconv.ParseInt(w, 10, 64); err == nil {
		return n
	}
	if isRealWord(w) {
		if f, err := strconv.ParseFloat(w, 64); err == nil {
			return f
		}
	}
	return pdfKeyword(w)
}

// isRealWord reports whether w is a PDF real: optional sign, digits and
// exactly one period (ISO 32000-1 section 7.3.3; no exponent form).
func isRealWord(w string) bool {
	if w != "" && (w[0] == '+' || w[0] == '-') {
		w = w[1:]
	}
	dots := 0
	for i := 0; i < len(w); i++ {
		switch {
		case w[i] == '.':
			dots++
		case w[i] < '0' || w[i] > '9':
			return false
		}
	}
	return w != "" && dots == 1
}

func (lx *lexer) name() any {
	lx.pos++ // the slash
	var out []byte
	for lx.pos < len(lx.b) {
		c := lx.b[lx.pos]
		if isWhite(c) || isDelimiter(c) {
			break
		}
		if c == '#' && lx.pos+2 < len(lx.b) && unhexDigit(lx.b[lx.pos+1]) >= 0 && unhexDigit(lx.b[lx.pos+2]) >= 0 {
			out = append(out, byte(unhexDigit(lx.b[lx.pos+1])<<4|unhexDigit(lx.b[lx.pos+2])))
			lx.pos += 3
			continue
		}
		out = append(out, c)
		lx.pos++
	}
	return pdfName(out)
}

func (lx *lexer) hexString() any {
	lx.pos++ // the <
	end := bytes.IndexByte(lx.b[lx.pos:], '>')
	if end < 0 {
		return lx.fail("unterminated hex string")
	}
	var out []byte
	hi := -1
	for _, c := range lx.b[lx.pos : lx.pos+end] {
		if isWhite(c) {
			continue
		}
		d := unhexDigit(c)
		if d < 0 {
			return lx.fail("bad hex string")
		}
		if hi < 0 {
			hi = d
		} else {
			out = append(out, byte(hi<<4|d))
			hi = -1
		}
	}
	if hi >= 0 {
		out = append(out, byte(hi<<4)) // ISO 32000-1 7.3.4.3: a final odd digit is followed by 0
	}
	lx.pos += end + 1
	return string(out)
}

func (lx *lexer) literalString() any {
	lx.pos++ // the (
	var out []byte
	depth := 1
	for lx.pos < len(lx.b) {
		c := lx.b[lx.pos]
		lx.pos++
		switch c {
		case '(':
			depth++
		case ')':
			if depth--; depth == 0 {
				return string(out)
			}
		case '\\':
			out = lx.escape(out)
			continue
		}
		out = append(out, c)
	}
	return lx.fail("unterminated string")
}

// escape appends the character of the escape sequence after a backslash
// in a literal string (ISO 32000-1 section 7.3.4.2, Table 3): \n \r \t \b
// \f \( \) \\, up to three octal digits, or nothing for a backslash before a
// line end; before any other character the backslash is ignored.
func (lx *lexer) escape(out []byte) []byte {
	if lx.pos >= len(lx.b) {
		return out
	}
	c := lx.b[lx.pos]
	lx.pos++
	switch c {
	case 'n':
		return append(out, '\n')
	case 'r':
		return append(out, '\r')
	case 't':
		return append(out, '\t')
	case 'b':
		return append(out, '\b')
	case 'f':
		return append(out, '\f')
	case '\r':
		if lx.pos < len(lx.b) && lx.b[lx.pos] == '\n' {
			lx.pos++
		}
		return out
	case '\n':
		return out
	}
	if c >= '0' && c <= '7' {
		v := int(c - '0')
		for k := 0; k < 2 && lx.pos < len(lx.b) && lx.b[lx.pos] >= '0' && lx.b[lx.pos] <= '7'; k++ {
			v = v*8 + int(lx.b[lx.pos]-'0')
			lx.pos++
		}
		return append(out, byte(v)) // high-order overflow is ignored (section 7.3.4.2)
	}
	return append(out, c)
}

// object reads one object: the token types above, plus map[pdfName]any for
// a dictionary, []any for an array and objRef for "id gen R".
func (lx *lexer) object(depth int) any {
	if depth > maxNesting {
		return lx.fail("objects nested too deeply")
	}
	t := lx.token()
	switch t {
	case tokDictOpen:
		d := map[pdfName]any{}
		for {
			k := lx.token()
			if k == tokDictClose {
				return d
			}
			key, ok := k.(pdfName)
			if !ok {
				return lx.fail("dictionary key is not a name")
			}
			d[key] = lx.object(depth + 1)
			if lx.err != "" {
				return nil
			}
		}
	case tokArrOpen:
		var a []any
		for {
			save := lx.pos
			switch lx.token() {
			case tokArrClose:
				return a
			case nil:
				return lx.fail("unterminated array")
			}
			lx.pos = save
			a = append(a, lx.object(depth+1))
			if lx.err != "" {
				return nil
			}
		}
	}
	if id, ok := t.(int64); ok && !lx.content && id >= 0 && id <= 1<<32-1 {
		save := lx.pos
		if gen, ok := lx.token().(int64); ok && gen >= 0 && gen <= 1<<16-1 {
			if lx.token() == pdfKeyword("R") {
				return objRef{uint32(id), uint16(gen)}
			}
		}
		lx.pos, lx.err = save, ""
	}
	return t
}

// indirect reads "id gen obj" and the object after it at the lexer's
// position. For a stream it returns the dictionary and the offset of the
// stream's data; data is -1 otherwise.
func (lx *lexer) indirect() (id int64, obj any, data int) {
	id, ok := lx.token().(int64)
	if !ok {
		return 0, lx.fail("no object number"), -1
	}
	if _, ok := lx.token().(int64); !ok {
		return 0, lx.fail("no generation number"), -1
	}
	if lx.token() != pdfKeyword("obj") {
		return 0, lx.fail("no obj keyword"), -1
	}
	obj = lx.object(0)
	if lx.err != "" {
		return 0, nil, -1
	}
	save := lx.pos
	if lx.token() != pdfKeyword("stream") {
		lx.pos = save
		return id, obj, -1
	}
	// ISO 32000-1 7.3.8.1: "stream" is followed by CRLF or LF.
	if lx.pos < len(lx.b) && lx.b[lx.pos] == '\r' {
		lx.pos++
	}
	if lx.pos < len(lx.b) && lx.b[lx.pos] == '\n' {
		lx.pos++
	}
	return id, obj, lx.pos
}
