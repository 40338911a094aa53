package corpus

import (
	"bytes"
	"crypto/sha256"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"path"
	"strings"
	"unicode"
	"unicode/utf8"
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
	MaxBytes int64
}

// Document is one document read from the corpus.
type Document struct {
	ID       string   // slash-separated path relative to the root
	Title    string   // first line with text, or the file name
	Text     string   // the whole text, valid UTF-8
	Size     int64    // raw size in bytes
	Hash     [32]byte // SHA-256 of the raw bytes
	Repaired int      // invalid UTF-8 sequences replaced by U+FFFD
}

// Skip records a file that was not read, and why.
type Skip struct {
	Path   string // slash-separated path relative to the root
	Reason string
}

// ErrStop may be returned by a Walk callback to end the walk early
// without an error.
var ErrStop = errors.New("corpus: stop")

var textExtensions = map[string]bool{".txt": true, ".text": true, ".md": true, ".rst": true}

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
	err := fs.WalkDir(fsys, ".", func(p string, d fs.DirEntry, err error) error {
		if err != nil {
			if p == "." {
				return fmt.Errorf("read folder: %w", err)
			}
			skip(p, "unreadable: "+reason(err))
			if d != nil && d.IsDir() {
				return fs.SkipDir
			}
			return nil
		}
		if p == "." {
			return nil
		}
		if strings.HasPrefix(d.Name(), ".") {
			if d.IsDir() {
				return fs.SkipDir
			}
			return nil
		}
		if d.IsDir() {
			return nil
		}
		doc, why := readFile(fsys, p, d, opts)
		if why != "" {
			skip(p, why)
			return nil
		}
		return fn(doc)
	})
	if errors.Is(err, ErrStop) {
		err = nil
	}
	return skips, err
}

// readFile reads one file; a non-empty reason means the file is skipped.
func readFile(fsys fs.FS, p string, d fs.DirEntry, opts Options) (Document, string) {
	ext := strings.ToLower(path.Ext(p))
	if !textExtensions[ext] {
		if d.Type()&fs.ModeSymlink != 0 {
			if info, err := fs.Stat(fsys, p); err == nil && info.IsDir() {
				return Document{}, "symbolic link to a folder (not followed)"
			}
		}
		if ext == "" {
			return Document{}, "unsupported file type (no extension)"
		}
		return Document{}, "unsupported file type (" + ext + ")"
	}
	info, err := fs.Stat(fsys, p) // follows a symbolic link
	if err != nil {
		return Document{}, "unreadable: " + reason(err)
	}
	if info.IsDir() {
		return Document{}, "symbolic link to a folder (not followed)"
	}
	if !info.Mode().IsRegular() {
		return Document{}, "not a regular file (" + info.Mode().Type().String() + ")"
	}
	if info.Size() > opts.MaxBytes {
		return Document{}, fmt.Sprintf("larger than the size limit (%s > %s)", byteSize(info.Size()), byteSize(opts.MaxBytes))
	}
	f, err := fsys.Open(p)
	if err != nil {
		return Document{}, "unreadable: " + reason(err)
	}
	defer f.Close()
	raw, err := io.ReadAll(io.LimitReader(f, opts.MaxBytes+1))
	if err != nil {
		return Document{}, "unreadable: " + reason(err)
	}
	if int64(len(raw)) > opts.MaxBytes {
		return Document{}, fmt.Sprintf("larger than the size limit (more than %s)", byteSize(opts.MaxBytes))
	}
	if len(raw) == 0 {
		return Document{}, "empty file"
	}
	if why := binaryReason(raw); why != "" {
		return Document{}, why
	}
	text, bad := repairUTF8(raw)
	if bad*10 > len(raw) {
		return Document{}, fmt.Sprintf("not UTF-8 text (%d invalid byte sequences in %d bytes)", bad, len(raw))
	}
	// A byte order mark is an encoding signature, not text.
	text = strings.TrimPrefix(text, "\ufeff")
	if strings.TrimSpace(text) == "" {
		return Document{}, "no text (white space only)"
	}
	return Document{
		ID:       p,
		Title:    Title(text, path.Base(p)),
		Text:     text,
		Size:     int64(len(raw)),
		Hash:     sha256.Sum256(raw),
		Repaired: bad,
	}, ""
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
	ctl := 0
	for _, b := range head {
		if b < 0x20 && b != '\t' && b != '\n' && b != '\r' && b != '\f' {
			ctl++
		}
	}
	if ctl*10 > len(head) {
		return "binary file (control characters)"
	}
	return ""
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
			return cutTitle(strings.Join(strings.Fields(t[8:]), " "))
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
	return cutTitle(strings.Join(strings.Fields(first), " "))
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
