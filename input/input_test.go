package input

import (
	"errors"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"strings"
	"syscall"
	"testing"
	"time"
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

// changing is an open file that something changes as its first read
// begins.
type changing struct {
	*os.File
	change func()
}

func (c *changing) Read(p []byte) (int, error) {
	if c.change != nil {
		c.change()
		c.change = nil
	}
	return c.File.Read(p)
}

func TestChangedWhileRead(t *testing.T) {
	const text = "ground gnd\nresistor R1 a gnd 1 kohm\n"
	for _, c := range []struct {
		name   string
		max    int64
		change func(t *testing.T, p string)
		want   error // nil: the text is read
	}{
		{"unchanged", 100, func(*testing.T, string) {}, nil},
		{"grows", 100, func(t *testing.T, p string) { appendTo(t, p, "ground g2\n") }, ErrChanged},
		{"grows past the cap", int64(len(text)) + 2, func(t *testing.T, p string) { appendTo(t, p, "ground g2\n") }, &TooLargeError{}},
		{"shrinks", 100, func(t *testing.T, p string) {
			if err := os.Truncate(p, 5); err != nil {
				t.Fatal(err)
			}
		}, ErrChanged},
		{"rewritten at the same size", 100, func(t *testing.T, p string) {
			info, err := os.Stat(p)
			if err != nil {
				t.Fatal(err)
			}
			write(t, p, strings.ToUpper(text))
			later := info.ModTime().Add(time.Hour)
			if err := os.Chtimes(p, later, later); err != nil {
				t.Fatal(err)
			}
		}, ErrChanged},
	} {
		t.Run(c.name, func(t *testing.T) {
			p := filepath.Join(t.TempDir(), "a.nodal")
			write(t, p, text)
			f, err := os.Open(p)
			if err != nil {
				t.Fatal(err)
			}
			defer f.Close()
			info, err := f.Stat()
			if err != nil {
				t.Fatal(err)
			}
			b, err := readOpen(&changing{File: f, change: func() { c.change(t, p) }}, info, c.max)
			var tl *TooLargeError
			switch want := c.want.(type) {
			case nil:
				if err != nil || string(b) != text {
					t.Errorf("got %q, %v; want the text", b, err)
				}
			case *TooLargeError:
				if !errors.As(err, &tl) || tl.Limit != c.max {
					t.Errorf("got %v, want a file past the cap of %d", err, c.max)
				}
			default:
				if !errors.Is(err, want) {
					t.Errorf("got %q, %v; want %v", b, err, want)
				}
			}
			if err != nil && b != nil {
				t.Errorf("refused, yet returned %q", b)
			}
		})
	}
}

func appendTo(t *testing.T, p, s string) {
	t.Helper()
	f, err := os.OpenFile(p, os.O_APPEND|os.O_WRONLY, 0)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	if _, err := f.WriteString(s); err != nil {
		t.Fatal(err)
	}
}

// A redirected standard input is a regular file: ReadAll reads what is
// left of it from where it stands, within the cap.
func TestReadAllRegularFile(t *testing.T) {
	p := filepath.Join(t.TempDir(), "in.nodal")
	write(t, p, "ground gnd\n")
	f, err := os.Open(p)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	if _, err := f.Seek(7, io.SeekStart); err != nil {
		t.Fatal(err)
	}
	if b, err := ReadAll(f, 100); err != nil || string(b) != "gnd\n" {
		t.Errorf("from byte 7: %q, %v", b, err)
	}
	if _, err := f.Seek(0, io.SeekStart); err != nil {
		t.Fatal(err)
	}
	var tl *TooLargeError
	if _, err := ReadAll(f, 10); !errors.As(err, &tl) || tl.Limit != 10 {
		t.Errorf("11 bytes past a 10-byte cap: %v", err)
	}
	if b, err := ReadAll(f, 100); err != nil || len(b) != 0 {
		t.Errorf("at the end: %q, %v", b, err)
	}
}

// A file that states no size (a virtual file) is still read, to its end.
func TestReadNoStatedSize(t *testing.T) {
	const p = "/proc/self/status"
	info, err := os.Stat(p)
	if err != nil || info.Size() != 0 {
		t.Skipf("no sizeless virtual file here: %v", err)
	}
	b, err := ReadRegular(p, 0)
	if err != nil || !strings.Contains(string(b), "Name:") {
		t.Errorf("%s: %d bytes, %v", p, len(b), err)
	}
}
