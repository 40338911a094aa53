package corpus

import (
	"bytes"
	"crypto/sha256"
	"errors"
	"fmt"
	"io"
	"mime"
	"mime/multipart"
	"net/mail"
	"net/textproto"
	"path"
	"regexp"
	"slices"
	"strconv"
	"strings"
	"unicode"

	"golang.org/x/text/transform"
)

// E-mail reading (.eml files, and each message of an mbox file).
//
// A message is parsed with net/mail (RFC 5322) and its MIME structure with
// mime/multipart (RFC 2045–2049). A leading mbox "From " line, as some
// mail programs save it, is dropped first. A header that net/mail cannot
// parse makes the file a skip: "malformed mail header: …".
//
// # Body text
//
//   - A part without a Content-Type, or with one that cannot be parsed,
//     is text/plain (RFC 2045 section 5.2); in multipart/digest a part
//     without one is message/rfc822 (RFC 2046 section 5.1.5).
//   - Transfer encodings: base64 (characters outside its alphabet are
//     ignored, RFC 2045 section 6.8; padding in the middle ends a group)
//     and quoted-printable (RFC 2045 section 6.7; "=" not followed by two
//     hex digits or a line end is kept as it is; lower-case hex is
//     accepted); anything else is taken as it is.
//   - Charsets are decoded to UTF-8 with golang.org/x/text (names looked up
//     in the WHATWG labels, then the IANA registry). UTF-8, US-ASCII, a
//     missing charset and an unknown charset are all read as UTF-8, with
//     invalid sequences replaced by U+FFFD and counted in
//     [Document.Repaired]. text/plain with format=flowed is unwrapped
//     (RFC 3676).
//   - Header fields (Subject, From, To, Cc, Date, Message-ID) have their
//     RFC 2047 encoded words decoded, also those (against RFC 2047
//     section 5, but common practice) inside quoted strings and file
//     names; they are kept in [Document.Meta] on one line.
//   - Body parts: text/html is rendered to text as the HTML reader does
//     (blockquote elements dropped too unless KeepQuoted); other text/*
//     parts are read as plain text. In multipart/alternative the first
//     text/plain alternative with text is read, else the last alternative
//     that gives text (RFC 2046 section 5.1.4 puts the richest last).
//     Other multiparts are read part by part, nested ones too. The text of
//     the body parts is joined with blank lines.
//   - A multipart without a boundary parameter, or whose boundary never
//     appears, is read as text/plain. A message cut short keeps the text
//     of the parts read until the cut.
//   - An unnamed message/rfc822 part that is not an attachment (a message
//     forwarded inline, the returned message of a bounce) adds its body
//     text to the message's; its header is dropped.
//
// # Quoted text
//
// Unless Options.KeepQuoted, these lines are removed from each text part
// (a part's text, not the whole message, is one unit):
//
//  1. a signature: the first line that is exactly "-- " (RFC 3676 section
//     4.3) and everything after it in the part;
//  2. quoted lines: lines whose first character other than spaces and
//     tabs is ">";
//  3. attribution lines: a line starting with "On " and ending with
//     "wrote:"; a line starting with "On " whose next line ends with
//     "wrote:" (a wrapped attribution: both lines); and a line ending with
//     "wrote:" or "writes:" whose next line with text is a quoted line;
//  4. reply and forward headers: a line such as "-----Original
//     Message-----", "-------- Forwarded Message --------" or "----------
//     Forwarded message ---------" (two or more hyphens, then "Original
//     Message" or "Forwarded message" in any letter case, then optional
//     hyphens), or "Begin forwarded message:"; with it the block of header
//     lines that follows (blank lines before the block are allowed): lines
//     starting with From:, Sent:, Date:, To:, Cc:, Bcc:, Subject: or
//     Reply-To: (any case), and lines starting with a space or tab right
//     after one of those. The text of the original or forwarded message
//     below the block is kept.
//
// Attributions in other languages are not recognised. When nothing is
// left of the whole message after this (a message that only forwards a
// quoted text), its text is read with nothing removed.
//
// # Attachments
//
// A part is an attachment when its Content-Disposition is "attachment",
// or when it has a file name (Content-Disposition filename, else
// Content-Type name) and is neither text/plain nor text/html, or when it
// is a named message/rfc822 part. Unless Options.NoAttachments, an
// attachment whose file name's extension has a reader (the extensions
// Walk reads; an unnamed attachment of type text/plain, text/html,
// text/csv, application/pdf, the DOCX type or message/rfc822 is named
// "partN" with that type's extension, N its place in its multipart) is decoded and read by that reader
// as a document of its own, with ID "<message ID>#<file name>" (a repeated
// name gets "~2", "~3" … before its extension), Container the path of the
// file, and Size and Hash of its decoded bytes. A reader's error or
// "no text" is a skip of that ID. An attached message (.eml or
// message/rfc822) is read as mail, its attachments in turn, within the
// nesting cap. Other attachments are ignored.
//
// # Documents
//
// A message gives a document with ID the file's path, Format "email" and
// Container "" (a message of a mailbox: ID "box.mbox#N", Format "mbox",
// Container the mailbox's path; an attached message: Format "email",
// Container the path of the file it is in). Its title is the
// decoded Subject; else [Title] of its text; else the file name. A
// message with no body text is skipped ("no text in the message (…)",
// saying what it had instead); when it has attachments that were read,
// those are still documents and only the message is a skip.
//
// # Caps
//
//   - MIME nesting: parts more than maxMIMEDepth (20) levels deep, counting
//     each multipart and each attached message as a level, are not read.
//   - Parts: after maxMIMEParts (1000) parts of one message (with its
//     attached messages) the rest are not read.
//   - Size: the bytes produced by base64 and quoted-printable decoding,
//     summed over all parts at every depth of one file (one mbox
//     included), never exceed Options.MaxBytes (other parts are slices of
//     the file, itself at most that size); charset decoding of one part is
//     cut at that size too; an attachment's reader gets the rest of the
//     budget as its MaxBytes.
//
// A cap that is reached leaves a skip on the message's ID saying what was
// not read; the rest of the message is still a document.

// Caps of the mail reader (see the comment at the top of mail.go).
const (
	maxMIMEDepth = 20
	maxMIMEParts = 1000
)

// attachmentReaders is the readers table, for attachments. It is set in
// init because readers refers to readMail, which would otherwise refer
// back to readers: an initialization cycle.
var attachmentReaders map[string]reader

func init() { attachmentReaders = readers }

// errNoText marks a message without body text.
var errNoText = errors.New("no text in the message")

// readMail reads one .eml file; see the comment at the top of mail.go.
func readMail(p string, raw []byte, opts *Options) ([]Document, []Skip, error) {
	f := newMailFile(p, opts)
	doc, err := f.message(p, raw, 0)
	if err != nil {
		if errors.Is(err, errNoText) && len(f.docs) > 0 {
			return f.docs, append([]Skip{{Path: p, Reason: err.Error()}}, f.skips...), nil
		}
		return nil, f.skips, err
	}
	return append([]Document{doc}, f.docs...), f.skips, nil
}

// mailFile is the state of reading one file of mail.
type mailFile struct {
	top    string // the file's path: Container of what is inside
	opts   *Options
	budget int64 // transfer-decoded bytes left
	full   bool  // the budget ran out
	parts  int   // MIME parts of the current top-level message
	docs   []Document
	skips  []Skip
}

func newMailFile(p string, opts *Options) *mailFile {
	limit := opts.MaxBytes
	if limit <= 0 {
		limit = DefaultMaxBytes
	}
	return &mailFile{top: p, opts: opts, budget: limit}
}

// limit is the size cap of one decoding step.
func (f *mailFile) limit() int64 {
	if f.opts.MaxBytes > 0 {
		return f.opts.MaxBytes
	}
	return DefaultMaxBytes
}

// msgState is the state of reading one message.
type msgState struct {
	f       *mailFile
	id      string
	texts   []piece
	bad     int      // invalid UTF-8 sequences replaced
	ignored []string // what was not read, for the no-text reason
	names   map[string]int
	index   int // the place of the current part in its multipart, from 1
	deep    bool
	many    bool
}

// message reads the message raw with ID id at MIME depth depth. Its
// attachments go to f.docs, skips of its parts to f.skips.
func (f *mailFile) message(id string, raw []byte, depth int) (Document, error) {
	if bytes.HasPrefix(raw, []byte("From ")) {
		if i := bytes.IndexByte(raw, '\n'); i >= 0 {
			raw = raw[i+1:]
		} else {
			raw = nil
		}
	}
	msg, err := mail.ReadMessage(bytes.NewReader(raw))
	if err != nil {
		return Document{}, fmt.Errorf("malformed mail header: %v", err)
	}
	body, err := io.ReadAll(msg.Body)
	if err != nil {
		return Document{}, fmt.Errorf("unreadable message body: %v", err)
	}
	m := &msgState{f: f, id: id, names: map[string]int{}, index: 1}
	hdr := textproto.MIMEHeader(msg.Header)
	m.entity(hdr, body, depth, "text/plain")
	if m.deep {
		f.skips = append(f.skips, Skip{Path: id, Reason: fmt.Sprintf("MIME parts nested more than %d levels deep were not read", maxMIMEDepth)})
	}
	if m.many {
		f.skips = append(f.skips, Skip{Path: id, Reason: fmt.Sprintf("more than %d MIME parts: the rest were not read", maxMIMEParts)})
	}
	if f.full {
		f.skips = append(f.skips, Skip{Path: id, Reason: fmt.Sprintf("decoded content reached the size limit (%s): the rest was not read", byteSize(f.limit()))})
		f.full = false
	}
	text := joinPieces(m.texts, true)
	if text == "" {
		text = joinPieces(m.texts, false) // all of it was quoted
	}
	if text == "" {
		return Document{}, m.noText(body)
	}
	meta := Meta{
		From:      headerText(msg.Header.Get("From")),
		To:        headerText(msg.Header.Get("To")),
		Cc:        headerText(msg.Header.Get("Cc")),
		Date:      headerText(msg.Header.Get("Date")),
		MessageID: headerText(msg.Header.Get("Message-Id")),
	}
	title := cleanLine(headerText(msg.Header.Get("Subject")))
	if title == "" {
		title = Title(text, path.Base(id))
	}
	return Document{ID: id, Title: title, Text: text, Repaired: m.bad, Format: "email", Meta: meta}, nil
}

// noText says why a message has no text.
func (m *msgState) noText(body []byte) error {
	switch {
	case len(m.ignored) > 0:
		const most = 5
		list := m.ignored[:min(len(m.ignored), most)]
		more := ""
		if len(m.ignored) > most {
			more = fmt.Sprintf(" and %d more", len(m.ignored)-most)
		}
		return fmt.Errorf("%w (only parts that are not text: %s%s)", errNoText, strings.Join(list, ", "), more)
	case len(bytes.TrimSpace(body)) == 0:
		return fmt.Errorf("%w (empty body)", errNoText)
	default:
		return fmt.Errorf("%w (the body has no text)", errNoText)
	}
}

// mediaType returns the lower-case media type and parameters of a
// Content-Type value, def when it is missing or cannot be parsed.
func mediaType(v, def string) (string, map[string]string) {
	if strings.TrimSpace(v) == "" {
		return def, nil
	}
	t, params, err := mime.ParseMediaType(v)
	if t == "" || (err != nil && !errors.Is(err, mime.ErrInvalidMediaParameter)) {
		return "text/plain", nil // RFC 2045 section 5.2
	}
	if !strings.Contains(t, "/") {
		return "text/plain", nil
	}
	return t, params
}

// entity reads one MIME entity (a message body or a part) at depth.
func (m *msgState) entity(hdr textproto.MIMEHeader, body []byte, depth int, defType string) {
	f := m.f
	if depth > maxMIMEDepth {
		m.deep = true
		return
	}
	if f.parts++; f.parts > maxMIMEParts {
		m.many = true
		return
	}
	ctype, params := mediaType(hdr.Get("Content-Type"), defType)
	cte := strings.ToLower(strings.TrimSpace(hdr.Get("Content-Transfer-Encoding")))
	disp, dparams, _ := mime.ParseMediaType(hdr.Get("Content-Disposition"))
	name := fileName(dparams["filename"])
	if name == "" {
		name = fileName(params["name"])
	}
	switch {
	case strings.HasPrefix(ctype, "multipart/"):
		m.multipart(ctype, params, m.decode(body, cte), depth)
	case disp == "attachment" || (name != "" && ctype != "text/plain" && ctype != "text/html"):
		m.attachment(ctype, name, m.decode(body, cte), depth)
	case ctype == "message/rfc822" || ctype == "message/global":
		m.inlineMessage(m.decode(body, cte), depth)
	case ctype == "text/html":
		h := renderHTML(m.decode(body, cte), params["charset"], f.limit(), !f.opts.KeepQuoted)
		m.bad += h.repaired
		m.addText(h.text)
	case strings.HasPrefix(ctype, "text/"):
		enc, _ := lookupCharset(params["charset"])
		text, bad := decodeCharset(m.decode(body, cte), enc, f.limit())
		m.bad += bad
		text = normalizeNewlines(text)
		if strings.EqualFold(params["format"], "flowed") {
			text = unflow(text, strings.EqualFold(params["delsp"], "yes"))
		}
		m.addText(text)
	default:
		what := ctype
		if name != "" {
			what = strconv.Quote(name)
		}
		m.ignored = append(m.ignored, what)
	}
}

// piece is the text of one body part: whole, and with quoted text
// removed unless KeepQuoted.
type piece struct{ kept, whole string }

// addText adds the text of one part.
func (m *msgState) addText(text string) {
	text = normalizeNewlines(text)
	p := piece{kept: text, whole: strings.TrimSpace(text)}
	if !m.f.opts.KeepQuoted {
		p.kept = blankRuns.ReplaceAllString(stripQuoted(text), "\n\n")
	}
	p.kept = strings.TrimSpace(p.kept)
	if p.whole != "" {
		m.texts = append(m.texts, p)
	}
}

// joinPieces joins the kept or whole texts of the pieces with blank
// lines.
func joinPieces(ps []piece, kept bool) string {
	var parts []string
	for _, p := range ps {
		t := p.whole
		if kept {
			t = p.kept
		}
		if t != "" {
			parts = append(parts, t)
		}
	}
	return strings.Join(parts, "\n\n")
}

// multipart reads a multipart body.
func (m *msgState) multipart(ctype string, params map[string]string, body []byte, depth int) {
	boundary := params["boundary"]
	if boundary == "" {
		m.plainFallback(body)
		return
	}
	partType := "text/plain" // RFC 2046 section 5.1.1
	if ctype == "multipart/digest" {
		partType = "message/rfc822"
	}
	mr := multipart.NewReader(bytes.NewReader(body), boundary)
	type alt struct {
		texts   []piece
		docs    []Document
		skips   []Skip
		ignored []string
		plain   bool
		bad     int
		hasText bool
	}
	var alts []alt
	n := 0
	for {
		part, err := mr.NextRawPart()
		if err != nil {
			break // io.EOF at the end; anything else is a message cut short
		}
		data, _ := io.ReadAll(part) // a cut-short part keeps what it has
		n++
		m.index = n
		hdr := part.Header
		if ctype != "multipart/alternative" {
			m.entity(hdr, data, depth+1, partType)
			continue
		}
		t0, d0, s0, i0, b0 := len(m.texts), len(m.f.docs), len(m.f.skips), len(m.ignored), m.bad
		t, _ := mediaType(hdr.Get("Content-Type"), partType)
		m.entity(hdr, data, depth+1, partType)
		alts = append(alts, alt{
			texts:   slices.Clone(m.texts[t0:]),
			docs:    slices.Clone(m.f.docs[d0:]),
			skips:   slices.Clone(m.f.skips[s0:]),
			ignored: slices.Clone(m.ignored[i0:]),
			plain:   t == "text/plain",
			bad:     m.bad - b0,
			hasText: len(m.texts) > t0,
		})
		m.texts, m.f.docs, m.f.skips, m.ignored, m.bad = m.texts[:t0], m.f.docs[:d0], m.f.skips[:s0], m.ignored[:i0], b0
	}
	if n == 0 {
		m.plainFallback(body)
		return
	}
	if ctype != "multipart/alternative" {
		return
	}
	pick := -1
	for i, a := range alts {
		if a.plain && a.hasText {
			pick = i
			break
		}
	}
	if pick < 0 {
		for i := len(alts) - 1; i >= 0; i-- {
			if alts[i].hasText {
				pick = i
				break
			}
		}
	}
	if pick < 0 {
		for _, a := range alts {
			m.ignored = append(m.ignored, a.ignored...)
		}
		return
	}
	a := alts[pick]
	m.texts = append(m.texts, a.texts...)
	m.f.docs = append(m.f.docs, a.docs...)
	m.f.skips = append(m.f.skips, a.skips...)
	m.bad += a.bad
}

// plainFallback reads a multipart body that has no parts as plain text.
func (m *msgState) plainFallback(body []byte) {
	text, bad := repairUTF8(body)
	m.bad += bad
	m.addText(text)
}

// inlineMessage adds the body text of an inline message/rfc822 part.
func (m *msgState) inlineMessage(data []byte, depth int) {
	if depth+1 > maxMIMEDepth {
		m.deep = true
		return
	}
	msg, err := mail.ReadMessage(bytes.NewReader(data))
	if err != nil {
		m.ignored = append(m.ignored, "message/rfc822 (malformed header)")
		return
	}
	body, _ := io.ReadAll(msg.Body)
	m.entity(textproto.MIMEHeader(msg.Header), body, depth+1, "text/plain")
}

// typeExt names unnamed attachments of the types that have a reader.
var typeExt = map[string]string{
	"text/plain":      ".txt",
	"text/html":       ".html",
	"text/csv":        ".csv",
	"application/pdf": ".pdf",
	"message/rfc822":  ".eml",
	"application/vnd.openxmlformats-officedocument.wordprocessingml.document": ".docx",
}

// attachment reads an attachment as a document of its own, if it can.
func (m *msgState) attachment(ctype, name string, data []byte, depth int) {
	f := m.f
	what := ctype
	if name != "" {
		what = strconv.Quote(name)
	}
	if f.opts.NoAttachments {
		m.ignored = append(m.ignored, what+" (attachments not read)")
		return
	}
	if name == "" {
		ext, ok := typeExt[ctype]
		if !ok {
			m.ignored = append(m.ignored, what)
			return
		}
		name = "part" + strconv.Itoa(m.index) + ext
	}
	ext := strings.ToLower(path.Ext(name))
	if ctype == "message/rfc822" && ext != ".eml" && ext != ".mbox" {
		ext = ".eml"
	}
	rd, ok := attachmentReaders[ext]
	if !ok {
		m.ignored = append(m.ignored, what)
		return
	}
	id := partID(m.id, m.uniqueName(name))
	if len(bytes.TrimSpace(data)) == 0 {
		f.skips = append(f.skips, Skip{Path: id, Reason: "empty attachment"})
		return
	}
	switch rd.format {
	case "email":
		if depth+1 > maxMIMEDepth {
			m.deep = true
			return
		}
		at := len(f.docs)
		doc, err := f.message(id, data, depth+1)
		if err != nil {
			f.skips = append(f.skips, Skip{Path: id, Reason: err.Error()})
			return
		}
		doc.Size, doc.Hash, doc.Container = int64(len(data)), sha256.Sum256(data), f.top
		f.docs = slices.Insert(f.docs, at, doc)
	case "mbox":
		if depth+1 > maxMIMEDepth {
			m.deep = true
			return
		}
		parts := f.parts
		f.mbox(id, data, depth+1)
		f.parts = parts
	default:
		if rd.text {
			if why := binaryReason(data); why != "" {
				f.skips = append(f.skips, Skip{Path: id, Reason: why})
				return
			}
		}
		o := *f.opts
		o.MaxBytes = max(f.budget, 1)
		docs, skips, err := extract(id, data, rd, &o)
		f.skips = append(f.skips, skips...)
		if err != nil {
			f.skips = append(f.skips, Skip{Path: id, Reason: err.Error()})
			return
		}
		for i := range docs {
			docs[i].Container = f.top
		}
		f.docs = append(f.docs, docs...)
	}
}

// uniqueName returns name, or name with "~N" before its extension when
// the message has had an attachment of that name already.
func (m *msgState) uniqueName(name string) string {
	m.names[name]++
	if n := m.names[name]; n > 1 {
		ext := path.Ext(name)
		return strings.TrimSuffix(name, ext) + "~" + strconv.Itoa(n) + ext
	}
	return name
}

// fileName cleans an attachment's file name: RFC 2047 encoded words
// decoded, the last element of a path, control characters dropped.
func fileName(v string) string {
	v = headerText(v)
	v = strings.ReplaceAll(v, `\`, "/")
	if i := strings.LastIndexByte(v, '/'); i >= 0 {
		v = v[i+1:]
	}
	v = strings.TrimSpace(v)
	if v == "." || v == ".." {
		return ""
	}
	return v
}

// decode undoes a Content-Transfer-Encoding within the file's budget.
func (m *msgState) decode(body []byte, cte string) []byte {
	f := m.f
	if f.budget <= 0 && (cte == "base64" || cte == "quoted-printable") {
		if len(body) > 0 {
			f.full = true
		}
		return nil
	}
	var out []byte
	switch cte {
	case "base64":
		out = decodeBase64(body, f.budget)
	case "quoted-printable":
		out = decodeQP(body, f.budget)
	default:
		return body // bytes of the file itself: nothing is decoded
	}
	f.budget -= int64(len(out))
	if f.budget <= 0 {
		f.full = true
	}
	return out
}

// b64 maps the base64 alphabet to its values, 0xff elsewhere.
var b64 = func() (t [256]byte) {
	for i := range t {
		t[i] = 0xff
	}
	for i, c := range "ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789+/" {
		t[c] = byte(i)
	}
	return t
}()

// decodeBase64 decodes base64, leniently (see the comment at the top of
// mail.go), writing at most limit bytes.
func decodeBase64(src []byte, limit int64) []byte {
	out := make([]byte, 0, min(int64(len(src))/4*3+3, limit))
	var acc uint32
	n := 0
	flush := func() {
		switch n {
		case 2:
			out = append(out, byte(acc>>4))
		case 3:
			out = append(out, byte(acc>>10), byte(acc>>2))
		}
		acc, n = 0, 0
	}
	for _, c := range src {
		if int64(len(out)) >= limit {
			break
		}
		if c == '=' {
			flush()
			continue
		}
		v := b64[c]
		if v == 0xff {
			continue
		}
		acc = acc<<6 | uint32(v)
		if n++; n == 4 {
			out = append(out, byte(acc>>16), byte(acc>>8), byte(acc))
			acc, n = 0, 0
		}
	}
	flush()
	return out[:min(int64(len(out)), limit)]
}

func unhex(c byte) (byte, bool) {
	switch {
	case '0' <= c && c <= '9':
		return c - '0', true
	case 'A' <= c && c <= 'F':
		return c - 'A' + 10, true
	case 'a' <= c && c <= 'f':
		return c - 'a' + 10, true
	}
	return 0, false
}

// decodeQP decodes quoted-printable, leniently (see the comment at the
// top of mail.go), writing at most limit bytes. Lines end in "\n".
func decodeQP(src []byte, limit int64) []byte {
	out := make([]byte, 0, min(int64(len(src)), limit))
	for len(src) > 0 && int64(len(out)) < limit {
		line := src
		nl := false
		if i := bytes.IndexByte(src, '\n'); i >= 0 {
			line, src, nl = src[:i], src[i+1:], true
		} else {
			src = nil
		}
		// Trailing white space is transport padding (RFC 2045 section 6.7,
		// rule 3).
		line = bytes.TrimRight(line, " \t\r")
		soft := bytes.HasSuffix(line, []byte("="))
		if soft {
			line = line[:len(line)-1]
		}
		for i := 0; i < len(line); i++ {
			c := line[i]
			if c == '=' && i+2 < len(line) {
				if hi, ok := unhex(line[i+1]); ok {
					if lo, ok := unhex(line[i+2]); ok {
						out = append(out, hi<<4|lo)
						i += 2
						continue
					}
				}
			}
			out = append(out, c)
		}
		if nl && !soft {
			out = append(out, '\n')
		}
	}
	return out[:min(int64(len(out)), limit)]
}

// normalizeNewlines turns CRLF and lone CR line ends into LF.
func normalizeNewlines(s string) string {
	if !strings.Contains(s, "\r") {
		return s
	}
	return strings.ReplaceAll(strings.ReplaceAll(s, "\r\n", "\n"), "\r", "\n")
}

// unflow joins the lines of format=flowed text (RFC 3676 section 4): a
// line ending in a space continues on the next line (its last space
// removed when delsp); a leading space is stuffing and is removed. The
// signature separator "-- " is not a flowed line.
func unflow(s string, delsp bool) string {
	var b strings.Builder
	for line := range strings.Lines(s) {
		line = strings.TrimSuffix(line, "\n")
		line = strings.TrimPrefix(line, " ")
		if line != "-- " && strings.HasSuffix(line, " ") {
			if delsp {
				line = line[:len(line)-1]
			}
			b.WriteString(line)
			continue
		}
		b.WriteString(line)
		b.WriteByte('\n')
	}
	return b.String()
}

// blankRuns matches two or more blank lines in a row (left where quoted
// text was removed).
var blankRuns = regexp.MustCompile(`\n[ \t]*\n(?:[ \t]*\n)+`)

// separator matches the line before a reply or forward header block.
var separator = regexp.MustCompile(`(?i)^(-{2,}\s*(original message|forwarded message)\s*-*|begin forwarded message:)$`)

// headerLine matches a line of a reply or forward header block.
var headerLine = regexp.MustCompile(`(?i)^(from|sent|date|to|cc|bcc|subject|reply-to):`)

// stripQuoted removes signatures, quoted lines, attributions and reply
// and forward headers from the text of one part (rules at the top of
// mail.go). Lines end in "\n".
func stripQuoted(s string) string {
	lines := strings.Split(s, "\n")
	quoted := func(l string) bool { return strings.HasPrefix(strings.TrimLeft(l, " \t"), ">") }
	// nextText is the index of the next line with text after i, or -1.
	nextText := func(i int) int {
		for j := i + 1; j < len(lines); j++ {
			if strings.TrimSpace(lines[j]) != "" {
				return j
			}
		}
		return -1
	}
	var out []string
	for i := 0; i < len(lines); i++ {
		l := lines[i]
		t := strings.TrimSpace(l)
		switch {
		case l == "-- ":
			return strings.Join(out, "\n")
		case quoted(l):
			continue
		case strings.HasPrefix(t, "On ") && strings.HasSuffix(t, "wrote:"):
			continue
		case strings.HasPrefix(t, "On ") && i+1 < len(lines) && strings.HasSuffix(strings.TrimSpace(lines[i+1]), "wrote:"):
			i++
			continue
		case strings.HasSuffix(t, "wrote:") || strings.HasSuffix(t, "writes:"):
			if j := nextText(i); j >= 0 && quoted(lines[j]) {
				continue
			}
		case separator.MatchString(t):
			j := i + 1
			for j < len(lines) && strings.TrimSpace(lines[j]) == "" {
				j++
			}
			if j < len(lines) && headerLine.MatchString(strings.TrimSpace(lines[j])) {
				for j < len(lines) && (headerLine.MatchString(strings.TrimSpace(lines[j])) ||
					(strings.HasPrefix(lines[j], " ") || strings.HasPrefix(lines[j], "\t")) && strings.TrimSpace(lines[j]) != "") {
					j++
				}
				i = j - 1
			}
			continue
		}
		out = append(out, l)
	}
	return strings.Join(out, "\n")
}

// wordDecoder decodes RFC 2047 encoded words in any charset lookupCharset
// knows; an unknown charset's bytes are passed on as they are (and read
// as UTF-8 with repair).
var wordDecoder = &mime.WordDecoder{CharsetReader: func(charset string, input io.Reader) (io.Reader, error) {
	enc, _ := lookupCharset(charset)
	if enc == nil {
		return input, nil
	}
	return transform.NewReader(input, enc.NewDecoder()), nil
}}

// headerText decodes the encoded words of a header value and makes one
// line of valid UTF-8 of it.
func headerText(v string) string {
	if v == "" {
		return ""
	}
	if dec, err := wordDecoder.DecodeHeader(v); err == nil {
		v = dec
	}
	v = strings.ToValidUTF8(v, "\uFFFD")
	v = strings.Map(func(r rune) rune {
		if unicode.IsControl(r) {
			return ' '
		}
		return r
	}, v)
	return strings.Join(strings.Fields(v), " ")
}
