package textproc

// classifyASCII looks at the 64 bytes at src. When one of them is outside
// ASCII or an apostrophe it reports ok = false (and dst may have been
// written). Otherwise it copies them to dst, capitals lower-cased when
// lower is set, and returns one bit a byte (byte k gives bit k): in word
// the letters and digits, in alpha the letters. On amd64 it is SSE2
// assembly, sixteen bytes at a time; classifyASCIIGo is the same in Go.
//
//go:noescape
func classifyASCII(dst, src *byte, lower bool) (word, alpha uint64, ok bool)
