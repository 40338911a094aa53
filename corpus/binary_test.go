package corpus

import (
	"math/rand/v2"
	"testing"
)

// TestControlBytes checks the eight-bytes-at-a-time count of control
// bytes against the plain byte loop, on every byte value at every
// position of a word and on random buffers of every length up to 40 in
// which control bytes and the four allowed ones are common. Common
// practice, no outside source.
func TestControlBytes(t *testing.T) {
	plain := func(b []byte) int {
		n := 0
		for _, c := range b {
			if c < 0x20 && c != '\t' && c != '\n' && c != '\r' && c != '\f' {
				n++
			}
		}
		return n
	}
	for c := range 256 {
		for pos := range 9 {
			b := []byte("abcdefghi")
			b[pos] = byte(c)
			if got, want := controlBytes(b), plain(b); got != want {
				t.Fatalf("byte %#x at %d: %d, want %d", c, pos, got, want)
			}
		}
	}
	r := rand.New(rand.NewPCG(11, 12))
	pieces := []byte{0, 1, 8, 9, 10, 11, 12, 13, 14, 0x1f, 0x20, 'a', 0x7f, 0x80, 0x89, 0x8a, 0x9f, 0xa0, 0xff}
	for trial := range 20000 {
		b := make([]byte, trial%41)
		for i := range b {
			if r.IntN(2) == 0 {
				b[i] = pieces[r.IntN(len(pieces))]
			} else {
				b[i] = byte(r.UintN(256))
			}
		}
		if got, want := controlBytes(b), plain(b); got != want {
			t.Fatalf("%x: %d, want %d", b, got, want)
		}
	}
}
