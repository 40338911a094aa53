package corpus_test

import (
	"crypto/sha256"
	"slices"
	"strings"
	"testing"
	"testing/fstest"

	"assay/corpus"
)

// recordsCSV has, after a UTF-8 byte order mark and the header (line 1):
// a quoted field with a comma (line 2); a quoted field with a line break,
// lines 3–4 (RFC 4180 section 2, rules 5 and 6); a bare quote in an
// unquoted field on line 5, an error under RFC 4180 section 2 rule 5
// ("If fields are not enclosed with double quotes, then double quotes may
// not appear inside the fields"); a repeated ID (line 6); too few fields
// (line 7, rule 4: each line should contain the same number of fields); no
// ID (line 8); an empty text (line 9); a doubled quote inside quotes
// (line 10, rule 7).
const recordsCSV = "\ufeffid,title,text,extra\r\n" +
	"a1,Pump test,\"The pump ran for six hours, no faults.\",x\r\n" +
	"a2,,\"Two lines\r\nof notes\",y\r\n" +
	"a3,Bad,He said \"stop\" twice,z\r\n" +
	"a1,Repeat,Same id again,w\r\n" +
	"a4,Short\r\n" +
	",No id,Text without an id,v\r\n" +
	"a5,Empty,,u\r\n" +
	"a6,Quotes,\"The \"\"east\"\" sluice\",t\r\n"

// TestCSV checks documents and skips of recordsCSV through Walk.
func TestCSV(t *testing.T) {
	docs, skips := walkAll(t, fstest.MapFS{"data.csv": file(recordsCSV)}, corpus.Options{})
	type want struct{ id, title, text string }
	wants := []want{
		{"data.csv#a1", "Pump test", "The pump ran for six hours, no faults."},
		// Title from the text. encoding/csv turns the CRLF inside quotes into
		// "\n" (its documentation: "carriage returns before newline
		// characters are silently removed").
		{"data.csv#a2", "Two lines", "Two lines\nof notes"},
		{"data.csv#a1~2", "Repeat", "Same id again"},
		{"data.csv#8", "No id", "Text without an id"}, // the line number
		{"data.csv#a6", "Quotes", `The "east" sluice`},
	}
	if len(docs) != len(wants) {
		t.Fatalf("documents %q, want %d", ids(docs), len(wants))
	}
	for i, w := range wants {
		d := docs[i]
		if d.ID != w.id || d.Title != w.title || d.Text != w.text {
			t.Errorf("document %d = %q, %q, %q; want %q, %q, %q", i, d.ID, d.Title, d.Text, w.id, w.title, w.text)
		}
		if d.Format != "csv" || d.Container != "data.csv" {
			t.Errorf("%s: Format %q, Container %q", d.ID, d.Format, d.Container)
		}
	}
	// Size and Hash are of the record's lines in the file, without the
	// final line end (records.go).
	raw := "a2,,\"Two lines\r\nof notes\",y"
	if d := docs[1]; d.Size != int64(len(raw)) || d.Hash != sha256.Sum256([]byte(raw)) {
		t.Errorf("a2: Size %d, Hash %x; want %d and the SHA-256 of %q", d.Size, d.Hash, len(raw), raw)
	}
	wantSkips := map[string]string{
		"data.csv:5": `bare " in non-quoted-field`, // encoding/csv's ErrBareQuote text
		"data.csv:7": "wrong number of fields (2, the header has 4)",
		"data.csv:9": `empty text field (column "text")`,
	}
	if got := skipPaths(skips); !slices.Equal(got, []string{"data.csv:5", "data.csv:7", "data.csv:9"}) {
		t.Errorf("skips %q", skips)
	}
	for p, reason := range wantSkips {
		if r := reasonOf(skips, p); !strings.Contains(r, reason) {
			t.Errorf("skip reason for %s = %q, want it to contain %q", p, r, reason)
		}
	}
}

// TestRecordFields checks the choice of the text, ID and title fields:
// the defaults in their order of preference, case-insensitive names, the
// options, and a file without a text column (records.go).
func TestRecordFields(t *testing.T) {
	const noText = "no text column (looked for text, body, content, message, description, abstract; use --text-field)"
	tests := []struct {
		name, data string
		opts       corpus.Options
		ids        []string
		titles     []string
		texts      []string
		fileSkip   string
	}{
		{"body before description", "Description,BODY,Key\nshort,long words,k1\n", corpus.Options{},
			[]string{"f.csv#k1"}, []string{"long words"}, []string{"long words"}, ""},
		{"identifier and headline", "headline,identifier,message\nTide table,T-9,High water at six\n", corpus.Options{},
			[]string{"f.csv#T-9"}, []string{"Tide table"}, []string{"High water at six"}, ""},
		{"no text column", "id,name,notes\n1,Weir,Checked\n", corpus.Options{}, nil, nil, nil, noText},
		{"--text-field names it", "id,name,notes\n1,Weir,Checked\n", corpus.Options{TextField: "NOTES"},
			[]string{"f.csv#1"}, []string{"Weir"}, []string{"Checked"}, ""},
		{"--text-field names no column", "id,notes\n1,Checked\n", corpus.Options{TextField: "remarks"}, nil, nil, nil,
			`no column named "remarks" (from --text-field)`},
		{"--id-field and --title-field", "code,label,text\nC7,Seventh,Gauge seven\n", corpus.Options{IDField: "Code", TitleField: "label"},
			[]string{"f.csv#C7"}, []string{"Seventh"}, []string{"Gauge seven"}, ""},
		{"a # in the ID", "id,text\nbox#2,Inside\n", corpus.Options{},
			[]string{"f.csv#box%232"}, []string{"Inside"}, []string{"Inside"}, ""},
		{"invalid UTF-8 is repaired", "id,text\n1,Caf\xe9 notes\n", corpus.Options{},
			[]string{"f.csv#1"}, []string{"Caf\ufffd notes"}, []string{"Caf\ufffd notes"}, ""},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			docs, skips := walkAll(t, fstest.MapFS{"f.csv": file(tt.data)}, tt.opts)
			if tt.fileSkip != "" {
				if len(docs) != 0 || reasonOf(skips, "f.csv") != tt.fileSkip {
					t.Errorf("documents %q, skips %q; want f.csv skipped with %q", ids(docs), skips, tt.fileSkip)
				}
				return
			}
			var titles, texts []string
			for _, d := range docs {
				titles = append(titles, d.Title)
				texts = append(texts, d.Text)
			}
			if !slices.Equal(ids(docs), tt.ids) || !slices.Equal(titles, tt.titles) || !slices.Equal(texts, tt.texts) {
				t.Errorf("got %q %q %q, want %q %q %q", ids(docs), titles, texts, tt.ids, tt.titles, tt.texts)
			}
		})
	}
}

// TestTSV checks tab-separated files: fields split at tabs, quotes taken
// literally (IANA text/tab-separated-values has no quoting), a line with
// the wrong number of fields skipped.
func TestTSV(t *testing.T) {
	data := "id\ttext\n1\tsix \"inch pipe\n\n2\tsecond \"quoted\" words\n3\tone\ttoo many\n4\tlast\n"
	docs, skips := walkAll(t, fstest.MapFS{"pipes.tsv": file(data)}, corpus.Options{})
	var texts []string
	for _, d := range docs {
		texts = append(texts, d.Text)
		if d.Format != "tsv" {
			t.Errorf("%s: Format %q", d.ID, d.Format)
		}
	}
	if want := []string{"pipes.tsv#1", "pipes.tsv#2", "pipes.tsv#4"}; !slices.Equal(ids(docs), want) {
		t.Errorf("documents %q, want %q", ids(docs), want)
	}
	if want := []string{`six "inch pipe`, `second "quoted" words`, "last"}; !slices.Equal(texts, want) {
		t.Errorf("texts %q, want %q", texts, want)
	}
	if len(skips) != 1 || skips[0].Path != "pipes.tsv:5" || !strings.Contains(skips[0].Reason, "wrong number of fields (3, the header has 2)") {
		t.Errorf("skips %q, want pipes.tsv:5 with the wrong number of fields", skips)
	}
}

// TestJSONL checks JSON Lines: one object a line (jsonlines.org, from
// memory), blank lines ignored, numbers as IDs kept as written
// (encoding/json's UseNumber), bad lines skipped with their line number.
func TestJSONL(t *testing.T) {
	data := "\ufeff{\"id\": 7, \"text\": \"Reed bed survey\", \"title\": \"Survey\"}\n" +
		"\n" +
		"{\"id\": \"x\", \"text\": 42}\n" +
		"not json\n" +
		"{\"Body\": \"Upper-case key\"}\r\n" +
		"[1, 2]\n" +
		"{\"text\": \"Bad byte \xff here\", \"id\": 12.50}\n" +
		"{\"id\": 7, \"text\": \"Same id\"}\n" +
		"{\"text\": \"\"}\n" +
		"{\"title\": \"no text\"}\n" +
		"{\"text\": \"two\"} {\"text\": \"values\"}\n" +
		"   \n"
	docs, skips := walkAll(t, fstest.MapFS{"notes.jsonl": file(data)}, corpus.Options{})
	type want struct {
		id, title, text string
		repaired        int
	}
	wants := []want{
		{"notes.jsonl#7", "Survey", "Reed bed survey", 0},
		{"notes.jsonl#5", "Upper-case key", "Upper-case key", 0},
		{"notes.jsonl#12.50", "Bad byte \ufffd here", "Bad byte \ufffd here", 1},
		{"notes.jsonl#7~2", "Same id", "Same id", 0},
	}
	if len(docs) != len(wants) {
		t.Fatalf("documents %q, want %d", ids(docs), len(wants))
	}
	for i, w := range wants {
		d := docs[i]
		if d.ID != w.id || d.Title != w.title || d.Text != w.text || d.Repaired != w.repaired {
			t.Errorf("document %d = %q %q %q %d, want %q %q %q %d", i, d.ID, d.Title, d.Text, d.Repaired, w.id, w.title, w.text, w.repaired)
		}
	}
	line := "{\"Body\": \"Upper-case key\"}" // without its CRLF
	if d := docs[1]; d.Size != int64(len(line)) || d.Hash != sha256.Sum256([]byte(line)) {
		t.Errorf("line 5: Size %d, Hash %x; want the line's bytes", d.Size, d.Hash)
	}
	wantSkips := []struct{ path, reason string }{
		{"notes.jsonl:3", `text field "text" is not a string (a number)`},
		{"notes.jsonl:4", "invalid JSON"},
		{"notes.jsonl:6", "not a JSON object (an array)"},
		{"notes.jsonl:9", "empty text field"},
		{"notes.jsonl:10", "no text field (looked for text, body"},
		{"notes.jsonl:11", "invalid JSON: data after the value"},
	}
	if len(skips) != len(wantSkips) {
		t.Errorf("skips %q, want %d", skips, len(wantSkips))
	}
	for _, w := range wantSkips {
		if r := reasonOf(skips, w.path); !strings.Contains(r, w.reason) {
			t.Errorf("skip reason for %s = %q, want it to contain %q", w.path, r, w.reason)
		}
	}
}

// FuzzCSV checks that no input makes the CSV or TSV reader panic, that
// text is valid UTF-8 and that document IDs are unique.
func FuzzCSV(f *testing.F) {
	f.Add(recordsCSV)
	f.Add("id\ttext\n1\tsix \"inch pipe\n2\tok\n")
	f.Add("text\n\"unterminated\n")
	f.Add("id,text\n1,a\n1,b\n1~2,c\n")
	f.Fuzz(func(t *testing.T, data string) {
		for _, name := range []string{"f.csv", "f.tsv"} {
			docs, skips := walkAll(t, fstest.MapFS{name: file(data)}, corpus.Options{})
			checkFuzzResult(t, docs, skips)
		}
	})
}

// FuzzJSONL checks the same for JSON Lines.
func FuzzJSONL(f *testing.F) {
	f.Add("{\"id\": 7, \"text\": \"Reed bed survey\", \"title\": \"Survey\"}\n\n{\"text\": 1}\n")
	f.Add("{\"TEXT\": \"a\", \"text\": \"b\", \"Id\": \"1\", \"id\": 1}\n")
	f.Add("\ufeff[]\nnull\n\"s\"\n{\"text\": \"\xff\"}\n")
	f.Fuzz(func(t *testing.T, data string) {
		docs, skips := walkAll(t, fstest.MapFS{"f.jsonl": file(data)}, corpus.Options{TitleField: "name"})
		checkFuzzResult(t, docs, skips)
		docs, skips = walkAll(t, fstest.MapFS{"f.jsonl": file(data)}, corpus.Options{})
		checkFuzzResult(t, docs, skips)
	})
}
