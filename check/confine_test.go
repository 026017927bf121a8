package check

import (
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// writeTree writes files below dir, making folders as needed.
func writeTree(t *testing.T, dir string, files map[string]string) {
	t.Helper()
	for name, text := range files {
		p := filepath.Join(dir, filepath.FromSlash(name))
		if err := os.MkdirAll(filepath.Dir(p), 0o755); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(p, []byte(text), 0o644); err != nil {
			t.Fatal(err)
		}
	}
}

// The default reader is confined to the repository: an include that
// leaves it, by "..", by an absolute path or through a link, is a
// bad-include that names the path as written and nothing of the file.
func TestIncludeConfinedToRepository(t *testing.T) {
	base := t.TempDir()
	repo := filepath.Join(base, "repo")
	writeTree(t, base, map[string]string{
		"repo/.git/HEAD":     "",
		"outside/secret.txt": "TOPSECRET_WORD and more\n",
		"outside/lib.nodal":  "block TOPSECRET_BLOCK (a, b) {\n  resistor R (a, b) 1 kΩ\n}\n",
	})
	if err := os.Symlink(filepath.Join(base, "outside"), filepath.Join(repo, "out")); err != nil {
		t.Skipf("no symlinks: %v", err)
	}
	for _, inc := range []string{
		"../outside/secret.txt",
		filepath.ToSlash(filepath.Join(base, "outside", "secret.txt")),
		"out/secret.txt",
		"out/lib.nodal",
		"out/nosuch.nodal", // answered as an existing file is
		"sub/../../outside/lib.nodal",
	} {
		top := filepath.Join(repo, "top.nodal")
		writeTree(t, repo, map[string]string{"top.nodal": fmt.Sprintf("include %q\nground gnd\n", inc)})
		r, err := File(top, nil)
		if err != nil {
			t.Fatal(err)
		}
		wantOne(t, r, "bad-include", "leads outside", fmt.Sprintf("%q", inc))
		for _, l := range lines(r) {
			if strings.Contains(l, "TOPSECRET") {
				t.Errorf("include %s: output shows the outside file: %s", inc, l)
			}
		}
		if len(r.Build.Files) != 1 {
			t.Errorf("include %s: %d files read", inc, len(r.Build.Files)-1)
		}
	}
}

// Two links to the repository's own folder make every include path new
// text; by identity each file is still read once. On main this design of
// 22 files read 2^22 files and did not finish.
func TestIncludeFanOutThroughLinksReadsEachFileOnce(t *testing.T) {
	repo := t.TempDir()
	const n = 22
	files := map[string]string{".git/HEAD": ""}
	for i := 0; i < n; i++ {
		s := ""
		if i+1 < n {
			s = fmt.Sprintf("include \"l1/f%d.nodal\"\ninclude \"l2/f%d.nodal\"\n", i+1, i+1)
		}
		files[fmt.Sprintf("f%d.nodal", i)] = s + "ground gnd\n"
	}
	writeTree(t, repo, files)
	for _, l := range []string{"l1", "l2"} {
		if err := os.Symlink(".", filepath.Join(repo, l)); err != nil {
			t.Skipf("no symlinks: %v", err)
		}
	}
	r, err := File(filepath.Join(repo, "f0.nodal"), nil)
	if err != nil {
		t.Fatal(err)
	}
	if got := len(r.Build.Files) - 1; got != n-1 {
		t.Errorf("%d files read for %d distinct included files", got, n-1)
	}
}

// A chain of 30 000 files, each including the next: each is identified
// and read exactly once, and the cycle check is a look-up, not a scan of
// the chain so far (main scanned it: quadratic, 24 s).
func TestLongIncludeChainLinear(t *testing.T) {
	const n = 30000
	files := map[string]string{}
	for i := 0; i < n; i++ {
		s := "ground gnd\n"
		if i+1 < n {
			s = fmt.Sprintf("include \"f%d.nodal\"\n", i+1)
		}
		files[fmt.Sprintf("lib/f%d.nodal", i)] = s
	}
	reads, ids := 0, 0
	read := memFiles(files)
	opt := &Options{
		ReadFile: func(p string) ([]byte, error) { reads++; return read(p) },
		Identify: func(p string) (string, error) { ids++; return filepath.Clean(p), nil },
	}
	r, err := File("lib/f0.nodal", opt)
	if err != nil {
		t.Fatal(err)
	}
	if reads != n || ids != n { // the top file, then each include
		t.Errorf("%d reads and %d identifications for a chain of %d files", reads, ids, n)
	}
	if len(r.Build.Files)-1 != n-1 {
		t.Errorf("%d files included, want %d", len(r.Build.Files)-1, n-1)
	}
}
