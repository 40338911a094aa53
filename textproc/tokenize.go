package textproc

import (
	"encoding/binary"
	"math/bits"
	"slices"
	"unicode"
	"unicode/utf8"
	"unsafe"
)

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

// gramClass is the class of a character of a script written without
// spaces between words. Such characters are cut into overlapping bigrams;
// a run of them never crosses from one class to another.
type gramClass uint8

const (
	gramNone   gramClass = iota
	gramCJ               // Han, Hiragana, Katakana (Chinese and Japanese run together)
	gramHangul           // Hangul
	gramThai             // Thai
)

// gramClassOf returns the bigram class of r: a letter (or a letter-like
// number such as U+3007 IDEOGRAPHIC NUMBER ZERO) of Han, Hiragana,
// Katakana, Hangul or Thai, or U+30FC / U+FF70, the prolonged sound marks,
// whose script is Common but which only occur inside kana words.
func gramClassOf(r rune) gramClass {
	if r < 0x0e00 { // below Thai: Latin, Greek, Cyrillic, Arabic, Indic, …
		return gramNone
	}
	if r == 0x30fc || r == 0xff70 {
		return gramCJ
	}
	if !unicode.IsLetter(r) && !unicode.Is(unicode.Nl, r) {
		return gramNone
	}
	switch {
	case unicode.Is(unicode.Thai, r):
		return gramThai
	case unicode.Is(unicode.Han, r), unicode.Is(unicode.Hiragana, r), unicode.Is(unicode.Katakana, r):
		return gramCJ
	case unicode.Is(unicode.Hangul, r):
		return gramHangul
	}
	return gramNone
}

// tokKind tells a word token from a character n-gram.
type tokKind uint8

const (
	tokWord tokKind = iota // a run of letters and digits
	tokGram                // a bigram, or a lone character, of a script without spaces
)

// tokRef is one token of a document, held in the analyzer's arena.
type tokRef struct {
	start, end int
	kind       tokKind
	script     script // of a word: the script of its first letter
}

// tokenizer splits normalised text into tokens and appends them to arena.
// Its zero value is ready; reuse it to reuse its buffers.
type tokenizer struct {
	arena []byte
	refs  []tokRef
	// the word being built: arena[wstart:] while inWord
	inWord  bool
	wstart  int
	wscript script
	// the run of bigram characters being built: gbuf holds it, gcut the
	// byte offset in gbuf where each character (a letter and the marks
	// after it) starts
	gbuf   []byte
	gcut   []int
	gclass gramClass
	// lower writes ASCII capitals in lower case (see run).
	lower bool
	// bytewise turns asciiText off, for tests: ASCII words are then
	// scanned a byte at a time.
	bytewise bool
	// blockFrom is the offset in the text where asciiText may try whole
	// blocks again.
	blockFrom int
}

// reset empties the token list, keeping the buffers.
func (t *tokenizer) reset() {
	t.arena = t.arena[:0]
	t.refs = t.refs[:0]
	t.inWord = false
	t.gbuf = t.gbuf[:0]
	t.gcut = t.gcut[:0]
	t.gclass = gramNone
}

// token returns the bytes of ref.
func (t *tokenizer) token(ref tokRef) []byte { return t.arena[ref.start:ref.end] }

func (t *tokenizer) flushWord() {
	if t.inWord && len(t.arena) > t.wstart {
		t.refs = append(t.refs, tokRef{start: t.wstart, end: len(t.arena), kind: tokWord, script: t.wscript})
	}
	t.inWord = false
}

func (t *tokenizer) addGram(b []byte) {
	start := len(t.arena)
	t.arena = append(t.arena, b...)
	t.refs = append(t.refs, tokRef{start: start, end: len(t.arena), kind: tokGram})
}

// flushGram cuts the run of bigram characters into overlapping bigrams, or
// keeps a lone character as it is.
func (t *tokenizer) flushGram() {
	n := len(t.gcut)
	switch {
	case n == 1:
		t.addGram(t.gbuf)
	case n > 1:
		for i := 0; i+1 < n; i++ {
			end := len(t.gbuf)
			if i+2 < n {
				end = t.gcut[i+2]
			}
			t.addGram(t.gbuf[t.gcut[i]:end])
		}
	}
	t.gbuf = t.gbuf[:0]
	t.gcut = t.gcut[:0]
	t.gclass = gramNone
}

// ASCII character classes of the tokenizer's fast path.
const (
	asciiSep   uint8 = iota // ends a token: space, punctuation, control
	asciiDigit              // 0-9
	asciiLower              // a-z
	asciiUpper              // A-Z
	asciiApos               // ', which needs a look at the next character
)

// asciiClass is the class of each ASCII byte; wordBits has the bit
// 1<<class of each ASCII letter and digit, and 0 for every other byte, non-ASCII
// ones included.
var asciiClass, wordBits = func() (c [utf8.RuneSelf]uint8, w [256]uint8) {
	for b := '0'; b <= '9'; b++ {
		c[b] = asciiDigit
	}
	for b := 'a'; b <= 'z'; b++ {
		c[b] = asciiLower
		c[b-'a'+'A'] = asciiUpper
	}
	c['\''] = asciiApos
	for b, cl := range c {
		if cl >= asciiDigit && cl <= asciiUpper {
			w[b] = 1 << cl
		}
	}
	return c, w
}()

// Words of 8 bytes, for asciiBlock and asciiWords.
const (
	swarOnes = 0x0101010101010101
	swarHigh = 0x8080808080808080
)

// swarAtLeast returns, in the high bit of each byte, whether that byte of
// x, whose high bits are clear, is at least c (c <= 0x80): the sum of the
// byte and 0x80-c stays below 0x100, so no byte carries into the next.
func swarAtLeast(x uint64, c byte) uint64 {
	return x + swarOnes*uint64(0x80-c)
}

// asciiText tokenises text from i on as run does, 64 bytes at a time
// while the bytes are ASCII other than the apostrophe (asciiBlock), eight
// at a time through the rest (asciiWords); it returns where it stopped, as
// asciiWords does.
//
// After a block that holds such a byte, no block is tried again before
// the end of that one: in text where they come every few words (accented
// letters, say), most tries would fail again.
func (t *tokenizer) asciiText(text string, i int) int {
	if i >= t.blockFrom {
		for i+64 <= len(text) {
			if !t.asciiBlock(text[i : i+64]) {
				t.blockFrom = i + 64
				break
			}
			i += 64
		}
	}
	return t.asciiWords(text, i)
}

// load64 returns the first eight bytes of s, little-endian.
func load64(s string) uint64 {
	_ = s[7]
	return uint64(s[0]) | uint64(s[1])<<8 | uint64(s[2])<<16 | uint64(s[3])<<24 |
		uint64(s[4])<<32 | uint64(s[5])<<40 | uint64(s[6])<<48 | uint64(s[7])<<56
}

// highBits gathers the high bit of each byte of x into the byte's bit of
// the result (byte k gives bit k): the bits, moved to the bottom of their
// bytes, are multiplied into the top byte, each to its own place, with no
// carry.
func highBits(x uint64) uint64 {
	return ((x >> 7) * 0x0102040810204080) >> 56
}

// classifyASCIIGo is classifyASCII in Go, eight bytes at a time.
func classifyASCIIGo(dst, src *byte, lower bool) (word, alpha uint64, ok bool) {
	in := unsafe.String(src, 64)
	// First a quick look for the bytes that stop a block, so that text
	// with many of them loses little on blocks tried in vain.
	stop := uint64(0)
	for k := 0; k < 64; k += 8 {
		x := load64(in[k:])
		stop |= x&swarHigh | ^swarAtLeast(x&^swarHigh^(swarOnes*'\''), 1)&swarHigh
	}
	if stop != 0 {
		return 0, 0, false
	}
	out := unsafe.Slice(dst, 64)
	for k := 0; k < 64; k += 8 {
		x := load64(in[k:]) // ASCII: the high bits are clear
		upper := swarAtLeast(x, 'A') &^ swarAtLeast(x, 'Z'+1)
		a := (upper | swarAtLeast(x, 'a')&^swarAtLeast(x, 'z'+1)) & swarHigh
		w := a | (swarAtLeast(x, '0')&^swarAtLeast(x, '9'+1))&swarHigh
		if lower {
			x |= (upper & swarHigh) >> 2 // 0x20 on each capital
		}
		binary.LittleEndian.PutUint64(out[k:], x)
		word |= highBits(w) << k
		alpha |= highBits(a) << k
	}
	return word, alpha, true
}

// asciiBlock tokenises the 64 bytes b as asciiWords does and reports
// true, or reports false and leaves everything as it was when b holds an
// apostrophe or a byte outside ASCII. It works on bit masks of the whole
// block, one bit a byte, so that a word costs no branch of its own (the
// lengths of words are irregular, and a branch on each boundary would be
// mispredicted about once a word).
func (t *tokenizer) asciiBlock(b string) bool {
	l := len(t.arena)
	arena := slices.Grow(t.arena, 64)[:l+64]
	word, alpha, ok := classifyASCII(&arena[l], unsafe.StringData(b[:64]), t.lower)
	if !ok {
		t.arena = arena[:l] // the same bytes; the room made is kept for what follows
		return false
	}
	// Bit p of starts: a word starts at byte p; of ends: a word ends
	// before byte p. A word being built goes on from the block before.
	carry := uint64(0)
	if t.inWord {
		carry = 1
	}
	prev := word<<1 | carry
	starts, ends := word&^prev, ^word&prev
	var at [64]uint8 // the starts, then the ends
	ns := 0
	for m := starts; m != 0; m &= m - 1 {
		at[ns] = uint8(bits.TrailingZeros64(m))
		ns++
	}
	ne := ns
	for m := ends; m != 0; m &= m - 1 {
		at[ne] = uint8(bits.TrailingZeros64(m))
		ne++
	}
	refs := slices.Grow(t.refs, ne-ns)
	s, first := 0, ns // the next start in at; the first end that closes a word of this block
	if t.inWord && ne > ns {
		// The word from before ends in this block.
		e := int(at[ns])
		sc := t.wscript
		if sc == scriptNone && alpha&(uint64(1)<<e-1) != 0 {
			sc = scriptLatin
		}
		refs = append(refs, tokRef{start: t.wstart, end: l + e, kind: tokWord, script: sc})
		t.inWord = false
		first++
	}
	if !t.inWord {
		for k := first; k < ne; k++ {
			st, e := int(at[s]), int(at[k])
			sc := scriptNone
			if alpha&(uint64(1)<<e-1)>>st != 0 {
				sc = scriptLatin
			}
			refs = append(refs, tokRef{start: l + st, end: l + e, kind: tokWord, script: sc})
			s++
		}
	}
	if s < ns {
		// A word goes on into the next block.
		st := int(at[s])
		t.inWord, t.wstart, t.wscript = true, l+st, scriptNone
		if alpha>>st != 0 {
			t.wscript = scriptLatin
		}
	} else if t.inWord && t.wscript == scriptNone && alpha != 0 {
		// The word from before takes the whole block.
		t.wscript = scriptLatin
	}
	t.arena, t.refs = arena, refs
	return true
}

// asciiWords tokenises text from i on, eight bytes at a time, as run does
// a byte at a time, while at least eight bytes remain and they are ASCII
// other than the apostrophe; it returns where it stopped: at an
// apostrophe or a byte outside ASCII (which run looks at next), or with
// fewer than eight bytes left. A word being built on entry (t.inWord) is
// continued, and a word may still be being built on return (it ends at
// len(t.arena)). Each eight bytes are stored in the arena whole, in lower
// case when t.lower is set, separators included: a token's ref points at
// its bytes there, and the bytes between tokens are never read.
func (t *tokenizer) asciiWords(text string, i int) int {
	// The state in locals, so that the loop keeps it in registers.
	arena, refs := t.arena, t.refs
	inWord, wstart, wscript := t.inWord, t.wstart, t.wscript
	for i+8 <= len(text) {
		x := load64(text[i:])
		x7 := x &^ swarHigh
		upper := swarAtLeast(x7, 'A') &^ swarAtLeast(x7, 'Z'+1)
		alpha := (upper | swarAtLeast(x7, 'a')&^swarAtLeast(x7, 'z'+1)) &^ x & swarHigh
		word := alpha | (swarAtLeast(x7, '0')&^swarAtLeast(x7, '9'+1))&^x&swarHigh
		apos := ^swarAtLeast(x7^(swarOnes*'\''), 1) &^ x & swarHigh
		n := bits.TrailingZeros64(x&swarHigh|apos) >> 3 // bytes before the first apostrophe or non-ASCII one (8: none)
		keep := uint64(1)<<(8*n) - 1                    // n = 8 shifts by 64: all ones
		if t.lower {
			x |= (upper & keep & swarHigh) >> 2 // 0x20 on each capital
		}
		l := len(arena)
		arena = slices.Grow(arena, 8)[:l+8]
		binary.LittleEndian.PutUint64(arena[l:], x)
		arena = arena[:l+n]
		// The words of bytes [0, n): where each starts and ends.
		word &= keep
		for p := 0; p < n; {
			from := ^uint64(0) << (8 * p)
			if !inWord {
				rest := word & from
				if rest == 0 {
					break
				}
				p = bits.TrailingZeros64(rest) >> 3
				inWord, wstart, wscript = true, l+p, scriptNone
				continue
			}
			e := n
			if rest := ^word & swarHigh & keep & from; rest != 0 {
				e = bits.TrailingZeros64(rest) >> 3
			}
			if wscript == scriptNone && alpha&from&(uint64(1)<<(8*e)-1) != 0 {
				wscript = scriptLatin
			}
			if e == n {
				break // the word goes on
			}
			refs = append(refs, tokRef{start: wstart, end: l + e, kind: tokWord, script: wscript})
			inWord = false
			p = e
		}
		i += n
		if n < 8 {
			break
		}
	}
	t.arena, t.refs = arena, refs
	t.inWord, t.wstart, t.wscript = inWord, wstart, wscript
	return i
}

// run appends the tokens of text by the rule of the package documentation.
// ASCII letters, digits and separators take a fast path; everything else
// (the apostrophes, and every character outside ASCII) goes through the
// Unicode tables. With t.lower set, ASCII capitals are written in lower
// case, which is all that case folding does to ASCII: the analyzer sets it
// to tokenise ASCII text without normalising it first.
func (t *tokenizer) run(text string) {
	t.blockFrom = 0
	for i := 0; i < len(text); {
		if c := text[i]; c < utf8.RuneSelf {
			switch cl := asciiClass[c]; cl {
			case asciiSep, asciiDigit, asciiLower, asciiUpper:
				if t.gclass != gramNone {
					t.flushGram()
				}
				if !t.bytewise && i+8 <= len(text) && (cl != asciiSep || text[i+1] < utf8.RuneSelf) {
					// The common case: runs of ASCII words and
					// separators, many bytes at a time (not for a
					// lone separator between words of other
					// scripts).
					i = t.asciiText(text, i)
					continue
				}
				if cl == asciiSep {
					t.flushWord()
					i++
					continue
				}
				if !t.inWord {
					t.inWord, t.wstart, t.wscript = true, len(t.arena), scriptNone
				}
				j, seen := i, uint8(0)
				for ; j < len(text); j++ {
					f := wordBits[text[j]]
					if f == 0 {
						break
					}
					seen |= f
				}
				if t.wscript == scriptNone && seen&(1<<asciiLower|1<<asciiUpper) != 0 {
					t.wscript = scriptLatin
				}
				start := len(t.arena)
				t.arena = append(t.arena, text[i:j]...)
				if t.lower && seen&(1<<asciiUpper) != 0 {
					for k, b := range t.arena[start:] {
						if 'A' <= b && b <= 'Z' {
							t.arena[start+k] = b + ('a' - 'A')
						}
					}
				}
				i = j
				continue
			}
		}
		r, size := rune(text[i]), 1
		if r >= utf8.RuneSelf {
			r, size = utf8.DecodeRuneInString(text[i:])
		}
		switch {
		case isApostrophe(r):
			// Checked before the letter test: U+02BC is a letter (Lm).
			next, _ := utf8.DecodeRuneInString(text[i+size:])
			if t.inWord && i+size < len(text) && isWordStart(next) && gramClassOf(next) == gramNone {
				t.arena = append(t.arena, '\'')
			} else {
				t.flushWord()
				t.flushGram()
			}
		case gramClassOf(r) != gramNone:
			t.flushWord()
			if c := gramClassOf(r); c != t.gclass {
				t.flushGram()
				t.gclass = c
			}
			t.gcut = append(t.gcut, len(t.gbuf))
			t.gbuf = utf8.AppendRune(t.gbuf, r)
		case isWordStart(r):
			if t.gclass != gramNone {
				t.flushGram()
			}
			if !t.inWord {
				t.inWord, t.wstart, t.wscript = true, len(t.arena), scriptNone
			}
			if t.wscript == scriptNone && unicode.IsLetter(r) {
				t.wscript = letterScript(r)
			}
			t.arena = utf8.AppendRune(t.arena, r)
		case isMark(r) && t.gclass != gramNone:
			// A combining mark belongs to the character before it.
			t.gbuf = utf8.AppendRune(t.gbuf, r)
		case isMark(r) && t.inWord:
			// A combining mark continues a token but never starts one.
			t.arena = utf8.AppendRune(t.arena, r)
		default:
			t.flushWord()
			t.flushGram()
		}
		i += size
	}
	t.flushWord()
	t.flushGram()
}

// letterScript returns the script of the letter r.
func letterScript(r rune) script {
	switch {
	case r < utf8.RuneSelf:
		return scriptLatin
	case unicode.Is(unicode.Latin, r):
		return scriptLatin
	case unicode.Is(unicode.Cyrillic, r):
		return scriptCyrillic
	}
	return scriptOther
}

// Tokenize splits already-normalised text into tokens by the rule in the
// package documentation and calls fn with each, in text order. Apostrophes
// inside a token are written as U+0027; a possessive "'s" is left on (the
// analyzer removes it after the stop-list look-up, so that "let's" can
// match the list). Runs of Han, Hiragana, Katakana, Hangul or Thai come out
// as overlapping character bigrams. The string passed to fn is only valid
// during the call.
func Tokenize(text string, fn func(tok string)) {
	var t tokenizer
	t.run(text)
	for _, ref := range t.refs {
		fn(unsafeString(t.token(ref)))
	}
}
