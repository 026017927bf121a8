package main

import (
	"bytes"
	"errors"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"nodal/check"
)

func runCLI(t *testing.T, stdin string, args ...string) (code int, stdout, stderr string) {
	t.Helper()
	var out, errb bytes.Buffer
	code = run(args, strings.NewReader(stdin), &out, &errb)
	return code, out.String(), errb.String()
}

func TestHelpSaysItAll(t *testing.T) {
	code, out, _ := runCLI(t, "", "--help")
	if code != 0 {
		t.Errorf("--help exit %d", code)
	}
	code, cout, _ := runCLI(t, "", "check", "--help")
	if code != 0 {
		t.Errorf("check --help exit %d", code)
	}
	if strings.Count(cout, "Usage: nodal check") != 1 {
		t.Errorf("check --help prints its usage %d times", strings.Count(cout, "Usage: nodal check"))
	}
	for _, want := range []string{"*.nodal", `"-"`, "standard input", "path:line:col: severity: message [rule-id]",
		"--no-color", "NO_COLOR", "terminal", "standard error", "summary", "0 ", "1 ", "2 ", "does not exist", "subfolders"} {
		if !strings.Contains(cout, want) {
			t.Errorf("check --help does not mention %q", want)
		}
	}
	for _, want := range []string{"check", "rules", "*.nodal", `"-"`, "path:line:col", "NO_COLOR", "--no-color", "standard error", "Exit status", "design aid"} {
		if !strings.Contains(out, want) {
			t.Errorf("--help does not mention %q", want)
		}
	}
}

func TestExitStatuses(t *testing.T) {
	dir := t.TempDir()
	good := filepath.Join(dir, "good.nodal")
	bad := filepath.Join(dir, "bad.nodal")
	os.WriteFile(good, []byte("ground gnd\nsource V1 (a, gnd) 5 V\nresistor R1 (a, gnd) 1 kΩ\n"), 0o644)
	os.WriteFile(bad, []byte("ground gnd\nsource V1 (a, gnd) 5 V\nresistor R1 (a, gnd) 1 kF\n"), 0o644)
	if code, out, errOut := runCLI(t, "", "check", good); code != 0 || out != "" || !strings.Contains(errOut, "0 errors, 0 warnings, 0 notes in 1 file") {
		t.Errorf("clean file: exit %d, %q, %q", code, out, errOut)
	}
	if code, out, _ := runCLI(t, "", "check", bad); code != 1 || !strings.Contains(out, "bad.nodal:3:22: error:") {
		t.Errorf("file with an error: exit %d, %q", code, out)
	}
	if code, _, errOut := runCLI(t, "", "check", filepath.Join(dir, "missing.nodal")); code != 2 || !strings.Contains(errOut, "missing.nodal") {
		t.Errorf("missing file: exit %d, %q", code, errOut)
	}
	// A missing path does not stop the others from being checked.
	if code, out, errOut := runCLI(t, "", "check", filepath.Join(dir, "missing.nodal"), bad); code != 2 || !strings.Contains(out, "bad.nodal:3:22") || !strings.Contains(errOut, "in 1 file") {
		t.Errorf("missing and bad: exit %d, %q, %q", code, out, errOut)
	}
	if code, _, _ := runCLI(t, "", "check", "--frobnicate"); code != 2 {
		t.Errorf("bad flag: exit %d", code)
	}
	if code, _, _ := runCLI(t, "", "frobnicate"); code != 2 {
		t.Errorf("bad command: exit %d", code)
	}
	if code, out, _ := runCLI(t, "ground gnd\nresistor R1 (a, gnd) 1 kΩ\n", "check", "-"); code != 0 || !strings.Contains(out, "<stdin>:2:") {
		t.Errorf("stdin: exit %d, %q", code, out)
	}
	// Folders: every *.nodal below, sorted.
	code, out, errOut := runCLI(t, "", "check", dir)
	if code != 1 || !strings.Contains(errOut, "in 2 files") || strings.Contains(out, "good.nodal") {
		t.Errorf("folder: exit %d, %q, %q", code, out, errOut)
	}
}

// Junk of every kind is a finding or nothing, never a panic or a stack trace.
func TestJunkInput(t *testing.T) {
	long := strings.Repeat("x", 3<<20) // the full 200 MB is tried by hand; see DEVELOPERS.md
	inputs := map[string]string{
		"empty":        "",
		"newlines":     "\n\n\n",
		"binary":       "\x00\x01\x02\xff\xfe\x7f\x1b[31m\x00",
		"non-utf8":     "ground g\xffnd\nresistor R\xc3 (a, gnd) 1 k\xce\n",
		"huge number":  "ground gnd\nsource V1 (a, gnd) 1e999 V\nresistor R1 (a, gnd) 1 kΩ\n",
		"long line":    "ground gnd\nresistor R1 (a, gnd) " + long + "\n",
		"long name":    "ground gnd\nresistor " + long + " (a, gnd) 1 kΩ\n",
		"many tokens":  "ground gnd\nport " + strings.Repeat("a, ", 1<<16) + "b\n",
		"open string":  "ground \"gnd\nresistor R1 (\"a, gnd) 1 kΩ\n",
		"only comment": "# nothing here",
		"crlf":         "ground gnd\r\nsource V1 (a, gnd) 5 V\r\nresistor R1 (a, gnd) 1 kΩ\r\n",
	}
	for name, src := range inputs {
		code, out, errOut := runCLI(t, src, "check", "-")
		if code == 2 || strings.Contains(out+errOut, "goroutine") || strings.Contains(out+errOut, "panic") {
			t.Errorf("%s: exit %d\n%s%s", name, code, out, errOut)
		}
		if len(out) > 1<<16 {
			t.Errorf("%s: %d bytes of output", name, len(out))
		}
	}
	if code, out, _ := runCLI(t, inputs["crlf"], "check", "-"); code != 0 || out != "" {
		t.Errorf("CRLF line ends: exit %d, %q", code, out)
	}
}

// An unexpected panic while checking one file is an internal error for that
// file (exit 2); the other files are still checked.
func TestPanicIsAnInternalError(t *testing.T) {
	dir := t.TempDir()
	boom := filepath.Join(dir, "a.nodal")
	fine := filepath.Join(dir, "b.nodal")
	os.WriteFile(boom, []byte("ground gnd\n"), 0o644)
	os.WriteFile(fine, []byte("ground gnd\nresistor R1 (a, gnd) 1 kF\n"), 0o644)
	saved := checkSource
	defer func() { checkSource = saved }()
	checkSource = func(name string, src []byte, opt *check.Options) (*check.Result, error) {
		if strings.HasSuffix(name, "a.nodal") {
			var m map[string]int
			m["x"]++ // a nil map write: a genuine runtime panic
		}
		return saved(name, src, opt)
	}
	code, out, errOut := runCLI(t, "", "check", dir)
	if code != 2 || !strings.Contains(errOut, "a.nodal: internal error") || !strings.Contains(out, "b.nodal:2:1") || strings.Contains(errOut, "goroutine") {
		t.Errorf("exit %d\nstdout %q\nstderr %q", code, out, errOut)
	}
	// The error path of check.Source is reported the same way.
	checkSource = func(string, []byte, *check.Options) (*check.Result, error) { return nil, errors.New("rule failed") }
	if code, _, errOut := runCLI(t, "", "check", fine); code != 2 || !strings.Contains(errOut, "internal error: rule failed") {
		t.Errorf("error: exit %d, %q", code, errOut)
	}
}
