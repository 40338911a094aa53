// Package corpus reads documents from a folder.
//
// # Overview
//
// [Walk] visits every file of an [io/fs.FS] in lexical order, reads the ones
// it understands and hands each to a callback as a [Document], one at a time,
// so the whole corpus is never held in memory. Anything it cannot use is
// recorded as a [Skip] with the path and a reason, and the walk goes on.
//
// # What is read
//
// The format is chosen by the extension (any letter case) and confirmed
// by the content; each reader's file comment gives its rules and limits:
//
//   - plain text .txt, .text, .md, .rst, decoded as UTF-8: invalid UTF-8
//     byte sequences are replaced by U+FFFD and counted in
//     [Document.Repaired]; a file where more than a tenth of the bytes are
//     invalid is not taken for UTF-8 text and is skipped;
//   - e-mail .eml (RFC 5322 and MIME; mail.go): bodies decoded to UTF-8,
//     the text part preferred, quoted replies and signatures dropped unless
//     [Options.KeepQuoted], attachments of readable types read as documents
//     of their own unless [Options.NoAttachments];
//   - mailboxes .mbox (RFC 4155; mbox.go): each message a document;
//   - HTML .html, .htm, .xhtml (html.go): scripts, styles and navigation
//     dropped by a documented rule, the title from <title> or a heading;
//   - PDF (pdf.go and the sub-package corpus/pdf): the text layer in
//     content-stream order; encrypted and image-only PDFs are skipped;
//   - DOCX (Office Open XML; docx.go): paragraphs and tables, the title
//     from the core properties; bounded against zip bombs;
//   - CSV, TSV and JSON Lines (records.go): one record a document, the
//     text, ID and title fields chosen by documented defaults or by
//     [Options.TextField], [Options.IDField], [Options.TitleField]; a
//     malformed record is skipped as "file:line" and the rest read.
//
// No reader takes more than [Options.MaxBytes] from one file, counting
// what it decompresses or decodes, and every reader runs under a recover:
// a panic in a parser skips the file with the panic's message as reason.
//
// # What is skipped, and why
//
//   - hidden files and folders (name starting with "."): silently, like
//     version-control folders are skipped by most tools; they are not listed;
//   - files of another type: "unsupported file type";
//   - files whose content does not match their extension, corrupt,
//     truncated or encrypted files, with the reader's reason;
//   - files larger than [Options.MaxBytes]: "larger than the size limit";
//   - empty files and files of white space only;
//   - binary files: a NUL byte or more than 10% control characters in the
//     first 8 KiB;
//   - files that cannot be opened or read, with the system's reason;
//   - symbolic links to folders (never followed, so a link loop cannot
//     trap the walk), and special files such as pipes and devices (never
//     opened, so a pipe cannot block it).
//
// # Document identity
//
// A document's ID is its slash-separated path relative to the root. Its
// title is the rest of a "Subject:" line among its first ten lines with
// text (memos and saved messages carry one), else its first line with text
// on it (Markdown heading marks removed), cut to [MaxTitleRunes] at a word
// boundary; the file name when there is none. A leading byte order mark is
// dropped from the text. Its hash is the SHA-256 of its raw bytes.
package corpus
