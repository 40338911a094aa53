package corpus

import (
	"bytes"
	"encoding/binary"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"math/bits"
	"path"
	"strings"
	"unicode"
	"unicode/utf8"
	"unsafe"
)

// DefaultMaxBytes is the default size limit for one file: 20 MiB.
const DefaultMaxBytes = 20 << 20

// MaxTitleRunes is the longest title kept, in runes, before it is cut.
const MaxTitleRunes = 80

// sniffBytes is how much of a file is examined for binary content.
const sniffBytes = 8 << 10

// Options configures [Walk]. The zero value is the documented default.
type Options struct {
	// MaxBytes is the size limit for one file; 0 means DefaultMaxBytes.
	// No reader takes more than this from one file, including what it
	// decompresses or decodes from it.
	MaxBytes int64
	// Include, when not empty, keeps only files whose slash path or base
	// name matches one of these path.Match patterns; Exclude drops files
	// (and folders) that match one. Files left out this way are not listed
	// as skipped.
	Include, Exclude []string
	// KeepQuoted keeps quoted reply lines, reply and forward headers and
	// signatures in e-mail bodies; by default they are removed.
	KeepQuoted bool
	// NoAttachments turns off reading e-mail attachments as documents.
	NoAttachments bool
	// TextField, IDField and TitleField name the CSV/TSV column or JSON
	// Lines field holding a record's text, ID and title; "" means the
	// documented defaults (see records.go).
	TextField, IDField, TitleField string
}

// Document is one document read from the corpus.
type Document struct {
	// ID is the slash-separated path relative to the root; a document
	// inside a file adds "#" and its place: "box.mbox#3" (third message),
	// "msg.eml#report.pdf" (an attachment), "data.csv#17" (a record, by
	// its ID field or line number).
	ID string
	// Title is the document's title (see the package documentation).
	Title string
	// Text is the whole text, valid UTF-8.
	Text string
	// Size is the raw size in bytes of the document (of its part of the
	// file for documents inside one).
	Size int64
	// Hash is the SHA-256 of those raw bytes.
	Hash [32]byte
	// Repaired counts invalid UTF-8 sequences replaced by U+FFFD.
	Repaired int
	// Format names the reader: "text", "markdown", "rst", "email", "mbox",
	// "html", "pdf", "docx", "csv", "tsv", "jsonl".
	Format string
	// Container is the ID of the file a document inside one came from
	// ("" for a document that is a whole file).
	Container string
	// Meta holds the e-mail headers of messages (empty otherwise).
	Meta Meta
}

// Meta holds e-mail headers, decoded to UTF-8.
type Meta struct {
	From, To, Cc, Date, MessageID string
}

// Skip records a file, or a part of one, that was not read, and why.
type Skip struct {
	// Path is the slash path relative to the root, with ":line" for a
	// record of a CSV/TSV/JSON Lines file or "#part" for a part of a
	// message or mailbox.
	Path   string
	Reason string
}

// ErrStop may be returned by a Walk callback to end the walk early
// without an error.
var ErrStop = errors.New("corpus: stop")

// Walk reads every supported file below the root of fsys in lexical order
// and calls fn with each document. It returns the files it skipped, in walk
// order. It returns an error only when the root itself cannot be read or
// when fn returns one (other than [ErrStop]); a file that cannot be read is
// a Skip, not an error.
func Walk(fsys fs.FS, opts Options, fn func(Document) error) ([]Skip, error) {
	if opts.MaxBytes <= 0 {
		opts.MaxBytes = DefaultMaxBytes
	}
	var skips []Skip
	skip := func(p, reason string) { skips = append(skips, Skip{Path: p, Reason: reason}) }
	err := WalkFiles(fsys, opts, func(s Skip) error { skips = append(skips, s); return nil }, func(p string, d fs.DirEntry) error {
		raw, rd, why := readFile(fsys, p, d, opts)
		if why != "" {
			skip(p, why)
			return nil
		}
		docs, inner, err := extract(p, raw, rd, &opts)
		skips = append(skips, inner...)
		if err != nil {
			skip(p, err.Error())
			return nil
		}
		if len(docs) == 0 && len(inner) == 0 {
			skip(p, "no documents in the file")
		}
		for _, doc := range docs {
			if err := fn(doc); err != nil {
				return err
			}
		}
		return nil
	})
	if errors.Is(err, ErrStop) {
		err = nil
	}
	return skips, err
}

// WalkFiles walks fsys in lexical order as every reader of a folder does:
// names starting with "." are left out (folders with all they hold), and
// so are paths or names matching opts.Exclude; with opts.Include set, only
// files matching one of its patterns are kept. It calls file for each
// entry kept that is not a folder, and unreadable with a Skip ("unreadable:
// …") for each entry that could not be read (a folder among them is not
// entered). An error from either stops the walk and is returned as it is;
// a root that cannot be read gives "read folder: …".
func WalkFiles(fsys fs.FS, opts Options, unreadable func(Skip) error, file func(p string, d fs.DirEntry) error) error {
	return fs.WalkDir(fsys, ".", func(p string, d fs.DirEntry, err error) error {
		if err != nil {
			if p == "." {
				return fmt.Errorf("read folder: %w", err)
			}
			if err := unreadable(Skip{Path: p, Reason: "unreadable: " + reason(err)}); err != nil {
				return err
			}
			if d != nil && d.IsDir() {
				return fs.SkipDir
			}
			return nil
		}
		if p == "." {
			return nil
		}
		if strings.HasPrefix(d.Name(), ".") || excluded(p, d.Name(), opts.Exclude) {
			if d.IsDir() {
				return fs.SkipDir
			}
			return nil
		}
		if d.IsDir() || (len(opts.Include) > 0 && !excluded(p, d.Name(), opts.Include)) {
			return nil
		}
		return file(p, d)
	})
}

// readFile reads one file whole, bounded by MaxBytes; a non-empty reason
// means the file is skipped. It returns the reader chosen by the extension.
func readFile(fsys fs.FS, p string, d fs.DirEntry, opts Options) ([]byte, reader, string) {
	ext := strings.ToLower(path.Ext(p))
	rd, ok := readers[ext]
	if !ok {
		if d.Type()&fs.ModeSymlink != 0 {
			if info, err := fs.Stat(fsys, p); err == nil && info.IsDir() {
				return nil, reader{}, "symbolic link to a folder (not followed)"
			}
		}
		if ext == "" {
			return nil, reader{}, "unsupported file type (no extension)"
		}
		return nil, reader{}, "unsupported file type (" + ext + ")"
	}
	info, err := fs.Stat(fsys, p) // follows a symbolic link
	if err != nil {
		return nil, reader{}, "unreadable: " + reason(err)
	}
	if info.IsDir() {
		return nil, reader{}, "symbolic link to a folder (not followed)"
	}
	if !info.Mode().IsRegular() {
		return nil, reader{}, "not a regular file (" + info.Mode().Type().String() + ")"
	}
	if info.Size() > opts.MaxBytes {
		return nil, reader{}, fmt.Sprintf("larger than the size limit (%s > %s)", byteSize(info.Size()), byteSize(opts.MaxBytes))
	}
	f, err := fsys.Open(p)
	if err != nil {
		return nil, reader{}, "unreadable: " + reason(err)
	}
	defer f.Close()
	raw, err := io.ReadAll(io.LimitReader(f, opts.MaxBytes+1))
	if err != nil {
		return nil, reader{}, "unreadable: " + reason(err)
	}
	if int64(len(raw)) > opts.MaxBytes {
		return nil, reader{}, fmt.Sprintf("larger than the size limit (more than %s)", byteSize(opts.MaxBytes))
	}
	if len(raw) == 0 {
		return nil, reader{}, "empty file"
	}
	if rd.text {
		if why := binaryReason(raw); why != "" {
			return nil, reader{}, why
		}
	}
	return raw, rd, ""
}

// decodeText turns raw bytes of a text file into valid UTF-8 (dropping a
// byte order mark), or gives the reason it is not text.
//
// When raw is valid UTF-8 the text is raw itself, not a copy (the bytes
// of the text files are most of what an ingest allocates: the copy was
// 2.4% of the CPU time of bench/ingestpipe on 100,000 generated files),
// so raw must not change afterwards. The readers never change it: it is a
// file's bytes, or a message part's, read or decoded for this call.
func decodeText(raw []byte) (text string, repaired int, why string) {
	bad := 0
	if utf8.Valid(raw) {
		text = unsafe.String(unsafe.SliceData(raw), len(raw))
	} else {
		text, bad = repairUTF8(raw)
	}
	if bad*10 > len(raw) {
		return "", 0, fmt.Sprintf("not UTF-8 text (%d invalid byte sequences in %d bytes)", bad, len(raw))
	}
	// A byte order mark is an encoding signature, not text.
	text = strings.TrimPrefix(text, "\ufeff")
	if strings.TrimSpace(text) == "" {
		return "", 0, "no text (white space only)"
	}
	return text, bad, ""
}

// excluded reports whether the slash path p or its base name matches one
// of the patterns (path.Match syntax; a bad pattern matches nothing).
func excluded(p, name string, patterns []string) bool {
	for _, pat := range patterns {
		if ok, _ := path.Match(pat, p); ok {
			return true
		}
		if ok, _ := path.Match(pat, name); ok {
			return true
		}
	}
	return false
}

// reason gives the innermost message of a path error, without the path,
// which the caller reports beside it.
func reason(err error) string {
	var pe *fs.PathError
	if errors.As(err, &pe) {
		return pe.Err.Error()
	}
	return err.Error()
}

// binaryReason reports why raw looks binary, or "".
func binaryReason(raw []byte) string {
	head := raw[:min(len(raw), sniffBytes)]
	if bytes.IndexByte(head, 0) >= 0 {
		return "binary file (contains NUL bytes)"
	}
	if controlBytes(head)*10 > len(head) {
		return "binary file (control characters)"
	}
	return ""
}

// controlBytes counts the bytes of b below 0x20 other than tab, line
// feed, form feed and carriage return: eight bytes at a time, by sums
// that never carry from one byte into the next (the high bits are
// cleared first and tested apart), and the last few one at a time.
func controlBytes(b []byte) int {
	const ones, high, low7 = 0x0101010101010101, 0x8080808080808080, 0x7f7f7f7f7f7f7f7f
	// zero has the high bit of each zero byte of x set.
	zero := func(x uint64) uint64 { return ^((x&low7 + low7) | x) & high }
	n, i := 0, 0
	for ; i+8 <= len(b); i += 8 {
		w := binary.LittleEndian.Uint64(b[i:])
		below := ^(w&low7 + ones*(0x80-0x20)) &^ w & high // bytes < 0x20
		if below == 0 {
			continue
		}
		allowed := zero(w^ones*'\t') | zero(w^ones*'\n') | zero(w^ones*'\f') | zero(w^ones*'\r')
		n += bits.OnesCount64(below &^ allowed)
	}
	for _, c := range b[i:] {
		if c < 0x20 && c != '\t' && c != '\n' && c != '\r' && c != '\f' {
			n++
		}
	}
	return n
}

// repairUTF8 returns raw as a string with every invalid UTF-8 sequence
// replaced by U+FFFD, and the number of replacements.
func repairUTF8(raw []byte) (string, int) {
	if utf8.Valid(raw) {
		return string(raw), 0
	}
	var b strings.Builder
	b.Grow(len(raw) + 16)
	bad := 0
	for len(raw) > 0 {
		r, size := utf8.DecodeRune(raw)
		if r == utf8.RuneError && size == 1 {
			bad++
			b.WriteRune(utf8.RuneError)
		} else {
			b.Write(raw[:size])
		}
		raw = raw[size:]
	}
	return b.String(), bad
}

// subjectLines is how many lines with text [Title] searches for a
// "Subject:" line.
const subjectLines = 10

// Title returns the title of text: the rest of a "Subject:" line (any
// letter case) among the first ten lines with text, as memos and saved
// messages carry one; otherwise the first line with letters or digits on
// it, Markdown heading marks removed. The title is cut to MaxTitleRunes at
// a word boundary with an ellipsis; fallback is returned when there is no
// such line.
func Title(text, fallback string) string {
	first := ""
	seen := 0
	for line := range strings.Lines(text) {
		t := strings.TrimSpace(line)
		if !hasText(t) {
			continue
		}
		if len(t) > 8 && strings.EqualFold(t[:8], "subject:") && hasText(t[8:]) {
			return titleOf(t[8:])
		}
		if first == "" {
			if h := strings.TrimSpace(strings.TrimLeft(t, "#")); hasText(h) {
				first = h
			}
		}
		if seen++; seen >= subjectLines {
			break
		}
	}
	if first == "" {
		return fallback
	}
	return titleOf(first)
}

// titleOf returns the title made of the line s: its runs of white space
// made one space, cut by cutTitle. Only the start of s that can reach the
// title is read: once it holds MaxTitleRunes+1 runes that are not white
// space, the joined text is longer than a title, and its first
// MaxTitleRunes runes are those of the whole line joined. A document that
// is one long line would otherwise be split into all its words.
func titleOf(s string) string {
	n := 0
	for i, r := range s {
		if !unicode.IsSpace(r) {
			if n++; n > MaxTitleRunes+1 {
				s = s[:i]
				break
			}
		}
	}
	if plainLine(s) {
		return cutTitle(s) // most titles: no allocation
	}
	return cutTitle(strings.Join(strings.Fields(s), " "))
}

// plainLine reports whether s is ASCII without control characters, with
// single spaces between its words and none at either end: then s is its
// own strings.Join(strings.Fields(s), " ").
func plainLine(s string) bool {
	if s == "" || s[0] == ' ' || s[len(s)-1] == ' ' {
		return false
	}
	for i := 0; i < len(s); i++ {
		if c := s[i]; c >= utf8.RuneSelf || c < ' ' || c == 0x7f || (c == ' ' && s[i+1] == ' ') {
			return false
		}
	}
	return true
}

func hasText(s string) bool {
	return strings.ContainsFunc(s, func(r rune) bool { return unicode.IsLetter(r) || unicode.IsDigit(r) })
}

// cutTitle cuts t to at most MaxTitleRunes runes, the last an ellipsis,
// at the last space in the second half of the allowed length if there is
// one.
func cutTitle(t string) string {
	if utf8.RuneCountInString(t) <= MaxTitleRunes {
		return t
	}
	runes := []rune(t)[:MaxTitleRunes-1]
	for i := len(runes) - 1; i > MaxTitleRunes/2; i-- {
		if runes[i] == ' ' {
			return strings.TrimRight(string(runes[:i]), " ,;:-") + "…"
		}
	}
	return string(runes) + "…"
}

// byteSize formats n bytes for people: "512 B", "3.4 KiB", "20.0 MiB".
func byteSize(n int64) string {
	switch {
	case n < 1<<10:
		return fmt.Sprintf("%d B", n)
	case n < 1<<20:
		return fmt.Sprintf("%.1f KiB", float64(n)/(1<<10))
	case n < 1<<30:
		return fmt.Sprintf("%.1f MiB", float64(n)/(1<<20))
	default:
		return fmt.Sprintf("%.1f GiB", float64(n)/(1<<30))
	}
}
