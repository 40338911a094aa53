package corpus

import (
	"bytes"
	"crypto/sha256"
	"errors"
	"slices"
	"strconv"
)

// Mailbox reading (.mbox files, RFC 4155).
//
// A mailbox is split into messages at "From " lines: a line starting with
// the five bytes "From " at the start of the file (blank lines before it
// are allowed) or right after an empty line. The "From " line itself is
// not part of the message, nor is the empty line before the next one (RFC
// 4155 ends each message with an empty line). A file whose first line
// with text is not a "From " line is not a mailbox and is skipped.
//
// In each message a line matching ^>+From (one or more ">" then "From ")
// loses one ">": the mboxrd way of undoing the escape of "From " lines.
// An mboxo file, which escapes "From " but not ">From ", reads the same,
// except that a line that had ">From " in the original message loses its
// ">".
//
// Message N (counted from 1) is read by the mail reader (mail.go) as the
// document "box.mbox#N", Format "mbox", Container the mailbox's path, and
// Size and Hash of the message's own bytes after the unescaping. Its
// attachments become "box.mbox#N#name". A message that cannot be read is
// a Skip with Path "box.mbox#N" and the reason; the others are still read.
// The caps of the mail reader apply to each message, except the size
// budget, which is shared by the whole mailbox.

// readMbox reads one mailbox file.
func readMbox(p string, raw []byte, opts *Options) ([]Document, []Skip, error) {
	f := newMailFile(p, opts)
	if err := f.mbox(p, raw, 0); err != nil {
		return nil, f.skips, err
	}
	return f.docs, f.skips, nil
}

// errNotMbox is the reason a file is not read as a mailbox.
var errNotMbox = errors.New(`not a mailbox (the first line with text is not a "From " line)`)

// mbox reads the mailbox raw with ID id at MIME depth depth, adding its
// documents and skips to f.
func (f *mailFile) mbox(id string, raw []byte, depth int) error {
	msgs, ok := splitMbox(raw)
	if !ok {
		if depth > 0 {
			f.skips = append(f.skips, Skip{Path: id, Reason: errNotMbox.Error()})
			return nil
		}
		return errNotMbox
	}
	for i, msg := range msgs {
		mid := partID(id, strconv.Itoa(i+1))
		msg = unescapeFrom(msg)
		f.parts = 0
		at := len(f.docs)
		doc, err := f.message(mid, msg, depth)
		if err != nil {
			f.skips = append(f.skips, Skip{Path: mid, Reason: err.Error()})
			continue
		}
		doc.Format, doc.Container = "mbox", f.top
		doc.Size, doc.Hash = int64(len(msg)), sha256.Sum256(msg)
		f.docs = slices.Insert(f.docs, at, doc)
	}
	return nil
}

// splitMbox cuts a mailbox into its messages (the rule at the top of this
// file); ok is false when it does not start with a "From " line.
func splitMbox(raw []byte) (msgs [][]byte, ok bool) {
	var starts []int // offsets of "From " lines
	prevBlank := true
	seenText := false
	for off := 0; off < len(raw); {
		end := len(raw)
		if i := bytes.IndexByte(raw[off:], '\n'); i >= 0 {
			end = off + i + 1
		}
		line := raw[off:end]
		blank := len(bytes.TrimRight(line, "\r\n")) == 0
		switch {
		case prevBlank && bytes.HasPrefix(line, []byte("From ")):
			starts = append(starts, off)
			seenText = true
		case !blank && !seenText:
			return nil, false
		}
		prevBlank = blank
		off = end
	}
	if len(starts) == 0 {
		return nil, false
	}
	for k, s := range starts {
		end := len(raw)
		if k+1 < len(starts) {
			end = starts[k+1]
		}
		msg := raw[s:end]
		if i := bytes.IndexByte(msg, '\n'); i >= 0 {
			msg = msg[i+1:] // the "From " line
		} else {
			msg = nil
		}
		// The empty line that ends the message.
		switch {
		case bytes.HasSuffix(msg, []byte("\r\n\r\n")):
			msg = msg[:len(msg)-2]
		case bytes.HasSuffix(msg, []byte("\n\n")):
			msg = msg[:len(msg)-1]
		}
		msgs = append(msgs, msg)
	}
	return msgs, true
}

// unescapeFrom removes one ">" from each line matching ^>+From (mboxrd).
func unescapeFrom(msg []byte) []byte {
	if !bytes.Contains(msg, []byte(">From ")) {
		return msg
	}
	out := make([]byte, 0, len(msg))
	for off := 0; off < len(msg); {
		end := len(msg)
		if i := bytes.IndexByte(msg[off:], '\n'); i >= 0 {
			end = off + i + 1
		}
		line := msg[off:end]
		if rest := bytes.TrimLeft(line, ">"); len(rest) < len(line) && bytes.HasPrefix(rest, []byte("From ")) {
			line = line[1:]
		}
		out = append(out, line...)
		off = end
	}
	return out
}
