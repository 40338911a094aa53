package corpus_test

import (
	"crypto/sha256"
	"encoding/base64"
	"fmt"
	"os"
	"slices"
	"strings"
	"testing"
	"testing/fstest"

	"assay/corpus"
)

// The messages below are invented. Header lines end in LF in most of them,
// as mail saved to disk usually does (common practice); RFC 5322 section
// 2.1 says CRLF, which the crlf helper gives where it matters.

func crlf(s string) string { return strings.ReplaceAll(s, "\n", "\r\n") }

// b64 encodes s in base64 in lines of 76 characters (RFC 2045 section
// 6.8), each ending in LF.
func b64(s string) string {
	enc := base64.StdEncoding.EncodeToString([]byte(s))
	var b strings.Builder
	for len(enc) > 76 {
		b.WriteString(enc[:76] + "\n")
		enc = enc[76:]
	}
	b.WriteString(enc + "\n")
	return b.String()
}

// readOne walks a folder holding the one file name with content raw and
// returns its documents and skips.
func readOne(t *testing.T, name, raw string, opts corpus.Options) ([]corpus.Document, []corpus.Skip) {
	t.Helper()
	return walkAll(t, fstest.MapFS{name: file(raw)}, opts)
}

// docByID returns the document with ID id, failing the test without one.
func docByID(t *testing.T, docs []corpus.Document, id string) corpus.Document {
	t.Helper()
	for _, d := range docs {
		if d.ID == id {
			return d
		}
	}
	t.Fatalf("no document %q among %q", id, ids(docs))
	return corpus.Document{}
}

// TestMailBodies checks the body text and title of single messages, one
// nasty case each. Each case names its source beside it.
func TestMailBodies(t *testing.T) {
	tests := []struct {
		name  string
		raw   string
		title string
		text  string // the whole text
		bad   int    // Repaired
	}{
		{
			// RFC 5322 section 2.1: header, empty line, body.
			name:  "plain CRLF",
			raw:   crlf("From: Ada Quill <ada@example.org>\nSubject: Pond report\n\nThe pond froze twice this week.\nThe ducks moved to the river.\n"),
			title: "Pond report",
			text:  "The pond froze twice this week.\nThe ducks moved to the river.",
		},
		{
			// RFC 2045 section 6.8: base64, 76-character lines; the
			// alphabet's values (Table 1) decode the text below; checked by
			// decoding with Python's base64 module.
			name: "base64 body",
			raw: "Subject: Ferry\nMIME-Version: 1.0\nContent-Type: text/plain; charset=us-ascii\nContent-Transfer-Encoding: base64\n\n" +
				"R3JlZXRpbmdzIGZyb20gdGhlIGhhcmJvdXIgb2ZmaWNlLgpUaGUgZmVycnkgbGVhdmVzIGF0IG5p\nbmUuCg==\n",
			title: "Ferry",
			text:  "Greetings from the harbour office.\nThe ferry leaves at nine.",
		},
		{
			// RFC 2045 section 6.8: characters outside the alphabet (here
			// "*" and spaces) are ignored; missing padding still decodes
			// the full groups (common practice for broken senders).
			name:  "base64 with junk and no padding",
			raw:   "Subject: Junk\nContent-Transfer-Encoding: BASE64\n\nSGVs*bG8g d29y\nbGQ\n",
			title: "Junk",
			text:  "Hello world",
		},
		{
			// RFC 2045 section 6.7: "=XX" is the octet XX, "=" at the end
			// of a line is a soft line break, trailing white space on a
			// line is dropped; ISO-8859-1 0xE9 is "é" (ISO/IEC 8859-1
			// table). "=ZZ" is not a valid escape: kept as it is (RFC 2045
			// section 6.7, note on robust decoders, from memory).
			name: "quoted-printable latin-1",
			raw: "Subject: Market\nContent-Type: text/plain; charset=ISO-8859-1\nContent-Transfer-Encoding: quoted-printable\n\n" +
				"The caf=E9 sells cr=e9pes, soft=   \nly.  \nA sign says =ZZ and 2+2=3D4.\n",
			title: "Market",
			text:  "The café sells crépes, softly.\nA sign says =ZZ and 2+2=4.",
		},
		{
			// Windows-1252 (the code page's table): 0x93 and 0x94 are the
			// curly double quotes U+201C and U+201D, 0x80 is "€", 0x96 is
			// the en dash.
			name:  "windows-1252",
			raw:   "Subject: Prices\nContent-Type: text/plain; charset=\"windows-1252\"\nContent-Transfer-Encoding: 8bit\n\n\x93Fresh\x94 bread \x96 2 \x80\n",
			title: "Prices",
			text:  "“Fresh” bread – 2 €",
		},
		{
			// KOI8-R (RFC 1489 table): F0 D2 C9 D7 C5 D4 is "Привет". The
			// subject's encoded word is the same bytes in base64 (RFC 2047
			// section 4.1).
			name:  "koi8-r body and subject",
			raw:   "Subject: =?KOI8-R?B?8NLJ18XU?=\nContent-Type: text/plain; charset=koi8-r\n\n\xf0\xd2\xc9\xd7\xc5\xd4, \xf3\xcf\xd3\xc5\xc4\n",
			title: "Привет",
			text:  "Привет, Сосед",
		},
		{
			// ISO-2022-JP (RFC 1468): ESC $ B switches to JIS X 0208, where
			// row 4 holds the hiragana (0x2433 こ, 0x2473 ん, 0x244B に,
			// 0x2441 ち, 0x244F は); ESC ( B switches back to ASCII. The
			// subject carries the same bytes as an RFC 2047 B word.
			name:  "iso-2022-jp body and subject",
			raw:   "Subject: =?ISO-2022-JP?B?GyRCJDMkcyRLJEEkTxsoQg==?=\nContent-Type: text/plain; charset=ISO-2022-JP\nContent-Transfer-Encoding: 7bit\n\n\x1b$B$3$s$K$A$O\x1b(B tomodachi\n",
			title: "こんにちは",
			text:  "こんにちは tomodachi",
		},
		{
			// RFC 2047 section 6.2: white space between adjacent encoded
			// words is ignored; section 4.2: "_" in a Q word is a space.
			name:  "rfc 2047 subject in two words",
			raw:   "Subject: =?ISO-8859-1?Q?Caf=E9?= =?ISO-8859-1?Q?_opening?= day\n\nSee you there.\n",
			title: "Café opening day",
			text:  "See you there.",
		},
		{
			// An unknown charset is read as UTF-8 with repair (mail.go);
			// 0xE9 alone is one invalid sequence (RFC 3629).
			name:  "unknown charset",
			raw:   "Subject: Odd\nContent-Type: text/plain; charset=x-made-up-7\n\nna\xefve caf\xe9 \xc3\xa9t\xc3\xa9\n",
			title: "Odd",
			text:  "na\ufffdve caf\ufffd été",
			bad:   2,
		},
		{
			// No charset: US-ASCII by RFC 2045 section 5.2, read as UTF-8
			// (a superset) with repair.
			name:  "8-bit bytes without charset",
			raw:   "Subject: Raw\n\nfa\xe7ade\n",
			title: "Raw",
			text:  "fa\ufffdade",
			bad:   1,
		},
		{
			// RFC 3676 section 4.2: a line ending in a space is continued
			// by the next (flowed); section 4.4: a leading space is
			// stuffing; with DelSp=yes the trailing space goes (4.5).
			name:  "format=flowed",
			raw:   "Subject: Flowed\nContent-Type: text/plain; format=flowed; delsp=yes\n\nA long line that was wrapped by the sender's mail prog \nram.\n From here on, stuffed.\n",
			title: "Flowed",
			text:  "A long line that was wrapped by the sender's mail program.\nFrom here on, stuffed.",
		},
		{
			// RFC 2046 section 5.1.4: alternatives of one content; the
			// reader prefers text/plain (mail.go).
			name: "alternative prefers plain",
			raw: "Subject: Choice\nMIME-Version: 1.0\nContent-Type: multipart/alternative; boundary=alt\n\n" +
				"--alt\nContent-Type: text/plain\n\nPlain words.\n--alt\nContent-Type: text/html\n\n<p>Rich <b>words</b>.</p>\n--alt--\n",
			title: "Choice",
			text:  "Plain words.",
		},
		{
			// Only an HTML alternative: rendered to text, the entity
			// decoded (HTML standard, named character references).
			name: "alternative with only HTML",
			raw: "Subject: Rich\nContent-Type: multipart/alternative; boundary=\"=_b 1\"\n\n" +
				"--=_b 1\nContent-Type: text/html; charset=utf-8\nContent-Transfer-Encoding: quoted-printable\n\n" +
				"<html><head><style>p{color:red}</style></head><body><p>Tide tables &amp; =\nmaps</p><script>x()</script><p>Second</p></body></html>\n--=_b 1--\n",
			title: "Rich",
			text:  "Tide tables & maps\n\nSecond",
		},
		{
			// A multipart with no boundary parameter is not valid (RFC
			// 2046 section 5.1.1); read as text/plain, the advice for an
			// invalid Content-Type (RFC 2045 section 5.2).
			name:  "missing boundary",
			raw:   "Subject: No boundary\nContent-Type: multipart/mixed\n\nText of a message whose parts cannot be found.\n",
			title: "No boundary",
			text:  "Text of a message whose parts cannot be found.",
		},
		{
			// The declared boundary never appears: no parts; the body is
			// read as text (mail.go).
			name:  "boundary never used",
			raw:   "Subject: Lost parts\nContent-Type: multipart/mixed; boundary=nowhere\n\n--elsewhere\n\nStill some text.\n",
			title: "Lost parts",
			text:  "--elsewhere\n\nStill some text.",
		},
		{
			// Cut short in the second part, before any closing delimiter
			// (RFC 2046 section 5.1.1): the text read so far is kept.
			name: "truncated message",
			raw: "Subject: Cut\nContent-Type: multipart/mixed; boundary=b\n\n--b\nContent-Type: text/plain\n\nFirst part whole.\n" +
				"--b\nContent-Type: text/plain\n\nSecond part cut in the mid",
			title: "Cut",
			text:  "First part whole.\n\nSecond part cut in the mid",
		},
		{
			// RFC 2046 section 5.1.5: in multipart/digest a part without a
			// Content-Type is message/rfc822; inline, its body text joins
			// the message's (mail.go).
			name: "digest of inline messages",
			raw: "Subject: Digest 4\nContent-Type: multipart/digest; boundary=d\n\n--d\n\nSubject: One\n\nFirst digest item.\n" +
				"--d\n\nSubject: Two\n\nSecond digest item.\n--d--\n",
			title: "Digest 4",
			text:  "First digest item.\n\nSecond digest item.",
		},
		{
			// No Subject: the first line of the text (Title, doc.go).
			name:  "title from text",
			raw:   "From: someone@example.org\n\n\nNotes on the spring fair\nMore lines.\n",
			title: "Notes on the spring fair",
			text:  "Notes on the spring fair\nMore lines.",
		},
		{
			// A leading mbox "From " line, as some programs save a
			// message (mail.go), is not a header.
			name:  "leading From line",
			raw:   "From ada@example.org Sat Mar  1 10:00:00 2025\nSubject: Saved\n\nSaved from a mailbox.\n",
			title: "Saved",
			text:  "Saved from a mailbox.",
		},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			docs, skips := readOne(t, "m.eml", tt.raw, corpus.Options{})
			if len(skips) != 0 || len(docs) != 1 {
				t.Fatalf("documents %q, skips %v; want one document", ids(docs), skips)
			}
			d := docs[0]
			if d.Title != tt.title {
				t.Errorf("title %q, want %q", d.Title, tt.title)
			}
			if d.Text != tt.text {
				t.Errorf("text\n%q\nwant\n%q", d.Text, tt.text)
			}
			if d.Repaired != tt.bad {
				t.Errorf("repaired %d, want %d", d.Repaired, tt.bad)
			}
			if d.Format != "email" || d.Container != "" || d.ID != "m.eml" {
				t.Errorf("ID %q format %q container %q, want m.eml, email, \"\"", d.ID, d.Format, d.Container)
			}
			if d.Size != int64(len(tt.raw)) || d.Hash != sha256.Sum256([]byte(tt.raw)) {
				t.Errorf("size %d and hash do not describe the file (%d bytes)", d.Size, len(tt.raw))
			}
		})
	}
}

// TestMailSkips checks messages that are not documents, and their reasons
// (mail.go).
func TestMailSkips(t *testing.T) {
	tests := []struct {
		name, raw, reason string
	}{
		{"empty body", "Subject: Nothing\nFrom: ada@example.org\n\n  \n", "no text in the message (empty body)"},
		{"header only", "Subject: Nothing at all\n", "no text in the message (empty body)"},
		{
			"binary attachment only",
			"Subject: Photo\nContent-Type: multipart/mixed; boundary=p\n\n--p\nContent-Type: image/jpeg; name=\"pier.jpg\"\nContent-Transfer-Encoding: base64\nContent-Disposition: attachment; filename=\"pier.jpg\"\n\n/9j/4AAQSkZJRgABAQ==\n--p--\n",
			`no text in the message (only parts that are not text: "pier.jpg")`,
		},
		{
			"inline image only",
			"Subject: Logo\nContent-Type: image/gif\nContent-Transfer-Encoding: base64\n\nR0lGODlhAQABAAAAACw=\n",
			"no text in the message (only parts that are not text: image/gif)",
		},
		// The header checks are net/mail's: a line that is neither a
		// field ("name: value", RFC 5322 section 2.2) nor a continuation.
		{"malformed header", "Subject: Fine\nthis line is not a field\n\nbody\n", "malformed mail header: "},
		{"continuation first", "  folded first\nSubject: x\n\nbody\n", "malformed mail header: "},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			docs, skips := readOne(t, "m.eml", tt.raw, corpus.Options{})
			if len(docs) != 0 {
				t.Errorf("documents %q, want none", ids(docs))
			}
			if got := reasonOf(skips, "m.eml"); !strings.HasPrefix(got, tt.reason) {
				t.Errorf("reason %q, want %q", got, tt.reason)
			}
		})
	}
}

// TestMailMeta checks the header fields kept in Meta, decoded (RFC 2047)
// and unfolded (RFC 5322 section 2.2.3), and the file's other fixtures:
// nested multipart/mixed inside multipart/related, a quoted-printable
// Latin-1 part, a .txt and an .html attachment.
func TestMailMeta(t *testing.T) {
	raw, err := os.ReadFile("testdata/mail/nested.eml")
	if err != nil {
		t.Fatal(err)
	}
	fsys := fstest.MapFS{"news/nested.eml": {Data: raw}}
	docs, skips := walkAll(t, fsys, corpus.Options{})
	if len(skips) != 0 {
		t.Errorf("skips %v, want none", skips)
	}
	want := []string{"news/nested.eml", "news/nested.eml#opening-hours.txt", "news/nested.eml#menu.html"}
	if got := ids(docs); !slices.Equal(got, want) {
		t.Fatalf("documents %q, want %q (message first, then attachments in order)", got, want)
	}
	msg := docs[0]
	wantMeta := corpus.Meta{
		From:      "Üna Fellow <una@example.org>", // RFC 2047 B word in UTF-8
		To:        "readers@example.net",
		Date:      "Wed, 5 Mar 2025 07:00:00 +0100",
		MessageID: "<news-12@example.org>",
	}
	if msg.Meta != wantMeta {
		t.Errorf("meta %+v, want %+v", msg.Meta, wantMeta)
	}
	if msg.Title != "Café newsletter" {
		t.Errorf("title %q", msg.Title)
	}
	// The preamble is not part of any body part (RFC 2046 section 5.1.1);
	// the inline image is not text; the soft line break joins the lines.
	if want := "The café on the quay now serves crêpes on Thursdays, and the terrace reopens in April."; msg.Text != want {
		t.Errorf("text %q, want %q", msg.Text, want)
	}
	txt := docs[1]
	if txt.Format != "text" || txt.Container != "news/nested.eml" || txt.Text != "Monday to Friday: eight to six.\nSaturday: nine to one.\n" {
		t.Errorf("text attachment %+v", txt)
	}
	page := docs[2]
	if page.Format != "html" || page.Title != "Quay menu" || page.Text != "Lentil soup & bread" || page.Container != "news/nested.eml" {
		t.Errorf("html attachment %+v", page)
	}
	// Size and Hash of an attachment are those of its decoded bytes
	// (base64 here, checked with Python's base64 module: 94 bytes).
	decoded := "<html><head><title>Quay menu</title></head><body><p>Lentil soup &amp; bread</p></body></html>\n"
	if page.Size != int64(len(decoded)) || page.Hash != sha256.Sum256([]byte(decoded)) {
		t.Errorf("attachment size %d, want %d, or its hash differs", page.Size, len(decoded))
	}

	docs, _ = walkAll(t, fsys, corpus.Options{NoAttachments: true})
	if got := ids(docs); !slices.Equal(got, want[:1]) {
		t.Errorf("with NoAttachments: documents %q, want %q", got, want[:1])
	}
}

// TestMailAttachments checks attachment naming and nesting (mail.go).
func TestMailAttachments(t *testing.T) {
	inner := "Subject: Inner note\nContent-Type: multipart/mixed; boundary=i\n\n--i\n\nInner body text.\n--i\nContent-Disposition: attachment; filename=\"deep.txt\"\n\nDeep attachment text.\n--i--\n"
	raw := "Subject: Bundle\nContent-Type: multipart/mixed; boundary=o\n\n" +
		"--o\nContent-Type: text/plain\n\nSee the attachments.\n" +
		"--o\nContent-Type: text/plain; name=\"list.txt\"\nContent-Disposition: attachment\n\nFirst list.\n" +
		"--o\nContent-Type: application/octet-stream\nContent-Disposition: attachment; filename=\"C:\\\\Users\\\\x\\\\list.txt\"\n\nSecond list.\n" +
		"--o\nContent-Type: text/plain\nContent-Disposition: attachment\n\nUnnamed attachment.\n" +
		"--o\nContent-Type: application/zip; name=\"archive.zip\"\n\nPK\n" +
		"--o\nContent-Type: message/rfc822\nContent-Disposition: attachment; filename=\"fwd.eml\"\n\n" + inner +
		"--o\nContent-Type: text/plain\nContent-Disposition: attachment; filename=\"=?UTF-8?Q?caf=C3=A9.txt?=\"\n\nEncoded name.\n" +
		"--o--\n"
	docs, skips := readOne(t, "b.eml", raw, corpus.Options{})
	if len(skips) != 0 {
		t.Errorf("skips %v, want none", skips)
	}
	want := []string{
		"b.eml",
		"b.eml#list.txt",
		"b.eml#list~2.txt", // the same name again; a Windows path cut to its last element
		"b.eml#part4.txt",  // unnamed text/plain attachment: partN by its place
		// archive.zip: no reader, ignored
		"b.eml#fwd.eml",
		"b.eml#fwd.eml#deep.txt",
		"b.eml#café.txt", // RFC 2047 word in a file name: common practice
	}
	if got := ids(docs); !slices.Equal(got, want) {
		t.Fatalf("documents %q, want %q", got, want)
	}
	for _, d := range docs[1:] {
		if d.Container != "b.eml" {
			t.Errorf("%s: container %q, want b.eml", d.ID, d.Container)
		}
	}
	fwd := docByID(t, docs, "b.eml#fwd.eml")
	if fwd.Format != "email" || fwd.Title != "Inner note" || fwd.Text != "Inner body text." {
		t.Errorf("attached message %+v", fwd)
	}
	// The line end before a boundary belongs to the boundary (RFC 2046
	// section 5.1.1), so the part's bytes lack inner's last "\n".
	part := strings.TrimSuffix(inner, "\n")
	if fwd.Size != int64(len(part)) || fwd.Hash != sha256.Sum256([]byte(part)) {
		t.Errorf("attached message size %d, want %d", fwd.Size, len(part))
	}
	if d := docByID(t, docs, "b.eml"); d.Text != "See the attachments." {
		t.Errorf("message text %q", d.Text)
	}

	docs, skips = readOne(t, "b.eml", raw, corpus.Options{NoAttachments: true})
	if got := ids(docs); !slices.Equal(got, []string{"b.eml"}) || len(skips) != 0 {
		t.Errorf("with NoAttachments: documents %q, skips %v; want only b.eml", got, skips)
	}

	// A message with no text of its own but an attachment that is read:
	// the attachment is a document, the message a skip (mail.go).
	only := "Subject: Only a file\nContent-Type: multipart/mixed; boundary=x\n\n--x\nContent-Disposition: attachment; filename=\"a.txt\"\n\nAttached words.\n--x--\n"
	docs, skips = readOne(t, "o.eml", only, corpus.Options{})
	if got := ids(docs); !slices.Equal(got, []string{"o.eml#a.txt"}) {
		t.Errorf("documents %q, want the attachment only", got)
	}
	if r := reasonOf(skips, "o.eml"); !strings.HasPrefix(r, "no text in the message") {
		t.Errorf("message skip reason %q", r)
	}
}

// TestMailQuoted checks the stripping rules of mail.go on a reply that has
// each kind: quoted lines, attributions (one wrapped over two lines), an
// "Original Message" and a forwarded-message header block, a signature.
func TestMailQuoted(t *testing.T) {
	raw, err := os.ReadFile("testdata/mail/reply.eml")
	if err != nil {
		t.Fatal(err)
	}
	fsys := fstest.MapFS{"reply.eml": {Data: raw}}
	docs, _ := walkAll(t, fsys, corpus.Options{})
	if len(docs) != 1 {
		t.Fatalf("documents %q, want one", ids(docs))
	}
	want := "Agreed, the cedar posts are the better choice for the wet corner.\n" +
		"I can collect them on Saturday morning.\n\n" +
		"The old posts by the shed have rotted through.\n\n" +
		"Cedar posts cost four coins each this month."
	if docs[0].Text != want {
		t.Errorf("stripped text\n%s\nwant\n%s", docs[0].Text, want)
	}
	wantMeta := corpus.Meta{
		From: "Brannoc Tillery <brannoc@example.org>", To: "Wenna Osgood <wenna@example.net>",
		Cc: "Allotment Committee <committee@example.org>", Date: "Tue, 4 Mar 2025 09:12:40 +0000",
		MessageID: "<reply-7@example.org>",
	}
	if docs[0].Meta != wantMeta {
		t.Errorf("meta %+v, want %+v", docs[0].Meta, wantMeta)
	}

	docs, _ = walkAll(t, fsys, corpus.Options{KeepQuoted: true})
	body := string(raw[strings.Index(string(raw), "\n\n")+2:])
	if docs[0].Text != strings.TrimSpace(body) {
		t.Errorf("with KeepQuoted the text is not the whole body:\n%s", docs[0].Text)
	}

	// Not stripped: "--" without the space (RFC 3676 section 4.3 names
	// "-- "), ">" inside a line, "wrote:" not followed by a quote.
	keep := "Subject: k\n\nScore 3 > 2 today.\n--\nShe wrote:\nnothing quoted follows.\n"
	docs, _ = readOne(t, "k.eml", keep, corpus.Options{})
	if want := "Score 3 > 2 today.\n--\nShe wrote:\nnothing quoted follows."; docs[0].Text != want {
		t.Errorf("text %q, want %q", docs[0].Text, want)
	}
}

// TestMailNestingCap checks the MIME depth cap (mail.go: 20 levels): text
// above the cap is read, parts below it are not, and a skip says so.
func TestMailNestingCap(t *testing.T) {
	build := func(levels int) string {
		var b strings.Builder
		b.WriteString("Subject: Deep\n")
		for i := range levels {
			fmt.Fprintf(&b, "Content-Type: multipart/mixed; boundary=L%d\n\n--L%d\nContent-Type: text/plain\n\nText at level %d.\n--L%d\n", i, i, i+1, i)
		}
		b.WriteString("Content-Type: text/plain\n\nBottom text.\n")
		for i := levels - 1; i >= 0; i-- {
			fmt.Fprintf(&b, "--L%d--\n", i)
		}
		return b.String()
	}
	// The message's body is level 0 and each multipart's parts are one
	// level below it, so "Text at level k" is at level k and, with n
	// multiparts, "Bottom text." at level n: with 20 it is just read.
	docs, skips := readOne(t, "ok.eml", build(20), corpus.Options{})
	if len(skips) != 0 || len(docs) != 1 || !strings.HasSuffix(docs[0].Text, "Bottom text.") {
		t.Fatalf("20 levels: documents %q, skips %v", ids(docs), skips)
	}
	docs, skips = readOne(t, "deep.eml", build(40), corpus.Options{})
	if len(docs) != 1 {
		t.Fatalf("40 levels: documents %q, want one", ids(docs))
	}
	text := docs[0].Text
	if !strings.Contains(text, "Text at level 20.") || strings.Contains(text, "Text at level 21.") || strings.Contains(text, "Bottom") {
		t.Errorf("40 levels: text read to the wrong depth:\n%s", text)
	}
	if r := reasonOf(skips, "deep.eml"); !strings.Contains(r, "nested more than 20 levels") {
		t.Errorf("40 levels: skip reason %q", r)
	}
}

// TestMailPartCap checks the cap of 1000 parts per message (mail.go).
func TestMailPartCap(t *testing.T) {
	var b strings.Builder
	b.WriteString("Subject: Many\nContent-Type: multipart/mixed; boundary=m\n\n")
	for i := range 1200 {
		fmt.Fprintf(&b, "--m\n\nw%d\n", i)
	}
	b.WriteString("--m--\n")
	docs, skips := readOne(t, "many.eml", b.String(), corpus.Options{})
	if len(docs) != 1 {
		t.Fatalf("documents %q", ids(docs))
	}
	// The message itself is part 1, so 999 body parts fit.
	if !strings.Contains(docs[0].Text, "w998") || strings.Contains(docs[0].Text, "w999") {
		t.Errorf("text does not stop after 999 body parts: ...%s", docs[0].Text[len(docs[0].Text)-20:])
	}
	if r := reasonOf(skips, "many.eml"); !strings.Contains(r, "more than 1000 MIME parts") {
		t.Errorf("skip reason %q", r)
	}
}

// TestMailDecodeBudget checks that decoding stops at MaxBytes for the
// whole file (mail.go): an attached base64 message holding a base64 text
// decodes to more bytes than the file has.
func TestMailDecodeBudget(t *testing.T) {
	line := strings.Repeat("Tidal flats and salt marsh. ", 2) + "\n"
	text := strings.Repeat(line, 40) // 2,280 bytes
	inner := "Subject: Inner\nContent-Transfer-Encoding: base64\n\n" + b64(text)
	raw := "Subject: Outer\nContent-Type: multipart/mixed; boundary=z\n\n--z\n\nOuter text.\n--z\nContent-Type: message/rfc822\nContent-Transfer-Encoding: base64\nContent-Disposition: attachment; filename=\"in.eml\"\n\n" + b64(inner) + "--z--\n"
	limit := int64(len(raw)) + 10
	docs, skips := readOne(t, "budget.eml", raw, corpus.Options{MaxBytes: limit})
	in := docByID(t, docs, "budget.eml#in.eml")
	if int64(len(inner)+len(in.Text)) > limit {
		t.Errorf("decoded %d + %d bytes, more than MaxBytes %d", len(inner), len(in.Text), limit)
	}
	if len(in.Text) >= len(strings.TrimSpace(text)) {
		t.Errorf("inner text not cut: %d bytes", len(in.Text))
	}
	if r := reasonOf(skips, "budget.eml#in.eml"); !strings.Contains(r, "size limit") {
		t.Errorf("skip reason %q, want the size limit", r)
	}
	// With room enough, the whole text.
	docs, _ = readOne(t, "budget.eml", raw, corpus.Options{})
	if in := docByID(t, docs, "budget.eml#in.eml"); in.Text != strings.TrimSpace(text) {
		t.Errorf("inner text not whole with the default limit")
	}
}
