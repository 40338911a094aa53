package corpus

import (
	"strings"
	"testing"
)

// BenchmarkBinaryReason measures the binary-content check on 8 KiB of
// ordinary text (the most it examines).
func BenchmarkBinaryReason(b *testing.B) {
	raw := []byte(strings.Repeat("The gauge at the weir read high twice.\n\tNotes follow.\r\n", 160)[:sniffBytes])
	b.SetBytes(int64(len(raw)))
	for b.Loop() {
		if binaryReason(raw) != "" {
			b.Fatal("text taken for binary")
		}
	}
}
