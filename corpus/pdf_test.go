package corpus_test

import (
	"crypto/sha256"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"
	"testing/fstest"

	"assay/corpus"
	"assay/corpus/pdf"
	"assay/corpus/pdf/pdftest"
)

func fixture(t testing.TB, name string) []byte {
	t.Helper()
	raw, err := os.ReadFile(filepath.Join("testdata", "pdf", name))
	if err != nil {
		t.Fatal(err)
	}
	return raw
}

// TestPDF checks PDF files end to end through Walk: documents, titles
// (Info /Title, else the text's, else the file name: pdf.go) and the skip
// reasons of the issue.
func TestPDF(t *testing.T) {
	titled := pdftest.Text("(Weir inspection, spring)", "BT /F1 12 Tf 72 700 Td (The weir was inspected.) Tj ET")
	untitled := pdftest.Text("", "BT /F1 12 Tf 72 700 Td (Eel pass notes) Tj 0 -14 Td (All clear.) Tj ET")
	digits := pdftest.Text("", "BT /F1 12 Tf 72 700 Td (2026) Tj ET")
	bomb := pdftest.Build([]string{
		"<< /Type /Catalog /Pages 2 0 R >>",
		"<< /Type /Pages /Kids [3 0 R] /Count 1 >>",
		"<< /Type /Page /Parent 2 0 R /Contents 4 0 R >>",
		pdftest.Stream("/Filter /FlateDecode", pdftest.Flate(strings.Repeat("(a) Tj ", 1<<20))),
	}, "")
	fsys := fstest.MapFS{
		"a-titled.pdf":     {Data: titled},
		"b-untitled.PDF":   {Data: untitled},
		"c-gs.pdf":         {Data: fixture(t, "ghostscript.pdf")},
		"d-objstm.pdf":     {Data: fixture(t, "objstm.pdf")},
		"e-digits.pdf":     {Data: digits},
		"x-fake.pdf":       {Data: []byte("Minutes of the weir committee, not a PDF at all.")},
		"x-encrypted.pdf":  {Data: fixture(t, "encrypted-aes.pdf")},
		"x-scanned.pdf":    {Data: fixture(t, "scanned.pdf")},
		"x-truncated.pdf":  {Data: titled[:len(titled)*2/3]},
		"x-bomb.pdf":       {Data: bomb},
		"x-empty-user.pdf": {Data: fixture(t, "encrypted-empty-user.pdf")},
	}
	docs, skips := walkAll(t, fsys, corpus.Options{MaxBytes: 1 << 20})
	type want struct{ id, title, text string }
	wants := []want{
		{"a-titled.pdf", "Weir inspection, spring", "The weir was inspected."},
		{"b-untitled.PDF", "Eel pass notes", "Eel pass notes\nAll clear."},
		{"c-gs.pdf", "Orchard trial notes", ""},
		{"d-objstm.pdf", "Orchard trial notes", ""},
		{"e-digits.pdf", "2026", "2026"},
	}
	if len(docs) != len(wants) {
		t.Fatalf("documents %q, want %d; skips %q", ids(docs), len(wants), skips)
	}
	for i, w := range wants {
		d := docs[i]
		if d.ID != w.id || d.Title != w.title || (w.text != "" && d.Text != w.text) || d.Format != "pdf" {
			t.Errorf("document %d = %q %q %q %q, want %q %q %q", i, d.ID, d.Title, d.Text, d.Format, w.id, w.title, w.text)
		}
		if raw := fsys[d.ID].Data; d.Size != int64(len(raw)) || d.Hash != sha256.Sum256(raw) {
			t.Errorf("%s: Size and Hash are not those of the file", d.ID)
		}
	}
	wantSkips := map[string]string{
		"x-fake.pdf":       "not a PDF (content does not match the extension)",
		"x-encrypted.pdf":  "encrypted PDF",
		"x-empty-user.pdf": "encrypted PDF",
		"x-scanned.pdf":    "no text layer (image-only PDF?)",
		"x-truncated.pdf":  "malformed PDF: ",
		"x-bomb.pdf":       "larger than the size limit (PDF streams expand beyond 1.0 MiB)",
	}
	if len(skips) != len(wantSkips) {
		t.Errorf("skips %q, want %d", skips, len(wantSkips))
	}
	for p, reason := range wantSkips {
		if r := reasonOf(skips, p); !strings.HasPrefix(r, reason) {
			t.Errorf("skip reason for %s = %q, want it to start with %q", p, r, reason)
		}
	}
}

// TestPDFUnknownEncoding checks a font with an encoding name the library
// does not know: it passes the bytes through, and bytes that are not
// UTF-8 are then read as Latin-1 (pdf's text.go), so the text is valid
// UTF-8 (ISO 8859-1: 0xF6 is ö, 0xE5 is å).
func TestPDFUnknownEncoding(t *testing.T) {
	raw := pdftest.Doc{
		Contents: []string{`BT /F2 12 Tf 72 700 Td (Sm\366rg\345s) Tj ET`},
		Fonts:    "/F2 7 0 R",
		Objects:  []string{"<< /Type /Font /Subtype /Type1 /BaseFont /Invented /Encoding /InventedEncoding >>"},
	}.Bytes()
	docs, skips := walkAll(t, fstest.MapFS{"s.pdf": {Data: raw}}, corpus.Options{})
	if len(docs) != 1 {
		t.Fatalf("documents %q, skips %q", ids(docs), skips)
	}
	if docs[0].Text != "Smörgås" {
		t.Errorf("Text = %q, want %q", docs[0].Text, "Smörgås")
	}
}

// FuzzPDF checks that pdf.Extract never panics (a panic would escape it
// and fail the fuzz run; Walk's own recover would hide it) and that
// documents read through Walk have valid UTF-8 text and titles.
func FuzzPDF(f *testing.F) {
	for _, name := range []string{"ghostscript.pdf", "objstm.pdf", "encrypted-aes.pdf", "scanned.pdf"} {
		f.Add(fixture(f, name))
	}
	f.Add(pdftest.Text("(Title)", "BT /F1 12 Tf 14 TL 72 700 Td [(A)-300(b)] TJ T* (c) ' ET", "q 1 0 0 1 0 0 cm Q"))
	f.Fuzz(func(t *testing.T, data []byte) {
		_, text, err := pdf.Extract(data, 1<<20)
		if err == nil && strings.TrimSpace(text) == "" {
			t.Fatalf("no error and no text")
		}
		docs, skips := walkAll(t, fstest.MapFS{"f.pdf": {Data: data}}, corpus.Options{MaxBytes: 1 << 20})
		checkFuzzResult(t, docs, skips)
		if !slices.ContainsFunc(docs, func(d corpus.Document) bool { return d.ID == "f.pdf" }) && len(skips) == 0 {
			t.Fatalf("f.pdf neither read nor skipped")
		}
	})
}
