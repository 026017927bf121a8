package check_test

import (
	"fmt"
	"os"
	"path/filepath"
	"regexp"
	"slices"
	"testing"

	"nodal/check"
	"nodal/format"
)

// lineRef matches a line number a message may quote.
var lineRef = regexp.MustCompile(`\bline \d+`)

// verdict is what a check says about a design, positions aside: each
// finding's severity, rule and message, sorted, and the operating point.
func verdict(t *testing.T, src []byte) []string {
	t.Helper()
	res, err := check.Source("f.nodal", src, nil)
	if err != nil {
		t.Fatalf("internal error: %v", err)
	}
	var out []string
	for _, d := range res.Diags {
		out = append(out, fmt.Sprintf("%v %s %s", d.Severity, d.Rule, lineRef.ReplaceAllString(d.Message, "line N")))
	}
	slices.Sort(out)
	if s := res.Solved; s != nil && s.OP != nil {
		out = append(out, fmt.Sprint("nets ", s.OP.NetV), fmt.Sprint("V ", s.OP.V), fmt.Sprint("I ", s.OP.I), fmt.Sprint("P ", s.OP.P))
	}
	return out
}

func sameVerdict(t *testing.T, src []byte) {
	t.Helper()
	formatted := format.Source(src)
	before, after := verdict(t, src), verdict(t, formatted)
	if !slices.Equal(before, after) {
		t.Fatalf("formatting changed the verdict on %q\n(formatted %q)\nbefore %q\nafter  %q", src, formatted, before, after)
	}
}

// TestFormatKeepsVerdict checks every example and rule test file before
// and after formatting: the same findings and the same numbers.
func TestFormatKeepsVerdict(t *testing.T) {
	n := 0
	for _, pattern := range []string{"../testdata/rules/*/*.nodal", "../examples/*.nodal", "../demo/*.nodal"} {
		files, _ := filepath.Glob(pattern)
		for _, file := range files {
			src, err := os.ReadFile(file)
			if err != nil {
				t.Fatal(err)
			}
			sameVerdict(t, src)
			n++
		}
	}
	if n < 20 {
		t.Fatalf("only %d files checked", n)
	}
}

// FuzzFormatVerdict: formatting never changes what a check finds.
//
//	go test -run='^$' -fuzz=FuzzFormatVerdict -fuzztime=1m ./check/
func FuzzFormatVerdict(f *testing.F) {
	for _, pattern := range []string{"../testdata/rules/*/*.nodal", "../examples/*.nodal"} {
		files, _ := filepath.Glob(pattern)
		for _, file := range files {
			src, err := os.ReadFile(file)
			if err != nil {
				f.Fatal(err)
			}
			f.Add(src)
		}
	}
	f.Add([]byte("ground gnd\nsource V1 (a, gnd) - 5 V\nresistor R1 (a,gnd)1 kΩ # nodal: accept floating-net because x\n"))
	f.Fuzz(func(t *testing.T, src []byte) {
		sameVerdict(t, src)
	})
}
