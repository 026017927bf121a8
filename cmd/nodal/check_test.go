package main

import (
	"bytes"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"nodal/circuit"
)

const goodDesign = `ground gnd
source V1 (vin, gnd) 5 V
resistor R1 (vin, gnd) 1kΩ
`

// badDesign has an error: two voltage sources in parallel.
const badDesign = goodDesign + "source V2 (vin, gnd) 3 V\n"

func runNodal(t *testing.T, dir string, stdin string, args ...string) (code int, stdout, stderr string) {
	t.Helper()
	if dir != "" {
		old, _ := os.Getwd()
		if err := os.Chdir(dir); err != nil {
			t.Fatal(err)
		}
		defer os.Chdir(old)
	}
	var out, errb bytes.Buffer
	code = run(args, strings.NewReader(stdin), &out, &errb)
	return code, out.String(), errb.String()
}

func write(t *testing.T, path, text string) {
	t.Helper()
	if err := os.MkdirAll(filepath.Dir(path), 0o755); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(path, []byte(text), 0o644); err != nil {
		t.Fatal(err)
	}
}

// errorFormat is the GNU "%f:%l:%c: %m" pattern, the default error format
// family of Vim's quickfix list, Emacs' compilation mode and most editors'
// problem matchers.
var errorFormat = regexp.MustCompile(`^([^:\n]+):(\d+):(\d+): (.*)$`)

// An editor lists each finding at the right line and byte column, one
// finding per line, without colour codes when the output is not a terminal.
func TestEditorFormat(t *testing.T) {
	dir := t.TempDir()
	src := "ground gnd\nsource V1 (vin, gnd) 5 V\nresistor R1 (vin, gnd) 1kΩ\nresistor \"RΩ\" (vin, \"ténu\") 1kΩ\n"
	write(t, filepath.Join(dir, "a.nodal"), src)
	code, out, _ := runNodal(t, dir, "", "check", "a.nodal")
	if code != 0 && code != 1 {
		t.Fatalf("exit %d", code)
	}
	lines := strings.Split(strings.TrimSuffix(out, "\n"), "\n")
	if len(lines) == 0 || out == "" {
		t.Fatal("no findings")
	}
	srcLines := strings.Split(src, "\n")
	found := false
	for _, l := range lines {
		if strings.Contains(l, "\x1b[") {
			t.Errorf("colour code off a terminal: %q", l)
		}
		m := errorFormat.FindStringSubmatch(l)
		if m == nil {
			t.Fatalf("line does not match %%f:%%l:%%c: %%m: %q", l)
		}
		if m[1] != "a.nodal" {
			t.Errorf("file %q", m[1])
		}
		ln, _ := strconv.Atoi(m[2])
		col, _ := strconv.Atoi(m[3])
		if strings.Contains(m[4], "ténu") {
			found = true
			// The column counts bytes: `resistor "RΩ" (vin, ` is 21
			// bytes but 20 characters.
			if ln != 4 || col != 22 || !strings.HasPrefix(srcLines[ln-1][col-1:], "\"ténu") {
				t.Errorf("ténu reported at %d:%d", ln, col)
			}
		}
	}
	if !found {
		t.Errorf("no finding for the floating net ténu:\n%s", out)
	}
}

func TestStdinFilename(t *testing.T) {
	dir := t.TempDir()
	write(t, filepath.Join(dir, "boards", "nodal.toml"), "[rules]\nsource-loop = \"warning\"\n")
	code, out, _ := runNodal(t, dir, badDesign, "check", "--stdin-filename", "boards/psu.nodal", "-")
	if code != 0 {
		t.Errorf("exit %d; the nodal.toml beside boards/psu.nodal lowers source-loop to a warning", code)
	}
	if !strings.HasPrefix(out, "boards/psu.nodal:4:1: warning: ") {
		t.Errorf("output %q does not name boards/psu.nodal", out)
	}
}

func TestFailOn(t *testing.T) {
	dir := t.TempDir()
	write(t, filepath.Join(dir, "w.nodal"), goodDesign+"resistor R9 (vin, loose) 1kΩ\n")
	for _, c := range []struct {
		failOn string
		want   int
	}{{"error", 0}, {"warning", 1}, {"note", 1}} {
		code, _, _ := runNodal(t, dir, "", "check", "--fail-on", c.failOn, "w.nodal")
		if code != c.want {
			t.Errorf("--fail-on %s: exit %d, want %d", c.failOn, code, c.want)
		}
	}
	if code, _, errs := runNodal(t, dir, "", "check", "--fail-on", "loud", "w.nodal"); code != 2 || !strings.Contains(errs, "--fail-on") {
		t.Errorf("bad --fail-on: exit %d, %q", code, errs)
	}
}

func TestConfigErrorNamesFileLineKey(t *testing.T) {
	dir := t.TempDir()
	write(t, filepath.Join(dir, "a.nodal"), goodDesign)
	write(t, filepath.Join(dir, "nodal.toml"), "# settings\n[rules]\nfloating-net = \"off\"\nfloting-net = \"off\"\n")
	code, _, errs := runNodal(t, dir, "", "check", "a.nodal")
	want := "nodal.toml:4: rules.floting-net: unknown rule id; did you mean floating-net?"
	if code != 2 || !strings.Contains(errs, want) {
		t.Errorf("exit %d, stderr %q; want 2 and %q", code, errs, want)
	}
}

func TestConfigCommand(t *testing.T) {
	dir := t.TempDir()
	write(t, filepath.Join(dir, "nodal.toml"), "[rules]\nfloating-net = \"off\"\n\n[derating]\nresistor-power = 50\n")
	write(t, filepath.Join(dir, "sub", "a.nodal"), goodDesign)
	code, out, errs := runNodal(t, dir, "", "config", "sub/a.nodal")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	for _, want := range []string{`floating-net = "off"`, "nodal.toml:2", "resistor-power = 50", "nodal.toml:5", `shorted-part = "warning"`, "# default"} {
		if !strings.Contains(out, want) {
			t.Errorf("nodal config output lacks %q:\n%s", want, out)
		}
	}
}

// A hook's file list: non-.nodal files are skipped quietly, a path git
// knows but the disk no longer has (a deletion) is skipped, a path nobody
// knows is a typo.
func TestHookFileList(t *testing.T) {
	dir := gitRepo(t)
	write(t, filepath.Join(dir, "gone.nodal"), goodDesign)
	write(t, filepath.Join(dir, "a.nodal"), goodDesign)
	git(t, dir, "add", ".")
	git(t, dir, "commit", "-qm", "first")
	git(t, dir, "rm", "-q", "gone.nodal")
	write(t, filepath.Join(dir, "README.md"), "# notes\n")
	code, _, errs := runNodal(t, dir, "", "check", "a.nodal", "README.md", "gone.nodal")
	if code != 0 || !strings.Contains(errs, "in 1 file") {
		t.Errorf("exit %d, stderr %q", code, errs)
	}
	code, _, errs = runNodal(t, dir, "", "check", "a.nodal", "typo.nodal")
	if code != 2 || !strings.Contains(errs, "typo.nodal: no such file") {
		t.Errorf("typo: exit %d, stderr %q", code, errs)
	}
}

// Many named files, one process, output in path order whatever order the
// workers finish in.
func TestManyFilesDeterministic(t *testing.T) {
	dir := t.TempDir()
	var args []string
	for i := 0; i < 60; i++ {
		name := "f" + strconv.Itoa(i) + ".nodal"
		write(t, filepath.Join(dir, name), goodDesign+"resistor R9 (vin, loose) 1kΩ\n")
		args = append(args, name)
	}
	_, first, _ := runNodal(t, dir, "", append([]string{"check", "--jobs", "4"}, args...)...)
	_, again, _ := runNodal(t, dir, "", append([]string{"check", "--jobs", "1"}, args...)...)
	if first != again || strings.Count(first, "\n") != 60 {
		t.Fatalf("outputs differ or wrong length:\n%s", first)
	}
	lines := strings.Split(strings.TrimSpace(first), "\n")
	for i := 1; i < len(lines); i++ {
		if lines[i-1] > lines[i] {
			t.Errorf("not sorted: %q before %q", lines[i-1], lines[i])
		}
	}
}

func gitRepo(t *testing.T) string {
	t.Helper()
	if _, err := exec.LookPath("git"); err != nil {
		t.Skip("git not installed")
	}
	dir := t.TempDir()
	git(t, dir, "init", "-q")
	git(t, dir, "config", "user.email", "test@nodal.invalid")
	git(t, dir, "config", "user.name", "nodal test")
	git(t, dir, "config", "commit.gpgsign", "false")
	return dir
}

func git(t *testing.T, dir string, args ...string) string {
	t.Helper()
	cmd := exec.Command("git", args...)
	cmd.Dir = dir
	cmd.Env = append(os.Environ(), "GIT_CONFIG_GLOBAL=/dev/null", "GIT_CONFIG_NOSYSTEM=1")
	out, err := cmd.CombinedOutput()
	if err != nil {
		t.Fatalf("git %v: %v\n%s", args, err, out)
	}
	return string(out)
}

// NODAL_DOCS_URL moves every rule link; a relative or non-http address is a
// usage error, since SARIF 2.1.0 (OASIS, 2020) requires absolute URIs.
func TestDocsURLFromEnvironment(t *testing.T) {
	dir := t.TempDir()
	f := filepath.Join(dir, "a.nodal")
	if err := os.WriteFile(f, []byte("ground gnd\nresistor R1 (a, gnd) 1 kΩ\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	t.Setenv("NODAL_DOCS_URL", "https://code.example.org/team/nodal/docs")
	var out, errb bytes.Buffer
	run([]string{"check", "--format", "json", f}, strings.NewReader(""), &out, &errb)
	if !strings.Contains(out.String(), `"https://code.example.org/team/nodal/docs/rules/floating-net.md"`) {
		t.Fatalf("help_uri does not follow NODAL_DOCS_URL:\n%s", out.String())
	}
	t.Setenv("NODAL_DOCS_URL", "docs/")
	out.Reset()
	errb.Reset()
	if st := run([]string{"check", f}, strings.NewReader(""), &out, &errb); st != 2 || !strings.Contains(errb.String(), "NODAL_DOCS_URL") {
		t.Fatalf("relative NODAL_DOCS_URL: status %d, stderr %q; want 2 and a message", st, errb.String())
	}
}

// TestConfigDeratingKeysFromKinds: every derating key a kind's rating
// names is shown by nodal config with its default and is accepted in
// nodal.toml; a key no kind declares is refused at its line.
func TestConfigDeratingKeysFromKinds(t *testing.T) {
	declared := map[string]float64{}
	for _, k := range circuit.Kinds() {
		for _, r := range k.Info().Ratings {
			if r.Derating != "" {
				declared[r.Derating] = r.Default
			}
		}
	}
	if len(declared) == 0 {
		t.Fatal("no kind declares a derating key")
	}
	dir := t.TempDir()
	write(t, filepath.Join(dir, "a.nodal"), goodDesign)
	code, out, errs := runNodal(t, dir, "", "config", "a.nodal")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	_, section, _ := strings.Cut(out, "\n[derating]\n")
	section, _, _ = strings.Cut(section, "\n\n")
	shown := map[string]bool{}
	for _, line := range strings.Split(section, "\n") {
		key, _, _ := strings.Cut(line, " = ")
		shown[key] = true
		if _, ok := declared[key]; !ok {
			t.Errorf("nodal config shows %q, which no kind declares", line)
		}
	}
	for key, f := range declared {
		line := regexp.MustCompile(`(?m)^` + regexp.QuoteMeta(key) + ` = ` + regexp.QuoteMeta(strconv.FormatFloat(f*100, 'g', -1, 64)) + ` +# default$`)
		if !shown[key] || !line.MatchString(section) {
			t.Errorf("nodal config does not show %s = %g # default:\n%s", key, f*100, section)
		}
		write(t, filepath.Join(dir, "nodal.toml"), "[derating]\n"+key+" = 55\n")
		code, out, errs := runNodal(t, dir, "", "config", "a.nodal")
		if code != 0 || !strings.Contains(out, key+" = 55") || !strings.Contains(out, "nodal.toml:2") {
			t.Errorf("%s = 55: exit %d, stderr %q, output:\n%s", key, code, errs, out)
		}
	}
	const undeclared = "resistor-current"
	if _, ok := declared[undeclared]; ok {
		t.Fatalf("%s is declared; pick another undeclared key", undeclared)
	}
	write(t, filepath.Join(dir, "nodal.toml"), "# settings\n[derating]\n"+undeclared+" = 50\n")
	code, _, errs = runNodal(t, dir, "", "check", "a.nodal")
	if want := "nodal.toml:3: derating." + undeclared + ": unknown derating key; the keys are "; code != 2 || !strings.Contains(errs, want) {
		t.Errorf("exit %d, stderr %q; want 2 and %q", code, errs, want)
	}
}
