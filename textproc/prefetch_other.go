//go:build !amd64

package textproc

import "unsafe"

// prefetch does nothing on this architecture.
func prefetch(p unsafe.Pointer) {}
