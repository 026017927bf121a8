package check_test

import (
	"bytes"
	"fmt"
	"io/fs"
	"os"
	"path"
	"path/filepath"
	"strings"
	"testing"

	"nodal/check"
	"nodal/diag"
	"nodal/input"
)

// memTree is an in-memory file system for a fuzzed hierarchy: files under
// "root/", confined there as the disk reader confines a check to its
// repository, with every read and identification counted.
type memTree struct {
	files    map[string][]byte
	allowed  map[string]bool // identities handed out
	reads    map[string]int
	outside  int
	readBad  []string // reads of paths never identified, or refused
	maxReads int
}

func (m *memTree) identify(p string) (string, error) {
	c := path.Clean(filepath.ToSlash(p))
	if c != "root" && !strings.HasPrefix(c, "root/") {
		m.outside++
		return "", &fs.PathError{Op: "read", Path: p, Err: input.ErrOutside}
	}
	if _, ok := m.files[c]; !ok {
		return "", &fs.PathError{Op: "read", Path: p, Err: fs.ErrNotExist}
	}
	m.allowed[c] = true
	return c, nil
}

func (m *memTree) read(p string) ([]byte, error) {
	c := path.Clean(filepath.ToSlash(p))
	if !m.allowed[c] {
		m.readBad = append(m.readBad, p)
		return nil, fs.ErrPermission
	}
	m.reads[c]++
	m.maxReads = max(m.maxReads, m.reads[c])
	return m.files[c], nil
}

// splitFiles turns fuzz input into a hierarchy: parts separated by a NUL
// byte are root/top.nodal, root/lib/f1.nodal, root/lib/f2.nodal, …
func splitFiles(data []byte) map[string][]byte {
	files := map[string][]byte{}
	for i, part := range bytes.Split(data, []byte{0}) {
		name := "root/top.nodal"
		if i > 0 {
			name = fmt.Sprintf("root/lib/f%d.nodal", i)
		}
		files[name] = part
		if i == 8 {
			break
		}
	}
	return files
}

// FuzzHierarchy checks multi-file designs held in memory: blocks, includes
// (by relative, absolute and escaping paths, and in cycles) and instances.
// Nothing may panic; every finding points inside the file it names; no file
// is read before it is identified, none outside the root is read, and each
// is read at most once.
//
//	go test -run='^$' -fuzz=FuzzHierarchy -fuzztime=3m ./check/
func FuzzHierarchy(f *testing.F) {
	var lib [][]byte
	for _, pattern := range []string{"../testdata/hier/*/*.nodal", "../testdata/hier/*/*/*.nodal", "../examples/led_panel/*.nodal", "../examples/led_panel/lib/*.nodal"} {
		names, _ := filepath.Glob(pattern)
		for _, n := range names {
			b, err := os.ReadFile(n)
			if err != nil {
				f.Fatal(err)
			}
			lib = append(lib, b)
		}
	}
	for i := range lib {
		f.Add(bytes.Join([][]byte{lib[i], lib[(i+1)%len(lib)]}, []byte{0}))
	}
	f.Add([]byte("include \"lib/f1.nodal\"\nground gnd\nsource V1 (a, gnd) 5 V\nstage S1 (a, gnd) [r = 2 kΩ]\n\x00" +
		"include \"f2.nodal\"\nblock stage (p, q) [r = 1 kΩ] {\n  resistor R (p, q) r\n}\n\x00include \"f1.nodal\"\n"))
	f.Add([]byte("include \"../../etc/passwd\"\ninclude \"/root/top.nodal\"\ninclude \"lib/../top.nodal\"\nground gnd\n\x00"))
	f.Add([]byte("include \"lib/f1.nodal\"\ninclude \"lib/./f1.nodal\"\ninclude \"lib//f1.nodal\"\n\x00block b (x) {\n  b B (x)\n}\n"))
	f.Fuzz(func(t *testing.T, data []byte) {
		m := &memTree{files: splitFiles(data), allowed: map[string]bool{}, reads: map[string]int{}}
		top := m.files["root/top.nodal"]
		res, err := check.Source("root/top.nodal", top, &check.Options{ReadFile: m.read, Identify: m.identify, MaxParts: 2_000, NoSuppress: true})
		if err != nil {
			t.Fatalf("internal error: %v", err)
		}
		if len(m.readBad) > 0 {
			t.Fatalf("read without identification or after a refusal: %q", m.readBad)
		}
		if m.maxReads > 1 {
			t.Fatalf("a file read %d times", m.maxReads)
		}
		for _, d := range res.Diags {
			p := res.Fset.Position(d.Pos)
			if !p.IsValid() || p.Column < 1 {
				t.Fatalf("finding without a position: %+v", d)
			}
			src, ok := m.files[path.Clean(filepath.ToSlash(p.Filename))]
			if !ok {
				t.Fatalf("finding in a file that was not read: %s", p.Filename)
			}
			if p.Offset > len(src) || p.Line > bytes.Count(src, []byte("\n"))+1 {
				t.Fatalf("finding outside %s: %+v", p.Filename, p)
			}
			if d.Rule == "" || d.Message == "" || d.Severity == diag.Off {
				t.Fatalf("finding without rule, message or severity: %+v", d)
			}
			if strings.Contains(diag.Format(res.Fset, d), "\n") && !strings.Contains(p.Filename, "\n") {
				t.Fatalf("finding spans lines: %q", diag.Format(res.Fset, d))
			}
		}
		if m.outside > 0 && !hasRule(res, "bad-include") {
			t.Fatalf("an include outside the root without a bad-include finding")
		}
	})
}

func hasRule(res *check.Result, rule string) bool {
	for _, d := range res.Diags {
		if d.Rule == rule {
			return true
		}
	}
	return false
}
