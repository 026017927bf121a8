package main

import (
	"encoding/hex"
	"os"
	"os/exec"
	"path/filepath"
	"slices"
	"strings"
	"testing"
)

// The index reader lists the paths git lists (git ls-files is the
// reference), in each index version, with unmerged paths once, and holds
// the tree git would write for the index when its cache of trees is whole.
// A split index, a sparse checkout and a damaged file are refused.
func TestIndexReaderAgreesWithGit(t *testing.T) {
	dir := libRepo(t)
	write(t, filepath.Join(dir, "new.nodal"), goodDesign)
	write(t, filepath.Join(dir, "deep", strings.Repeat("d", 200), "far.nodal"), goodDesign)
	git(t, dir, "add", ".")
	index := filepath.Join(dir, ".git", "index")
	for _, version := range []string{"2", "3", "4"} {
		git(t, dir, "update-index", "--index-version", version)
		write(t, filepath.Join(dir, "intent.nodal"), goodDesign)
		git(t, dir, "add", "-N", "intent.nodal") // an extended flag in versions 3 and 4
		x, err := readIndex(index)
		if err != nil {
			t.Fatalf("version %s: %v", version, err)
		}
		want := lsFiles(t, dir)
		if !slices.Equal(x.paths, want) {
			t.Errorf("version %s: read %d paths, git lists %d:\n%q\n%q", version, len(x.paths), len(want), x.paths, want)
		}
		git(t, dir, "rm", "-q", "--cached", "intent.nodal")
	}

	// After a commit the cache of trees holds HEAD's tree; a staged change
	// takes the root out of it.
	git(t, dir, "commit", "-qm", "more")
	x, err := readIndex(index)
	if err != nil {
		t.Fatal(err)
	}
	head := strings.TrimSpace(git(t, dir, "rev-parse", "HEAD^{tree}"))
	if !x.treeOK || hexOID(x.tree) != head {
		t.Errorf("cache of trees after a commit: %v %x, HEAD's tree %s", x.treeOK, x.tree, head)
	}
	git(t, dir, "rm", "-q", "--cached", "new.nodal")
	if x, err := readIndex(index); err != nil || (x.treeOK && hexOID(x.tree) == head) {
		t.Errorf("after a staged deletion the index still claims HEAD's tree (err %v)", err)
	}

	// Unmerged paths are listed once.
	git(t, dir, "reset", "-q", "--hard")
	git(t, dir, "checkout", "-qb", "side")
	write(t, filepath.Join(dir, "boards", "other.nodal"), badDesign)
	git(t, dir, "commit", "-qam", "side")
	git(t, dir, "checkout", "-q", "-")
	write(t, filepath.Join(dir, "boards", "other.nodal"), goodDesign+"# changed\n")
	git(t, dir, "commit", "-qam", "main")
	mergeCmd(dir, "merge", "-q", "side") // stops on the conflict
	if x, err := readIndex(index); err != nil || !slices.Equal(x.paths, lsFiles(t, dir)) || !strings.Contains(git(t, dir, "ls-files", "-s"), " 3\tboards/other.nodal") {
		t.Errorf("unmerged index: %v", err)
	}
	git(t, dir, "merge", "--abort")

	// Layouts left to git.
	damaged, _ := os.ReadFile(index)
	damaged[len(damaged)/2] ^= 1
	if _, err := parseIndex(damaged); err == nil {
		t.Error("a damaged index was read")
	}
	git(t, dir, "update-index", "--skip-worktree", "boards/other.nodal")
	if _, err := readIndex(index); err == nil {
		t.Error("an entry marked skip-worktree was read as a plain one")
	}
	git(t, dir, "update-index", "--no-skip-worktree", "boards/other.nodal")
	git(t, dir, "update-index", "--split-index")
	if _, err := readIndex(index); err == nil {
		t.Error("a split index was read as a whole one")
	}
}

// lsFiles lists the index's paths as git does, each once (git lists an
// unmerged path once per stage).
func lsFiles(t *testing.T, dir string) []string {
	return slices.Compact(strings.Split(strings.TrimSuffix(git(t, dir, "ls-files", "-z"), "\x00"), "\x00"))
}

// mergeCmd runs git where failing is expected.
func mergeCmd(dir string, args ...string) {
	cmd := exec.Command("git", args...)
	cmd.Dir = dir
	cmd.Env = append(os.Environ(), "GIT_CONFIG_GLOBAL=/dev/null", "GIT_CONFIG_NOSYSTEM=1")
	_ = cmd.Run()
}

func hexOID(b [20]byte) string { return hex.EncodeToString(b[:]) }

// HEAD's tree read from the repository's files is the one git names
// (git rev-parse HEAD^{tree}): a loose commit, a packed one, a packed
// branch, a detached HEAD and a linked work tree.
func TestHeadTreeAgreesWithGit(t *testing.T) {
	dir := libRepo(t)
	wt := filepath.Join(t.TempDir(), "wt")
	git(t, dir, "worktree", "add", "-q", wt)
	check := func(what, where string) {
		t.Helper()
		t.Chdir(where)
		lay, ok, _ := fastRoot()
		if !ok {
			t.Fatalf("%s: no layout", what)
		}
		tree, ok := headTree(lay)
		want := strings.TrimSpace(git(t, where, "rev-parse", "HEAD^{tree}"))
		if !ok || hexOID(tree) != want {
			t.Errorf("%s: read %v %x, git says %s", what, ok, tree, want)
		}
	}
	check("loose commit", dir)
	check("linked work tree", wt)
	git(t, dir, "gc", "-q")
	check("packed commit and branch", dir)
	write(t, filepath.Join(dir, "x.nodal"), goodDesign)
	git(t, dir, "add", "x.nodal")
	git(t, dir, "commit", "-qm", "loose again over packed refs")
	check("loose commit, loose branch over packed-refs", dir)
	git(t, dir, "checkout", "-q", "--detach", "HEAD~1")
	check("detached HEAD", dir)

	// Replace refs make git read another commit: left to git.
	git(t, dir, "replace", "HEAD", "HEAD@{1}")
	t.Chdir(dir)
	lay, _, _ := fastRoot()
	if _, ok := headTree(lay); ok {
		t.Error("HEAD read past a replace ref")
	}
}

// fastDependents gives the answer git's listings give (listedDependents)
// whenever it answers, in work trees with untracked, ignored, deleted,
// renamed and staged files, links, a nested repository and a nodal.toml;
// and in a plain tree it does answer.
func TestFastDependentsAgreesWithGit(t *testing.T) {
	type state struct {
		name  string
		setup func(t *testing.T, dir string)
		fast  bool // the walk and the index must settle it alone
	}
	states := []state{
		{"committed", func(t *testing.T, dir string) {}, true},
		{"untracked includer", func(t *testing.T, dir string) {
			write(t, filepath.Join(dir, "boards", "new.nodal"), boardUsingLib)
		}, false},
		{"ignored includer", func(t *testing.T, dir string) {
			write(t, filepath.Join(dir, ".gitignore"), "scratch/\n")
			write(t, filepath.Join(dir, "scratch", "try.nodal"), boardUsingLib)
			git(t, dir, "add", ".gitignore")
			git(t, dir, "commit", "-qm", "ignore")
		}, false},
		{"ignored file that includes nothing", func(t *testing.T, dir string) {
			write(t, filepath.Join(dir, ".gitignore"), "scratch/\n")
			write(t, filepath.Join(dir, "scratch", "try.nodal"), goodDesign)
			git(t, dir, "add", ".gitignore")
			git(t, dir, "commit", "-qm", "ignore")
		}, true},
		{"library deleted in the work tree", func(t *testing.T, dir string) {
			os.Remove(filepath.Join(dir, "lib", "loads.nodal"))
		}, true},
		{"library deletion staged", func(t *testing.T, dir string) {
			git(t, dir, "rm", "-q", "lib/loads.nodal")
		}, false},
		{"library deletion staged, file kept", func(t *testing.T, dir string) {
			git(t, dir, "rm", "-q", "--cached", "lib/loads.nodal")
		}, false},
		{"library renamed", func(t *testing.T, dir string) {
			git(t, dir, "mv", "lib/loads.nodal", "lib/renamed.nodal")
		}, false},
		{"include of a file that never was", func(t *testing.T, dir string) {
			write(t, filepath.Join(dir, "boards", "broken.nodal"), strings.Replace(boardUsingLib, "loads.nodal", "missing.nodal", 1))
			git(t, dir, "add", ".")
			git(t, dir, "commit", "-qm", "broken")
		}, true},
		{"library reached through a linked folder", func(t *testing.T, dir string) {
			if err := os.Symlink("lib", filepath.Join(dir, "shared")); err != nil {
				t.Fatal(err)
			}
			write(t, filepath.Join(dir, "boards", "vialink.nodal"), strings.Replace(boardUsingLib, "../lib/", "../shared/", 1))
			git(t, dir, "add", ".")
			git(t, dir, "commit", "-qm", "link")
		}, true},
		{"linked design file", func(t *testing.T, dir string) {
			if err := os.Symlink("direct.nodal", filepath.Join(dir, "boards", "alias.nodal")); err != nil {
				t.Fatal(err)
			}
			git(t, dir, "add", ".")
			git(t, dir, "commit", "-qm", "alias")
		}, true},
		{"nested repository", func(t *testing.T, dir string) {
			nested := filepath.Join(dir, "vendor", "kit")
			git(t, dir, "init", "-q", nested)
			write(t, filepath.Join(nested, "uses.nodal"), strings.Replace(boardUsingLib, "../lib/", "../../lib/", 1))
		}, false},
		{"staged edit", func(t *testing.T, dir string) {
			write(t, filepath.Join(dir, "boards", "other.nodal"), goodDesign+"# edited\n")
			git(t, dir, "add", ".")
		}, true},
	}
	for _, st := range states {
		t.Run(st.name, func(t *testing.T) {
			dir := libRepo(t)
			st.setup(t, dir)
			t.Chdir(dir)
			lay, ok, _ := fastRoot()
			if !ok {
				t.Fatal("no layout")
			}
			var files []string
			filepath.WalkDir(dir, func(p string, e os.DirEntry, err error) error {
				if e != nil && e.IsDir() && e.Name() == ".git" {
					return filepath.SkipDir
				}
				if strings.HasSuffix(p, ".nodal") {
					files = append(files, p)
				}
				return nil
			})
			answered := 0
			cases := [][]string{{filepath.Join(dir, "lib", "loads.nodal")}, {filepath.Join(dir, "lib", "middle.nodal")}}
			for _, f := range files {
				cases = append(cases, []string{f})
			}
			for _, names := range cases {
				for _, ch := range []changed{{}, {configs: []string{filepath.Join(dir, "boards", "nodal.toml")}}} {
					want, err := listedDependents(lay.root, ch, names)
					if err != nil {
						t.Fatal(err)
					}
					got, ok := fastDependents(lay, ch, names)
					if !ok {
						continue
					}
					answered++
					if !slices.Equal(got, want) {
						t.Errorf("named %v, configs %v: fast %v, git %v", names, ch.configs, got, want)
					}
				}
			}
			if st.fast && answered == 0 {
				t.Error("the walk and the index settled nothing")
			}
		})
	}
}

// BenchmarkFastDependents: the search for includers of one design in this
// repository's own work tree, as a check inside it runs it.
func BenchmarkFastDependents(b *testing.B) {
	lay, ok, _ := fastRoot()
	if !ok {
		b.Skip("not inside a plain git work tree")
	}
	names := []string{filepath.Join(lay.root, "examples", "soil_logger.nodal")}
	if _, ok := fastDependents(lay, changed{}, names); !ok {
		b.Skip("this work tree is left to git")
	}
	for b.Loop() {
		fastDependents(lay, changed{}, names)
	}
}

// BenchmarkScanTree: the walk alone.
func BenchmarkScanTree(b *testing.B) {
	lay, ok, _ := fastRoot()
	if !ok {
		b.Skip("not inside a plain git work tree")
	}
	for b.Loop() {
		if _, err := scanTree(lay.root); err != nil {
			b.Fatal(err)
		}
	}
}

// The walk of a hostile work tree: a pipe named like a design is not
// opened to wait on, and a design that is a link to a file outside (whose
// text would include the library) or sits behind a link to an outside
// folder is not read, so it is no includer, as git's listings with the
// confined reader have it too.
func TestFastDependentsHostileTree(t *testing.T) {
	dir := libRepo(t)
	outside := t.TempDir()
	write(t, filepath.Join(outside, "evil.nodal"), "include \"../lib/loads.nodal\"\n")
	write(t, filepath.Join(outside, "folder", "x.nodal"), "include \"../../lib/loads.nodal\"\n")
	symlink(t, filepath.Join(outside, "evil.nodal"), filepath.Join(dir, "boards", "evil.nodal"))
	symlink(t, filepath.Join(outside, "folder"), filepath.Join(dir, "boards", "ext"))
	git(t, dir, "add", ".")
	git(t, dir, "commit", "-qm", "links")
	fifo(t, filepath.Join(dir, "boards", "pipe.nodal"))
	t.Chdir(dir)
	lay, ok, _ := fastRoot()
	if !ok {
		t.Fatal("no layout")
	}
	names := []string{filepath.Join(dir, "lib", "loads.nodal")}
	got, ok := fastDependents(lay, changed{}, names)
	want, err := listedDependents(lay.root, changed{}, names)
	if err != nil {
		t.Fatal(err)
	}
	if !ok || !slices.Equal(got, want) {
		t.Fatalf("fast %v (answered %v), git %v", got, ok, want)
	}
	for _, d := range got {
		if strings.Contains(d, "evil") || strings.Contains(d, "ext") || strings.Contains(d, "pipe") {
			t.Errorf("%s counted as an includer", d)
		}
	}
	if len(got) != 3 {
		t.Errorf("dependents %v, want direct.nodal, top.nodal and middle.nodal", got)
	}
}
