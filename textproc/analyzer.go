package textproc

import (
	"fmt"
	"slices"
	"strings"
	"unicode"
	"unicode/utf8"
	"unsafe"

	"golang.org/x/text/cases"
	"golang.org/x/text/transform"
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
	// TermID numbers index terms for [Analyzer.AnalyzeIDs], which calls
	// it once for each distinct token the analyzer keeps (with the memo
	// on) and reports the number it returns. It must return the same
	// number for the same term; it may be shared by analyzers in several
	// goroutines if it is safe for concurrent use (sparsemat.Vocabulary's
	// ID is). Nil is allowed when AnalyzeIDs is not used.
	TermID func(term string) int32
}

// Analyzer turns text into index terms. Build one with [NewAnalyzer]; it is
// not safe for concurrent use.
type Analyzer struct {
	opts  Options
	fixed int // index in langTable of Options.Lang, or -1 to detect
	fold  cases.Caser
	tok   tokenizer
	// Scratch buffers of normalisation, reused from one document to the
	// next.
	nfc, folded []byte
	last        Detection

	// The memo (off with Options.NoMemo). Every distinct word token has a
	// slot in words, found with one look-up, that holds its detection
	// facts and its analysis in the first language it was analysed in,
	// and a tokMemo; its analyses in other languages are found through
	// more. Every analysis is an entry. Bigrams go straight to an entry.
	memo    bool
	words   wordTable
	toks    []tokMemo
	more    map[uint64]int32 // token index << 8 | language -> entry
	multi   [][numStemmed]int32
	grams   map[string]int32 // bigram -> index in entries
	entries []memoEntry
	at      []int32  // per token of the current document: its slot in words (word) or its entry (bigram)
	sc      []script // per token of the current document: the script of a word, or scriptGram

	// The surface forms counted by AnalyzeIDs without the memo.
	forms map[[2]string]int
}

// tokMemo is the memo of one distinct word token, beside its slot.
type tokMemo struct {
	key    string // the token, the memo's own copy
	tail   uint64 // of a token longer than wKey: tailWord, its bytes after the slot's
	pieces int32  // detection: pieces between apostrophes
	multi  int32  // detection: 1 + index in Analyzer.multi of the stop counts of a token of several pieces; 0 when it has none
	ent    int32  // index in Analyzer.entries of the analysis in the slot's language (wslot.lang)
}

// memoEntry is the analysis of one distinct token in one language. term
// and surface are the memo's own strings, so that callers never see the
// scratch buffer.
type memoEntry struct {
	term    string // "" when the token is dropped
	surface string
	id      int32 // Options.TermID(term), for AnalyzeIDs; -1 until asked
	n       int32 // occurrences counted by AnalyzeIDs since AddFormsTo
}

// NewAnalyzer returns an analyzer configured by opts. It panics if
// opts.Lang is not one of the Language constants or "".
func NewAnalyzer(opts Options) *Analyzer {
	if opts.MinLength <= 0 {
		opts.MinLength = DefaultMinLength
	}
	a := &Analyzer{opts: opts, fixed: -1, fold: cases.Fold()}
	a.tok.lower = true
	if opts.Lang != "" && opts.Lang != Auto {
		i, ok := langIndex(opts.Lang)
		if !ok {
			panic(fmt.Sprintf("textproc: NewAnalyzer with unknown language %q", opts.Lang))
		}
		a.fixed = i
	}
	if !opts.NoMemo {
		a.memo = true
		a.grams = make(map[string]int32)
		a.words.grow(nil)
	}
	return a
}

// Normalize returns text in NFC with full case folding applied, the form
// that tokenising works on.
func (a *Analyzer) Normalize(text string) string {
	return a.fold.String(norm.NFC.String(text))
}

// tokenize normalises text and splits it into the analyzer's tokens: the
// same tokens as a.tok.run(a.Normalize(text)), faster (see normalized).
func (a *Analyzer) tokenize(text string) {
	a.tok.reset()
	a.tok.run(a.normalized(text))
	a.tok.arena = slices.Grow(a.tok.arena, headBytes) // room for probe's loads
}

// normalized returns text normalised for a tokenizer that lower-cases
// ASCII capitals itself (tokenizer.lower): Normalize(text), except that
// ASCII capitals may be left as they are. The result may be text itself
// or a view of a scratch buffer that the next call overwrites.
//
//   - ASCII text is returned as it is: NFC leaves ASCII alone and full
//     case folding only lower-cases its capitals.
//   - Text that is mostly ASCII is normalised a stretch at a time
//     (normalizeStretches).
//   - Other text is normalised whole, into reused buffers.
func (a *Analyzer) normalized(text string) string {
	p := firstNonASCII(text)
	if p == len(text) {
		return text
	}
	nonASCII := 0
	for i := p; i < len(text); i++ {
		if text[i] >= utf8.RuneSelf {
			nonASCII++
		}
	}
	if nonASCII*16 > len(text) {
		return a.normalizeWhole(text)
	}
	return a.normalizeStretches(text)
}

// normalizeWhole returns Normalize(text) in a scratch buffer.
func (a *Analyzer) normalizeWhole(text string) string {
	a.nfc = norm.NFC.AppendString(a.nfc[:0], text)
	a.folded = a.foldAppend(a.folded[:0], a.nfc)
	return unsafeString(a.folded)
}

// normalizeStretches returns Normalize(text), ASCII capitals aside, in a
// scratch buffer, sending only the stretches of text that hold non-ASCII
// characters through the Unicode normalisers. Both steps of Normalize
// leave a boundary before every ASCII character: no composition of NFC
// has an ASCII character as its second part, and an ASCII character is a
// starter, so nothing before it changes because of what follows it; and
// full case folding maps each character on its own. So the text is cut
// before every ASCII character that is followed by another ASCII
// character or ends the text, and each stretch of non-ASCII characters is
// normalised with the ASCII character before it (a letter that a
// combining mark may compose with).
func (a *Analyzer) normalizeStretches(text string) string {
	out := a.folded[:0]
	for i := 0; i < len(text); {
		p := i + firstNonASCII(text[i:])
		if p == len(text) {
			out = append(out, text[i:]...)
			break
		}
		s := p
		if p > i {
			s = p - 1 // the ASCII character before belongs to the stretch
		}
		out = append(out, text[i:s]...)
		q := p
		for q < len(text) && text[q] >= utf8.RuneSelf {
			q++
		}
		a.nfc = norm.NFC.AppendString(a.nfc[:0], text[s:q])
		out = a.foldAppend(out, a.nfc)
		i = q
	}
	a.folded = out
	return unsafeString(out)
}

// foldAppend appends src with full case folding to dst, as
// a.fold.String does.
func (a *Analyzer) foldAppend(dst, src []byte) []byte {
	a.fold.Reset()
	for {
		dst = slices.Grow(dst, len(src)+16)
		nDst, nSrc, err := a.fold.Transform(dst[len(dst):cap(dst)], src, true)
		dst = dst[:len(dst)+nDst]
		src = src[nSrc:]
		if err != transform.ErrShortDst {
			return dst
		}
	}
}

// firstNonASCII returns the index of the first byte of s that is not
// ASCII, or len(s).
func firstNonASCII(s string) int {
	i := 0
	for ; i+32 <= len(s); i += 32 {
		if (load64(s[i:])|load64(s[i+8:])|load64(s[i+16:])|load64(s[i+24:]))&swarHigh != 0 {
			break
		}
	}
	for ; i+8 <= len(s); i += 8 {
		if load64(s[i:])&swarHigh != 0 {
			break
		}
	}
	for ; i < len(s); i++ {
		if s[i] >= utf8.RuneSelf {
			return i
		}
	}
	return len(s)
}

// Analyze calls emit once for every kept token of text, in text order,
// with the token's index term and its surface form (the folded token, with
// a possessive or an elided article removed), and returns the language
// used for the document: Options.Lang when it is fixed, else the detected
// language or Undetermined. The strings passed to emit stay valid after
// emit returns.
func (a *Analyzer) Analyze(text string, emit func(term, surface string)) Language {
	if !a.memo {
		a.tokenize(text)
		return a.analyzeNoMemo(emit)
	}
	doc := a.lookUp(text)
	docScript := langTable[doc].script
	for k, si := range a.at {
		var e *memoEntry
		if sc := a.sc[k]; sc == scriptGram {
			e = &a.entries[si]
		} else {
			li := doc
			if sc != docScript {
				li = idxUnd // a number, or a word in another script
			}
			e = &a.entries[a.wordEntry(si, li)]
		}
		if e.term != "" {
			emit(e.term, e.surface)
		}
	}
	return langTable[doc].lang
}

// AnalyzeIDs analyses text as Analyze does and appends to ids, for every
// kept token in text order, the number Options.TermID gives its term. It
// also counts each (term, surface form) pair it sees, for
// [Analyzer.AddFormsTo]. It returns the extended slice and the language
// used for the document. It panics if Options.TermID is nil.
func (a *Analyzer) AnalyzeIDs(text string, ids []int32) ([]int32, Language) {
	if a.opts.TermID == nil {
		panic("textproc: AnalyzeIDs without Options.TermID")
	}
	if !a.memo {
		lang := a.Analyze(text, func(term, surface string) {
			ids = append(ids, a.opts.TermID(term))
			if a.forms == nil {
				a.forms = make(map[[2]string]int)
			}
			a.forms[[2]string{term, surface}]++
		})
		return ids, lang
	}
	doc := a.lookUp(text)
	docScript := langTable[doc].script
	slots := a.words.slots
	// Every token adds at most one ID, so there is room for all of them
	// and the common case below can store an ID whether or not it is
	// kept, and count it in only when it is: stop words are a large and
	// irregular share of the tokens, which a branch would mispredict.
	m := len(ids)
	ids = slices.Grow(ids, len(a.at))
	for k, si := range a.at {
		sc := a.sc[k]
		if sc == scriptGram {
			if e := &a.entries[si]; e.term != "" {
				ids = a.countEntry(ids[:m], e)
				m = len(ids)
			}
			continue
		}
		li := doc
		if sc != docScript {
			li = idxUnd // a number, or a word in another script
		}
		// The common case inline: the slot's own analysis, its term ID
		// known (or the token known to be dropped, idDropped < 0).
		if s := &slots[si]; int(s.lang) == li && s.id != idUnknown {
			kept := int32(uint32(^s.id) >> 31) // 1 for an ID, 0 for idDropped
			s.n += kept
			ids = ids[:m+1]
			ids[m] = s.id
			m += int(kept)
			continue
		}
		ids = a.countWord(ids[:m], si, li)
		m = len(ids)
	}
	return ids[:m], langTable[doc].lang
}

// countWord counts one occurrence of the word token in slot si, analysed
// in language li, and appends its term ID unless it is dropped.
func (a *Analyzer) countWord(ids []int32, si int32, li int) []int32 {
	s := &a.words.slots[si]
	if int(s.lang) != li {
		if s.lang != noLang {
			// Not the language of the slot's analysis.
			if e := &a.entries[a.wordEntry(si, li)]; e.term != "" {
				ids = a.countEntry(ids, e)
			}
			return ids
		}
		a.wordEntry(si, li) // the slot's analysis, from now on
	}
	// The common case: the slot's own analysis.
	if s.id == idUnknown {
		s.id = idDropped
		if e := &a.entries[a.toks[s.ti].ent]; e.term != "" {
			if e.id < 0 {
				e.id = a.opts.TermID(e.term)
			}
			s.id = e.id
		}
	}
	if s.id >= 0 {
		s.n++
		ids = append(ids, s.id)
	}
	return ids
}

// gramEntry returns the entry of the bigram-script token b, adding it if
// it is new.
func (a *Analyzer) gramEntry(b []byte) int32 {
	i, ok := a.grams[unsafeString(b)]
	if !ok {
		surface := string(b)
		i = a.newEntry(memoEntry{term: langTable[idxUnd].prefix + surface, surface: surface})
		a.grams[surface] = i
	}
	return i
}

// countEntry counts one occurrence of e, a kept analysis outside a slot,
// and appends its term ID.
func (a *Analyzer) countEntry(ids []int32, e *memoEntry) []int32 {
	if e.id < 0 {
		e.id = a.opts.TermID(e.term)
	}
	e.n++
	return append(ids, e.id)
}

// AddFormsTo adds to d the surface forms that AnalyzeIDs counted since the
// last call, and clears the counts. The forms of several analyzers can be
// added to one DisplayForms in any order: the counts are sums.
func (a *Analyzer) AddFormsTo(d *DisplayForms) {
	a.takeForms(func(e *memoEntry) { d.AddN(e.term, e.surface, int(e.n)) },
		func(term, surface string, n int) { d.AddN(term, surface, n) })
}

// AddFormsByID is AddFormsTo for a [FormsByID]: the forms are counted
// under the numbers Options.TermID gave their terms.
func (a *Analyzer) AddFormsByID(f *FormsByID) {
	top := int32(-1)
	a.takeForms(func(e *memoEntry) {
		if top < 0 { // the first: make room for them all at once
			for i := range a.entries {
				if e := &a.entries[i]; e.n > 0 {
					top = max(top, e.id)
				}
			}
			f.reserve(top)
		}
		f.AddN(e.id, e.surface, int(e.n))
	}, func(term, surface string, n int) { f.AddN(a.opts.TermID(term), surface, n) })
}

// takeForms hands the counted forms to the memo's entry (each entry with
// a count, in the memo's order) or to plain (the forms counted without the
// memo), and clears the counts.
func (a *Analyzer) takeForms(entry func(e *memoEntry), plain func(term, surface string, n int)) {
	a.settleCounts()
	for i := range a.entries {
		if e := &a.entries[i]; e.n > 0 {
			entry(e)
			e.n = 0
		}
	}
	for f, n := range a.forms {
		plain(f[0], f[1], n)
	}
	a.forms = nil
}

// settleCounts moves the occurrences counted in the word slots to the
// slots' entries.
func (a *Analyzer) settleCounts() {
	for i := range a.words.slots {
		if s := &a.words.slots[i]; s.n > 0 {
			a.entries[a.toks[s.ti].ent].n += s.n
			s.n = 0
		}
	}
}

// analyzeNoMemo analyses the tokens of the current document without the
// memo.
func (a *Analyzer) analyzeNoMemo(emit func(term, surface string)) Language {
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
			surface := string(b)
			e = memoEntry{term: langTable[idxUnd].prefix + surface, surface: surface}
		} else {
			i := doc
			if ref.script != docScript {
				i = idxUnd // a number, or a word in another script
			}
			e = a.analyzeWord(&langTable[i], string(b))
		}
		if e.term != "" {
			emit(e.term, e.surface)
		}
	}
	return langTable[doc].lang
}

// lookUp splits text into tokens and finds the memo of each (adding the
// new ones), in a.at (the slot of a word, the entry of a bigram) and a.sc
// (the script of a word, scriptGram for a bigram); then it settles the
// document's language and returns its index in langTable.
func (a *Analyzer) lookUp(text string) int {
	a.tokenize(text)
	a.probe()
	for k, si := range a.at {
		if si < 0 {
			a.at[k] = a.wordSlot(a.tok.token(a.tok.refs[k]), a.sc[k])
		}
	}
	if a.fixed >= 0 {
		return a.fixed
	}
	var (
		stops, marks   [numStemmed]int
		nLatin, nCyril int
		// The candidates' counts since the last flush, one byte each:
		// adding a token's masks as bytes takes no loop and no branch.
		stopLanes, markLanes uint64
		inLanes              int
	)
	for k, sc := range a.sc {
		if sc != scriptLatin && sc != scriptCyrillic {
			continue
		}
		s := &a.words.slots[a.at[k]]
		pieces := int(s.pieces)
		if s.pieces == manyPieces { // s.stops is 0: the stops are in a.multi
			tm := &a.toks[s.ti]
			pieces = int(tm.pieces)
			if tm.multi > 0 {
				for i, n := range &a.multi[tm.multi-1] {
					stops[i] += int(n)
				}
			}
		}
		if sc == scriptCyrillic {
			nCyril += pieces
		} else {
			nLatin += pieces
		}
		markLanes += byteLanes[s.marks]
		stopLanes += byteLanes[s.stops]
		if inLanes++; inLanes == 255 { // a byte holds up to 255
			addLanes(&marks, markLanes)
			addLanes(&stops, stopLanes)
			markLanes, stopLanes, inLanes = 0, 0, 0
		}
	}
	addLanes(&marks, markLanes)
	addLanes(&stops, stopLanes)
	a.last = decide(&stops, &marks, nLatin, nCyril)
	doc, _ := langIndex(a.last.Lang)
	return doc
}

// byteLanes[m] has a 1 in byte i for each bit i of m: a mask of
// candidates (bits below numStemmed) as counts of one, a byte each.
var byteLanes = func() (t [256]uint64) {
	for m := range t {
		for i := range 8 {
			t[m] |= uint64(m>>i&1) << (8 * i)
		}
	}
	return t
}()

// addLanes adds the counts held a byte each in lanes to counts.
func addLanes(counts *[numStemmed]int, lanes uint64) {
	for i := range counts {
		counts[i] += int(uint8(lanes >> (8 * i)))
	}
}

// probe fills a.at and a.sc for the tokens of the current document: the
// entry of each bigram, and the slot of each word token that is in the
// table at the slot its hash points to; -1 for every other word token
// (longer than wKey, elsewhere in the table, or new), which lookUp then
// finds with wordSlot. With a large vocabulary most of the time of a
// look-up is the wait for its slot, so the work is split in two passes: the
// first hashes every word token and only prefetches its slot, which lets
// the processor fetch many slots at once; the second compares each slot's
// head with its token, by when most of the slots are in the cache.
func (a *Analyzer) probe() {
	refs := a.tok.refs
	a.at = slices.Grow(a.at[:0], len(refs))[:len(refs)]
	a.sc = slices.Grow(a.sc[:0], len(refs))[:len(refs)]
	arena := a.tok.arena[:cap(a.tok.arena)] // tokenize leaves headBytes of room
	slots := a.words.slots
	mask := uint64(len(slots) - 1)
	for k, ref := range refs {
		if ref.kind == tokGram {
			a.at[k], a.sc[k] = a.gramEntry(arena[ref.start:ref.end]), scriptGram
			continue
		}
		a.sc[k] = ref.script
		n := ref.end - ref.start
		si := int32(-1)
		if n <= wKey {
			x, y := paddedWords(arena[ref.start:ref.start+headBytes], n)
			i := hashHead(x, y, n) & mask
			prefetch(unsafe.Pointer(&slots[i]))
			si = int32(i)
		}
		a.at[k] = si
	}
	for k, ref := range refs {
		si := a.at[k]
		if si < 0 || ref.kind == tokGram {
			continue
		}
		n := ref.end - ref.start
		x, y := paddedWords(arena[ref.start:ref.start+headBytes], n)
		if sx, sy := slots[si].head(); sx != x || sy != y|uint64(n)<<56 {
			a.at[k] = -1
		}
	}
}

// wordSlot returns the slot of the word token b, whose first letter is of
// script sc (scriptNone for a number), adding it if it is new.
func (a *Analyzer) wordSlot(b []byte, sc script) int32 {
	h := hashToken(b)
	i, ok := a.words.find(b, h, a.toks)
	if !ok {
		if 2*(a.words.used+1) > len(a.words.slots) {
			a.growWords()
			i, _ = a.words.find(b, h, a.toks)
		}
		a.newToken(i, b, sc)
	}
	return int32(i)
}

// growWords doubles the word table and moves the slots of the current
// document's words in a.at to their new places (those not found yet, -1,
// stay so).
func (a *Analyzer) growWords() {
	old := a.words.slots
	a.words.grow(a.toks)
	for k, sc := range a.sc {
		if sc != scriptGram && a.at[k] >= 0 {
			s := &old[a.at[k]]
			a.at[k] = int32(a.words.slotOf(s, a.toks))
		}
	}
}

// newToken fills slot i of the word table with the new word token b,
// whose first letter is of script sc, and adds its tokMemo.
func (a *Analyzer) newToken(i int, b []byte, sc script) {
	key := string(b)
	f := wordFacts(b, sc)
	tm := tokMemo{key: key, pieces: int32(f.pieces)}
	if len(b) > wKey {
		tm.tail = tailWord(b)
	}
	s := wslot{lang: noLang, marks: f.marks, ti: int32(len(a.toks)), id: idUnknown}
	copy(s.key[:wKey], b)
	s.key[wKey] = uint8(len(b))
	if len(b) > wKey {
		s.key[wKey] = wLong
	}
	var counts [numStemmed]int32
	hits := 0
	for l, n := range f.stops {
		counts[l] = int32(n)
		hits += n
		if n > 0 {
			s.stops |= 1 << l
		}
	}
	switch {
	case f.pieces <= 1:
		s.pieces = uint8(f.pieces)
	case hits == 0 && f.pieces < manyPieces:
		s.pieces = uint8(f.pieces)
	default:
		s.pieces, s.stops = manyPieces, 0
		if hits > 0 {
			a.multi = append(a.multi, counts)
			tm.multi = int32(len(a.multi))
		}
	}
	a.toks = append(a.toks, tm)
	a.words.slots[i] = s
	a.words.used++
}

func (a *Analyzer) newEntry(e memoEntry) int32 {
	e.id = -1
	a.entries = append(a.entries, e)
	return int32(len(a.entries) - 1)
}

// wordEntry returns the entry of the analysis of the word token in slot
// si in language li, analysing it the first time: the slot keeps the
// first language's analysis, the others are found through a.more.
func (a *Analyzer) wordEntry(si int32, li int) int32 {
	s := &a.words.slots[si]
	tm := &a.toks[s.ti]
	if int(s.lang) == li {
		return tm.ent
	}
	if s.lang == noLang {
		s.lang, tm.ent = uint8(li), a.newEntry(a.analyzeWord(&langTable[li], tm.key))
		return tm.ent
	}
	key := uint64(s.ti)<<8 | uint64(li)
	if e, ok := a.more[key]; ok {
		return e
	}
	e := a.newEntry(a.analyzeWord(&langTable[li], tm.key))
	if a.more == nil {
		a.more = make(map[uint64]int32)
	}
	a.more[key] = e
	return e
}

// LastDetection returns the language detection of the last Analyze call
// that detected one (Options.Lang "" or Auto); the zero Detection before
// that.
func (a *Analyzer) LastDetection() Detection { return a.last }

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
