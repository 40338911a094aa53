package store

import (
	"encoding/binary"
	"fmt"
)

// termCount is one entry of a document's terms BLOB: a word id and how
// often the term occurs.
type termCount struct {
	id int64
	n  int
}

// formCount is one entry of a document's forms BLOB: the word ids of a
// term and of one of its surface forms, and how often that form occurs.
type formCount struct {
	term, form int64
	n          int
}

// appendTerms appends the terms BLOB of tc, which is sorted by id with no
// id twice (see the package documentation).
func appendTerms(dst []byte, tc []termCount) []byte {
	prev := int64(0)
	for _, e := range tc {
		dst = binary.AppendUvarint(dst, uint64(e.id-prev))
		dst = binary.AppendUvarint(dst, uint64(e.n))
		prev = e.id
	}
	return dst
}

// appendForms appends the forms BLOB of fc, sorted by (term, form) with no
// pair twice.
func appendForms(dst []byte, fc []formCount) []byte {
	prev := int64(0)
	for _, e := range fc {
		dst = binary.AppendUvarint(dst, uint64(e.term-prev))
		dst = binary.AppendVarint(dst, e.form-e.term)
		dst = binary.AppendUvarint(dst, uint64(e.n))
		prev = e.term
	}
	return dst
}

// appendSig appends the sig BLOB of sig: each value as 4 bytes,
// little-endian.
func appendSig(dst []byte, sig []uint32) []byte {
	for _, v := range sig {
		dst = binary.LittleEndian.AppendUint32(dst, v)
	}
	return dst
}

// decodeSig reads a sig BLOB; nil (SQL NULL) gives nil.
func decodeSig(b []byte) ([]uint32, error) {
	if b == nil {
		return nil, nil
	}
	if len(b)%4 != 0 {
		return nil, errBlob("sig", len(b)-len(b)%4)
	}
	sig := make([]uint32, len(b)/4)
	for i := range sig {
		sig[i] = binary.LittleEndian.Uint32(b[4*i:])
	}
	return sig, nil
}

// errBlob describes a BLOB that does not decode; the caller wraps it with
// ErrDamaged.
func errBlob(what string, at int) error {
	return fmt.Errorf("%s BLOB malformed at byte %d", what, at)
}

// uvarint reads an unsigned varint of b at *at, advancing *at.
func uvarint(b []byte, at *int) (uint64, bool) {
	v, n := binary.Uvarint(b[*at:])
	if n <= 0 {
		return 0, false
	}
	*at += n
	return v, true
}

// decodeTerms calls fn with each (term, count) of a terms BLOB; word
// gives the word of an id.
func decodeTerms(b []byte, word func(id int64) (string, bool), fn func(term string, n int)) error {
	var w string
	return decodeTermIDs(b, func(id int64) bool {
		var ok bool
		w, ok = word(id)
		return ok
	}, func(_ int64, n int) { fn(w, n) })
}

// decodeTermIDs calls fn with each (word id, count) of a terms BLOB, in
// increasing id order; valid says whether an id names a word (it is
// called just before fn with the same id).
func decodeTermIDs(b []byte, valid func(id int64) bool, fn func(id int64, n int)) error {
	at, id := 0, int64(0)
	for at < len(b) {
		start := at
		d, ok1 := uvarint(b, &at)
		n, ok2 := uvarint(b, &at)
		if !ok1 || !ok2 || d == 0 || n == 0 || n > 1<<62 {
			return errBlob("terms", start)
		}
		id += int64(d)
		if !valid(id) {
			return errBlob("terms", start)
		}
		fn(id, int(n))
	}
	return nil
}

// decodeForms calls fn with each (term, form, count) of a forms BLOB.
func decodeForms(b []byte, word func(id int64) (string, bool), fn func(term, form string, n int)) error {
	return decodeFormIDs(b, func(id int64) bool { _, ok := word(id); return ok }, func(t, f int64, n int) {
		tw, _ := word(t)
		fw, _ := word(f)
		fn(tw, fw, n)
	})
}

// decodeFormIDs calls fn with each (term id, form id, count) of a forms
// BLOB; valid says whether an id names a word.
func decodeFormIDs(b []byte, valid func(id int64) bool, fn func(term, form int64, n int)) error {
	at, term := 0, int64(0)
	for at < len(b) {
		start := at
		d, ok1 := uvarint(b, &at)
		var off int64
		ok2 := false
		if ok1 {
			var k int
			off, k = binary.Varint(b[at:])
			if k > 0 {
				at += k
				ok2 = true
			}
		}
		n, ok3 := uvarint(b, &at)
		if !ok1 || !ok2 || !ok3 || n == 0 || n > 1<<62 {
			return errBlob("forms", start)
		}
		term += int64(d)
		if !valid(term) || !valid(term+off) {
			return errBlob("forms", start)
		}
		fn(term, term+off, int(n))
	}
	return nil
}

// wordTable maps word ids to words, as loaded from the words table.
type wordTable struct {
	words []string
	used  []bool
}

// set records word id.
func (w *wordTable) set(id int64, s string) {
	for int64(len(w.words)) <= id {
		w.words = append(w.words, "")
		w.used = append(w.used, false)
	}
	w.words[id], w.used[id] = s, true
}

// valid reports whether id names a word.
func (w *wordTable) valid(id int64) bool {
	return id >= 1 && id < int64(len(w.words)) && w.used[id]
}

// get returns the word of id, if there is one.
func (w *wordTable) get(id int64) (string, bool) {
	if !w.valid(id) {
		return "", false
	}
	return w.words[id], true
}
