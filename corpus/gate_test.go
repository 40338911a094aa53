package corpus

import (
	"fmt"
	"strings"
	"sync"
	"sync/atomic"
	"testing"
	"testing/fstest"
	"time"
)

// TestGateHeadNeverWaits checks the gate's rule on its own: a file other
// than the one collect waits for waits while the bytes held would pass the
// limit, the awaited one never waits, collecting releases the waiters,
// and stop releases them all with false.
func TestGateHeadNeverWaits(t *testing.T) {
	g := newGate(100)
	if !g.admit(0, 80) || !g.admit(1, 10) {
		t.Fatal("admits within the limit returned false")
	}
	admitted := make(chan int, 3)
	go func() {
		if g.admit(2, 50) { // 90 + 50 > 100: waits
			admitted <- 2
		}
	}()
	select {
	case <-admitted:
		t.Fatal("file 2 was admitted past the limit")
	case <-time.After(50 * time.Millisecond):
	}
	g.collected(1, 80) // file 0 collected: 10 held
	select {
	case n := <-admitted:
		if n != 2 {
			t.Fatalf("admitted %d", n)
		}
	case <-time.After(5 * time.Second):
		t.Fatal("file 2 still waits after file 0 was collected")
	}
	// 60 held; the awaited file (1 is next) is admitted whatever its size.
	if !g.admit(1, 1000) {
		t.Fatal("the awaited file was refused")
	}
	stopped := make(chan bool)
	go func() { stopped <- g.admit(7, 1) }()
	time.Sleep(20 * time.Millisecond)
	g.stop()
	select {
	case ok := <-stopped:
		if ok {
			t.Fatal("admit after stop returned true")
		}
	case <-time.After(5 * time.Second):
		t.Fatal("stop did not release a waiting worker")
	}
}

// TestWalkParallelByteBound runs WalkParallel over files of very different
// sizes, with the first file of every ten slow to work on, so that the
// other workers run ahead; with a small byte bound the text worked on and
// not yet collected must stay within the bound plus one file a worker, and
// the documents must still come in walk order.
func TestWalkParallelByteBound(t *testing.T) {
	defer func(old int) { bytesInFlight = old }(bytesInFlight)
	const limit = 4 << 10
	bytesInFlight = limit
	fsys := fstest.MapFS{}
	var names []string
	biggest := 0
	for i := range 120 {
		n := 200 + (i*7919)%9000
		biggest = max(biggest, n)
		name := fmt.Sprintf("d%03d.txt", i)
		fsys[name] = &fstest.MapFile{Data: []byte("word " + strings.Repeat("x", n-5))}
		names = append(names, name)
	}
	for _, jobs := range []int{2, 4} {
		var held, peak atomic.Int64
		var mu sync.Mutex
		var got []string
		_, err := WalkParallel(fsys, Options{}, jobs, func() func(Document) int {
			return func(d Document) int {
				if strings.HasSuffix(d.ID, "0.txt") {
					time.Sleep(3 * time.Millisecond)
				}
				h := held.Add(int64(len(d.Text)))
				for p := peak.Load(); h > p && !peak.CompareAndSwap(p, h); p = peak.Load() {
				}
				return len(d.Text)
			}
		}, func(d Document, n int) error {
			held.Add(-int64(n))
			mu.Lock()
			got = append(got, d.ID)
			mu.Unlock()
			return nil
		})
		if err != nil {
			t.Fatal(err)
		}
		if strings.Join(got, " ") != strings.Join(names, " ") {
			t.Fatalf("jobs %d: documents out of walk order: %v", jobs, got)
		}
		if bound := int64(limit*jobs + jobs*biggest); peak.Load() > bound {
			t.Fatalf("jobs %d: %d bytes worked on and not collected, bound %d", jobs, peak.Load(), bound)
		}
		t.Logf("jobs %d: at most %d bytes held (bound %d + %d a worker)", jobs, peak.Load(), limit*jobs, biggest)
	}
}
