package selection

// Signatures holds MinHash signatures ([MinHashes] values each), in the
// order they are added, in chunks of [SignatureChunk], so that adding one
// never moves those before it. One slice grown by append would copy them
// all again at each growth: for the 51 MB of 100,000 signatures, 300 MB
// allocated and moved by the one goroutine that gathers them. The zero
// value is empty and ready to use.
type Signatures struct {
	chunks [][]uint32
	n      int
}

// SignatureChunk is the number of signatures in a chunk of [Signatures]:
// 2 MiB.
const SignatureChunk = 4096

// Add appends a copy of sig, which must have [MinHashes] values.
func (s *Signatures) Add(sig []uint32) {
	if len(sig) != MinHashes {
		panic("selection: Signatures.Add needs a signature of MinHashes values")
	}
	k := s.n % SignatureChunk
	if k == 0 {
		s.chunks = append(s.chunks, make([]uint32, SignatureChunk*MinHashes))
	}
	copy(s.chunks[len(s.chunks)-1][k*MinHashes:], sig)
	s.n++
}

// At returns signature i, not a copy.
func (s *Signatures) At(i int) []uint32 {
	k := i % SignatureChunk * MinHashes
	return s.chunks[i/SignatureChunk][k : k+MinHashes : k+MinHashes]
}

// Len returns the number of signatures.
func (s *Signatures) Len() int { return s.n }

// SignatureSlab hands out room for one signature at a time, cut from
// slabs of [SignatureSlabSize] signatures: one allocation a slab rather
// than one a document, for a goroutine that signs documents whose
// signatures are copied elsewhere (into [Signatures]) once made. A slab
// stays alive while any signature cut from it does. The zero value is
// ready to use; it is not safe for concurrent use.
type SignatureSlab struct {
	free []uint32
}

// SignatureSlabSize is the number of signatures in a slab of
// [SignatureSlab].
const SignatureSlabSize = 256

// Next returns room for a signature: [MinHashes] values, with no room
// beyond them.
func (s *SignatureSlab) Next() []uint32 {
	if len(s.free) == 0 {
		s.free = make([]uint32, SignatureSlabSize*MinHashes)
	}
	sig := s.free[:MinHashes:MinHashes]
	s.free = s.free[MinHashes:]
	return sig
}
