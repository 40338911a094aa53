package corpus

import (
	"encoding/binary"
	"io/fs"
	"path"
	"slices"
	"strings"
	"syscall"
)

// dirReader is the Linux fileReader: the root folder and the folder of
// the last file read, open as descriptors.
type dirReader struct {
	rootFD int    // the root, from root.Open(".")
	dir    string // the folder of dirFD, a path of the walk ("" before the first)
	dirFD  int    // -1 when none is open
}

func (r *rootFS) newFileReader() fileReader {
	f, err := r.root.Open(".")
	if err != nil {
		return nil
	}
	// A duplicate of the descriptor, so that the reader owns its own and
	// f can be closed now.
	fd, err := syscall.Dup(int(f.Fd()))
	f.Close()
	if err != nil {
		return nil
	}
	syscall.CloseOnExec(fd)
	return &dirReader{rootFD: fd, dirFD: -1}
}

func (r *dirReader) close() {
	r.closeDir()
	syscall.Close(r.rootFD)
}

func (r *dirReader) closeDir() {
	if r.dirFD >= 0 && r.dirFD != r.rootFD {
		syscall.Close(r.dirFD)
	}
	r.dir, r.dirFD = "", -1
}

// openFlags open a file or a folder for reading without following a
// symbolic link in its last part, and without blocking: O_NONBLOCK does
// nothing to a regular file, but keeps a named pipe that took a regular
// file's place since the walk from blocking the open.
const openFlags = syscall.O_RDONLY | syscall.O_NOFOLLOW | syscall.O_CLOEXEC | syscall.O_NONBLOCK

// openDir makes dir (a clean path of the walk, "." for the root) the
// reader's open folder, opening it a part at a time from the root so
// that no symbolic link is followed on the way.
func (r *dirReader) openDir(dir string) bool {
	if dir == r.dir && r.dirFD >= 0 {
		return true
	}
	r.closeDir()
	fd := r.rootFD
	if dir != "." {
		for part := range strings.SplitSeq(dir, "/") {
			next, err := openat(fd, part, openFlags|syscall.O_DIRECTORY)
			if fd != r.rootFD {
				syscall.Close(fd)
			}
			if err != nil {
				return false
			}
			fd = next
		}
	}
	r.dir, r.dirFD = dir, fd
	return true
}

func (r *dirReader) read(p string, limit int64) ([]byte, bool) {
	dir, name := path.Split(p)
	dir = strings.TrimSuffix(dir, "/")
	if dir == "" {
		dir = "."
	}
	if !fs.ValidPath(p) || p == "." || !r.openDir(dir) {
		return nil, false
	}
	fd, err := openat(r.dirFD, name, openFlags)
	if err != nil {
		return nil, false
	}
	defer syscall.Close(fd)
	var st syscall.Stat_t
	if err := fstat(fd, &st); err != nil || st.Mode&syscall.S_IFMT != syscall.S_IFREG || st.Size <= 0 || st.Size > limit {
		return nil, false
	}
	// One byte more than the size: a read of a regular file returns less
	// than asked only at its end, so a file that is as long as fstat
	// said is read, and known to end there, with one system call.
	buf := make([]byte, st.Size+1)
	got := 0
	for got < len(buf) {
		n, err := readFD(fd, buf[got:])
		if err != nil {
			return nil, false
		}
		if n == 0 {
			break
		}
		got += n
		if got == int(st.Size) {
			break // asked for one more byte than that: the end of the file
		}
	}
	if got != int(st.Size) {
		return nil, false // shorter or longer than its size said
	}
	return buf[:got:got], true
}

// openat, fstat and readFD are the system calls, retried when a signal
// interrupts them.
func openat(dirfd int, name string, flags int) (int, error) {
	for {
		fd, err := syscall.Openat(dirfd, name, flags, 0)
		if err != syscall.EINTR {
			return fd, err
		}
	}
}

func fstat(fd int, st *syscall.Stat_t) error {
	for {
		if err := syscall.Fstat(fd, st); err != syscall.EINTR {
			return err
		}
	}
}

func readFD(fd int, b []byte) (int, error) {
	for {
		n, err := syscall.Read(fd, b)
		if err != syscall.EINTR {
			return n, err
		}
	}
}

// readDirFast lists the folder name (a path of the walk) from its
// entries' records (getdents64), with the type each record holds. ok is
// false when anything fails, or when a record's type is unknown (a file
// system that does not keep types): the caller then takes root.FS's
// path.
func (r *rootFS) readDirFast(name string) ([]fs.DirEntry, bool) {
	if !fs.ValidPath(name) {
		return nil, false
	}
	rd, ok := r.newFileReader().(*dirReader)
	if !ok {
		return nil, false
	}
	defer rd.close()
	if !rd.openDir(name) {
		return nil, false
	}
	var entries []fs.DirEntry
	buf := make([]byte, 32<<10)
	for {
		n, err := getdents(rd.dirFD, buf)
		if err != nil || n < 0 {
			return nil, false
		}
		if n == 0 {
			break
		}
		for rec := buf[:n]; len(rec) > 0; {
			// struct linux_dirent64: ino u64, off s64, reclen u16, type u8, name (NUL-ended)
			if len(rec) < 19 {
				return nil, false
			}
			reclen := int(binary.NativeEndian.Uint16(rec[16:18]))
			if reclen < 19 || reclen > len(rec) {
				return nil, false
			}
			dtype, nameBytes := rec[18], rec[19:reclen]
			if i := slices.Index(nameBytes, 0); i >= 0 {
				nameBytes = nameBytes[:i]
			}
			rec = rec[reclen:]
			entry := string(nameBytes)
			if entry == "." || entry == ".." {
				continue
			}
			typ, ok := direntType(dtype)
			if !ok {
				return nil, false // a file system that does not say: root.FS looks each entry up
			}
			p := entry
			if name != "." {
				p = name + "/" + entry
			}
			entries = append(entries, &rootEntry{root: r.root, path: p, name: entry, typ: typ})
		}
	}
	slices.SortFunc(entries, func(a, b fs.DirEntry) int { return strings.Compare(a.Name(), b.Name()) })
	return entries, true
}

// direntType is the file type of a record's d_type; ok is false for
// DT_UNKNOWN (or anything else).
func direntType(t byte) (fs.FileMode, bool) {
	switch t {
	case syscall.DT_REG:
		return 0, true
	case syscall.DT_DIR:
		return fs.ModeDir, true
	case syscall.DT_LNK:
		return fs.ModeSymlink, true
	case syscall.DT_FIFO:
		return fs.ModeNamedPipe, true
	case syscall.DT_SOCK:
		return fs.ModeSocket, true
	case syscall.DT_CHR:
		return fs.ModeDevice | fs.ModeCharDevice, true
	case syscall.DT_BLK:
		return fs.ModeDevice, true
	}
	return 0, false
}

func getdents(fd int, buf []byte) (int, error) {
	for {
		n, err := syscall.Getdents(fd, buf)
		if err != syscall.EINTR {
			return n, err
		}
	}
}
