package pdf_test

import (
	"bytes"
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"assay/corpus/pdf"
	"assay/corpus/pdf/pdftest"
)

// maxBytes is the size limit of the tests unless a case sets its own.
const maxBytes = 1 << 20

// Extra objects are numbered from Doc.FirstExtra: with one page that is 7.
const extra1 = 7

// cmapSource is a ToUnicode CMap (ISO 32000-1 section 9.10.3, with the
// syntax of Adobe's CMap format as section 9.7.5 describes it): two-byte
// codes, one bfchar pair for the space and "é", ranges for A–Z and a–z, and
// a range with an array of destinations for "1" and "2".
const cmapSource = `/CIDInit /ProcSet findresource begin
12 dict begin
begincmap
/CMapName /Invented-UCS def
1 begincodespacerange
<0000> <FFFF>
endcodespacerange
2 beginbfchar
<0003> <0020>
<0011> <00E9>
endbfchar
3 beginbfrange
<0024> <003D> <0041>
<0044> <005D> <0061>
<0060> <0061> [<0031> <0032>]
endbfrange
endcmap
CMapName currentdict /CMap defineresource pop
end
end`

// glyphs encodes s for cmapSource: A–Z from 0x24, a–z from 0x44, space
// 0x03, é 0x11, 1 and 2 at 0x60 and 0x61.
func glyphs(s string) string {
	var b strings.Builder
	b.WriteString("<")
	for _, r := range s {
		code := 0
		switch {
		case r >= 'A' && r <= 'Z':
			code = 0x24 + int(r-'A')
		case r >= 'a' && r <= 'z':
			code = 0x44 + int(r-'a')
		case r == ' ':
			code = 0x03
		case r == 'é':
			code = 0x11
		case r == '1', r == '2':
			code = 0x60 + int(r-'1')
		}
		fmt.Fprintf(&b, "%04X", code)
	}
	return b.String() + ">"
}

// withCMapFont is a one-page document whose /F2 is a composite font
// (Type0, Identity-H, section 9.7) mapped to Unicode by cmapSource.
func withCMapFont(content string) []byte { return withCMap(content, cmapSource) }

// withCMap is withCMapFont with another CMap.
func withCMap(content, cmap string) []byte {
	return pdftest.Doc{
		Contents: []string{content},
		Fonts:    fmt.Sprintf("/F2 %d 0 R", extra1),
		Objects: []string{
			fmt.Sprintf("<< /Type /Font /Subtype /Type0 /BaseFont /InventedSans /Encoding /Identity-H /DescendantFonts [] /ToUnicode %d 0 R >>", extra1+1),
			pdftest.Stream("", cmap),
		},
	}.Bytes()
}

// TestExtractText checks the text of hand-made PDFs. The operators are
// those of ISO 32000-1: Td, TD, Tm, T*, TL (section 9.4.2, Tables 105 and
// 108), Tj, TJ, ' and " (section 9.4.3, Table 109), cm, q, Q (section
// 8.4.4, Table 57), Do with a form XObject (section 8.10) and inline images
// (section 8.9.7). Where lines and spaces go is our rule (pdf.go's package
// documentation), not the specification's.
func TestExtractText(t *testing.T) {
	tests := []struct {
		name string
		pdf  []byte
		want string
	}{
		{"Td starts new lines", pdftest.Text("",
			"BT /F1 12 Tf 72 720 Td (Flood gauge readings) Tj 0 -14 Td (Level at noon: 3.2 m) Tj ET"),
			"Flood gauge readings\nLevel at noon: 3.2 m"},
		{"Td along the line is a space", pdftest.Text("",
			"BT /F1 12 Tf 72 700 Td (North) Tj 60 0 Td (gate) Tj ET"),
			"North gate"},
		{"TJ: kerning joins, a wide gap is a space", pdftest.Text("",
			"BT /F1 12 Tf 72 720 Td [(Sand)-30(bags) -250 (stacked)] TJ ET"),
			"Sandbags stacked"},
		{"T*, ' and \" move to the next line", pdftest.Text("",
			"BT /F1 11 Tf 14 TL 72 700 Td (First line) Tj T* (Second line) Tj (Third line) ' 1 0.5 (Fourth line) \" ET"),
			"First line\nSecond line\nThird line\nFourth line"},
		{"TD sets the leading", pdftest.Text("",
			"BT /F1 10 Tf 72 700 TD (unused) Tj ET BT /F1 10 Tf 72 650 Td 0 -12 TD (Upper) Tj T* (Lower) Tj ET"),
			"unused\nUpper\nLower"},
		{"Tm places text", pdftest.Text("",
			"BT /F1 12 Tf 1 0 0 1 72 720 Tm (Top) Tj 1 0 0 1 72 500 Tm (Bottom) Tj ET"),
			"Top\nBottom"},
		{"consecutive Tj join", pdftest.Text("",
			"BT /F1 12 Tf 72 720 Td (water) Tj (proof) Tj ET"),
			"waterproof"},
		{"cm scales the line spacing", pdftest.Text("",
			"q 0.5 0 0 0.5 0 0 cm BT /F1 24 Tf 100 1000 Td (Scaled) Tj 0 -30 Td (text) Tj ET Q"),
			"Scaled\ntext"},
		{"separate text objects on one line", pdftest.Text("",
			"BT /F1 12 Tf 72 700 Td (Left) Tj ET BT /F1 12 Tf 300 700 Td (right) Tj ET"),
			"Left right"},
		{"escapes in literal strings (section 7.3.4.2)", pdftest.Text("",
			`BT /F1 12 Tf 72 700 Td (Paren \( and \) and back\\slash) Tj ET`),
			`Paren ( and ) and back\slash`},
		{"hex strings (section 7.3.4.3)", pdftest.Text("",
			"BT /F1 12 Tf 72 700 Td <4869676820 7469646521> Tj ET"),
			"High tide!"},
		{"two pages are separated by a blank line", pdftest.Text("",
			"BT /F1 12 Tf 72 700 Td (Page one) Tj ET",
			"BT /F1 12 Tf 72 700 Td (Page two) Tj ET"),
			"Page one\n\nPage two"},
		{"a page without text between pages", pdftest.Text("",
			"BT /F1 12 Tf 72 700 Td (Page one) Tj ET", "",
			"BT /F1 12 Tf 72 700 Td (Page three) Tj ET"),
			"Page one\n\nPage three"},
		{"inline image data is skipped", pdftest.Text("",
			"BI /W 4 /H 1 /BPC 8 /CS /G ID \x00)(>\xff EI BT /F1 12 Tf 72 700 Td (After the image) Tj ET"),
			"After the image"},
		{"control characters become spaces", pdftest.Text("",
			"BT /F1 12 Tf 72 700 Td (tab\\there) Tj ET"),
			"tab here"},
		{"WinAnsiEncoding (Annex D.2: 0xE9 is eacute)", pdftest.Doc{
			Contents: []string{`BT /F2 12 Tf 72 700 Td (Caf\351 by the weir) Tj ET`},
			Fonts:    fmt.Sprintf("/F2 %d 0 R", extra1),
			Objects:  []string{"<< /Type /Font /Subtype /Type1 /BaseFont /Times-Roman /Encoding /WinAnsiEncoding >>"},
		}.Bytes(), "Café by the weir"},
		{"Differences names glyphs (section 9.6.6.1)", pdftest.Doc{
			Contents: []string{`BT /F2 12 Tf 72 700 Td (\001 la carte) Tj ET`},
			Fonts:    fmt.Sprintf("/F2 %d 0 R", extra1),
			Objects:  []string{"<< /Type /Font /Subtype /Type1 /BaseFont /Times-Roman /Encoding << /Type /Encoding /Differences [1 /agrave] >> >>"},
		}.Bytes(), "à la carte"},
		{"ToUnicode CMap of a composite font", withCMapFont(
			"BT /F2 12 Tf 72 700 Td " + glyphs("Weir é") + " Tj 0 -20 Td " + glyphs("Gate 12") + " Tj ET"),
			"Weir é\nGate 12"},
		{"form XObject", pdftest.Doc{
			Contents:  []string{"BT /F1 12 Tf 72 720 Td (Before the form) Tj ET q 1 0 0 1 0 -100 cm /Fm1 Do Q"},
			Resources: fmt.Sprintf("/XObject << /Fm1 %d 0 R >>", extra1),
			Objects: []string{pdftest.Stream("/Type /XObject /Subtype /Form /BBox [0 0 612 792]",
				"BT /F1 12 Tf 72 600 Td (Inside the form) Tj ET")},
		}.Bytes(), "Before the form\nInside the form"},
		{"a form drawing itself stops at the depth bound", pdftest.Doc{
			Contents:  []string{"/Fm1 Do"},
			Resources: fmt.Sprintf("/XObject << /Fm1 %d 0 R >>", extra1),
			Objects: []string{pdftest.Stream("/Type /XObject /Subtype /Form /BBox [0 0 612 792]",
				"BT /F1 12 Tf 72 600 Td (Echo) Tj ET /Fm1 Do")},
		}.Bytes(), "Echo Echo Echo Echo Echo Echo Echo Echo"},
		{"FlateDecode content (section 7.4.4)", pdftest.Build([]string{
			"<< /Type /Catalog /Pages 2 0 R >>",
			"<< /Type /Pages /Kids [3 0 R] /Count 1 >>",
			"<< /Type /Page /Parent 2 0 R /Contents 4 0 R /Resources << /Font << /F1 5 0 R >> >> >>",
			pdftest.Stream("/Filter /FlateDecode", pdftest.Flate("BT /F1 12 Tf 72 700 Td (Compressed words) Tj ET")),
			"<< /Type /Font /Subtype /Type1 /BaseFont /Helvetica >>",
		}, ""), "Compressed words"},
		{"a Contents array (section 7.7.3.3)", pdftest.Build([]string{
			"<< /Type /Catalog /Pages 2 0 R >>",
			"<< /Type /Pages /Kids [3 0 R] /Count 1 >>",
			"<< /Type /Page /Parent 2 0 R /Contents [4 0 R 6 0 R 7 0 R] /Resources << /Font << /F1 5 0 R >> >> >>",
			pdftest.Stream("", "BT /F1 12 Tf 72 700 Td (First part) Tj"),
			"<< /Type /Font /Subtype /Type1 /BaseFont /Helvetica >>",
			pdftest.Stream("/Filter /LZWDecode", "not read"),
			pdftest.Stream("", "0 -20 Td (second part) Tj ET"),
		}, ""), "First part\nsecond part"},
		{"resources inherited through /Parent loops are bounded", pdftest.Build([]string{
			"<< /Type /Catalog /Pages 2 0 R >>",
			"<< /Type /Pages /Kids [3 0 R] /Count 1 >>",
			"<< /Type /Page /Parent 3 0 R /Contents 4 0 R >>",
			pdftest.Stream("", "BT /F1 12 Tf 72 700 Td (No font found) Tj ET"),
		}, ""), "No font found"},
		{"junk before the header", append([]byte(strings.Repeat("x", 1000)), pdftest.Text("", "BT /F1 12 Tf 72 700 Td (Late header) Tj ET")...),
			"Late header"},
		{"junk after %%EOF", append(pdftest.Text("", "BT /F1 12 Tf 72 700 Td (Tail junk) Tj ET"), strings.Repeat("\x00junk", 50)...),
			"Tail junk"},
		{"a PDF 2.0 header", bytes.Replace(pdftest.Text("", "BT /F1 12 Tf 72 700 Td (Version two) Tj ET"), []byte("%PDF-1.4"), []byte("%PDF-2.0"), 1),
			"Version two"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			_, text, err := pdf.Extract(tt.pdf, maxBytes)
			if err != nil {
				t.Fatalf("Extract: %v", err)
			}
			if text != tt.want {
				t.Errorf("text = %q, want %q", text, tt.want)
			}
		})
	}
}

// TestExtractTitle checks the Info dictionary's /Title (ISO 32000-1
// section 14.3.3), a text string: PDFDocEncoding or UTF-16BE with a byte
// order mark (section 7.9.2.2).
func TestExtractTitle(t *testing.T) {
	tests := []struct{ name, info, want string }{
		{"literal", "(Minutes of the weir committee)", "Minutes of the weir committee"},
		{"UTF-16BE", "<FEFF005700650069007200200032>", "Weir 2"},
		{"PDFDocEncoding 0xE9 is é (Annex D.2)", `(Caf\351 menu)`, "Café menu"},
		{"white space collapsed", "(  Spring\\n\\tnotes  )", "Spring notes"},
		{"empty", "()", ""},
		{"none", "", ""},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			title, _, err := pdf.Extract(pdftest.Text(tt.info, "BT /F1 12 Tf 72 700 Td (Body) Tj ET"), maxBytes)
			if err != nil {
				t.Fatalf("Extract: %v", err)
			}
			if title != tt.want {
				t.Errorf("title = %q, want %q", title, tt.want)
			}
		})
	}
}

// prevLoop returns a PDF whose trailer's /Prev points to its own
// cross-reference table (ISO 32000-1 section 7.5.6: /Prev gives the
// previous section's offset).
func prevLoop() []byte {
	b := pdftest.Text("", "BT /F1 12 Tf 72 700 Td (Loop) Tj ET")
	i := bytes.LastIndex(b, []byte("startxref\n"))
	var off int
	fmt.Sscanf(string(b[i+len("startxref\n"):]), "%d", &off)
	return bytes.Replace(b, []byte("/Root 1 0 R"), fmt.Appendf(nil, "/Root 1 0 R /Prev %d", off), 1)
}

// xrefObjects are the objects of xrefStreamPDF's default file.
var xrefObjects = []string{
	"<< /Type /Catalog /Pages 2 0 R >>",
	"<< /Type /Pages /Kids [3 0 R] /Count 1 >>",
	"<< /Type /Page /Parent 2 0 R /Contents 4 0 R /Resources << >> >>",
	pdftest.Stream("", "BT 72 700 Td (Cross-reference stream) Tj ET"),
}

// xrefStreamPDF returns a PDF whose cross-reference section is an
// uncompressed cross-reference stream (ISO 32000-1 section 7.5.8) with
// W [1 4 2], listing objs as objects 1, 2, … in the file, then the extra
// entries given as (object number, type, field 2, field 3), which may
// replace those of objs.
func xrefStreamPDF(objs []string, extra [][4]int) []byte {
	var b bytes.Buffer
	b.WriteString("%PDF-1.5\n")
	offs := []int{0}
	for i, o := range objs {
		offs = append(offs, b.Len())
		fmt.Fprintf(&b, "%d 0 obj\n%s\nendobj\n", i+1, o)
	}
	size := len(objs) + 2
	rows := map[int][3]int{0: {0, 0, 65535}}
	for i := 1; i <= len(objs); i++ {
		rows[i] = [3]int{1, offs[i], 0}
	}
	rows[len(objs)+1] = [3]int{1, b.Len(), 0} // the stream itself
	for _, e := range extra {
		rows[e[0]] = [3]int{e[1], e[2], e[3]}
		size = max(size, e[0]+1)
	}
	var data []byte
	for id := range size {
		r := rows[id]
		data = append(data, byte(r[0]), byte(r[1]>>24), byte(r[1]>>16), byte(r[1]>>8), byte(r[1]), byte(r[2]>>8), byte(r[2]))
	}
	xref := b.Len()
	fmt.Fprintf(&b, "%d 0 obj\n<< /Type /XRef /Size %d /W [1 4 2] /Root 1 0 R /Length %d >>\nstream\n%s\nendstream\nendobj\n",
		len(objs)+1, size, len(data), data)
	fmt.Fprintf(&b, "startxref\n%d\n%%%%EOF\n", xref)
	return b.Bytes()
}

// TestExtractErrors checks the files that are refused and why.
func TestExtractErrors(t *testing.T) {
	good := pdftest.Text("", "BT /F1 12 Tf 72 700 Td (Sound text) Tj ET")
	cmapBomb := pdftest.Doc{
		Contents: []string{"BT /F2 12 Tf 72 700 Td <" + strings.Repeat("01", 1000) + "> Tj ET"},
		Fonts:    fmt.Sprintf("/F2 %d 0 R", extra1),
		Objects: []string{
			fmt.Sprintf("<< /Type /Font /Subtype /Type1 /BaseFont /X /ToUnicode %d 0 R >>", extra1+1),
			pdftest.Stream("", "1 begincodespacerange <00> <FF> endcodespacerange 1 beginbfchar <01> <"+strings.Repeat("0041", 2000)+"> endbfchar"),
		},
	}.Bytes()
	tests := []struct {
		name     string
		pdf      []byte
		maxBytes int64
		want     error  // errors.Is, or nil to check a MalformedError
		reason   string // the MalformedError's reason must contain this
	}{
		{"not a PDF", []byte("Dear committee, the weir is fine."), 0, pdf.ErrNotPDF, ""},
		{"header after 1024 bytes", append([]byte(strings.Repeat("x", 1100)), good...), 0, pdf.ErrNotPDF, ""},
		// ISO 32000-1 section 7.6.1: a trailer /Encrypt entry marks an
		// encrypted document.
		{"encrypted", pdftest.Doc{
			Contents: []string{"BT /F1 12 Tf 72 700 Td (Secret) Tj ET"},
			Trailer:  "/Encrypt << /Filter /Standard /V 1 /R 2 /O (0123456789abcdef0123456789abcdef) /U (0123456789abcdef0123456789abcdef) /P -4 >> /ID [<00> <00>]",
		}.Bytes(), 0, pdf.ErrEncrypted, ""},
		{"image only", pdftest.Doc{
			Contents:  []string{"q 200 0 0 100 72 600 cm /Im1 Do Q"},
			Resources: fmt.Sprintf("/XObject << /Im1 %d 0 R >>", extra1),
			Objects:   []string{pdftest.Stream("/Type /XObject /Subtype /Image /Width 2 /Height 1 /ColorSpace /DeviceGray /BitsPerComponent 8", "\x00\xff")},
		}.Bytes(), 0, pdf.ErrNoText, ""},
		{"blank page", pdftest.Text("", ""), 0, pdf.ErrNoText, ""},
		{"punctuation only", pdftest.Text("", "BT /F1 12 Tf 72 700 Td (-- . --) Tj ET"), 0, pdf.ErrNoText, ""},
		{"composite font without ToUnicode", pdftest.Doc{
			Contents: []string{"BT /F2 12 Tf 72 700 Td <00240025> Tj ET"},
			Fonts:    fmt.Sprintf("/F2 %d 0 R", extra1),
			Objects:  []string{"<< /Type /Font /Subtype /Type0 /BaseFont /X /Encoding /Identity-H /DescendantFonts [] >>"},
		}.Bytes(), 0, pdf.ErrNoText, ""},
		{"truncated", good[:len(good)/2], 0, nil, "truncated"},
		{"truncated after the objects", good[:bytes.Index(good, []byte("xref"))], 0, nil, "truncated"},
		{"startxref points nowhere", bytes.Replace(good, []byte("startxref\n"), []byte("startxref\n9"), 1), 0, nil, "outside the file"},
		{"garbage after the header", []byte("%PDF-1.4\n" + strings.Repeat("\x8f\x01(", 200) + "\nstartxref\n9\n%%EOF\n"), 0, nil, ""},
		{"a /Prev loop", prevLoop(), 0, nil, "loop"},
		{"object numbers out of bounds", bytes.Replace(good, []byte("xref\n0 "), []byte("xref\n4000000000 "), 1), 0, nil, "object numbers"},
		{"/Size out of bounds", pdftest.Doc{Contents: []string{"BT ET"}, Trailer: "/Size 99999999999"}.Bytes(), 0, nil, "/Size"},
		{"page tree loop", pdftest.Build([]string{
			"<< /Type /Catalog /Pages 2 0 R >>",
			"<< /Type /Pages /Kids [2 0 R 2 0 R] /Count 1 >>",
		}, ""), 0, nil, "page tree"},
		{"no page tree", pdftest.Build([]string{"<< /Type /Catalog >>"}, ""), 0, nil, "no page tree"},
		{"unsupported filter only", pdftest.Build([]string{
			"<< /Type /Catalog /Pages 2 0 R >>",
			"<< /Type /Pages /Kids [3 0 R] /Count 1 >>",
			"<< /Type /Page /Parent 2 0 R /Contents 4 0 R >>",
			pdftest.Stream("/Filter /LZWDecode", "\x80\x0b\x60\x50"),
		}, ""), 0, nil, "LZWDecode"},
		{"predictor columns out of bounds", pdftest.Build([]string{
			"<< /Type /Catalog /Pages 2 0 R >>",
			"<< /Type /Pages /Kids [3 0 R] /Count 1 >>",
			"<< /Type /Page /Parent 2 0 R /Contents 4 0 R >>",
			pdftest.Stream("/Filter /FlateDecode /DecodeParms << /Predictor 12 /Columns 99999999999 >>", pdftest.Flate("x")),
		}, ""), 0, nil, "Columns"},
		{"a reference to a reference", pdftest.Build([]string{
			"<< /Type /Catalog /Pages 2 0 R >>",
			"<< /Type /Pages /Kids [3 0 R] /Count 1 >>",
			"<< /Type /Page /Parent 2 0 R /Contents 4 0 R >>",
			"4 0 R",
		}, ""), 0, nil, ""},
		{"object streams nested in a loop", xrefStreamPDF(xrefObjects, [][4]int{{7, 2, 8, 0}, {8, 2, 7, 0}}), 0, nil, "object streams"},
		// A zip bomb in a stream: 4 MiB of spaces compress to about 4 KiB
		// (deflate's longest match is 258 bytes, RFC 1951 section 3.2.5).
		{"content stream expands beyond the limit", pdftest.Build([]string{
			"<< /Type /Catalog /Pages 2 0 R >>",
			"<< /Type /Pages /Kids [3 0 R] /Count 1 >>",
			"<< /Type /Page /Parent 2 0 R /Contents 4 0 R >>",
			pdftest.Stream("/Filter /FlateDecode", pdftest.Flate(strings.Repeat(" ", 4<<20))),
		}, ""), 1 << 20, pdf.ErrTooLarge, ""},
		// 1000 codes each mapped to 2000 letters: 2 MB of text from a few
		// KiB of streams.
		{"text expands beyond the limit", cmapBomb, 1 << 20, pdf.ErrTooLarge, ""},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			limit := tt.maxBytes
			if limit == 0 {
				limit = maxBytes
			}
			_, text, err := pdf.Extract(tt.pdf, limit)
			if tt.want != nil {
				if !errors.Is(err, tt.want) {
					t.Fatalf("Extract error = %v, want %v", err, tt.want)
				}
				return
			}
			var bad *pdf.MalformedError
			if !errors.As(err, &bad) {
				t.Fatalf("Extract = %q, %v; want a MalformedError", text, err)
			}
			if !strings.Contains(bad.Reason, tt.reason) {
				t.Errorf("reason %q, want it to contain %q", bad.Reason, tt.reason)
			}
		})
	}
}

// TestExtractXrefStream checks that a file with a cross-reference stream
// (ISO 32000-1 section 7.5.8) and sound entries passes the check.
func TestExtractXrefStream(t *testing.T) {
	_, text, err := pdf.Extract(xrefStreamPDF(xrefObjects, nil), maxBytes)
	if err != nil || text != "Cross-reference stream" {
		t.Errorf("Extract = %q, %v", text, err)
	}
}

// TestExtractFixtures checks files written by real producers
// (testdata/pdf/make-fixtures.sh: Ghostscript and qpdf).
func TestExtractFixtures(t *testing.T) {
	const page1 = "Quarterly notes on the orchard irrigation trial\n" +
		"The drip lines on the north slope were flushed twice.\n" +
		"Moisture sensors read between 18 and 24 percent."
	const text = page1 + "\n\nSecond page: pruning schedule for the pear rows."
	tests := []struct {
		file, title, text string
		err               error
	}{
		{"ghostscript.pdf", "Orchard trial notes", text, nil},
		{"objstm.pdf", "Orchard trial notes", text, nil}, // object and cross-reference streams
		{"encrypted-aes.pdf", "", "", pdf.ErrEncrypted},
		{"encrypted-empty-user.pdf", "", "", pdf.ErrEncrypted}, // opens without a password, still not read
		{"scanned.pdf", "", "", pdf.ErrNoText},
	}
	for _, tt := range tests {
		t.Run(tt.file, func(t *testing.T) {
			raw, err := os.ReadFile(filepath.Join("..", "testdata", "pdf", tt.file))
			if err != nil {
				t.Fatal(err)
			}
			title, text, err := pdf.Extract(raw, maxBytes)
			if tt.err != nil {
				if !errors.Is(err, tt.err) {
					t.Errorf("Extract error = %v, want %v", err, tt.err)
				}
				return
			}
			if err != nil {
				t.Fatalf("Extract: %v", err)
			}
			if title != tt.title || text != tt.text {
				t.Errorf("Extract = %q, %q; want %q, %q", title, text, tt.title, tt.text)
			}
		})
	}
}

// TestExtractWorkBudget checks that a file whose reading never ends is
// cut off by the work budget: a form XObject that draws itself twice, 8
// levels deep, is 2^9 - 1 drawings, each charged at least a kilobyte of
// work (pdf.go's formCost); with a limit of about 1 KB the budget of 64 KB
// ends it. (The text is empty, so only the work budget can end it.)
func TestExtractWorkBudget(t *testing.T) {
	doc := pdftest.Doc{
		Contents:  []string{"/Fm1 Do"},
		Resources: fmt.Sprintf("/XObject << /Fm1 %d 0 R >>", extra1),
		Objects: []string{pdftest.Stream("/Type /XObject /Subtype /Form /BBox [0 0 1 1]",
			"/Fm1 Do /Fm1 Do")},
	}.Bytes()
	_, _, err := pdf.Extract(doc, int64(len(doc)))
	var bad *pdf.MalformedError
	if !errors.As(err, &bad) || !strings.Contains(bad.Reason, "work") {
		t.Errorf("Extract error = %v, want a MalformedError about work", err)
	}
}

// TestExtractObjectStreamBomb checks an object stream (ISO 32000-1 section
// 7.5.7) that the library must decompress far at every lookup: its first
// object starts after 900 KB of spaces (/First), and the page inside it is
// listed 300 times in the page tree. Each lookup costs the work budget
// what is decompressed, so the reading ends with the budget (64 MiB here)
// instead of decompressing 270 MB.
func TestExtractObjectStreamBomb(t *testing.T) {
	const pad = 900_000
	page := "<< /Type /Page /Contents 4 0 R >>"
	objStm := fmt.Sprintf("3 %d %s%s", pad-len("3 900000 "), strings.Repeat(" ", pad-len("3 900000 ")), page)
	kids := strings.Repeat("3 0 R ", 300)
	objs := []string{
		"<< /Type /Catalog /Pages 2 0 R >>",
		"<< /Type /Pages /Kids [" + kids + "] /Count 300 >>",
		"null", // object 3 lives in the object stream
		pdftest.Stream("", "BT 72 700 Td (Deep) Tj ET"),
		pdftest.Stream(fmt.Sprintf("/Type /ObjStm /N 1 /First %d /Filter /FlateDecode", len("3 900000 ")), pdftest.Flate(objStm)),
	}
	raw := xrefStreamPDF(objs, [][4]int{{3, 2, 5, 0}})
	_, text, err := pdf.Extract(raw, 1<<20)
	var bad *pdf.MalformedError
	if !errors.As(err, &bad) || !strings.Contains(bad.Reason, "work") {
		t.Errorf("Extract = %.40q, %v; want a MalformedError about work", text, err)
	}
	// The same file with the page listed once reads.
	objs[1] = "<< /Type /Pages /Kids [3 0 R] /Count 1 >>"
	if _, text, err := pdf.Extract(xrefStreamPDF(objs, [][4]int{{3, 2, 5, 0}}), 1<<20); err != nil || text != "Deep" {
		t.Errorf("one lookup: Extract = %q, %v; want Deep", text, err)
	}
}

// FuzzContent wraps fuzzed bytes as a page's content stream in a sound
// file, so that the content-stream reader is fuzzed past the file
// structure (FuzzPDF in package corpus mostly breaks the offsets). No
// input may make Extract panic; without an error there is text.
func FuzzContent(f *testing.F) {
	f.Add("BT /F1 12 Tf 14 TL 72 700 Td [(Sand)-30(bags) -250 (stacked)] TJ T* (x) ' 1 2 (y) \" ET")
	f.Add("q 0.5 0 0 0.5 0 0 cm BT /F1 24 Tf 1 0 0 1 72 720 Tm <48 69> Tj ET Q /Fm1 Do")
	f.Add("BI /W 4 /H 1 ID \x00)(> EI BT (after) Tj ET")
	f.Add("BT /F2 12 Tf " + glyphs("Weir é 12") + " Tj ET")
	f.Fuzz(func(t *testing.T, content string) {
		doc := pdftest.Doc{
			Contents:  []string{content},
			Fonts:     fmt.Sprintf("/F2 %d 0 R", extra1),
			Resources: fmt.Sprintf("/XObject << /Fm1 %d 0 R >>", extra1+2),
			Objects: []string{
				fmt.Sprintf("<< /Type /Font /Subtype /Type0 /Encoding /Identity-H /ToUnicode %d 0 R >>", extra1+1),
				pdftest.Stream("", cmapSource),
				pdftest.Stream("/Type /XObject /Subtype /Form", content),
			},
		}.Bytes()
		_, text, err := pdf.Extract(doc, 1<<20)
		if err == nil && strings.TrimSpace(text) == "" {
			t.Fatal("no error and no text")
		}
	})
}

// FuzzCMap does the same for a font's ToUnicode CMap, shown with a fixed
// string of two-byte codes.
func FuzzCMap(f *testing.F) {
	f.Add(cmapSource)
	f.Add("1 begincodespacerange <00> <FF> endcodespacerange 1 beginbfrange <20> <7E> <0020> endbfrange")
	f.Add("2 beginbfchar <0041> <FEFF> <0042> <D83DDE00> endbfchar 1 beginbfrange <00FF> <0100> [<0041> <0042>] endbfrange")
	f.Fuzz(func(t *testing.T, cmap string) {
		pdf.Extract(withCMap("BT /F2 12 Tf 72 700 Td <0024004400030011006000FF01000041> Tj ET", cmap), 1<<20)
	})
}
