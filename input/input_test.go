package input

import (
	"errors"
	"io/fs"
	"os"
	"path/filepath"
	"strings"
	"syscall"
	"testing"
)

// tree makes root/{repo/.git, repo/a.nodal, repo/sub/b.nodal,
// outside/secret.txt} and returns the repository and the outside folder.
func tree(t *testing.T) (repo, outside string) {
	t.Helper()
	base := t.TempDir()
	repo = filepath.Join(base, "repo")
	outside = filepath.Join(base, "outside")
	for _, d := range []string{filepath.Join(repo, ".git"), filepath.Join(repo, "sub"), outside} {
		if err := os.MkdirAll(d, 0o755); err != nil {
			t.Fatal(err)
		}
	}
	write(t, filepath.Join(repo, "a.nodal"), "ground gnd\n")
	write(t, filepath.Join(repo, "sub", "b.nodal"), "ground gnd\n")
	write(t, filepath.Join(outside, "secret.txt"), "TOPSECRET\n")
	return repo, outside
}

func write(t *testing.T, p, s string) {
	t.Helper()
	if err := os.WriteFile(p, []byte(s), 0o644); err != nil {
		t.Fatal(err)
	}
}

func link(t *testing.T, target, name string) {
	t.Helper()
	if err := os.Symlink(target, name); err != nil {
		t.Skipf("symlinks not available: %v", err)
	}
}

func TestConfinement(t *testing.T) {
	repo, outside := tree(t)
	link(t, outside, filepath.Join(repo, "out"))
	link(t, filepath.Join(outside, "secret.txt"), filepath.Join(repo, "secret.nodal"))
	link(t, filepath.Join(outside, "nosuch.txt"), filepath.Join(repo, "dangling.nodal"))
	link(t, "sub", filepath.Join(repo, "insub"))
	r, err := New([]string{repo}, 0)
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		name string
		want error // nil: readable
	}{
		{"a.nodal", nil},
		{"sub/b.nodal", nil},
		{"insub/b.nodal", nil},
		{"sub/../a.nodal", nil},
		{"../outside/secret.txt", ErrOutside},
		{"sub/../../outside/secret.txt", ErrOutside},
		{filepath.Join(outside, "secret.txt"), ErrOutside},
		{"out/secret.txt", ErrOutside},
		{"secret.nodal", ErrOutside},
		// A missing outside file answers as an existing one does, so
		// that nothing is learnt about the outside.
		{"out/nosuch.txt", ErrOutside},
		{"dangling.nodal", ErrOutside},
		{"../outside/nosuch.txt", ErrOutside},
		{"nosuch.nodal", fs.ErrNotExist},
		{"a.nodal/x", fs.ErrNotExist},
	} {
		p := c.name
		if !filepath.IsAbs(p) {
			p = filepath.Join(repo, p)
		}
		b, err := r.ReadFile(p)
		if c.want == nil {
			if err != nil {
				t.Errorf("%s: %v", c.name, err)
			}
			continue
		}
		if !errors.Is(err, c.want) {
			t.Errorf("%s: error %v, want %v", c.name, err, c.want)
		}
		if strings.Contains(string(b), "TOPSECRET") {
			t.Errorf("%s: read the outside file", c.name)
		}
	}
}

func TestIdentityThroughLinks(t *testing.T) {
	repo, _ := tree(t)
	link(t, ".", filepath.Join(repo, "l1"))
	link(t, ".", filepath.Join(repo, "l2"))
	r, err := New([]string{repo}, 0)
	if err != nil {
		t.Fatal(err)
	}
	a, err := r.Resolve(filepath.Join(repo, "l1", "l2", "l1", "a.nodal"))
	if err != nil {
		t.Fatal(err)
	}
	b, err := r.Resolve(filepath.Join(repo, "a.nodal"))
	if err != nil {
		t.Fatal(err)
	}
	if a != b {
		t.Errorf("same file, two identities: %s and %s", a, b)
	}
}

func TestLinkLoop(t *testing.T) {
	repo, _ := tree(t)
	link(t, "loop2", filepath.Join(repo, "loop1"))
	link(t, "loop1", filepath.Join(repo, "loop2"))
	r, _ := New([]string{repo}, 0)
	if _, err := r.ReadFile(filepath.Join(repo, "loop1")); err == nil || !strings.Contains(err.Error(), "symbolic links") {
		t.Errorf("link loop: %v", err)
	}
}

func TestNotRegular(t *testing.T) {
	repo, _ := tree(t)
	fifo := filepath.Join(repo, "pipe.nodal")
	if err := syscall.Mkfifo(fifo, 0o644); err != nil {
		t.Skipf("no FIFOs here: %v", err)
	}
	r, _ := New([]string{repo}, 0)
	// Returns at once: a FIFO without a writer would block a plain read.
	if _, err := r.ReadFile(fifo); !errors.Is(err, ErrNotRegular) {
		t.Errorf("FIFO: %v, want ErrNotRegular", err)
	}
	if _, err := r.ReadFile(filepath.Join(repo, "sub")); !errors.Is(err, ErrNotRegular) {
		t.Errorf("folder: %v, want ErrNotRegular", err)
	}
	if _, err := os.Stat("/dev/zero"); err == nil {
		link(t, "/dev/zero", filepath.Join(repo, "zero.nodal"))
		root, _ := New([]string{"/"}, 0)
		if _, err := root.ReadFile("/dev/zero"); !errors.Is(err, ErrNotRegular) {
			t.Errorf("/dev/zero with / as root: %v, want ErrNotRegular", err)
		}
		if _, err := ReadRegular("/dev/zero", 0); !errors.Is(err, ErrNotRegular) {
			t.Errorf("ReadRegular /dev/zero: %v, want ErrNotRegular", err)
		}
		if _, err := r.ReadFile(filepath.Join(repo, "zero.nodal")); !errors.Is(err, ErrOutside) {
			t.Errorf("link to /dev/zero: %v, want ErrOutside", err)
		}
	}
	if _, err := ReadRegular(fifo, 0); !errors.Is(err, ErrNotRegular) {
		t.Errorf("ReadRegular FIFO: %v", err)
	}
}

func TestSizeCap(t *testing.T) {
	repo, _ := tree(t)
	write(t, filepath.Join(repo, "big.nodal"), strings.Repeat("x", 101))
	r, _ := New([]string{repo}, 100)
	_, err := r.ReadFile(filepath.Join(repo, "big.nodal"))
	var tl *TooLargeError
	if !errors.As(err, &tl) || tl.Limit != 100 || tl.Size != 101 {
		t.Errorf("101 bytes past a 100-byte cap: %v", err)
	}
	if b, err := r.ReadFile(filepath.Join(repo, "a.nodal")); err != nil || string(b) != "ground gnd\n" {
		t.Errorf("small file: %q, %v", b, err)
	}
	// A stream is cut one byte past the cap: an endless one ends.
	_, err = ReadAll(endless{}, 1000)
	if !errors.As(err, &tl) || tl.Limit != 1000 {
		t.Errorf("endless stream: %v", err)
	}
	if b, err := ReadAll(strings.NewReader("abc"), 3); err != nil || string(b) != "abc" {
		t.Errorf("stream at the cap: %q, %v", b, err)
	}
}

type endless struct{}

func (endless) Read(p []byte) (int, error) {
	for i := range p {
		p[i] = 'z'
	}
	return len(p), nil
}

func TestTreeRoot(t *testing.T) {
	repo, outside := tree(t)
	got, err := TreeRoot(filepath.Join(repo, "sub"))
	want, _ := filepath.EvalSymlinks(repo)
	if err != nil || got != want {
		t.Errorf("TreeRoot(repo/sub) = %q, %v; want %q", got, err, want)
	}
	got, err = TreeRoot(outside)
	want, _ = filepath.EvalSymlinks(outside)
	if err != nil || got != want {
		t.Errorf("TreeRoot(outside) = %q, %v; want %q (outside a repository, the folder itself)", got, err, want)
	}
}
