package store

import (
	"bytes"
	"context"
	"database/sql"
	"errors"
	"io/fs"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"assay/textproc"
)

// builtStore makes a store of the fixture at dir/name, closed.
func builtStore(t *testing.T, dir, name string) string {
	t.Helper()
	p := filepath.Join(dir, name)
	s, err := Open(p)
	if err != nil {
		t.Fatal(err)
	}
	update(t, s, os.DirFS(fixture), UpdateOptions{Key: testKey}, analyzerWorker(textproc.Options{}))
	if err := s.Close(); err != nil {
		t.Fatal(err)
	}
	return p
}

// foreignDB makes a SQLite database of another application at p, in the
// journal mode given.
func foreignDB(t *testing.T, p, journal string) {
	t.Helper()
	db, err := sql.Open("sqlite", "file://"+p+"?_pragma=journal_mode("+journal+")")
	if err != nil {
		t.Fatal(err)
	}
	if _, err := db.Exec("CREATE TABLE notes(id INTEGER PRIMARY KEY, body TEXT); INSERT INTO notes(body) VALUES('buy string')"); err != nil {
		t.Fatal(err)
	}
	if err := db.Close(); err != nil {
		t.Fatal(err)
	}
}

// names lists a folder's file names.
func names(t *testing.T, dir string) []string {
	t.Helper()
	es, err := os.ReadDir(dir)
	if err != nil {
		t.Fatal(err)
	}
	var out []string
	for _, e := range es {
		out = append(out, e.Name())
	}
	return out
}

// Open refuses what is not a usable store with the right error, and
// leaves the file's bytes as they were. The header checks follow the
// SQLite file format's "The Database Header" (the 16-byte magic string at
// offset 0, application_id at offset 68); damage is what PRAGMA
// quick_check reports, or SQLite's SQLITE_CORRUPT / SQLITE_NOTADB result
// codes (https://sqlite.org/rescode.html).
func TestOpenRefuses(t *testing.T) {
	cases := []struct {
		name string
		make func(t *testing.T, dir string) string
		want error
		// quiet: no file may appear beside it (SQLite is never asked to
		// open it, so no -wal or -shm file is made)
		quiet bool
	}{
		{"text file", func(t *testing.T, dir string) string {
			p := filepath.Join(dir, "notes.assay")
			os.WriteFile(p, []byte("These are my notes, not a database.\n"), 0o644)
			return p
		}, ErrNotStore, true},
		{"short SQLite header", func(t *testing.T, dir string) string {
			p := filepath.Join(dir, "short.assay")
			os.WriteFile(p, []byte("SQLite format 3\x00\x10\x00"), 0o644)
			return p
		}, ErrDamaged, true},
		{"foreign SQLite database", func(t *testing.T, dir string) string {
			p := filepath.Join(dir, "other.db")
			foreignDB(t, p, "DELETE")
			return p
		}, ErrNotStore, true},
		{"foreign SQLite database in WAL mode", func(t *testing.T, dir string) string {
			p := filepath.Join(dir, "other-wal.db")
			foreignDB(t, p, "WAL")
			return p
		}, ErrNotStore, true},
		{"truncated store", func(t *testing.T, dir string) string {
			p := builtStore(t, dir, "cut.assay")
			st, _ := os.Stat(p)
			if err := os.Truncate(p, st.Size()/2); err != nil {
				t.Fatal(err)
			}
			return p
		}, ErrDamaged, false},
		{"overwritten page", func(t *testing.T, dir string) string {
			p := builtStore(t, dir, "scribbled.assay")
			raw, _ := os.ReadFile(p)
			// Page 2 starts at byte 4096 (the default page size); fill
			// its b-tree page header with a byte no page type has.
			for i := 4096; i < 4096+64; i++ {
				raw[i] = 0x7f
			}
			os.WriteFile(p, raw, 0o644)
			return p
		}, ErrDamaged, false},
		{"newer schema", func(t *testing.T, dir string) string {
			p := builtStore(t, dir, "future.assay")
			db, err := sql.Open("sqlite", "file://"+p)
			if err != nil {
				t.Fatal(err)
			}
			if _, err := db.Exec("UPDATE meta SET value = '99' WHERE name = 'schema'"); err != nil {
				t.Fatal(err)
			}
			db.Close()
			return p
		}, ErrNewerSchema, false},
		{"folder", func(t *testing.T, dir string) string {
			p := filepath.Join(dir, "folder.assay")
			os.Mkdir(p, 0o755)
			return p
		}, ErrNotStore, true},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			dir := t.TempDir()
			p := c.make(t, dir)
			before, _ := os.ReadFile(p)
			beside := names(t, dir)
			s, err := Open(p)
			if err == nil {
				s.Close()
				t.Fatalf("Open succeeded")
			}
			t.Log(err)
			if !errors.Is(err, c.want) {
				t.Fatalf("err %v, want %v", err, c.want)
			}
			if !strings.Contains(err.Error(), p) {
				t.Errorf("message %q does not name the file", err)
			}
			after, _ := os.ReadFile(p)
			if !bytes.Equal(before, after) {
				t.Errorf("the file changed")
			}
			if now := names(t, dir); c.quiet && !slices.Equal(now, beside) {
				t.Errorf("files beside it: %q, before %q", now, beside)
			}
		})
	}
}

// OpenExisting does not create a store; Open creates one from nothing or
// from an empty file, and what it creates opens again.
func TestOpenCreates(t *testing.T) {
	dir := t.TempDir()
	p := filepath.Join(dir, "new.assay")
	if _, err := OpenExisting(p); !errors.Is(err, fs.ErrNotExist) {
		t.Fatalf("OpenExisting of a missing file: %v", err)
	}
	if len(names(t, dir)) != 0 {
		t.Fatalf("OpenExisting left %q", names(t, dir))
	}
	empty := filepath.Join(dir, "empty.assay")
	os.WriteFile(empty, nil, 0o644)
	for _, f := range []string{p, empty} {
		s, err := Open(f)
		if err != nil {
			t.Fatal(err)
		}
		in, err := s.Info(context.Background())
		if err != nil || in.SchemaVersion != SchemaVersion || in.Options != "" || in.Files != 0 {
			t.Errorf("%s: info %+v, %v", f, in, err)
		}
		// A store never updated loads nothing, without error.
		snap, err := s.Load(context.Background(), func(Doc) error { return errors.New("no documents expected") })
		if err != nil || snap.Documents != 0 {
			t.Errorf("%s: load %+v, %v", f, snap, err)
		}
		s.Close()
		s, err = OpenExisting(f)
		if err != nil {
			t.Fatal(err)
		}
		s.Close()
	}
	// No temporary file is left behind; the last connection removed the
	// write-ahead log (SQLite's wal.html: "the WAL file is deleted when
	// the last connection to the database closes").
	if got := names(t, dir); !slices.Equal(got, []string{"empty.assay", "new.assay"}) {
		t.Errorf("folder holds %q", got)
	}
}

// The store is in WAL mode with foreign keys on (https://sqlite.org/wal.html;
// https://sqlite.org/foreignkeys.html: foreign keys are off unless each
// connection turns them on), and carries its application_id.
func TestPragmas(t *testing.T) {
	s, _ := openStore(t)
	var mode string
	var fk, app int
	if err := s.db.QueryRow("PRAGMA journal_mode").Scan(&mode); err != nil || mode != "wal" {
		t.Errorf("journal_mode %q, %v", mode, err)
	}
	if err := s.db.QueryRow("PRAGMA foreign_keys").Scan(&fk); err != nil || fk != 1 {
		t.Errorf("foreign_keys %d, %v", fk, err)
	}
	if err := s.db.QueryRow("PRAGMA application_id").Scan(&app); err != nil || app != applicationID {
		t.Errorf("application_id %#x, %v", app, err)
	}
}

// Removing a file removes its documents, texts and skips through the
// foreign keys' ON DELETE CASCADE: no orphan rows remain.
func TestNoOrphans(t *testing.T) {
	dir := t.TempDir()
	copyTree(t, fixture, dir, past)
	s, _ := openStore(t)
	nw := analyzerWorker(textproc.Options{})
	update(t, s, os.DirFS(dir), UpdateOptions{Key: testKey, KeepText: true}, nw)
	os.RemoveAll(filepath.Join(dir, "mail"))
	os.Remove(filepath.Join(dir, "records", "stations.csv"))
	update(t, s, os.DirFS(dir), UpdateOptions{Key: testKey, KeepText: true}, nw)
	for _, q := range []string{
		"SELECT count(*) FROM documents WHERE file NOT IN (SELECT id FROM files)",
		"SELECT count(*) FROM skips WHERE file NOT IN (SELECT id FROM files)",
		"SELECT count(*) FROM texts WHERE doc NOT IN (SELECT id FROM documents)",
	} {
		var n int
		if err := s.db.QueryRow(q).Scan(&n); err != nil || n != 0 {
			t.Errorf("%s: %d, %v", q, n, err)
		}
	}
	var n int
	s.db.QueryRow("SELECT count(*) FROM texts").Scan(&n)
	if n != 6 {
		t.Errorf("%d texts, want 6 (12 documents less the mail folder's 4 and the CSV's 2)", n)
	}
}
