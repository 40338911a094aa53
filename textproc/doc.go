// Package textproc turns text into index terms.
//
// # Overview
//
// An [Analyzer] normalises a document's text, splits it into tokens, drops
// stop words, pure numbers and very short tokens, and stems what is left with
// the Snowball English stemmer (github.com/kljensen/snowball). Stems are
// memoised per distinct token: text vocabularies are Zipfian, so most tokens
// repeat and the memo turns most stemming calls into one map look-up.
//
// # The analysis, step by step
//
//  1. Unicode NFC normalisation (golang.org/x/text/unicode/norm).
//  2. Full case folding (golang.org/x/text/cases, cases.Fold), so "Straße"
//     and "STRASSE" meet.
//  3. Tokens are maximal runs of letters and digits, with the combining
//     marks that follow them (a mark never starts a token; variation
//     selectors, which only choose how an emoji is drawn, are not marks
//     here). An apostrophe (U+0027, U+2019 or U+02BC) between a token
//     character and a letter or digit stays inside the token and is written
//     as U+0027. Every other character, hyphens included, ends a token:
//     "flood-risk" gives "flood" and "risk".
//  4. Stop words (the list in stopwords.go) are dropped; then a trailing
//     possessive "'s" is removed ("authority's" → "authority"), and the
//     stop list is consulted again. Looking first lets contractions such as
//     "let's" match the list.
//  5. Tokens made only of digits are dropped unless [Options.KeepNumbers].
//  6. Tokens shorter than [Options.MinLength] runes (default 2) are dropped.
//  7. What remains is stemmed; the folded token, possessive removed, is its
//     surface form.
//
// [DisplayForms] remembers, for every stem, how often each surface form was
// seen, so that a stem can be shown as a real word: its most frequent
// surface form, ties broken by the smaller string.
//
// # Concurrency
//
// An Analyzer holds its memo and is not safe for concurrent use: give each
// goroutine its own. DisplayForms is not safe for concurrent use either.
package textproc
