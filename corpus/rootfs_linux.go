package corpus

import (
	"io/fs"
	"path"
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
	raw := make([]byte, st.Size)
	for got := 0; got < len(raw); {
		n, err := readFD(fd, raw[got:])
		if err != nil || n == 0 {
			return nil, false // shorter than its size said
		}
		got += n
	}
	var probe [1]byte
	if n, err := readFD(fd, probe[:]); n != 0 || err != nil {
		return nil, false // longer than its size said
	}
	return raw, true
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
