package textproc

import (
	"encoding/binary"
	"math/bits"
)

// wordTable is the memo's index of the distinct word tokens an analyzer
// has seen: an open-addressing hash table (linear probing, at most half
// full) whose slots hold a short token itself, its language-detection
// facts and its analysis in the first language it was analysed in. A
// look-up of a token seen before therefore usually reads one cache line,
// where a Go map of strings reads the map's slot, the key's bytes
// elsewhere on the heap and then the memo record. The slots hold no
// pointers, so the garbage collector never scans them.
type wordTable struct {
	slots []wslot
	used  int
}

// wKey is the longest token a slot holds; longer ones are compared with
// the memo record's copy (tokMemo.key).
const wKey = 11

// Special values of wslot fields.
const (
	wLong      = 255 // klen of a token longer than wKey
	noLang     = 255 // lang of a token not analysed yet
	manyPieces = 255 // pieces: the detection facts are in the tokMemo
	idUnknown  = -2  // id: Options.TermID not asked yet
	idDropped  = -1  // id: the token is dropped
)

// wslot is one slot of a wordTable: 32 bytes.
type wslot struct {
	key    [wKey]byte // the token (its first wKey bytes when longer)
	klen   uint8      // 0 for an empty slot, the token's length, or wLong
	lang   uint8      // index in langTable of the cached analysis, or noLang
	pieces uint8      // detection: pieces between apostrophes, or manyPieces
	stops  uint8      // detection: candidates whose stop list holds the token (one piece)
	marks  uint8      // detection: candidates a letter of the token marks
	id     int32      // term ID of the cached analysis, idDropped or idUnknown
	ent    int32      // index in Analyzer.entries of the cached analysis
	ti     int32      // index in Analyzer.toks
	n      int32      // occurrences of the cached analysis counted by AnalyzeIDs
}

// hashToken hashes a token for the table: two words of the token
// (overlapping when it is shorter than their sum), folded by one 128-bit
// multiply; a token longer than 16 bytes first folds its 16-byte blocks. The hash only places tokens in the
// table; equality is always checked on the bytes, so the hash changes
// speed, never results.
func hashToken(b []byte) uint64 {
	const k0, k1, k2 = 0x9e3779b97f4a7c15, 0xbf58476d1ce4e5b9, 0x94d049bb133111eb
	n := len(b)
	var x, y uint64
	switch {
	case n > 16:
		h := uint64(n) * k2
		for p := b; len(p) > 16; p = p[16:] {
			hi, lo := bits.Mul64(binary.LittleEndian.Uint64(p)^k0, binary.LittleEndian.Uint64(p[8:])^h)
			h = hi ^ lo
		}
		x = binary.LittleEndian.Uint64(b[n-16:]) ^ h
		y = binary.LittleEndian.Uint64(b[n-8:])
	case n >= 8:
		x = binary.LittleEndian.Uint64(b)
		y = binary.LittleEndian.Uint64(b[n-8:])
	case n >= 4:
		x = uint64(binary.LittleEndian.Uint32(b))
		y = uint64(binary.LittleEndian.Uint32(b[n-4:]))
	case n > 0:
		x = uint64(b[0])<<16 | uint64(b[n>>1])<<8 | uint64(b[n-1])
	}
	hi, lo := bits.Mul64(x^k0^uint64(n), y^k1)
	return hi ^ lo
}

// find returns the index of the slot of tok: the slot that holds it, or
// the empty slot where it belongs, and whether it was found. toks gives
// the full key of long tokens.
func (t *wordTable) find(tok []byte, h uint64, toks []tokMemo) (int, bool) {
	mask := uint64(len(t.slots) - 1)
	for i := h & mask; ; i = (i + 1) & mask {
		s := &t.slots[i]
		switch {
		case s.klen == 0:
			return int(i), false
		case len(tok) <= wKey:
			if int(s.klen) == len(tok) && string(s.key[:len(tok)]) == string(tok) {
				return int(i), true
			}
		case s.klen == wLong:
			if string(s.key[:]) == string(tok[:wKey]) && toks[s.ti].key == string(tok) {
				return int(i), true
			}
		}
	}
}

// grow doubles the table (or makes its first 1024 slots).
func (t *wordTable) grow(toks []tokMemo) {
	old := t.slots
	t.slots = make([]wslot, max(2*len(old), 1024))
	for i := range old {
		if s := &old[i]; s.klen != 0 {
			t.slots[t.slotOf(s, toks)] = *s
		}
	}
}

// slotOf returns where the token of slot s (of this table or an older
// one) is, or belongs, in the table.
func (t *wordTable) slotOf(s *wslot, toks []tokMemo) int {
	key := s.key[:min(int(s.klen), wKey)]
	if s.klen == wLong {
		key = []byte(toks[s.ti].key)
	}
	i, _ := t.find(key, hashToken(key), toks)
	return i
}
