package main

// fastdeps.go: the designs that depend on a change, found without starting
// git where the work tree and git's index file settle the answer alone.
// The answer must be the one git's listings lead to (listedDependents):
// the files git tracks or would track (--cached --others
// --exclude-standard), and as changed files those gone from the disk
// (--deleted) or deleted in the index (diff --cached).
//
// # Why the answer is git's
//
// The walk lists every .nodal entry below the root but .git entries, and
// the index lists every tracked path, so together they hold every file git
// lists, and more (ignored and nested repositories' files). The deleted
// files git lists are the tracked ones missing from the disk, which the
// index and the walk give exactly, and the deletions staged in the index
// (in HEAD, not in the index), which only HEAD's tree shows: they matter
// only as includes, so an include of a .nodal path below the root that the
// index does not hold hands the question to git. The reverse include graph
// over the larger set finds every dependent git's finds; a file it finds
// that the index does not hold may be ignored, so that too goes to git.
// When every dependent found is tracked, each is one git lists, reached
// through tracked files by the same includes: the two answers are equal.

import (
	"os"
	"path/filepath"
	"strings"

	"nodal/input"
)

// fastEnv lists the environment variables, beyond those that move the
// repository (gitEnv), that change which index git reads or how it matches
// the *.nodal pathspec; with any of them set, git is asked.
var fastEnv = []string{"GIT_INDEX_FILE", "GIT_ICASE_PATHSPECS", "GIT_LITERAL_PATHSPECS", "GIT_GLOB_PATHSPECS", "GIT_NOGLOB_PATHSPECS"}

// fastDependents returns what listedDependents would, for the work tree
// and repository of lay, without git; ok is false when it cannot be sure.
func fastDependents(lay gitLayout, ch changed, absNames []string) (deps []string, ok bool) {
	for _, v := range fastEnv {
		if _, set := os.LookupEnv(v); set {
			return nil, false
		}
	}
	// A hash other than SHA-1 changes the index layout; a case-folding
	// repository matches the pathspec and the index's paths otherwise.
	cfg, err := os.ReadFile(filepath.Join(lay.common, "config"))
	if err != nil || len(cfg) > 1<<20 {
		return nil, false
	}
	c := strings.ToLower(string(cfg))
	if strings.Contains(c, "objectformat") || (strings.Contains(c, "ignorecase") && !onlyFalse(c, "ignorecase")) {
		return nil, false
	}
	idx, err := readIndex(filepath.Join(lay.gitDir, "index"))
	if err != nil {
		return nil, false
	}
	paths := idx.paths
	scan, err := scanTree(lay.root)
	if err != nil {
		return nil, false
	}
	// The tracked .nodal files, each path joined once (the index lists
	// every tracked path, most of them not .nodal files).
	tracked := map[string]bool{}
	var trackedList []string
	for _, p := range paths {
		if strings.HasSuffix(p, ".nodal") {
			t := filepath.Join(lay.root, filepath.FromSlash(p))
			if !tracked[t] {
				tracked[t] = true
				trackedList = append(trackedList, t)
			}
		}
	}
	onDisk := make(map[string]bool, len(scan.files))
	for _, f := range scan.files {
		onDisk[f] = true
	}
	all := append([]string(nil), scan.files...)
	ch.files = append([]string(nil), ch.files...)
	for _, t := range trackedList {
		if onDisk[t] {
			continue
		}
		all = append(all, t)
		// Tracked and gone from the disk: what ls-files --deleted lists.
		if _, err := os.Lstat(t); err != nil {
			ch.files = append(ch.files, t)
		}
	}
	// Every file of the larger set but the named ones is read: those the
	// walk read already, the rest (links, other entries) by the confined
	// reader, as listedDependents reads them.
	others, isTarget := graphFiles(ch, absNames, all)
	var toRead []string
	for _, f := range others {
		if _, read := scan.includes[f]; !read && !isTarget[f] {
			toRead = append(toRead, f)
		}
	}
	incs := scan.includes
	for f, in := range readIncludes(toRead, newDiskReaders().read) {
		incs[f] = in
	}
	// An include of a path the index does not hold may be a deletion
	// staged in the index, unless the index stages nothing against HEAD.
	unstaged := func() bool {
		head, ok := headTree(lay)
		return ok && idx.treeOK && head == idx.tree
	}
	sure := false
	for _, f := range others {
		if isTarget[f] {
			continue
		}
		for _, in := range incs[f] {
			if strings.HasSuffix(in, ".nodal") && !isTarget[in] && !tracked[in] && input.Within(in, lay.root) && !sure {
				if !unstaged() {
					return nil, false
				}
				sure = true
			}
		}
	}
	deps = graphDependents(ch, absNames, all, func(f string) []string { return incs[f] })
	for _, d := range deps {
		if !tracked[d] {
			return nil, false // perhaps ignored
		}
	}
	return deps, true
}
