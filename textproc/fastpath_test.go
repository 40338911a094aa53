package textproc

import (
	"math/rand/v2"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"
)

// The analyzer's fast paths (ASCII text tokenised without normalising,
// mostly-ASCII text normalised a stretch at a time, one memo look-up per
// token, detection from the memo, AnalyzeIDs) must give exactly what the
// plain path gives: the tokens of tokenizer.run(Normalize(text)), and with
// NoMemo the analysis of every token afresh. These tests compare the two
// on tricky and random text.

// trickyPieces are the pieces random test texts are made of: ASCII of
// every class, apostrophes of the three kinds, combining marks (which
// compose with the letter before them under NFC), characters that case
// folding expands or turns into ASCII (ß, ẞ, ﬁ, İ, the Kelvin sign),
// U+0345 (a combining mark that folds to a letter), final sigma, Hangul
// jamo (which NFC composes) and syllables, Han, kana with U+30FC, Thai
// with vowel signs, Cyrillic with ё, a variation selector, a
// no-break space, dashes and quotes, and invalid UTF-8.
var trickyPieces = []string{
	"a", "Z", "q", "7", " ", ".", "-", "'", "'s", "\u2019", "\u02bc", "_", "\n", "\t",
	"e\u0301", "E\u0301", "\u0301", "\u0323", "\u0308", "a\u0323\u0301", "\u00e9", "\u00c9",
	"\u00df", "\u1e9e", "\ufb01", "\u0130", "\u212a", "\u212b", "\u0345", "\u03a3", "\u03c2", "\u0391\u0345",
	"\u1100", "\u1161", "\u11a8", "\ud55c", "\u6c34\u9053", "\u30ab\u30fc", "\u0e19\u0e49\u0e33",
	"\u0401", "\u0451\u0436", "\ufe0f", "\u00a0", "\u2014", "\u201c", "\u00bd", "\u0662",
	"\xff", "\xe2\x80", "\xc3", "\xed\xa0\x80",
}

func randomTricky(r *rand.Rand, asciiBias int) string {
	var b strings.Builder
	for range 1 + r.IntN(40) {
		if r.IntN(asciiBias+1) > 0 {
			b.WriteString(trickyPieces[r.IntN(14)]) // the ASCII pieces
		} else {
			b.WriteString(trickyPieces[r.IntN(len(trickyPieces))])
		}
	}
	return b.String()
}

func lowerASCII(s string) string {
	b := []byte(s)
	for i, c := range b {
		if 'A' <= c && c <= 'Z' {
			b[i] = c + 'a' - 'A'
		}
	}
	return string(b)
}

func tokenDump(t *tokenizer) []string {
	var out []string
	for _, ref := range t.refs {
		out = append(out, string(rune('0'+ref.kind))+string(rune('0'+ref.script))+string(t.token(ref)))
	}
	return out
}

// checkNormalization compares the fast normalisation and tokenising of
// text with the plain path (which also scans ASCII words a byte at a
// time, where the fast one takes eight at once).
func checkNormalization(t *testing.T, text string) {
	t.Helper()
	a := NewAnalyzer(Options{})
	want := a.Normalize(text)
	for name, got := range map[string]string{
		"stretches": a.normalizeStretches(text),
		"whole":     a.normalizeWhole(text),
		"chosen":    a.normalized(text),
	} {
		if lowerASCII(got) != want {
			t.Fatalf("%s(%q) = %q, want %q", name, text, got, want)
		}
	}
	plain := tokenizer{bytewise: true}
	plain.run(want)
	a.tokenize(text)
	if got, want := tokenDump(&a.tok), tokenDump(&plain); !slices.Equal(got, want) {
		t.Fatalf("tokens of %q: %q, want %q", text, got, want)
	}
}

// TestASCIIRunMatchesBytewise checks the eight-bytes-at-a-time scan of
// ASCII words (asciiWords) against the byte-at-a-time scan, with and
// without lower-casing, on texts of long words in mixed case broken by
// every ASCII character and by non-ASCII ones, at every offset from the
// end of the text (where fewer than eight bytes remain). Every byte
// value from 0x00 to 0xff is also tried inside a long word: the bytes
// just outside each class ('/', ':', '@', '[', '`', '{') and the bytes
// with the high bit set are where a wrong mask would show. Common
// practice, no outside source.
func TestASCIIRunMatchesBytewise(t *testing.T) {
	r := rand.New(rand.NewPCG(7, 8))
	const letters = "abcxyzABCXYZ0189"
	check := func(text string) {
		t.Helper()
		for _, lower := range []bool{false, true} {
			fast := tokenizer{lower: lower}
			slow := tokenizer{lower: lower, bytewise: true}
			fast.run(text)
			slow.run(text)
			if got, want := tokenDump(&fast), tokenDump(&slow); !slices.Equal(got, want) {
				t.Fatalf("lower %v, tokens of %q: %q, want %q", lower, text, got, want)
			}
		}
	}
	for range 5000 {
		var b strings.Builder
		for range 1 + r.IntN(6) {
			for range r.IntN(30) {
				b.WriteByte(letters[r.IntN(len(letters))])
			}
			switch r.IntN(4) {
			case 0:
				b.WriteByte(byte(r.IntN(128)))
			case 1:
				b.WriteString(trickyPieces[r.IntN(len(trickyPieces))])
			default:
				b.WriteByte(' ')
			}
		}
		text := b.String()
		for cut := 0; cut <= min(len(text), 10); cut++ {
			check(text[cut:])
		}
	}
	for c := range 256 {
		for pos := range 12 {
			w := []byte("abcdefghijKLMNOPQRST")
			w[pos] = byte(c)
			check(string(w))
			check(string(w) + " tail")
		}
	}
}

// TestASCIIBlocksMatchBytewise checks the 64-bytes-at-a-time scan of
// ASCII text (asciiBlock, with asciiWords after it) against the
// byte-at-a-time scan, with and without lower-casing, on ASCII texts
// long enough for several blocks: words of every length from 1 to 150
// bytes (so that words cross block boundaries, and fill whole blocks),
// numbers that turn into words after a boundary, runs of separators, and
// now and then an apostrophe or a non-ASCII character (which sends a
// block back to the eight-byte scan), each text cut at every offset of a
// block. Common practice, no outside source.
func TestASCIIBlocksMatchBytewise(t *testing.T) {
	r := rand.New(rand.NewPCG(9, 10))
	const (
		letters = "abcdefxyzABCDEFXYZ"
		digits  = "0123456789"
		seps    = " .,;:-_/\n\t()[]{}@`~!?"
	)
	pick := func(set string) byte { return set[r.IntN(len(set))] }
	for range 1500 {
		var b strings.Builder
		for b.Len() < 64+r.IntN(400) {
			n := 1 + r.IntN(12)
			if r.IntN(10) == 0 {
				n = 1 + r.IntN(150)
			}
			switch r.IntN(6) {
			case 0: // a number
				for range n {
					b.WriteByte(pick(digits))
				}
			case 1: // a number, then letters
				for range n {
					b.WriteByte(pick(digits))
				}
				for range 1 + r.IntN(8) {
					b.WriteByte(pick(letters))
				}
			default:
				for range n {
					b.WriteByte(pick(letters + digits[:2]))
				}
			}
			for range 1 + r.IntN(3)*r.IntN(3) {
				b.WriteByte(pick(seps))
			}
			if r.IntN(40) == 0 {
				b.WriteString([]string{"'", "'s ", "\u00e9", "\u2019", "\xff"}[r.IntN(5)])
			}
		}
		text := b.String()
		for cut := 0; cut < min(len(text), 64); cut++ {
			for _, lower := range []bool{false, true} {
				fast := tokenizer{lower: lower}
				slow := tokenizer{lower: lower, bytewise: true}
				fast.run(text[cut:])
				slow.run(text[cut:])
				if got, want := tokenDump(&fast), tokenDump(&slow); !slices.Equal(got, want) {
					t.Fatalf("lower %v, tokens of %q: %q, want %q", lower, text[cut:], got, want)
				}
			}
		}
	}
}

// TestHighBits checks highBits against a loop over the bytes, for every
// one of the 256 patterns of high bits, with the other bits set at
// random. Common practice, no outside source.
func TestHighBits(t *testing.T) {
	r := rand.New(rand.NewPCG(11, 12))
	for m := range 256 {
		x := r.Uint64() &^ swarHigh
		for k := range 8 {
			if m>>k&1 != 0 {
				x |= 0x80 << (8 * k)
			}
		}
		if got := highBits(x & swarHigh); got != uint64(m) {
			t.Fatalf("highBits(%#x) = %#x, want %#x", x&swarHigh, got, m)
		}
	}
}

func TestFastNormalizationMatchesNormalize(t *testing.T) {
	r := rand.New(rand.NewPCG(3, 4))
	for _, bias := range []int{0, 3, 30} {
		for range 3000 {
			checkNormalization(t, randomTricky(r, bias))
		}
	}
	for _, s := range trickyPieces {
		for _, ctx := range []string{"%s", "x%s", "X%sy", "%s%s", " %sZ", "E%s\u0301"} {
			checkNormalization(t, strings.ReplaceAll(ctx, "%s", s))
		}
	}
}

// analysisDump is everything Analyze gives for a sequence of documents:
// each document's pairs and language, and the detection counts.
func analysisDump(a *Analyzer, docs []string) []string {
	var out []string
	for _, d := range docs {
		lang := a.Analyze(d, func(term, surface string) { out = append(out, term+"\x00"+surface) })
		det := a.LastDetection()
		out = append(out, "lang="+string(lang), strings.Join([]string{string(det.Lang), string(det.Best), string(det.Second)}, ","),
			string(rune(det.BestScore)), string(rune(det.SecondScore)), string(rune(det.BestStops)), string(rune(det.Tokens)))
	}
	return out
}

func fixtureTexts(t *testing.T) []string {
	var docs []string
	files, _ := filepath.Glob(filepath.Join("testdata", "langid", "*", "*.txt"))
	for _, f := range files {
		b, err := os.ReadFile(f)
		if err != nil {
			t.Fatal(err)
		}
		docs = append(docs, string(b), strings.ToUpper(string(b)))
	}
	return docs
}

// TestMemoMatchesNoMemo analyses the same documents with one reused
// analyzer (memo on) and without the memo, under several options.
func TestMemoMatchesNoMemo(t *testing.T) {
	r := rand.New(rand.NewPCG(5, 6))
	docs := fixtureTexts(t)
	for range 500 {
		docs = append(docs, randomTricky(r, r.IntN(20)))
	}
	docs = append(docs, "don't won't l'eau qu'aujourd'hui jusqu'à ё ёлка ЁЛКА a'b'c'd the'and'of", "Ещё и уже", "")
	// One token in several languages (English, French, Undetermined),
	// tokens around the length a slot holds, and enough distinct tokens
	// for the table to grow several times.
	docs = append(docs, "the riverbanks and the rain on the hill with riverbanks",
		"le riverbanks et la pluie sur le mont avec riverbanks", "riverbanks riverbanks", "the riverbanks and the rain")
	for _, n := range []int{10, 11, 12, 15, 16, 17, 31, 32, 33, 100} {
		w := strings.Repeat("ab", n)[:n]
		docs = append(docs, "the "+w+" and "+w+"'s "+w+"x of", w[:n-1]+" "+w)
	}
	var many strings.Builder
	for i := range 20000 {
		many.WriteString(strings.Repeat(string(rune('a'+i%26)), 1+i%19))
		many.WriteString(string(rune('a'+i/26%26)) + string(rune('a'+i/676%26)) + " the ")
	}
	docs = append(docs, many.String(), many.String())
	for _, opts := range []Options{
		{}, {Lang: English}, {Lang: French}, {Lang: Russian}, {Lang: Undetermined},
		{NoStem: true}, {KeepNumbers: true, MinLength: 1}, {MinLength: 4, Lang: Spanish},
	} {
		memo := analysisDump(NewAnalyzer(opts), docs)
		opts.NoMemo = true
		plain := analysisDump(NewAnalyzer(opts), docs)
		if !slices.Equal(memo, plain) {
			for i := range min(len(memo), len(plain)) {
				if memo[i] != plain[i] {
					t.Fatalf("%+v: first difference at %d: memo %q, no memo %q", opts, i, memo[i], plain[i])
				}
			}
			t.Fatalf("%+v: %d items with the memo, %d without", opts, len(memo), len(plain))
		}
	}
}

// termNumbers returns a TermID function that numbers terms 0, 1, 2, … in
// the order first asked for, and the list of the terms it numbered.
func termNumbers() (*[]string, func(string) int32) {
	var terms []string
	ids := map[string]int32{}
	return &terms, func(term string) int32 {
		id, ok := ids[term]
		if !ok {
			id = int32(len(terms))
			ids[term] = id
			terms = append(terms, term)
		}
		return id
	}
}

// TestAnalyzeIDsMatchesAnalyze checks that AnalyzeIDs reports the terms
// of Analyze, through TermID, and that AddFormsTo adds the forms Analyze
// emits, with and without the memo.
func TestAnalyzeIDsMatchesAnalyze(t *testing.T) {
	docs := fixtureTexts(t)
	r := rand.New(rand.NewPCG(7, 8))
	for range 200 {
		docs = append(docs, randomTricky(r, 5))
	}
	for _, noMemo := range []bool{false, true} {
		terms, termID := termNumbers()
		withIDs := NewAnalyzer(Options{NoMemo: noMemo, TermID: termID})
		plain := NewAnalyzer(Options{NoMemo: true})
		var wantForms, gotForms DisplayForms
		var buf []int32
		for _, d := range docs {
			var want []string
			wantLang := plain.Analyze(d, func(term, surface string) {
				want = append(want, term)
				wantForms.Add(term, surface)
			})
			var lang Language
			buf, lang = withIDs.AnalyzeIDs(d, buf[:0])
			var got []string
			for _, id := range buf {
				got = append(got, (*terms)[id])
			}
			if lang != wantLang || !slices.Equal(got, want) {
				t.Fatalf("noMemo=%v: AnalyzeIDs(%q) = %q (%s), want %q (%s)", noMemo, d, got, lang, want, wantLang)
			}
		}
		withIDs.AddFormsTo(&gotForms)
		if gotForms.Len() != wantForms.Len() {
			t.Fatalf("noMemo=%v: forms of %d terms, want %d", noMemo, gotForms.Len(), wantForms.Len())
		}
		for term := range wantForms.index {
			if got, want := gotForms.Forms(term), wantForms.Forms(term); !slices.Equal(got, want) {
				t.Fatalf("noMemo=%v: forms of %q: %v, want %v", noMemo, term, got, want)
			}
		}
		// The counts were handed over: a second call adds nothing.
		var again DisplayForms
		withIDs.AddFormsTo(&again)
		if again.Len() != 0 {
			t.Fatalf("noMemo=%v: AddFormsTo twice added %d terms", noMemo, again.Len())
		}
	}
}

// TestAddFormsByIDMatchesAddFormsTo checks that the forms two analyzers
// count, summed under term IDs (AddFormsByID, then FormsByID.AddTo), are
// those their AddFormsTo sum under the terms, with and without the memo,
// and that AddTo keeps to the terms it is given.
func TestAddFormsByIDMatchesAddFormsTo(t *testing.T) {
	docs := fixtureTexts(t)
	r := rand.New(rand.NewPCG(9, 10))
	for range 200 {
		docs = append(docs, randomTricky(r, 5))
	}
	for _, noMemo := range []bool{false, true} {
		numbered, termID := termNumbers()
		byTerm := []*Analyzer{NewAnalyzer(Options{NoMemo: noMemo, TermID: termID}), NewAnalyzer(Options{NoMemo: noMemo, TermID: termID})}
		byID := []*Analyzer{NewAnalyzer(Options{NoMemo: noMemo, TermID: termID}), NewAnalyzer(Options{NoMemo: noMemo, TermID: termID})}
		var buf []int32
		for k, d := range docs {
			buf, _ = byTerm[k%2].AnalyzeIDs(d, buf[:0])
			buf, _ = byID[(k/3)%2].AnalyzeIDs(d, buf[:0])
		}
		terms := *numbered
		var want, got, some DisplayForms
		var f FormsByID
		for i := range 2 {
			byTerm[i].AddFormsTo(&want)
			byID[i].AddFormsByID(&f)
		}
		all := make([]int32, len(terms))
		for i := range all {
			all[i] = int32(i)
		}
		f.AddTo(&got, terms, all)
		if got.Len() != want.Len() || got.Len() == 0 {
			t.Fatalf("noMemo=%v: forms of %d terms, want %d", noMemo, got.Len(), want.Len())
		}
		for _, term := range terms {
			if g, w := got.Forms(term), want.Forms(term); !slices.Equal(g, w) {
				t.Fatalf("noMemo=%v: forms of %q: %v, want %v", noMemo, term, g, w)
			}
			if g, w := got.Form(term), want.Form(term); g != w {
				t.Fatalf("noMemo=%v: form of %q: %q, want %q", noMemo, term, g, w)
			}
		}
		// Every other term only, and added twice: counts double.
		var half []string
		var halfIDs []int32
		for i := 0; i < len(terms); i += 2 {
			half, halfIDs = append(half, terms[i]), append(halfIDs, int32(i))
		}
		f.AddTo(&some, half, halfIDs)
		f.AddTo(&some, half, halfIDs)
		if some.Len() != len(half) {
			t.Fatalf("noMemo=%v: AddTo of %d terms gave %d", noMemo, len(half), some.Len())
		}
		for _, term := range half {
			w := want.Forms(term)
			for i := range w {
				w[i].Count *= 2
			}
			if g := some.Forms(term); !slices.Equal(g, w) {
				t.Fatalf("noMemo=%v: forms of %q added twice: %v, want %v", noMemo, term, g, w)
			}
		}
	}
}

// FuzzAnalyzeFastPaths is the comparisons above on any input; its seeds
// run with the ordinary tests.
func FuzzAnalyzeFastPaths(f *testing.F) {
	for _, s := range trickyPieces {
		f.Add("Ab " + s + "c'd")
	}
	f.Fuzz(func(t *testing.T, text string) {
		checkNormalization(t, text)
		docs := []string{text, text, strings.ToUpper(text)}
		if memo, plain := analysisDump(NewAnalyzer(Options{}), docs), analysisDump(NewAnalyzer(Options{NoMemo: true}), docs); !slices.Equal(memo, plain) {
			t.Fatalf("memo %q, no memo %q", memo, plain)
		}
	})
}

// TestFirstNonASCII checks firstNonASCII against a byte loop, for a byte
// outside ASCII at every position of texts of up to 100 bytes (and none).
// Common practice, no outside source.
func TestFirstNonASCII(t *testing.T) {
	want := func(s string) int {
		for i := 0; i < len(s); i++ {
			if s[i] >= 0x80 {
				return i
			}
		}
		return len(s)
	}
	r := rand.New(rand.NewPCG(15, 16))
	for n := range 101 {
		b := make([]byte, n)
		for i := range b {
			b[i] = byte(r.IntN(0x80))
		}
		if got := firstNonASCII(string(b)); got != n {
			t.Fatalf("firstNonASCII of %d ASCII bytes = %d", n, got)
		}
		for p := range n {
			c := slices.Clone(b)
			c[p] = byte(0x80 + r.IntN(0x80))
			if p+1 < n && r.IntN(2) == 0 {
				c[p+1+r.IntN(n-p-1)] = 0xff // a second one after it
			}
			if got := firstNonASCII(string(c)); got != want(string(c)) {
				t.Fatalf("firstNonASCII(%q) = %d, want %d", c, got, want(string(c)))
			}
		}
	}
}

// BenchmarkFirstNonASCII scans 64 KiB of ASCII text, the whole of a plain
// English document's check before tokenising.
func BenchmarkFirstNonASCII(b *testing.B) {
	s := strings.Repeat("The river rose in the night; the footbridge held. ", 1311)
	b.SetBytes(int64(len(s)))
	for b.Loop() {
		if firstNonASCII(s) != len(s) {
			b.Fatal("non-ASCII")
		}
	}
}
