package main

// files.go: how check and report read the files of a design — confined to
// the repository (or the roots given), regular files only, each within
// the size cap — and how files are admitted to the worker pool by size.

import (
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path"
	"path/filepath"
	"strings"
	"sync"

	"nodal/input"
	"nodal/output"
)

// reader reads a file the way the current mode sees files.
type reader func(name string) ([]byte, error)

// diskReaders read files of the work tree outside a check (to follow
// includes for a hook): each confined to the repository holding it, a
// regular file, within the default cap. The reader check.DefaultReader
// makes for a folder is made once per folder, not once per file. It is
// safe for concurrent use.
type diskReaders struct {
	mu     sync.Mutex
	byDir  map[string]diskReader
	byRoot map[string]*input.Reader
	tops   map[string]string // folder → input.Locate's Top ("" outside a repository)
}

type diskReader struct {
	r   *input.Reader
	err error
}

func newDiskReaders() *diskReaders {
	return &diskReaders{byDir: map[string]diskReader{}, byRoot: map[string]*input.Reader{}, tops: map[string]string{}}
}

// reader is check.DefaultReader for the files of the clean absolute
// folder dir: confined to input.TreeRoot(dir).
func (d *diskReaders) reader(dir string) (*input.Reader, error) {
	root, err := d.treeRoot(dir)
	if err != nil {
		return nil, err
	}
	if r, ok := d.byRoot[root]; ok {
		return r, nil
	}
	r, err := input.New([]string{root}, 0)
	if err == nil {
		d.byRoot[root] = r
	}
	return r, err
}

// treeRoot is input.TreeRoot(dir) for a clean absolute folder. A folder
// that is not a link and holds no .git lies in the repository of its
// parent, as input.Locate walks up to it, so inside a repository the
// answer is the parent's (kept per folder) after two lstat calls instead
// of resolving the whole path again.
func (d *diskReaders) treeRoot(dir string) (string, error) {
	if top, ok := d.tops[dir]; ok && top != "" {
		return top, nil
	}
	if parent := filepath.Dir(dir); parent != dir && filepath.IsAbs(dir) && filepath.Clean(dir) == dir {
		info, err := os.Lstat(dir)
		if err == nil && info.IsDir() {
			if _, gerr := os.Lstat(filepath.Join(dir, ".git")); gerr != nil {
				if top, err := d.top(parent); err == nil && top != "" {
					d.tops[dir] = top
					return top, nil
				}
			}
		}
	}
	loc, err := input.Locate(dir)
	if err != nil {
		return "", err
	}
	d.tops[dir] = loc.Top
	if loc.Top != "" {
		return loc.Top, nil
	}
	return loc.Dir, nil
}

// top is input.Locate(dir).Top, kept per folder.
func (d *diskReaders) top(dir string) (string, error) {
	if top, ok := d.tops[dir]; ok {
		return top, nil
	}
	if _, err := d.treeRoot(dir); err != nil {
		return "", err
	}
	return d.tops[dir], nil
}

// read reads a file through its folder's reader.
func (d *diskReaders) read(name string) ([]byte, error) {
	dir := filepath.Dir(name)
	d.mu.Lock()
	dr, ok := d.byDir[dir]
	if !ok {
		dr.r, dr.err = d.reader(dir)
		d.byDir[dir] = dr
	}
	d.mu.Unlock()
	if dr.err != nil {
		return nil, dr.err
	}
	return dr.r.ReadFile(name)
}

// readers builds and keeps one input.Reader per set of roots and cap.
type readers struct {
	explicit []string // --root: replaces the default root and nodal.toml's roots
	maxSize  int64    // --max-file-mib in bytes; 0: each file's nodal.toml
	mu       sync.Mutex
	byDir    map[string]string // folder → its tree root
	byKey    map[string]*input.Reader
}

func newReaders(explicit []string, maxSize int64) *readers {
	return &readers{explicit: explicit, maxSize: maxSize, byDir: map[string]string{}, byKey: map[string]*input.Reader{}}
}

// forFile returns the reader for a file checked with configuration roots
// and size cap (in MiB) from its nodal.toml.
func (rs *readers) forFile(name string, cfgRoots []string, cfgMiB int) (*input.Reader, error) {
	rs.mu.Lock()
	defer rs.mu.Unlock()
	roots := rs.explicit
	if len(roots) == 0 {
		dir := filepath.Dir(name)
		top, ok := rs.byDir[dir]
		if !ok {
			var err error
			if top, err = input.TreeRoot(dir); err != nil {
				return nil, err
			}
			rs.byDir[dir] = top
		}
		roots = append([]string{top}, cfgRoots...)
	}
	size := rs.maxSize
	if size == 0 {
		size = int64(cfgMiB) << 20
	}
	key := fmt.Sprint(size, "\x00", strings.Join(roots, "\x00"))
	if r, ok := rs.byKey[key]; ok {
		return r, nil
	}
	r, err := input.New(roots, size)
	if err != nil {
		return nil, fmt.Errorf("a root of the check: %w", err)
	}
	rs.byKey[key] = r
	return r, nil
}

// cleanIdentity is the identity of a file read from git's index: its
// repository path (the index holds no links to follow).
func cleanIdentity(name string) (string, error) { return path.Clean(filepath.ToSlash(name)), nil }

// fileError is an I/O error about one file, as one line: the name shown
// safely, then what went wrong.
func fileError(name string, err error) string {
	var pe *fs.PathError
	if errors.As(err, &pe) {
		err = pe.Err
	}
	switch {
	case errors.Is(err, input.ErrOutside):
		return fmt.Sprintf("nodal: %s: leads outside the folders nodal reads (the repository, or the roots set in nodal.toml or by --root); refused", output.TextSafe(name))
	case errors.Is(err, fs.ErrNotExist):
		return fmt.Sprintf("nodal: %s: no such file", output.TextSafe(name))
	}
	return fmt.Sprintf("nodal: %s: %s", output.TextSafe(name), output.TextSafe(err.Error()))
}

// admission lets files into the worker pool while the bytes being checked
// at once stay within a budget, so that several large designs do not
// multiply the peak memory by the number of workers. A file larger than
// the budget runs alone.
type admission struct {
	mu     sync.Mutex
	cond   *sync.Cond
	budget int64
	used   int64
}

func newAdmission(budget int64) *admission {
	a := &admission{budget: budget}
	a.cond = sync.NewCond(&a.mu)
	return a
}

func (a *admission) acquire(n int64) {
	a.mu.Lock()
	for a.used > 0 && a.used+n > a.budget {
		a.cond.Wait()
	}
	a.used += n
	a.mu.Unlock()
}

func (a *admission) release(n int64) {
	a.mu.Lock()
	a.used -= n
	a.mu.Unlock()
	a.cond.Broadcast()
}

// partWeight is what one expanded part weighs for admission, in bytes of
// source: about the length of a flat part line (a 2 M-part mesh is a
// 90.6 MB file), so that a design weighs about what it would written
// out flat.
const partWeight = 48

// ticket is one file's hold on the admission budget.
type ticket struct {
	a *admission
	n int64
}

// admit waits until n bytes fit in the budget and holds them.
func (a *admission) admit(n int64) *ticket {
	a.acquire(n)
	return &ticket{a: a, n: n}
}

// grow makes the hold n bytes when that is more than it holds. It lets go
// of what it holds before it waits for the more, so that two files
// growing at once cannot wait on each other.
func (t *ticket) grow(n int64) {
	n = min(n, t.a.budget) // more than the budget runs alone all the same
	if n <= t.n {
		return
	}
	t.a.release(t.n)
	t.a.acquire(n)
	t.n = n
}

// done lets go of the hold.
func (t *ticket) done() { t.a.release(t.n) }

// sizeOf is the size of a file for admission; 0 when unknown.
func sizeOf(name string) int64 {
	info, err := os.Stat(name)
	if err != nil || !info.Mode().IsRegular() {
		return 0
	}
	return info.Size()
}
