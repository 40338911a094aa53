//go:build !linux

package corpus

import "io/fs"

func (r *rootFS) newFileReader() fileReader { return nil }

func (r *rootFS) readDirFast(string) ([]fs.DirEntry, bool) { return nil, false }
