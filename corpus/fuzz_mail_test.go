package corpus

import (
	"strings"
	"testing"
	"unicode/utf8"
)

// The fuzz targets call the readers directly, not through extract, so
// that a panic is not recovered but reported by the fuzzer. Seeds are in
// testdata/fuzz/<target>/ (go test fuzz v1 files) besides those added
// here. Run one with
//
//	go test ./corpus -run '^$' -fuzz '^FuzzMail$' -fuzztime 3m

// fuzzOptions are the option sets each input is read with.
var fuzzOptions = []Options{
	{MaxBytes: 1 << 20},
	{MaxBytes: 1 << 20, KeepQuoted: true, NoAttachments: true},
	{MaxBytes: 4 << 10}, // a small budget, so that decoding hits it
}

// checkRead fails the test unless the reader's result is an error or
// documents with valid UTF-8, and every skip has a path and a reason.
func checkRead(t *testing.T, docs []Document, skips []Skip, err error) {
	t.Helper()
	for _, s := range skips {
		if s.Path == "" || s.Reason == "" {
			t.Errorf("skip without a path or reason: %+v", s)
		}
	}
	if err != nil {
		if docs != nil {
			t.Errorf("documents with an error: %v", err)
		}
		if err.Error() == "" {
			t.Error("error without a message")
		}
		return
	}
	for _, d := range docs {
		if d.ID == "" || d.Format == "" {
			t.Errorf("document without an ID or format: %+v", d)
		}
		for what, s := range map[string]string{"text": d.Text, "title": d.Title, "from": d.Meta.From,
			"to": d.Meta.To, "cc": d.Meta.Cc, "date": d.Meta.Date, "message-id": d.Meta.MessageID} {
			if !utf8.ValidString(s) {
				t.Errorf("%s: %s is not valid UTF-8: %q", d.ID, what, s)
			}
		}
		mine := d.Format == "email" || d.Format == "mbox" || d.Format == "html"
		if mine && strings.TrimSpace(d.Text) == "" {
			t.Errorf("%s: a document with no text", d.ID)
		}
	}
}

func fuzzReader(f *testing.F, name string, read func(string, []byte, *Options) ([]Document, []Skip, error), seeds ...string) {
	for _, s := range seeds {
		f.Add([]byte(s))
	}
	f.Fuzz(func(t *testing.T, raw []byte) {
		for _, o := range fuzzOptions {
			if int64(len(raw)) > o.MaxBytes {
				continue // Walk never hands a reader more than MaxBytes
			}
			docs, skips, err := read(name, raw, &o)
			checkRead(t, docs, skips, err)
		}
	})
}

func FuzzMail(f *testing.F) {
	fuzzReader(f, "f.eml", readMail,
		"Subject: s\n\nbody\n",
		"Subject: =?ISO-2022-JP?B?GyRCJDMkcyRLJEEkTxsoQg==?=\nContent-Type: multipart/alternative; boundary=a\n\n--a\nContent-Type: text/html; charset=koi8-r\nContent-Transfer-Encoding: quoted-printable\n\n<p>=F0=D2</p>\n--a--\n",
		"Content-Type: multipart/mixed; boundary=b\n\n--b\nContent-Type: message/rfc822\nContent-Disposition: attachment; filename=x.eml\nContent-Transfer-Encoding: base64\n\nU3ViamVjdDogaQoKaW5uZXIK\n--b\nContent-Disposition: attachment; filename=a.mbox\n\nFrom a b\nSubject: c\n\nd\n--b--\n",
		"Subject: q\n\n> quoted\nOn Mon, A wrote:\n-----Original Message-----\nFrom: x\n\n-- \nsig\n",
	)
}

func FuzzMbox(f *testing.F) {
	fuzzReader(f, "f.mbox", readMbox,
		"From a b\nSubject: one\n\n>From x\n>>From y\n\nFrom c d\nbad line\n\nFrom e f\nSubject: three\n\nthree\n",
		"\r\nFrom a\r\n\r\nFrom b\r\nSubject: x\r\n\r\ny\r\n",
	)
}

func FuzzHTML(f *testing.F) {
	fuzzReader(f, "f.html", readHTML,
		"<html><head><title>t</title><meta charset=windows-1252></head><body><nav>n</nav><p>caf\xe9 &amp; <b>x</p><pre>\n a</pre></body></html>",
		"<?xml version='1.0' encoding='koi8-r'?><svg><title>s</title></svg><header>h</header><article><header>k</header></article>",
		"<p>a<br>b</br><table><tr><td>c<td>d</table><script/>z</script><div role=banner>q",
	)
}
