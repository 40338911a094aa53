// Package demo embeds the demo corpus: invented documents of the fictional
// Quillmere Basin Authority, a regional public body for the valley of the
// (equally fictional) River Quill, across ten topics with a few
// near-duplicates, two exact duplicates, a few one-off outliers and a
// folder of letters and notices in six other languages. Every name, place
// and event in it is made up.
package demo

import (
	"embed"
	"io/fs"
)

//go:embed docs
var docs embed.FS

// FS returns the demo corpus as a file system rooted at its top folder.
func FS() fs.FS {
	sub, err := fs.Sub(docs, "docs")
	if err != nil {
		panic("demo: " + err.Error()) // the embedded folder is always there
	}
	return sub
}
