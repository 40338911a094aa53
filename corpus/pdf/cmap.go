package pdf

import (
	"slices"
	"strings"
	"unicode/utf16"
)

// A ToUnicode CMap (ISO 32000-1 section 9.10.3) maps the character codes a
// font shows to Unicode text. It is read here with our own lexer rather
// than the library's, whose CMap decoder scans every mapping for every
// code shown (a large CMap with a long text made it crawl) and panics on
// some malformed ones.

// Bounds on what one CMap may define; real ones stay far below.
const (
	maxCMapChars  = 1 << 17
	maxCMapRanges = 1 << 16
)

type codeRange struct{ lo, hi string }

type bfRange struct {
	lo, hi string
	dst    string   // UTF-16BE start value, or
	dsts   []string // one UTF-16BE value per code
}

// cmap is a parsed ToUnicode CMap.
type cmap struct {
	space  [4][]codeRange // codespace ranges by code length 1..4 (section 9.7.6.2)
	chars  map[string]string
	ranges []bfRange // sorted by lo
}

// parseCMap reads the codespace ranges, bfchar and bfrange sections of a
// ToUnicode CMap; it returns nil when there is no mapping at all.
func parseCMap(b []byte) *cmap {
	m := &cmap{chars: map[string]string{}}
	lx := &lexer{b: b, content: true}
	var args []any
	for {
		t := lx.object(0)
		if t == nil {
			break // the end, or a syntax error: keep what was read
		}
		kw, ok := t.(pdfKeyword)
		if !ok {
			if len(args) < 3*maxCMapRanges {
				args = append(args, t)
			}
			continue
		}
		switch kw {
		case "endcodespacerange":
			for i := 0; i+1 < len(args); i += 2 {
				lo, ok1 := args[i].(string)
				hi, ok2 := args[i+1].(string)
				if ok1 && ok2 && len(lo) == len(hi) && len(lo) >= 1 && len(lo) <= 4 {
					m.space[len(lo)-1] = append(m.space[len(lo)-1], codeRange{lo, hi})
				}
			}
		case "endbfchar":
			for i := 0; i+1 < len(args) && len(m.chars) < maxCMapChars; i += 2 {
				src, ok1 := args[i].(string)
				dst, ok2 := args[i+1].(string)
				if ok1 && ok2 && src != "" {
					m.chars[src] = utf16Text(dst)
				}
			}
		case "endbfrange":
			for i := 0; i+2 < len(args) && len(m.ranges) < maxCMapRanges; i += 3 {
				lo, ok1 := args[i].(string)
				hi, ok2 := args[i+1].(string)
				if !ok1 || !ok2 || lo == "" || len(lo) != len(hi) || lo > hi {
					continue
				}
				r := bfRange{lo: lo, hi: hi}
				switch d := args[i+2].(type) {
				case string:
					r.dst = d
				case []any:
					for _, x := range d {
						s, _ := x.(string)
						r.dsts = append(r.dsts, s)
					}
				default:
					continue
				}
				m.ranges = append(m.ranges, r)
			}
		}
		args = args[:0]
	}
	if len(m.chars) == 0 && len(m.ranges) == 0 {
		return nil
	}
	slices.SortStableFunc(m.ranges, func(a, b bfRange) int { return strings.Compare(a.lo, b.lo) })
	return m
}

// utf16Text decodes UTF-16BE (ISO 32000-1 section 9.10.3: the destination
// strings of a ToUnicode CMap); an odd last byte is dropped.
func utf16Text(s string) string {
	u := make([]uint16, 0, len(s)/2)
	for i := 0; i+1 < len(s); i += 2 {
		u = append(u, uint16(s[i])<<8|uint16(s[i+1]))
	}
	return string(utf16.Decode(u))
}

// inSpace reports whether code lies in one of the codespace ranges of its
// length; the test is byte by byte (ISO 32000-1 section 9.7.6.2).
func (m *cmap) inSpace(code string) bool {
	for _, r := range m.space[len(code)-1] {
		ok := true
		for i := 0; i < len(code) && ok; i++ {
			ok = r.lo[i] <= code[i] && code[i] <= r.hi[i]
		}
		if ok {
			return true
		}
	}
	return false
}

// hasSpace reports whether the CMap declared any codespace range.
func (m *cmap) hasSpace() bool {
	for _, s := range m.space {
		if len(s) > 0 {
			return true
		}
	}
	return false
}

// lookup maps one code, reporting whether the CMap knows it.
func (m *cmap) lookup(code string) (string, bool) {
	if s, ok := m.chars[code]; ok {
		return s, true
	}
	// The last range starting at or before code (ranges rarely overlap).
	i, _ := slices.BinarySearchFunc(m.ranges, code, func(r bfRange, c string) int { return strings.Compare(r.lo, c) })
	if i < len(m.ranges) && m.ranges[i].lo == code {
		i++
	}
	for j := i - 1; j >= 0 && j >= i-4; j-- {
		r := m.ranges[j]
		if len(r.lo) != len(code) || code < r.lo || code > r.hi {
			continue
		}
		off := codeValue(code) - codeValue(r.lo)
		if r.dsts != nil {
			if off < len(r.dsts) {
				return utf16Text(r.dsts[off]), true
			}
			return "", true
		}
		// The code's value is the start value with its last code unit
		// incremented by the code's offset in the range (section 9.10.3).
		if len(r.dst) < 2 {
			return "", true
		}
		u := []byte(r.dst)
		last := int(u[len(u)-2])<<8 | int(u[len(u)-1]) + off
		if last > 0xFFFF {
			return "", true
		}
		u[len(u)-2], u[len(u)-1] = byte(last>>8), byte(last)
		return utf16Text(string(u)), true
	}
	return "", false
}

func codeValue(s string) int {
	v := 0
	for i := 0; i < len(s); i++ {
		v = v<<8 | int(s[i])
	}
	return v
}

// decode turns the codes in raw into text. Codes are split by the
// codespace ranges; a CMap without any is taken to use codes of the length
// of its first mapping. Codes it does not map give no text.
func (m *cmap) decode(raw string) string {
	width := 0
	if !m.hasSpace() {
		width = 4 // the shortest code the CMap maps
		for k := range m.chars {
			width = min(width, len(k))
		}
		for _, r := range m.ranges {
			width = min(width, len(r.lo))
		}
	}
	var b strings.Builder
	for i := 0; i < len(raw); {
		n := 0
		if width > 0 {
			n = min(width, len(raw)-i)
		} else {
			for k := 1; k <= 4 && i+k <= len(raw); k++ {
				if m.inSpace(raw[i : i+k]) {
					n = k
					break
				}
			}
		}
		if n == 0 {
			i++ // a byte in no codespace range
			continue
		}
		if s, ok := m.lookup(raw[i : i+n]); ok {
			b.WriteString(s)
		}
		i += n
	}
	return b.String()
}
