package main

import (
	"errors"
	"os"
	"path/filepath"
	"testing"
)

// The root found without git is the one git names, from the top level, a
// subfolder, a folder reached through a link and a linked work tree; a
// layout it does not know is left to git, and outside any repository
// neither answers with a root.
func TestWorktreeRootAgreesWithGit(t *testing.T) {
	dir := libRepo(t)
	wt := filepath.Join(t.TempDir(), "wt")
	git(t, dir, "worktree", "add", "-q", wt)
	link := filepath.Join(t.TempDir(), "via")
	if err := os.Symlink(filepath.Join(dir, "boards"), link); err != nil {
		t.Fatal(err)
	}
	for _, where := range []string{dir, filepath.Join(dir, "boards", "deep"), link, wt, filepath.Join(wt, "lib")} {
		t.Run(filepath.Base(where), func(t *testing.T) {
			t.Chdir(where)
			lay, ok, none := fastRoot()
			root, prefix := lay.root, lay.prefix
			if !ok || none {
				t.Fatalf("fastRoot: ok %v, none %v", ok, none)
			}
			groot, gprefix, err := gitRoot(".")
			if err != nil {
				t.Fatal(err)
			}
			if root != groot || prefix != gprefix {
				t.Errorf("fastRoot %q %q, git %q %q", root, prefix, groot, gprefix)
			}
		})
	}

	// Inside .git itself there is no work tree: git says so.
	t.Chdir(filepath.Join(dir, ".git", "refs"))
	if _, ok, none := fastRoot(); ok || none {
		t.Errorf("inside .git: fastRoot ok %v, none %v", ok, none)
	}

	// A .git folder whose config sets the work tree elsewhere is git's to
	// read.
	odd := gitRepo(t)
	git(t, odd, "config", "core.worktree", dir)
	t.Chdir(odd)
	if _, ok, none := fastRoot(); ok || none {
		t.Errorf("core.worktree: fastRoot ok %v, none %v", ok, none)
	}

	outside := t.TempDir()
	t.Chdir(outside)
	if _, _, err := gitRoot("."); err == nil {
		t.Skip("the temporary folder is inside a repository")
	}
	if _, _, err := worktreeRoot(); !errors.Is(err, errNoRepository) {
		t.Errorf("outside a repository: %v", err)
	}
	t.Setenv("GIT_DIR", filepath.Join(dir, ".git"))
	if _, ok, none := fastRoot(); ok || none {
		t.Errorf("GIT_DIR set: fastRoot ok %v, none %v", ok, none)
	}
}
