package textproc

import (
	"bufio"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/kljensen/snowball/english"
)

// englishTestWords returns the words of the English stem golden file
// (testdata/stems/english.tsv, a sample of the Snowball vocabulary) and,
// when Debian's snowball-data is installed, the whole vocabulary in
// /usr/share/snowball/data/english/voc.txt.
func englishTestWords(t *testing.T) []string {
	t.Helper()
	var words []string
	read := func(path string, tsv bool) {
		f, err := os.Open(path)
		if err != nil {
			if tsv {
				t.Fatal(err)
			}
			t.Logf("not compared: %v (Debian's snowball-data is not installed)", err)
			return
		}
		defer f.Close()
		sc := bufio.NewScanner(f)
		for sc.Scan() {
			line := sc.Text()
			if tsv {
				if strings.HasPrefix(line, "#") {
					continue
				}
				line, _, _ = strings.Cut(line, "\t")
			}
			words = append(words, line)
		}
		if err := sc.Err(); err != nil {
			t.Fatal(err)
		}
	}
	read(filepath.Join("testdata", "stems", "english.tsv"), true)
	read("/usr/share/snowball/data/english/voc.txt", false)
	return words
}

// porter2Pieces are the pieces generated words are made of: every suffix
// and prefix the English steps look for, the exception words, and the
// letter patterns the regions and short syllables depend on.
var porter2Pieces = strings.Fields(`
	's' 's ' sses ied ies us ss s eedly ingly edly ing eed ed at bl iz bb dd
	ff gg mm nn pp rr tt ll y yy ay oy ey ational fulness iveness ization
	ousness biliti lessli tional alism aliti ation entli fulli iviti ousli
	anci abli alli ator enci izer bli ogi logi li cli dli eli gli hli kli
	mli nli rli tli alize icate ative iciti ical ful ness ement ance ence
	able ible ment ent ant ism ate iti ous ive ize ion sion tion al er ic e
	le w x wx gener commun arsen skis skies dying lying tying idly gently
	ugly early only singly sky news howe atlas cosmos bias andes inning
	outing canning herring earring proceed exceed succeed 0 7 42`)

// generatedEnglishWords returns n words made, with a fixed seed, of random
// letters and porter2Pieces, so that every branch of every step is taken
// many times.
func generatedEnglishWords(n int) []string {
	r := rand.New(rand.NewPCG(7, 11))
	const letters = "abcdefghijklmnopqrstuvwxyzaeiouyaeiou"
	words := make([]string, 0, n)
	var b strings.Builder
	for len(words) < n {
		b.Reset()
		for k := r.IntN(4); k >= 0; k-- {
			if r.IntN(3) == 0 {
				b.WriteString(porter2Pieces[r.IntN(len(porter2Pieces))])
				continue
			}
			for l := 1 + r.IntN(4); l > 0; l-- {
				b.WriteByte(letters[r.IntN(len(letters))])
			}
		}
		w := b.String()
		if len(w) > 0 && w[0] != '\'' || r.IntN(8) == 0 {
			words = append(words, w)
		}
	}
	return words
}

// TestStemEnglishMatchesKljensen checks that stemEnglish gives exactly the
// stem of github.com/kljensen/snowball v0.10.0's english.Stem(w, true),
// the implementation it replaces (and which TestStemsMatchSnowballReference
// and TestStemsFullVocabulary compare with the Snowball reference stems),
// on the Snowball English vocabulary and on 400,000 generated words, half
// of them with a letter changed to one the fast path does not take.
func TestStemEnglishMatchesKljensen(t *testing.T) {
	words := englishTestWords(t)
	gen := generatedEnglishWords(400_000)
	r := rand.New(rand.NewPCG(3, 5))
	odd := []string{"Y", "É", "é", "-", ".", " ", "\u2019", "A", "ß"}
	for i := 0; i < len(gen); i += 2 {
		w := gen[i]
		k := r.IntN(len(w) + 1)
		gen[i] = w[:k] + odd[r.IntN(len(odd))] + w[k:]
	}
	words = append(words, gen...)
	words = append(words, "", "'", "''", "'s", "a", "ab", "y", "yy", "sky's", strings.Repeat("ab", 40)+"ing")
	fast, diffs := 0, 0
	for _, w := range words {
		if plainEnglish(w) {
			fast++
		}
		if got, want := stemEnglish(w), english.Stem(w, true); got != want {
			if diffs++; diffs <= 20 {
				t.Errorf("stemEnglish(%q) = %q, english.Stem = %q", w, got, want)
			}
		}
	}
	if diffs > 0 {
		t.Errorf("%d of %d words differ", diffs, len(words))
	}
	if fast < len(words)/3 {
		t.Errorf("only %d of %d words took the fast path", fast, len(words))
	}
	t.Logf("%d words compared, %d through the byte path", len(words), fast)
}

func BenchmarkStemEnglish(b *testing.B) {
	words := generatedEnglishWords(4096)
	for _, f := range []struct {
		name string
		stem func(string) string
	}{{"bytes", stemEnglish}, {"kljensen", func(w string) string { return english.Stem(w, true) }}} {
		b.Run(f.name, func(b *testing.B) {
			for i := 0; b.Loop(); i++ {
				f.stem(words[i%len(words)])
			}
		})
	}
}
