package main

// gittree.go: one revision's files for "nodal diff" — a commit, git's
// index or the work tree — listed once and read through one
// "git cat-file --batch" process, never by checking anything out. Only
// regular files are listed (no links, no submodules); a path the listing
// does not hold does not exist, so includes cannot leave the repository.

import (
	"crypto/sha1"
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"fmt"
	"hash"
	"io/fs"
	"path"
	"path/filepath"
	"strings"
	"sync"

	"nodal/input"
)

// treeKind says where a revision's files are.
type treeKind int

const (
	commitTree treeKind = iota
	indexTree
	workTree
	emptyTree // no commits yet
)

// gitTree is one revision's files, by repository path (slash-separated).
type gitTree struct {
	kind  treeKind
	label string // how messages name the revision
	root  string
	cat   *catFile
	algo  func() hash.Hash
	disk  *input.Reader // the work tree's files, confined to it
	mu    sync.Mutex
	ids   map[string]string // path → blob id ("" in the work tree until read)
}

// listCommit lists the regular files of a commit.
func listCommit(root, commit, label string, cat *catFile) (*gitTree, error) {
	out, err := gitOutput(root, "ls-tree", "-r", "-z", "--full-tree", commit)
	if err != nil {
		return nil, err
	}
	t := &gitTree{kind: commitTree, label: label, root: root, cat: cat, ids: map[string]string{}}
	for _, rec := range strings.Split(string(out), "\x00") {
		// "<mode> <type> <id>\t<path>"
		meta, p, ok := strings.Cut(rec, "\t")
		f := strings.Fields(meta)
		if !ok || len(f) != 3 || f[1] != "blob" || (f[0] != "100644" && f[0] != "100755") {
			continue
		}
		t.ids[p] = f[2]
	}
	return t, nil
}

// listIndex lists the regular files staged in git's index. A path with
// unmerged entries has no staged content to compare, and is an error.
func listIndex(root string, cat *catFile) (*gitTree, error) {
	out, err := gitOutput(root, "ls-files", "-s", "-z", "--full-name")
	if err != nil {
		return nil, err
	}
	t := &gitTree{kind: indexTree, label: "the index", root: root, cat: cat, ids: map[string]string{}}
	var unmerged []string
	for _, rec := range strings.Split(string(out), "\x00") {
		// "<mode> <id> <stage>\t<path>"
		meta, p, ok := strings.Cut(rec, "\t")
		f := strings.Fields(meta)
		if !ok || len(f) != 3 {
			continue
		}
		if f[2] != "0" {
			if strings.HasSuffix(p, ".nodal") || path.Base(p) == "nodal.toml" {
				unmerged = append(unmerged, p)
			}
			continue
		}
		if f[0] != "100644" && f[0] != "100755" {
			continue
		}
		t.ids[p] = f[1]
	}
	if len(unmerged) > 0 {
		return nil, fmt.Errorf("the index has unmerged entries for %s; resolve them first", strings.Join(dedup(unmerged), ", "))
	}
	return t, nil
}

// listWork lists the files of the work tree that git tracks or would
// track; their ids are computed when they are read.
func listWork(root string) (*gitTree, error) {
	out, err := gitOutput(root, "ls-files", "-z", "--full-name", "--cached", "--others", "--exclude-standard")
	if err != nil {
		return nil, err
	}
	format := "sha1"
	if f, err := gitOutput(root, "rev-parse", "--show-object-format"); err == nil {
		format = strings.TrimSpace(string(f))
	}
	disk, err := input.New([]string{root}, 0)
	if err != nil {
		return nil, err
	}
	t := &gitTree{kind: workTree, label: "the work tree", root: root, ids: map[string]string{}, algo: sha1.New, disk: disk}
	if format == "sha256" {
		t.algo = sha256.New
	}
	for _, p := range strings.Split(string(out), "\x00") {
		if p != "" {
			t.ids[p] = ""
		}
	}
	return t, nil
}

func dedup(ss []string) []string {
	var out []string
	for i, s := range ss {
		if i == 0 || s != ss[i-1] {
			out = append(out, s)
		}
	}
	return out
}

// has reports whether the revision holds the file.
func (t *gitTree) has(p string) bool {
	t.mu.Lock()
	defer t.mu.Unlock()
	_, ok := t.ids[p]
	return ok
}

// paths returns the revision's paths that satisfy keep.
func (t *gitTree) paths(keep func(string) bool) []string {
	t.mu.Lock()
	defer t.mu.Unlock()
	var out []string
	for p := range t.ids {
		if keep(p) {
			out = append(out, p)
		}
	}
	return out
}

// clean turns a name as the checker forms it into a repository path, or
// "" for one that leaves the repository.
func clean(name string) string {
	p := path.Clean(filepath.ToSlash(name))
	if p == ".." || strings.HasPrefix(p, "../") || path.IsAbs(p) {
		return ""
	}
	return p
}

// id returns the blob id of a file, reading a work-tree file to compute
// it; "" when the revision has no such file.
func (t *gitTree) id(name string) string {
	p := clean(name)
	t.mu.Lock()
	id, ok := t.ids[p]
	t.mu.Unlock()
	if !ok || p == "" {
		return ""
	}
	if id != "" {
		return id
	}
	if _, err := t.ReadFile(p); err != nil {
		return ""
	}
	t.mu.Lock()
	defer t.mu.Unlock()
	return t.ids[p]
}

// ReadFile returns a file's content in the revision, or an error wrapping
// fs.ErrNotExist when the revision has no such regular file.
func (t *gitTree) ReadFile(name string) ([]byte, error) {
	return t.readFile(name, input.DefaultMaxSize)
}

// reader returns ReadFile with another size cap.
func (t *gitTree) reader(max int64) func(string) ([]byte, error) {
	return func(name string) ([]byte, error) { return t.readFile(name, max) }
}

func (t *gitTree) readFile(name string, max int64) ([]byte, error) {
	p := clean(name)
	t.mu.Lock()
	id, ok := t.ids[p]
	t.mu.Unlock()
	if !ok || p == "" {
		return nil, &fs.PathError{Op: "read", Path: name, Err: fs.ErrNotExist}
	}
	if t.kind != workTree {
		b, err := t.cat.read(id, max)
		if err != nil {
			return nil, &fs.PathError{Op: "read " + t.label, Path: name, Err: err}
		}
		return b, nil
	}
	b, err := t.disk.ReadFile(filepath.Join(t.root, filepath.FromSlash(p)))
	if err != nil {
		if errors.Is(err, fs.ErrNotExist) {
			t.mu.Lock()
			delete(t.ids, p) // deleted from the disk, still in the index
			t.mu.Unlock()
		}
		return nil, &fs.PathError{Op: "read", Path: name, Err: unwrapPathErr(err)}
	}
	h := t.algo()
	fmt.Fprintf(h, "blob %d\x00", len(b))
	h.Write(b)
	t.mu.Lock()
	t.ids[p] = hex.EncodeToString(h.Sum(nil))
	t.mu.Unlock()
	return b, nil
}

// unwrapPathErr returns the error inside a *fs.PathError, so that the
// path is named once.
func unwrapPathErr(err error) error {
	var pe *fs.PathError
	if errors.As(err, &pe) {
		return pe.Err
	}
	return err
}
