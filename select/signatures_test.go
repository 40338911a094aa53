package selection

import "testing"

// TestSignaturesAcrossChunks checks that the chunked store gives back
// every signature as it was added, on both sides of a chunk boundary, and
// that a later Add does not disturb an earlier one (common practice for a
// container, no outside source).
func TestSignaturesAcrossChunks(t *testing.T) {
	var s Signatures
	n := 2*SignatureChunk + 3
	sig := make([]uint32, MinHashes)
	for i := range n {
		for j := range sig {
			sig[j] = uint32(i*MinHashes + j)
		}
		s.Add(sig)
	}
	if s.Len() != n {
		t.Fatalf("len = %d, want %d", s.Len(), n)
	}
	for _, i := range []int{0, 1, SignatureChunk - 1, SignatureChunk, SignatureChunk + 1, 2 * SignatureChunk, n - 1} {
		got := s.At(i)
		if len(got) != MinHashes || cap(got) != MinHashes {
			t.Fatalf("at(%d): len %d cap %d, want %d", i, len(got), cap(got), MinHashes)
		}
		for j, v := range got {
			if want := uint32(i*MinHashes + j); v != want {
				t.Fatalf("at(%d)[%d] = %d, want %d", i, j, v, want)
			}
		}
	}
}

// TestSignatureSlabCutsApart checks that the room Next hands out is
// MinHashes long with no capacity beyond, and that no two pieces overlap,
// within a slab and across slabs (common practice for an allocator, no
// outside source).
func TestSignatureSlabCutsApart(t *testing.T) {
	var s SignatureSlab
	var pieces [][]uint32
	for i := range SignatureSlabSize + 2 {
		p := s.Next()
		if len(p) != MinHashes || cap(p) != MinHashes {
			t.Fatalf("piece %d: len %d cap %d, want %d", i, len(p), cap(p), MinHashes)
		}
		for j := range p {
			p[j] = uint32(i)
		}
		pieces = append(pieces, p)
	}
	for i, p := range pieces {
		for j, v := range p {
			if v != uint32(i) {
				t.Fatalf("piece %d[%d] = %d: overwritten by piece %d", i, j, v, v)
			}
		}
	}
}
