package corpus

import (
	"archive/zip"
	"bytes"
	"encoding/xml"
	"errors"
	"fmt"
	"io"
	"path"
	"strings"
)

// A .docx file is an Office Open XML package (ECMA-376): a zip archive
// whose main part, word/document.xml, holds the text as WordprocessingML.
// What is read:
//
//   - the main part named by the package relationships (_rels/.rels,
//     ECMA-376 Part 2), word/document.xml when there are none;
//   - paragraphs (w:p) as lines, the text runs (w:t) in them joined; tabs
//     (w:tab) as tabs, breaks (w:br, w:cr) as line breaks, non-breaking
//     hyphens as "-";
//   - table rows (w:tr) as lines, their cells (w:tc) separated by tabs and
//     the paragraphs inside a cell by spaces;
//   - the title from docProps/core.xml (dc:title), else the title of the
//     text.
//
// Not read: headers, footers, footnotes, comments, deleted text of tracked
// changes (w:delText) and field instructions (w:instrText).
//
// Limits: at most maxZipEntries entries; the parts read may together
// expand to at most Options.MaxBytes, checked against each entry's
// declared size before it is opened and again while it is read, since the
// declared size may lie.

// maxZipEntries bounds the entries of a DOCX archive; documents have tens
// of parts, a few hundred with many images.
const maxZipEntries = 10000

// oleSignature starts an OLE compound file: a legacy .doc, or an encrypted
// Office Open XML document, which is stored inside one ([MS-CFB] and
// [MS-OFFCRYPTO], from memory).
var oleSignature = []byte{0xD0, 0xCF, 0x11, 0xE0, 0xA1, 0xB1, 0x1A, 0xE1}

// WordprocessingML namespaces: transitional (ECMA-376 Part 1) and strict
// (ECMA-376 Part 1, strict conformance).
const (
	nsWordTransitional = "http://schemas.openxmlformats.org/wordprocessingml/2006/main"
	nsWordStrict       = "http://purl.oclc.org/ooxml/wordprocessingml/main"
	nsDC               = "http://purl.org/dc/elements/1.1/"
	relOfficeDocument  = "/officeDocument" // the end of the relationship type (ECMA-376 Part 2)
)

// errPartTooLarge marks a zip part that expands beyond what is left of
// MaxBytes.
var errPartTooLarge = errors.New("part too large")

func readDOCX(p string, raw []byte, opts *Options) ([]Document, []Skip, error) {
	if bytes.HasPrefix(raw, oleSignature) {
		return nil, nil, errors.New("encrypted or legacy Office file")
	}
	zr, err := zip.NewReader(bytes.NewReader(raw), int64(len(raw)))
	if err != nil {
		return nil, nil, fmt.Errorf("not a DOCX: not a zip archive (%v)", err)
	}
	if len(zr.File) > maxZipEntries {
		return nil, nil, fmt.Errorf("not a DOCX: more than %d zip entries", maxZipEntries)
	}
	pk := &zipPackage{files: zr.File, left: opts.MaxBytes, limit: opts.MaxBytes}
	main := pk.mainPart()
	f := pk.find(main)
	if f == nil {
		return nil, nil, fmt.Errorf("not a DOCX: no %s in the archive", main)
	}
	text, err := pk.read(f, wordText)
	if err != nil {
		return nil, nil, err
	}
	if strings.TrimSpace(text) == "" {
		return nil, nil, errors.New("no text (white space only)")
	}
	title := ""
	if core := pk.find("docProps/core.xml"); core != nil {
		if t, err := pk.read(core, coreTitle); err == nil && t != "" {
			title = Title(t, "")
		}
	}
	if title == "" {
		title = Title(text, path.Base(p))
	}
	return []Document{{ID: p, Title: title, Text: text, Format: "docx"}}, nil, nil
}

// zipPackage reads parts of an Office Open XML package within a budget of
// uncompressed bytes.
type zipPackage struct {
	files       []*zip.File
	left, limit int64
}

// find returns the part named name, compared without regard to ASCII
// letter case as ECMA-376 Part 2 compares part names; nil if absent.
func (pk *zipPackage) find(name string) *zip.File {
	name = strings.TrimPrefix(name, "/")
	for _, f := range pk.files {
		if strings.EqualFold(f.Name, name) {
			return f
		}
	}
	return nil
}

// mainPart returns the name of the main document part: the target of the
// officeDocument relationship in _rels/.rels, else word/document.xml.
func (pk *zipPackage) mainPart() string {
	const fallback = "word/document.xml"
	rels := pk.find("_rels/.rels")
	if rels == nil {
		return fallback
	}
	target, err := pk.read(rels, func(d *xml.Decoder) (string, error) {
		for {
			tok, err := d.Token()
			if err != nil {
				return "", err
			}
			if se, ok := tok.(xml.StartElement); ok && se.Name.Local == "Relationship" {
				var typ, tgt, mode string
				for _, a := range se.Attr {
					switch a.Name.Local {
					case "Type":
						typ = a.Value
					case "Target":
						tgt = a.Value
					case "TargetMode":
						mode = a.Value
					}
				}
				if strings.HasSuffix(typ, relOfficeDocument) && mode != "External" && tgt != "" {
					return tgt, nil
				}
			}
		}
	})
	if err != nil || target == "" {
		return fallback
	}
	// Targets are relative to the package root for _rels/.rels.
	return path.Clean("/" + target)[1:]
}

// read decodes the XML part f with fn, charging its uncompressed size to
// the budget.
func (pk *zipPackage) read(f *zip.File, fn func(*xml.Decoder) (string, error)) (string, error) {
	if f.UncompressedSize64 > uint64(pk.left) {
		return "", fmt.Errorf("larger than the size limit (%s expands to %s, more than %s)", f.Name, byteSize(int64(min(f.UncompressedSize64, 1<<62))), byteSize(pk.limit))
	}
	rc, err := f.Open()
	if err != nil {
		return "", fmt.Errorf("malformed DOCX: %s: %v", f.Name, err)
	}
	defer rc.Close()
	cr := &cappedReader{r: rc, left: pk.left}
	d := xml.NewDecoder(cr)
	s, err := fn(d)
	pk.left = cr.left
	switch {
	case errors.Is(err, errPartTooLarge):
		return "", fmt.Errorf("larger than the size limit (%s expands beyond %s)", f.Name, byteSize(pk.limit))
	case errors.Is(err, zip.ErrFormat), errors.Is(err, zip.ErrChecksum):
		// archive/zip stops at the declared size with ErrFormat.
		return "", fmt.Errorf("malformed DOCX: %s: the data is longer than its declared size, or damaged", f.Name)
	case err != nil:
		return "", fmt.Errorf("malformed DOCX: %s: %v", f.Name, err)
	}
	return s, nil
}

// cappedReader fails with errPartTooLarge once more than left bytes are
// read.
type cappedReader struct {
	r    io.Reader
	left int64
}

func (c *cappedReader) Read(p []byte) (int, error) {
	if c.left <= 0 {
		// One byte more tells a part that ends exactly at the limit from
		// one that goes on.
		var one [1]byte
		n, err := c.r.Read(one[:])
		if n > 0 {
			return 0, errPartTooLarge
		}
		if err == nil {
			err = io.ErrNoProgress
		}
		return 0, err
	}
	if int64(len(p)) > c.left {
		p = p[:c.left]
	}
	n, err := c.r.Read(p)
	c.left -= int64(n)
	return n, err
}

func isWordNS(space string) bool { return space == nsWordTransitional || space == nsWordStrict }

// wordText returns the text of a WordprocessingML main part (ECMA-376
// Part 1, section 17): one line per paragraph outside tables, one line per
// table row.
func wordText(d *xml.Decoder) (string, error) {
	var (
		out   strings.Builder
		line  strings.Builder    // the paragraph being read outside tables
		cells []*strings.Builder // the open table cells, innermost last
		rows  [][]string         // the open table rows, innermost last
		inT   int                // depth of open w:t elements
	)
	sink := func() *strings.Builder {
		if len(cells) > 0 {
			return cells[len(cells)-1]
		}
		return &line
	}
	// space adds a separator to a cell unless it ends with one already.
	space := func(b *strings.Builder) {
		if s := b.String(); s != "" && !strings.HasSuffix(s, " ") {
			b.WriteByte(' ')
		}
	}
	emit := func(s string) {
		if s = strings.TrimRight(s, " \t"); strings.TrimSpace(s) != "" {
			out.WriteString(s)
			out.WriteByte('\n')
		}
	}
	for {
		tok, err := d.Token()
		if err == io.EOF {
			break
		}
		if err != nil {
			return "", err
		}
		switch t := tok.(type) {
		case xml.StartElement:
			if !isWordNS(t.Name.Space) {
				continue
			}
			switch t.Name.Local {
			case "t":
				inT++
			case "tab":
				if len(cells) > 0 {
					space(sink())
				} else {
					line.WriteByte('\t')
				}
			case "br", "cr":
				if len(cells) > 0 {
					space(sink())
				} else {
					emit(line.String())
					line.Reset()
				}
			case "noBreakHyphen":
				sink().WriteByte('-')
			case "tr":
				rows = append(rows, nil)
			case "tc":
				cells = append(cells, &strings.Builder{})
			}
		case xml.EndElement:
			if !isWordNS(t.Name.Space) {
				continue
			}
			switch t.Name.Local {
			case "t":
				inT = max(inT-1, 0)
			case "p":
				if len(cells) > 0 {
					space(sink())
				} else {
					emit(line.String())
					line.Reset()
				}
			case "tc":
				if len(cells) == 0 {
					continue
				}
				c := strings.Join(strings.Fields(cells[len(cells)-1].String()), " ")
				cells = cells[:len(cells)-1]
				if len(rows) > 0 {
					rows[len(rows)-1] = append(rows[len(rows)-1], c)
				}
			case "tr":
				if len(rows) == 0 {
					continue
				}
				r := strings.Join(rows[len(rows)-1], "\t")
				rows = rows[:len(rows)-1]
				if len(cells) > 0 { // a table inside a cell
					space(sink())
					sink().WriteString(strings.ReplaceAll(r, "\t", " "))
				} else {
					emit(r)
				}
			}
		case xml.CharData:
			if inT > 0 {
				sink().Write(t)
			}
		}
	}
	emit(line.String())
	return out.String(), nil
}

// coreTitle returns dc:title of a core properties part (ECMA-376 Part 2,
// section 11), white space collapsed.
func coreTitle(d *xml.Decoder) (string, error) {
	for {
		tok, err := d.Token()
		if err != nil {
			return "", err
		}
		if se, ok := tok.(xml.StartElement); ok && se.Name.Space == nsDC && se.Name.Local == "title" {
			var s string
			if err := d.DecodeElement(&s, &se); err != nil {
				return "", err
			}
			return strings.Join(strings.Fields(s), " "), nil
		}
	}
}
