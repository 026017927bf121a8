// Package input reads the files of a check, and nothing else. Files in a
// pull request are untrusted: a design may name any path in an include,
// and a .nodal file or a folder may be a symbolic link to anywhere. Every
// read nodal makes of a design goes through a Reader.
//
// # Roots
//
// A Reader reads only below its roots: by default the top level of the
// repository that holds the checked file (the nearest folder above it with
// a .git entry), or the checked file's own folder outside a repository.
// Paths are resolved one component at a time, symbolic links included,
// before anything is opened, so a path that leaves the roots by "..", by an
// absolute name or through a link is refused with ErrOutside whether or
// not its target exists: the answer says nothing about the world outside.
//
// # Regular files only
//
// Devices, pipes, sockets and folders are refused with ErrNotRegular
// before they are opened for reading (a pipe is opened without waiting
// for a writer, and checked again once open), so /dev/zero or a FIFO
// cannot make a check hang or fill memory.
//
// # Size
//
// Every read is capped (DefaultMaxSize unless set). A file past the cap is
// refused with a *TooLargeError before its content is read. A file is read
// into one buffer of the size it states; one that grows past the cap while
// it is read is refused with a *TooLargeError, and one that otherwise grows,
// shrinks or changes under the read with ErrChanged. ReadAll applies the
// same cap to a stream such as standard input.
//
// # Identity
//
// Resolve returns a file's resolved absolute path: two paths that reach
// the same file through links resolve alike, so a check reads and parses
// each file once, however many ways it is named.
package input

import (
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"strings"
)

// DefaultMaxSize is the largest file a check reads unless told otherwise:
// 512 MiB, room for the largest generated meshes the solver handles.
const DefaultMaxSize = 512 << 20

// maxLinks bounds the symbolic links followed while resolving one path,
// as the operating system does.
const maxLinks = 255

// ErrOutside is returned for a path that leads outside every root.
var ErrOutside = errors.New("outside the folders nodal reads")

// ErrNotRegular is returned for a device, pipe, socket or folder.
var ErrNotRegular = errors.New("not a regular file (a device, pipe, socket or folder)")

// ErrChanged is returned for a file that changed while it was read.
var ErrChanged = errors.New("changed while it was read; check it again once it is written")

// TooLargeError is returned for a file or stream past the size cap.
type TooLargeError struct {
	Size  int64 // the size seen; Limit+1 when it is only known to be larger
	Limit int64
}

func (e *TooLargeError) Error() string {
	if e.Size > e.Limit+1 {
		return fmt.Sprintf("%s, larger than the limit of %s on one input", MiB(e.Size), MiB(e.Limit))
	}
	return fmt.Sprintf("larger than the limit of %s on one input", MiB(e.Limit))
}

// MiB formats a byte count for a message.
func MiB(n int64) string {
	if n >= 1<<20 && n%(1<<20) == 0 {
		return fmt.Sprintf("%d MiB", n>>20)
	}
	if n >= 1<<20 {
		return fmt.Sprintf("%.1f MiB", float64(n)/(1<<20))
	}
	return fmt.Sprintf("%d bytes", n)
}

// Reader reads regular files below its roots, each up to a size cap. It
// holds no state between reads and is safe for concurrent use.
type Reader struct {
	roots []string
	max   int64
}

// New returns a Reader confined to roots (folders, which must exist) with
// the size cap maxSize (0: DefaultMaxSize).
func New(roots []string, maxSize int64) (*Reader, error) {
	if len(roots) == 0 {
		return nil, errors.New("input: no root")
	}
	if maxSize <= 0 {
		maxSize = DefaultMaxSize
	}
	r := &Reader{max: maxSize}
	for _, root := range roots {
		abs, err := filepath.Abs(root)
		if err != nil {
			return nil, err
		}
		res, ok, err := resolve(abs)
		if err != nil {
			return nil, err
		}
		if !ok {
			return nil, &fs.PathError{Op: "root", Path: root, Err: fs.ErrNotExist}
		}
		r.roots = append(r.roots, res)
	}
	return r, nil
}

// Roots returns the resolved roots.
func (r *Reader) Roots() []string { return r.roots }

// MaxSize returns the size cap.
func (r *Reader) MaxSize() int64 { return r.max }

// Resolve returns the absolute path name leads to once every symbolic link
// is followed. It fails with ErrOutside when that path is not below a
// root, and with fs.ErrNotExist when it is but nothing is there; both are
// wrapped in an *fs.PathError holding name as given.
func (r *Reader) Resolve(name string) (string, error) {
	abs, err := filepath.Abs(name)
	if err != nil {
		return "", &fs.PathError{Op: "resolve", Path: name, Err: err}
	}
	res, exists, err := resolve(abs)
	if err != nil {
		return "", &fs.PathError{Op: "resolve", Path: name, Err: err}
	}
	if !r.inside(res) {
		return "", &fs.PathError{Op: "read", Path: name, Err: ErrOutside}
	}
	if !exists {
		return "", &fs.PathError{Op: "read", Path: name, Err: fs.ErrNotExist}
	}
	return res, nil
}

func (r *Reader) inside(p string) bool {
	for _, root := range r.roots {
		if Within(p, root) {
			return true
		}
	}
	return false
}

// Within reports whether the clean absolute path p is root or below it.
func Within(p, root string) bool {
	if p == root {
		return true
	}
	if !strings.HasSuffix(root, string(filepath.Separator)) {
		root += string(filepath.Separator)
	}
	return strings.HasPrefix(p, root)
}

// ReadFile reads the regular file name leads to, below a root and within
// the size cap.
func (r *Reader) ReadFile(name string) ([]byte, error) {
	res, err := r.Resolve(name)
	if err != nil {
		return nil, err
	}
	return readRegular(name, res, r.max)
}

// ReadRegular reads a regular file, following links, within maxSize (0:
// DefaultMaxSize) but without confining it to a root. It is for files the
// user names for nodal itself, such as a configuration file.
func ReadRegular(name string, maxSize int64) ([]byte, error) {
	if maxSize <= 0 {
		maxSize = DefaultMaxSize
	}
	return readRegular(name, name, maxSize)
}

// readRegular reads path (reported as name) if it is a regular file no
// larger than max.
func readRegular(name, path string, max int64) ([]byte, error) {
	fail := func(err error) ([]byte, error) { return nil, &fs.PathError{Op: "read", Path: name, Err: err} }
	info, err := os.Stat(path)
	if err != nil {
		var pe *fs.PathError
		if errors.As(err, &pe) {
			err = pe.Err
		}
		return fail(err)
	}
	if !info.Mode().IsRegular() {
		return fail(ErrNotRegular)
	}
	if info.Size() > max {
		return fail(&TooLargeError{Size: info.Size(), Limit: max})
	}
	f, err := openNoWait(path)
	if err != nil {
		var pe *fs.PathError
		if errors.As(err, &pe) {
			err = pe.Err
		}
		return fail(err)
	}
	defer f.Close()
	// Checked again on the open file: the path may have changed since.
	if info, err = f.Stat(); err != nil {
		return fail(err)
	}
	if !info.Mode().IsRegular() {
		return fail(ErrNotRegular)
	}
	b, err := readOpen(f, info, max)
	if err != nil {
		return fail(err)
	}
	return b, nil
}

// openFile is what readOpen needs of an open file.
type openFile interface {
	io.Reader
	Stat() (fs.FileInfo, error)
}

// readOpen reads the open regular file f, whose Stat gave info, into one
// buffer of the size info states: no copies, no buffer regrown. A file
// that grows or shrinks while it is read, or whose size or time of change
// differs once it is read, is refused with ErrChanged (with a
// *TooLargeError when it grew past max): what was read is not a version of
// the file that ever was. A file that states no size (0, as some virtual
// files do) is read as a stream within max.
func readOpen(f openFile, info fs.FileInfo, max int64) ([]byte, error) {
	size := info.Size()
	if size > max {
		return nil, &TooLargeError{Size: size, Limit: max}
	}
	if size == 0 {
		return readAtMost(f, 0, max)
	}
	b := make([]byte, size)
	if _, err := io.ReadFull(f, b); err != nil {
		if err == io.ErrUnexpectedEOF || err == io.EOF {
			return nil, ErrChanged // shorter than it was
		}
		return nil, err
	}
	// One byte more would be a file that grew: how far (up to the cap)
	// decides which error it is.
	if n, err := io.Copy(io.Discard, io.LimitReader(f, max-size+1)); err != nil {
		return nil, err
	} else if n > 0 {
		if size+n > max {
			return nil, &TooLargeError{Size: max + 1, Limit: max}
		}
		return nil, ErrChanged
	}
	after, err := f.Stat()
	if err != nil {
		return nil, err
	}
	if after.Size() != size || !after.ModTime().Equal(info.ModTime()) {
		return nil, ErrChanged
	}
	return b, nil
}

// ReadAll reads a stream to its end, or fails with a *TooLargeError as
// soon as it passes maxSize bytes (0: DefaultMaxSize). A regular file (a
// redirected standard input) is read into one buffer of the size it has
// left; what it holds past that is read too, within the cap.
func ReadAll(rd io.Reader, maxSize int64) ([]byte, error) {
	if maxSize <= 0 {
		maxSize = DefaultMaxSize
	}
	hint := int64(0)
	if f, ok := rd.(*os.File); ok {
		if info, err := f.Stat(); err == nil && info.Mode().IsRegular() {
			if at, err := f.Seek(0, io.SeekCurrent); err == nil && at < info.Size() {
				hint = info.Size() - at
			}
		}
	}
	return readAtMost(rd, hint, maxSize)
}

// readAtMost reads rd to its end into a buffer sized for hint bytes (grown
// if there are more), failing with a *TooLargeError past max.
func readAtMost(rd io.Reader, hint, max int64) ([]byte, error) {
	// One byte past the hint, so that a read that fills the buffer
	// exactly can find the end without growing it.
	b := make([]byte, 0, min(hint, max)+1)
	lr := io.LimitReader(rd, max+1)
	for {
		if len(b) == cap(b) {
			b = append(b, 0)[:len(b)] // grows by the runtime's rule
		}
		n, err := lr.Read(b[len(b):cap(b)])
		b = b[:len(b)+n]
		if err == io.EOF {
			break
		}
		if err != nil {
			return nil, err
		}
	}
	if int64(len(b)) > max {
		return nil, &TooLargeError{Size: max + 1, Limit: max}
	}
	return b, nil
}

// TreeRoot returns the default root for a file in dir: the top level of
// the repository holding dir (the nearest folder, dir included, with a
// .git entry), or dir itself outside a repository. The result is absolute
// with its links resolved.
func TreeRoot(dir string) (string, error) {
	l, err := Locate(dir)
	if err != nil {
		return "", err
	}
	if l.Top != "" {
		return l.Top, nil
	}
	return l.Dir, nil
}

// Location is where a folder is.
type Location struct {
	Dir string // the folder, absolute, links resolved
	Top string // the top level of the repository holding it; "" outside one
}

// Locate resolves dir and finds its repository. A dir that does not exist
// is located by the nearest folder above it that does.
//
// The repository is found on the path as written, not on where its links
// lead: a link inside a repository to a folder elsewhere (even another
// repository) leaves the files behind it outside the root. A folder whose
// .git is reached through a link counts only when no repository lies
// above the link (a checkout that is itself a link, say ~/proj).
func Locate(dir string) (Location, error) {
	abs, err := filepath.Abs(dir)
	if err != nil {
		return Location{}, err
	}
	res, ok, err := resolve(abs)
	if err != nil {
		return Location{}, err
	}
	for !ok {
		// A folder yet to be made (a --stdin-filename, say) is located
		// by the nearest one above it that exists.
		up := filepath.Dir(res)
		if up == res {
			return Location{}, &fs.PathError{Op: "find root", Path: dir, Err: fs.ErrNotExist}
		}
		if res, ok, err = resolve(up); err != nil {
			return Location{}, err
		}
	}
	top := ""
	linked := "" // a repository reached through a link
	sawLink := false
	for d := abs; ; {
		info, lerr := os.Lstat(d)
		isLink := lerr == nil && info.Mode()&fs.ModeSymlink != 0
		if _, err := os.Lstat(filepath.Join(d, ".git")); err == nil {
			switch {
			case sawLink:
				top = d // a link inside this repository led below it
			case !isLink:
				top = d
			case linked == "":
				linked = d
			}
			if top != "" {
				break
			}
		}
		if isLink {
			sawLink = true
		}
		up := filepath.Dir(d)
		if up == d {
			top = linked
			break
		}
		d = up
	}
	if top == "" {
		return Location{Dir: res}, nil
	}
	t, ok, err := resolve(top)
	if err != nil || !ok {
		return Location{Dir: res}, err
	}
	return Location{Dir: res, Top: t}, nil
}
