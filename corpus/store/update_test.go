package store

import (
	"context"
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"
	"testing/fstest"
	"time"

	"assay/corpus"
	"assay/textproc"
)

// fixture is the invented test folder: plain text, Markdown and
// reStructuredText, an .mbox with a broken message, an .eml with an
// attachment, a CSV with a broken record, a binary file with a .txt
// extension, an empty file, unsupported types, a hidden folder, and the
// names "a/…" and "a-b.txt", whose walk order differs from their string
// order.
const fixture = "testdata/corpus"

// fixtureFiles are the files of the fixture an update meets, in walk order.
var fixtureFiles = []string{
	"a/alpha.rst", "a/zulu.txt", "a-b.txt", "mail/survey.eml", "mail/thread.mbox",
	"misc/empty.txt", "misc/minutes.odt", "misc/pixel.gif", "misc/pixel.txt",
	"notes/ferry.txt", "notes/floods.md", "notes/lettre.txt", "records/stations.csv",
}

// A store built from the fixture loads the same documents (every field
// and every count), skips (order and reasons) and fingerprint as a direct
// corpus.WalkParallel with the analysis in the workers, for 1 and 3 jobs
// (the property a pick from the store relies on; no outside source).
func TestRoundTrip(t *testing.T) {
	nw := analyzerWorker(textproc.Options{})
	want := direct(t, os.DirFS(fixture), corpus.Options{}, nw, false)
	if len(want.lines) != 12 || len(want.skips) != 6 {
		t.Fatalf("the fixture gives %d documents and %d skips; the test expects 12 and 6", len(want.lines), len(want.skips))
	}
	for _, jobs := range []int{1, 3} {
		s, _ := openStore(t)
		ch := update(t, s, os.DirFS(fixture), UpdateOptions{Key: testKey, Jobs: jobs}, nw)
		if !slices.Equal(ch.Added, fixtureFiles) || len(ch.Changed)+len(ch.Removed)+ch.Unchanged != 0 {
			t.Errorf("jobs %d: changes %+v, want every fixture file added", jobs, ch)
		}
		if ch.DocumentsRead != 12 || ch.Documents != 12 || ch.Files != len(fixtureFiles) {
			t.Errorf("jobs %d: %s", jobs, ch)
		}
		if fmt.Sprint(ch.Skipped) != fmt.Sprint(want.skips) {
			t.Errorf("jobs %d: Changes.Skipped %v, want %v", jobs, ch.Skipped, want.skips)
		}
		got := loadView(t, s)
		sameView(t, fmt.Sprintf("jobs %d", jobs), got, want)
	}
}

// Load gives documents in walk order, which is not the string order of
// their IDs: io/fs.WalkDir documents "The files are walked in lexical
// order", folder by folder, so "a/zulu.txt" comes before "a-b.txt"
// although "a-b.txt" < "a/zulu.txt" as strings ('-' 0x2D < '/' 0x2F).
func TestLoadWalkOrder(t *testing.T) {
	s, _ := openStore(t)
	update(t, s, os.DirFS(fixture), UpdateOptions{Key: testKey}, analyzerWorker(textproc.Options{}))
	var ids []string
	if _, err := s.Load(context.Background(), func(d Doc) error {
		ids = append(ids, d.ID)
		return nil
	}); err != nil {
		t.Fatal(err)
	}
	if i, j := slices.Index(ids, "a/zulu.txt"), slices.Index(ids, "a-b.txt"); i < 0 || j < 0 || i > j {
		t.Errorf("order %q: want a/zulu.txt before a-b.txt", ids)
	}
}

// walkKey orders paths as fs.WalkDir visits them, on names chosen around
// the separator: bytes below and above '/', a prefix folder, upper case,
// non-ASCII (io/fs.WalkDir: "lexical order", each folder's entries sorted
// by name).
func TestWalkKeyOrder(t *testing.T) {
	m := fstest.MapFS{}
	for _, p := range []string{"a!x", "a-b", "a.b", "a/b", "a/b!/c", "a/b/c", "a/bc", "a0", "B", "b", "é/a", "e", "a/b/c/d", "ab"} {
		m[p+".txt"] = &fstest.MapFile{Data: []byte("x")}
	}
	var walked []string
	fs.WalkDir(m, ".", func(p string, d fs.DirEntry, err error) error {
		if err == nil && !d.IsDir() {
			walked = append(walked, p)
		}
		return nil
	})
	byKey := slices.Clone(walked)
	slices.SortFunc(byKey, func(x, y string) int { return strings.Compare(string(walkKey(x)), string(walkKey(y))) })
	if !slices.Equal(byKey, walked) {
		t.Errorf("by walk key %q\nwalked     %q", byKey, walked)
	}
}

// Incremental updates on a copy of the fixture whose files were written
// an hour before (outside RacyWindow): nothing changed → nothing opened
// or analysed; one file's content changed → only it opened and analysed;
// a modification time changed alone → the file hashed (opened) but not
// analysed; a file deleted → its documents and skips gone; a file added →
// read. After each step Load equals a direct walk of the folder as it is
// (no outside source: the properties the store promises).
func TestIncremental(t *testing.T) {
	dir := t.TempDir()
	copyTree(t, fixture, dir, past)
	fsys := &openCounter{base: os.DirFS(dir)}
	var cnt counting
	nw := analyzerWorker(textproc.Options{})
	o := UpdateOptions{Key: testKey, Jobs: 2}
	s, _ := openStore(t)
	check := func(step string) {
		t.Helper()
		sameView(t, step, loadView(t, s), direct(t, os.DirFS(dir), corpus.Options{}, nw, false))
	}

	update(t, s, fsys, o, cnt.wrap(nw))
	if got := cnt.take(); len(got) != 12 {
		t.Fatalf("first update analysed %d documents, want 12", len(got))
	}
	fsys.take()

	ch := update(t, s, fsys, o, cnt.wrap(nw))
	if got, opened := cnt.take(), fsys.take(); len(got) != 0 || len(opened) != 0 {
		t.Errorf("nothing changed: analysed %q, opened %q", got, opened)
	}
	if ch.Unchanged != len(fixtureFiles) || len(ch.Added)+len(ch.Changed)+len(ch.Removed) != 0 || ch.Documents != 12 {
		t.Errorf("nothing changed: %s", ch)
	}
	check("nothing changed")

	ferry := filepath.Join(dir, "notes", "ferry.txt")
	if err := os.WriteFile(ferry, []byte("Subject: Ferry suspended\n\nThe ferry is suspended until the pontoon is mended.\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	os.Chtimes(ferry, past.Add(time.Minute), past.Add(time.Minute))
	ch = update(t, s, fsys, o, cnt.wrap(nw))
	if got, opened := cnt.take(), fsys.take(); !slices.Equal(got, []string{"notes/ferry.txt"}) || !slices.Equal(opened, []string{"notes/ferry.txt"}) {
		t.Errorf("one file changed: analysed %q, opened %q", got, opened)
	}
	if !slices.Equal(ch.Changed, []string{"notes/ferry.txt"}) || ch.Unchanged != len(fixtureFiles)-1 {
		t.Errorf("one file changed: %+v", ch)
	}
	check("one file changed")

	floods := filepath.Join(dir, "notes", "floods.md")
	os.Chtimes(floods, past.Add(2*time.Minute), past.Add(2*time.Minute))
	ch = update(t, s, fsys, o, cnt.wrap(nw))
	if got, opened := cnt.take(), fsys.take(); len(got) != 0 || !slices.Equal(opened, []string{"notes/floods.md"}) {
		t.Errorf("time changed alone: analysed %q, opened %q; want only notes/floods.md opened", got, opened)
	}
	if ch.Retimed != 1 || ch.Unchanged != len(fixtureFiles) || len(ch.Changed) != 0 {
		t.Errorf("time changed alone: %+v", ch)
	}
	update(t, s, fsys, o, cnt.wrap(nw))
	if opened := fsys.take(); len(opened) != 0 {
		t.Errorf("after the new time was stored: opened %q", opened)
	}
	check("time changed alone")

	if err := os.Remove(filepath.Join(dir, "mail", "thread.mbox")); err != nil {
		t.Fatal(err)
	}
	ch = update(t, s, fsys, o, cnt.wrap(nw))
	if !slices.Equal(ch.Removed, []string{"mail/thread.mbox"}) || ch.Documents != 10 || len(cnt.take()) != 0 {
		t.Errorf("a file deleted: %+v", ch)
	}
	for _, sk := range ch.Skipped {
		if strings.HasPrefix(sk.Path, "mail/thread.mbox") {
			t.Errorf("the deleted mailbox's skip %v is still listed", sk)
		}
	}
	check("a file deleted")

	added := filepath.Join(dir, "notes", "bell.txt")
	os.WriteFile(added, []byte("The bell tower clock gains a minute a week."), 0o644)
	os.Chtimes(added, past, past)
	ch = update(t, s, fsys, o, cnt.wrap(nw))
	if got := cnt.take(); !slices.Equal(ch.Added, []string{"notes/bell.txt"}) || !slices.Equal(got, []string{"notes/bell.txt"}) {
		t.Errorf("a file added: %+v, analysed %q", ch, got)
	}
	check("a file added")
}

// RacyWindow: a file rewritten with content of the same size and given
// back the very modification time it had when it was indexed looks
// unchanged by size and time; because that time lay within RacyWindow of
// the update's start, the next update hashes it and finds the change
// (the "racily clean" entry of common practice in version-control
// indexes). Once an update has started well after the file's time, the
// file is trusted again and not opened.
func TestRacyWindow(t *testing.T) {
	dir := t.TempDir()
	p := filepath.Join(dir, "memo.txt")
	os.WriteFile(p, []byte("The pump house opens at eight."), 0o644)
	now := time.Now()
	os.Chtimes(p, now, now)
	fsys := &openCounter{base: os.DirFS(dir)}
	s, _ := openStore(t)
	var cnt counting
	nw := analyzerWorker(textproc.Options{})
	update(t, s, fsys, UpdateOptions{Key: testKey}, cnt.wrap(nw))
	os.WriteFile(p, []byte("The pump house opens at eleven"), 0o644) // same size
	os.Chtimes(p, now, now)
	cnt.take()
	ch := update(t, s, fsys, UpdateOptions{Key: testKey}, cnt.wrap(nw))
	if got := cnt.take(); !slices.Equal(got, []string{"memo.txt"}) || !slices.Equal(ch.Changed, []string{"memo.txt"}) {
		t.Errorf("racy rewrite: analysed %q, changes %+v", got, ch)
	}
	sameView(t, "racy rewrite", loadView(t, s), direct(t, os.DirFS(dir), corpus.Options{}, nw, false))

	// Give the file an old time, then update twice: the first update
	// hashes it (its time changed), the second must not open it.
	os.Chtimes(p, past, past)
	update(t, s, fsys, UpdateOptions{Key: testKey}, nw)
	fsys.take()
	update(t, s, fsys, UpdateOptions{Key: testKey}, nw)
	if opened := fsys.take(); len(opened) != 0 {
		t.Errorf("an old file was opened: %q", opened)
	}
}

// A file system without modification times (fstest.MapFS with zero
// ModTime) has every file hashed on every update, so a rewrite of the
// same size is still found; unchanged content is not analysed again.
func TestZeroModTime(t *testing.T) {
	m := fstest.MapFS{
		"one.txt": {Data: []byte("Moorland fire risk is high this week.")},
		"two.txt": {Data: []byte("The moth trap caught forty species.")},
	}
	s, _ := openStore(t)
	var cnt counting
	nw := analyzerWorker(textproc.Options{})
	update(t, s, m, UpdateOptions{Key: testKey}, cnt.wrap(nw))
	cnt.take()
	m["two.txt"] = &fstest.MapFile{Data: []byte("The moth trap caught fifty species.")}
	ch := update(t, s, m, UpdateOptions{Key: testKey}, cnt.wrap(nw))
	if got := cnt.take(); !slices.Equal(got, []string{"two.txt"}) || ch.Retimed != 0 || ch.Unchanged != 1 {
		t.Errorf("analysed %q, changes %+v", got, ch)
	}
	sameView(t, "zero times", loadView(t, s), direct(t, m, corpus.Options{}, nw, false))
}

// Another options key, or another KeepText, gives ErrOptionsChanged with
// both keys and the way out in the message, and leaves the store as it
// was; Rebuild starts over with the new options.
func TestOptionsChanged(t *testing.T) {
	s, _ := openStore(t)
	nw := analyzerWorker(textproc.Options{})
	update(t, s, os.DirFS(fixture), UpdateOptions{Key: testKey}, nw)
	before := loadView(t, s)
	newKey := strings.Replace(testKey, "stem=true", "stem=false", 1)
	noStem := analyzerWorker(textproc.Options{NoStem: true})
	for _, o := range []UpdateOptions{{Key: newKey}, {Key: testKey, KeepText: true}} {
		_, err := s.Update(context.Background(), os.DirFS(fixture), o, noStem)
		if !errors.Is(err, ErrOptionsChanged) {
			t.Fatalf("%+v: err %v, want ErrOptionsChanged", o, err)
		}
		for _, want := range []string{testKey, o.Key, "--rebuild", "new store"} {
			if !strings.Contains(err.Error(), want) {
				t.Errorf("message %q lacks %q", err, want)
			}
		}
		sameView(t, "after the refused update", loadView(t, s), before)
	}
	ch := update(t, s, os.DirFS(fixture), UpdateOptions{Key: newKey, Rebuild: true}, noStem)
	if !ch.Rebuilt || len(ch.Added) != len(fixtureFiles) {
		t.Errorf("rebuild: %+v", ch)
	}
	sameView(t, "rebuilt", loadView(t, s), direct(t, os.DirFS(fixture), corpus.Options{}, noStem, false))
	if in, err := s.Info(context.Background()); err != nil || in.Options != newKey {
		t.Errorf("info %+v, %v", in, err)
	}
}

// Texts are stored only when asked: without KeepText the texts table
// stays empty and Load gives empty texts; with it, Load gives each
// document's text as the reader made it.
func TestKeepText(t *testing.T) {
	nw := analyzerWorker(textproc.Options{})
	for _, keep := range []bool{false, true} {
		s, _ := openStore(t)
		update(t, s, os.DirFS(fixture), UpdateOptions{Key: testKey, KeepText: keep}, nw)
		var n int
		if err := s.db.QueryRow("SELECT count(*) FROM texts").Scan(&n); err != nil {
			t.Fatal(err)
		}
		if keep != (n == 12) || !keep && n != 0 {
			t.Errorf("keep %v: %d texts stored", keep, n)
		}
		got := loadView(t, s)
		sameView(t, fmt.Sprintf("keep %v", keep), got, direct(t, os.DirFS(fixture), corpus.Options{}, nw, keep))
		if keep && !strings.Contains(strings.Join(got.lines, "\n"), "Spraints were found") {
			t.Errorf("kept texts lack the e-mail's body")
		}
	}
}

// The same folder indexed twice, into two stores with 1 and 4 jobs, gives
// identical Load output and identical table contents (word ids
// included): what is stored depends on the documents' walk order only
// (the project's determinism convention).
func TestDeterminism(t *testing.T) {
	nw := analyzerWorker(textproc.Options{})
	var views []corpusView
	var dumps []string
	for _, jobs := range []int{1, 4} {
		s, _ := openStore(t)
		update(t, s, os.DirFS(fixture), UpdateOptions{Key: testKey, Jobs: jobs}, nw)
		views = append(views, loadView(t, s))
		dumps = append(dumps, dump(t, s))
	}
	sameView(t, "second store", views[1], views[0])
	if dumps[0] != dumps[1] {
		t.Errorf("table contents differ:\n%s\n----\n%s", dumps[0], dumps[1])
	}
}

// dump renders the tables that hold the corpus (not meta, whose
// indexed_at is a time).
func dump(t testing.TB, s *Store) string {
	t.Helper()
	var b strings.Builder
	for _, q := range []string{
		"SELECT id, hex(walk_key), path, kind, size, mtime_ns, mode, hex(sha256) FROM files ORDER BY id",
		"SELECT file, pos, path, reason FROM skips ORDER BY file, pos",
		"SELECT id, word FROM words ORDER BY id",
		"SELECT id, file, pos, doc_id, title, size, hex(sha256), format, lang, repaired, container, mail_from, mail_to, mail_cc, mail_date, message_id, hex(terms), hex(forms) FROM documents ORDER BY id",
	} {
		rows, err := s.db.Query(q)
		if err != nil {
			t.Fatal(err)
		}
		cols, _ := rows.Columns()
		for rows.Next() {
			vals := make([]any, len(cols))
			ptrs := make([]any, len(cols))
			for i := range vals {
				ptrs[i] = &vals[i]
			}
			rows.Scan(ptrs...)
			fmt.Fprintln(&b, vals...)
		}
		rows.Close()
	}
	return b.String()
}

// failingDirFS fails to list one folder, as a folder without read
// permission does (which root, running the tests, cannot be denied).
type failingDirFS struct {
	fstest.MapFS
	bad string
}

func (f failingDirFS) ReadDir(name string) ([]fs.DirEntry, error) {
	if name == f.bad {
		return nil, &fs.PathError{Op: "readdir", Path: name, Err: fs.ErrPermission}
	}
	return f.MapFS.ReadDir(name)
}

// A folder the walk cannot list is stored as a skip in walk order, as
// corpus.WalkParallel reports it; when it can be listed again its files
// come in and the skip goes.
func TestUnreadableFolder(t *testing.T) {
	m := fstest.MapFS{
		"a.txt":        {Data: []byte("Bus timetable for the valley route."), ModTime: past},
		"locked/b.txt": {Data: []byte("Staff conduct policy, second draft."), ModTime: past},
		"z.txt":        {Data: []byte("Water quality at the reservoir is good."), ModTime: past},
	}
	nw := analyzerWorker(textproc.Options{})
	s, _ := openStore(t)
	bad := failingDirFS{m, "locked"}
	ch := update(t, s, bad, UpdateOptions{Key: testKey}, nw)
	want := direct(t, bad, corpus.Options{}, nw, false)
	if len(want.skips) != 1 || want.skips[0].Path != "locked" {
		t.Fatalf("the direct walk gives skips %v", want.skips)
	}
	sameView(t, "locked", loadView(t, s), want)
	ch = update(t, s, bad, UpdateOptions{Key: testKey}, nw)
	if ch.Unchanged != 3 {
		t.Errorf("locked again: %+v", ch)
	}
	ch = update(t, s, m, UpdateOptions{Key: testKey}, nw)
	if !slices.Equal(ch.Removed, []string{"locked"}) || !slices.Equal(ch.Added, []string{"locked/b.txt"}) {
		t.Errorf("unlocked: %+v", ch)
	}
	sameView(t, "unlocked", loadView(t, s), direct(t, m, corpus.Options{}, nw, false))
}

// A cancelled update returns the context's error and leaves the store as
// it was (the transaction is rolled back).
func TestUpdateCancelled(t *testing.T) {
	dir := t.TempDir()
	copyTree(t, fixture, dir, past)
	nw := analyzerWorker(textproc.Options{})
	s, _ := openStore(t)
	update(t, s, os.DirFS(dir), UpdateOptions{Key: testKey}, nw)
	before := loadView(t, s)
	os.Remove(filepath.Join(dir, "notes", "ferry.txt"))
	os.WriteFile(filepath.Join(dir, "notes", "new.txt"), []byte("A new notice about the ferry."), 0o644)
	ctx, cancel := context.WithCancel(context.Background())
	n := 0
	_, err := s.Update(ctx, os.DirFS(dir), UpdateOptions{Key: testKey, Progress: func() {
		if n++; n == 3 {
			cancel()
		}
	}}, nw)
	if !errors.Is(err, context.Canceled) {
		t.Fatalf("err %v, want context.Canceled", err)
	}
	sameView(t, "after the cancelled update", loadView(t, s), before)
}

// Include and Exclude filter the update's walk as they filter
// corpus.Walk.
func TestIncludeExclude(t *testing.T) {
	nw := analyzerWorker(textproc.Options{})
	opts := corpus.Options{Include: []string{"*.txt", "*.md"}, Exclude: []string{"misc"}}
	s, _ := openStore(t)
	update(t, s, os.DirFS(fixture), UpdateOptions{Key: "include=*.txt,*.md exclude=misc", Read: opts}, nw)
	sameView(t, "filtered", loadView(t, s), direct(t, os.DirFS(fixture), opts, nw, false))
}

// Bad counts from the analyzer are refused, not stored.
func TestBadCount(t *testing.T) {
	s, _ := openStore(t)
	bad := func() func(corpus.Document) Analysis {
		return func(corpus.Document) Analysis { return Analysis{Terms: map[string]int{"x": 0}} }
	}
	_, err := s.Update(context.Background(), fstest.MapFS{"a.txt": {Data: []byte("words")}}, UpdateOptions{Key: testKey}, bad)
	if err == nil || !strings.Contains(err.Error(), "count 0") {
		t.Errorf("err %v", err)
	}
}

// LoadCounted gives every document of Load, in the same order, with the
// same fields, its terms and forms as word ids that name Load's strings
// with the same counts, terms in increasing id order; and the same
// snapshot (a property of the two views of one store; no outside source).
func TestLoadCountedMatchesLoad(t *testing.T) {
	s, _ := openStore(t)
	update(t, s, os.DirFS(fixture), UpdateOptions{Key: testKey, Jobs: 2}, analyzerWorker(textproc.Options{}))
	var want []Doc
	snapA, err := s.Load(context.Background(), func(d Doc) error { want = append(want, d); return nil })
	if err != nil {
		t.Fatal(err)
	}
	i := 0
	snapB, err := s.LoadCounted(context.Background(), func(d Doc, c *Counted) error {
		if i >= len(want) {
			t.Fatalf("LoadCounted gives more than Load's %d documents", len(want))
		}
		w := want[i]
		i++
		if d.Terms != nil || d.Forms != nil {
			t.Errorf("%s: LoadCounted filled the maps", d.ID)
		}
		if d.ID != w.ID || d.File != w.File || d.Title != w.Title || d.Hash != w.Hash || d.Lang != w.Lang || !slices.Equal(d.Sig, w.Sig) {
			t.Errorf("%s: fields differ from Load's %s", d.ID, w.ID)
		}
		terms := map[string]int{}
		for k, tc := range c.Terms {
			if k > 0 && tc.Word <= c.Terms[k-1].Word {
				t.Errorf("%s: term ids not increasing", d.ID)
			}
			terms[c.Words[tc.Word]] = tc.N
		}
		if fmt.Sprint(terms) != fmt.Sprint(w.Terms) {
			t.Errorf("%s: terms %v, want %v", d.ID, terms, w.Terms)
		}
		forms := map[[2]string]int{}
		for _, fc := range c.Forms {
			forms[[2]string{c.Words[fc.Term], c.Words[fc.Form]}] = fc.N
		}
		if fmt.Sprint(forms) != fmt.Sprint(w.Forms) {
			t.Errorf("%s: forms %v, want %v", d.ID, forms, w.Forms)
		}
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
	if i != len(want) || len(want) == 0 {
		t.Errorf("LoadCounted gave %d documents, Load %d", i, len(want))
	}
	if fmt.Sprint(snapA) != fmt.Sprint(snapB) {
		t.Errorf("snapshots differ:\n%+v\n%+v", snapA, snapB)
	}
}
