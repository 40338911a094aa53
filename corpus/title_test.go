package corpus

import (
	"math/rand/v2"
	"strings"
	"testing"
)

// TestTitleOfMatchesWholeLine checks titleOf, which reads only the start
// of a line, against the title made from the whole line (all its words
// joined by one space, then cutTitle) on random lines of words and white
// space of every kind, short and long, in scripts of one to four bytes a
// rune.
func TestTitleOfMatchesWholeLine(t *testing.T) {
	r := rand.New(rand.NewPCG(5, 6))
	pieces := []string{"a", "flood", "вода", "水道", "𝔸", "x,", "—", "é", "" + "\u00a0", " ", "  ", "\t", "\u2003", "\u3000", "\v"}
	for i := range 20000 {
		var b strings.Builder
		for n := r.IntN(60 + i%200); n > 0; n-- {
			b.WriteString(pieces[r.IntN(len(pieces))])
		}
		line := b.String()
		if got, want := titleOf(line), cutTitle(strings.Join(strings.Fields(line), " ")); got != want {
			t.Fatalf("titleOf(%q) = %q, want %q", line, got, want)
		}
	}
	// Lines of ASCII words and spaces, most of them plain (plainLine's
	// fast path), some with a double space, a space at an end, or a
	// control character.
	ascii := []string{"a", "flood", "x,", "Minutes", "7", " ", " ", " ", "  ", "\t", "\x01", "\x7f"}
	for i := range 20000 {
		var b strings.Builder
		for n := r.IntN(10 + i%150); n > 0; n-- {
			b.WriteString(ascii[r.IntN(len(ascii))])
		}
		line := b.String()
		if i%3 == 0 {
			line = strings.Join(strings.Fields(line), " ") // plain
		}
		if got, want := titleOf(line), cutTitle(strings.Join(strings.Fields(line), " ")); got != want {
			t.Fatalf("titleOf(%q) = %q, want %q", line, got, want)
		}
	}
}

func BenchmarkTitleLongLine(b *testing.B) {
	line := strings.Repeat("minutes of the riverside working group ", 500)
	b.SetBytes(int64(len(line)))
	for b.Loop() {
		Title(line, "x.txt")
	}
}

// BenchmarkTitle takes the title of a document whose first line is an
// ordinary heading, as most are.
func BenchmarkTitle(b *testing.B) {
	text := "Minutes of the riverside working group, third meeting\n\nThe group met at the boathouse. " +
		strings.Repeat("Notes on the water levels and the new footbridge. ", 40)
	b.SetBytes(int64(len(text)))
	b.ReportAllocs()
	for b.Loop() {
		Title(text, "x.txt")
	}
}
