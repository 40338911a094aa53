package corpus

import (
	"errors"
	"fmt"
	"path"

	"assay/corpus/pdf"
)

// readPDF reads a .pdf file through package pdf, which keeps the PDF
// library and its panics behind one function. The title is the Info
// dictionary's /Title, else the title of the text, else the file name.
func readPDF(p string, raw []byte, opts *Options) ([]Document, []Skip, error) {
	title, text, err := pdf.Extract(raw, opts.MaxBytes)
	var bad *pdf.MalformedError
	var big *pdf.SizeError
	switch {
	case errors.Is(err, pdf.ErrNotPDF):
		return nil, nil, errors.New("not a PDF (content does not match the extension)")
	case errors.Is(err, pdf.ErrEncrypted):
		return nil, nil, errors.New("encrypted PDF")
	case errors.Is(err, pdf.ErrNoText):
		return nil, nil, errors.New("no text layer (image-only PDF?)")
	case errors.As(err, &big):
		return nil, nil, fmt.Errorf("larger than the size limit (%s expand beyond %s)", big.What, byteSize(big.Limit))
	case errors.As(err, &bad):
		return nil, nil, bad
	case err != nil:
		return nil, nil, fmt.Errorf("malformed PDF: %v", err)
	}
	text, bad8 := repairUTF8([]byte(text))
	if title != "" {
		title = Title(title, "")
	}
	if title == "" {
		title = Title(text, path.Base(p))
	}
	return []Document{{ID: p, Title: title, Text: text, Repaired: bad8, Format: "pdf"}}, nil, nil
}
