package textproc_test

import (
	"strings"
	"testing"
	"unicode/utf8"

	"assay/textproc"
)

// FuzzAnalyze checks invariants of Analyze on any input, in auto mode:
// it does not panic, the language is one of Languages or Undetermined,
// every term is non-empty, splits into a language and a non-empty bare
// form that join back to the term, holds no colon in its bare form, and
// every surface is valid UTF-8.
func FuzzAnalyze(f *testing.F) {
	for _, s := range []string{
		"", "The gate was shut.", "L'eau d'hiver", "Ёжик нашёл ещё", "水道水 dam'水",
		"น้ำท่วม", "저수지 수위", "a\u0301\u0301'", "''''", "x:y fr:maison", "\xff\xfe",
	} {
		f.Add(s)
	}
	valid := map[textproc.Language]bool{textproc.Undetermined: true}
	for _, l := range textproc.Languages() {
		valid[l] = true
	}
	f.Fuzz(func(t *testing.T, text string) {
		a := textproc.NewAnalyzer(textproc.Options{KeepNumbers: true})
		lang := a.Analyze(text, func(term, surface string) {
			l, bare := textproc.SplitTerm(term)
			if bare == "" || strings.ContainsRune(bare, ':') || textproc.JoinTerm(l, bare) != term {
				t.Errorf("term %q splits into %q, %q", term, l, bare)
			}
			if !utf8.ValidString(surface) || surface == "" {
				t.Errorf("surface %q of %q", surface, term)
			}
		})
		if !valid[lang] {
			t.Errorf("language %q", lang)
		}
	})
}
