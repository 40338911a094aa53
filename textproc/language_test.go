package textproc_test

import (
	"slices"
	"testing"

	"assay/textproc"
)

// The seven stemmed languages are those with a package in
// github.com/kljensen/snowball v0.10.0 (english, french, spanish, russian,
// swedish, norwegian, hungarian); the codes are ISO 639-1 (written from
// memory).
func TestLanguages(t *testing.T) {
	want := []textproc.Language{textproc.English, textproc.French, textproc.Spanish, textproc.Russian,
		textproc.Swedish, textproc.Norwegian, textproc.Hungarian}
	if got := textproc.Languages(); !slices.Equal(got, want) {
		t.Errorf("Languages() = %q, want %q", got, want)
	}
	codes := []string{"en", "fr", "es", "ru", "sv", "no", "hu"}
	for i, l := range want {
		if got := l.Code(); got != codes[i] {
			t.Errorf("%s.Code() = %q, want %q", l, got, codes[i])
		}
	}
	if got := textproc.Undetermined.Code(); got != "und" {
		t.Errorf("Undetermined.Code() = %q, want %q", got, "und")
	}
	if got := textproc.Auto.Code(); got != "" {
		t.Errorf("Auto.Code() = %q, want \"\"", got)
	}
}

func TestParseLanguage(t *testing.T) {
	good := map[string]textproc.Language{
		"": textproc.Auto, "auto": textproc.Auto, " AUTO ": textproc.Auto,
		"english": textproc.English, "en": textproc.English, "French": textproc.French,
		"fr": textproc.French, "es": textproc.Spanish, "RU": textproc.Russian,
		"swedish": textproc.Swedish, "no": textproc.Norwegian, "nb": textproc.Norwegian,
		"hu": textproc.Hungarian, "und": textproc.Undetermined,
	}
	for in, want := range good {
		if got, err := textproc.ParseLanguage(in); err != nil || got != want {
			t.Errorf("ParseLanguage(%q) = %q, %v; want %q", in, got, err, want)
		}
	}
	for _, in := range []string{"german", "de", "eng", "fr:"} {
		if got, err := textproc.ParseLanguage(in); err == nil {
			t.Errorf("ParseLanguage(%q) = %q, want an error", in, got)
		}
	}
}

func TestNewAnalyzerUnknownLanguage(t *testing.T) {
	defer func() {
		if recover() == nil {
			t.Error("NewAnalyzer with Lang \"german\" did not panic")
		}
	}()
	textproc.NewAnalyzer(textproc.Options{Lang: "german"})
}

// TestSplitTerm checks the keying rule of doc.go ("Keying") both ways.
func TestSplitTerm(t *testing.T) {
	tests := []struct {
		term string
		lang textproc.Language
		bare string
	}{
		{"flood", textproc.English, "flood"},
		{"fr:maison", textproc.French, "maison"},
		{"es:cas", textproc.Spanish, "cas"},
		{"ru:город", textproc.Russian, "город"},
		{"sv:barn", textproc.Swedish, "barn"},
		{"no:barn", textproc.Norwegian, "barn"},
		{"hu:gyerek", textproc.Hungarian, "gyerek"},
		{"und:水道", textproc.Undetermined, "水道"},
		{"und:2026", textproc.Undetermined, "2026"},
	}
	for _, tt := range tests {
		l, bare := textproc.SplitTerm(tt.term)
		if l != tt.lang || bare != tt.bare {
			t.Errorf("SplitTerm(%q) = %q, %q; want %q, %q", tt.term, l, bare, tt.lang, tt.bare)
		}
		if got := textproc.JoinTerm(tt.lang, tt.bare); got != tt.term {
			t.Errorf("JoinTerm(%q, %q) = %q, want %q", tt.lang, tt.bare, got, tt.term)
		}
	}
	// A colon after an unknown code is not a key: such a term is bare
	// (English). The analyzer never makes one, since tokens hold no colon.
	if l, bare := textproc.SplitTerm("xx:yy"); l != textproc.English || bare != "xx:yy" {
		t.Errorf("SplitTerm(%q) = %q, %q", "xx:yy", l, bare)
	}
}
