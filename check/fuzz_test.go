package check_test

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
	"unicode/utf8"

	"nodal/check"
	"nodal/diag"
)

// FuzzCheck runs the whole pipeline on arbitrary input. Nothing may panic,
// and every finding must point inside the file with a rule id and a
// message. Seeds are the testdata and the examples.
//
//	go test -run='^$' -fuzz=FuzzCheck -fuzztime=2m ./check/
func FuzzCheck(f *testing.F) {
	for _, pattern := range []string{"../testdata/rules/*/*.nodal", "../testdata/*.nodal", "../examples/*.nodal"} {
		files, _ := filepath.Glob(pattern)
		for _, file := range files {
			src, err := os.ReadFile(file)
			if err != nil {
				f.Fatal(err)
			}
			f.Add(src)
		}
	}
	f.Add([]byte(greenhouse))
	f.Add([]byte("resistor R1 (a, gnd) 1e999 V\n"))
	f.Add([]byte("\xff\xfe\x00ground\x80 gnd\n"))
	f.Add([]byte(""))
	f.Fuzz(func(t *testing.T, src []byte) {
		res, err := check.Source("f.nodal", src, nil)
		if err != nil {
			t.Fatalf("internal error: %v", err)
		}
		checkFindings(t, res, src)
	})
}

// checkFindings asserts that every finding is well formed.
func checkFindings(t *testing.T, res *check.Result, src []byte) {
	t.Helper()
	lineCount := strings.Count(string(src), "\n") + 1
	for _, d := range res.Diags {
		p := res.Fset.Position(d.Pos)
		if !p.IsValid() || p.Line > lineCount || p.Column < 1 || p.Offset > len(src) {
			t.Fatalf("finding outside the file: %+v at %+v", d, p)
		}
		if d.Rule == "" || d.Message == "" || d.Severity == diag.Off {
			t.Fatalf("finding without rule, message or severity: %+v", d)
		}
		if !utf8.ValidString(d.Message) {
			t.Fatalf("message is not UTF-8: %q", d.Message)
		}
		if strings.Contains(diag.Format(res.Fset, d), "\n") {
			t.Fatalf("finding spans lines: %q", diag.Format(res.Fset, d))
		}
	}
}
