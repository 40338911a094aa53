package store

import (
	"context"
	"database/sql"
	"errors"
	"fmt"

	"assay/corpus"
)

// Doc is one stored document: what the corpus reader gave (Text is empty
// unless the store keeps texts) and what the analyzer found in it.
type Doc struct {
	corpus.Document
	Analysis
	// File is the slash path of the file the document was read from.
	File string
}

// Snapshot is what [Store.Load] gives besides the documents, all from the
// same state of the store.
type Snapshot struct {
	// Skips lists every file or part of one not read as a document, with
	// the reason, in walk order.
	Skips []corpus.Skip
	// Fingerprint is corpus.Fingerprint over the documents, in walk order:
	// what a walk of the folder would give.
	Fingerprint string
	// Documents is the number of documents handed to fn.
	Documents int
	// Options is the options key of the last update ("" for a store never
	// updated); KeepText whether texts are kept.
	Options  string
	KeepText bool
}

// Load calls fn with every document of the store in walk order (the order
// a walk of the folder gives: the files in lexical walk order, then the
// documents in their order within the file) and returns the skips and the
// fingerprint. It reads in one read transaction, so it sees one state of
// the store even while an update runs (the update's changes are not seen
// until it commits). An error from fn stops the load and is returned;
// corpus.ErrStop stops it quietly. A document's Terms and Forms maps are
// its own: fn may keep them.
func (s *Store) Load(ctx context.Context, fn func(Doc) error) (*Snapshot, error) {
	return s.load(ctx, fn, nil)
}

// Counted is a document's analysis as numbers: the ids of its words in
// the store's word list, which Words holds (Words[id]; ids start at 1).
// It is what [Store.LoadCounted] hands over, so that a caller that counts
// terms by number builds no string map a document.
type Counted struct {
	// Terms are the document's terms with their counts, in increasing
	// word id order.
	Terms []WordCount
	// Forms are its (term, surface form) pairs with their counts.
	Forms []FormCount
	// Words is the store's word list, the same for every document of a
	// load; read-only.
	Words []string
}

// WordCount is a word id and a count.
type WordCount struct {
	Word int32
	N    int
}

// FormCount is the word ids of a term and of one of its surface forms,
// and how often the form was seen.
type FormCount struct {
	Term, Form int32
	N          int
}

// LoadCounted is [Store.Load] with each document's analysis given as
// numbers (the Doc's Terms and Forms are nil). The Counted and its slices
// are reused from one document to the next: fn must not keep them.
func (s *Store) LoadCounted(ctx context.Context, fn func(Doc, *Counted) error) (*Snapshot, error) {
	return s.load(ctx, nil, fn)
}

// load runs Load (fn) or LoadCounted (counted).
func (s *Store) load(ctx context.Context, fn func(Doc) error, counted func(Doc, *Counted) error) (*Snapshot, error) {
	tx, err := s.db.BeginTx(ctx, &sql.TxOptions{ReadOnly: true}) // BEGIN (deferred)
	if err != nil {
		return nil, fmt.Errorf("load %s: %w", s.path, classify(err))
	}
	defer tx.Rollback()
	snap, err := load(ctx, tx, fn, counted)
	if err != nil {
		return nil, fmt.Errorf("load %s: %w", s.path, err)
	}
	if err := tx.Commit(); err != nil {
		return nil, fmt.Errorf("load %s: %w", s.path, classify(err))
	}
	return snap, nil
}

func load(ctx context.Context, tx *sql.Tx, fn func(Doc) error, counted func(Doc, *Counted) error) (*Snapshot, error) {
	// The first read starts the transaction's snapshot; every later read
	// of this function sees the same state.
	meta, err := readMeta(ctx, tx)
	if err != nil {
		return nil, err
	}
	snap := &Snapshot{Options: meta["options"], KeepText: meta["keep_text"] == "1"}
	words, err := readWords(ctx, tx)
	if err != nil {
		return nil, err
	}
	if snap.Skips, err = readSkips(ctx, tx); err != nil {
		return nil, err
	}
	query := `SELECT f.path, f.sha256, d.doc_id, d.title, d.size, d.sha256, d.format, d.lang, d.repaired, d.container,
		d.mail_from, d.mail_to, d.mail_cc, d.mail_date, d.message_id, d.terms, d.forms, d.sig, NULL
		FROM files f JOIN documents d ON d.file = f.id ORDER BY f.walk_key, d.pos`
	if snap.KeepText {
		query = `SELECT f.path, f.sha256, d.doc_id, d.title, d.size, d.sha256, d.format, d.lang, d.repaired, d.container,
		d.mail_from, d.mail_to, d.mail_cc, d.mail_date, d.message_id, d.terms, d.forms, d.sig, t.text
		FROM files f JOIN documents d ON d.file = f.id LEFT JOIN texts t ON t.doc = d.id ORDER BY f.walk_key, d.pos`
	}
	rows, err := tx.QueryContext(ctx, query)
	if err != nil {
		return nil, classify(err)
	}
	defer rows.Close()
	var fp corpus.Fingerprint
	c := &Counted{Words: words.words}
	for rows.Next() {
		var (
			d                                    Doc
			fileHash, docHash, terms, forms, sig sql.RawBytes
			docID, container, text               sql.NullString
			from, to, cc, date, messageID        sql.NullString
		)
		if err := rows.Scan(&d.File, &fileHash, &docID, &d.Title, &d.Size, &docHash, &d.Format, &d.Lang, &d.Repaired, &container,
			&from, &to, &cc, &date, &messageID, &terms, &forms, &sig, &text); err != nil {
			return nil, classify(err)
		}
		d.ID = d.File
		if docID.Valid {
			d.ID = docID.String
		}
		h := docHash
		if h == nil {
			h = fileHash
		}
		if len(h) != len(d.Hash) {
			return nil, fmt.Errorf("%w: document %s has a hash of %d bytes", ErrDamaged, d.ID, len(h))
		}
		copy(d.Hash[:], h)
		d.Container, d.Text = container.String, text.String
		d.Meta = corpus.Meta{From: from.String, To: to.String, Cc: cc.String, Date: date.String, MessageID: messageID.String}
		if counted != nil {
			c.Terms, c.Forms = c.Terms[:0], c.Forms[:0]
			if err := decodeTermIDs(terms, words.valid, func(id int64, n int) { c.Terms = append(c.Terms, WordCount{int32(id), n}) }); err != nil {
				return nil, fmt.Errorf("%w: document %s: %w", ErrDamaged, d.ID, err)
			}
			if err := decodeFormIDs(forms, words.valid, func(t, f int64, n int) { c.Forms = append(c.Forms, FormCount{int32(t), int32(f), n}) }); err != nil {
				return nil, fmt.Errorf("%w: document %s: %w", ErrDamaged, d.ID, err)
			}
		} else {
			d.Terms = make(map[string]int, len(terms)/2)
			if err := decodeTerms(terms, words.get, func(t string, n int) { d.Terms[t] = n }); err != nil {
				return nil, fmt.Errorf("%w: document %s: %w", ErrDamaged, d.ID, err)
			}
			d.Forms = make(map[[2]string]int, len(forms)/3)
			if err := decodeForms(forms, words.get, func(t, f string, n int) { d.Forms[[2]string{t, f}] = n }); err != nil {
				return nil, fmt.Errorf("%w: document %s: %w", ErrDamaged, d.ID, err)
			}
		}
		if d.Sig, err = decodeSig(sig); err != nil {
			return nil, fmt.Errorf("%w: document %s: %w", ErrDamaged, d.ID, err)
		}
		fp.Add(&d.Document)
		snap.Documents++
		var err error
		if counted != nil {
			err = counted(d, c)
		} else {
			err = fn(d)
		}
		if err != nil {
			if errors.Is(err, corpus.ErrStop) {
				break
			}
			return nil, err
		}
	}
	if err := rows.Err(); err != nil {
		return nil, classify(err)
	}
	snap.Fingerprint = fp.String()
	return snap, nil
}

// readWords reads the words table.
func readWords(ctx context.Context, tx *sql.Tx) (*wordTable, error) {
	var n int64
	if err := tx.QueryRowContext(ctx, "SELECT count(*) FROM words").Scan(&n); err != nil {
		return nil, classify(err)
	}
	w := &wordTable{words: make([]string, 0, n+1), used: make([]bool, 0, n+1)}
	rows, err := tx.QueryContext(ctx, "SELECT id, word FROM words ORDER BY id")
	if err != nil {
		return nil, classify(err)
	}
	defer rows.Close()
	for rows.Next() {
		var id int64
		var s string
		if err := rows.Scan(&id, &s); err != nil {
			return nil, classify(err)
		}
		w.set(id, s)
	}
	return w, classify(rows.Err())
}
