package config

import (
	"errors"
	"strings"
	"testing"
)

// FuzzParse reads arbitrary text as a nodal.toml. Nothing may panic; a
// rejected file gives errors that name the file and a line inside it; an
// accepted one holds only values in range, and its skip globs match paths
// without error.
//
//	go test -run='^$' -fuzz=FuzzParse -fuzztime=3m ./config/
func FuzzParse(f *testing.F) {
	for _, s := range []string{
		"skip = [\"vendor/**\"]\n\n[rules]\nfloating-net = \"off\"\n\n[derating]\nresistor-power = 50\n\n[limits]\ndepth = 8\nparts = 1000\nfile-mib = 64\n",
		"roots = [\"../lib\", \"/opt/parts\"]\n",
		"[rules]\n\"a\\n::error::x\\u001b[2J\" = \"off\"\n",
		"skip = [\"" + strings.Repeat("**/", 12) + "x\", \"{a,b}/[c-d]*.nodal\"]\n",
		"[limits]\ndepth = -1\nparts = 99999999999999999999\n",
		"[derating]\nresistor-power = nan\n",
		"[[rules]]\n", "x = \n", "\xff\xfe", "",
	} {
		f.Add([]byte(s))
	}
	f.Fuzz(func(t *testing.T, src []byte) {
		c, err := Parse("p/nodal.toml", src, known, suggest, testDerating)
		lines := strings.Count(string(src), "\n") + 1
		if err != nil {
			var errs Errors
			var one *Error
			switch {
			case errors.As(err, &errs):
				for _, e := range errs {
					checkError(t, e, lines)
				}
			case errors.As(err, &one):
				checkError(t, one, lines)
			default:
				t.Fatalf("an error that names no file: %v", err)
			}
			return
		}
		if c.Depth < 1 || c.Parts < 1 || c.FileMiB < 1 {
			t.Fatalf("limits out of range: %+v", c)
		}
		for k, v := range c.Derating {
			if !(v > 0 && v <= 1) {
				t.Fatalf("derating %s = %v", k, v)
			}
		}
		for _, path := range []string{"p/a.nodal", "p/" + strings.Repeat("d/", 30) + "x", "p/vendor/a/b.nodal", "q/a.nodal"} {
			c.SkippedBy(path)
		}
	})
}

func checkError(t *testing.T, e *Error, lines int) {
	t.Helper()
	if e.File != "p/nodal.toml" || e.Line < 0 || e.Line > lines || e.Msg == "" {
		t.Fatalf("error %+v: want the file, a line within its %d lines, and a message", e, lines)
	}
}
