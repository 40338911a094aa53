package store

import (
	"fmt"
	"math/rand/v2"
	"slices"
	"testing"
)

// The BLOB encodings give back what they were given, for random sorted
// entries with ids up to 2^40 and counts up to 2^40 (varints of up to six
// bytes), forms below and above their term's id; and a malformed BLOB (cut
// short, a zero step, an id without a word) is an error, never a panic or
// a wrong count. The varints are encoding/binary's (Uvarint, Varint).
func TestCodecRoundTrip(t *testing.T) {
	r := rand.New(rand.NewPCG(1, 2))
	for range 500 {
		var tc []termCount
		var fc []formCount
		id := int64(0)
		for range r.IntN(40) {
			id += 1 + r.Int64N(1<<r.IntN(40))
			tc = append(tc, termCount{id, 1 + r.IntN(1<<r.IntN(40))})
			forms := map[int64]bool{}
			for range 1 + r.IntN(3) {
				f := max(1, id+r.Int64N(200)-100)
				if !forms[f] {
					forms[f] = true
					fc = append(fc, formCount{id, f, 1 + r.IntN(1000)})
				}
			}
		}
		slices.SortFunc(fc, func(x, y formCount) int {
			if x.term != y.term {
				return int(x.term - y.term)
			}
			return int(x.form - y.form)
		})
		var gotT []termCount
		if err := decodeTerms(appendTerms(nil, tc), sparseWord, func(w string, n int) {
			gotT = append(gotT, termCount{idOf(w), n})
		}); err != nil || !slices.Equal(gotT, tc) {
			t.Fatalf("terms: %v, got %v want %v", err, gotT, tc)
		}
		var gotF []formCount
		if err := decodeForms(appendForms(nil, fc), sparseWord, func(tw, fw string, n int) {
			gotF = append(gotF, formCount{idOf(tw), idOf(fw), n})
		}); err != nil || !slices.Equal(gotF, fc) {
			t.Fatalf("forms: %v, got %v want %v", err, gotF, fc)
		}
	}
}

// sparseWord is the word of any id ≥ 1 in the tests: "w<id>"; idOf
// inverts it.
func sparseWord(id int64) (string, bool) {
	if id < 1 {
		return "", false
	}
	return fmt.Sprintf("w%d", id), true
}

func idOf(s string) int64 {
	var id int64
	fmt.Sscanf(s, "w%d", &id)
	return id
}

func TestCodecMalformed(t *testing.T) {
	words := &wordTable{}
	for id := int64(1); id <= 3; id++ {
		words.set(id, fmt.Sprintf("w%d", id))
	}
	good := appendTerms(nil, []termCount{{1, 2}, {3, 300}})
	for name, b := range map[string][]byte{
		"cut in a varint": good[:len(good)-1],
		"cut after an id": good[:1],
		"zero step":       {0, 1},
		"zero count":      {1, 0},
		"id without word": {4, 1},
		"overlong varint": {0x80, 0x80, 0x80, 0x80, 0x80, 0x80, 0x80, 0x80, 0x80, 0x80, 0x01},
	} {
		if err := decodeTerms(b, words.get, func(string, int) {}); err == nil {
			t.Errorf("terms, %s: no error", name)
		}
	}
	goodF := appendForms(nil, []formCount{{1, 2, 5}})
	for name, b := range map[string][]byte{
		"cut":             goodF[:len(goodF)-1],
		"form below 1":    {1, 1, 1}, // zig-zag 1 is -1: form id 0
		"form above last": {3, 2, 1}, // +1: id 4
		"zero count":      {1, 0, 0},
	} {
		if err := decodeForms(b, words.get, func(string, string, int) {}); err == nil {
			t.Errorf("forms, %s: no error", name)
		}
	}
}
