package textproc_test

import (
	"slices"
	"testing"

	"github.com/kljensen/snowball/english"
	"github.com/kljensen/snowball/french"
	"github.com/kljensen/snowball/hungarian"
	"github.com/kljensen/snowball/norwegian"
	"github.com/kljensen/snowball/russian"
	"github.com/kljensen/snowball/spanish"
	"github.com/kljensen/snowball/swedish"

	"assay/textproc"
)

// TestStopListsSizes checks the number of distinct words of each list
// against its source: the English list as stopwords.go describes it (the
// Snowball list, 174 words counted with Debian's liblingua-stopwords-perl
// 0.12-2 getStopWords('en'), plus the 7 words that kljensen adds); the
// others as Debian's liblingua-stopwords-perl 0.12-2 gives them
// (perl -MLingua::StopWords=getStopWords -e 'print scalar keys
// %{getStopWords("fr", "UTF-8")}' and so on).
func TestStopListsSizes(t *testing.T) {
	want := map[textproc.Language]int{
		textproc.English: 174 + 7, textproc.French: 155, textproc.Spanish: 308, textproc.Russian: 159,
		textproc.Swedish: 114, textproc.Norwegian: 172, textproc.Hungarian: 198,
	}
	for l, n := range want {
		if got := len(textproc.StopWords(l)); got != n {
			t.Errorf("%s: %d stop words, want %d", l, got, n)
		}
	}
	union := make(map[string]bool)
	for _, l := range textproc.Languages() {
		for _, w := range textproc.StopWords(l) {
			union[w] = true
		}
	}
	if got := len(textproc.StopWords(textproc.Undetermined)); got != len(union) {
		t.Errorf("Undetermined: %d stop words, want the union, %d", got, len(union))
	}
}

// TestStopListsNormalised checks that every stop word is already in the
// form the analyzer looks it up in (NFC, folded) and is one token, so that
// it can match at all. The Hungarian list has "ill." (an abbreviation with
// its full stop, as published), which can never match; it is the only
// exception.
func TestStopListsNormalised(t *testing.T) {
	a := textproc.NewAnalyzer(textproc.Options{})
	for _, l := range textproc.Languages() {
		for _, w := range textproc.StopWords(l) {
			if l == textproc.Hungarian && w == "ill." {
				continue
			}
			if n := a.Normalize(w); n != w {
				t.Errorf("%s stop word %q normalises to %q", l, w, n)
			}
			if toks := tokens(w); !slices.Equal(toks, []string{w}) {
				t.Errorf("%s stop word %q tokenises as %q", l, w, toks)
			}
		}
	}
}

// TestStopListsAgainstKljensen compares the lists with the IsStopWord
// functions of github.com/kljensen/snowball v0.10.0, an outside copy of
// the Snowball lists. French, Swedish and Hungarian agree word for word.
// The differences of the others were found by reading kljensen's
// common.go files and are listed here.
func TestStopListsAgainstKljensen(t *testing.T) {
	tests := []struct {
		lang       textproc.Language
		isStop     func(string) bool
		kljensen   int      // words on kljensen's list
		onlyOurs   []string // on our list, not on kljensen's
		onlyTheirs []string // on kljensen's list, not on ours
	}{
		// Our English list is the Snowball list joined with kljensen's:
		// kljensen lacks the contractions and "cannot", "could", "ought",
		// "would".
		{textproc.English, english.IsStopWord, 127, nil, nil},
		{textproc.French, french.IsStopWord, 155, nil, nil},
		{textproc.Swedish, swedish.IsStopWord, 114, nil, nil},
		{textproc.Hungarian, hungarian.IsStopWord, 198, nil, nil},
		// kljensen has misspellings ("vosostros") and forms of "sentir";
		// it lacks "sido", "siendo", "vosotras", "vosotros".
		{textproc.Spanish, spanish.IsStopWord, 313,
			[]string{"sido", "siendo", "vosotras", "vosotros"},
			[]string{"sentid", "sentida", "sentidas", "sentido", "sentidos", "siente", "sintiendo", "vosostras", "vosostros"}},
		// kljensen lacks eight words of the Snowball list.
		{textproc.Russian, russian.IsStopWord, 151,
			[]string{"говорил", "жизнь", "кажется", "сегодня", "сказал", "сказала", "сказать", "человек"}, nil},
		// kljensen's Norwegian list is another list altogether (it has
		// content words such as "arbeid", "verdi", "makt"); only the
		// words below are checked.
		{textproc.Norwegian, norwegian.IsStopWord, 119,
			[]string{"ikkje", "eg", "kva", "hjå"},
			[]string{"arbeid", "verdi", "makt", "tilstand"}},
	}
	for _, tt := range tests {
		t.Run(string(tt.lang), func(t *testing.T) {
			ours := textproc.StopWords(tt.lang)
			for _, w := range tt.onlyTheirs {
				if !tt.isStop(w) || textproc.IsStopWord(tt.lang, w) {
					t.Errorf("%q: kljensen %v, ours %v; want only kljensen's", w, tt.isStop(w), textproc.IsStopWord(tt.lang, w))
				}
			}
			if tt.lang == textproc.Norwegian {
				for _, w := range tt.onlyOurs {
					if tt.isStop(w) || !textproc.IsStopWord(tt.lang, w) {
						t.Errorf("%q: kljensen %v, ours %v; want only ours", w, tt.isStop(w), textproc.IsStopWord(tt.lang, w))
					}
				}
				return
			}
			shared := 0
			for _, w := range ours {
				switch {
				case tt.isStop(w):
					shared++
				case tt.lang == textproc.English && (slices.Contains([]string{"cannot", "could", "ought", "would"}, w) || containsApostrophe(w)):
				case slices.Contains(tt.onlyOurs, w):
				default:
					t.Errorf("%q is on our list, not on kljensen's", w)
				}
			}
			// kljensen's list has shared + len(onlyTheirs) words: then no
			// word of it is missing from ours but those named.
			if shared+len(tt.onlyTheirs) != tt.kljensen {
				t.Errorf("%d shared words + %d of kljensen's only = %d, want kljensen's %d",
					shared, len(tt.onlyTheirs), shared+len(tt.onlyTheirs), tt.kljensen)
			}
		})
	}
}

func containsApostrophe(w string) bool {
	for _, r := range w {
		if r == '\'' {
			return true
		}
	}
	return false
}
