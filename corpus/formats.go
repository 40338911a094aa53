package corpus

import (
	"crypto/sha256"
	"errors"
	"fmt"
	"path"
	"strings"
)

// reader is how one kind of file becomes documents.
type reader struct {
	// format names the reader in Document.Format.
	format string
	// text is true for formats read as text, which get the binary check
	// before they are read.
	text bool
	// read turns the raw bytes of the file at path p into documents and
	// the skips of parts of it. An error skips the whole file, with the
	// error's text as the reason. Documents need ID, Title, Text and
	// Format; read may leave Size and Hash zero for a document that is the
	// whole file (extract fills them in).
	read func(p string, raw []byte, opts *Options) ([]Document, []Skip, error)
}

// readers maps lower-case extensions to their reader.
var readers = map[string]reader{
	".txt":   {format: "text", text: true, read: readPlain("text")},
	".text":  {format: "text", text: true, read: readPlain("text")},
	".md":    {format: "markdown", text: true, read: readPlain("markdown")},
	".rst":   {format: "rst", text: true, read: readPlain("rst")},
	".eml":   {format: "email", text: true, read: readMail},
	".mbox":  {format: "mbox", text: true, read: readMbox},
	".html":  {format: "html", text: true, read: readHTML},
	".htm":   {format: "html", text: true, read: readHTML},
	".xhtml": {format: "html", text: true, read: readHTML},
	".pdf":   {format: "pdf", read: readPDF},
	".docx":  {format: "docx", read: readDOCX},
	".csv":   {format: "csv", text: true, read: readCSV},
	".tsv":   {format: "tsv", text: true, read: readTSV},
	".jsonl": {format: "jsonl", text: true, read: readJSONL},
}

// errPanic marks a reader that panicked; the file is skipped with the
// panic's message.
var errPanic = errors.New("reader failed")

// extract runs the reader of a file under a recover, so that no panic in a
// parser (ours or a library's) can escape: a panic becomes the file's skip
// reason. It fills in Size and Hash of whole-file documents.
func extract(p string, raw []byte, rd reader, opts *Options) (docs []Document, skips []Skip, err error) {
	defer func() {
		if r := recover(); r != nil {
			docs, skips = nil, nil
			err = fmt.Errorf("%w: %v", errPanic, r)
		}
	}()
	docs, skips, err = rd.read(p, raw, opts)
	if err != nil {
		return nil, skips, err
	}
	for i := range docs {
		d := &docs[i]
		if d.Format == "" {
			d.Format = rd.format
		}
		if d.Size == 0 && d.Hash == ([32]byte{}) {
			d.Size = int64(len(raw))
			d.Hash = sha256.Sum256(raw)
		}
	}
	return docs, skips, nil
}

// readPlain reads .txt, .md and .rst files.
func readPlain(format string) func(p string, raw []byte, _ *Options) ([]Document, []Skip, error) {
	return func(p string, raw []byte, _ *Options) ([]Document, []Skip, error) {
		text, bad, why := decodeText(raw)
		if why != "" {
			return nil, nil, errors.New(why)
		}
		return []Document{{
			ID: p, Title: Title(text, path.Base(p)), Text: text, Repaired: bad, Format: format,
		}}, nil, nil
	}
}

// partID names a document inside the file p.
func partID(p, part string) string {
	return p + "#" + strings.ReplaceAll(part, "#", "%23")
}
