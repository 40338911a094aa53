package corpus_test

import (
	"os"
	"strings"
	"testing"
	"testing/fstest"

	"assay/corpus"
)

// readFixture reads testdata/html/name as the only file of a folder.
func readFixture(t *testing.T, name string) ([]corpus.Document, []corpus.Skip) {
	t.Helper()
	raw, err := os.ReadFile("testdata/html/" + name)
	if err != nil {
		t.Fatal(err)
	}
	return walkAll(t, fstest.MapFS{name: {Data: raw}}, corpus.Options{})
}

// TestHTMLPage reads testdata/html/page.html: dropped elements (html.go's
// rule), entities, blocks, pre and br.
func TestHTMLPage(t *testing.T) {
	docs, skips := readFixture(t, "page.html")
	if len(docs) != 1 || len(skips) != 0 {
		t.Fatalf("documents %q, skips %v", ids(docs), skips)
	}
	d := docs[0]
	// The title element's text, its entity decoded and its white space
	// collapsed (HTML standard: the title is "stripped and collapsed").
	if d.Title != "Harbour timetable & fares" {
		t.Errorf("title %q", d.Title)
	}
	// Named references from the HTML standard's table: &pound; U+00A3,
	// &frac12; U+00BD, &mdash; U+2014. The first line end inside pre is
	// dropped (HTML standard, the pre start tag), the rest kept.
	want := "Ferry timetable\n\n" +
		"The ferry to Gull Island leaves at 09:00 & 14:30, weather permitting.\n\n" +
		"Fares: adults £4, children ½ price — bicycles free.\n\n" +
		"Monday\nWednesday\n\n" +
		"Day Crossings\nSat 3\n\n" +
		"  Pier A   09:00\n  Pier B   09:20\n\n" +
		"Line one\nline two"
	if d.Text != want {
		t.Errorf("text\n%s\nwant\n%s", d.Text, want)
	}
	for _, gone := range []string{"styled", "script text", "written", "Site banner", "Menu", "Home", "Breadcrumbs",
		"Enable scripts", "template text", "svg", "Search", "bus routes", "Copyright"} {
		if strings.Contains(d.Text, gone) {
			t.Errorf("text keeps %q, which html.go drops", gone)
		}
	}
}

// TestHTMLCharsets checks the encoding rules of html.go.
func TestHTMLCharsets(t *testing.T) {
	// Declared by http-equiv; windows-1252 (the code page's table): 0xE9
	// "é", 0x93/0x94 curly quotes, 0x80 "€", 0x96 en dash.
	docs, _ := readFixture(t, "cp1252.html")
	if len(docs) != 1 {
		t.Fatalf("documents %q", ids(docs))
	}
	if want := "Café notes\n\n“Quoted” € 5 – price"; docs[0].Text != want {
		t.Errorf("text %q, want %q", docs[0].Text, want)
	}
	if docs[0].Title != "Café notes" { // no title element: the first heading
		t.Errorf("title %q", docs[0].Title)
	}
	tests := []struct {
		name, raw, text string
		bad             int
	}{
		// <meta charset> (HTML standard, prescan); ISO-8859-1 label maps
		// to windows-1252 (WHATWG Encoding Standard).
		{"meta charset", "<meta charset=\"iso-8859-1\"><p>na\xefve \x85</p>", "naïve …", 0},
		// KOI8-R by an unquoted http-equiv content (RFC 1489 table).
		{"http-equiv unquoted", "<meta http-equiv=content-type content='text/html;charset=koi8-r'><p>\xf0\xd2\xc9\xd7\xc5\xd4</p>", "Привет", 0},
		// XML declaration (XML 1.0 section 4.3.3).
		{"xml declaration", "<?xml version=\"1.0\" encoding=\"ISO-8859-15\"?><html><body><p>\xa4 5</p></body></html>", "€ 5", 0},
		// Undeclared, valid UTF-8: UTF-8.
		{"undeclared utf-8", "<p>\xc3\xa9t\xc3\xa9</p>", "été", 0},
		// Undeclared, not UTF-8: windows-1252 (browsers' usual fallback,
		// from memory of the HTML standard's sniffing algorithm).
		{"undeclared legacy", "<p>caf\xe9</p>", "café", 0},
		// Declared UTF-8 with a stray byte: repaired and counted.
		{"declared utf-8 repaired", "<meta charset=utf-8><p>caf\xe9 ok</p>", "caf\ufffd ok", 1},
		// An unknown label is ignored (WHATWG: no encoding), so the
		// fallback applies.
		{"unknown label", "<meta charset=x-nothing><p>\xc3\xa9</p>", "é", 0},
		// A UTF-8 byte order mark wins over a meta (HTML standard).
		{"byte order mark", "\xef\xbb\xbf<meta charset=windows-1252><p>\xc3\xa9</p>", "é", 0},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			docs, skips := readOne(t, "p.html", tt.raw, corpus.Options{})
			if len(docs) != 1 {
				t.Fatalf("documents %q, skips %v", ids(docs), skips)
			}
			if docs[0].Text != tt.text || docs[0].Repaired != tt.bad {
				t.Errorf("text %q repaired %d, want %q and %d", docs[0].Text, docs[0].Repaired, tt.text, tt.bad)
			}
		})
	}
}

// TestHTMLStructure checks titles, malformed markup and boilerplate.
func TestHTMLStructure(t *testing.T) {
	docs, _ := readFixture(t, "unclosed.html")
	if len(docs) != 1 {
		t.Fatalf("documents %q", ids(docs))
	}
	// Unclosed elements end at the end of the file; the heading holds
	// the unclosed p inside it, as an HTML parser builds it (an h3 is not
	// closed by a p start tag).
	if want := "Unclosed paragraph bold italic\nSecond block still open\n\nLate heading\n\nLast words"; docs[0].Text != want {
		t.Errorf("text %q, want %q", docs[0].Text, want)
	}
	tests := []struct {
		name, raw, title, text string
	}{
		{"title element wins", "<title>Tide</title><h1>Heading</h1><p>x</p>", "Tide", "Heading\n\nx"},
		{"empty title", "<title> </title><h2>Second level</h2>", "Second level", "Second level"},
		{"no heading", "<p>First words here</p><p>more</p>", "First words here", "First words here\n\nmore"},
		{"no letters", "<p>***</p>", "p.html", "***"},
		// HTML-AAM (from memory): header and footer are banner and
		// contentinfo only outside article, aside, main, nav, section.
		{"article header kept", "<header>Site</header><article><header><h1>Story</h1></header><p>Body</p><footer>By Ada</footer></article><footer>Legal</footer>", "Story", "Story\n\nBody\n\nBy Ada"},
		{"roles", "<div role=\"banner\">B</div><div role=\"contentinfo\">C</div><div role=\"main\">Kept</div><span role=\"navigation menu\">N</span>", "Kept", "Kept"},
		{"stray end tags", "</div></p><p>One</span> two</p></b>", "One two", "One two"},
		{"head without end", "<head><title>T</title><meta x=y>Loose text", "T", "Loose text"},
		{"body closes head", "<head><style>s{}</style><body><p>Text</p>", "Text", "Text"},
		// HTML standard, named character references: "&not" is one of
		// the legacy names that need no ";", so "&notanentity;" starts
		// with "¬" as in browsers; "&zzz;" is no name and stays; &nbsp;
		// is white space.
		{"entities", "<p>&lt;tag&gt; &amp;amp; &#233;&#x20AC; &nbsp;&copy; &notanentity; &zzz;</p>", "<tag> &amp; é€ © ¬anentity; &zzz;", "<tag> &amp; é€ © ¬anentity; &zzz;"},
		{"self-closing script", "<p>a</p><script/>hidden()</script><p>b</p>", "a", "a\n\nb"},
		{"breaks", "a<br>b<br><br>c<br/><br/><br/>d", "a", "a\nb\n\nc\n\nd"},
		{"comment", "<p>x<!-- hidden --> y</p>", "x y", "x y"},
		{"second title", "<title>One</title><p>a</p><title>Two</title><p>b</p>", "One", "a\n\nb"},
		{"svg title", "<svg><title>Icon</title></svg><p>Words</p>", "Words", "Words"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			docs, skips := readOne(t, "p.html", tt.raw, corpus.Options{})
			if len(docs) != 1 {
				t.Fatalf("documents %q, skips %v", ids(docs), skips)
			}
			if docs[0].Title != tt.title || docs[0].Text != tt.text {
				t.Errorf("title %q text %q, want %q and %q", docs[0].Title, docs[0].Text, tt.title, tt.text)
			}
		})
	}
	for _, raw := range []string{"<script>only()</script>", "<html><head><title>Only a title</title></head><body> </body></html>", "<nav>menu</nav>"} {
		_, skips := readOne(t, "e.xhtml", raw, corpus.Options{})
		if r := reasonOf(skips, "e.xhtml"); r != "no text (the page has no visible text)" {
			t.Errorf("%q: reason %q", raw, r)
		}
	}
}
