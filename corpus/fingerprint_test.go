package corpus_test

import (
	"crypto/sha256"
	"regexp"
	"testing"
	"testing/fstest"

	"assay/corpus"
)

// fingerprint walks fsys and returns the fingerprint of its documents.
func fingerprint(t *testing.T, fsys fstest.MapFS) string {
	t.Helper()
	docs, _ := walkAll(t, fsys, corpus.Options{})
	var f corpus.Fingerprint
	for i := range docs {
		f.Add(&docs[i])
	}
	return f.String()
}

// fingerprintFormat is the documented form: "sha256:" and 64 hex digits
// (doc comment of Fingerprint.String).
var fingerprintFormat = regexp.MustCompile(`^sha256:[0-9a-f]{64}$`)

func TestFingerprint(t *testing.T) {
	base := fstest.MapFS{
		"a.txt":     file("Flood warning for the lower meadows."),
		"b/c.md":    file("# Gauge readings\n\n3.42 m at dawn."),
		"b/d.rst":   file("Sampling schedule\n================="),
		"notes.pdf": file("%PDF-1.7"), // skipped, so not part of it
	}
	fp := fingerprint(t, base)
	if !fingerprintFormat.MatchString(fp) {
		t.Fatalf("fingerprint %q does not match %v", fp, fingerprintFormat)
	}

	t.Run("same documents, same fingerprint", func(t *testing.T) {
		again := fstest.MapFS{}
		for p, f := range base {
			again[p] = file(string(f.Data))
		}
		if got := fingerprint(t, again); got != fp {
			t.Errorf("fingerprint %q, want %q for the same documents", got, fp)
		}
	})
	t.Run("String does not change the state", func(t *testing.T) {
		var f corpus.Fingerprint
		d := corpus.Document{ID: "a.txt", Hash: sha256.Sum256([]byte("x"))}
		f.Add(&d)
		if s1, s2 := f.String(), f.String(); s1 != s2 {
			t.Errorf("String() twice gave %q and %q", s1, s2)
		}
	})

	changes := []struct {
		name   string
		change func(fstest.MapFS)
	}{
		{"one byte of content", func(m fstest.MapFS) { m["b/c.md"] = file("# Gauge readings\n\n3.43 m at dawn.") }},
		{"one byte appended", func(m fstest.MapFS) { m["a.txt"] = file("Flood warning for the lower meadows.\n") }},
		{"an ID", func(m fstest.MapFS) { m["b/e.rst"] = m["b/d.rst"]; delete(m, "b/d.rst") }},
		{"a document more", func(m fstest.MapFS) { m["e.txt"] = file("Another document.") }},
		{"a document less", func(m fstest.MapFS) { delete(m, "a.txt") }},
	}
	for _, c := range changes {
		t.Run("changed "+c.name, func(t *testing.T) {
			m := fstest.MapFS{}
			for p, f := range base {
				m[p] = file(string(f.Data))
			}
			c.change(m)
			got := fingerprint(t, m)
			if got == fp {
				t.Errorf("fingerprint unchanged (%q) after changing %s", got, c.name)
			}
			if !fingerprintFormat.MatchString(got) {
				t.Errorf("fingerprint %q does not match %v", got, fingerprintFormat)
			}
		})
	}

	t.Run("skipped files do not count", func(t *testing.T) {
		m := fstest.MapFS{}
		for p, f := range base {
			m[p] = file(string(f.Data))
		}
		m["notes.pdf"] = file("%PDF-2.0")
		if got := fingerprint(t, m); got != fp {
			t.Errorf("fingerprint %q, want %q: only documents count", got, fp)
		}
	})
}

// TestFingerprintEmpty checks the fingerprint of no documents: the SHA-256
// of nothing, e3b0c442...b855 (FIPS 180-4; well known, from memory, and
// checked with coreutils `sha256sum </dev/null`).
func TestFingerprintEmpty(t *testing.T) {
	var f corpus.Fingerprint
	want := "sha256:e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855"
	if got := f.String(); got != want {
		t.Errorf("empty fingerprint %q, want %q", got, want)
	}
}
