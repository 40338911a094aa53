package corpus_test

import (
	"archive/zip"
	"bytes"
	"compress/flate"
	"hash/crc32"
	"slices"
	"strconv"
	"strings"
	"testing"
	"testing/fstest"
	"time"
	"unicode/utf8"

	"assay/corpus"
)

// zipEntry is one file of a zip archive built by makeZip.
type zipEntry struct{ name, data string }

// makeZip builds a zip archive (archive/zip, Deflate) of the entries in
// order.
func makeZip(t testing.TB, entries ...zipEntry) []byte {
	t.Helper()
	var b bytes.Buffer
	w := zip.NewWriter(&b)
	for _, e := range entries {
		f, err := w.CreateHeader(&zip.FileHeader{Name: e.name, Method: zip.Deflate, Modified: time.Unix(0, 0).UTC()})
		if err != nil {
			t.Fatal(err)
		}
		if _, err := f.Write([]byte(e.data)); err != nil {
			t.Fatal(err)
		}
	}
	if err := w.Close(); err != nil {
		t.Fatal(err)
	}
	return b.Bytes()
}

// WordprocessingML parts (ECMA-376 Part 1, section 17), with invented text.
const (
	wordNS = `xmlns:w="http://schemas.openxmlformats.org/wordprocessingml/2006/main"`
	// docBody has: a paragraph; runs with a tab (w:tab, 17.3.3.32); a
	// break (w:br, 17.3.3.1); a table (w:tbl, w:tr, w:tc, 17.4) whose cell
	// holds two paragraphs; deleted text (w:delText, 17.3.3.7) and a field
	// instruction (w:instrText, 17.16.23), which are not text; a
	// non-breaking hyphen (17.3.3.18); an empty paragraph.
	docBody = `<w:body>` +
		`<w:p><w:r><w:t>Harbour maintenance plan</w:t></w:r></w:p>` +
		`<w:p><w:r><w:t xml:space="preserve">Dredging starts </w:t></w:r><w:r><w:rPr><w:b/></w:rPr><w:t>in May</w:t></w:r><w:r><w:tab/><w:t>(tentative)</w:t></w:r></w:p>` +
		`<w:p><w:r><w:t>Line one</w:t><w:br/><w:t>line two</w:t></w:r></w:p>` +
		`<w:tbl><w:tr><w:tc><w:p><w:r><w:t>Berth</w:t></w:r></w:p></w:tc><w:tc><w:p><w:r><w:t>Depth</w:t></w:r></w:p></w:tc></w:tr>` +
		`<w:tr><w:tc><w:p><w:r><w:t>North</w:t></w:r></w:p><w:p><w:r><w:t>quay</w:t></w:r></w:p></w:tc><w:tc><w:p><w:r><w:t>7.5 m</w:t></w:r></w:p></w:tc></w:tr></w:tbl>` +
		`<w:p><w:r><w:delText>removed words</w:delText><w:instrText>PAGE</w:instrText><w:t>Kept</w:t><w:noBreakHyphen/><w:t>words</w:t></w:r></w:p>` +
		`<w:p/>` +
		`</w:body>`
	docXML  = `<?xml version="1.0" encoding="UTF-8" standalone="yes"?>` + "\n" + `<w:document ` + wordNS + `>` + docBody + `</w:document>`
	docText = "Harbour maintenance plan\nDredging starts in May\t(tentative)\nLine one\nline two\nBerth\tDepth\nNorth quay\t7.5 m\nKept-words\n"
	// coreXML is a core properties part (ECMA-376 Part 2, section 11).
	coreXML = `<?xml version="1.0" encoding="UTF-8"?><cp:coreProperties xmlns:cp="http://schemas.openxmlformats.org/package/2006/metadata/core-properties" xmlns:dc="http://purl.org/dc/elements/1.1/"><dc:title>Harbour plan  2027</dc:title><dc:creator>Invented Author</dc:creator></cp:coreProperties>`
	// relsXML is the package relationships part (ECMA-376 Part 2, section
	// 9.3) naming the main part.
	relsXML = `<?xml version="1.0" encoding="UTF-8"?><Relationships xmlns="http://schemas.openxmlformats.org/package/2006/relationships"><Relationship Id="rId1" Type="http://schemas.openxmlformats.org/officeDocument/2006/relationships/officeDocument" Target="%s"/></Relationships>`
)

func rels(target string) string { return strings.Replace(relsXML, "%s", target, 1) }

// bombZip returns a zip whose one entry, name, is n bytes of "a" and
// declares declared as its uncompressed size (n when declared < 0): the
// central directory can lie (APPNOTE.TXT section 4.4.9, from memory).
func bombZip(t testing.TB, name string, n int, declared int) []byte {
	t.Helper()
	data := bytes.Repeat([]byte("a"), n)
	var comp bytes.Buffer
	fw, _ := flate.NewWriter(&comp, flate.BestCompression)
	fw.Write(data)
	fw.Close()
	if declared < 0 {
		declared = n
	}
	var b bytes.Buffer
	w := zip.NewWriter(&b)
	f, err := w.CreateRaw(&zip.FileHeader{
		Name: name, Method: zip.Deflate, CRC32: crc32.ChecksumIEEE(data),
		CompressedSize64: uint64(comp.Len()), UncompressedSize64: uint64(declared),
	})
	if err != nil {
		t.Fatal(err)
	}
	f.Write(comp.Bytes())
	w.Close()
	return b.Bytes()
}

// TestDOCX checks the text and title of DOCX files read through Walk.
func TestDOCX(t *testing.T) {
	tests := []struct {
		name       string
		data       []byte
		text, titl string
	}{
		{"text, table and core title", makeZip(t,
			zipEntry{"[Content_Types].xml", "<Types/>"},
			zipEntry{"_rels/.rels", rels("word/document.xml")},
			zipEntry{"word/document.xml", docXML},
			zipEntry{"docProps/core.xml", coreXML},
		), docText, "Harbour plan 2027"},
		{"no core properties: the first paragraph", makeZip(t,
			zipEntry{"word/document.xml", docXML},
		), docText, "Harbour maintenance plan"},
		{"main part named by the relationships", makeZip(t,
			zipEntry{"_rels/.rels", rels("/word/main2.xml")},
			zipEntry{"word/document.xml", strings.Replace(docXML, "Harbour", "Wrong", 1)},
			zipEntry{"word/main2.xml", docXML},
		), docText, "Harbour maintenance plan"},
		// ECMA-376 Part 2 compares part names without regard to ASCII case.
		{"part names in another letter case", makeZip(t,
			zipEntry{"Word/Document.XML", docXML},
		), docText, "Harbour maintenance plan"},
		{"strict namespace", makeZip(t,
			zipEntry{"word/document.xml", strings.Replace(docXML, "http://schemas.openxmlformats.org/wordprocessingml/2006/main", "http://purl.oclc.org/ooxml/wordprocessingml/main", 1)},
		), docText, "Harbour maintenance plan"},
		{"other namespaces are not text", makeZip(t,
			zipEntry{"word/document.xml", `<w:document ` + wordNS + ` xmlns:x="urn:invented"><w:body><w:p><w:r><w:t>Seen</w:t><x:t>unseen</x:t></w:r></w:p></w:body></w:document>`},
		), "Seen\n", "Seen"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			docs, skips := walkAll(t, fstest.MapFS{"plan.docx": {Data: tt.data}}, corpus.Options{})
			if len(docs) != 1 || len(skips) != 0 {
				t.Fatalf("documents %v, skips %v; want plan.docx read", ids(docs), skips)
			}
			d := docs[0]
			if d.Text != tt.text {
				t.Errorf("Text = %q, want %q", d.Text, tt.text)
			}
			if d.Title != tt.titl {
				t.Errorf("Title = %q, want %q", d.Title, tt.titl)
			}
			if d.Format != "docx" || d.ID != "plan.docx" || d.Size != int64(len(tt.data)) {
				t.Errorf("Format, ID, Size = %q, %q, %d", d.Format, d.ID, d.Size)
			}
		})
	}
}

// TestDOCXSkips checks the DOCX files that are skipped and why; each sits
// beside a good one, which must still be read.
func TestDOCXSkips(t *testing.T) {
	good := makeZip(t, zipEntry{"word/document.xml", docXML})
	many := make([]zipEntry, 10001)
	for i := range many {
		many[i] = zipEntry{"media/image" + strconv.Itoa(i) + ".png", ""}
	}
	many[0] = zipEntry{"word/document.xml", docXML}
	// The OLE compound file signature ([MS-CFB] section 2.2, from memory)
	// starts a legacy .doc and an encrypted Office Open XML file.
	ole := "\xd0\xcf\x11\xe0\xa1\xb1\x1a\xe1" + strings.Repeat("\x00", 504)
	tests := []struct {
		name   string
		data   []byte
		opts   corpus.Options
		reason string
	}{
		{"not a zip", []byte("Plain words in a .docx file."), corpus.Options{}, "not a DOCX: not a zip archive"},
		{"legacy .doc renamed", []byte(ole), corpus.Options{}, "encrypted or legacy Office file"},
		{"zip without document.xml", makeZip(t, zipEntry{"word/styles.xml", "<styles/>"}), corpus.Options{}, "not a DOCX: no word/document.xml in the archive"},
		{"relationship target missing", makeZip(t, zipEntry{"_rels/.rels", rels("word/gone.xml")}, zipEntry{"word/document.xml", docXML}), corpus.Options{}, "not a DOCX: no word/gone.xml"},
		{"too many entries", makeZip(t, many...), corpus.Options{}, "more than 10000 zip entries"},
		{"no text", makeZip(t, zipEntry{"word/document.xml", `<w:document ` + wordNS + `><w:body><w:p/></w:body></w:document>`}), corpus.Options{}, "no text"},
		{"malformed XML", makeZip(t, zipEntry{"word/document.xml", `<w:document ` + wordNS + `><w:body><w:p>`}), corpus.Options{}, "malformed DOCX: word/document.xml"},
		// 4 MiB that compress to a few KiB: the declared size is over the
		// limit, so the entry is not even opened.
		{"zip bomb, declared", bombZip(t, "word/document.xml", 4<<20, -1), corpus.Options{MaxBytes: 64 << 10},
			"larger than the size limit (word/document.xml expands to 4.0 MiB, more than 64.0 KiB)"},
		// The same entry declaring 100 bytes: reading stops at the limit
		// (archive/zip itself also refuses to read past the declared size).
		{"zip bomb, size understated", bombZip(t, "word/document.xml", 4<<20, 100), corpus.Options{MaxBytes: 64 << 10},
			"malformed DOCX: word/document.xml: the data is longer than its declared size"},
		{"zip bomb, size just under the limit", bombZip(t, "word/document.xml", 4<<20, 64<<10-1), corpus.Options{MaxBytes: 64 << 10},
			"malformed DOCX: word/document.xml: the data is longer than its declared size"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			fsys := fstest.MapFS{"bad.docx": {Data: tt.data}, "good.docx": {Data: good}}
			docs, skips := walkAll(t, fsys, tt.opts)
			if got := ids(docs); !slices.Equal(got, []string{"good.docx"}) {
				t.Errorf("documents %q, want good.docx", got)
			}
			if r := reasonOf(skips, "bad.docx"); !strings.Contains(r, tt.reason) {
				t.Errorf("skip reason %q, want it to contain %q", r, tt.reason)
			}
		})
	}
}

// FuzzDOCX checks that no input makes the DOCX reader panic (a panic would
// show as a "reader failed" skip: formats.go) and that documents have
// valid UTF-8 text.
func FuzzDOCX(f *testing.F) {
	f.Add(makeZip(f, zipEntry{"_rels/.rels", rels("word/document.xml")}, zipEntry{"word/document.xml", docXML}, zipEntry{"docProps/core.xml", coreXML}))
	f.Add(makeZip(f, zipEntry{"word/document.xml", `<w:document ` + wordNS + `><w:body><w:tbl><w:tr><w:tc><w:tbl><w:tr><w:tc><w:p><w:r><w:t>nested</w:t></w:r></w:p></w:tc></w:tr></w:tbl></w:tc></w:tr></w:tbl></w:body></w:document>`}))
	f.Add(bombZip(f, "word/document.xml", 1<<16, 100))
	f.Add([]byte("\xd0\xcf\x11\xe0\xa1\xb1\x1a\xe1"))
	f.Fuzz(func(t *testing.T, data []byte) {
		docs, skips := walkAll(t, fstest.MapFS{"f.docx": {Data: data}}, corpus.Options{MaxBytes: 1 << 20})
		checkFuzzResult(t, docs, skips)
	})
}

// checkFuzzResult fails on a recovered panic and on text that is not
// valid UTF-8.
func checkFuzzResult(t *testing.T, docs []corpus.Document, skips []corpus.Skip) {
	t.Helper()
	for _, s := range skips {
		if strings.Contains(s.Reason, "reader failed") {
			t.Fatalf("reader panicked: %s", s.Reason)
		}
	}
	seen := map[string]bool{}
	for _, d := range docs {
		if !utf8.ValidString(d.Text) || !utf8.ValidString(d.Title) {
			t.Fatalf("document %s: invalid UTF-8", d.ID)
		}
		if seen[d.ID] {
			t.Fatalf("document ID %s repeated", d.ID)
		}
		seen[d.ID] = true
	}
}
