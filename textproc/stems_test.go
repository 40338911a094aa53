package textproc_test

import (
	"bufio"
	"os"
	"path/filepath"
	"regexp"
	"slices"
	"strings"
	"testing"
	"unicode/utf8"

	"assay/textproc"
)

// Reasons why the stems of github.com/kljensen/snowball v0.10.0 differ
// from the Snowball reference (python3-snowballstemmer 2.2.0, which equals
// output.txt of Debian's snowball-data). Each was found by reading both
// implementations: python3-snowballstemmer's generated modules in
// /usr/lib/python3/dist-packages/snowballstemmer/ and kljensen/snowball's
// sources in the Go module cache.
const (
	// french_stemmer.py (2.2.0) rewrites ë as "He" and ï as "Hi" in its
	// prelude, before the regions are found, so that "ïque" and "ïsme"
	// leave the stem at the vowel before them; kljensen's french package
	// has no such rule.
	whyDiaeresis = "French ë/ï: the Snowball 2.2.0 prelude marks them (He/Hi); kljensen does not"
	// russian.Stem returns a word of at most 2 runes unchanged (len(w.RS)
	// <= 2); the reference still removes a one-letter ending.
	whyShort = "kljensen returns words of at most 2 runes (Russian) or 2 bytes (others) unchanged"
	// Snowball's among picks the longest suffix of the list that the word
	// ends with and removes it only if it lies in R1; kljensen's
	// hungarian.firstSuffixInR1 skips suffixes that are not in R1 and
	// removes a shorter one ("bot": the longest suffix "ot" is not in R1,
	// so Snowball keeps "bot"; kljensen removes "t").
	whyShorterSuffix = "Hungarian: kljensen falls back to a shorter suffix when the longest is not in R1"
	// The factive -á/-é after a doubled digraph ("nny", "lly"): the
	// reference removes the suffix and one letter of the double
	// ("látvánnyá" → "látvány"); kljensen's step5 rewrites the digraph
	// ("látvána").
	whyDoubleDigraph = "Hungarian: factive -á/-é after a doubled digraph (nny, lly) is mangled by kljensen"
	// The Russian superlative "ейш" must lie in R2; kljensen removes it
	// from "злейш" although R2 is empty there.
	whySuperlative = "Russian: kljensen removes the superlative ейш outside R2"
	// Words our tokenizer never produces: they hold '.', '-' or nothing but
	// apostrophes (kljensen treats those characters differently).
	whyNotAToken = "not a token of the analyzer (holds '.', '-' or only apostrophes)"
)

// stemDiff is a known difference: the stem kljensen gives and why.
type stemDiff struct{ got, why string }

// knownSampleDiffs lists every word of the golden samples
// (testdata/stems/<language>.tsv) whose stem differs from the reference,
// with the stem that the analyzer gives. The tests fail if one of them
// starts to agree (then remove it) or if any other word differs.
var knownSampleDiffs = map[textproc.Language]map[string]stemDiff{
	textproc.French: {
		"altaïques":       {"altaïqu", whyDiaeresis},
		"apotropaïque":    {"apotropaïqu", whyDiaeresis},
		"archaïque":       {"archaïqu", whyDiaeresis},
		"archaïsmes":      {"archaïsm", whyDiaeresis},
		"averroïstes":     {"averroïst", whyDiaeresis},
		"benzoïque":       {"benzoïqu", whyDiaeresis},
		"égoïstes":        {"égoïst", whyDiaeresis},
		"gaëlique":        {"gaëliqu", whyDiaeresis},
		"hautboïste":      {"hautboïst", whyDiaeresis},
		"hébraïques":      {"hébraïqu", whyDiaeresis},
		"héroïcité":       {"héroïc", whyDiaeresis},
		"héroïquement":    {"héroïqu", whyDiaeresis},
		"judaïque":        {"judaïqu", whyDiaeresis},
		"laïcisme":        {"laïcism", whyDiaeresis},
		"mésozoïque":      {"mésozoïqu", whyDiaeresis},
		"moëlle":          {"moëll", whyDiaeresis},
		"photovoltaïques": {"photovoltaïqu", whyDiaeresis},
		"ptolémaïque":     {"ptolémaïqu", whyDiaeresis},
		"shintoïstes":     {"shintoïst", whyDiaeresis},
	},
	textproc.Russian: {
		"аи": {"аи", whyShort},
		"эа": {"эа", whyShort},
	},
	textproc.Hungarian: {
		"békével": {"bé", whyShorterSuffix},
		"bére":    {"be", whyShorterSuffix},
		"kéken":   {"ké", whyShorterSuffix},
		"ködben":  {"kö", whyShorterSuffix},
		"löknek":  {"lö", whyShorterSuffix},
		"mait":    {"ma", whyShorterSuffix},
		"mán":     {"ma", whyShorterSuffix},
	},
}

// readStems reads a golden file of word<TAB>stem lines; '#' starts a
// comment line.
func readStems(t *testing.T, path string) [][2]string {
	t.Helper()
	f, err := os.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	var out [][2]string
	sc := bufio.NewScanner(f)
	for sc.Scan() {
		line := sc.Text()
		if line == "" || strings.HasPrefix(line, "#") {
			continue
		}
		w, s, ok := strings.Cut(line, "\t")
		if !ok {
			t.Fatalf("%s: bad line %q", path, line)
		}
		out = append(out, [2]string{w, s})
	}
	if err := sc.Err(); err != nil {
		t.Fatal(err)
	}
	return out
}

// analyzerPathWord reports whether Analyze in language l sees w as one
// kept word token, spelt as it is: then its single term must be l's key and
// the reference stem.
func analyzerPathWord(l textproc.Language, norm, w string) bool {
	if norm != w || strings.ContainsRune(w, '\'') || utf8.RuneCountInString(w) < textproc.DefaultMinLength {
		return false
	}
	if textproc.IsStopWord(l, w) || strings.Trim(w, "0123456789") == "" {
		return false
	}
	toks := tokens(w)
	return len(toks) == 1 && toks[0] == w
}

// TestStemsMatchSnowballReference compares the analyzer's stems with the
// Snowball reference on the golden samples in testdata/stems: words from
// the Snowball vocabularies of Debian's snowball-data, stems from Debian's
// python3-snowballstemmer 2.2.0 (the Python port generated from the
// Snowball reference implementation), written by
// testdata/stems/gen_stems.py. Every word is checked twice: through the
// stem function the analyzer chose for the language (StemWord, which adds
// the language's own mapping, ё → е for Russian), and, where the word is
// one kept token, through Analyze with Options.Lang set, memo on and off.
func TestStemsMatchSnowballReference(t *testing.T) {
	for _, l := range textproc.Languages() {
		t.Run(string(l), func(t *testing.T) {
			rows := readStems(t, filepath.Join("testdata", "stems", string(l)+".tsv"))
			if len(rows) < 2000 {
				t.Fatalf("%d words in the golden file, want at least 2000", len(rows))
			}
			known := knownSampleDiffs[l]
			seen := make(map[string]bool)
			memo := textproc.NewAnalyzer(textproc.Options{Lang: l})
			noMemo := textproc.NewAnalyzer(textproc.Options{Lang: l, NoMemo: true})
			equal, viaAnalyzer := 0, 0
			for _, row := range rows {
				w, want := row[0], row[1]
				got := textproc.StemWord(l, w)
				switch d, ok := known[w]; {
				case got == want && ok:
					t.Errorf("%q: stem %q now equals the reference; remove it from knownSampleDiffs", w, got)
				case got == want:
					equal++
				case ok && got == d.got:
					seen[w] = true
					t.Logf("known difference %q: reference %q, kljensen %q (%s)", w, want, got, d.why)
					want = got // the analyzer must agree with its stem function
				default:
					t.Errorf("%q: stem %q, reference %q", w, got, want)
					continue
				}
				if !analyzerPathWord(l, memo.Normalize(w), w) {
					continue
				}
				viaAnalyzer++
				for _, a := range []*textproc.Analyzer{memo, noMemo} {
					var terms []string
					lang := a.Analyze(w, func(term, _ string) { terms = append(terms, term) })
					if wantTerm := textproc.JoinTerm(l, want); lang != l || !slices.Equal(terms, []string{wantTerm}) {
						t.Errorf("Analyze(%q) = %q in %q, want [%q] in %q", w, terms, lang, wantTerm, l)
					}
				}
			}
			for w := range known {
				if !seen[w] && !slices.ContainsFunc(rows, func(r [2]string) bool { return r[0] == w }) {
					t.Errorf("knownSampleDiffs lists %q, which is not in the golden file", w)
				}
			}
			t.Logf("%s: %d words, %d equal to the reference, %d known differences; %d also checked through Analyze",
				l, len(rows), equal, len(seen), viaAnalyzer)
		})
	}
}

// hungarianShorterSuffix lists the words of the whole Hungarian vocabulary
// of snowball-data whose stems differ for whyShorterSuffix (found by
// TestStemsFullVocabulary with kljensen/snowball v0.10.0).
var hungarianShorterSuffix = strings.Fields(`
baki bamba bokában bokáig bokán bomba bot bottal bámul bán békében békéhez
békén békéről békét békével béke bére bért böknek jön kamat kamattal kedvel
krémmel kába kád kádban kára kávé kék kéken kém kért két ködbe ködben ködből
ködnek ködön ködöt köt leköt lével lébe lében lába lám lát lét löknek mai
maikor mainál mait maki mákot máként mán mára mát máig mába máról mától mért
nat`)

var doubledDigraphFactive = regexp.MustCompile(`(nny|lly)[áé]$`)

// fullVocabularyReason explains a difference on the whole vocabulary, or
// returns "".
func fullVocabularyReason(l textproc.Language, w, got string) string {
	switch {
	case strings.ContainsAny(w, ".-") || strings.Trim(w, "'") == "":
		return whyNotAToken
	case got == w && (len(w) <= 2 || l == textproc.Russian && utf8.RuneCountInString(w) <= 2):
		return whyShort
	case l == textproc.French && strings.ContainsAny(w, "ëï"):
		return whyDiaeresis
	case l == textproc.Hungarian && doubledDigraphFactive.MatchString(w):
		return whyDoubleDigraph
	case l == textproc.Hungarian && slices.Contains(hungarianShorterSuffix, w):
		return whyShorterSuffix
	case l == textproc.Russian && w == "злейший":
		return whySuperlative
	}
	return ""
}

// TestStemsFullVocabulary compares the stem functions with the whole
// Snowball vocabulary of each language as Debian's snowball-data ships it
// (/usr/share/snowball/data/<language>/voc.txt and output.txt, the
// reference stems), when that package is installed: `apt-get install
// snowball-data`. Every difference must have one of the reasons above; the
// counts are logged.
func TestStemsFullVocabulary(t *testing.T) {
	const dir = "/usr/share/snowball/data"
	if _, err := os.Stat(dir); err != nil {
		t.Skipf("Debian's snowball-data is not installed (%v)", err)
	}
	for _, l := range textproc.Languages() {
		t.Run(string(l), func(t *testing.T) {
			voc := readLines(t, filepath.Join(dir, string(l), "voc.txt"))
			out := readLines(t, filepath.Join(dir, string(l), "output.txt"))
			if len(voc) != len(out) {
				t.Fatalf("voc.txt has %d lines, output.txt %d", len(voc), len(out))
			}
			reasons := make(map[string]int)
			for i, w := range voc {
				got := textproc.StemWord(l, w)
				if got == out[i] {
					continue
				}
				why := fullVocabularyReason(l, w, got)
				if why == "" {
					t.Errorf("%q: stem %q, reference %q", w, got, out[i])
					continue
				}
				reasons[why]++
			}
			n := 0
			for why, c := range reasons {
				n += c
				t.Logf("%d × %s", c, why)
			}
			t.Logf("%s: %d words, %d differ from the reference", l, len(voc), n)
		})
	}
}

func readLines(t *testing.T, path string) []string {
	t.Helper()
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	return strings.Split(strings.TrimSuffix(string(b), "\n"), "\n")
}
