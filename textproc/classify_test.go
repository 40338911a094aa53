package textproc

import (
	"bytes"
	"math/rand/v2"
	"testing"
)

// TestClassifyASCIIMatchesGo compares classifyASCII (SSE2 assembly on
// amd64) with classifyASCIIGo, byte for byte and bit for bit, on blocks
// made of the bytes at the edges of every class, of random bytes, and of
// plain ASCII text (common practice, no outside source: two
// implementations of one function held to each other). On other
// architectures the two are one function and the test checks nothing
// more than that.
func TestClassifyASCIIMatchesGo(t *testing.T) {
	edges := []byte("@AZ[`az{/09:'\x00\x20\x7f\x80\xc3\xff -.,")
	r := rand.New(rand.NewPCG(21, 22))
	var blocks [][]byte
	for range 20000 {
		b := make([]byte, 64)
		switch r.IntN(3) {
		case 0: // edges of the classes
			for i := range b {
				b[i] = edges[r.IntN(len(edges))]
			}
		case 1: // any byte, most of them ASCII
			for i := range b {
				b[i] = byte(r.IntN(128))
				if r.IntN(200) == 0 {
					b[i] = byte(r.IntN(256))
				}
			}
		default: // ASCII letters, digits and spaces, one stopping byte at most
			for i := range b {
				b[i] = "abcXYZ0189 ,."[r.IntN(13)]
			}
			if r.IntN(2) == 0 {
				b[r.IntN(64)] = edges[r.IntN(len(edges))]
			}
		}
		blocks = append(blocks, b)
	}
	for c := range 256 { // every byte value in every position class
		blocks = append(blocks, bytes.Repeat([]byte{byte(c)}, 64))
	}
	for _, b := range blocks {
		for _, lower := range []bool{false, true} {
			var gotOut, wantOut [64]byte
			gw, ga, gok := classifyASCII(&gotOut[0], &b[0], lower)
			ww, wa, wok := classifyASCIIGo(&wantOut[0], &b[0], lower)
			if gok != wok {
				t.Fatalf("%q lower=%v: ok %v, want %v", b, lower, gok, wok)
			}
			if !wok {
				continue
			}
			if gw != ww || ga != wa || gotOut != wantOut {
				t.Fatalf("%q lower=%v: word %064b alpha %064b %q, want %064b %064b %q",
					b, lower, gw, ga, gotOut[:], ww, wa, wantOut[:])
			}
		}
	}
}
