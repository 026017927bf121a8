package main

// treescan.go: every .nodal entry of a work tree and the includes of
// each, read by walking the folders through open folder handles. The walk
// never follows a link: a folder is opened relative to its parent with
// O_NOFOLLOW, a file the same way and only when it is a regular file, so
// nothing outside the tree is read however the tree is laid out or
// changed during the walk. Entries that are links or not regular files
// are listed for the caller to read its own confined way.

import (
	"errors"
	"os"
	"strings"
	"syscall"

	"nodal/check"
	"nodal/input"
)

// errTreeUnusual stops a scan whose answer could differ from git's
// listing, or that is too large to be worth it: the caller asks git.
var errTreeUnusual = errors.New("work tree: a layout left to git")

// maxScanEntries bounds the folder entries a scan looks at. A tree past it
// (a large ignored build folder, say, which git would not enter) is left to
// git's listing.
const maxScanEntries = 50_000

// treeScan is what a walk of a work tree found.
type treeScan struct {
	// files lists every entry below the root whose name ends in .nodal and
	// that is not a folder, as root + "/" + its path, in walk order.
	files []string
	// includes holds, for each regular file that was read, what it
	// includes (check.Includes); a file absent here was not read.
	includes map[string][]string
	entries  int
}

// scanTree walks root, which must be a clean absolute path to a folder,
// skipping only entries named .git, and reads every regular .nodal file
// of at most input.DefaultMaxSize bytes (a larger one includes nothing,
// as the confined reader refuses it).
func scanTree(root string) (*treeScan, error) {
	fd, err := syscall.Open(root, syscall.O_RDONLY|syscall.O_DIRECTORY|syscall.O_CLOEXEC, 0)
	if err != nil {
		return nil, err
	}
	s := &treeScan{includes: map[string][]string{}}
	if err := s.walk(fd, root); err != nil {
		return nil, err
	}
	return s, nil
}

// walk lists the folder open as fd, whose path is dir, and closes fd.
func (s *treeScan) walk(fd int, dir string) error {
	f := os.NewFile(uintptr(fd), dir)
	ents, err := f.ReadDir(-1)
	defer f.Close()
	if err != nil {
		return err
	}
	s.entries += len(ents)
	if s.entries > maxScanEntries {
		return errTreeUnusual
	}
	for _, e := range ents {
		name := e.Name()
		if name == ".git" {
			continue
		}
		p := dir + "/" + name
		nodal := strings.HasSuffix(name, ".nodal")
		switch t := e.Type(); {
		case t.IsDir():
			if nodal {
				return errTreeUnusual // git may list such a folder as a path
			}
			sub, err := syscall.Openat(fd, name, syscall.O_RDONLY|syscall.O_DIRECTORY|syscall.O_NOFOLLOW|syscall.O_CLOEXEC, 0)
			if err != nil {
				return err
			}
			if err := s.walk(sub, p); err != nil {
				return err
			}
		case nodal:
			s.files = append(s.files, p)
			if t.IsRegular() {
				if src, ok := readAt(fd, name); ok {
					s.includes[p] = check.Includes(p, src)
				}
			}
		}
	}
	return nil
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
