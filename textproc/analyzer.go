package textproc

import (
	"strings"
	"unicode"
	"unicode/utf8"

	"github.com/kljensen/snowball/english"
	"golang.org/x/text/cases"
	"golang.org/x/text/unicode/norm"
)

// DefaultMinLength is the shortest token, in runes, that is kept.
const DefaultMinLength = 2

// Options configures an [Analyzer]. The zero value is the documented default.
type Options struct {
	// MinLength is the shortest token kept, in runes; 0 means
	// DefaultMinLength.
	MinLength int
	// KeepNumbers keeps tokens made only of digits.
	KeepNumbers bool
	// NoStem turns stemming off: each token is its own term.
	NoStem bool
}

// Analyzer turns text into stemmed index terms. Build one with
// [NewAnalyzer]; it is not safe for concurrent use.
type Analyzer struct {
	opts Options
	fold cases.Caser
	memo map[string]memoEntry // folded token -> its analysis
}

// memoEntry is the analysis of one distinct token. surface is the memo's
// own copy of the token, so that callers never see the scratch buffer.
type memoEntry struct {
	stem    string // "" when the token is dropped
	surface string
}

// NewAnalyzer returns an English analyzer configured by opts.
func NewAnalyzer(opts Options) *Analyzer {
	if opts.MinLength <= 0 {
		opts.MinLength = DefaultMinLength
	}
	return &Analyzer{
		opts: opts,
		fold: cases.Fold(),
		memo: make(map[string]memoEntry),
	}
}

// Normalize returns text in NFC with full case folding applied, the form
// that tokenising works on.
func (a *Analyzer) Normalize(text string) string {
	return a.fold.String(norm.NFC.String(text))
}

// Analyze calls emit once for every kept token of text, in text order,
// with the token's stem and its surface form (the folded token). The
// strings passed to emit stay valid after emit returns.
func (a *Analyzer) Analyze(text string, emit func(stem, surface string)) {
	Tokenize(a.Normalize(text), func(tok string) {
		e, ok := a.memo[tok]
		if !ok {
			key := strings.Clone(tok)
			e = a.analyzeToken(key)
			a.memo[key] = e
		}
		if e.stem != "" {
			emit(e.stem, e.surface)
		}
	})
}

// analyzeToken analyses one folded token.
func (a *Analyzer) analyzeToken(tok string) memoEntry {
	if IsEnglishStopWord(tok) { // before the possessive rule: "let's"
		return memoEntry{surface: tok}
	}
	surface := strings.TrimSuffix(tok, "'s")
	return memoEntry{stem: a.term(surface), surface: surface}
}

// term analyses one folded token with no possessive: "" when the token is
// dropped.
func (a *Analyzer) term(tok string) string {
	if tok == "" || utf8.RuneCountInString(tok) < a.opts.MinLength {
		return ""
	}
	if !a.opts.KeepNumbers && allDigits(tok) {
		return ""
	}
	if IsEnglishStopWord(tok) {
		return ""
	}
	if a.opts.NoStem {
		return strings.Clone(tok)
	}
	// english.Stem lower-cases and trims again, which is harmless on a
	// folded token; stop words were removed above, so the flag is moot.
	return english.Stem(tok, true)
}

func allDigits(s string) bool {
	for _, r := range s {
		if !unicode.IsDigit(r) {
			return false
		}
	}
	return true
}

// isWordStart reports a letter or digit, which can start or continue a
// token.
func isWordStart(r rune) bool {
	return unicode.IsLetter(r) || unicode.IsDigit(r)
}

// isMark reports a combining mark (Mn, Mc) other than a variation selector:
// variation selectors (U+FE00–U+FE0F, U+E0100–U+E01EF) only choose how an
// emoji or ideograph is drawn and belong to no word.
func isMark(r rune) bool {
	if (r >= 0xfe00 && r <= 0xfe0f) || (r >= 0xe0100 && r <= 0xe01ef) {
		return false
	}
	return unicode.Is(unicode.Mn, r) || unicode.Is(unicode.Mc, r)
}

func isApostrophe(r rune) bool {
	return r == '\'' || r == '\u2019' || r == '\u02bc'
}

// Tokenize splits already-normalised text into tokens by the rule in the
// package documentation and calls fn with each. Apostrophes inside a token
// are written as U+0027; a possessive "'s" is left on (the analyzer removes
// it after the stop-list look-up, so that "let's" can match the list). The
// string passed to fn is only valid during the call.
func Tokenize(text string, fn func(tok string)) {
	var buf []byte
	flush := func() {
		if len(buf) > 0 {
			fn(unsafeString(buf))
		}
		buf = buf[:0]
	}
	for i := 0; i < len(text); {
		r, size := utf8.DecodeRuneInString(text[i:])
		switch {
		case isApostrophe(r):
			// Checked before the letter test: U+02BC is a letter (Lm).
			next, _ := utf8.DecodeRuneInString(text[i+size:])
			if len(buf) > 0 && i+size < len(text) && isWordStart(next) {
				buf = append(buf, '\'')
			} else {
				flush()
			}
		case isWordStart(r):
			buf = utf8.AppendRune(buf, r)
		case isMark(r) && len(buf) > 0:
			// A combining mark continues a token but never starts one.
			buf = utf8.AppendRune(buf, r)
		default:
			flush()
		}
		i += size
	}
	flush()
}
