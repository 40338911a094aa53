package textproc

import (
	"math/rand/v2"
	"strings"
	"testing"
	"unsafe"
)

// The probe of the memo (Analyzer.probe) hashes and compares a token by
// words loaded from the tokenizer's arena, with whatever bytes follow
// the token; find does it from the token's bytes alone. The two must
// agree, or a token seen before would be missed by the probe (slower,
// same result) or, worse, taken for another. Common practice, no
// outside source: the check is exhaustive over lengths, random over
// contents.

func TestPaddedWordsMatchHeadWords(t *testing.T) {
	r := rand.New(rand.NewPCG(3, 4))
	buf := make([]byte, 64)
	for trial := 0; trial < 20000; trial++ {
		for i := range buf {
			buf[i] = byte(r.UintN(256))
		}
		n := 1 + trial%wKey
		tok := append([]byte(nil), buf[:n]...)
		x, y := headWords(tok)
		px, py := paddedWords(buf[:headBytes], n)
		if x != px || y != py {
			t.Fatalf("length %d: paddedWords %x %x, headWords %x %x", n, px, py, x, y)
		}
		if h := hashToken(tok); h != hashHead(x, y, n) {
			t.Fatalf("length %d: hashToken %x, hashHead %x", n, h, hashHead(x, y, n))
		}
		// A slot holding tok gives the same head, with the length on top.
		var s wslot
		copy(s.key[:wKey], tok)
		s.key[wKey] = uint8(n)
		if sx, sy := s.head(); sx != x || sy != y|uint64(n)<<56 {
			t.Fatalf("length %d: slot head %x %x, token %x %x", n, sx, sy, x, y|uint64(n)<<56)
		}
		// A token that is a prefix of another, or differs in one byte,
		// has other head words.
		if n > 1 {
			if px, py := headWords(tok[:n-1]); px == x && py|uint64(n-1)<<56 == y|uint64(n)<<56 {
				t.Fatalf("length %d: a prefix has the same head", n)
			}
		}
		other := append([]byte(nil), tok...)
		other[r.IntN(n)] ^= byte(1 + r.UintN(255))
		if ox, oy := headWords(other); ox == x && oy == y {
			t.Fatalf("length %d: %q and %q have the same head", n, tok, other)
		}
	}
}

// TestProbeFindsWhatFindFinds analyses documents twice: on the second
// pass every token is in the memo, and every slot the probe reports must
// be the one find reports; most short tokens must be found by the probe
// (at least those in their home slot, which is most of them at a load
// factor of at most one half).
func TestProbeFindsWhatFindFinds(t *testing.T) {
	r := rand.New(rand.NewPCG(5, 6))
	var docs []string
	for range 40 {
		var b strings.Builder
		for range 300 {
			n := 1 + r.IntN(16)
			for range n {
				b.WriteByte(byte('a' + r.IntN(6)))
			}
			b.WriteByte(' ')
		}
		docs = append(docs, b.String())
	}
	a := NewAnalyzer(Options{Lang: English})
	for _, d := range docs {
		a.Analyze(d, func(string, string) {})
	}
	found, short := 0, 0
	for _, d := range docs {
		a.tokenize(d)
		a.probe()
		for k, si := range a.at {
			b := a.tok.token(a.tok.refs[k])
			want, ok := a.words.find(b, hashToken(b), a.toks)
			if !ok {
				t.Fatalf("%q not in the memo on the second pass", b)
			}
			if len(b) <= wKey {
				short++
			}
			if si >= 0 {
				found++
				if int(si) != want {
					t.Fatalf("%q: probe says slot %d, find %d", b, si, want)
				}
			} else if len(b) <= wKey && int(hashToken(b)&uint64(len(a.words.slots)-1)) == want {
				t.Fatalf("%q is in its home slot %d but the probe missed it", b, want)
			}
		}
	}
	if found < short/2 {
		t.Errorf("the probe found %d of %d short tokens", found, short)
	}
}

// TestLongTokensTellApart feeds the memo tokens longer than a slot holds
// that share their first wKey bytes (the slot's part) and differ only
// after it: in the next 8 bytes (tokMemo.tail), beyond them, or in length
// alone. Each must get a slot of its own and find it again. Common
// practice, no outside source.
func TestLongTokensTellApart(t *testing.T) {
	a := NewAnalyzer(Options{})
	r := rand.New(rand.NewPCG(8, 9))
	head := "abcdefghijklmno" // wKey bytes
	seen := map[string]int32{}
	var toks []string
	for n := wKey + 1; n <= wKey+20; n++ {
		for range 30 {
			b := []byte(head + strings.Repeat("z", n-wKey))
			b[wKey+r.IntN(n-wKey)] = byte('a' + r.IntN(3))
			toks = append(toks, string(b))
		}
	}
	// Pass 0 adds them (the table may grow meanwhile); passes 1 and 2 only
	// find them, so their slots stay put.
	for pass := range 3 {
		for _, tok := range toks {
			si := a.wordSlot([]byte(tok), scriptLatin)
			if got := a.toks[a.words.slots[si].ti].key; got != tok {
				t.Fatalf("pass %d: %q found the slot of %q", pass, tok, got)
			}
			if want, ok := seen[tok]; pass == 2 && (!ok || want != si) {
				t.Fatalf("%q in slot %d, before in %d", tok, si, want)
			}
			if pass == 1 {
				seen[tok] = si
			}
		}
	}
	if a.words.used != len(seen) {
		t.Fatalf("%d slots used for %d distinct tokens", a.words.used, len(seen))
	}
}

// A slot is half a 64-byte cache line, so that a look-up reads one line;
// the layout of wslot is chosen for it (a guard, not a correctness check).
func TestSlotIs32Bytes(t *testing.T) {
	if n := unsafe.Sizeof(wslot{}); n != 32 {
		t.Fatalf("wslot is %d bytes, want 32", n)
	}
}
