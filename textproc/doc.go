// Package textproc turns text into index terms, in seven languages.
//
// # Overview
//
// An [Analyzer] normalises a document's text, splits it into tokens,
// settles the document's language (fixed by [Options.Lang], or detected),
// drops stop words, pure numbers and very short tokens, and stems what is
// left with the Snowball stemmer of the language
// (github.com/kljensen/snowball): English, French, Spanish, Russian,
// Swedish, Norwegian or Hungarian. English words of lower-case ASCII
// letters, digits and inner apostrophes are stemmed by stemEnglish, a copy
// of the English algorithm of that package over bytes, with the same
// results (tested on the Snowball vocabulary and generated words) and
// without its allocations. Stems are memoised per language and per
// distinct token: text vocabularies are Zipfian, so most tokens repeat and
// the memo turns most stemming calls into one map look-up.
//
// # The analysis, step by step
//
//  1. Unicode NFC normalisation (golang.org/x/text/unicode/norm).
//  2. Full case folding (golang.org/x/text/cases, cases.Fold), so "Straße"
//     and "STRASSE" meet. Diacritics are kept: they tell words apart in
//     French, Spanish and Hungarian.
//  3. Tokens are maximal runs of letters and digits, with the combining
//     marks that follow them (a mark never starts a token; variation
//     selectors, which only choose how an emoji is drawn, are not marks
//     here). An apostrophe (U+0027, U+2019 or U+02BC) between a token
//     character and a letter or digit stays inside the token and is written
//     as U+0027. Every other character, hyphens included, ends a token:
//     "flood-risk" gives "flood" and "risk". Latin, Cyrillic and every
//     other spaced script are tokenised alike. Han, Hiragana, Katakana
//     (with the prolonged sound mark U+30FC), Thai and Hangul are written
//     without spaces between words (Korean puts spaces between phrases,
//     with particles joined to the words): a run of them is cut into
//     overlapping character bigrams, "水道水" → "水道", "道水", and a lone
//     character stays a unigram. This is common practice in retrieval for
//     these scripts. A character is a letter with the combining marks after
//     it (Thai vowel signs stay with their consonant). A run never crosses
//     from Han/kana to Hangul or Thai, and a bigram never spans a space,
//     a punctuation mark or a Latin letter.
//  4. The document's language: [Options.Lang], or detected ("Language
//     detection" below). A word token is analysed in that language if it is
//     written in the language's script (Latin for six of them, Cyrillic for
//     Russian); numbers and words in any other script are analysed as
//     [Undetermined].
//  5. Per language, before the stop list: French drops elided words joined
//     by an apostrophe ("l'eau" → "eau", "qu'il" → "il", also "jusqu'",
//     "lorsqu'", "puisqu'", "quoiqu'"); Russian writes ё as е (as the
//     Snowball Russian algorithm does), for the stop list and the stemmer
//     only: the surface form keeps ё.
//  6. Stop words of the language are dropped (the lists in stopwords.go;
//     for Undetermined, the union of all the lists). In English a trailing
//     possessive "'s" is then removed ("authority's" → "authority"), and
//     the stop list is consulted again; looking first lets contractions
//     such as "let's" match the list.
//  7. Tokens made only of digits are dropped unless [Options.KeepNumbers].
//  8. Word tokens shorter than [Options.MinLength] runes (default 2) are
//     dropped. Bigrams and lone characters of step 3 are always kept, and
//     no stop list applies to them.
//  9. What remains is stemmed, unless [Options.NoStem] is set or the
//     language is Undetermined; bigrams are never stemmed. The folded token,
//     with the possessive or elided word removed, is its surface form.
//
// # Keying
//
// An index term is the stem keyed with its language, so that terms of
// different languages never collide ("son", an English word, and "son", a
// French one): English stems are bare, as they were before other languages
// came; every other language's stems carry the language's ISO 639-1 code
// and a colon ("fr:", "es:", "ru:", "sv:", "no:", "hu:"): "fr:maison". Terms
// of [Undetermined] carry "und:": the unstemmed words of undetermined
// documents, numbers, words written in another script than the document's
// language, and all bigrams ("und:水道"; bigram characters never occur in
// word tokens, so the two cannot meet). A token never holds a colon, so a
// bare term is always English. [SplitTerm] returns the language and the
// bare stem; [JoinTerm] does the opposite. [DisplayForms] keeps the surface
// forms per term, so the display form of "fr:maison" comes from French
// words only.
//
// # Language detection
//
// With [Options.Lang] "" or [Auto], each document's language is detected
// from its own tokens only (never from other documents, so the result does
// not depend on the order of a corpus), by this deterministic rule:
//
//  1. Each word token with a letter is split at its apostrophes ("l'eau" →
//     "l", "eau"; "don't" → "don", "t"), and its pieces are counted under
//     the script of the token's first letter. If Cyrillic pieces outnumber
//     Latin ones, the only candidate is Russian; otherwise the candidates
//     are the six Latin-script languages. Tokens is the number of pieces in
//     the candidate script.
//  2. A candidate's stop count is the number of pieces on its stop list.
//     Its score is the stop count plus the number of Latin tokens holding a
//     letter that marks it: à â ç è ê ë î ï ô ù û ÿ œ French; ñ Spanish;
//     á í ó ú ü Spanish and Hungarian; ő ű Hungarian; ö Swedish and
//     Hungarian; ä Swedish; å Swedish and Norwegian; æ ø Norwegian.
//  3. Best and Second are the candidates with the highest scores (ties go
//     to the earlier language in [Languages]).
//  4. The document is in Best when Best's stop count is at least
//     [DetectMinHits] (2), Best's share (stop count / Tokens) is at least
//     [DetectMinShare] (0.15), and Best leads Second by at least
//     [DetectMinMargin] (2) points of score. Otherwise it is [Undetermined].
//
// Short documents: a document with fewer than two stop words of one
// language, such as a title ("Annual flood report") or a single short
// sentence, is Undetermined; so is a document with no Latin or Cyrillic
// word (a Chinese or Japanese text, numbers only, an empty text). Its words
// are not stemmed, the union of all the stop lists is removed from it, and
// its terms carry "und:". A corpus known to be in one language should set
// [Options.Lang], which also analyses short documents fully.
//
// Limits: languages outside the seven are not recognised as such. Most
// come out Undetermined, but one close to a candidate can be taken for it
// (Danish for Norwegian); a Cyrillic text in another language (Ukrainian,
// Bulgarian) is Russian if it shares enough of Russian's stop words.
// [DetectLanguage] and [Analyzer.LastDetection] give the counts behind a
// decision.
//
// # Counting terms for a matrix
//
// [Analyzer.AnalyzeIDs] gives the same terms as [Analyzer.Analyze], as
// numbers from [Options.TermID] (a shared, concurrency-safe vocabulary
// such as sparsemat.Vocabulary's ID), so that a goroutine that analyses
// documents can count them without building strings or maps; it also
// counts the surface forms it sees, which [Analyzer.AddFormsTo] adds to a
// [DisplayForms] (sums, so the forms of several analyzers can be added in
// any order).
//
// # Speed
//
// The analyzer keeps the result of every distinct token (the memo), so
// that after the first sight a token costs one look-up in a hash table
// whose slots hold short tokens and their analysis in place. The look-ups
// of a document are made in two passes: a tight one that compares each
// short token with the slot its hash points to, so that the waits for
// slots out of the cache overlap, then the full search for the rest. ASCII
// text skips NFC and case folding (the tokenizer lower-cases ASCII
// letters, which is all that folding does to them), and mostly-ASCII text
// sends only the stretches around its other characters through them. The
// tokenizer takes ASCII text 64 bytes at a time where a block holds no
// apostrophe and no other character, finding its words' starts and ends
// in bit masks of the block (a word costs no branch of its own), and eight
// bytes at a time elsewhere. The package's tests check that all of this
// gives exactly the tokens of the full normalisation and of a
// byte-at-a-time scan, and that the memo gives exactly the terms of
// [Options.NoMemo].
//
// # Concurrency
//
// An Analyzer holds its memos and scratch buffers and is not safe for
// concurrent use: give each goroutine its own ([Options.TermID] may be
// shared when it is safe for concurrent use). The stem function of each
// language is chosen once, when the package is initialised; the stop lists
// and stemmers are shared and read-only. DisplayForms is not safe for
// concurrent use either.
package textproc
