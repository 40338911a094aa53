package textproc

// BenchTokenizer gives the benchmarks the analyzer's tokenizer, with its
// buffers reused from one call to the next as an Analyzer reuses them.
type BenchTokenizer struct{ t tokenizer }

// Run tokenises the normalised text and returns the number of tokens.
func (b *BenchTokenizer) Run(text string) int {
	b.t.reset()
	b.t.run(text)
	return len(b.t.refs)
}
