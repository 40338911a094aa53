package main

import (
	"runtime"
	"runtime/debug"
	"testing"
)

// gcPercent reads GOGC without changing it.
func gcPercent() int {
	p := debug.SetGCPercent(100)
	debug.SetGCPercent(p)
	return p
}

// The raised GOGC of a read's start must give way to the one before once
// the live heap passes the floor, and stop must put it back in any case.
// Common practice, no outside source.
func TestGCFloorRestores(t *testing.T) {
	defer debug.SetGCPercent(debug.SetGCPercent(77))
	f := startGCFloor()
	if p := gcPercent(); p != gcFloorPercent {
		t.Fatalf("GOGC %d during the read, want %d", p, gcFloorPercent)
	}
	for range gcFloorEvery {
		f.check() // the test's heap is far below the floor
	}
	if p := gcPercent(); p != gcFloorPercent {
		t.Fatalf("GOGC %d below the floor, want %d", p, gcFloorPercent)
	}
	live := make([][]byte, 0, 80)
	for range 80 {
		live = append(live, make([]byte, 1<<20))
	}
	runtime.GC() // the live heap is measured by a collection
	for range gcFloorEvery {
		f.check()
	}
	if p := gcPercent(); p != 77 {
		t.Fatalf("GOGC %d with %d MiB live, want 77 back", p, len(live))
	}
	runtime.KeepAlive(live)
	f.stop()
	if p := gcPercent(); p != 77 {
		t.Fatalf("GOGC %d after stop, want 77", p)
	}
	g := startGCFloor()
	g.stop()
	if p := gcPercent(); p != 77 {
		t.Fatalf("GOGC %d after a read that stayed small, want 77", p)
	}
}
