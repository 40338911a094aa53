// Package store keeps the analysed documents of a corpus in one file, so
// that the documents can be picked from many times without reading the
// folder again, and so that indexing the folder again reads only what
// changed.
//
// A store is a SQLite database (through the pure-Go driver
// modernc.org/sqlite) in write-ahead-log mode. [Store.Update] walks a
// folder as [corpus.Walk] does, reads and analyses the new and changed
// files only, forgets the deleted ones, and commits everything as one
// transaction: a crash or a kill leaves the store as it was before.
// [Store.Load] hands back every document in walk order, with its terms,
// inside one read transaction, so it sees one consistent state even while
// another process updates the store.
//
// # Schema, version 1
//
// The database's application_id is 0x61737931 ("asy1" in ASCII); [Open]
// refuses any SQLite database without it. Tables:
//
//	meta(name TEXT PRIMARY KEY, value TEXT NOT NULL)   -- WITHOUT ROWID
//	    schema      the schema version, "1" (see SchemaVersion)
//	    kind        "assay corpus store"
//	    options     the options key of the last update: a canonical string
//	                of every reading and analysis option, given by the
//	                caller (absent until the first update)
//	    keep_text   "1" when document texts are kept, else "0"
//	    indexed_at  wall-clock time (Unix nanoseconds) at which the walk
//	                of the last update began
//
//	files(id INTEGER PRIMARY KEY,
//	      walk_key BLOB NOT NULL UNIQUE,  -- the path with each "/" as a 0x00
//	                                      -- byte: bytewise order is walk order
//	      path TEXT NOT NULL,             -- slash path relative to the root
//	      kind INTEGER NOT NULL,          -- 0 a file, 1 an entry the walk
//	                                      -- could not read (its skip only)
//	      size INTEGER NOT NULL,          -- bytes, as stat gave it; -1 unknown
//	      mtime_ns INTEGER NOT NULL,      -- modification time, Unix ns
//	      mode INTEGER NOT NULL,          -- io/fs.FileMode bits
//	      sha256 BLOB)                    -- of the whole content; NULL when
//	                                      -- the content was not read
//
//	skips(file INTEGER NOT NULL REFERENCES files(id) ON DELETE CASCADE,
//	      pos INTEGER NOT NULL,           -- order within the file
//	      path TEXT NOT NULL, reason TEXT NOT NULL,
//	      PRIMARY KEY(file, pos))         -- WITHOUT ROWID
//
//	words(id INTEGER PRIMARY KEY, word TEXT NOT NULL UNIQUE)
//	      -- index terms and surface forms share one table of strings
//
//	documents(id INTEGER PRIMARY KEY,
//	      file INTEGER NOT NULL REFERENCES files(id) ON DELETE CASCADE,
//	      pos INTEGER NOT NULL,           -- order within the file
//	      doc_id TEXT,                    -- NULL: the file's path
//	      title TEXT NOT NULL, size INTEGER NOT NULL,
//	      sha256 BLOB,                    -- NULL: the file's sha256
//	      format TEXT NOT NULL, lang TEXT NOT NULL,
//	      repaired INTEGER NOT NULL,
//	      container TEXT,                 -- NULL: ""
//	      mail_from, mail_to, mail_cc, mail_date, message_id TEXT,  -- NULL: ""
//	      terms BLOB NOT NULL, forms BLOB NOT NULL,
//	      sig BLOB,                       -- NULL: no signature
//	      UNIQUE(file, pos))
//
//	texts(doc INTEGER PRIMARY KEY REFERENCES documents(id) ON DELETE CASCADE,
//	      text TEXT NOT NULL)             -- only when keep_text is "1"
//
// A document's terms BLOB lists its (term, count) pairs in increasing
// order of the term's word id, each as two unsigned varints
// (encoding/binary): the id minus the previous pair's id (the first pair's
// minus 0), then the count. The forms BLOB lists its (term, surface form,
// count) triples in increasing order of (term id, form id), each as the
// term id minus the previous triple's term id (unsigned varint), the form
// id minus the term id (signed varint: 0 when the form is the term's own
// string) and the count (unsigned varint). The sig BLOB holds the
// caller's signature of the document (Analysis.Sig), each 32-bit value as
// 4 bytes, little-endian. Document frequencies are not stored; a reader
// derives them while loading.
//
// Word ids are never reused; a word no document refers to any more stays
// in the words table until the store is rebuilt.
//
// # Change detection
//
// A file is kept without being read when its size, mode and modification
// time equal the stored ones. When only the modification time differs,
// the file is read and hashed, and if its SHA-256 is the stored one only
// the time is updated. Because a file system's clock can be coarse, a file
// whose modification time is later than [RacyWindow] before the start of
// the previous update is hashed again even when nothing seems to have
// changed (rewritten with the same size within the same clock tick, it
// would otherwise look unchanged). A file system that gives no
// modification times (zero times) has every file hashed on every update.
// Reading goes through corpus.WalkParallel over a view of the folder that
// shows one file, so a stored file gives the documents, IDs and skips of a
// walk of the whole folder.
package store
