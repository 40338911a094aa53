package store

import (
	"context"
	"hash/fnv"
	"os"
	"path/filepath"
	"runtime"
	"testing"
	"time"

	"assay/corpus"
	selection "assay/select"
	"assay/textproc"
)

// minHashWorker analyses as analyzerWorker does, with a signature like
// cmd/assay's: the MinHash values of the document's terms.
func minHashWorker(opts textproc.Options) func() func(corpus.Document) Analysis {
	return func() func(corpus.Document) Analysis {
		az := textproc.NewAnalyzer(opts)
		return func(d corpus.Document) Analysis {
			a := Analysis{Terms: map[string]int{}, Forms: map[[2]string]int{}}
			var items []uint64
			a.Lang = string(az.Analyze(d.Text, func(term, surface string) {
				a.Terms[term]++
				a.Forms[[2]string{term, surface}]++
				h := fnv.New64a()
				h.Write([]byte(term))
				items = append(items, h.Sum64())
			}))
			a.Sig = make([]uint32, selection.MinHashes)
			selection.MinHash(a.Sig, items, 1)
			return a
		}
	}
}

// BenchmarkIndex measures, on 20,000 generated text files of 30 to 70
// words (written once, in the setup, with a modification time an hour
// back, outside RacyWindow, as for a folder indexed some time after it was
// written):
//
//   - full-ms: a full index into a new store (walk, read, analyse, write,
//     commit);
//   - unchanged-ms: an update with nothing changed (walk and stat only);
//   - unchanged/full: their ratio (the target is under 0.10);
//   - rehash-ms: an update after every file's modification time changed
//     but not its content (every file read and hashed, none analysed:
//     also the cost of the update right after a folder was indexed within
//     RacyWindow of being written);
//   - load-ms and folder-ms: loading every document with its terms from
//     the store, against reading and analysing the folder as a pick does
//     without a store (corpus.WalkParallel with the analysis);
//   - open-ms: opening the closed store again (the read-only checks,
//     PRAGMA quick_check among them, which reads the whole database);
//   - store-B/doc: the store's size once closed, per document, with a
//     signature of selection.MinHashes (128) values a document, as
//     cmd/assay stores.
//
// Run it with: go test -run '^$' -bench Index -benchtime 3x ./corpus/store
func BenchmarkIndex(b *testing.B) {
	const n = 20000
	dir := b.TempDir()
	writeFolder(b, dir, n, 0, past)
	nw := minHashWorker(textproc.Options{})
	o := UpdateOptions{Key: testKey, Jobs: runtime.GOMAXPROCS(0)}
	ctx := context.Background()
	var full, unchanged, rehash, load, folder, open time.Duration
	var size int64
	iter := 0
	for b.Loop() {
		iter++
		p := filepath.Join(b.TempDir(), "bench.assay")
		s, err := Open(p)
		if err != nil {
			b.Fatal(err)
		}
		t0 := time.Now()
		if ch, err := s.Update(ctx, os.DirFS(dir), o, nw); err != nil || ch.Documents != n {
			b.Fatalf("full index: %v, %v", ch, err)
		}
		t1 := time.Now()
		if ch, err := s.Update(ctx, os.DirFS(dir), o, nw); err != nil || ch.Unchanged != n {
			b.Fatalf("unchanged: %v, %v", ch, err)
		}
		t2 := time.Now()
		terms := 0
		if _, err := s.Load(ctx, func(d Doc) error { terms += len(d.Terms); return nil }); err != nil {
			b.Fatal(err)
		}
		t3 := time.Now()
		for i := range n {
			mt := past.Add(time.Duration(iter) * time.Second)
			os.Chtimes(filepath.Join(dir, folderOf(i), fileOf(i)), mt, mt)
		}
		t4 := time.Now()
		if ch, err := s.Update(ctx, os.DirFS(dir), o, nw); err != nil || ch.Retimed != n {
			b.Fatalf("rehash: %v, %v", ch, err)
		}
		t5 := time.Now()
		direct(b, os.DirFS(dir), corpus.Options{}, nw, false)
		t6 := time.Now()
		if err := s.Close(); err != nil {
			b.Fatal(err)
		}
		st, err := os.Stat(p)
		if err != nil {
			b.Fatal(err)
		}
		t7 := time.Now()
		s, err = OpenExisting(p)
		if err != nil {
			b.Fatal(err)
		}
		s.Close()
		open += time.Since(t7)
		full += t1.Sub(t0)
		unchanged += t2.Sub(t1)
		load += t3.Sub(t2)
		rehash += t5.Sub(t4)
		folder += t6.Sub(t5)
		size = st.Size()
	}
	ms := func(d time.Duration) float64 { return float64(d) / float64(iter) / 1e6 }
	b.ReportMetric(ms(full), "full-ms")
	b.ReportMetric(ms(unchanged), "unchanged-ms")
	b.ReportMetric(float64(unchanged)/float64(full), "unchanged/full")
	b.ReportMetric(ms(rehash), "rehash-ms")
	b.ReportMetric(ms(load), "load-ms")
	b.ReportMetric(ms(folder), "folder-ms")
	b.ReportMetric(ms(open), "open-ms")
	b.ReportMetric(float64(size)/n, "store-B/doc")
}
