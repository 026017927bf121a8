//go:build linux

package main

// treescan_linux.go: the walk of scanTree, through open folder handles
// and the raw folder entries (getdents64) Linux gives.

import (
	"strings"
	"syscall"
	"unsafe"

	"nodal/check"
	"nodal/input"
)

// walkRoot walks the folder root.
func (s *treeScan) walkRoot(root string) error {
	fd, err := syscall.Open(root, syscall.O_RDONLY|syscall.O_DIRECTORY|syscall.O_CLOEXEC, 0)
	if err != nil {
		return err
	}
	s.buf = make([]byte, 64<<10)
	return s.walk(fd, strings.TrimSuffix(root, "/"))
}

// walk lists the folder open as fd, whose path is dir ("" for /), and
// closes fd.
func (s *treeScan) walk(fd int, dir string) error {
	defer syscall.Close(fd)
	type entry struct {
		name string
		typ  byte
	}
	var ents []entry
	for {
		n, err := syscall.Getdents(fd, s.buf)
		if err == syscall.EINTR {
			continue
		}
		if err != nil {
			return err
		}
		if n <= 0 {
			break
		}
		// struct linux_dirent64: inode (8 bytes), offset (8), record
		// length (2), type (1), then the NUL-terminated name.
		for off := 0; off < n; {
			if off+19 > n {
				return errTreeUnusual
			}
			reclen := int(*(*uint16)(unsafe.Pointer(&s.buf[off+16])))
			if reclen < 19 || off+reclen > n {
				return errTreeUnusual
			}
			rec := s.buf[off+19 : off+reclen]
			end := 0
			for end < len(rec) && rec[end] != 0 {
				end++
			}
			if name := string(rec[:end]); name != "." && name != ".." && name != ".git" {
				ents = append(ents, entry{name, s.buf[off+18]})
			}
			off += reclen
		}
	}
	s.entries += len(ents)
	if s.entries > maxScanEntries {
		return errTreeUnusual
	}
	for _, e := range ents {
		p := dir + "/" + e.name
		nodal := strings.HasSuffix(e.name, ".nodal")
		typ := e.typ
		if typ == syscall.DT_UNKNOWN {
			// Some file systems do not give the type: ask for it, without
			// following a link (what is then opened is opened with
			// O_NOFOLLOW all the same).
			var st syscall.Stat_t
			if err := syscall.Lstat(p, &st); err != nil {
				return err
			}
			typ = dtOf(st.Mode)
		}
		switch {
		case typ == syscall.DT_DIR:
			if nodal {
				return errTreeUnusual // git may list such a folder as a path
			}
			sub, err := syscall.Openat(fd, e.name, syscall.O_RDONLY|syscall.O_DIRECTORY|syscall.O_NOFOLLOW|syscall.O_CLOEXEC, 0)
			if err != nil {
				return err
			}
			if err := s.walk(sub, p); err != nil {
				return err
			}
		case nodal:
			s.files = append(s.files, p)
			if typ == syscall.DT_REG {
				if src, ok := readAt(fd, e.name); ok {
					s.includes[p] = check.Includes(p, src)
				}
			}
		}
	}
	return nil
}

// dtOf is the folder-entry type of a file mode.
func dtOf(mode uint32) byte {
	switch mode & syscall.S_IFMT {
	case syscall.S_IFDIR:
		return syscall.DT_DIR
	case syscall.S_IFREG:
		return syscall.DT_REG
	case syscall.S_IFLNK:
		return syscall.DT_LNK
	}
	return syscall.DT_UNKNOWN + 1 // something else: neither read nor walked
}

// readAt reads the regular file name in the folder open as dir, without
// following a link, waiting on a pipe or passing the default size cap.
// ok is false when it is not such a file (or cannot be read): the caller
// reads it its own way.
func readAt(dir int, name string) ([]byte, bool) {
	fd, err := syscall.Openat(dir, name, syscall.O_RDONLY|syscall.O_NOFOLLOW|syscall.O_NONBLOCK|syscall.O_CLOEXEC, 0)
	if err != nil {
		return nil, false
	}
	defer syscall.Close(fd)
	var st syscall.Stat_t
	if syscall.Fstat(fd, &st) != nil || st.Mode&syscall.S_IFMT != syscall.S_IFREG || st.Size > input.DefaultMaxSize {
		return nil, false
	}
	// One byte more than the size, to see the end in one read.
	b := make([]byte, 0, st.Size+1)
	for {
		if len(b) == cap(b) {
			b = append(b, 0)[:len(b)]
		}
		n, err := syscall.Read(fd, b[len(b):cap(b)])
		if err == syscall.EINTR {
			continue
		}
		if err != nil || n < 0 {
			return nil, false
		}
		if n == 0 {
			return b, true
		}
		b = b[:len(b)+n]
		if int64(len(b)) > input.DefaultMaxSize {
			return nil, false
		}
	}
}
