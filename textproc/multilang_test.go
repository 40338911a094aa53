package textproc_test

import (
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"assay/textproc"
)

// analyzeLang runs one Analyze call and returns its pairs and language.
func analyzeLang(opts textproc.Options, text string) ([]pair, textproc.Language) {
	var out []pair
	l := textproc.NewAnalyzer(opts).Analyze(text, func(term, surface string) {
		out = append(out, pair{term, surface})
	})
	return out, l
}

// TestAnalyzeLanguages analyses one invented sentence per language, in
// auto mode and with the language fixed. Expected stems are from Debian's
// python3-snowballstemmer 2.2.0, run as
//
//	/usr/bin/python3 -c "import snowballstemmer as s; print(s.stemmer('french').stemWords([...]))"
//
// on the kept words: french eau barrage surveille monte lentement → eau
// barrag surveil mont lent; spanish niños caminaban orilla río → niñ camin
// orill rio; russian ежик нашел одну елку → ежик нашел одн елк (ё written
// as е first, doc.go step 5); swedish barnen lekte sjön hela
// eftermiddagen → barn lekt sjön hel eftermiddag; norwegian barna lekte
// vannet hele ettermiddagen → barn lekt vann hel ettermiddag; hungarian
// gyerekek folyóparton játszottak délután → gyerek folyópart játszott
// délut. Stop words dropped are on the lists of stopwords.go.
func TestAnalyzeLanguages(t *testing.T) {
	tests := []struct {
		lang textproc.Language
		text string
		want []pair
	}{
		{textproc.French, "L'eau du barrage qu'on surveille monte lentement.", []pair{
			{"fr:eau", "eau"}, {"fr:barrag", "barrage"}, {"fr:surveil", "surveille"},
			{"fr:mont", "monte"}, {"fr:lent", "lentement"}}},
		{textproc.Spanish, "Los niños caminaban por la orilla del río.", []pair{
			{"es:niñ", "niños"}, {"es:camin", "caminaban"}, {"es:orill", "orilla"}, {"es:rio", "río"}}},
		{textproc.Russian, "Ёжик нашёл ещё одну ёлку у дома.", []pair{
			{"ru:ежик", "ёжик"}, {"ru:нашел", "нашёл"}, {"ru:одн", "одну"}, {"ru:елк", "ёлку"}, {"ru:дом", "дома"}}},
		{textproc.Swedish, "Barnen lekte vid sjön hela eftermiddagen och det var roligt.", []pair{
			{"sv:barn", "barnen"}, {"sv:lekt", "lekte"}, {"sv:sjön", "sjön"}, {"sv:hel", "hela"},
			{"sv:eftermiddag", "eftermiddagen"}, {"sv:rol", "roligt"}}},
		{textproc.Norwegian, "Barna lekte ved vannet hele ettermiddagen, og det var gøy.", []pair{
			{"no:barn", "barna"}, {"no:lekt", "lekte"}, {"no:vann", "vannet"}, {"no:hel", "hele"},
			{"no:ettermiddag", "ettermiddagen"}, {"no:gøy", "gøy"}}},
		{textproc.Hungarian, "A gyerekek a folyóparton játszottak egész délután, és nem fáztak.", []pair{
			{"hu:gyerek", "gyerekek"}, {"hu:folyópart", "folyóparton"}, {"hu:játszott", "játszottak"},
			{"hu:délut", "délután"}, {"hu:fázt", "fáztak"}}},
	}
	for _, tt := range tests {
		t.Run(string(tt.lang), func(t *testing.T) {
			for _, lang := range []textproc.Language{"", textproc.Auto, tt.lang} {
				got, l := analyzeLang(textproc.Options{Lang: lang}, tt.text)
				if l != tt.lang || !slices.Equal(got, tt.want) {
					t.Errorf("Lang %q: Analyze = %q in %q, want %q in %q", lang, got, l, tt.want, tt.lang)
				}
			}
		})
	}
}

// TestAnalyzeKeying checks the keying rule (doc.go, "Keying") and the
// per-language stop lists.
func TestAnalyzeKeying(t *testing.T) {
	// "son" is an English word (stem "son", python3-snowballstemmer 2.2.0)
	// and a French stop word (on the French list of stopwords.go).
	en, _ := analyzeLang(textproc.Options{Lang: textproc.English}, "son")
	fr, _ := analyzeLang(textproc.Options{Lang: textproc.French}, "son")
	if !slices.Equal(en, []pair{{"son", "son"}}) || len(fr) != 0 {
		t.Errorf("English %q, French %q", en, fr)
	}
	// "maisons": English stem "maison", French stem "maison"
	// (python3-snowballstemmer 2.2.0): same bare stem, two terms.
	en, _ = analyzeLang(textproc.Options{Lang: textproc.English}, "maisons")
	fr, _ = analyzeLang(textproc.Options{Lang: textproc.French}, "maisons")
	if !slices.Equal(en, []pair{{"maison", "maisons"}}) || !slices.Equal(fr, []pair{{"fr:maison", "maisons"}}) {
		t.Errorf("English %q, French %q", en, fr)
	}
}

// TestAnalyzeUndetermined checks what happens to a document whose language
// is not detected (doc.go, "Short documents"): no stemming, the union of
// the stop lists removed, terms keyed "und:".
func TestAnalyzeUndetermined(t *testing.T) {
	// "of", "the" English, "son" Spanish: a lead of one point.
	got, l := analyzeLang(textproc.Options{}, "Son of the Rivers")
	if want := []pair{{"und:rivers", "rivers"}}; l != textproc.Undetermined || !slices.Equal(got, want) {
		t.Errorf("Analyze = %q in %q, want %q in und", got, l, want)
	}
	// Lang Undetermined analyses every document so.
	got, l = analyzeLang(textproc.Options{Lang: textproc.Undetermined}, "The rivers were rising")
	if want := []pair{{"und:rivers", "rivers"}, {"und:rising", "rising"}}; l != textproc.Undetermined || !slices.Equal(got, want) {
		t.Errorf("Analyze = %q in %q, want %q in und", got, l, want)
	}
}

// TestAnalyzeOtherScripts checks doc.go step 4: in a document of one
// language, numbers and words in another script are Undetermined, and
// bigrams are always keyed "und:" (step 3).
func TestAnalyzeOtherScripts(t *testing.T) {
	opts := textproc.Options{Lang: textproc.English, KeepNumbers: true}
	// English stems (python3-snowballstemmer 2.2.0): gauges → gaug.
	got, _ := analyzeLang(opts, "Gauges 2026 водохранилище σίσυφος 水道水")
	want := []pair{
		{"gaug", "gauges"}, {"und:2026", "2026"}, {"und:водохранилище", "водохранилище"},
		{"und:σίσυφοσ", "σίσυφοσ"}, {"und:水道", "水道"}, {"und:道水", "道水"},
	}
	if !slices.Equal(got, want) {
		t.Errorf("Analyze = %q, want %q", got, want)
	}
	// In a Russian document the Latin word is the one of another script.
	// Russian stem of "водохранилище" (python3-snowballstemmer 2.2.0):
	// "водохранилищ".
	got, _ = analyzeLang(textproc.Options{Lang: textproc.Russian}, "водохранилище gauges")
	want = []pair{{"ru:водохранилищ", "водохранилище"}, {"und:gauges", "gauges"}}
	if !slices.Equal(got, want) {
		t.Errorf("Analyze = %q, want %q", got, want)
	}
	// A lone character is kept although it is below MinLength (step 8).
	got, l := analyzeLang(textproc.Options{}, "水")
	if want := []pair{{"und:水", "水"}}; l != textproc.Undetermined || !slices.Equal(got, want) {
		t.Errorf("Analyze = %q in %q, want %q", got, l, want)
	}
}

// TestAnalyzeFrenchElision checks doc.go step 5: elided words joined by an
// apostrophe are dropped, the rest of the token is analysed. Stems from
// python3-snowballstemmer 2.2.0 (French): eau → eau, hiver → hiv,
// aujourd'hui → aujourd'hui, île → île.
func TestAnalyzeFrenchElision(t *testing.T) {
	got, _ := analyzeLang(textproc.Options{Lang: textproc.French}, "L\u2019eau d'hiver, aujourd'hui, jusqu'à l'île")
	want := []pair{{"fr:eau", "eau"}, {"fr:hiv", "hiver"}, {"fr:aujourd'hui", "aujourd'hui"}, {"fr:île", "île"}}
	if !slices.Equal(got, want) {
		t.Errorf("Analyze = %q, want %q", got, want)
	}
}

// TestAnalyzeNoStemKeyed checks that NoStem keeps the language key and
// the language's own mapping (ё → е for Russian, doc.go step 5).
func TestAnalyzeNoStemKeyed(t *testing.T) {
	got, _ := analyzeLang(textproc.Options{Lang: textproc.Russian, NoStem: true}, "Ёлки")
	if want := []pair{{"ru:елки", "ёлки"}}; !slices.Equal(got, want) {
		t.Errorf("Analyze = %q, want %q", got, want)
	}
}

// fixtureText joins every paragraph of testdata/langid/<lang> into one
// text, paragraphs separated by blank lines.
func fixtureText(t testing.TB, l textproc.Language) string {
	t.Helper()
	files, err := filepath.Glob(filepath.Join("testdata", "langid", string(l), "*.txt"))
	if err != nil {
		t.Fatal(err)
	}
	if len(files) == 0 {
		t.Skipf("no fixture paragraphs for %s", l)
	}
	var b strings.Builder
	for _, f := range files {
		p, err := os.ReadFile(f)
		if err != nil {
			t.Fatal(err)
		}
		b.Write(p)
		b.WriteString("\n\n")
	}
	return b.String()
}

// TestAnalyzeMemoOff checks that NoMemo changes nothing but speed, on the
// fixture text of every language, auto and fixed, with the same analyzer
// used twice (the second time from the memo).
func TestAnalyzeMemoOff(t *testing.T) {
	for _, l := range textproc.Languages() {
		text := fixtureText(t, l)
		for _, lang := range []textproc.Language{textproc.Auto, l} {
			memo := textproc.NewAnalyzer(textproc.Options{Lang: lang})
			noMemo := textproc.NewAnalyzer(textproc.Options{Lang: lang, NoMemo: true})
			for round := range 2 {
				var a, b []pair
				la := memo.Analyze(text, func(term, surface string) { a = append(a, pair{term, surface}) })
				lb := noMemo.Analyze(text, func(term, surface string) { b = append(b, pair{term, surface}) })
				if la != lb || !slices.Equal(a, b) {
					t.Errorf("%s, Lang %q, round %d: memo and NoMemo differ (%s/%s, %d/%d pairs)", l, lang, round, la, lb, len(a), len(b))
				}
				if len(a) == 0 {
					t.Errorf("%s: no terms", l)
				}
			}
		}
	}
}

// TestAnalyzeSurfacesStableMultilingual repeats TestAnalyzeSurfacesStable's
// check on the fixture of every language: the surfaces passed to emit stay
// valid after emit returns, and each re-analyses, in the same language, to
// the same term.
func TestAnalyzeSurfacesStableMultilingual(t *testing.T) {
	for _, l := range textproc.Languages() {
		text := fixtureText(t, l)
		a := textproc.NewAnalyzer(textproc.Options{Lang: l})
		var got []pair
		for range 2 {
			a.Analyze(text, func(term, surface string) { got = append(got, pair{term, surface}) })
		}
		check := textproc.NewAnalyzer(textproc.Options{Lang: l})
		for _, p := range got {
			var again []pair
			check.Analyze(p.surface, func(term, surface string) { again = append(again, pair{term, surface}) })
			if len(again) != 1 || again[0] != p {
				t.Errorf("%s: surface %q re-analyses to %q, want [%q]", l, p.surface, again, p)
			}
		}
	}
}

// TestDisplayFormsPerLanguage checks that the display form of a keyed term
// comes from the surface words of its own language (doc.go, "Keying").
// French stem of "maisons" and "maison": "maison"; English stem of
// "maisons": "maison" (python3-snowballstemmer 2.2.0).
func TestDisplayFormsPerLanguage(t *testing.T) {
	var d textproc.DisplayForms
	fr := textproc.NewAnalyzer(textproc.Options{Lang: textproc.French})
	en := textproc.NewAnalyzer(textproc.Options{Lang: textproc.English})
	fr.Analyze("maisons maisons maison", d.Add)
	en.Analyze("maisons", d.Add)
	en.Analyze("maisons", d.Add)
	en.Analyze("maisons", d.Add)
	if got := d.Form("fr:maison"); got != "maisons" {
		t.Errorf("Form(fr:maison) = %q, want %q", got, "maisons")
	}
	want := []textproc.FormCount{{Form: "maisons", Count: 2}, {Form: "maison", Count: 1}}
	if got := d.Forms("fr:maison"); !slices.Equal(got, want) {
		t.Errorf("Forms(fr:maison) = %v, want %v", got, want)
	}
	if got := d.Forms("maison"); !slices.Equal(got, []textproc.FormCount{{Form: "maisons", Count: 3}}) {
		t.Errorf("Forms(maison) = %v", got)
	}
	// A term never seen shows as its bare stem.
	if got := d.Form("hu:gyerek"); got != "gyerek" {
		t.Errorf("Form(hu:gyerek) = %q, want %q", got, "gyerek")
	}
}

// TestAnalyzeLastDetection checks that LastDetection reports the counts
// of the last auto-mode document (same counts as DetectLanguage).
func TestAnalyzeLastDetection(t *testing.T) {
	a := textproc.NewAnalyzer(textproc.Options{})
	text := "L'eau et l'air sont froids"
	a.Analyze(text, func(_, _ string) {})
	if got, want := a.LastDetection(), textproc.DetectLanguage(text); got != want {
		t.Errorf("LastDetection = %+v, want %+v", got, want)
	}
}
