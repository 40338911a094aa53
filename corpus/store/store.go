package store

import (
	"bytes"
	"context"
	"database/sql"
	"encoding/binary"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"strconv"
	"strings"

	_ "modernc.org/sqlite" // the "sqlite" database/sql driver
)

// SchemaVersion is the version of the on-disk schema this package writes
// and reads (see the package documentation).
const SchemaVersion = 1

// applicationID marks a SQLite database as an assay store: the 32-bit
// application_id of the database header, "asy1" in ASCII.
const applicationID = 0x61737931

// storeKind is the meta value "kind" of every store.
const storeKind = "assay corpus store"

// busyTimeoutMS is how long a connection waits for a lock held by another
// connection (another process updating the store, or checkpointing)
// before it gives up with ErrBusy.
const busyTimeoutMS = 5000

// The errors of Open, Update and Load; test them with errors.Is.
var (
	// ErrNotStore: the file is not a SQLite database, or a SQLite
	// database of another application.
	ErrNotStore = errors.New("not an assay store")
	// ErrDamaged: the file is an assay store whose database is damaged
	// (truncated, or failing SQLite's quick_check).
	ErrDamaged = errors.New("damaged assay store")
	// ErrNewerSchema: the store was written by a newer assay, with a
	// schema version this one does not know.
	ErrNewerSchema = errors.New("assay store of a newer schema version")
	// ErrOptionsChanged: Update was asked for other options than the
	// store was built with, and not to rebuild it.
	ErrOptionsChanged = errors.New("options differ from the store's")
	// ErrBusy: another connection held the store's lock for longer than
	// the busy timeout (typically another update in progress).
	ErrBusy = errors.New("the store is locked by another process")
)

// SQLite's primary result codes that the package tells apart
// (https://sqlite.org/rescode.html).
const (
	sqliteBusy    = 5
	sqliteLocked  = 6
	sqliteCorrupt = 11
	sqliteNotADB  = 26
)

// sqliteCode returns the primary SQLite result code of err, or 0.
func sqliteCode(err error) int {
	var c interface{ Code() int }
	if errors.As(err, &c) {
		return c.Code() & 0xff
	}
	return 0
}

// classify wraps err with ErrDamaged or ErrBusy when SQLite's result code
// says so, and leaves it alone otherwise.
func classify(err error) error {
	switch sqliteCode(err) {
	case sqliteCorrupt, sqliteNotADB:
		return fmt.Errorf("%w: %w", ErrDamaged, err)
	case sqliteBusy, sqliteLocked:
		return fmt.Errorf("%w: %w", ErrBusy, err)
	}
	return err
}

// Store is an open assay store. Its methods may be called from several
// goroutines; Update and Load each run in a transaction of their own.
type Store struct {
	db   *sql.DB
	path string
}

// Info describes a store.
type Info struct {
	// Path is the file name given to Open.
	Path string
	// SchemaVersion is the store's schema version.
	SchemaVersion int
	// Options is the options key of the last update ("" before the
	// first), KeepText whether document texts are kept.
	Options  string
	KeepText bool
	// Files, Documents, Skips and Words count the rows of the tables.
	Files, Documents, Skips, Words int
}

// Open opens the store at path, creating a new one when there is no file
// there (or an empty one). An existing file is first examined read-only,
// and refused when it is not an assay store (ErrNotStore), is damaged
// (ErrDamaged: truncated, or failing PRAGMA quick_check) or is of a newer
// schema (ErrNewerSchema). A refused file's bytes are not changed: a file
// without the store's header marks is never handed to SQLite at all; for
// one with them (a damaged or newer store) SQLite may leave the -wal and
// -shm files that any reader of a WAL database makes beside it. Examining
// a store reads the whole database once. A new store is built under a
// temporary name in the same folder and moved into place, so a store is
// never seen half made.
func Open(path string) (*Store, error) { return open(path, true) }

// OpenExisting is Open without the creation: it fails with an error
// matching fs.ErrNotExist when there is no file at path.
func OpenExisting(path string) (*Store, error) { return open(path, false) }

func open(path string, create bool) (*Store, error) {
	abs, err := filepath.Abs(path)
	if err != nil {
		return nil, fmt.Errorf("open store %s: %w", path, err)
	}
	st, err := os.Stat(abs)
	switch {
	case errors.Is(err, fs.ErrNotExist) && create:
		if err := createStore(abs, false); err != nil {
			return nil, fmt.Errorf("create store %s: %w", path, err)
		}
	case err != nil:
		return nil, fmt.Errorf("open store %s: %w", path, err)
	case st.IsDir():
		return nil, fmt.Errorf("open store %s: %w (it is a folder)", path, ErrNotStore)
	case st.Size() == 0 && create:
		if err := createStore(abs, true); err != nil {
			return nil, fmt.Errorf("create store %s: %w", path, err)
		}
	}
	if err := check(abs); err != nil {
		return nil, fmt.Errorf("open store %s: %w", path, err)
	}
	db, err := sql.Open("sqlite", dsn(abs, "_txlock=immediate",
		"_pragma=busy_timeout("+strconv.Itoa(busyTimeoutMS)+")",
		"_pragma=foreign_keys(1)", "_pragma=journal_mode(WAL)"))
	if err != nil {
		return nil, fmt.Errorf("open store %s: %w", path, err)
	}
	if err := db.Ping(); err != nil {
		db.Close()
		return nil, fmt.Errorf("open store %s: %w", path, classify(err))
	}
	return &Store{db: db, path: path}, nil
}

// Close closes the store. The last connection to close checkpoints the
// write-ahead log into the database file and removes it.
func (s *Store) Close() error { return s.db.Close() }

// Path returns the file name the store was opened with.
func (s *Store) Path() string { return s.path }

// dsn makes the driver's data source name of the database file abs, with
// the query parameters params: an SQLite URI (https://sqlite.org/uri.html),
// in which "%", "?" and "#" of the path must be percent-encoded.
func dsn(abs string, params ...string) string {
	p := filepath.ToSlash(abs)
	p = strings.NewReplacer("%", "%25", "?", "%3f", "#", "%23").Replace(p)
	if !strings.HasPrefix(p, "/") {
		p = "/" + p // a Windows drive letter: file:///C:/...
	}
	return "file://" + p + "?" + strings.Join(params, "&")
}

// sqliteMagic begins every SQLite database file
// (https://sqlite.org/fileformat.html, "The Database Header").
var sqliteMagic = []byte("SQLite format 3\x00")

// check examines the existing file abs read-only: its header, then, with
// SQLite in read-only mode, quick_check and the meta table.
func check(abs string) error {
	f, err := os.Open(abs)
	if err != nil {
		return err
	}
	head := make([]byte, 100)
	n, err := io.ReadFull(f, head)
	f.Close()
	head = head[:n]
	if err != nil && !errors.Is(err, io.ErrUnexpectedEOF) && !errors.Is(err, io.EOF) {
		return err
	}
	if !bytes.HasPrefix(head, sqliteMagic) {
		return fmt.Errorf("%w: not a SQLite database", ErrNotStore)
	}
	if n < 100 {
		return fmt.Errorf("%w: the file ends inside the database header (%d bytes)", ErrDamaged, n)
	}
	// The application_id is the big-endian integer at offset 68 of the
	// header (https://sqlite.org/fileformat.html#application_id).
	if id := binary.BigEndian.Uint32(head[68:72]); id != applicationID {
		return fmt.Errorf("%w: a SQLite database of another application (application_id %#x)", ErrNotStore, id)
	}
	db, err := sql.Open("sqlite", dsn(abs, "mode=ro", "_pragma=busy_timeout("+strconv.Itoa(busyTimeoutMS)+")"))
	if err != nil {
		return err
	}
	defer db.Close()
	ctx := context.Background()
	conn, err := db.Conn(ctx)
	if err != nil {
		return classify(err)
	}
	defer conn.Close()
	rows, err := conn.QueryContext(ctx, "PRAGMA quick_check")
	if err != nil {
		return classify(err)
	}
	var problems []string
	for rows.Next() {
		var msg string
		if err := rows.Scan(&msg); err != nil {
			rows.Close()
			return classify(err)
		}
		problems = append(problems, msg)
	}
	if err := rows.Close(); err != nil {
		return classify(err)
	}
	if err := rows.Err(); err != nil {
		return classify(err)
	}
	if len(problems) != 1 || problems[0] != "ok" {
		if len(problems) > 3 {
			problems = append(problems[:3], "…")
		}
		return fmt.Errorf("%w: quick_check: %s", ErrDamaged, strings.Join(problems, "; "))
	}
	meta := map[string]string{}
	mrows, err := conn.QueryContext(ctx, "SELECT name, value FROM meta")
	if err != nil {
		return fmt.Errorf("%w: no meta table: %w", ErrDamaged, classify(err))
	}
	for mrows.Next() {
		var k, v string
		if err := mrows.Scan(&k, &v); err != nil {
			mrows.Close()
			return classify(err)
		}
		meta[k] = v
	}
	if err := mrows.Close(); err != nil {
		return classify(err)
	}
	if meta["kind"] != storeKind {
		return fmt.Errorf("%w: meta kind %q", ErrDamaged, meta["kind"])
	}
	v, err := strconv.Atoi(meta["schema"])
	switch {
	case err != nil || v < 1:
		return fmt.Errorf("%w: schema version %q", ErrDamaged, meta["schema"])
	case v > SchemaVersion:
		return fmt.Errorf("%w: version %d; this assay reads version %d: use a newer assay, or build a new store", ErrNewerSchema, v, SchemaVersion)
	}
	return nil
}

// schema creates the tables of a new store (see the package
// documentation).
const schema = `
CREATE TABLE meta(name TEXT PRIMARY KEY, value TEXT NOT NULL) WITHOUT ROWID;
CREATE TABLE files(
	id INTEGER PRIMARY KEY,
	walk_key BLOB NOT NULL UNIQUE,
	path TEXT NOT NULL,
	kind INTEGER NOT NULL,
	size INTEGER NOT NULL,
	mtime_ns INTEGER NOT NULL,
	mode INTEGER NOT NULL,
	sha256 BLOB
);
CREATE TABLE skips(
	file INTEGER NOT NULL REFERENCES files(id) ON DELETE CASCADE,
	pos INTEGER NOT NULL,
	path TEXT NOT NULL,
	reason TEXT NOT NULL,
	PRIMARY KEY(file, pos)
) WITHOUT ROWID;
CREATE TABLE words(id INTEGER PRIMARY KEY, word TEXT NOT NULL UNIQUE);
CREATE TABLE documents(
	id INTEGER PRIMARY KEY,
	file INTEGER NOT NULL REFERENCES files(id) ON DELETE CASCADE,
	pos INTEGER NOT NULL,
	doc_id TEXT,
	title TEXT NOT NULL,
	size INTEGER NOT NULL,
	sha256 BLOB,
	format TEXT NOT NULL,
	lang TEXT NOT NULL,
	repaired INTEGER NOT NULL,
	container TEXT,
	mail_from TEXT, mail_to TEXT, mail_cc TEXT, mail_date TEXT, message_id TEXT,
	terms BLOB NOT NULL,
	forms BLOB NOT NULL,
	sig BLOB,
	UNIQUE(file, pos)
);
CREATE TABLE texts(
	doc INTEGER PRIMARY KEY REFERENCES documents(id) ON DELETE CASCADE,
	text TEXT NOT NULL
);
`

// createStore writes a new, empty store to abs: built under a temporary
// name beside it, then linked into place (so that a store another
// process created meanwhile is not overwritten), or renamed over abs when
// replace is set (abs is an empty file).
func createStore(abs string, replace bool) (err error) {
	tmp, err := os.CreateTemp(filepath.Dir(abs), filepath.Base(abs)+".*.tmp")
	if err != nil {
		return err
	}
	tmpName := tmp.Name()
	tmp.Close()
	defer func() {
		if err != nil {
			os.Remove(tmpName)
		}
	}()
	if err := os.Chmod(tmpName, 0o644); err != nil {
		return err
	}
	db, err := sql.Open("sqlite", dsn(tmpName))
	if err != nil {
		return err
	}
	defer func() {
		if cerr := db.Close(); err == nil {
			err = cerr
		}
	}()
	ctx := context.Background()
	conn, err := db.Conn(ctx)
	if err != nil {
		return err
	}
	defer conn.Close()
	tx, err := conn.BeginTx(ctx, nil)
	if err != nil {
		return err
	}
	defer tx.Rollback()
	if _, err := tx.Exec(fmt.Sprintf("PRAGMA application_id = %d", applicationID)); err != nil {
		return err
	}
	if _, err := tx.Exec(schema); err != nil {
		return err
	}
	for k, v := range map[string]string{"schema": strconv.Itoa(SchemaVersion), "kind": storeKind, "keep_text": "0"} {
		if _, err := tx.Exec("INSERT INTO meta(name, value) VALUES(?, ?)", k, v); err != nil {
			return err
		}
	}
	if err := tx.Commit(); err != nil {
		return err
	}
	if _, err := conn.ExecContext(ctx, "PRAGMA journal_mode = WAL"); err != nil {
		return err
	}
	if err := conn.Close(); err != nil {
		return err
	}
	if err := db.Close(); err != nil {
		return err
	}
	if replace {
		return os.Rename(tmpName, abs)
	}
	if err := os.Link(tmpName, abs); err != nil {
		if errors.Is(err, fs.ErrExist) {
			os.Remove(tmpName)
			return nil // made meanwhile by another process: check it instead
		}
		// No hard links on this file system: rename, which would replace a
		// file made in the instant since the Stat.
		return os.Rename(tmpName, abs)
	}
	return os.Remove(tmpName)
}

// Info reports the store's options and the sizes of its tables, from one
// read transaction.
func (s *Store) Info(ctx context.Context) (Info, error) {
	in := Info{Path: s.path}
	tx, err := s.db.BeginTx(ctx, &sql.TxOptions{ReadOnly: true})
	if err != nil {
		return in, classify(err)
	}
	defer tx.Rollback()
	meta, err := readMeta(ctx, tx)
	if err != nil {
		return in, err
	}
	in.SchemaVersion, _ = strconv.Atoi(meta["schema"])
	in.Options = meta["options"]
	in.KeepText = meta["keep_text"] == "1"
	for _, c := range []struct {
		n     *int
		table string
	}{{&in.Files, "files"}, {&in.Documents, "documents"}, {&in.Skips, "skips"}, {&in.Words, "words"}} {
		if err := tx.QueryRowContext(ctx, "SELECT count(*) FROM "+c.table).Scan(c.n); err != nil {
			return in, classify(err)
		}
	}
	return in, tx.Commit()
}

// querier is what readMeta needs of a transaction.
type querier interface {
	QueryContext(ctx context.Context, query string, args ...any) (*sql.Rows, error)
}

// readMeta reads the meta table.
func readMeta(ctx context.Context, q querier) (map[string]string, error) {
	rows, err := q.QueryContext(ctx, "SELECT name, value FROM meta")
	if err != nil {
		return nil, classify(err)
	}
	defer rows.Close()
	meta := map[string]string{}
	for rows.Next() {
		var k, v string
		if err := rows.Scan(&k, &v); err != nil {
			return nil, classify(err)
		}
		meta[k] = v
	}
	return meta, classify(rows.Err())
}
