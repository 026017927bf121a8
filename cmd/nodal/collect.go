package main

// collect.go: which files a check is given — folders walked for their
// .nodal files, missing paths told apart from deletions git knows, and
// with --staged the staged files named or all of them.

import (
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path"
	"path/filepath"
	"sort"
	"strings"

	"nodal/output"
)

// collect expands folders into their .nodal files, sorted, each once.
// Named files that are not .nodal files are skipped; named paths that do
// not exist are skipped when git knows them (deleted by the change being
// checked) and reported otherwise. A named link to a folder is walked like
// the folder. walked holds the files found by walking rather than named.
func collect(paths []string, stderr io.Writer) (out []string, walked map[string]bool, status int) {
	seen := map[string]bool{}
	walked = map[string]bool{}
	var missing []string
	add := func(p string) {
		if !seen[p] {
			seen[p] = true
			out = append(out, p)
		}
	}
	for _, p := range paths {
		if p == "-" {
			add(p)
			continue
		}
		info, err := os.Stat(p)
		if errors.Is(err, fs.ErrNotExist) {
			missing = append(missing, p)
			continue
		}
		if err != nil {
			fmt.Fprintln(stderr, fileError(p, err))
			status = 2
			continue
		}
		if !info.IsDir() {
			if strings.HasSuffix(p, ".nodal") {
				add(filepath.Clean(p))
			}
			continue
		}
		// A link to a folder is walked as the folder it names; the walk
		// itself does not follow links to folders.
		start := p
		if l, err := os.Lstat(p); err == nil && l.Mode()&fs.ModeSymlink != 0 {
			start = filepath.Clean(p) + string(filepath.Separator)
		}
		var found []string
		err = filepath.WalkDir(start, func(q string, e fs.DirEntry, err error) error {
			if err != nil {
				return err
			}
			if e.IsDir() && q != start && strings.HasPrefix(e.Name(), ".") {
				return filepath.SkipDir
			}
			if !e.IsDir() && strings.HasSuffix(e.Name(), ".nodal") {
				found = append(found, q)
			}
			return nil
		})
		if err != nil {
			fmt.Fprintln(stderr, fileError(p, err))
			status = 2
		}
		sort.Strings(found)
		for _, q := range found {
			// Behind a named link to a folder, files count as named: a
			// link that leads outside the root is refused, not skipped.
			walked[q] = start == p && (!seen[q] || walked[q])
			add(q)
		}
	}
	if reportUnknown(missing, "no such file or folder", stderr) {
		status = 2
	}
	return out, walked, status
}

// reportUnknown says which of the missing paths git does not know: those
// are typos, while a missing path git knows is a deletion a hook passes on,
// skipped quietly. It reports whether any was a typo.
func reportUnknown(missing []string, what string, stderr io.Writer) bool {
	if len(missing) == 0 {
		return false
	}
	typo := false
	known := gitKnown(".", missing)
	for _, p := range missing {
		if !known[p] {
			fmt.Fprintf(stderr, "nodal: %s: %s\n", output.TextSafe(p), what)
			typo = true
		}
	}
	return typo
}

// stagedNames turns the named paths (relative to the current folder) into
// repository paths of staged .nodal files, or lists every staged one.
// Unmerged files (a merge stopped on a conflict) are errors: the index
// holds no one version of them to check.
func stagedNames(root, prefix string, paths []string, stderr io.Writer) ([]string, int) {
	unmerged, err := gitUnmerged(root)
	if err != nil {
		fmt.Fprintf(stderr, "nodal: --staged: %s\n", output.TextSafe(err.Error()))
		return nil, 2
	}
	conflict := func(rp string) {
		fmt.Fprintf(stderr, "nodal: %s: unmerged in git's index (a conflict); resolve the merge first, then stage the file\n", output.TextSafe(rp))
	}
	if len(paths) == 0 {
		ps, err := gitStaged(root)
		if err != nil {
			fmt.Fprintf(stderr, "nodal: --staged: %s\n", output.TextSafe(err.Error()))
			return nil, 2
		}
		status := 0
		for _, p := range sortedKeys(unmerged) {
			if strings.HasSuffix(p, ".nodal") {
				conflict(p)
				status = 2
			}
		}
		return ps, status
	}
	var named, rps []string
	seen := map[string]bool{}
	for _, p := range paths {
		if !strings.HasSuffix(p, ".nodal") {
			continue
		}
		rp := path.Clean(prefix + filepath.ToSlash(p))
		if seen[rp] {
			continue
		}
		seen[rp] = true
		named, rps = append(named, p), append(rps, rp)
	}
	// One ls-files call says which are staged; their content is read once,
	// later, when they are checked.
	in, err := gitInIndex(root, rps)
	if err != nil {
		fmt.Fprintf(stderr, "nodal: --staged: %v\n", err)
		return nil, 2
	}
	var out, missing []string
	status := 0
	for i, rp := range rps {
		if unmerged[rp] {
			conflict(rp)
			status = 2
			continue
		}
		if in[rp] {
			out = append(out, rp)
		} else {
			missing = append(missing, named[i])
		}
	}
	if reportUnknown(missing, "not in git's index", stderr) {
		status = 2
	}
	return out, status
}

func sortedKeys(m map[string]bool) []string {
	out := make([]string, 0, len(m))
	for k := range m {
		out = append(out, k)
	}
	sort.Strings(out)
	return out
}
