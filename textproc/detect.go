package textproc

import (
	"bytes"
	"math/bits"
	"unicode/utf8"
)

// The thresholds of language detection; the rule is in the package
// documentation ("Language detection").
const (
	// DetectMinHits is the fewest stop words of the best language that a
	// document must hold.
	DetectMinHits = 2
	// DetectMinShare is the smallest share of the document's tokens (of the
	// candidate script) that must be stop words of the best language.
	DetectMinShare = 0.15
	// DetectMinMargin is the smallest lead, in tokens, of the best language
	// over the second.
	DetectMinMargin = 2
)

// Detection is the outcome of language detection for one document.
type Detection struct {
	// Lang is the decision: Best when every threshold is met, else
	// Undetermined.
	Lang Language
	// Best and Second are the candidates with the highest and the second
	// highest score, ties going to the earlier in [Languages]; "" when
	// there is no such candidate (no token of a detectable script, or
	// Russian, the only Cyrillic candidate, has no second).
	Best, Second Language
	// BestScore and SecondScore are their scores: the tokens that are stop
	// words of the language plus the words that hold a letter marking it.
	BestScore, SecondScore int
	// BestStops counts the tokens that are stop words of Best.
	BestStops int
	// Tokens counts the tokens of the candidate script, the denominator of
	// the share.
	Tokens int
}

// Share returns the share of the tokens that are stop words of Best: 0
// when there are no tokens.
func (d Detection) Share() float64 {
	if d.Tokens == 0 {
		return 0
	}
	return float64(d.BestStops) / float64(d.Tokens)
}

// Margin returns BestScore − SecondScore.
func (d Detection) Margin() int { return d.BestScore - d.SecondScore }

// DetectLanguage normalises text as an [Analyzer] does and detects its
// language by the rule of the package documentation.
func DetectLanguage(text string) Detection {
	a := NewAnalyzer(Options{NoMemo: true})
	a.tok.run(a.Normalize(text))
	return detect(&a.tok)
}

// Masks of the candidates of each script in stopMask values.
const (
	cyrillicCandidates uint8 = 1 << idxRussian
	latinCandidates    uint8 = (1<<numStemmed - 1) &^ cyrillicCandidates
)

// Bits of the Latin-script candidates, for letterMarks.
const (
	bitFR = 1 << idxFrench
	bitES = 1 << idxSpanish
	bitSV = 1 << idxSwedish
	bitNO = 1 << idxNorwegian
	bitHU = 1 << idxHungarian
)

// letterMarks maps a letter found in the alphabet of only one or two of the
// Latin-script candidates to those candidates (the alphabets as taught for
// each language, written from memory; English has no such letter). A word
// holding one of them counts as one hit for each language named, as a stop
// word of those languages would.
var letterMarks = map[rune]uint8{
	'à': bitFR, 'â': bitFR, 'ç': bitFR, 'è': bitFR, 'ê': bitFR, 'ë': bitFR,
	'î': bitFR, 'ï': bitFR, 'ô': bitFR, 'ù': bitFR, 'û': bitFR, 'ÿ': bitFR,
	'œ': bitFR,
	'ñ': bitES,
	'á': bitES | bitHU, 'í': bitES | bitHU, 'ó': bitES | bitHU, 'ú': bitES | bitHU,
	'ü': bitES | bitHU,
	'ő': bitHU, 'ű': bitHU,
	'ö': bitSV | bitHU,
	'ä': bitSV,
	'å': bitSV | bitNO,
	'æ': bitNO, 'ø': bitNO,
}

// lettersMask returns the union of letterMarks over the letters of tok.
func lettersMask(tok []byte) uint8 {
	var m uint8
	for i := 0; i < len(tok); {
		if tok[i] < utf8.RuneSelf {
			i++
			continue
		}
		r, size := utf8.DecodeRune(tok[i:])
		m |= letterMarks[r]
		i += size
	}
	return m
}

// tokenFacts is what one word token adds to the counts of language
// detection (rule step 1 and the scores of step 2).
type tokenFacts struct {
	stops  [numStemmed]int // pieces on each candidate's stop list
	marks  uint8           // candidates marked by a letter of the token (Latin only)
	pieces int             // pieces between apostrophes
}

// wordFacts returns the facts of the word token tok, whose first letter is
// of script sc; the zero facts for a script that has no candidate.
func wordFacts(tok []byte, sc script) tokenFacts {
	var f tokenFacts
	var cand uint8
	switch sc {
	case scriptLatin:
		cand = latinCandidates
		f.marks = lettersMask(tok)
	case scriptCyrillic:
		cand = cyrillicCandidates
	default:
		return f
	}
	for len(tok) > 0 { // each piece between apostrophes counts
		piece := tok
		if i := bytes.IndexByte(tok, '\''); i >= 0 {
			piece, tok = tok[:i], tok[i+1:]
		} else {
			tok = nil
		}
		f.pieces++
		if cand == cyrillicCandidates && bytes.Contains(piece, yo) {
			piece = []byte(russianYo(string(piece)))
		}
		for m := stopMask[string(piece)] & cand; m != 0; m &= m - 1 {
			f.stops[bits.TrailingZeros8(m)]++
		}
	}
	return f
}

var yo = []byte("ё")

// detect applies the detection rule to the word tokens held by t.
func detect(t *tokenizer) Detection {
	var (
		stops, marks   [numStemmed]int
		nLatin, nCyril int
	)
	for _, ref := range t.refs {
		if ref.kind != tokWord || (ref.script != scriptLatin && ref.script != scriptCyrillic) {
			continue
		}
		f := wordFacts(t.token(ref), ref.script)
		if ref.script == scriptCyrillic {
			nCyril += f.pieces
		} else {
			nLatin += f.pieces
		}
		for m := f.marks; m != 0; m &= m - 1 {
			marks[bits.TrailingZeros8(m)]++
		}
		for i, n := range f.stops {
			stops[i] += n
		}
	}
	return decide(&stops, &marks, nLatin, nCyril)
}

// decide applies steps 1 (the choice of script), 3 and 4 of the detection
// rule to the counts of a document: the stop words and marked words of
// each candidate, and the pieces of each script.
func decide(stops, marks *[numStemmed]int, nLatin, nCyril int) Detection {
	d := Detection{Lang: Undetermined}
	cand, n := latinCandidates, nLatin
	if nCyril > nLatin {
		cand, n = cyrillicCandidates, nCyril
	}
	d.Tokens = n
	if n == 0 {
		return d
	}
	var score [numStemmed]int
	for i := range score {
		score[i] = stops[i] + marks[i]
	}
	best, second := -1, -1
	for i := range numStemmed {
		if cand&(1<<i) == 0 {
			continue
		}
		switch {
		case best < 0 || score[i] > score[best]:
			best, second = i, best
		case second < 0 || score[i] > score[second]:
			second = i
		}
	}
	d.Best, d.BestScore, d.BestStops = langTable[best].lang, score[best], stops[best]
	if second >= 0 {
		d.Second, d.SecondScore = langTable[second].lang, score[second]
	}
	if d.BestStops >= DetectMinHits && d.Share() >= DetectMinShare && d.Margin() >= DetectMinMargin {
		d.Lang = d.Best
	}
	return d
}
