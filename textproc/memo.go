package textproc

import (
	"encoding/binary"
	"math/bits"
	"os"
	"unsafe"
)

// wordTable is the memo's index of the distinct word tokens an analyzer
// has seen: an open-addressing hash table (linear probing, at most half
// full) whose slots hold a short token itself, its language-detection
// facts and its analysis in the first language it was analysed in. A
// look-up of a token seen before therefore usually reads one cache line,
// where a Go map of strings reads the map's slot, the key's bytes
// elsewhere on the heap and then the memo record. The slots hold no
// pointers, so the garbage collector never scans them.
//
// Slots of 64 bytes holding tokens of up to 43 bytes were tried: 1.5%
// less CPU on the 100,000-document generated corpus, for twice the
// memory. A 32-byte slot holds tokens of up to 15 bytes, which leaves
// 0.08% of that corpus's tokens to the long-token search (3.8% at 11).
type wordTable struct {
	slots []wslot
	used  int
}

// slotsPerPage is how many slots a page of memory holds (at least 1).
var slotsPerPage = max(1, os.Getpagesize()/int(unsafe.Sizeof(wslot{})))

// wKey is the longest token a slot holds; longer ones are compared with
// the memo record's copy (tokMemo.key).
const wKey = 15

// headBytes is how many bytes paddedWords loads: a token's first wKey
// bytes and one more (two 64-bit words). Analyzer.tokenize leaves that much room after the
// last token of its arena, so that the probe can load any token's head
// words in place.
const headBytes = wKey + 1

// Special values of wslot fields.
const (
	wLong      = 255 // length byte of a token longer than wKey
	noLang     = 255 // lang of a token not analysed yet
	manyPieces = 255 // pieces: the detection facts are in the tokMemo
	idUnknown  = -2  // id: Options.TermID not asked yet
	idDropped  = -1  // id: the token is dropped
)

// wslot is one slot of a wordTable: 32 bytes.
type wslot struct {
	// key holds the token, padded with zeros (its first wKey bytes when
	// longer), and in its last byte (klen) 0 for an empty slot, the
	// token's length, or wLong.
	key    [wKey + 1]byte
	lang   uint8 // index in langTable of the cached analysis, or noLang
	pieces uint8 // detection: pieces between apostrophes, or manyPieces
	stops  uint8 // detection: candidates whose stop list holds the token (one piece)
	marks  uint8 // detection: candidates a letter of the token marks
	id     int32 // term ID of the cached analysis, idDropped or idUnknown
	ti     int32 // index in Analyzer.toks (whose ent is the cached analysis)
	n      int32 // occurrences of the cached analysis counted by AnalyzeIDs
}

// klen returns the length byte of the slot: 0 when empty, the token's
// length, or wLong.
func (s *wslot) klen() uint8 { return s.key[wKey] }

// Hash constants of hashToken.
const hk0, hk1, hk2 = 0x9e3779b97f4a7c15, 0xbf58476d1ce4e5b9, 0x94d049bb133111eb

// hashToken hashes a token for the table. A token of at most wKey bytes
// is hashed from its head words (headWords), so that Analyzer.probe can
// hash it from the words it compares; a longer one from its first and
// last 8 bytes, beyond 16 bytes after folding its 16-byte blocks, by
// 128-bit multiplies. The hash only places tokens in the table; equality
// is always checked on the bytes, so the hash changes speed, never
// results.
func hashToken(b []byte) uint64 {
	n := len(b)
	if n <= wKey {
		x, y := headWords(b)
		return hashHead(x, y, n)
	}
	x := binary.LittleEndian.Uint64(b)
	y := binary.LittleEndian.Uint64(b[n-8:])
	if n > 16 {
		h := uint64(n) * hk2
		for p := b; len(p) > 16; p = p[16:] {
			hi, lo := bits.Mul64(binary.LittleEndian.Uint64(p)^hk0, binary.LittleEndian.Uint64(p[8:])^h)
			h = hi ^ lo
		}
		x = binary.LittleEndian.Uint64(b[n-16:]) ^ h
	}
	hi, lo := bits.Mul64(x^hk0^uint64(n), y^hk1)
	return hi ^ lo
}

// hashHead is hashToken of a token of n <= wKey bytes whose head words are
// x and y.
func hashHead(x, y uint64, n int) uint64 {
	hi, lo := bits.Mul64(x^hk0^uint64(n), y^hk1)
	return hi ^ lo
}

// headWords returns the head words of a token b of at most wKey bytes:
// its bytes 0 to 7 and 8 to 14, little-endian and padded with zeros.
// wslot.head reads the same words from a slot that holds b, with the
// token's length in the top byte of the second.
func headWords(b []byte) (x, y uint64) {
	var p [headBytes]byte
	copy(p[:], b)
	return paddedWords(p[:], len(b))
}

// paddedWords returns headWords(p[:n]) for an n <= wKey and a p of at
// least headBytes bytes, of which the bytes from n on are ignored.
func paddedWords(p []byte, n int) (x, y uint64) {
	x = binary.LittleEndian.Uint64(p)
	y = binary.LittleEndian.Uint64(p[8:])
	if n < 8 {
		return x & (1<<(8*n) - 1), 0
	}
	return x, y & (1<<(8*(n-8)) - 1)
}

// head returns the slot's key as two words: bytes 0 to 7, and 8 to 15,
// whose top byte is klen. A slot holds a token of n <= wKey bytes with
// head words x and y exactly when head returns x and y | n<<56 (the key
// is padded with zeros).
func (s *wslot) head() (uint64, uint64) {
	return binary.LittleEndian.Uint64(s.key[:8]), binary.LittleEndian.Uint64(s.key[8:])
}

// find returns the index of the slot of tok: the slot that holds it, or
// the empty slot where it belongs, and whether it was found. toks gives
// the full key of long tokens.
func (t *wordTable) find(tok []byte, h uint64, toks []tokMemo) (int, bool) {
	mask := uint64(len(t.slots) - 1)
	if len(tok) <= wKey {
		x, y := headWords(tok)
		y |= uint64(len(tok)) << 56
		for i := h & mask; ; i = (i + 1) & mask {
			s := &t.slots[i]
			if s.klen() == 0 {
				return int(i), false
			}
			if sx, sy := s.head(); sx == x && sy == y {
				return int(i), true
			}
		}
	}
	// A long token: its first wKey bytes are in the slot, with klen
	// wLong; the next 8 are in the memo record (tokMemo.tail), beside the
	// length of its copy of the token, and only a token longer than that
	// has the rest compared with the copy's bytes (one cache miss less).
	x, y := headWords(tok[:wKey])
	y |= wLong << 56
	tail := tailWord(tok)
	for i := h & mask; ; i = (i + 1) & mask {
		s := &t.slots[i]
		if s.klen() == 0 {
			return int(i), false
		}
		if sx, sy := s.head(); sx == x && sy == y {
			if tm := &toks[s.ti]; len(tm.key) == len(tok) && tm.tail == tail &&
				(len(tok) <= wKey+8 || tm.key[wKey+8:] == string(tok[wKey+8:])) {
				return int(i), true
			}
		}
	}
}

// tailWord returns bytes wKey to wKey+7 of a token longer than wKey,
// little-endian, padded with zeros: tokMemo.tail.
func tailWord(tok []byte) uint64 {
	var p [8]byte
	copy(p[:], tok[wKey:])
	return binary.LittleEndian.Uint64(p[:])
}

// grow doubles the table (or makes its first 1024 slots).
//
// The new table is first touched page by page, in address order, and only
// then filled in hash order. Measured (assay pick --lang english --no-stem
// --near-dup off, timings.read, 7 fresh processes each, interleaved,
// medians): SpamAssassin 0.436 -> 0.375 s, SpamAssassin .eml 0.603 ->
// 0.565 s, the generated 10k corpus 0.578 -> 0.561 s, 100k 3.33 -> 3.09 s.
// The first write to each page of a fresh table faults; in hash order
// those faults, taken by both workers at once while the collector runs,
// cost several times what they cost in address order on this machine.
func (t *wordTable) grow(toks []tokMemo) {
	old := t.slots
	t.slots = make([]wslot, max(2*len(old), 1024))
	for i := 0; i < len(t.slots); i += slotsPerPage {
		t.slots[i].key[wKey] = 0
	}
	for i := range old {
		if s := &old[i]; s.klen() != 0 {
			t.slots[t.slotOf(s, toks)] = *s
		}
	}
}

// slotOf returns where the token of slot s (of this table or an older
// one) is, or belongs, in the table.
func (t *wordTable) slotOf(s *wslot, toks []tokMemo) int {
	key := s.key[:min(int(s.klen()), wKey)]
	if s.klen() == wLong {
		key = []byte(toks[s.ti].key)
	}
	i, _ := t.find(key, hashToken(key), toks)
	return i
}
