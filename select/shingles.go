package selection

// ShingleLength is the number of consecutive terms in a word shingle.
const ShingleLength = 3

// Shingles returns the hashes of the runs of ShingleLength consecutive
// terms (given by their TermHash, all the terms of a document before
// pruning); a text shorter than that gives its terms one by one. These are
// the items a document's [MinHash] signature is made of.
func Shingles(terms []uint64) []uint64 {
	if len(terms) < ShingleLength {
		return terms
	}
	out := make([]uint64, 0, len(terms)-ShingleLength+1)
	for i := 0; i+ShingleLength <= len(terms); i++ {
		out = append(out, shingle(terms[i:i+ShingleLength]))
	}
	return out
}

// shingle is the hash of one run of ShingleLength terms.
func shingle(run []uint64) uint64 {
	_ = run[ShingleLength-1]
	h := uint64(ShingleLength)
	for _, t := range run[:ShingleLength] {
		h = h*0x100000001b3 ^ t
	}
	return h
}

// MinHashTerms writes into dst the signature that [MinHash] makes of
// Shingles(terms), without building the shingles: it is what a worker
// calls for every document, and the shingles would be a slice as long as
// the document each time.
func MinHashTerms(dst []uint32, terms []uint64, seed uint64) {
	if len(terms) < ShingleLength {
		MinHash(dst, terms, seed)
		return
	}
	if len(dst) != MinHashes {
		panic("selection: MinHashTerms needs a signature of MinHashes values")
	}
	var bins minBins
	bins.reset()
	for i := 0; i+ShingleLength <= len(terms); i++ {
		bins.add(shingle(terms[i:i+ShingleLength]), seed)
	}
	bins.write(dst, seed)
}

// TermHash is the 64-bit FNV-1a hash of a term: a hash that depends only
// on the term, so that signatures made in different runs (and kept in an
// index) agree.
func TermHash(s string) uint64 {
	h := uint64(0xcbf29ce484222325)
	for i := 0; i < len(s); i++ {
		h ^= uint64(s[i])
		h *= 0x100000001b3
	}
	return h
}
