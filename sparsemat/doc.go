// Package sparsemat builds and computes with the document-term matrix.
//
// # Overview
//
// A [Builder] takes each document's term counts, one document at a time.
// [Builder.Build] prunes the vocabulary by document frequency and lays the
// counts out as a CSR matrix (github.com/james-bowman/sparse) directly from
// sorted, merged term IDs — never through the library's DOK or COO types,
// whose conversions keep map order or leave duplicate entries. [Weight]
// turns counts into TF-IDF weights. [MulDense] and [MulDenseT] multiply the
// sparse matrix by a dense one in parallel over the raw CSR arrays, and
// [TruncatedSVD] computes the leading singular triplets.
//
// # Invariants
//
// Rows are documents and columns are terms. Within a row, column indices
// are strictly increasing and no stored value is zero. The columns of a
// built matrix follow the byte order of the term strings, so the matrix of
// a corpus does not depend on the order terms were first seen in.
//
// # Weighting
//
// The default weighting ([DefaultWeighting]) matches scikit-learn's
// TfidfVectorizer(sublinear_tf=True, smooth_idf=True, norm="l2"):
//
//	tf(t, d)  = 1 + ln(count(t, d))          (for count > 0)
//	idf(t)    = ln((1 + m) / (1 + df(t))) + 1
//	a(d, t)   = tf(t, d) · idf(t), then each row scaled to unit L2 norm
//
// where m is the number of documents and df(t) the number of documents
// containing t. Other standard choices are listed with [TF], [IDF] and
// [Norm].
//
// # Concurrency and determinism
//
// All functions are synchronous for their callers. The products split the
// rows into a fixed number of blocks that does not depend on GOMAXPROCS,
// and each output element is summed in a fixed order, so results are
// bit-identical however many goroutines run them. Matrices are not changed
// by the functions that read them.
package sparsemat
