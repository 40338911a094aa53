package textproc

import "unsafe"

// prefetch asks the processor to bring the cache line at p into its
// caches without waiting for it: unlike a load, the instruction retires at
// once, so many can be outstanding. It never faults.
//
//go:noescape
func prefetch(p unsafe.Pointer)
