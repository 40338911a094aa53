package corpus

import (
	"bytes"
	"errors"
	"io"
	"path"
	"regexp"
	"strings"
	"unicode"
	"unicode/utf8"

	"golang.org/x/net/html"
	"golang.org/x/net/html/atom"
	"golang.org/x/text/encoding"
	"golang.org/x/text/encoding/htmlindex"
	"golang.org/x/text/encoding/ianaindex"
	"golang.org/x/text/transform"
)

// HTML reading.
//
// readHTML reads .html, .htm and .xhtml files with the tokenizer of
// golang.org/x/net/html and keeps the text a reader sees on the page:
//
//   - Dropped with everything inside them: script, style, template,
//     noscript, noembed, iframe and svg elements; the head element
//     except its title; and navigation-like boilerplate, that is nav,
//     aside and form elements, header and footer elements that belong to
//     the whole page (not inside an article, aside, main, nav or section
//     element, which is when HTML gives them the roles banner and
//     contentinfo), and any element whose role attribute starts with
//     navigation, banner or contentinfo. Comments are dropped.
//   - Block elements (p, div, li, h1–h6, tr, table, blockquote, pre and
//     the like) end a line; p, headings, lists, tables, blockquote, pre
//     and hr leave a blank line. br is a line end, a table cell a space.
//     Elsewhere runs of white space become one space; inside pre and
//     textarea the text is kept as it is, but for a line end right after
//     the start tag.
//   - Character references (&amp;, &#233;, &eacute; …) are decoded.
//   - Unclosed elements are closed at the end of the file; an end tag
//     closes the innermost open element of its name and everything opened
//     inside it; an end tag with no open element of its name is ignored.
//     At most maxHTMLOpen elements are tracked as open at once; deeper
//     ones are read as text without their effect on dropping.
//
// The title is the text of the first title element; else the first h1–h6
// heading of the kept text; else [Title] of the text; else the file name.
//
// Character encoding, the first rule that applies: a byte order mark
// (UTF-8, UTF-16); the charset of the enclosing MIME part, for HTML in a
// message; a <meta charset>, a <meta http-equiv="Content-Type"> content
// attribute, or for XHTML the encoding of the XML declaration, found in
// the first 1024 bytes; then UTF-8 when the bytes are valid UTF-8, else
// windows-1252, the usual fallback of browsers for undeclared pages.
// Names are looked up as the WHATWG Encoding Standard labels them
// (htmlindex), then in the IANA registry (ianaindex). A declared encoding
// that is not known is ignored. In UTF-8 invalid sequences are replaced
// and counted in [Document.Repaired]; other decoders replace bytes they
// cannot decode with U+FFFD, uncounted. A meta that declares UTF-16 in an
// ASCII-compatible file is read as UTF-8, as the HTML standard says.
//
// Bounds: the input is at most Options.MaxBytes (Walk's limit); at most
// that many bytes of decoded HTML are tokenized, the rest of a file whose
// decoded form grows past it is dropped.

// maxHTMLOpen is the deepest nesting of open elements that is tracked.
const maxHTMLOpen = 1000

// readHTML reads one HTML file; see the comment at the top of html.go.
func readHTML(p string, raw []byte, opts *Options) ([]Document, []Skip, error) {
	h := renderHTML(raw, "", opts.MaxBytes, false)
	if strings.TrimSpace(h.text) == "" {
		return nil, nil, errors.New("no text (the page has no visible text)")
	}
	title := h.title
	if title == "" {
		title = h.heading
	}
	if title == "" {
		title = Title(h.text, path.Base(p))
	}
	return []Document{{
		ID: p, Title: title, Text: h.text, Repaired: h.repaired, Format: "html",
	}}, nil, nil
}

// htmlResult is the text of an HTML document.
type htmlResult struct {
	title, heading, text string
	repaired             int
}

// renderHTML turns HTML bytes into text. charset is the charset parameter
// of an enclosing MIME part ("" for none); at most limit bytes of decoded
// HTML are read; dropQuotes drops blockquote elements too (for mail).
func renderHTML(raw []byte, charset string, limit int64, dropQuotes bool) htmlResult {
	src, repaired := decodeHTMLBytes(raw, charset, limit)
	z := html.NewTokenizer(strings.NewReader(src))
	r := htmlRenderer{dropQuotes: dropQuotes}
	for {
		tt := z.Next()
		if tt == html.ErrorToken {
			break // io.EOF, or a read error of a strings.Reader: none
		}
		r.token(z, tt)
	}
	text, bad := repairUTF8([]byte(strings.TrimSpace(r.w.b.String())))
	return htmlResult{
		title:    cleanLine(r.title.String()),
		heading:  cleanLine(r.heading.String()),
		text:     text,
		repaired: repaired + bad,
	}
}

// cleanLine makes one line of s, white space collapsed, cut as a title;
// "" when it has no letters or digits.
func cleanLine(s string) string {
	s = strings.Join(strings.Fields(strings.ToValidUTF8(s, "\uFFFD")), " ")
	if !hasText(s) {
		return ""
	}
	return cutTitle(s)
}

// openElem is an element on the renderer's stack of open elements.
type openElem struct {
	name    string
	drop    bool // dropped with its content
	pre     bool // white space kept
	heading bool // h1–h6
}

// htmlRenderer turns tokens into text.
type htmlRenderer struct {
	dropQuotes bool
	stack      []openElem
	dropping   int  // dropped elements on the stack
	pre        int  // pre and textarea elements on the stack
	inHead     bool // inside an explicit head element
	inTitle    bool
	titleDone  bool
	afterPre   bool // the last token was a pre or textarea start tag
	inHeading  int  // stack depth of the heading being captured, 0 for none
	headDone   bool
	title      strings.Builder
	heading    strings.Builder
	w          textWriter
}

// headElems may appear in a head element; any other start tag ends it.
var headElems = map[atom.Atom]bool{
	atom.Title: true, atom.Meta: true, atom.Link: true, atom.Style: true, atom.Script: true,
	atom.Base: true, atom.Noscript: true, atom.Template: true, atom.Basefont: true, atom.Bgsound: true,
}

// voidElems have no content and no end tag.
var voidElems = map[atom.Atom]bool{
	atom.Area: true, atom.Base: true, atom.Br: true, atom.Col: true, atom.Embed: true,
	atom.Hr: true, atom.Img: true, atom.Input: true, atom.Link: true, atom.Meta: true,
	atom.Param: true, atom.Source: true, atom.Track: true, atom.Wbr: true, atom.Keygen: true,
	atom.Basefont: true, atom.Bgsound: true, atom.Frame: true, atom.Image: true,
}

// rawElems are read by the tokenizer as raw text up to their end tag, so
// they are open even when written as self-closing.
var rawElems = map[atom.Atom]bool{
	atom.Script: true, atom.Style: true, atom.Textarea: true, atom.Title: true, atom.Xmp: true,
	atom.Iframe: true, atom.Noembed: true, atom.Noframes: true, atom.Noscript: true, atom.Plaintext: true,
}

// droppedElems are dropped with their content.
var droppedElems = map[atom.Atom]bool{
	atom.Script: true, atom.Style: true, atom.Template: true, atom.Noscript: true,
	atom.Noembed: true, atom.Iframe: true, atom.Svg: true,
	atom.Nav: true, atom.Aside: true, atom.Form: true,
}

// droppedRoles are the role attribute values of dropped elements.
var droppedRoles = map[string]bool{"navigation": true, "banner": true, "contentinfo": true}

// sectioning elements keep a header or footer inside them.
var sectioning = map[string]bool{"article": true, "aside": true, "main": true, "nav": true, "section": true}

// blockBreaks gives the line ends a block element leaves before and after
// it: 1 ends the line, 2 leaves a blank line.
var blockBreaks = map[atom.Atom]int{
	atom.Address: 1, atom.Article: 1, atom.Aside: 1, atom.Body: 1, atom.Caption: 1,
	atom.Center: 1, atom.Dd: 1, atom.Details: 1, atom.Dialog: 1, atom.Div: 1, atom.Dt: 1,
	atom.Fieldset: 1, atom.Figcaption: 1, atom.Figure: 1, atom.Footer: 1, atom.Form: 1,
	atom.Header: 1, atom.Hgroup: 1, atom.Html: 1, atom.Legend: 1, atom.Li: 1, atom.Main: 1,
	atom.Menu: 1, atom.Nav: 1, atom.Option: 1, atom.Section: 1, atom.Summary: 1, atom.Tr: 1,
	atom.Textarea: 1, atom.Frameset: 1, atom.Noframes: 1,
	atom.P: 2, atom.H1: 2, atom.H2: 2, atom.H3: 2, atom.H4: 2, atom.H5: 2, atom.H6: 2,
	atom.Blockquote: 2, atom.Pre: 2, atom.Ul: 2, atom.Ol: 2, atom.Dl: 2, atom.Table: 2,
	atom.Hr: 2, atom.Plaintext: 2, atom.Xmp: 2,
}

func isHeading(a atom.Atom) bool {
	switch a {
	case atom.H1, atom.H2, atom.H3, atom.H4, atom.H5, atom.H6:
		return true
	}
	return false
}

func (r *htmlRenderer) token(z *html.Tokenizer, tt html.TokenType) {
	afterPre := r.afterPre
	r.afterPre = false
	switch tt {
	case html.TextToken:
		s := z.Text()
		if afterPre {
			// A line end right after <pre> or <textarea> is not content
			// (HTML standard, parsing of those start tags).
			s = bytes.TrimPrefix(s, []byte("\n"))
		}
		r.text(s)
	case html.StartTagToken, html.SelfClosingTagToken:
		name, hasAttr := z.TagName()
		a := atom.Lookup(name)
		var role string
		if hasAttr {
			for more := true; more; {
				var k, v []byte
				k, v, more = z.TagAttr()
				if string(k) == "role" {
					role, _, _ = strings.Cut(strings.ToLower(strings.TrimSpace(string(v))), " ")
				}
			}
		}
		r.start(string(name), a, role, tt == html.SelfClosingTagToken)
	case html.EndTagToken:
		name, _ := z.TagName()
		r.end(string(name), atom.Lookup(name))
	}
}

func (r *htmlRenderer) text(s []byte) {
	switch {
	case r.inTitle:
		// A title is never page text; only the first one with text,
		// outside dropped elements (an svg's title), is the title.
		if !r.titleDone && r.dropping == 0 {
			r.title.Write(s)
		}
		return
	case r.dropping > 0:
		return
	case r.inHead:
		if len(bytes.TrimSpace(s)) == 0 {
			return
		}
		r.inHead = false // text ends the head, as in an HTML parser
	}
	if r.inHeading > 0 {
		r.heading.Write(s)
		r.heading.WriteByte(' ')
	}
	if r.pre > 0 {
		r.w.raw(string(s))
		return
	}
	r.w.words(string(s))
}

func (r *htmlRenderer) start(name string, a atom.Atom, role string, selfClosing bool) {
	switch a {
	case atom.Head:
		r.inHead = true
		return
	case atom.Body:
		r.inHead = false
	case atom.Title:
		r.inTitle = true
		return
	case atom.Br:
		if r.dropping == 0 && !r.inHead {
			r.w.lineEnd()
		}
		return
	}
	if r.inHead && !headElems[a] {
		r.inHead = false
	}
	if r.dropping == 0 && !r.inHead {
		if n := blockBreaks[a]; n > 0 {
			r.w.brk(n)
		}
		if a == atom.Td || a == atom.Th {
			r.w.space = true
		}
	}
	if voidElems[a] || (selfClosing && !rawElems[a]) || len(r.stack) >= maxHTMLOpen {
		return
	}
	e := openElem{name: name, pre: a == atom.Pre || a == atom.Textarea || a == atom.Plaintext || a == atom.Xmp}
	switch {
	case droppedElems[a], droppedRoles[role], r.dropQuotes && a == atom.Blockquote:
		e.drop = true
	case a == atom.Header || a == atom.Footer:
		e.drop = !r.inSection()
	}
	e.heading = isHeading(a)
	r.afterPre = e.pre
	r.push(e)
}

// inSection reports whether a sectioning element is open.
func (r *htmlRenderer) inSection() bool {
	for _, e := range r.stack {
		if sectioning[e.name] {
			return true
		}
	}
	return false
}

func (r *htmlRenderer) push(e openElem) {
	r.stack = append(r.stack, e)
	if e.drop {
		r.dropping++
	}
	if e.pre {
		r.pre++
	}
	if e.heading && r.dropping == 0 && !r.headDone && r.inHeading == 0 {
		r.inHeading = len(r.stack)
	}
}

func (r *htmlRenderer) end(name string, a atom.Atom) {
	switch a {
	case atom.Head:
		r.inHead = false
		return
	case atom.Title:
		if r.inTitle && !r.titleDone {
			r.titleDone = hasText(r.title.String())
			if !r.titleDone {
				r.title.Reset()
			}
		}
		r.inTitle = false
		return
	case atom.Br: // </br> is read as <br>
		if r.dropping == 0 && !r.inHead {
			r.w.lineEnd()
		}
		return
	}
	i := len(r.stack) - 1
	for i >= 0 && r.stack[i].name != name {
		i--
	}
	for i >= 0 && len(r.stack) > i { // i < 0: no open element of that name
		e := r.stack[len(r.stack)-1]
		r.stack = r.stack[:len(r.stack)-1]
		if e.drop {
			r.dropping--
		}
		if e.pre {
			r.pre--
		}
		if r.inHeading > len(r.stack) {
			r.inHeading = 0
			r.headDone = hasText(r.heading.String())
			if !r.headDone {
				r.heading.Reset()
			}
		}
	}
	if r.dropping == 0 {
		if n := blockBreaks[a]; n > 0 {
			r.w.brk(n)
		}
		if a == atom.Td || a == atom.Th {
			r.w.space = true
		}
	}
}

// textWriter builds text from words, spaces and line ends, so that no
// line starts or ends with a space and at most one blank line is in a row.
type textWriter struct {
	b      strings.Builder
	space  bool // a space is due before the next text
	breaks int  // line ends due before the next text
	trail  int  // line ends at the end of b
}

// brk asks for n line ends (1 or 2) before the next text.
func (w *textWriter) brk(n int) { w.breaks = max(w.breaks, n) }

// lineEnd writes a line end now (a br element), after those due.
func (w *textWriter) lineEnd() {
	if w.b.Len() == 0 {
		return
	}
	for w.trail < min(w.breaks, 2) {
		w.b.WriteByte('\n')
		w.trail++
	}
	if w.trail < 2 {
		w.b.WriteByte('\n')
		w.trail++
	}
	w.space, w.breaks = false, 0
}

// sep writes the space or line ends due before text.
func (w *textWriter) sep() {
	if w.b.Len() > 0 {
		switch {
		case w.breaks > w.trail:
			w.b.WriteString("\n\n"[:w.breaks-w.trail])
		case w.space && w.trail == 0:
			w.b.WriteByte(' ')
		}
	}
	w.space, w.breaks = false, 0
}

// words writes s with its white space collapsed.
func (w *textWriter) words(s string) {
	fields := strings.Fields(s)
	if len(fields) == 0 {
		if s != "" {
			w.space = true
		}
		return
	}
	if r, _ := utf8.DecodeRuneInString(s); unicode.IsSpace(r) {
		w.space = true
	}
	for i, f := range fields {
		if i > 0 {
			w.space = true
		}
		w.sep()
		w.b.WriteString(f)
		w.trail = 0
	}
	if r, _ := utf8.DecodeLastRuneInString(s); unicode.IsSpace(r) {
		w.space = true
	}
}

// raw writes preformatted text as it is.
func (w *textWriter) raw(s string) {
	if s == "" {
		return
	}
	w.sep()
	w.b.WriteString(s)
	n := len(s) - len(strings.TrimRight(s, "\n"))
	if n == len(s) {
		w.trail += n
	} else {
		w.trail = n
	}
}

// decodeHTMLBytes decodes HTML to UTF-8 by the rules at the top of this
// file, reading at most limit decoded bytes. It returns the number of
// invalid UTF-8 sequences replaced.
func decodeHTMLBytes(raw []byte, charset string, limit int64) (string, int) {
	var enc encoding.Encoding
	switch {
	case bytes.HasPrefix(raw, []byte("\xef\xbb\xbf")):
		raw = raw[3:]
	case bytes.HasPrefix(raw, []byte("\xfe\xff")):
		enc, _ = htmlindex.Get("utf-16be")
	case bytes.HasPrefix(raw, []byte("\xff\xfe")):
		enc, _ = htmlindex.Get("utf-16le")
	default:
		e, known := lookupCharset(charset)
		if !known {
			e, known = lookupCharset(metaCharset(raw))
			if known && isUTF16(e) {
				e = nil
			}
		}
		switch {
		case known:
			enc = e
		case !utf8.Valid(raw):
			enc, _ = htmlindex.Get("windows-1252")
		}
	}
	s, bad := decodeCharset(raw, enc, limit)
	return strings.TrimPrefix(s, "\ufeff"), bad
}

func isUTF16(e encoding.Encoding) bool {
	n, err := htmlindex.Name(e)
	return err == nil && strings.HasPrefix(n, "utf-16")
}

// lookupCharset finds the encoding of a charset name: nil for UTF-8 (and
// US-ASCII, a subset of it), the WHATWG label (htmlindex), else the IANA
// name or alias (ianaindex). known is false for an empty or unknown name.
func lookupCharset(name string) (enc encoding.Encoding, known bool) {
	name = strings.ToLower(strings.Trim(strings.TrimSpace(name), `"'`))
	switch name {
	case "":
		return nil, false
	case "utf-8", "utf8", "us-ascii", "ascii", "ansi_x3.4-1968":
		return nil, true
	}
	if e, err := htmlindex.Get(name); err == nil {
		if n, _ := htmlindex.Name(e); n == "utf-8" {
			return nil, true
		}
		return e, true
	}
	if e, err := ianaindex.IANA.Encoding(name); err == nil && e != nil {
		return e, true
	}
	return nil, false
}

// decodeCharset decodes raw from enc (nil for UTF-8) into valid UTF-8,
// keeping at most limit bytes of output. It returns the number of invalid
// UTF-8 sequences replaced (for UTF-8 input).
func decodeCharset(raw []byte, enc encoding.Encoding, limit int64) (string, int) {
	if limit <= 0 {
		limit = DefaultMaxBytes
	}
	if enc == nil {
		if int64(len(raw)) > limit {
			raw = raw[:limit]
		}
		return repairUTF8(raw)
	}
	out, _ := io.ReadAll(io.LimitReader(transform.NewReader(bytes.NewReader(raw), enc.NewDecoder()), limit))
	// The decoders of golang.org/x/text write U+FFFD for what they cannot
	// decode and return no error for bad input; a cut at the limit can
	// still split a rune.
	s, _ := repairUTF8(out)
	return s, 0
}

// xmlEncoding finds the encoding pseudo-attribute of an XML declaration.
var xmlEncoding = regexp.MustCompile(`encoding\s*=\s*["']([A-Za-z0-9._:-]+)["']`)

// metaCharset finds the charset declared in the first 1024 bytes of an
// HTML file: <meta charset>, <meta http-equiv="Content-Type" content="…;
// charset=…">, or an XML declaration's encoding. "" for none.
func metaCharset(raw []byte) string {
	z := html.NewTokenizer(bytes.NewReader(raw[:min(len(raw), 1024)]))
	for {
		switch z.Next() {
		case html.ErrorToken:
			return ""
		case html.CommentToken:
			// The tokenizer reads "<?xml … ?>" as a comment.
			if c := z.Text(); bytes.HasPrefix(c, []byte("?xml")) {
				if m := xmlEncoding.FindSubmatch(c); m != nil {
					return string(m[1])
				}
			}
		case html.StartTagToken, html.SelfClosingTagToken:
			name, hasAttr := z.TagName()
			if string(name) != "meta" || !hasAttr {
				continue
			}
			var charset, equiv, content string
			for more := true; more; {
				var k, v []byte
				k, v, more = z.TagAttr()
				switch string(k) {
				case "charset":
					charset = string(v)
				case "http-equiv":
					equiv = string(v)
				case "content":
					content = string(v)
				}
			}
			if charset != "" {
				return charset
			}
			if strings.EqualFold(strings.TrimSpace(equiv), "content-type") {
				if cs := contentCharset(content); cs != "" {
					return cs
				}
			}
		}
	}
}

// contentCharset takes the charset out of a meta content attribute such
// as "text/html; charset=windows-1252" (the value may be quoted).
func contentCharset(s string) string {
	i := strings.Index(strings.ToLower(s), "charset")
	if i < 0 {
		return ""
	}
	s = strings.TrimLeft(s[i+len("charset"):], " \t\n\f\r")
	if !strings.HasPrefix(s, "=") {
		return ""
	}
	s = strings.TrimLeft(s[1:], " \t\n\f\r")
	if s != "" && (s[0] == '"' || s[0] == '\'') {
		if j := strings.IndexByte(s[1:], s[0]); j >= 0 {
			return s[1 : j+1]
		}
		return ""
	}
	if j := strings.IndexAny(s, " \t\n\f\r;"); j >= 0 {
		s = s[:j]
	}
	return s
}
