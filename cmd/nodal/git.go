package main

// git.go: what the check command asks of git — the repository root, which
// missing paths git knows (a hook's deleted files), the staged file list,
// and the staged content of files, read through one "git cat-file --batch"
// process however many files are checked.

import (
	"bytes"
	"errors"
	"fmt"
	"io/fs"
	"os/exec"
	"path"
	"path/filepath"
	"strconv"
	"strings"
	"sync"

	"nodal/input"
)

// gitOutputs runs one git command for each argument list, all at once,
// and returns their outputs and errors in the same order.
func gitOutputs(dir string, argLists ...[]string) ([][]byte, []error) {
	outs, errs := make([][]byte, len(argLists)), make([]error, len(argLists))
	var wg sync.WaitGroup
	for k, args := range argLists {
		wg.Add(1)
		go func() {
			defer wg.Done()
			outs[k], errs[k] = gitOutput(dir, args...)
		}()
	}
	wg.Wait()
	return outs, errs
}

func gitOutput(dir string, args ...string) ([]byte, error) {
	cmd := exec.Command("git", args...)
	cmd.Dir = dir
	var stderr bytes.Buffer
	cmd.Stderr = &stderr
	out, err := cmd.Output()
	if err != nil {
		msg := strings.TrimSpace(stderr.String())
		if msg == "" {
			msg = err.Error()
		}
		return nil, fmt.Errorf("git %s: %s", args[0], msg)
	}
	return out, nil
}

// gitRoot returns the top folder of the work tree holding dir and the path
// of dir inside it ("" or "sub/dir/").
func gitRoot(dir string) (root, prefix string, err error) {
	out, err := gitOutput(dir, "rev-parse", "--show-toplevel", "--show-prefix")
	if err != nil {
		return "", "", err
	}
	lines := strings.Split(strings.TrimRight(string(out), "\n"), "\n")
	root = lines[0]
	if len(lines) > 1 {
		prefix = lines[1]
	}
	return root, prefix, nil
}

// gitKnown returns the paths among ps that git tracks in HEAD or the
// index: a path that is missing from the disk but known to git is a
// deletion, not a typo. Errors (no git, not a repository) mean "none".
func gitKnown(dir string, ps []string) map[string]bool {
	args := append([]string{"ls-files", "-z", "--full-name", "--with-tree=HEAD", "--"}, ps...)
	out, err := gitOutput(dir, args...)
	if err != nil {
		// A repository without commits has no HEAD; ask the index alone.
		args = append([]string{"ls-files", "-z", "--full-name", "--"}, ps...)
		if out, err = gitOutput(dir, args...); err != nil {
			return nil
		}
	}
	_, prefix, err := gitRoot(dir)
	if err != nil {
		return nil
	}
	listed := map[string]bool{}
	for _, p := range strings.Split(string(out), "\x00") {
		if p != "" {
			listed[p] = true
		}
	}
	known := map[string]bool{}
	for _, p := range ps {
		if listed[path.Clean(prefix+filepath.ToSlash(p))] {
			known[p] = true
		}
	}
	return known
}

// gitInIndex reports which of the repository paths rps have an entry in
// git's index, in one ls-files call and without reading any content.
func gitInIndex(root string, rps []string) (map[string]bool, error) {
	if len(rps) == 0 {
		return nil, nil
	}
	args := append([]string{"--literal-pathspecs", "ls-files", "-z", "--full-name", "--"}, rps...)
	out, err := gitOutput(root, args...)
	if err != nil {
		return nil, err
	}
	in := map[string]bool{}
	for _, p := range strings.Split(string(out), "\x00") {
		if p != "" {
			in[p] = true
		}
	}
	return in, nil
}

// gitStaged lists the repository paths of the staged .nodal files that
// are added, copied, modified or renamed (deleted ones have nothing to
// check).
func gitStaged(root string) ([]string, error) {
	out, err := gitOutput(root, "diff", "--cached", "--name-only", "-z", "--diff-filter=ACMR", "--", "*.nodal")
	if err != nil {
		return nil, err
	}
	var ps []string
	for _, p := range strings.Split(string(out), "\x00") {
		if strings.HasSuffix(p, ".nodal") {
			ps = append(ps, p)
		}
	}
	return ps, nil
}

// index reads files from git's index. Names are repository paths; it is
// safe for concurrent use.
type index struct {
	root string
	cat  *catFile
}

func openIndex(root string) (*index, error) {
	cat, err := openCatFile(root)
	if err != nil {
		return nil, err
	}
	return &index{root: root, cat: cat}, nil
}

// reader returns ReadFile with a size cap.
func (x *index) reader(maxSize int64) func(string) ([]byte, error) {
	return func(name string) ([]byte, error) { return x.readFile(name, maxSize) }
}

// ReadFile returns the staged content of a repository path, or an error
// wrapping fs.ErrNotExist when the index has no such file.
func (x *index) ReadFile(name string) ([]byte, error) { return x.readFile(name, input.DefaultMaxSize) }

func (x *index) readFile(name string, maxSize int64) ([]byte, error) {
	p := path.Clean(filepath.ToSlash(name))
	if p == ".." || strings.HasPrefix(p, "../") || path.IsAbs(p) {
		return nil, &fs.PathError{Op: "read staged", Path: name, Err: input.ErrOutside}
	}
	if strings.ContainsAny(p, "\n") {
		// The batch protocol is one name a line: such a name is asked
		// for on its own.
		return x.readOne(name, p, maxSize)
	}
	b, err := x.cat.read(":"+p, maxSize)
	switch {
	case errors.Is(err, errNoObject):
		return nil, &fs.PathError{Op: "read staged", Path: name, Err: fs.ErrNotExist}
	case errors.Is(err, errNotBlob):
		return nil, &fs.PathError{Op: "read staged", Path: name, Err: errors.New("not a file in git's index")}
	case err != nil:
		var tl *input.TooLargeError
		if errors.As(err, &tl) {
			return nil, &fs.PathError{Op: "read staged", Path: name, Err: err}
		}
		return nil, err
	}
	return b, nil
}

// readOne reads one staged file by its own git call, for a name the batch
// protocol cannot carry.
func (x *index) readOne(name, p string, maxSize int64) ([]byte, error) {
	out, err := gitOutput(x.root, "cat-file", "-s", ":"+p)
	if err != nil {
		return nil, &fs.PathError{Op: "read staged", Path: name, Err: fs.ErrNotExist}
	}
	size, err := strconv.ParseInt(strings.TrimSpace(string(out)), 10, 64)
	if err != nil {
		return nil, fmt.Errorf("git cat-file: bad size %q", out)
	}
	if size > maxSize {
		return nil, &fs.PathError{Op: "read staged", Path: name, Err: &input.TooLargeError{Size: size, Limit: maxSize}}
	}
	return gitOutput(x.root, "cat-file", "blob", ":"+p)
}

// gitUnmerged lists the repository paths with unmerged entries (a merge
// or rebase stopped on a conflict): they have no staged content to check.
func gitUnmerged(root string) (map[string]bool, error) {
	out, err := gitOutput(root, "diff", "--cached", "--name-only", "-z", "--diff-filter=U")
	if err != nil {
		return nil, err
	}
	u := map[string]bool{}
	for _, p := range strings.Split(string(out), "\x00") {
		if p != "" {
			u[p] = true
		}
	}
	return u, nil
}

func (x *index) Close() error { return x.cat.Close() }
