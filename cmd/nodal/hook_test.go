package main

import (
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"
)

// The plain git route: the pre-commit script the README shows, installed
// in a temporary repository, runs this package's binary on the staged
// content. It blocks a bad change, passes a good one, and lints the staged
// version of a partly staged file.
func TestPreCommitHook(t *testing.T) {
	if testing.Short() {
		t.Skip("builds the binary")
	}
	dir := gitRepo(t)
	bin := filepath.Join(t.TempDir(), "nodal")
	if out, err := exec.Command("go", "build", "-o", bin, ".").CombinedOutput(); err != nil {
		t.Fatalf("go build: %v\n%s", err, out)
	}
	hook := "#!/bin/sh\n# nodal pre-commit hook: check what is about to be committed.\nexec \"" + bin + "\" check --staged\n"
	write(t, filepath.Join(dir, ".git", "hooks", "pre-commit"), hook)
	if err := os.Chmod(filepath.Join(dir, ".git", "hooks", "pre-commit"), 0o755); err != nil {
		t.Fatal(err)
	}
	commit := func(msg string) (string, error) {
		cmd := exec.Command("git", "commit", "-qm", msg)
		cmd.Dir = dir
		cmd.Env = append(os.Environ(), "GIT_CONFIG_GLOBAL=/dev/null", "GIT_CONFIG_NOSYSTEM=1")
		out, err := cmd.CombinedOutput()
		return string(out), err
	}

	// A good change passes.
	write(t, filepath.Join(dir, "boards", "psu.nodal"), goodDesign)
	git(t, dir, "add", ".")
	if out, err := commit("good"); err != nil {
		t.Fatalf("hook blocked a good change: %v\n%s", err, out)
	}

	// A bad change is blocked, and the message names the repository path.
	write(t, filepath.Join(dir, "boards", "psu.nodal"), badDesign)
	git(t, dir, "add", ".")
	out, err := commit("bad")
	if err == nil {
		t.Fatal("hook let a design with an error through")
	}
	if !strings.Contains(out, "boards/psu.nodal:4:1: error: ") {
		t.Errorf("hook output does not name the finding: %s", out)
	}

	// Partly staged: the good version is staged, the bad one only in the
	// work tree. The hook checks the staged one and lets it through.
	write(t, filepath.Join(dir, "boards", "psu.nodal"), goodDesign+"# staged\n")
	git(t, dir, "add", ".")
	write(t, filepath.Join(dir, "boards", "psu.nodal"), badDesign)
	if out, err := commit("partly staged, good in the index"); err != nil {
		t.Fatalf("hook checked the work tree, not the index: %v\n%s", err, out)
	}
	// And the reverse: bad in the index, fixed only in the work tree.
	git(t, dir, "add", ".")
	write(t, filepath.Join(dir, "boards", "psu.nodal"), goodDesign)
	if out, err := commit("partly staged, bad in the index"); err == nil {
		t.Fatalf("hook passed a bad staged version:\n%s", out)
	}
}

// nodal.toml is read from the index too, and named files map to
// repository paths from a subfolder.
func TestStagedConfigAndSubfolder(t *testing.T) {
	dir := gitRepo(t)
	write(t, filepath.Join(dir, "nodal.toml"), "[rules]\nsource-loop = \"note\"\n")
	write(t, filepath.Join(dir, "boards", "psu.nodal"), badDesign)
	git(t, dir, "add", ".")
	// The work tree's nodal.toml differs from the staged one.
	write(t, filepath.Join(dir, "nodal.toml"), "[rules]\nsource-loop = \"error\"\n")
	code, out, errs := runNodal(t, filepath.Join(dir, "boards"), "", "check", "--staged", "psu.nodal")
	if code != 0 || !strings.HasPrefix(out, "boards/psu.nodal:4:1: note: ") {
		t.Errorf("exit %d, out %q, err %q", code, out, errs)
	}
}

// Named paths with --staged: a staged file is checked, a path git's index
// has never held is a typo (exit 2), and a file removed with "git rm" is a
// deletion the hook passes on, skipped quietly.
func TestStagedNamedPaths(t *testing.T) {
	dir := gitRepo(t)
	write(t, filepath.Join(dir, "boards", "psu.nodal"), goodDesign)
	write(t, filepath.Join(dir, "boards", "old.nodal"), goodDesign)
	git(t, dir, "add", ".")
	git(t, dir, "commit", "-q", "-m", "boards")
	git(t, dir, "rm", "-q", filepath.Join("boards", "old.nodal"))
	sub := filepath.Join(dir, "boards")
	code, _, errs := runNodal(t, sub, "", "check", "--staged", "psu.nodal", "old.nodal")
	if code != 0 || !strings.Contains(errs, "in 1 file") {
		t.Errorf("staged + deleted: exit %d, stderr %q; want 0 and one file checked", code, errs)
	}
	code, _, errs = runNodal(t, sub, "", "check", "--staged", "psu.nodal", "typo.nodal")
	if code != 2 || !strings.Contains(errs, "typo.nodal: not in git's index") {
		t.Errorf("typo: exit %d, stderr %q; want 2 and the path named", code, errs)
	}
}
