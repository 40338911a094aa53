package corpus_test

import (
	"crypto/sha256"
	"os"
	"slices"
	"strings"
	"testing"
	"testing/fstest"

	"assay/corpus"
)

// TestMbox reads testdata/mail/box.mbox: three messages, the second with
// a malformed header, the third with an attachment. The rules are RFC
// 4155's (messages start at "From " lines after an empty line, and end
// with an empty line) and mboxrd's unescaping (one ">" off ^>+From ).
func TestMbox(t *testing.T) {
	raw, err := os.ReadFile("testdata/mail/box.mbox")
	if err != nil {
		t.Fatal(err)
	}
	fsys := fstest.MapFS{"lists/box.mbox": {Data: raw}}
	docs, skips := walkAll(t, fsys, corpus.Options{KeepQuoted: true})
	want := []string{"lists/box.mbox#1", "lists/box.mbox#3", "lists/box.mbox#3#rota.txt"}
	if got := ids(docs); !slices.Equal(got, want) {
		t.Fatalf("documents %q, want %q", got, want)
	}
	if got := skipPaths(skips); !slices.Equal(got, []string{"lists/box.mbox#2"}) {
		t.Fatalf("skips %v, want the second message only", skips)
	}
	if r := skips[0].Reason; !strings.HasPrefix(r, "malformed mail header: ") {
		t.Errorf("reason %q", r)
	}
	first := docs[0]
	// ">From" and ">>From" each lose one ">"; a "From " line right after
	// a text line does not start a message (RFC 4155, the empty line
	// before a separator).
	wantText := "The seed order goes in on Friday.\n" +
		"From the catalogue: broad beans, leeks and chard.\n" +
		">From the old list: keep the marigolds.\n" +
		"From here on this line starts a paragraph but follows a text line."
	if first.Text != wantText {
		t.Errorf("text\n%s\nwant\n%s", first.Text, wantText)
	}
	if first.Title != "Seed order" || first.Format != "mbox" || first.Container != "lists/box.mbox" {
		t.Errorf("first message: title %q format %q container %q", first.Title, first.Format, first.Container)
	}
	// Size and Hash are of the message's own bytes: after its "From "
	// line, before the empty line that ends it, unescaped.
	s := string(raw)
	start := strings.Index(s, "\n") + 1
	end := strings.Index(s, "\n\nFrom orrin") + 1
	own := strings.Replace(strings.Replace(s[start:end], ">From the cat", "From the cat", 1), ">>From", ">From", 1)
	if first.Size != int64(len(own)) || first.Hash != sha256.Sum256([]byte(own)) {
		t.Errorf("size %d, want %d (or the hash differs)", first.Size, len(own))
	}
	if att := docs[2]; att.Container != "lists/box.mbox" || att.Format != "text" {
		t.Errorf("attachment container %q format %q", att.Container, att.Format)
	}

	// By default the unescaped ">From the old list" is a quoted line.
	docs, _ = walkAll(t, fsys, corpus.Options{})
	if strings.Contains(docs[0].Text, "old list") {
		t.Errorf("quoted line kept without KeepQuoted:\n%s", docs[0].Text)
	}
}

// TestMboxCases checks the splitting rule on small mailboxes.
func TestMboxCases(t *testing.T) {
	tests := []struct {
		name   string
		raw    string
		texts  []string // texts of the documents, in order
		reason string   // the file's skip reason, when it is skipped
	}{
		{
			name:  "blank lines before the first From, CRLF",
			raw:   "\r\n\r\nFrom a@example.org Sat Mar  1 10:00:00 2025\r\nSubject: A\r\n\r\nalpha\r\n\r\nFrom b@example.org Sat Mar  1 11:00:00 2025\r\nSubject: B\r\n\r\nbravo\r\n",
			texts: []string{"alpha", "bravo"},
		},
		{
			name:  "no final empty line",
			raw:   "From a@example.org x\nSubject: A\n\nalpha\nFrom inside a line run\n",
			texts: []string{"alpha\nFrom inside a line run"},
		},
		{
			name:   "not a mailbox",
			raw:    "Subject: A\n\nalpha\n\nFrom a@example.org x\nSubject: B\n\nbravo\n",
			reason: `not a mailbox (the first line with text is not a "From " line)`,
		},
		{
			// "From:" is a header field, not a separator (RFC 4155
			// requires "From " with a space).
			name:   "From colon",
			raw:    "From: a@example.org\nSubject: A\n\nalpha\n",
			reason: "not a mailbox",
		},
		{
			name:   "empty messages",
			raw:    "From a x\n\nFrom b y\n",
			reason: "",
			texts:  nil,
		},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			docs, skips := readOne(t, "x.mbox", tt.raw, corpus.Options{})
			var texts []string
			for _, d := range docs {
				texts = append(texts, d.Text)
			}
			if !slices.Equal(texts, tt.texts) {
				t.Errorf("texts %q, want %q", texts, tt.texts)
			}
			if tt.reason != "" {
				if r := reasonOf(skips, "x.mbox"); !strings.HasPrefix(r, tt.reason) {
					t.Errorf("reason %q, want %q", r, tt.reason)
				}
			}
		})
	}
	// Both empty messages are skips of their own.
	_, skips := readOne(t, "x.mbox", "From a x\n\nFrom b y\n", corpus.Options{})
	if got := skipPaths(skips); !slices.Equal(got, []string{"x.mbox#1", "x.mbox#2"}) {
		t.Errorf("skips %v", skips)
	}
}
