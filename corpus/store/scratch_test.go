package store

import (
	"database/sql"
	"os"
	"path/filepath"
	"testing"

	_ "modernc.org/sqlite"
)

func ls(t *testing.T, dir string) {
	es, _ := os.ReadDir(dir)
	for _, e := range es {
		i, _ := e.Info()
		t.Logf("  %s %d", e.Name(), i.Size())
	}
}

func TestScratch(t *testing.T) {
	dir := t.TempDir()
	p := filepath.Join(dir, "x.db")
	db, err := sql.Open("sqlite", "file:"+p+"?_pragma=journal_mode(WAL)")
	if err != nil {
		t.Fatal(err)
	}
	if _, err := db.Exec("create table a(x); insert into a values(1)"); err != nil {
		t.Fatal(err)
	}
	ls(t, dir)
	db.Close()
	t.Log("after close")
	ls(t, dir)
	db, err = sql.Open("sqlite", "file:"+p+"?mode=ro")
	if err != nil {
		t.Fatal(err)
	}
	var s string
	if err := db.QueryRow("pragma quick_check").Scan(&s); err != nil {
		t.Fatal(err)
	}
	t.Log(s)
	ls(t, dir)
	db.Close()
	t.Log("after ro close")
	ls(t, dir)
}
