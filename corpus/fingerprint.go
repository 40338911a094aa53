package corpus

import (
	"crypto/sha256"
	"encoding/hex"
	"hash"
)

// Fingerprint accumulates a SHA-256 over the documents of a corpus (ID and
// content hash of each, in the order added), so that a report can say which
// input it was computed from. The zero value is ready to use.
type Fingerprint struct {
	h hash.Hash
}

// Add records one document.
func (f *Fingerprint) Add(d *Document) {
	if f.h == nil {
		f.h = sha256.New()
	}
	f.h.Write([]byte(d.ID))
	f.h.Write([]byte{0})
	f.h.Write(d.Hash[:])
}

// String returns the fingerprint as "sha256:" and 64 hex digits.
func (f *Fingerprint) String() string {
	if f.h == nil {
		f.h = sha256.New()
	}
	return "sha256:" + hex.EncodeToString(f.h.Sum(nil))
}
