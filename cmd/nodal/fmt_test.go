package main

import (
	"bytes"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

const unformatted = "ground  gnd\nresistor R1 (a,gnd) 1 kΩ\nresistor R22 (a, gnd)  4k7   tol 1%\n\n\n# end\n"
const formatted = "ground gnd\nresistor R1  (a, gnd) 1 kΩ\nresistor R22 (a, gnd) 4k7  tol 1%\n\n# end\n"

func TestFmtPrints(t *testing.T) {
	dir := t.TempDir()
	p := filepath.Join(dir, "a.nodal")
	if err := os.WriteFile(p, []byte(unformatted), 0o640); err != nil {
		t.Fatal(err)
	}
	var out, errb bytes.Buffer
	if st := run([]string{"fmt", p}, nil, &out, &errb); st != 0 {
		t.Fatalf("status %d, stderr %s", st, errb.String())
	}
	if out.String() != formatted {
		t.Errorf("got %q, want %q", out.String(), formatted)
	}
	if b, _ := os.ReadFile(p); string(b) != unformatted {
		t.Error("fmt without -w changed the file")
	}
	out.Reset()
	if st := run([]string{"fmt", "-"}, strings.NewReader(unformatted), &out, &errb); st != 0 || out.String() != formatted {
		t.Errorf("stdin: status %d, got %q", st, out.String())
	}
}

func TestFmtWriteKeepsMode(t *testing.T) {
	dir := t.TempDir()
	p := filepath.Join(dir, "a.nodal")
	clean := filepath.Join(dir, "b.nodal")
	if err := os.WriteFile(p, []byte(unformatted), 0o640); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(clean, []byte(formatted), 0o600); err != nil {
		t.Fatal(err)
	}
	before, _ := os.Stat(clean)
	var out, errb bytes.Buffer
	if st := run([]string{"fmt", "-w", dir}, nil, &out, &errb); st != 0 {
		t.Fatalf("status %d, stderr %s", st, errb.String())
	}
	b, _ := os.ReadFile(p)
	if string(b) != formatted {
		t.Errorf("rewritten file holds %q", b)
	}
	info, _ := os.Stat(p)
	if info.Mode().Perm() != 0o640 {
		t.Errorf("mode %v, want 0640", info.Mode().Perm())
	}
	if after, _ := os.Stat(clean); !after.ModTime().Equal(before.ModTime()) {
		t.Error("a formatted file was rewritten")
	}
	entries, _ := os.ReadDir(dir)
	if len(entries) != 2 {
		t.Errorf("temporary files left behind: %v", entries)
	}
}

func TestFmtCheck(t *testing.T) {
	dir := t.TempDir()
	p := filepath.Join(dir, "a.nodal")
	if err := os.WriteFile(p, []byte(unformatted), 0o644); err != nil {
		t.Fatal(err)
	}
	var out, errb bytes.Buffer
	if st := run([]string{"fmt", "--check", p}, nil, &out, &errb); st != 1 {
		t.Fatalf("status %d, want 1; stderr %s", st, errb.String())
	}
	for _, want := range []string{"-ground  gnd\n", "+ground gnd\n", "@@ -1,6 +1,5 @@"} {
		if !strings.Contains(out.String(), want) {
			t.Errorf("diff lacks %q:\n%s", want, out.String())
		}
	}
	if b, _ := os.ReadFile(p); string(b) != unformatted {
		t.Error("--check changed the file")
	}
	os.WriteFile(p, []byte(formatted), 0o644)
	out.Reset()
	if st := run([]string{"fmt", "--check", p}, nil, &out, &errb); st != 0 || out.Len() != 0 {
		t.Errorf("formatted file: status %d, output %q", st, out.String())
	}
}

func TestFmtRefuses(t *testing.T) {
	dir := t.TempDir()
	p := filepath.Join(dir, "a.nodal")
	os.WriteFile(p, []byte(unformatted), 0o644)
	link := filepath.Join(dir, "link.nodal")
	if err := os.Symlink(p, link); err != nil {
		t.Skip("no symbolic links here:", err)
	}
	var out, errb bytes.Buffer
	if st := run([]string{"fmt", "-w", link}, nil, &out, &errb); st != 2 || !strings.Contains(errb.String(), "not a regular file") {
		t.Errorf("link: status %d, stderr %q", st, errb.String())
	}
	if st := run([]string{"fmt", "-w", "-"}, strings.NewReader(""), &out, &errb); st != 2 {
		t.Errorf("-w on standard input: status %d", st)
	}
	if b, _ := os.ReadFile(p); string(b) != unformatted {
		t.Error("the link's target was changed")
	}
}
