package textproc

import "strings"

// englishStopWords is the English stop list.
//
// Source: the English stop list published with the Snowball project
// (snowballstem.org, algorithms/english/stop.txt), written here from memory,
// joined with the list that github.com/kljensen/snowball v0.10.0 uses in
// english.IsStopWord, which adds "will", "just", "don", "s", "t", "now" and
// "can". Contractions are kept with a plain apostrophe because the analyzer
// writes every apostrophe as U+0027 before the look-up.
var englishStopWords = makeSet(`
i me my myself we our ours ourselves you your yours yourself yourselves
he him his himself she her hers herself it its itself they them their
theirs themselves what which who whom this that these those am is are was
were be been being have has had having do does did doing would should could
ought i'm you're he's she's it's we're they're i've you've we've they've
i'd you'd he'd she'd we'd they'd i'll you'll he'll she'll we'll they'll
isn't aren't wasn't weren't hasn't haven't hadn't doesn't don't didn't
won't wouldn't shan't shouldn't can't cannot couldn't mustn't let's that's
who's what's here's there's when's where's why's how's a an the and but if
or because as until while of at by for with about against between into
through during before after above below to from up down in out on off over
under again further then once here there when where why how all any both
each few more most other some such no nor not only own same so than too
very will just don s t now can
`)

func makeSet(words string) map[string]struct{} {
	set := make(map[string]struct{})
	for _, w := range strings.Fields(words) {
		set[w] = struct{}{}
	}
	return set
}

// IsEnglishStopWord reports whether the folded token w is on the English
// stop list.
func IsEnglishStopWord(w string) bool {
	_, ok := englishStopWords[w]
	return ok
}
