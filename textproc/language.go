package textproc

import (
	"fmt"
	"strings"

	"github.com/kljensen/snowball/french"
	"github.com/kljensen/snowball/hungarian"
	"github.com/kljensen/snowball/norwegian"
	"github.com/kljensen/snowball/russian"
	"github.com/kljensen/snowball/spanish"
	"github.com/kljensen/snowball/swedish"
)

// Language names a language of analysis. The values are the lower-case
// English names of the languages that github.com/kljensen/snowball stems,
// plus [Undetermined] and [Auto].
type Language string

// The languages of analysis.
const (
	English   Language = "english"
	French    Language = "french"
	Spanish   Language = "spanish"
	Russian   Language = "russian"
	Swedish   Language = "swedish"
	Norwegian Language = "norwegian"
	Hungarian Language = "hungarian"

	// Undetermined is the language of a document whose language was not
	// detected with enough confidence, and of every term that belongs to
	// no language (character bigrams, numbers, words in a script the
	// document's language is not written in). Its terms are not stemmed.
	Undetermined Language = "und"

	// Auto asks for the language of each document to be detected; it is
	// never the language of a document. [Options.Lang] "" means Auto.
	Auto Language = "auto"
)

// Languages returns the languages that can be detected and stemmed, in a
// fixed order (the order of the constants).
func Languages() []Language {
	out := make([]Language, 0, len(stemmed))
	for i := range stemmed {
		out = append(out, langTable[i].lang)
	}
	return out
}

// String returns the language's name.
func (l Language) String() string { return string(l) }

// Code returns the language's ISO 639-1 code ("en", "fr", "es", "ru", "sv",
// "no", "hu"), "und" for [Undetermined], and "" for [Auto] or an unknown
// value.
func (l Language) Code() string {
	if i, ok := langIndex(l); ok {
		return langTable[i].code
	}
	return ""
}

// ParseLanguage turns a user's choice into a Language. It accepts the
// names of the constants and the ISO 639-1 codes, in any case ("French",
// "fr"), "nb" as Norwegian, "und", and "auto" or "" for [Auto].
func ParseLanguage(s string) (Language, error) {
	s = strings.ToLower(strings.TrimSpace(s))
	switch s {
	case "", "auto":
		return Auto, nil
	case "nb":
		return Norwegian, nil
	}
	for i := range langTable {
		if s == string(langTable[i].lang) || s == langTable[i].code {
			return langTable[i].lang, nil
		}
	}
	names := []string{"auto"}
	for _, l := range Languages() {
		names = append(names, string(l))
	}
	names = append(names, string(Undetermined))
	return "", fmt.Errorf("textproc: unknown language %q (want one of %s)", s, strings.Join(names, ", "))
}

// JoinTerm returns the index term of stem in language l, by the keying
// rule of the package documentation: English stems are bare, every other
// language's stem carries its code and a colon ("fr:maison", "und:水道").
// It is the inverse of [SplitTerm].
func JoinTerm(l Language, stem string) string {
	i, ok := langIndex(l)
	if !ok {
		panic(fmt.Sprintf("textproc: JoinTerm with language %q", l))
	}
	return langTable[i].prefix + stem
}

// SplitTerm returns the language of an index term made by an [Analyzer]
// and its bare stem (or bare form, for unstemmed terms): SplitTerm("fr:maison")
// is (French, "maison"), SplitTerm("flood") is (English, "flood"). A token
// never holds a colon, so a term without one of the known prefixes is
// English.
func SplitTerm(term string) (Language, string) {
	if i := strings.IndexByte(term, ':'); i > 0 {
		code := term[:i]
		for j := range langTable {
			if langTable[j].prefix != "" && code == langTable[j].code {
				return langTable[j].lang, term[i+1:]
			}
		}
	}
	return English, term
}

// script is the writing system a word token is written in: the script of
// its first letter.
type script uint8

const (
	scriptNone     script = iota // no letter: a number
	scriptLatin                  // unicode.Latin
	scriptCyrillic               // unicode.Cyrillic
	scriptOther                  // any other script (Greek, Arabic, …)
	scriptGram                   // not a script: marks a bigram token in Analyzer.sc
)

// langInfo is what the analyzer needs of one language. Everything in it is
// fixed when the package is initialised, so it is safe to share.
type langInfo struct {
	lang   Language
	code   string
	prefix string              // "" for English, code + ":" otherwise
	script script              // the script the language is written in
	stem   func(string) string // the Snowball stemmer, chosen once; nil for und
	stop   map[string]struct{} // the stop list
	prep   func(string) string // maps a token before stop list and stemmer; nil for none
	strip  func(string) string // removes clitics before analysis (elision); nil for none
	poss   bool                // English possessive rule
}

// The indices of langTable. The languages that are stemmed come first, so
// that stemmed = langTable[:numStemmed].
const (
	idxEnglish = iota
	idxFrench
	idxSpanish
	idxRussian
	idxSwedish
	idxNorwegian
	idxHungarian
	idxUnd
	numLangs
	numStemmed = idxUnd
)

// stemWith wraps a kljensen/snowball Stem function. The analyzer removes
// stop words itself, before stemming, so the stemmer's own stop list is
// never consulted (stemStopWords = true). Each Stem lower-cases and trims
// again, which is harmless on a folded token.
func stemWith(f func(string, bool) string) func(string) string {
	return func(w string) string { return f(w, true) }
}

// russianYo maps ё to е, as the Snowball Russian algorithm does before it
// stems (snowballstemmer 2.2.0, russian_stemmer.py, replaces every "\u0451"
// by "\u0435" first; kljensen/snowball v0.10.0 does not). The stop list is
// written with е as well ("еще", "ее").
func russianYo(w string) string {
	if strings.Contains(w, "ё") {
		return strings.ReplaceAll(w, "ё", "е")
	}
	return w
}

// frenchElisions are the French words that lose their vowel before a vowel
// and are written joined to the next word with an apostrophe ("l'eau",
// "qu'il", "jusqu'à"). List written from memory.
var frenchElisions = makeSet(`c d j l m n s t qu jusqu lorsqu puisqu quoiqu`)

// frenchElide removes leading elided words: "l'eau" → "eau",
// "qu'aujourd'hui" → "aujourd'hui". A token that is nothing but an elided
// word and an apostrophe cannot occur (an apostrophe is only kept between
// two word characters).
func frenchElide(w string) string {
	for {
		i := strings.IndexByte(w, '\'')
		if i <= 0 {
			return w
		}
		if _, ok := frenchElisions[w[:i]]; !ok {
			return w
		}
		w = w[i+1:]
	}
}

var (
	stemmed   []langInfo         // langTable[:numStemmed]
	langTable [numLangs]langInfo // indexed by idx*
	// stopMask maps a stop word to the set of languages (bit i for
	// langTable[i]) whose list holds it. It serves language detection
	// with one look-up per token.
	stopMask map[string]uint8
	// anyStop is the union of every stop list: the list of [Undetermined].
	anyStop map[string]struct{}
)

func init() {
	langTable = [numLangs]langInfo{
		idxEnglish:   {lang: English, code: "en", script: scriptLatin, stem: stemEnglish, stop: englishStopWords, poss: true},
		idxFrench:    {lang: French, code: "fr", script: scriptLatin, stem: stemWith(french.Stem), stop: frenchStopWords, strip: frenchElide},
		idxSpanish:   {lang: Spanish, code: "es", script: scriptLatin, stem: stemWith(spanish.Stem), stop: spanishStopWords},
		idxRussian:   {lang: Russian, code: "ru", script: scriptCyrillic, stem: stemWith(russian.Stem), stop: russianStopWords, prep: russianYo},
		idxSwedish:   {lang: Swedish, code: "sv", script: scriptLatin, stem: stemWith(swedish.Stem), stop: swedishStopWords},
		idxNorwegian: {lang: Norwegian, code: "no", script: scriptLatin, stem: stemWith(norwegian.Stem), stop: norwegianStopWords},
		idxHungarian: {lang: Hungarian, code: "hu", script: scriptLatin, stem: stemWith(hungarian.Stem), stop: hungarianStopWords},
		idxUnd:       {lang: Undetermined, code: "und", script: scriptNone},
	}
	stopMask = make(map[string]uint8)
	anyStop = make(map[string]struct{})
	for i := range langTable {
		li := &langTable[i]
		if li.lang != English {
			li.prefix = li.code + ":"
		}
		for w := range li.stop {
			stopMask[w] |= 1 << i
			anyStop[w] = struct{}{}
		}
	}
	langTable[idxUnd].stop = anyStop
	stemmed = langTable[:numStemmed]
}

// langIndex returns the index in langTable of l.
func langIndex(l Language) (int, bool) {
	for i := range langTable {
		if langTable[i].lang == l {
			return i, true
		}
	}
	return 0, false
}
