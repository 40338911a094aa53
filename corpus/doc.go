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
// Plain text with the extensions .txt, .text, .md and .rst (any letter
// case), decoded as UTF-8. Invalid UTF-8 byte sequences are replaced by
// U+FFFD and counted in [Document.Repaired]; a file where more than a tenth
// of the bytes are invalid is not taken for UTF-8 text and is skipped.
//
// # What is skipped, and why
//
//   - hidden files and folders (name starting with "."): silently, like
//     version-control folders are skipped by most tools; they are not listed;
//   - files of another type: "unsupported file type";
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
