package main

import (
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"
)

// An invented library of one block and a board that uses it. libRenamed
// renames the block, so the board's instance names a block that no longer
// exists: an error in the board, while the library alone is clean.
const (
	libLoad = `# shared load stages
block stage (a, b) {
  resistor R (a, b) 1 kΩ
}
`
	libRenamed = `# shared load stages
block dummy_load (a, b) {
  resistor R (a, b) 1 kΩ
}
`
	boardUsingLib = `include "../lib/loads.nodal"
ground gnd
source V1 (vin, gnd) 5 V
stage L1 (vin, gnd)
`
	// middle.nodal includes the library; top.nodal includes middle.nodal.
	libMiddle = `include "loads.nodal"
`
)

// libRepo makes a repository with a library, a board that includes it
// directly, a board that reaches it through another library, and an
// unrelated board, all committed.
func libRepo(t *testing.T) string {
	t.Helper()
	dir := gitRepo(t)
	write(t, filepath.Join(dir, "lib", "loads.nodal"), libLoad)
	write(t, filepath.Join(dir, "lib", "middle.nodal"), libMiddle)
	write(t, filepath.Join(dir, "boards", "direct.nodal"), boardUsingLib)
	write(t, filepath.Join(dir, "boards", "deep", "top.nodal"), strings.Replace(boardUsingLib, "../lib/loads.nodal", "../../lib/middle.nodal", 1))
	write(t, filepath.Join(dir, "boards", "other.nodal"), goodDesign)
	write(t, filepath.Join(dir, "lib", "unused.nodal"), libLoad)
	git(t, dir, "add", ".")
	git(t, dir, "commit", "-qm", "boards")
	return dir
}

// A library change staged alone is caught through the designs that
// include it, directly and through another file.
func TestStagedLibraryChangeChecksIncluders(t *testing.T) {
	dir := libRepo(t)
	write(t, filepath.Join(dir, "lib", "loads.nodal"), libRenamed)
	git(t, dir, "add", "lib/loads.nodal")
	// The work tree goes back to the old library: --staged must read the
	// index, for the library and for the graph alike.
	write(t, filepath.Join(dir, "lib", "loads.nodal"), libLoad)
	for _, args := range [][]string{
		{"check", "--staged"},
		{"check", "--staged", "lib/loads.nodal"},
	} {
		code, out, errs := runNodal(t, dir, "", args...)
		if code != 1 {
			t.Errorf("%v: exit %d, want 1 (the boards use a block that is gone)\n%s%s", args, code, out, errs)
		}
		for _, want := range []string{"boards/direct.nodal:4:1: error: ", "boards/deep/top.nodal:4:1: error: "} {
			if !strings.Contains(out, want) {
				t.Errorf("%v: output lacks %q:\n%s", args, want, out)
			}
		}
		// loads.nodal, middle.nodal, direct.nodal and top.nodal; not
		// other.nodal or unused.nodal.
		if strings.Contains(out, "other.nodal") || !strings.Contains(errs, "in 4 files") {
			t.Errorf("%v: wrong files checked: %s", args, errs)
		}
		if !strings.Contains(errs, "also checking") {
			t.Errorf("%v: no note of the designs added: %s", args, errs)
		}
	}
	// A library that no design includes is checked on its own, as before.
	write(t, filepath.Join(dir, "lib", "unused.nodal"), libRenamed)
	git(t, dir, "add", "lib/unused.nodal")
	code, out, errs := runNodal(t, dir, "", "check", "--staged", "lib/unused.nodal")
	if code != 0 || !strings.Contains(errs, "in 1 file") || strings.Contains(errs, "also checking") {
		t.Errorf("unused library: exit %d\n%s%s", code, out, errs)
	}
}

// A library deleted in the index leaves its includers with an include that
// cannot be followed; they are checked and fail.
func TestStagedLibraryDeletionChecksIncluders(t *testing.T) {
	dir := libRepo(t)
	git(t, dir, "rm", "-q", "lib/loads.nodal")
	for _, args := range [][]string{{"check", "--staged"}, {"check", "--staged", "boards/other.nodal"}} {
		code, out, errs := runNodal(t, dir, "", args...)
		if code != 1 || !strings.Contains(out, "boards/direct.nodal:1:1: error: ") || !strings.Contains(out, "[bad-include]") {
			t.Errorf("%v: exit %d\n%s%s", args, code, out, errs)
		}
	}
	// A staged rename takes the old name away the same way.
	git(t, dir, "reset", "-q", "--hard")
	git(t, dir, "mv", "lib/loads.nodal", "lib/renamed.nodal")
	for _, args := range [][]string{{"check", "--staged"}, {"check", "--staged", "boards/other.nodal"}} {
		code, out, errs := runNodal(t, dir, "", args...)
		if code != 1 || !strings.Contains(out, "boards/direct.nodal:1:1: error: ") {
			t.Errorf("rename, %v: exit %d\n%s%s", args, code, out, errs)
		}
	}
}

// A staged nodal.toml brings in the designs below its folder.
func TestStagedConfigChecksDesignsBelow(t *testing.T) {
	dir := libRepo(t)
	write(t, filepath.Join(dir, "boards", "other.nodal"), badDesign)
	write(t, filepath.Join(dir, "boards", "nodal.toml"), "[rules]\nsource-loop = \"note\"\n")
	git(t, dir, "add", ".")
	git(t, dir, "commit", "-qm", "loop accepted as a note")
	git(t, dir, "rm", "-q", "boards/nodal.toml")
	code, out, errs := runNodal(t, dir, "", "check", "--staged")
	if code != 1 || !strings.Contains(out, "boards/other.nodal:4:1: error: ") {
		t.Errorf("removing the nodal.toml that made the loop a note: exit %d\n%s%s", code, out, errs)
	}
}

// A library deleted (in the work tree, or with the deletion staged)
// brings in its includers whatever file is named.
func TestDeletedLibraryChecksIncluders(t *testing.T) {
	dir := libRepo(t)
	git(t, dir, "rm", "-q", "lib/loads.nodal")
	code, out, errs := runNodal(t, dir, "", "check", "boards/other.nodal")
	if code != 1 || !strings.Contains(out, "boards/direct.nodal:1:1: error: ") || !strings.Contains(out, "boards/deep/top.nodal") {
		t.Errorf("staged deletion: exit %d\n%s%s", code, out, errs)
	}
	git(t, dir, "reset", "-q", "HEAD", "lib/loads.nodal")
	code, out, errs = runNodal(t, dir, "", "check", "boards/other.nodal")
	if code != 1 || !strings.Contains(out, "boards/direct.nodal:1:1: error: ") {
		t.Errorf("deleted in the work tree: exit %d\n%s%s", code, out, errs)
	}
	git(t, dir, "checkout", "lib/loads.nodal")
	code, out, errs = runNodal(t, dir, "", "check", "boards/other.nodal")
	if code != 0 || !strings.Contains(errs, "in 1 file") {
		t.Errorf("nothing deleted: exit %d\n%s%s", code, out, errs)
	}
	// A staged rename takes the old name away as a deletion does, though
	// git's diff shows it as a rename.
	git(t, dir, "mv", "lib/loads.nodal", "lib/renamed.nodal")
	code, out, errs = runNodal(t, dir, "", "check", "boards/other.nodal")
	if code != 1 || !strings.Contains(out, "boards/direct.nodal:1:1: error: ") || !strings.Contains(out, "boards/deep/top.nodal") {
		t.Errorf("staged rename: exit %d\n%s%s", code, out, errs)
	}
}

// In the work tree, a named library brings in its includers, with paths
// relative to the current folder.
func TestNamedLibraryChecksIncluders(t *testing.T) {
	dir := libRepo(t)
	write(t, filepath.Join(dir, "lib", "loads.nodal"), libRenamed)
	code, out, errs := runNodal(t, filepath.Join(dir, "lib"), "", "check", "loads.nodal")
	if code != 1 || !strings.Contains(out, "../boards/direct.nodal:4:1: error: ") || !strings.Contains(out, "../boards/deep/top.nodal:4:1: error: ") {
		t.Errorf("exit %d\n%s%s", code, out, errs)
	}
	code, out, errs = runNodal(t, dir, "", "check", "lib/unused.nodal")
	if code != 0 || !strings.Contains(errs, "in 1 file") {
		t.Errorf("unused library: exit %d\n%s%s", code, out, errs)
	}
}

// The pre-commit framework, with a local hook of language system running
// this package's binary with the entry and file pattern of
// .pre-commit-hooks.yaml: committing a library change alone is blocked
// because a board that includes it breaks.
func TestPreCommitFrameworkFollowsIncludes(t *testing.T) {
	if testing.Short() {
		t.Skip("builds the binary and runs pre-commit")
	}
	if _, err := exec.LookPath("pre-commit"); err != nil {
		t.Skip("pre-commit is not installed (Debian: apt-get install pre-commit; .ci/run installs it where it can)")
	}
	entry, files := hookDefinition(t)
	dir := libRepo(t)
	bin := filepath.Join(t.TempDir(), "nodal")
	if out, err := exec.Command("go", "build", "-o", bin, ".").CombinedOutput(); err != nil {
		t.Fatalf("go build: %v\n%s", err, out)
	}
	entry = strings.Replace(entry, "nodal", bin, 1)
	cfg := "repos:\n  - repo: local\n    hooks:\n      - id: nodal-check\n        name: nodal check\n" +
		"        entry: " + entry + "\n        language: system\n        files: '" + files + "'\n        require_serial: true\n"
	write(t, filepath.Join(dir, ".pre-commit-config.yaml"), cfg)
	env := append(os.Environ(), "GIT_CONFIG_GLOBAL=/dev/null", "GIT_CONFIG_NOSYSTEM=1",
		"PRE_COMMIT_HOME="+filepath.Join(t.TempDir(), "cache"), "PRE_COMMIT_COLOR=never")
	run := func(args ...string) (string, error) {
		cmd := exec.Command(args[0], args[1:]...)
		cmd.Dir = dir
		cmd.Env = env
		out, err := cmd.CombinedOutput()
		return string(out), err
	}
	git(t, dir, "add", ".pre-commit-config.yaml")
	git(t, dir, "commit", "-qm", "hook config")
	if out, err := run("pre-commit", "install"); err != nil {
		t.Fatalf("pre-commit install: %v\n%s", err, out)
	}

	// Only the library is staged; the framework passes only its name.
	write(t, filepath.Join(dir, "lib", "loads.nodal"), libRenamed)
	git(t, dir, "add", "lib/loads.nodal")
	out, err := run("git", "commit", "-m", "rename the load block")
	if err == nil {
		t.Fatalf("the hook let a library change through that breaks its includers:\n%s", out)
	}
	if !strings.Contains(out, "boards/direct.nodal:4:1: error: ") || !strings.Contains(out, "boards/deep/top.nodal:4:1: error: ") {
		t.Errorf("hook output does not name the broken boards:\n%s", out)
	}

	// A change to a library nobody includes passes, checked alone.
	git(t, dir, "reset", "-q", "lib/loads.nodal")
	write(t, filepath.Join(dir, "lib", "loads.nodal"), libLoad)
	write(t, filepath.Join(dir, "lib", "unused.nodal"), libRenamed)
	git(t, dir, "add", "lib/unused.nodal")
	if out, err := run("git", "commit", "-m", "rename an unused block"); err != nil {
		t.Fatalf("hook blocked a change to an unused library: %v\n%s", err, out)
	}

	// The framework never names a deleted file; once the hook runs, the
	// includers of a library deleted in the same commit are checked.
	git(t, dir, "rm", "-q", "lib/loads.nodal")
	write(t, filepath.Join(dir, "boards", "other.nodal"), goodDesign+"# touched\n")
	git(t, dir, "add", "boards/other.nodal")
	out, err = run("git", "commit", "-m", "delete the loads library")
	if err == nil || !strings.Contains(out, "boards/direct.nodal:1:1: error: ") {
		t.Errorf("the hook let a library deletion through that breaks its includers: %v\n%s", err, out)
	}
}

// hookDefinition reads the entry and the file pattern of the hook this
// repository offers the pre-commit framework.
func hookDefinition(t *testing.T) (entry, files string) {
	t.Helper()
	src, err := os.ReadFile(filepath.Join("..", "..", ".pre-commit-hooks.yaml"))
	if err != nil {
		t.Fatal(err)
	}
	for _, line := range strings.Split(string(src), "\n") {
		k, v, ok := strings.Cut(strings.TrimSpace(line), ":")
		if !ok {
			continue
		}
		v = strings.Trim(strings.TrimSpace(v), `'"`)
		switch k {
		case "entry":
			entry = v
		case "files":
			files = v
		}
	}
	if entry == "" || files == "" {
		t.Fatalf(".pre-commit-hooks.yaml has no entry or files:\n%s", src)
	}
	return entry, files
}

// A current folder reached through a link still finds the includers: git
// names the repository by its real path.
func TestNamedLibraryThroughLinkedFolder(t *testing.T) {
	dir := libRepo(t)
	write(t, filepath.Join(dir, "lib", "loads.nodal"), libRenamed)
	link := filepath.Join(t.TempDir(), "link")
	if err := os.Symlink(dir, link); err != nil {
		t.Skip("cannot make a symbolic link here:", err)
	}
	// os.Getwd answers with $PWD when it names the current folder, as a
	// shell that followed the link would set it.
	t.Setenv("PWD", filepath.Join(link, "lib"))
	code, out, errs := runNodal(t, filepath.Join(link, "lib"), "", "check", "loads.nodal")
	if code != 1 || !strings.Contains(out, "../boards/direct.nodal:4:1: error: ") {
		t.Errorf("exit %d\n%s%s", code, out, errs)
	}
}

// git grep's -z records name a file before a NUL, so a name may hold a
// space or a newline.
func TestParseGrepZ(t *testing.T) {
	out := "a b.nodal\x00include \"x.nodal\"\nodd\nname.nodal\x00  include \"y.nodal\"\na b.nodal\x00# include nothing\n"
	got, err := parseGrepZ([]byte(out))
	if err != nil {
		t.Fatal(err)
	}
	if len(got) != 2 || string(got["a b.nodal"]) != "include \"x.nodal\"\n# include nothing\n" || string(got["odd\nname.nodal"]) != "  include \"y.nodal\"\n" {
		t.Errorf("parsed %q", got)
	}
	if _, err := parseGrepZ([]byte("no separator")); err == nil {
		t.Error("output without a NUL was accepted")
	}
}

// The note that names the designs added keeps a hostile name on its line.
func TestDependentsNoteEscapesNames(t *testing.T) {
	dir := libRepo(t)
	odd := "boards/odd\nname\x1b[31m.nodal"
	write(t, filepath.Join(dir, filepath.FromSlash(odd)), boardUsingLib)
	git(t, dir, "add", ".")
	_, _, errs := runNodal(t, filepath.Join(dir, "lib"), "", "check", "loads.nodal")
	for _, line := range strings.Split(strings.TrimSpace(errs), "\n") {
		if strings.Contains(line, "\x1b") || strings.HasPrefix(line, "name") {
			t.Errorf("stderr line %q", line)
		}
	}
	if !strings.Contains(errs, `odd\nname\x1b[31m.nodal`) {
		t.Errorf("the odd name is not shown escaped:\n%s", errs)
	}
}

// Inside a repository git cannot be asked about (here: no git on the
// path), the includers are found where the work tree and git's index
// settle them alone; where they do not (an untracked includer, which git
// may ignore), the includers are not looked for, and a note says so.
func TestDependentsWithoutGitSaysSo(t *testing.T) {
	dir := libRepo(t)
	t.Setenv("PATH", t.TempDir())
	code, _, errs := runNodal(t, dir, "", "check", "lib/loads.nodal")
	if code != 0 || !strings.Contains(errs, "also checking 3 designs") || strings.Contains(errs, "not looked for") {
		t.Errorf("plain work tree: exit %d, stderr %q", code, errs)
	}
	write(t, filepath.Join(dir, "boards", "new.nodal"), boardUsingLib)
	code, _, errs = runNodal(t, dir, "", "check", "lib/loads.nodal")
	if code != 0 || !strings.Contains(errs, "note: designs that include the named files were not looked for") {
		t.Errorf("untracked includer: exit %d, stderr %q", code, errs)
	}
}
