package textproc

// StemWord stems the folded word w exactly as an Analyzer in language l
// stems a word that is kept: the language's own mapping first (ё → е for
// Russian), then the stem function chosen for l. It exists for the tests.
func StemWord(l Language, w string) string {
	i, ok := langIndex(l)
	if !ok || langTable[i].stem == nil {
		panic("textproc: StemWord with a language that is not stemmed: " + string(l))
	}
	li := &langTable[i]
	if li.prep != nil {
		w = li.prep(w)
	}
	return li.stem(w)
}
