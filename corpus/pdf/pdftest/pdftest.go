// Package pdftest builds small PDF files by hand, for tests.
//
// The files follow the layout of ISO 32000-1 section 7.5: a header line, a
// body of numbered indirect objects, a cross-reference table of 20-byte
// entries (section 7.5.4) and a trailer (section 7.5.5). Object 1 is always
// the document catalog.
package pdftest

import (
	"bytes"
	"compress/zlib"
	"fmt"
	"strings"
)

// Build returns a PDF whose objects 1, 2, … are objs (each the text
// between "N 0 obj" and "endobj") and whose trailer dictionary holds /Size,
// /Root 1 0 R and the entries in trailer.
func Build(objs []string, trailer string) []byte {
	var b bytes.Buffer
	b.WriteString("%PDF-1.4\n%\xe2\xe3\xcf\xd3\n") // a comment of high bytes marks binary content (section 7.5.2)
	offsets := make([]int, len(objs))
	for i, o := range objs {
		offsets[i] = b.Len()
		fmt.Fprintf(&b, "%d 0 obj\n%s\nendobj\n", i+1, o)
	}
	xref := b.Len()
	fmt.Fprintf(&b, "xref\n0 %d\n0000000000 65535 f \n", len(objs)+1)
	for _, off := range offsets {
		fmt.Fprintf(&b, "%010d 00000 n \n", off)
	}
	fmt.Fprintf(&b, "trailer\n<< /Size %d /Root 1 0 R %s >>\nstartxref\n%d\n%%%%EOF\n", len(objs)+1, trailer, xref)
	return b.Bytes()
}

// Stream returns a stream object with the dictionary entries dict and the
// data, its /Length set (section 7.3.8).
func Stream(dict, data string) string {
	return fmt.Sprintf("<< /Length %d %s >>\nstream\n%s\nendstream", len(data), dict, data)
}

// Flate returns data compressed for /FlateDecode (section 7.4.4: the zlib
// format).
func Flate(data string) string {
	var b bytes.Buffer
	w := zlib.NewWriter(&b)
	w.Write([]byte(data))
	w.Close()
	return b.String()
}

// Text returns a PDF of pages, each drawn by its content stream, with the
// standard Type 1 font Helvetica (section 9.6.2.2) as /F1 in the
// resources of the page tree's root, and an Info dictionary with /Title
// title when title is not "" (a literal string, written as given).
func Text(title string, contents ...string) []byte {
	return Doc{Title: title, Contents: contents}.Bytes()
}

// Doc describes a PDF for Bytes.
type Doc struct {
	Title    string   // the Info /Title, a literal string as written; "" for none
	Contents []string // one content stream a page
	// Fonts are more entries of the shared /Font dictionary (/F1 is
	// Helvetica), Resources more entries of the resource dictionary, and
	// Objects more objects, numbered from 3 + 2×len(Contents) + 2 on.
	Fonts     string
	Resources string
	Objects   []string
	// Trailer holds more trailer entries.
	Trailer string
	// PageDict holds more entries of every page dictionary.
	PageDict string
}

// FirstExtra returns the object number of the first of Objects.
func (d Doc) FirstExtra() int { return 3 + 2*len(d.Contents) + 2 }

// Bytes builds the file: 1 catalog, 2 page tree, then each page and its
// content stream, then the font, the Info dictionary (or null) and Objects.
func (d Doc) Bytes() []byte {
	n := len(d.Contents)
	font := 3 + 2*n
	info := font + 1
	var kids []string
	objs := []string{"<< /Type /Catalog /Pages 2 0 R >>", ""}
	for i, c := range d.Contents {
		page := 3 + 2*i
		kids = append(kids, fmt.Sprintf("%d 0 R", page))
		objs = append(objs,
			fmt.Sprintf("<< /Type /Page /Parent 2 0 R /MediaBox [0 0 612 792] /Contents %d 0 R %s >>", page+1, d.PageDict),
			Stream("", c))
	}
	objs[1] = fmt.Sprintf("<< /Type /Pages /Kids [%s] /Count %d /Resources << /Font << /F1 %d 0 R %s >> %s >> >>",
		strings.Join(kids, " "), n, font, d.Fonts, d.Resources)
	objs = append(objs, "<< /Type /Font /Subtype /Type1 /BaseFont /Helvetica >>")
	trailer := d.Trailer
	if d.Title != "" {
		objs = append(objs, "<< /Title "+d.Title+" /Producer (pdftest) >>")
		trailer += fmt.Sprintf(" /Info %d 0 R", info)
	} else {
		objs = append(objs, "null")
	}
	objs = append(objs, d.Objects...)
	return Build(objs, trailer)
}
