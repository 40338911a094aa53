package corpus_test

import (
	"crypto/sha256"
	"errors"
	"fmt"
	"io/fs"
	"slices"
	"strings"
	"testing"
	"testing/fstest"
	"time"
	"unicode/utf8"

	"assay/corpus"
)

// walkAll runs Walk and returns the documents handed to the callback and
// the skips, failing the test on an error.
func walkAll(t *testing.T, fsys fs.FS, opts corpus.Options) ([]corpus.Document, []corpus.Skip) {
	t.Helper()
	var docs []corpus.Document
	skips, err := corpus.Walk(fsys, opts, func(d corpus.Document) error {
		docs = append(docs, d)
		return nil
	})
	if err != nil {
		t.Fatalf("Walk: %v", err)
	}
	return docs, skips
}

func ids(docs []corpus.Document) []string {
	out := make([]string, 0, len(docs))
	for _, d := range docs {
		out = append(out, d.ID)
	}
	return out
}

func skipPaths(skips []corpus.Skip) []string {
	out := make([]string, 0, len(skips))
	for _, s := range skips {
		out = append(out, s.Path)
	}
	return out
}

func file(s string) *fstest.MapFile {
	return &fstest.MapFile{Data: []byte(s), ModTime: time.Unix(0, 0)}
}

// reasonOf returns the skip reason for path p, or "" when p was not skipped.
func reasonOf(skips []corpus.Skip, p string) string {
	for _, s := range skips {
		if s.Path == p {
			return s.Reason
		}
	}
	return ""
}

// TestWalkOrder checks the lexical walk order. io/fs.WalkDir documents it:
// "The files are walked in lexical order", each folder's entries sorted by
// name (byte order) and a folder's contents visited where the folder's name
// sorts. So the folder "a" comes before "a-b.txt" and "a.txt", although the
// full path "a/b/c.md" sorts after them; "B.txt" (0x42) comes before "a"
// (0x61).
func TestWalkOrder(t *testing.T) {
	fsys := fstest.MapFS{
		"b.txt":     file("bravo"),
		"a.txt":     file("alpha"),
		"a-b.txt":   file("alpha bravo"),
		"B.txt":     file("capital bravo"),
		"a/z.txt":   file("zulu"),
		"a/y.rst":   file("yankee"),
		"a/b/c.md":  file("charlie"),
		"a/x.odt":   file("PK"),
		"a/b/a.doc": file("doc"),
	}
	docs, skips := walkAll(t, fsys, corpus.Options{})
	wantDocs := []string{"B.txt", "a/b/c.md", "a/y.rst", "a/z.txt", "a-b.txt", "a.txt", "b.txt"}
	if got := ids(docs); !slices.Equal(got, wantDocs) {
		t.Errorf("documents in order %q, want %q", got, wantDocs)
	}
	wantSkips := []string{"a/b/a.doc", "a/x.odt"}
	if got := skipPaths(skips); !slices.Equal(got, wantSkips) {
		t.Errorf("skips in order %q, want %q", got, wantSkips)
	}
}

// TestWalkHidden checks that hidden files and folders (name starting with
// ".") are skipped silently: not read and not listed (doc.go).
func TestWalkHidden(t *testing.T) {
	fsys := fstest.MapFS{
		".git/HEAD":              file("ref: refs/heads/main"),
		".git/notes.txt":         file("hidden folder text"),
		".hidden.txt":            file("hidden file text"),
		".config/deep/x.md":      file("deeply hidden"),
		"notes/.draft.md":        file("hidden draft"),
		"notes/.cache/draft.txt": file("hidden cache"),
		"notes/visible.md":       file("# Visible"),
	}
	docs, skips := walkAll(t, fsys, corpus.Options{})
	if got, want := ids(docs), []string{"notes/visible.md"}; !slices.Equal(got, want) {
		t.Errorf("documents %q, want %q", got, want)
	}
	if len(skips) != 0 {
		t.Errorf("skips %v, want none: hidden entries are not listed", skips)
	}
}

// TestWalkExtensions checks which extensions are read: .txt, .text, .md and
// .rst in any letter case; anything else is an "unsupported file type"
// (doc.go).
func TestWalkExtensions(t *testing.T) {
	read := []string{"a.txt", "b.TXT", "c.text", "d.Text", "e.md", "f.MD", "g.rst", "h.RsT", "archive.tar.txt"}
	fsys := fstest.MapFS{}
	for _, p := range read {
		fsys[p] = file("some text in " + p)
	}
	skipped := map[string]string{
		"report.odt":  "unsupported file type (.odt)",
		"README":      "unsupported file type (no extension)",
		"notes.txt.7": "unsupported file type (.7)",
		"minutes.doc": "unsupported file type (.doc)",
		// The extension is read in any letter case; these bytes are no zip
		// archive, so the DOCX reader skips the file (docx.go).
		"LETTER.DOCX": "not a DOCX",
	}
	for p := range skipped {
		fsys[p] = file("some text in " + p)
	}
	docs, skips := walkAll(t, fsys, corpus.Options{})
	got := ids(docs)
	slices.Sort(got)
	want := slices.Sorted(slices.Values(read))
	if !slices.Equal(got, want) {
		t.Errorf("read %q, want %q", got, want)
	}
	for p, want := range skipped {
		t.Run(p, func(t *testing.T) {
			if got := reasonOf(skips, p); !strings.HasPrefix(got, want) {
				t.Errorf("skip reason for %s = %q, want %q", p, got, want)
			}
		})
	}
	if len(skips) != len(skipped) {
		t.Errorf("%d skips, want %d: %v", len(skips), len(skipped), skips)
	}
}

// TestWalkSkipReasons checks each documented reason for skipping a text
// file. Each case sits beside a good file, which must still be read.
func TestWalkSkipReasons(t *testing.T) {
	binaryCtl := strings.Repeat("ab\x1b\x07", 8) // 2 control characters in 4 bytes: 50%
	tests := []struct {
		name   string
		data   string
		opts   corpus.Options
		reason string // the reason must contain this
	}{
		{"empty file", "", corpus.Options{}, "empty file"},
		{"white space only", " \n\t\r\n  \f ", corpus.Options{}, "no text (white space only)"},
		{"NUL byte", "flood report\x00\x01\x02", corpus.Options{}, "binary file (contains NUL bytes)"},
		{"UTF-16 text has NUL bytes", "f\x00l\x00o\x00o\x00d\x00", corpus.Options{}, "binary"},
		{"control characters", binaryCtl, corpus.Options{}, "binary file (control characters)"},
		// Latin-1 text: every accented letter is one byte that is not valid
		// UTF-8 (RFC 3629), 4 of 14 bytes here.
		{"mostly invalid UTF-8", "\xc9t\xe9 \xe0 la for\xeat", corpus.Options{}, "not UTF-8 text"},
		// 2 of 10 bytes invalid: more than a tenth.
		{"two tenths invalid UTF-8", "a\xe9bcd\xe9fghi", corpus.Options{}, "not UTF-8 text"},
		{"over the size limit", strings.Repeat("x", 21), corpus.Options{MaxBytes: 20}, "larger than the size limit"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			fsys := fstest.MapFS{
				"bad.txt":  file(tt.data),
				"good.txt": file("Levels normal."), // 14 bytes, under every limit here
			}
			docs, skips := walkAll(t, fsys, tt.opts)
			if got, want := ids(docs), []string{"good.txt"}; !slices.Equal(got, want) {
				t.Errorf("documents %q, want %q", got, want)
			}
			if len(skips) != 1 || skips[0].Path != "bad.txt" || !strings.Contains(skips[0].Reason, tt.reason) {
				t.Errorf("skips %q, want one for bad.txt containing %q", skips, tt.reason)
			}
		})
	}
}

// TestWalkBoundaries checks the edges of the documented limits; each of
// these files must be read. "More than 10%" control characters (doc.go),
// "more than a tenth" invalid bytes (doc.go), "larger than" MaxBytes
// (Options), a NUL byte only counts "in the first 8 KiB" (doc.go).
func TestWalkBoundaries(t *testing.T) {
	tests := []struct {
		name string
		data string
		opts corpus.Options
	}{
		{"exactly 10% control characters", "abcdefghi\x1b", corpus.Options{}},
		{"exactly a tenth invalid UTF-8", "a\xe9bcdefghi", corpus.Options{}},
		{"exactly MaxBytes", strings.Repeat("x", 16), corpus.Options{MaxBytes: 16}},
		{"NUL after the first 8 KiB", strings.Repeat("flood ", 8<<10/6+1) + "\x00", corpus.Options{}},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			docs, skips := walkAll(t, fstest.MapFS{"edge.txt": file(tt.data)}, tt.opts)
			if len(docs) != 1 || len(skips) != 0 {
				t.Errorf("got %d documents and skips %q, want edge.txt read", len(docs), skips)
			}
		})
	}
}

// TestWalkRepairsUTF8 checks that invalid bytes become U+FFFD, counted in
// Repaired, while Size and Hash describe the raw bytes. Each invalid byte
// here is a lone Latin-1 byte (0xE9 "é", 0xFF), one invalid sequence each
// under any decoder (RFC 3629).
func TestWalkRepairsUTF8(t *testing.T) {
	raw := "Caf\xe9 inspection notes for the riverside kiosk\n" +
		"Temperature log \xff checked, fridge seals replaced, all fine.\n"
	docs, skips := walkAll(t, fstest.MapFS{"cafe.txt": file(raw)}, corpus.Options{})
	if len(docs) != 1 {
		t.Fatalf("documents %v, skips %v, want cafe.txt read", ids(docs), skips)
	}
	d := docs[0]
	wantText := strings.NewReplacer("\xe9", "\uFFFD", "\xff", "\uFFFD").Replace(raw)
	if d.Text != wantText {
		t.Errorf("Text = %q, want %q", d.Text, wantText)
	}
	if !utf8.ValidString(d.Text) {
		t.Errorf("Text is not valid UTF-8")
	}
	if d.Repaired != 2 {
		t.Errorf("Repaired = %d, want 2 (bytes 0xE9 and 0xFF)", d.Repaired)
	}
	if d.Size != int64(len(raw)) {
		t.Errorf("Size = %d, want %d (raw bytes, not the repaired text)", d.Size, len(raw))
	}
	if want := sha256.Sum256([]byte(raw)); d.Hash != want {
		t.Errorf("Hash = %x, want SHA-256 of the raw bytes %x", d.Hash, want)
	}
	if d.Title != "Caf\uFFFD inspection notes for the riverside kiosk" {
		t.Errorf("Title = %q", d.Title)
	}
}

// TestWalkDocument checks ID, Text, Size and Hash of a valid document; the
// hash is compared with crypto/sha256 directly.
func TestWalkDocument(t *testing.T) {
	raw := "Sluice gate 3\r\n\r\nThe gate was greased and tested on Tuesday.\r\n"
	docs, _ := walkAll(t, fstest.MapFS{"flood-defence/2026/sluice.TXT": file(raw)}, corpus.Options{})
	if len(docs) != 1 {
		t.Fatalf("got %d documents, want 1", len(docs))
	}
	d := docs[0]
	if d.ID != "flood-defence/2026/sluice.TXT" {
		t.Errorf("ID = %q, want the slash path %q", d.ID, "flood-defence/2026/sluice.TXT")
	}
	if d.Text != raw {
		t.Errorf("Text = %q, want the file's text unchanged", d.Text)
	}
	if d.Size != int64(len(raw)) {
		t.Errorf("Size = %d, want %d", d.Size, len(raw))
	}
	if want := sha256.Sum256([]byte(raw)); d.Hash != want {
		t.Errorf("Hash = %x, want %x", d.Hash, want)
	}
	if d.Repaired != 0 {
		t.Errorf("Repaired = %d, want 0", d.Repaired)
	}
	if d.Title != "Sluice gate 3" {
		t.Errorf("Title = %q, want %q", d.Title, "Sluice gate 3")
	}
}

// TestTitle checks the title rule of doc.go and of Title's doc comment:
// the first line with letters or digits, Markdown heading marks removed,
// the file name when there is none.
func TestTitle(t *testing.T) {
	tests := []struct {
		name, path, data, want string
	}{
		{"first line", "a.txt", "Flood warning\nbody text", "Flood warning"},
		{"leading blank lines", "a.txt", "\n\n   \n\tFlood warning for the lower meadows  \nbody", "Flood warning for the lower meadows"},
		{"markdown heading", "a.md", "# Sandbag depots\n\nThree depots.", "Sandbag depots"},
		{"markdown level 3 heading", "a.md", "###   Opening hours\n", "Opening hours"},
		{"lines without letters or digits are passed", "a.rst", "=====\n-----\n***\n#\nReal title\n=====\n", "Real title"},
		{"digits count as text", "a.txt", "---\n2026\n", "2026"},
		{"non-Latin letters count", "a.txt", "...\nΣτάθμη νερού\n", "Στάθμη νερού"},
		{"fallback to the file name", "notes/marks.txt", "*** --- !!!\n", "marks.txt"},
		{"CRLF line ends", "a.txt", "\r\nGauge readings\r\nmore\r\n", "Gauge readings"},
		{"subject line of a memo", "m.txt", "MEMO\n\nTo: IT group\nFrom: A. Writer\nSubject: Why the backups failed\n\nBody.", "Why the backups failed"},
		{"subject line first, any case", "m.txt", "SUBJECT:   Ferry   times\nbody", "Ferry times"},
		{"empty subject is passed over", "m.txt", "Notice\nSubject:\nbody", "Notice"},
		{"subject after ten lines is not used", "m.txt", strings.Repeat("line\n", 10) + "Subject: late\n", "line"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			docs, skips := walkAll(t, fstest.MapFS{tt.path: file(tt.data)}, corpus.Options{})
			if len(docs) != 1 {
				t.Fatalf("documents %v, skips %v, want %s read", ids(docs), skips, tt.path)
			}
			if docs[0].Title != tt.want {
				t.Errorf("Title = %q, want %q", docs[0].Title, tt.want)
			}
		})
	}
}

// TestTitleByteOrderMark checks a Markdown file saved with a UTF-8 byte
// order mark. U+FEFF at the start of a UTF-8 file is an encoding signature,
// not text (Unicode Standard, section 23.8, from memory), so the heading
// mark after it must still be removed.
func TestTitleByteOrderMark(t *testing.T) {
	docs, _ := walkAll(t, fstest.MapFS{"bom.md": file("\ufeff# Reading groups\n\nSpring list.")}, corpus.Options{})
	if len(docs) != 1 {
		t.Fatalf("got %d documents, want 1", len(docs))
	}
	if got, want := docs[0].Title, "Reading groups"; got != want {
		t.Errorf("Title = %q, want %q (the byte order mark must not hide the heading mark)", got, want)
	}
}

// TestTitleCut checks long titles: at most MaxTitleRunes runes, ending in
// "…", cut at a word boundary when there is one (doc.go, Title's doc).
func TestTitleCut(t *testing.T) {
	words := "Minutes of the joint meeting of the flood committee and the wildlife working group held at the riverside hall on a wet Tuesday"
	cyr := strings.Repeat("вода ", 40) // 200 runes, 360 bytes
	tests := []struct {
		name     string
		text     string
		wordCut  bool // the cut must fall at a word boundary
		wantRune int  // exact rune count wanted, 0 for "at most MaxTitleRunes"
	}{
		{"words", words, true, 0},
		{"cyrillic words", cyr, true, 0},
		{"one long word", strings.Repeat("q", 120), false, corpus.MaxTitleRunes},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			got := corpus.Title(tt.text, "fallback.txt")
			n := utf8.RuneCountInString(got)
			if n > corpus.MaxTitleRunes || (tt.wantRune != 0 && n != tt.wantRune) {
				t.Errorf("Title has %d runes, want at most %d (exactly %d if set): %q", n, corpus.MaxTitleRunes, tt.wantRune, got)
			}
			kept, ok := strings.CutSuffix(got, "…")
			if !ok {
				t.Fatalf("Title %q does not end with an ellipsis", got)
			}
			orig := strings.TrimSpace(tt.text)
			if !strings.HasPrefix(orig, kept) {
				t.Fatalf("Title %q is not a prefix of the line", got)
			}
			if tt.wordCut {
				if next, _ := utf8.DecodeRuneInString(orig[len(kept):]); next != ' ' {
					t.Errorf("Title %q is not cut at a word boundary (next rune %q)", got, next)
				}
			}
		})
	}
	// Short enough titles are not cut; the limit counts runes, not bytes.
	for _, s := range []string{
		strings.Repeat("w", corpus.MaxTitleRunes),
		strings.TrimSpace(strings.Repeat("вода ", 16)), // 79 runes, 143 bytes
	} {
		if got := corpus.Title(s, "x"); got != s {
			t.Errorf("Title(%d runes) = %q, want it unchanged", utf8.RuneCountInString(s), got)
		}
	}
}

// faultFS serves a MapFS through Open and Stat only (no ReadDirFS or
// ReadFileFS, so every read goes through Open), and injects failures.
type faultFS struct {
	m          fstest.MapFS
	openErr    map[string]error // Open fails
	readErr    map[string]error // Read fails after the first readAfter bytes
	readDirErr map[string]error // ReadDir on the folder fails
	statSize   map[string]int64 // Stat reports this size instead
}

const readAfter = 600 // bytes read before an injected Read error

func (f faultFS) Open(name string) (fs.File, error) {
	if err, ok := f.openErr[name]; ok {
		return nil, &fs.PathError{Op: "open", Path: name, Err: err}
	}
	file, err := f.m.Open(name)
	if err != nil {
		return nil, err
	}
	if err, ok := f.readErr[name]; ok {
		return &failingFile{File: file, err: err, left: readAfter}, nil
	}
	if err, ok := f.readDirErr[name]; ok {
		return failingDir{File: file, name: name, err: err}, nil
	}
	return file, nil
}

func (f faultFS) Stat(name string) (fs.FileInfo, error) {
	info, err := f.m.Stat(name)
	if err != nil {
		return nil, err
	}
	if n, ok := f.statSize[name]; ok {
		return sizedInfo{info, n}, nil
	}
	return info, nil
}

type failingFile struct {
	fs.File
	err  error
	left int
}

func (f *failingFile) Read(p []byte) (int, error) {
	if f.left == 0 {
		return 0, &fs.PathError{Op: "read", Path: "x", Err: f.err}
	}
	n, err := f.File.Read(p[:min(len(p), f.left)])
	f.left -= n
	return n, err
}

type failingDir struct {
	fs.File
	name string
	err  error
}

func (d failingDir) ReadDir(int) ([]fs.DirEntry, error) {
	return nil, &fs.PathError{Op: "readdirent", Path: d.name, Err: d.err}
}

type sizedInfo struct {
	fs.FileInfo
	size int64
}

func (i sizedInfo) Size() int64 { return i.size }

var errDisk = errors.New("disk went away")

// TestWalkUnreadable checks files that cannot be opened or read: each is a
// Skip with "unreadable" and the system's reason, and the walk goes on.
// fs.ErrPermission's message is "permission denied" (io/fs).
func TestWalkUnreadable(t *testing.T) {
	long := strings.Repeat("The embankment was inspected. ", 100) // 3000 bytes
	fsys := faultFS{
		m: fstest.MapFS{
			"a.txt":        file("first"),
			"locked.txt":   file("secret"),
			"partial.txt":  file(long),
			"z.txt":        file("last"),
			"sub/open.txt": file("inside"),
		},
		openErr: map[string]error{"locked.txt": fs.ErrPermission},
		readErr: map[string]error{"partial.txt": errDisk},
	}
	docs, skips := walkAll(t, fsys, corpus.Options{})
	if got, want := ids(docs), []string{"a.txt", "sub/open.txt", "z.txt"}; !slices.Equal(got, want) {
		t.Errorf("documents %q, want %q", got, want)
	}
	tests := []struct{ path, words string }{
		{"locked.txt", "permission denied"},
		{"partial.txt", errDisk.Error()},
	}
	for _, tt := range tests {
		t.Run(tt.path, func(t *testing.T) {
			r := reasonOf(skips, tt.path)
			if !strings.Contains(r, "unreadable") || !strings.Contains(r, tt.words) {
				t.Errorf("skip reason for %s = %q, want it to contain %q and %q", tt.path, r, "unreadable", tt.words)
			}
		})
	}
	if len(skips) != 2 {
		t.Errorf("skips %q, want 2", skips)
	}
}

// TestWalkUnreadableStat checks a file whose Stat fails too (fs.Stat falls
// back to Open when the FS has no Stat method).
func TestWalkUnreadableStat(t *testing.T) {
	fsys := openOnly{faultFS{
		m:       fstest.MapFS{"a.txt": file("first"), "locked.md": file("secret")},
		openErr: map[string]error{"locked.md": fs.ErrPermission},
	}}
	docs, skips := walkAll(t, fsys, corpus.Options{})
	if got, want := ids(docs), []string{"a.txt"}; !slices.Equal(got, want) {
		t.Errorf("documents %q, want %q", got, want)
	}
	if r := reasonOf(skips, "locked.md"); !strings.Contains(r, "unreadable") || !strings.Contains(r, "permission denied") {
		t.Errorf("skip reason = %q, want unreadable: permission denied", r)
	}
}

// openOnly hides every method but Open.
type openOnly struct{ f faultFS }

func (o openOnly) Open(name string) (fs.File, error) { return o.f.Open(name) }

// TestWalkFolderUnreadable checks that a folder that cannot be listed is a
// Skip and that its siblings are still read.
func TestWalkFolderUnreadable(t *testing.T) {
	m := fstest.MapFS{
		"a/one.txt":    file("one"),
		"b/two.txt":    file("two"),
		"c/three.txt":  file("three"),
		"d/four.txt":   file("four"),
		"e.txt":        file("five"),
		"b/deep/x.txt": file("hidden by the failure"),
	}
	tests := []struct {
		name string
		fsys faultFS
	}{
		{"ReadDir fails", faultFS{m: m, readDirErr: map[string]error{"b": fs.ErrPermission}}},
		{"Open fails", faultFS{m: m, openErr: map[string]error{"b": fs.ErrPermission}}},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			docs, skips := walkAll(t, tt.fsys, corpus.Options{})
			if got, want := ids(docs), []string{"a/one.txt", "c/three.txt", "d/four.txt", "e.txt"}; !slices.Equal(got, want) {
				t.Errorf("documents %q, want %q", got, want)
			}
			if len(skips) != 1 || skips[0].Path != "b" || !strings.Contains(skips[0].Reason, "permission denied") {
				t.Errorf("skips %q, want one for folder b with permission denied", skips)
			}
		})
	}
}

// TestWalkRootUnreadable checks the one case that is an error: the root
// itself cannot be read (Walk's doc comment).
func TestWalkRootUnreadable(t *testing.T) {
	fsys := faultFS{m: fstest.MapFS{"a.txt": file("x")}, readDirErr: map[string]error{".": fs.ErrPermission}}
	_, err := corpus.Walk(fsys, corpus.Options{}, func(corpus.Document) error { return nil })
	if !errors.Is(err, fs.ErrPermission) {
		t.Errorf("Walk error = %v, want one wrapping fs.ErrPermission", err)
	}
}

// TestWalkSizeLimitWhileReading checks a file that is larger than its Stat
// says (it grew after the listing): the read itself must stop at the limit.
func TestWalkSizeLimitWhileReading(t *testing.T) {
	fsys := faultFS{
		m:        fstest.MapFS{"growing.txt": file(strings.Repeat("x", 100)), "ok.txt": file("fine")},
		statSize: map[string]int64{"growing.txt": 5},
	}
	docs, skips := walkAll(t, fsys, corpus.Options{MaxBytes: 10})
	if got, want := ids(docs), []string{"ok.txt"}; !slices.Equal(got, want) {
		t.Errorf("documents %q, want %q", got, want)
	}
	if r := reasonOf(skips, "growing.txt"); !strings.Contains(r, "larger than the size limit") {
		t.Errorf("skip reason = %q, want larger than the size limit", r)
	}
}

// TestWalkCallbackErrors checks Walk's doc comment: ErrStop ends the walk
// without an error; any other callback error ends it and is returned.
func TestWalkCallbackErrors(t *testing.T) {
	fsys := fstest.MapFS{
		"a.txt": file("alpha"),
		"b.txt": file("bravo"),
		"c.pdf": file("%PDF"),
		"d.txt": file("delta"),
	}
	errBoom := errors.New("index full")
	tests := []struct {
		name    string
		stopAt  string
		ret     error
		wantErr error
	}{
		{"ErrStop", "b.txt", corpus.ErrStop, nil},
		{"wrapped ErrStop", "b.txt", fmt.Errorf("enough: %w", corpus.ErrStop), nil},
		{"other error", "a.txt", errBoom, errBoom},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			var seen []string
			skips, err := corpus.Walk(fsys, corpus.Options{}, func(d corpus.Document) error {
				seen = append(seen, d.ID)
				if d.ID == tt.stopAt {
					return tt.ret
				}
				return nil
			})
			if tt.wantErr == nil && err != nil {
				t.Errorf("Walk error = %v, want nil", err)
			}
			if tt.wantErr != nil && !errors.Is(err, tt.wantErr) {
				t.Errorf("Walk error = %v, want %v", err, tt.wantErr)
			}
			want := []string{"a.txt"}
			if tt.stopAt == "b.txt" {
				want = []string{"a.txt", "b.txt"}
			}
			if !slices.Equal(seen, want) {
				t.Errorf("callback saw %q, want %q: the walk must end at once", seen, want)
			}
			if len(skips) != 0 {
				t.Errorf("skips %q, want none: c.pdf comes after the stop", skips)
			}
		})
	}
}
