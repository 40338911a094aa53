package corpus

import (
	"bytes"
	"crypto/sha256"
	"encoding/csv"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"slices"
	"strconv"
	"strings"
)

// CSV (.csv), TSV (.tsv) and JSON Lines (.jsonl) files hold one document a
// record.
//
// Fields. A record's text is the first column (CSV, TSV: by the header
// line; JSON Lines: by the object's keys) named, without regard to letter
// case, text, body, content, message, description or abstract, in that
// order of preference; its ID is the column id, identifier or key, else
// the record's line number; its title is the column title, subject, name
// or headline, else the title of the text. Options.TextField, IDField and
// TitleField name the column instead (again without regard to case). A
// CSV or TSV file without a text column is skipped whole: "no text column
// (looked for text, body, …; use --text-field)".
//
// Documents. A record's document ID is the file's path, "#" and the ID
// ("data.csv#17"); a repeated ID gets "~2", "~3", … in the order the
// records come. Its Container is the file's path. Its Size and Hash are of
// the record's raw bytes: the line or lines it spans in the file, without
// the final line end.
//
// Bad records. A record that cannot be read (a quoting error, the wrong
// number of fields, invalid JSON, a text field that is missing, empty or
// not a string) is a Skip with the path, ":" and its line number
// ("data.csv:5"), and the other records are still read.
//
// Formats. CSV follows RFC 4180 through encoding/csv: fields quoted with
// '"', quotes doubled inside them, newlines and commas allowed inside
// quotes; a stray quote is an error (LazyQuotes off); every record must
// have as many fields as the header. TSV follows the IANA registration of
// text/tab-separated-values: one record a line, fields split at tabs, no
// quoting, so a '"' is an ordinary character (encoding/csv with LazyQuotes
// would still take a field starting with '"' as quoted and swallow the
// lines after an unbalanced one); blank lines are ignored. JSON Lines has
// one JSON object a line; blank lines are ignored; a number used as an ID
// is kept as written (json.Number: 12.50 stays "12.50"). A UTF-8
// byte order mark before the first line is dropped; invalid UTF-8 is
// replaced by U+FFFD and counted in Document.Repaired.

// Default field names, in order of preference.
var (
	textFieldNames  = []string{"text", "body", "content", "message", "description", "abstract"}
	idFieldNames    = []string{"id", "identifier", "key"}
	titleFieldNames = []string{"title", "subject", "name", "headline"}
)

// errNoTextColumn is the reason for a file whose header has no text column.
var errNoTextColumn = errors.New("no text column (looked for " + strings.Join(textFieldNames, ", ") + "; use --text-field)")

const utf8BOM = "\ufeff"

// fieldPicker chooses a record's fields by name.
type fieldPicker struct {
	text, id, title string // Options overrides; "" for the defaults
}

func newFieldPicker(opts *Options) fieldPicker {
	return fieldPicker{
		text:  strings.TrimSpace(opts.TextField),
		id:    strings.TrimSpace(opts.IDField),
		title: strings.TrimSpace(opts.TitleField),
	}
}

// pick returns the index in names of the field to use: the override if
// set, else the first of the defaults present; -1 if none. Names are
// compared without regard to case, and the first of equal names wins.
func pick(names []string, override string, defaults []string) int {
	find := func(want string) int {
		return slices.IndexFunc(names, func(n string) bool { return strings.EqualFold(strings.TrimSpace(n), want) })
	}
	if override != "" {
		return find(override)
	}
	for _, d := range defaults {
		if i := find(d); i >= 0 {
			return i
		}
	}
	return -1
}

// columns are the header positions of a CSV or TSV file's fields.
type columns struct{ text, id, title int }

func (fp fieldPicker) columns(header []string) (columns, error) {
	c := columns{
		text:  pick(header, fp.text, textFieldNames),
		id:    pick(header, fp.id, idFieldNames),
		title: pick(header, fp.title, titleFieldNames),
	}
	switch {
	case c.text < 0 && fp.text != "":
		return c, fmt.Errorf("no column named %q (from --text-field)", fp.text)
	case c.text < 0:
		return c, errNoTextColumn
	case c.id < 0 && fp.id != "":
		return c, fmt.Errorf("no column named %q (from --id-field)", fp.id)
	case c.title < 0 && fp.title != "":
		return c, fmt.Errorf("no column named %q (from --title-field)", fp.title)
	}
	return c, nil
}

// recordSet builds the documents of one file, keeping IDs unique.
type recordSet struct {
	p, format string
	docs      []Document
	skips     []Skip
	taken     map[string]bool
}

func (rs *recordSet) skip(line int, reason string) {
	rs.skips = append(rs.skips, Skip{Path: rs.p + ":" + strconv.Itoa(line), Reason: reason})
}

// add makes a document of one record: its text, ID and title fields ("" when
// absent), its first line and its raw bytes.
// repaired counts invalid UTF-8 already replaced by the caller.
func (rs *recordSet) add(line int, text, id, title string, raw []byte, repaired int) {
	text, bad := repairUTF8([]byte(text))
	bad += repaired
	if strings.TrimSpace(text) == "" {
		rs.skip(line, "empty text field")
		return
	}
	id = strings.TrimSpace(strings.ToValidUTF8(id, "\uFFFD"))
	if id == "" {
		id = strconv.Itoa(line)
	}
	unique := id
	for n := 2; rs.taken[unique]; n++ {
		unique = id + "~" + strconv.Itoa(n)
	}
	rs.taken[unique] = true
	docID := partID(rs.p, unique)
	t := ""
	if title != "" {
		t = Title(strings.ToValidUTF8(title, "\uFFFD"), "")
	}
	if t == "" {
		t = Title(text, docID)
	}
	raw = bytes.TrimRight(raw, "\r\n")
	rs.docs = append(rs.docs, Document{
		ID: docID, Title: t, Text: text, Size: int64(len(raw)), Hash: sha256.Sum256(raw),
		Repaired: bad, Format: rs.format, Container: rs.p,
	})
}

func newRecordSet(p, format string) *recordSet {
	return &recordSet{p: p, format: format, taken: map[string]bool{}}
}

func field(rec []string, i int) string {
	if i < 0 || i >= len(rec) {
		return ""
	}
	return rec[i]
}

// readCSV reads an RFC 4180 CSV file with a header line.
func readCSV(p string, raw []byte, opts *Options) ([]Document, []Skip, error) {
	base := 0
	if bytes.HasPrefix(raw, []byte(utf8BOM)) {
		base = len(utf8BOM)
	}
	body := raw[base:]
	r := csv.NewReader(bytes.NewReader(body))
	r.ReuseRecord = true
	r.LazyQuotes = false
	r.FieldsPerRecord = 0 // set by the header (encoding/csv: "the number of fields in the first record")
	header, err := r.Read()
	if err == io.EOF {
		return nil, nil, errors.New("no text (white space only)")
	}
	if err != nil {
		return nil, nil, fmt.Errorf("malformed CSV header: %v", err)
	}
	header = slices.Clone(header)
	cols, err := newFieldPicker(opts).columns(header)
	if err != nil {
		return nil, nil, err
	}
	rs := newRecordSet(p, "csv")
	for {
		start := r.InputOffset()
		rec, err := r.Read()
		if err == io.EOF {
			break
		}
		// Blank lines before a record are skipped by encoding/csv but lie
		// inside the offsets.
		rawRec := bytes.TrimLeft(body[start:r.InputOffset()], "\r\n")
		var pe *csv.ParseError
		switch {
		case errors.As(err, &pe) && errors.Is(pe.Err, csv.ErrFieldCount):
			rs.skip(pe.StartLine, fmt.Sprintf("wrong number of fields (%d, the header has %d)", len(rec), len(header)))
			continue
		case errors.As(err, &pe):
			rs.skip(pe.StartLine, "malformed CSV record: "+pe.Err.Error())
			continue
		case err != nil:
			return nil, nil, fmt.Errorf("malformed CSV: %v", err)
		}
		line, _ := r.FieldPos(0)
		if strings.TrimSpace(field(rec, cols.text)) == "" {
			rs.skip(line, fmt.Sprintf("empty text field (column %q)", header[cols.text]))
			continue
		}
		rs.add(line, field(rec, cols.text), field(rec, cols.id), field(rec, cols.title), rawRec, 0)
	}
	return rs.docs, rs.skips, nil
}

// readTSV reads a tab-separated file with a header line.
func readTSV(p string, raw []byte, opts *Options) ([]Document, []Skip, error) {
	raw = bytes.TrimPrefix(raw, []byte(utf8BOM))
	var rs *recordSet
	var header []string
	var cols columns
	lineNo := 0
	for len(raw) > 0 {
		lineNo++
		var line []byte
		if i := bytes.IndexByte(raw, '\n'); i >= 0 {
			line, raw = raw[:i], raw[i+1:]
		} else {
			line, raw = raw, nil
		}
		line = bytes.TrimSuffix(line, []byte("\r"))
		if len(bytes.TrimSpace(line)) == 0 {
			continue
		}
		rec := strings.Split(string(line), "\t")
		if header == nil {
			header = rec
			var err error
			if cols, err = newFieldPicker(opts).columns(header); err != nil {
				return nil, nil, err
			}
			rs = newRecordSet(p, "tsv")
			continue
		}
		if len(rec) != len(header) {
			rs.skip(lineNo, fmt.Sprintf("wrong number of fields (%d, the header has %d)", len(rec), len(header)))
			continue
		}
		if strings.TrimSpace(rec[cols.text]) == "" {
			rs.skip(lineNo, fmt.Sprintf("empty text field (column %q)", header[cols.text]))
			continue
		}
		rs.add(lineNo, rec[cols.text], field(rec, cols.id), field(rec, cols.title), line, 0)
	}
	if rs == nil {
		return nil, nil, errors.New("no text (white space only)")
	}
	return rs.docs, rs.skips, nil
}

// readJSONL reads a JSON Lines file: one JSON object a line.
func readJSONL(p string, raw []byte, opts *Options) ([]Document, []Skip, error) {
	raw = bytes.TrimPrefix(raw, []byte(utf8BOM))
	fp := newFieldPicker(opts)
	rs := newRecordSet(p, "jsonl")
	lineNo := 0
	for len(raw) > 0 {
		lineNo++
		var line []byte
		if i := bytes.IndexByte(raw, '\n'); i >= 0 {
			line, raw = raw[:i], raw[i+1:]
		} else {
			line, raw = raw, nil
		}
		line = bytes.TrimSuffix(line, []byte("\r"))
		if len(bytes.TrimSpace(line)) == 0 {
			continue
		}
		fixed, repaired := repairUTF8(line)
		obj, err := decodeObject(fixed)
		if err != "" {
			rs.skip(lineNo, err)
			continue
		}
		keys := make([]string, 0, len(obj))
		for k := range obj {
			keys = append(keys, k)
		}
		// Exact letter case first, then byte order, so that the choice
		// among keys equal but for case does not depend on map order.
		slices.SortFunc(keys, strings.Compare)
		ti := pickKey(keys, fp.text, textFieldNames)
		if ti < 0 {
			if fp.text != "" {
				rs.skip(lineNo, fmt.Sprintf("no field named %q (from --text-field)", fp.text))
			} else {
				rs.skip(lineNo, "no text field (looked for "+strings.Join(textFieldNames, ", ")+"; use --text-field)")
			}
			continue
		}
		text, ok := obj[keys[ti]].(string)
		if !ok {
			rs.skip(lineNo, fmt.Sprintf("text field %q is not a string (%s)", keys[ti], jsonKind(obj[keys[ti]])))
			continue
		}
		if strings.TrimSpace(text) == "" {
			rs.skip(lineNo, fmt.Sprintf("empty text field (%q)", keys[ti]))
			continue
		}
		id := ""
		if i := pickKey(keys, fp.id, idFieldNames); i >= 0 {
			switch v := obj[keys[i]].(type) {
			case string:
				id = v
			case json.Number:
				id = v.String()
			}
		}
		title := ""
		if i := pickKey(keys, fp.title, titleFieldNames); i >= 0 {
			title, _ = obj[keys[i]].(string)
		}
		rs.add(lineNo, text, id, title, line, repaired)
	}
	return rs.docs, rs.skips, nil
}

// pickKey is pick for sorted JSON keys, preferring a key that matches in
// letter case exactly.
func pickKey(keys []string, override string, defaults []string) int {
	try := func(want string) int {
		if i := slices.Index(keys, want); i >= 0 {
			return i
		}
		return slices.IndexFunc(keys, func(k string) bool { return strings.EqualFold(k, want) })
	}
	if override != "" {
		return try(override)
	}
	for _, d := range defaults {
		if i := try(d); i >= 0 {
			return i
		}
	}
	return -1
}

// decodeObject decodes one line as a JSON object, numbers as json.Number;
// it returns the reason when the line is not one.
func decodeObject(line string) (map[string]any, string) {
	d := json.NewDecoder(strings.NewReader(line))
	d.UseNumber()
	var v any
	if err := d.Decode(&v); err != nil {
		return nil, "invalid JSON: " + err.Error()
	}
	if _, err := d.Token(); err != io.EOF {
		return nil, "invalid JSON: data after the value"
	}
	obj, ok := v.(map[string]any)
	if !ok {
		return nil, "not a JSON object (" + jsonKind(v) + ")"
	}
	return obj, ""
}

func jsonKind(v any) string {
	switch v.(type) {
	case nil:
		return "null"
	case bool:
		return "a boolean"
	case json.Number:
		return "a number"
	case string:
		return "a string"
	case []any:
		return "an array"
	case map[string]any:
		return "an object"
	}
	return fmt.Sprintf("%T", v)
}
