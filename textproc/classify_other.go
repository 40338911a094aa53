//go:build !amd64

package textproc

// classifyASCII is classifyASCIIGo on this architecture; see
// classify_amd64.go.
func classifyASCII(dst, src *byte, lower bool) (word, alpha uint64, ok bool) {
	return classifyASCIIGo(dst, src, lower)
}
