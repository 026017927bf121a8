package main

import (
	"os"
	"path/filepath"
	"testing"

	"nodal/input"
)

// The per-folder roots of the includers' search are input.TreeRoot's:
// in nested folders, in a nested repository, behind a link inside the
// repository to a folder elsewhere, and outside any repository.
func TestDiskReadersRootIsTreeRoot(t *testing.T) {
	base := t.TempDir()
	repo := filepath.Join(base, "repo")
	other := filepath.Join(base, "elsewhere", "lib")
	for _, d := range []string{
		filepath.Join(repo, ".git"),
		filepath.Join(repo, "a", "b", "c"),
		filepath.Join(repo, "a", "nested", ".git"),
		filepath.Join(repo, "a", "nested", "x", "y"),
		filepath.Join(other, "deep"),
	} {
		if err := os.MkdirAll(d, 0o755); err != nil {
			t.Fatal(err)
		}
	}
	if err := os.Symlink(filepath.Join(base, "elsewhere"), filepath.Join(repo, "a", "link")); err != nil {
		t.Fatal(err)
	}
	dirs := []string{
		filepath.Join(repo, "a", "b", "c"), filepath.Join(repo, "a", "b"), repo,
		filepath.Join(repo, "a", "nested", "x", "y"), filepath.Join(repo, "a", "nested"),
		filepath.Join(repo, "a", "link", "lib", "deep"), filepath.Join(repo, "a", "link", "lib"),
		filepath.Join(other, "deep"), other,
	}
	d := newDiskReaders()
	for _, dir := range dirs {
		want, werr := input.TreeRoot(dir)
		got, gerr := d.treeRoot(dir)
		if got != want || (werr == nil) != (gerr == nil) {
			t.Errorf("%s: root %q (%v), input.TreeRoot %q (%v)", dir, got, gerr, want, werr)
		}
	}
}
