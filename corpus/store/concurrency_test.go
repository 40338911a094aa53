package store

import (
	"bufio"
	"context"
	"fmt"
	"math/rand/v2"
	"os"
	"os/exec"
	"path/filepath"
	"strconv"
	"strings"
	"sync/atomic"
	"testing"
	"time"

	"assay/corpus"
	"assay/textproc"
)

// vocabulary is the invented word list of generated folders.
var vocabulary = strings.Fields(`ferry harbour crossing pontoon tide gauge weir sluice culvert embankment
	flood sandbag depot volunteer survey otter spraint heron moorland heather fire beater
	grant panel receipt treasurer library archive reading room catalogue shelf packet seed
	bus timetable route depot driver fare ticket school hall roof repair contractor tender
	water quality sample reservoir filter pump main valve boil notice parish council clerk
	lantern parade canal towpath granary bell tower clock chess ladder recipe tortoise`)

// writeFolder writes n generated text files into dir (in folders of 100),
// version v of each (another version has other words and another size),
// all with modification time mtime.
func writeFolder(t testing.TB, dir string, n, v int, mtime time.Time) {
	t.Helper()
	for i := range n {
		r := rand.New(rand.NewPCG(uint64(i), uint64(v)))
		var b strings.Builder
		fmt.Fprintf(&b, "Notice %d, issue %d\n\n", i, v)
		for w := range 30 + r.IntN(40) + 7*v {
			if w > 0 {
				b.WriteByte(' ')
			}
			b.WriteString(vocabulary[r.IntN(len(vocabulary))])
		}
		b.WriteString(".\n")
		sub := filepath.Join(dir, folderOf(i))
		if err := os.MkdirAll(sub, 0o755); err != nil {
			t.Fatal(err)
		}
		p := filepath.Join(sub, fileOf(i))
		if err := os.WriteFile(p, []byte(b.String()), 0o644); err != nil {
			t.Fatal(err)
		}
		if err := os.Chtimes(p, mtime, mtime); err != nil {
			t.Fatal(err)
		}
	}
}

// folderOf and fileOf name the i-th generated file.
func folderOf(i int) string { return fmt.Sprintf("d%03d", i/100) }
func fileOf(i int) string   { return fmt.Sprintf("n%05d.txt", i) }

// A load during an update sees the store as it was before the update, in
// full, from another Store on the same file and from the same Store; once
// the update commits, a load sees all of it. This is the snapshot
// isolation of WAL mode (https://sqlite.org/wal.html: "a reader ... sees
// only those changes that were committed at the moment the read
// transaction started"; https://sqlite.org/isolation.html).
func TestLoadDuringUpdate(t *testing.T) {
	const n = 200
	dir := t.TempDir()
	writeFolder(t, dir, n, 0, past)
	nw := analyzerWorker(textproc.Options{})
	s, p := openStore(t)
	update(t, s, os.DirFS(dir), UpdateOptions{Key: testKey}, nw)
	wantA := loadView(t, s)
	writeFolder(t, dir, n, 1, past.Add(time.Minute))
	wantB := direct(t, os.DirFS(dir), corpus.Options{}, nw, false)

	reader, err := Open(p)
	if err != nil {
		t.Fatal(err)
	}
	defer reader.Close()

	// The update stops in its 150th document, in its transaction, after
	// at least 100 files have been written.
	gate, reached, applied := make(chan struct{}), make(chan struct{}), make(chan struct{})
	var analysed, progressed atomic.Int64
	blocking := func() func(corpus.Document) Analysis {
		work := nw()
		return func(d corpus.Document) Analysis {
			if analysed.Add(1) == 150 {
				close(reached)
				<-gate
			}
			return work(d)
		}
	}
	done := make(chan error, 1)
	go func() {
		_, err := s.Update(context.Background(), os.DirFS(dir), UpdateOptions{Key: testKey, Jobs: 2, Progress: func() {
			if progressed.Add(1) == 100 {
				close(applied)
			}
		}}, blocking)
		done <- err
	}()
	<-reached
	<-applied
	sameView(t, "during the update, another Store", loadView(t, reader), wantA)
	sameView(t, "during the update, the updating Store", loadView(t, s), wantA)
	close(gate)
	if err := <-done; err != nil {
		t.Fatal(err)
	}
	sameView(t, "after the update", loadView(t, reader), wantB)

	// Loads in a loop while an unhindered update runs: each sees the
	// state before or the state after, never a mixture.
	writeFolder(t, dir, n, 0, past.Add(2*time.Minute))
	done = make(chan error, 1)
	go func() {
		_, err := s.Update(context.Background(), os.DirFS(dir), UpdateOptions{Key: testKey, Jobs: 2}, nw)
		done <- err
	}()
	before, after := 0, 0
	for finished := false; !finished; {
		select {
		case err := <-done:
			if err != nil {
				t.Fatal(err)
			}
			finished = true
		default:
		}
		v := loadView(t, reader)
		switch v.fingerprint {
		case wantB.fingerprint:
			sameView(t, "a load during the second update", v, wantB)
			before++
		case wantA.fingerprint:
			sameView(t, "a load during the second update", v, wantA)
			after++
		default:
			t.Fatalf("a load saw neither state (fingerprint %s)", v.fingerprint)
		}
	}
	if after == 0 {
		t.Errorf("no load saw the committed update")
	}
	t.Logf("loads during the second update: %d saw the state before it, %d the state after", before, after)
}

// crashEnv names the helper's folder and store; set, TestHelperIndex
// indexes that folder and TestCrashMidUpdate kills it.
const crashEnv = "ASSAY_STORE_CRASH_HELPER"

// TestHelperIndex is not a test: it is the process TestCrashMidUpdate
// starts (re-running the test binary, the common practice of Go's own
// os/exec tests) and kills in the middle of an update.
func TestHelperIndex(t *testing.T) {
	env := os.Getenv(crashEnv)
	if env == "" {
		t.Skip("the helper process of TestCrashMidUpdate")
	}
	dir, storePath, _ := strings.Cut(env, string(os.PathListSeparator))
	s, err := Open(storePath)
	if err != nil {
		fmt.Println("error", err)
		os.Exit(2)
	}
	// A page cache of 64 pages (256 KiB) on the one connection makes the
	// transaction spill its pages into the write-ahead log long before it
	// commits (https://sqlite.org/pragma.html#pragma_cache_size), so the
	// kill finds uncommitted frames there.
	s.db.SetMaxOpenConns(1)
	if _, err := s.db.Exec("PRAGMA cache_size = 64"); err != nil {
		fmt.Println("error", err)
		os.Exit(2)
	}
	nw := analyzerWorker(textproc.Options{})
	var analysed atomic.Int64
	slow := func() func(corpus.Document) Analysis {
		work := nw()
		return func(d corpus.Document) Analysis {
			if n := analysed.Add(1); n%250 == 0 {
				fmt.Println("analysed", n)
			}
			time.Sleep(time.Millisecond) // leave the killer time to strike
			return work(d)
		}
	}
	if _, err := s.Update(context.Background(), os.DirFS(dir), UpdateOptions{Key: testKey, Jobs: 2}, slow); err != nil {
		fmt.Println("error", err)
		os.Exit(2)
	}
	fmt.Println("committed")
	os.Exit(0)
}

// An update killed with SIGKILL in the middle of its transaction leaves a
// store that opens, passes PRAGMA quick_check and loads exactly the state
// before that update; the next update then completes. SQLite's
// atomic-commit guarantee in WAL mode (https://sqlite.org/wal.html: a
// transaction is committed when its commit frame is in the WAL; frames
// of an uncommitted transaction are ignored by the recovery that the next
// connection runs; https://sqlite.org/atomiccommit.html).
func TestCrashMidUpdate(t *testing.T) {
	if testing.Short() {
		t.Skip("writes 3,000 files and runs a second process")
	}
	const n = 3000
	dir := t.TempDir()
	writeFolder(t, dir, n, 0, past)
	storePath := filepath.Join(t.TempDir(), "crash.assay")
	s, err := Open(storePath)
	if err != nil {
		t.Fatal(err)
	}
	nw := analyzerWorker(textproc.Options{})
	update(t, s, os.DirFS(dir), UpdateOptions{Key: testKey, Jobs: 2}, nw)
	wantA := loadView(t, s)
	if err := s.Close(); err != nil {
		t.Fatal(err)
	}
	writeFolder(t, dir, n, 1, past.Add(time.Minute))

	cmd := exec.Command(os.Args[0], "-test.run=^TestHelperIndex$", "-test.count=1")
	cmd.Env = append(os.Environ(), crashEnv+"="+dir+string(os.PathListSeparator)+storePath)
	out, err := cmd.StdoutPipe()
	if err != nil {
		t.Fatal(err)
	}
	cmd.Stderr = os.Stderr
	if err := cmd.Start(); err != nil {
		t.Fatal(err)
	}
	// Kill once the helper has analysed 500 documents and its transaction
	// has spilled pages into the write-ahead log, or at 2,500 documents
	// (of 3,000) at the latest.
	lines := bufio.NewScanner(out)
	killedAt, walSize := "", int64(0)
	for lines.Scan() {
		l := lines.Text()
		if strings.HasPrefix(l, "committed") || strings.HasPrefix(l, "error") {
			t.Fatalf("the helper was not killed in time: %s", l)
		}
		k, ok := strings.CutPrefix(l, "analysed ")
		if !ok {
			continue
		}
		done, _ := strconv.Atoi(k)
		if st, err := os.Stat(storePath + "-wal"); err == nil {
			walSize = st.Size()
		}
		if done >= 500 && walSize > 0 || done >= 2500 {
			killedAt = k
			break
		}
	}
	if killedAt == "" {
		t.Fatalf("the helper ended without reporting progress")
	}
	if err := cmd.Process.Kill(); err != nil {
		t.Fatal(err)
	}
	err = cmd.Wait()
	if st := cmd.ProcessState; err == nil || st.Exited() {
		t.Fatalf("the helper was not killed: %v", err)
	}
	t.Logf("killed after %s documents, the write-ahead log at %d bytes", killedAt, walSize)
	if walSize == 0 {
		t.Errorf("the write-ahead log was empty at the kill: the transaction had written nothing yet")
	}

	s, err = Open(storePath)
	if err != nil {
		t.Fatalf("the store does not open after the kill: %v", err)
	}
	defer s.Close()
	var qc string
	if err := s.db.QueryRow("PRAGMA quick_check").Scan(&qc); err != nil || qc != "ok" {
		t.Fatalf("quick_check: %q, %v", qc, err)
	}
	sameView(t, "after the kill", loadView(t, s), wantA)
	ch := update(t, s, os.DirFS(dir), UpdateOptions{Key: testKey, Jobs: 2}, nw)
	if len(ch.Changed) != n {
		t.Errorf("the update after the kill: %s", ch)
	}
	sameView(t, "after the new update", loadView(t, s), direct(t, os.DirFS(dir), corpus.Options{}, nw, false))
}
