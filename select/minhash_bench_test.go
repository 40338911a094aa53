package selection

import (
	"math/rand/v2"
	"testing"
)

// BenchmarkMinHash signs a document of 250 shingles, about the median
// length of the generated benchmark corpus after stop words (bench/gen);
// the bytes are the 8-byte shingle hashes.
func BenchmarkMinHash(b *testing.B) {
	rng := rand.New(rand.NewPCG(1, 2))
	items := make([]uint64, 250)
	for i := range items {
		items[i] = rng.Uint64()
	}
	dst := make([]uint32, MinHashes)
	b.SetBytes(int64(8 * len(items)))
	b.ReportAllocs()
	for b.Loop() {
		MinHash(dst, items, 7)
	}
}
