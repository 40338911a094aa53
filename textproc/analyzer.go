package textproc

import (
	"fmt"
	"strings"
	"unicode"
	"unicode/utf8"

	"golang.org/x/text/cases"
	"golang.org/x/text/unicode/norm"
)

// DefaultMinLength is the shortest token, in runes, that is kept.
const DefaultMinLength = 2

// Options configures an [Analyzer]. The zero value is the documented default.
type Options struct {
	// MinLength is the shortest word token kept, in runes; 0 means
	// DefaultMinLength. Bigram-script tokens are always kept.
	MinLength int
	// KeepNumbers keeps tokens made only of digits.
	KeepNumbers bool
	// NoStem turns stemming off: each token is its own term (still keyed
	// with its language).
	NoStem bool
	// Lang is the language of every document. "" or Auto detects the
	// language of each document; Undetermined analyses every document
	// without a language. Any other value than these constants makes
	// NewAnalyzer panic: check user input with ParseLanguage.
	Lang Language
	// NoMemo turns the memo off: every token is analysed (and stemmed)
	// afresh. For benchmarks; the terms are the same.
	NoMemo bool
}

// Analyzer turns text into index terms. Build one with [NewAnalyzer]; it is
// not safe for concurrent use.
type Analyzer struct {
	opts  Options
	fixed int // index in langTable of Options.Lang, or -1 to detect
	fold  cases.Caser
	tok   tokenizer
	memo  [numLangs]map[string]memoEntry // per language: folded token -> its analysis
	grams map[string]memoEntry           // bigram -> its term
	last  Detection
}

// memoEntry is the analysis of one distinct token. term and surface are
// the memo's own strings, so that callers never see the scratch buffer.
type memoEntry struct {
	term    string // "" when the token is dropped
	surface string
}

// NewAnalyzer returns an analyzer configured by opts. It panics if
// opts.Lang is not one of the Language constants or "".
func NewAnalyzer(opts Options) *Analyzer {
	if opts.MinLength <= 0 {
		opts.MinLength = DefaultMinLength
	}
	a := &Analyzer{opts: opts, fixed: -1, fold: cases.Fold()}
	if opts.Lang != "" && opts.Lang != Auto {
		i, ok := langIndex(opts.Lang)
		if !ok {
			panic(fmt.Sprintf("textproc: NewAnalyzer with unknown language %q", opts.Lang))
		}
		a.fixed = i
	}
	if !opts.NoMemo {
		for i := range a.memo {
			a.memo[i] = make(map[string]memoEntry)
		}
		a.grams = make(map[string]memoEntry)
	}
	return a
}

// Normalize returns text in NFC with full case folding applied, the form
// that tokenising works on.
func (a *Analyzer) Normalize(text string) string {
	return a.fold.String(norm.NFC.String(text))
}

// Analyze calls emit once for every kept token of text, in text order,
// with the token's index term and its surface form (the folded token, with
// a possessive or an elided article removed), and returns the language
// used for the document: Options.Lang when it is fixed, else the detected
// language or Undetermined. The strings passed to emit stay valid after
// emit returns.
func (a *Analyzer) Analyze(text string, emit func(term, surface string)) Language {
	a.tok.reset()
	a.tok.run(a.Normalize(text))
	doc := a.fixed
	if doc < 0 {
		a.last = detect(&a.tok)
		doc, _ = langIndex(a.last.Lang)
	}
	docScript := langTable[doc].script
	for _, ref := range a.tok.refs {
		b := a.tok.token(ref)
		var e memoEntry
		if ref.kind == tokGram {
			e = a.gram(b)
		} else {
			i := doc
			if ref.script != docScript {
				i = idxUnd // a number, or a word in another script
			}
			e = a.word(i, b)
		}
		if e.term != "" {
			emit(e.term, e.surface)
		}
	}
	return langTable[doc].lang
}

// LastDetection returns the language detection of the last Analyze call
// that detected one (Options.Lang "" or Auto); the zero Detection before
// that.
func (a *Analyzer) LastDetection() Detection { return a.last }

// word returns the analysis of the word token b in language langTable[i],
// from the memo when it is on.
func (a *Analyzer) word(i int, b []byte) memoEntry {
	m := a.memo[i]
	if m != nil {
		if e, ok := m[string(b)]; ok {
			return e
		}
	}
	key := string(b)
	e := a.analyzeWord(&langTable[i], key)
	if m != nil {
		m[key] = e
	}
	return e
}

// gram returns the term of the bigram-script token b.
func (a *Analyzer) gram(b []byte) memoEntry {
	if a.grams != nil {
		if e, ok := a.grams[string(b)]; ok {
			return e
		}
	}
	surface := string(b)
	e := memoEntry{term: langTable[idxUnd].prefix + surface, surface: surface}
	if a.grams != nil {
		a.grams[surface] = e
	}
	return e
}

// analyzeWord analyses one folded word token, which the caller owns, in
// language li (doc.go, "The analysis, step by step", steps 4 to 7).
func (a *Analyzer) analyzeWord(li *langInfo, tok string) memoEntry {
	if li.strip != nil {
		tok = li.strip(tok)
	}
	look := tok
	if li.prep != nil {
		look = li.prep(tok)
	}
	if _, stop := li.stop[look]; stop { // before the possessive rule: "let's"
		return memoEntry{surface: tok}
	}
	if li.poss {
		tok = strings.TrimSuffix(tok, "'s")
		look = tok
	}
	return memoEntry{term: a.term(li, look), surface: tok}
}

// term returns the index term of the folded token w (mapped by li.prep),
// or "" when the token is dropped.
func (a *Analyzer) term(li *langInfo, w string) string {
	if w == "" || utf8.RuneCountInString(w) < a.opts.MinLength {
		return ""
	}
	if !a.opts.KeepNumbers && allDigits(w) {
		return ""
	}
	if _, stop := li.stop[w]; stop {
		return ""
	}
	if a.opts.NoStem || li.stem == nil {
		return li.prefix + w
	}
	return li.prefix + li.stem(w)
}

func allDigits(s string) bool {
	for _, r := range s {
		if !unicode.IsDigit(r) {
			return false
		}
	}
	return true
}
