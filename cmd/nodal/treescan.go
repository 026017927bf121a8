package main

// treescan.go: every .nodal entry of a work tree and the includes of
// each, read by walking the folders through open folder handles. The walk
// never follows a link: a folder is opened relative to its parent with
// O_NOFOLLOW, a file the same way and only when it is a regular file, so
// nothing outside the tree is read however the tree is laid out or
// changed during the walk. Entries that are links or not regular files
// are listed for the caller to read its own confined way. The walk is
// written for Linux (treescan_linux.go); elsewhere scanTree declines and
// git is asked.

import "errors"

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
	buf      []byte // for folder entries
}

// scanTree walks root, which must be a clean absolute path to a folder,
// skipping only entries named .git, and reads every regular .nodal file
// of at most input.DefaultMaxSize bytes (a larger one includes nothing,
// as the confined reader refuses it).
func scanTree(root string) (*treeScan, error) {
	s := &treeScan{includes: map[string][]string{}}
	if err := s.walkRoot(root); err != nil {
		return nil, err
	}
	return s, nil
}
