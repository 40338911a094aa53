package corpus

import (
	"archive/zip"
	"bytes"
	"encoding/base64"
	"encoding/json"
	"fmt"
	"io/fs"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"testing/fstest"
	"time"

	"assay/corpus/pdf/pdftest"
)

// benchWords is an invented vocabulary for the reader benchmarks: a few
// real function words and made-up content words.
var benchWords = strings.Fields(`the of and to in is that for it as was with be by on not this are
or from at which but have an they were there been has their river gauge embankment sluice
culvert ferry warden parish ledger tariff quarry heron otter alder sedge turbine borehole
nitrate meadow levee hamlet tithe cooper brannock cobbet harls quill senwick ostravel
marlow tenby draycott fenwold blackmere  ridding hollin sallow brindle carrow`)

// benchProse returns about size bytes of invented sentences, in lines of
// about 70 characters, from a fixed seed.
func benchProse(size int, seed uint64) string {
	r := rand.New(rand.NewPCG(seed, 7))
	var b strings.Builder
	line := 0
	for b.Len() < size {
		n := 6 + r.IntN(14)
		for k := range n {
			w := benchWords[r.IntN(len(benchWords))]
			if k == 0 {
				w = strings.ToUpper(w[:1]) + w[1:]
			}
			b.WriteString(w)
			line += len(w) + 1
			switch {
			case k == n-1:
				b.WriteString(".")
			case r.IntN(10) == 0:
				b.WriteString(",")
			}
			if line > 70 {
				b.WriteByte('\n')
				line = 0
			} else {
				b.WriteByte(' ')
			}
		}
		if r.IntN(6) == 0 {
			b.WriteString("\n\n")
			line = 0
		}
	}
	return b.String()
}

// benchMail returns a multipart/alternative message with a
// quoted-printable text part, its HTML twin and a base64 text attachment,
// the shape of a message from a mail client, with a quoted reply.
func benchMail(i int) string {
	text := benchProse(3000, uint64(i))
	var qp strings.Builder
	for _, line := range strings.Split(text, "\n") {
		qp.WriteString(strings.ReplaceAll(line, "=", "=3D"))
		qp.WriteString("\r\n")
	}
	qp.WriteString("\r\nOn Tuesday the warden wrote:\r\n> the gauge was read at noon\r\n> and again at dusk\r\n")
	html := "<html><body><p>" + strings.ReplaceAll(text, "\n\n", "</p><p>") + "</p></body></html>"
	att := base64.StdEncoding.EncodeToString([]byte(benchProse(1500, uint64(i)+100)))
	var b strings.Builder
	fmt.Fprintf(&b, "From: Warden %d <warden%d@example.org>\r\nTo: ledger@example.org\r\nSubject: Gauge report %d\r\n", i, i, i)
	b.WriteString("Date: Tue, 3 Feb 2026 10:00:00 +0000\r\nMessage-ID: <r" + fmt.Sprint(i) + "@example.org>\r\nMIME-Version: 1.0\r\n")
	b.WriteString("Content-Type: multipart/mixed; boundary=\"outer\"\r\n\r\n--outer\r\n")
	b.WriteString("Content-Type: multipart/alternative; boundary=\"alt\"\r\n\r\n--alt\r\n")
	b.WriteString("Content-Type: text/plain; charset=utf-8\r\nContent-Transfer-Encoding: quoted-printable\r\n\r\n")
	b.WriteString(qp.String())
	b.WriteString("\r\n--alt\r\nContent-Type: text/html; charset=utf-8\r\n\r\n" + html + "\r\n--alt--\r\n")
	b.WriteString("--outer\r\nContent-Type: text/plain; name=\"notes.txt\"\r\nContent-Disposition: attachment; filename=\"notes.txt\"\r\nContent-Transfer-Encoding: base64\r\n\r\n")
	for len(att) > 76 {
		b.WriteString(att[:76] + "\r\n")
		att = att[76:]
	}
	b.WriteString(att + "\r\n--outer--\r\n")
	return b.String()
}

// benchHTML returns a web page: head with title, style and script, a
// navigation list, headings, paragraphs with links and entities, a table
// and a footer.
func benchHTML(size int) string {
	var b strings.Builder
	b.WriteString("<!DOCTYPE html>\n<html lang=\"en\"><head><meta charset=\"utf-8\"><title>Ferry timetable &amp; notices</title>\n")
	b.WriteString("<style>body{font-family:sans-serif} .nav li{display:inline}</style>\n<script>var x = 1; function f(){ return x < 2; }</script></head>\n<body>\n")
	b.WriteString("<nav class=\"nav\"><ul><li><a href=\"/\">Home</a></li><li><a href=\"/news\">News</a></li><li><a href=\"/contact\">Contact</a></li></ul></nav>\n<main>\n")
	for i := 0; b.Len() < size; i++ {
		fmt.Fprintf(&b, "<h2 id=\"s%d\">Section %d</h2>\n", i, i)
		for _, para := range strings.Split(benchProse(1200, uint64(i)), "\n\n") {
			b.WriteString("<p>" + strings.ReplaceAll(para, " river ", " <a href=\"/river\">river</a> ") + " &mdash; see <em>notes</em>.</p>\n")
		}
		if i%3 == 0 {
			b.WriteString("<table><tr><th>Route</th><th>Depart</th></tr><tr><td>4</td><td>07:15</td></tr><tr><td>7</td><td>08:40</td></tr></table>\n")
		}
	}
	b.WriteString("</main><footer><p>&copy; 2026 Invented Authority</p></footer></body></html>\n")
	return b.String()
}

// benchPDF returns a PDF of pages of Helvetica text lines, one text object
// a page with a Tj per line (pdftest), about size bytes of text.
func benchPDF(size int) []byte {
	var pages []string
	text := benchProse(size, 5)
	lines := strings.Split(text, "\n")
	for len(lines) > 0 {
		n := min(50, len(lines))
		var c strings.Builder
		c.WriteString("BT /F1 11 Tf 72 740 Td 14 TL\n")
		for _, l := range lines[:n] {
			l = strings.NewReplacer(`\`, `\\`, "(", `\(`, ")", `\)`).Replace(l)
			c.WriteString("(" + l + ") Tj T*\n")
		}
		c.WriteString("ET")
		pages = append(pages, c.String())
		lines = lines[n:]
	}
	return pdftest.Text("(Gauge report)", pages...)
}

// benchDOCX returns a .docx of paragraphs of runs, every few paragraphs
// a heading style and a small table.
func benchDOCX(b *testing.B, size int) []byte {
	var body strings.Builder
	for i, para := range strings.Split(benchProse(size, 6), "\n\n") {
		body.WriteString("<w:p>")
		if i%5 == 0 {
			body.WriteString(`<w:pPr><w:pStyle w:val="Heading1"/></w:pPr>`)
		}
		for _, line := range strings.Split(para, "\n") {
			body.WriteString(`<w:r><w:rPr><w:lang w:val="en-GB"/></w:rPr><w:t xml:space="preserve">` + line + ` </w:t></w:r>`)
		}
		body.WriteString("</w:p>")
		if i%7 == 3 {
			body.WriteString(`<w:tbl><w:tr><w:tc><w:p><w:r><w:t>Berth</w:t></w:r></w:p></w:tc><w:tc><w:p><w:r><w:t>7.5 m</w:t></w:r></w:p></w:tc></w:tr></w:tbl>`)
		}
	}
	doc := `<?xml version="1.0" encoding="UTF-8" standalone="yes"?>` + "\n" +
		`<w:document xmlns:w="http://schemas.openxmlformats.org/wordprocessingml/2006/main"><w:body>` + body.String() + `</w:body></w:document>`
	rels := `<?xml version="1.0" encoding="UTF-8"?><Relationships xmlns="http://schemas.openxmlformats.org/package/2006/relationships"><Relationship Id="rId1" Type="http://schemas.openxmlformats.org/officeDocument/2006/relationships/officeDocument" Target="word/document.xml"/></Relationships>`
	core := `<?xml version="1.0" encoding="UTF-8"?><cp:coreProperties xmlns:cp="http://schemas.openxmlformats.org/package/2006/metadata/core-properties" xmlns:dc="http://purl.org/dc/elements/1.1/"><dc:title>Harbour plan</dc:title></cp:coreProperties>`
	var buf bytes.Buffer
	w := zip.NewWriter(&buf)
	for _, e := range []struct{ name, data string }{{"_rels/.rels", rels}, {"docProps/core.xml", core}, {"word/document.xml", doc}} {
		f, err := w.CreateHeader(&zip.FileHeader{Name: e.name, Method: zip.Deflate, Modified: time.Unix(0, 0).UTC()})
		if err != nil {
			b.Fatal(err)
		}
		f.Write([]byte(e.data))
	}
	if err := w.Close(); err != nil {
		b.Fatal(err)
	}
	return buf.Bytes()
}

// benchRecords returns n CSV records (id, title, text with quoted commas
// and a quoted newline now and then) or n JSON Lines objects.
func benchRecords(n int, jsonl bool) string {
	var b strings.Builder
	if !jsonl {
		b.WriteString("id,title,text\n")
	}
	for i := range n {
		text := strings.ReplaceAll(benchProse(600, uint64(i)), "\n", " ")
		if i%10 == 0 {
			text += "\nSecond line."
		}
		if jsonl {
			line, _ := json.Marshal(map[string]any{"id": i, "title": fmt.Sprintf("Record %d", i), "text": text})
			b.Write(line)
			b.WriteByte('\n')
		} else {
			fmt.Fprintf(&b, "%d,Record %d,\"%s\"\n", i, i, strings.ReplaceAll(text, `"`, `""`))
		}
	}
	return b.String()
}

// BenchmarkReaders runs each format's reader (through extract, as the
// walk does: recover, size and SHA-256) on a realistic invented input;
// MB/s is of the raw file.
func BenchmarkReaders(b *testing.B) {
	var mbox strings.Builder
	for i := range 20 {
		fmt.Fprintf(&mbox, "From warden%d@example.org Tue Feb  3 10:00:00 2026\n", i)
		mbox.WriteString(strings.ReplaceAll(benchMail(i), "\r\n", "\n"))
		mbox.WriteString("\n")
	}
	inputs := []struct {
		name string
		raw  []byte
	}{
		{"text.txt", []byte("Gauge report\n\n" + benchProse(64<<10, 1))},
		{"mail.eml", []byte(benchMail(1))},
		{"box.mbox", []byte(mbox.String())},
		{"page.html", []byte(benchHTML(64 << 10))},
		{"report.pdf", benchPDF(32 << 10)},
		{"plan.docx", benchDOCX(b, 64<<10)},
		{"data.csv", []byte(benchRecords(100, false))},
		{"data.jsonl", []byte(benchRecords(100, true))},
	}
	for _, in := range inputs {
		ext := filepath.Ext(in.name)
		b.Run(strings.TrimPrefix(ext, "."), func(b *testing.B) {
			rd := readers[ext]
			opts := Options{MaxBytes: DefaultMaxBytes}
			docs, skips, err := extract(in.name, in.raw, rd, &opts)
			if err != nil || len(docs) == 0 {
				b.Fatalf("%s: %d documents, skips %v, error %v", in.name, len(docs), skips, err)
			}
			b.SetBytes(int64(len(in.raw)))
			b.ReportAllocs()
			for b.Loop() {
				extract(in.name, in.raw, rd, &opts)
			}
		})
	}
}

// BenchmarkWalkParallel reads 2,000 small text files (about 2.5 KB each,
// 1,000 to a folder) from disk through os.Root, as the command line does,
// with jobs workers that only count the bytes of text: the cost of
// walking, opening, reading and decoding, without analysis.
func BenchmarkWalkParallel(b *testing.B) {
	dir := b.TempDir()
	var total int64
	for i := range 2000 {
		p := filepath.Join(dir, fmt.Sprintf("%03d", i/1000), fmt.Sprintf("%06d.txt", i))
		if i%1000 == 0 {
			if err := os.MkdirAll(filepath.Dir(p), 0o755); err != nil {
				b.Fatal(err)
			}
		}
		data := "Report " + fmt.Sprint(i) + "\n\n" + benchProse(2500, uint64(i))
		total += int64(len(data))
		if err := os.WriteFile(p, []byte(data), 0o644); err != nil {
			b.Fatal(err)
		}
	}
	root, err := os.OpenRoot(dir)
	if err != nil {
		b.Fatal(err)
	}
	defer root.Close()
	for _, fsys := range []struct {
		name string
		fs   fs.FS
	}{{"os.Root", root.FS()}, {"mapfs", loadMapFS(b, root.FS())}} {
		for _, jobs := range []int{1, 2} {
			b.Run(fmt.Sprintf("fs=%s/jobs=%d", fsys.name, jobs), func(b *testing.B) {
				b.SetBytes(total)
				b.ReportAllocs()
				for b.Loop() {
					n := 0
					_, err := WalkParallel(fsys.fs, Options{}, jobs, func() func(Document) int {
						return func(d Document) int { return len(d.Text) }
					}, func(_ Document, k int) error { n += k; return nil })
					if err != nil || n == 0 {
						b.Fatal(n, err)
					}
				}
			})
		}
	}
}

// loadMapFS copies a folder into memory, to tell the file system's cost
// from the rest.
func loadMapFS(b *testing.B, fsys fs.FS) fstest.MapFS {
	m := fstest.MapFS{}
	err := fs.WalkDir(fsys, ".", func(p string, d fs.DirEntry, err error) error {
		if err != nil || d.IsDir() {
			return err
		}
		data, err := fs.ReadFile(fsys, p)
		m[p] = &fstest.MapFile{Data: data}
		return err
	})
	if err != nil {
		b.Fatal(err)
	}
	return m
}
