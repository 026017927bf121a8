package main

// dependents.go: hooks follow includes. A changed file — staged, or named
// on the command line as a hook's file list names it — brings in every
// design that includes it, directly or through other files, and a changed
// nodal.toml brings in every design it may govern (those in its folder and
// below). The reverse include graph is built from git's index with
// --staged and from the work tree otherwise, over the .nodal files git
// tracks or would track; outside a git repository only the named files are
// checked.

import (
	"bytes"
	"errors"
	"fmt"
	"io"
	"os"
	"path"
	"path/filepath"
	"runtime"
	"sort"
	"strings"
	"sync"

	"nodal/check"
	"nodal/input"
	"nodal/output"
)

// changed is what a change touches: .nodal files (still there or deleted)
// and nodal.toml files. Paths are in one namespace: absolute in the work
// tree, repository paths in the index.
type changed struct {
	files   []string
	configs []string
}

// dependents returns the files of all, other than names, that include a
// changed file directly or transitively, or that lie below the folder of a
// changed nodal.toml. read reads a file of all; a file it cannot read
// includes nothing (checking it reports why).
func dependents(ch changed, names, all []string, read reader) []string {
	// The files the graph asks about (every other file that is not a
	// target), read and scanned on every core before it asks.
	others, isTarget := graphFiles(ch, names, all)
	var toRead []string
	for _, f := range others {
		if !isTarget[f] {
			toRead = append(toRead, f)
		}
	}
	incs := readIncludes(toRead, read)
	return graphDependents(ch, names, all, func(f string) []string { return incs[f] })
}

// graphFiles returns the files of all that are not named (the candidates)
// and the set of targets: the named files and the changed ones.
func graphFiles(ch changed, names, all []string) (others []string, isTarget map[string]bool) {
	checked := map[string]bool{}
	for _, n := range names {
		checked[n] = true
	}
	for _, f := range all {
		if !checked[f] {
			others = append(others, f)
		}
	}
	isTarget = map[string]bool{}
	for _, t := range names {
		isTarget[t] = true
	}
	for _, t := range ch.files {
		isTarget[t] = true
	}
	return others, isTarget
}

// graphDependents is dependents with each file's includes given.
func graphDependents(ch changed, names, all []string, includes func(string) []string) []string {
	others, _ := graphFiles(ch, names, all)
	targets := append(append([]string(nil), names...), ch.files...)
	out := check.Dependents(targets, others, includes)
	seen := map[string]bool{}
	for _, f := range out {
		seen[f] = true
	}
	for _, c := range ch.configs {
		dir := filepath.Dir(c)
		for _, f := range others {
			if !seen[f] && (dir == "." || strings.HasPrefix(f, dir+string(filepath.Separator))) {
				seen[f] = true
				out = append(out, f)
			}
		}
	}
	sort.Strings(out)
	return out
}

// readIncludes reads files on every core and returns what each includes;
// a file read cannot read includes nothing.
func readIncludes(files []string, read reader) map[string][]string {
	if len(files) == 0 {
		return map[string][]string{} // no goroutine started for nothing
	}
	incs := make([][]string, len(files))
	var wg sync.WaitGroup
	next := make(chan int)
	for range min(runtime.GOMAXPROCS(0), max(len(files), 1)) {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for i := range next {
				if src, err := read(files[i]); err == nil {
					incs[i] = check.Includes(files[i], src)
				}
			}
		}()
	}
	for i := range files {
		next <- i
	}
	close(next)
	wg.Wait()
	byFile := make(map[string][]string, len(files))
	for i, f := range files {
		byFile[f] = incs[i]
	}
	return byFile
}

// sayDependents notes on standard error which designs were added.
func sayDependents(stderr io.Writer, deps []string) {
	if len(deps) == 0 {
		return
	}
	var list []string
	for _, d := range deps[:min(len(deps), 5)] {
		list = append(list, output.TextSafe(d))
	}
	more := ""
	if len(deps) > len(list) {
		more = fmt.Sprintf(" and %d more", len(deps)-len(list))
	}
	fmt.Fprintf(stderr, "nodal: also checking %s that the changed files reach through includes or a nodal.toml: %s%s\n",
		output.Plural(len(deps), "design"), strings.Join(list, ", "), more)
}

// isConfigName reports whether a path names a nodal.toml.
func isConfigName(p string) bool { return filepath.Base(p) == "nodal.toml" }

// worktreeDependents returns, relative to the current folder, the designs
// of the work tree other than names (paths as the user gave them) that
// depend on them, on the named paths
// (deleted .nodal files and nodal.toml files among them), or on a .nodal
// file git knows that is gone from the disk. The files considered are
// those git tracks or would track; where the work tree and git's index
// file settle that alone (fastDependents), no git process starts.
func worktreeDependents(names, paths []string, stderr io.Writer) []string {
	lay, fast, none := fastRoot() // worktreeRoot, keeping the layout
	root, err := lay.root, error(nil)
	switch {
	case none:
		err = errNoRepository
	case !fast:
		root, _, err = gitRoot(".")
	}
	if errors.Is(err, errNoRepository) {
		if loc, lerr := input.Locate("."); lerr == nil && loc.Top != "" {
			// A .git on the path as written but not above the physical
			// folder: git has the last word.
			root, _, err = gitRoot(".")
		}
	}
	if err != nil {
		if loc, lerr := input.Locate("."); lerr == nil && loc.Top != "" {
			// A repository git could not be asked about: say what was not
			// done rather than skip it quietly.
			fmt.Fprintf(stderr, "nodal: note: designs that include the named files were not looked for: %s\n", output.TextSafe(err.Error()))
		}
		return nil // no repository: no graph to follow
	}
	cwd, err := os.Getwd()
	if err != nil {
		return nil
	}
	// git names the root by its real path; the current folder may be
	// reached through a link, and paths must compare alike.
	if real, err := filepath.EvalSymlinks(cwd); err == nil {
		cwd = real
	}
	abs := func(p string) string {
		if filepath.IsAbs(p) {
			return filepath.Clean(p)
		}
		return filepath.Join(cwd, p)
	}
	var ch changed
	var absNames []string
	for _, n := range names {
		if n != "-" {
			absNames = append(absNames, abs(n))
		}
	}
	for _, p := range paths {
		switch {
		case isConfigName(p):
			ch.configs = append(ch.configs, abs(p))
		case strings.HasSuffix(p, ".nodal"):
			if _, err := os.Lstat(p); err != nil {
				ch.files = append(ch.files, abs(p)) // deleted: its includers change
			}
		}
	}
	deps, ok := []string(nil), false
	if fast {
		deps, ok = fastDependents(lay, ch, absNames)
	}
	if !ok {
		if deps, err = listedDependents(root, ch, absNames); err != nil {
			fmt.Fprintf(stderr, "nodal: note: designs that include the named files were not looked for: %s\n", output.TextSafe(err.Error()))
			return nil
		}
	}
	rel := make([]string, 0, len(deps))
	for _, d := range deps {
		if r, err := filepath.Rel(cwd, d); err == nil {
			d = r
		}
		rel = append(rel, d)
	}
	sayDependents(stderr, rel)
	return rel
}

// includerSearch is worktreeDependents run while the named files are
// checked.
type includerSearch struct {
	done chan struct{}
	deps []string
	said bytes.Buffer // what it says on standard error
}

// startSearch starts worktreeDependents(names, paths) in the background.
func startSearch(names, paths []string) *includerSearch {
	s := &includerSearch{done: make(chan struct{})}
	go func() {
		defer close(s.done)
		s.deps = worktreeDependents(names, paths, &s.said)
	}()
	return s
}

// wait returns the dependents found and what the search said, once it
// ends.
func (s *includerSearch) wait() (deps []string, said []byte) {
	<-s.done
	return s.deps, s.said.Bytes()
}

// listedDependents finds the dependents over git's listings of the work
// tree at root.
func listedDependents(root string, ch changed, absNames []string) ([]string, error) {
	// The files git tracks or would track, then those it knows that are
	// gone from the disk, deleted in the work tree or with the deletion
	// staged. The three listings are independent: asked at once, a check
	// of one small file waits for one git start instead of three.
	outs, errs := gitOutputs(root,
		[]string{"ls-files", "-z", "--full-name", "--cached", "--others", "--exclude-standard", "--", "*.nodal"},
		[]string{"ls-files", "-z", "--full-name", "--deleted", "--", "*.nodal"},
		[]string{"diff", "--cached", "--name-only", "-z", "--no-renames", "--diff-filter=D", "--", "*.nodal"})
	if errs[0] != nil {
		return nil, errs[0]
	}
	seen := map[string]bool{}
	var all []string
	for _, p := range strings.Split(string(outs[0]), "\x00") {
		if p == "" {
			continue
		}
		a := filepath.Join(root, filepath.FromSlash(p))
		if !seen[a] {
			seen[a] = true
			all = append(all, a)
		}
	}
	// Files git knows that are gone from the disk: their includers change
	// too, though a hook's file list never names a deleted file.
	ch.files = append([]string(nil), ch.files...)
	for k, out := range outs[1:] {
		if errs[1+k] != nil {
			continue // a repository without commits has no staged deletions
		}
		for _, p := range strings.Split(string(out), "\x00") {
			if p != "" {
				ch.files = append(ch.files, filepath.Join(root, filepath.FromSlash(p)))
			}
		}
	}
	return dependents(ch, absNames, all, newDiskReaders().read), nil
}

// stagedDependents adds to names (repository paths of staged files) the
// staged designs that depend on them, on the other named paths, or — when
// no path is named — on every staged change, deletions and nodal.toml
// files among them.
func stagedDependents(root, prefix string, names, paths []string, stderr io.Writer) ([]string, error) {
	out, err := gitOutput(root, "ls-files", "-z", "--full-name", "--", "*.nodal")
	if err != nil {
		return names, err
	}
	seen := map[string]bool{}
	var all []string
	for _, p := range strings.Split(string(out), "\x00") {
		if p != "" && !seen[p] {
			seen[p] = true
			all = append(all, filepath.FromSlash(p))
		}
	}
	var ch changed
	if len(paths) == 0 {
		// Every staged change, deletions and renames' old names too.
		out, err := gitOutput(root, "diff", "--cached", "--name-only", "-z", "--no-renames", "--", "*.nodal", "*nodal.toml")
		if err != nil {
			return names, err
		}
		for _, p := range strings.Split(string(out), "\x00") {
			switch {
			case p == "":
			case isConfigName(p):
				ch.configs = append(ch.configs, filepath.FromSlash(p))
			case strings.HasSuffix(p, ".nodal"):
				ch.files = append(ch.files, filepath.FromSlash(p))
			}
		}
	} else {
		for _, p := range paths {
			rp := filepath.FromSlash(path.Clean(prefix + filepath.ToSlash(p)))
			switch {
			case isConfigName(p):
				ch.configs = append(ch.configs, rp)
			case strings.HasSuffix(p, ".nodal") && !seen[filepath.ToSlash(rp)]:
				ch.files = append(ch.files, rp) // not in the index: deleted
			}
		}
		// Staged deletions, named or not: their includers change.
		out, err := gitOutput(root, "diff", "--cached", "--name-only", "-z", "--no-renames", "--diff-filter=D", "--", "*.nodal")
		if err != nil {
			return names, err
		}
		for _, p := range strings.Split(string(out), "\x00") {
			if p != "" {
				ch.files = append(ch.files, filepath.FromSlash(p))
			}
		}
	}
	local := make([]string, len(names))
	for i, n := range names {
		local[i] = filepath.FromSlash(n)
	}
	lines, err := stagedIncludeLines(root)
	if err != nil {
		return names, err
	}
	deps := dependents(ch, local, all, func(f string) ([]byte, error) { return lines[filepath.ToSlash(f)], nil })
	for i := range deps {
		deps[i] = filepath.ToSlash(deps[i])
	}
	sayDependents(stderr, deps)
	return append(names, deps...), nil
}
