package textproc

import "unsafe"

// unsafeString views b as a string without copying. The caller must not
// keep the string after b changes; Analyze clones every string it stores.
func unsafeString(b []byte) string {
	return unsafe.String(unsafe.SliceData(b), len(b))
}
