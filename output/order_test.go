package output

import (
	"bytes"
	"fmt"
	"testing"

	"nodal/check"
)

// checkInMemory checks name with files read from the map.
func checkInMemory(t *testing.T, name string, files map[string]string) []Finding {
	t.Helper()
	read := func(p string) ([]byte, error) {
		if s, ok := files[p]; ok {
			return []byte(s), nil
		}
		return nil, fmt.Errorf("%s: no such file", p)
	}
	opt := &check.Options{ReadFile: read, Identify: func(p string) (string, error) { return p, nil }}
	res, err := check.Source(name, []byte(files[name]), opt)
	if err != nil {
		t.Fatal(err)
	}
	return FromDiags(res.Fset, res.Diags)
}

// Findings are listed by file name, line and column, then rule and
// message (diag.Order). A check's last pass leaves them so across the
// files it reads, an included file whose name sorts first included; Write
// sorts only the findings of several checks put together.
func TestFindingOrder(t *testing.T) {
	files := map[string]string{
		"top.nodal": "include \"lib.nodal\"\nground gnd\nresistor R1 (x, gnd) 1 kΩ\nresistor R2 (y, gnd) 1 kΩ @\n",
		"lib.nodal": "block amp (a, b) {\nresistor R (a, b) 1 kΩ @\n}\nresistor @\n",
		"aaa.nodal": "ground gnd\nresistor R9 (z, gnd) 1 kΩ\n",
	}
	top := checkInMemory(t, "top.nodal", files)
	inFile := map[string]int{}
	for _, f := range top {
		inFile[f.File]++
	}
	if inFile["lib.nodal"] < 2 || inFile["top.nodal"] < 2 {
		t.Fatalf("want findings in both files, got %v", inFile)
	}
	if !Sorted(top) {
		t.Errorf("a check's findings are not in order: %+v", top)
	}
	if top[0].File != "lib.nodal" {
		t.Errorf("first finding in %s, want lib.nodal, whose name sorts first", top[0].File)
	}

	// Two checks put together: Write lists them in the one order.
	other := checkInMemory(t, "aaa.nodal", files)
	if len(other) == 0 {
		t.Fatal("aaa.nodal has no findings")
	}
	r := &Report{Files: 2, Findings: append(append([]Finding(nil), top...), other...)}
	if Sorted(r.Findings) {
		t.Fatal("the two checks' findings are in order before Write; the test shows nothing")
	}
	if err := Write(&bytes.Buffer{}, "json", r, Options{}); err != nil {
		t.Fatal(err)
	}
	if !Sorted(r.Findings) || r.Findings[0].File != "aaa.nodal" {
		t.Errorf("Write left the findings out of order: %+v", r.Findings)
	}
	for i := 1; i < len(r.Findings); i++ {
		a, b := r.Findings[i-1], r.Findings[i]
		if a.File > b.File || a.File == b.File && (a.Line > b.Line || a.Line == b.Line && a.Column > b.Column) {
			t.Errorf("%s:%d:%d listed before %s:%d:%d", a.File, a.Line, a.Column, b.File, b.Line, b.Column)
		}
	}
}
