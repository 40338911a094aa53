package selection

import (
	"math/rand/v2"
	"slices"
	"testing"
)

// TermHash is 64-bit FNV-1a: the test vectors "" → cbf29ce484222325 (the
// offset basis), "a" → af63dc4c8601ec8c and "foobar" → 85944171f73967e8
// are from the FNV reference test suite (Fowler, Noll and Vo; values from
// memory, checked here against an independent few-line computation in
// Python). Shingles gives one hash a run of three terms, in order, and
// the terms themselves for a text of fewer than three.
func TestTermHashAndShingles(t *testing.T) {
	for in, want := range map[string]uint64{"": 0xcbf29ce484222325, "a": 0xaf63dc4c8601ec8c, "foobar": 0x85944171f73967e8} {
		if got := TermHash(in); got != want {
			t.Errorf("TermHash(%q) = %x, want %x", in, got, want)
		}
	}
	terms := []uint64{1, 2, 3, 4}
	got := Shingles(terms)
	if len(got) != 2 || got[0] == got[1] {
		t.Fatalf("Shingles of 4 terms: %x, want 2 distinct hashes", got)
	}
	if again := Shingles([]uint64{9, 1, 2, 3}); again[1] != got[0] {
		t.Errorf("the shingle (1, 2, 3) hashes differently at another position: %x vs %x", again[1], got[0])
	}
	if short := Shingles([]uint64{5, 6}); !slices.Equal(short, []uint64{5, 6}) {
		t.Errorf("Shingles of 2 terms = %v, want the terms", short)
	}
}

// MinHashTerms must give exactly the signature MinHash gives of the
// shingles, for texts shorter than a shingle, of one shingle and long
// ones, with repeated terms: signatures are kept in indexes and compared
// with signatures made the other way.
func TestMinHashTermsMatchesShingles(t *testing.T) {
	rng := rand.New(rand.NewPCG(11, 12))
	want := make([]uint32, MinHashes)
	got := make([]uint32, MinHashes)
	for _, n := range []int{0, 1, 2, 3, 4, 5, 17, 128, 300, 5000} {
		for trial := range 20 {
			terms := make([]uint64, n)
			for i := range terms {
				terms[i] = rng.Uint64N(uint64(1 + trial*n)) // few distinct terms in the early trials
			}
			seed := rng.Uint64()
			MinHash(want, Shingles(terms), seed)
			MinHashTerms(got, terms, seed)
			if !slices.Equal(got, want) {
				t.Fatalf("%d terms, trial %d: MinHashTerms differs from MinHash of the shingles", n, trial)
			}
		}
	}
}
