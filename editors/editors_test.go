package editors_test

import (
	"bytes"
	"encoding/json"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"
)

// vims returns the Vim-like editors installed here, skipping the test
// when there is none.
func vims(t *testing.T) []string {
	t.Helper()
	var out []string
	for _, name := range []string{"vim", "nvim"} {
		if p, err := exec.LookPath(name); err == nil {
			out = append(out, p)
		}
	}
	if len(out) == 0 {
		t.Skip("neither vim nor nvim is installed (apt-get install vim neovim); the Vim runtime files are not tested")
	}
	return out
}

// runVim runs editor headless with the repository's runtime package on
// file, sources script, and returns what the script wrote to the file
// named by $OUT.
func runVim(t *testing.T, editor, file, script string) []byte {
	t.Helper()
	dir := t.TempDir()
	out := filepath.Join(dir, "out")
	scriptFile := filepath.Join(dir, "script.vim")
	if err := os.WriteFile(scriptFile, []byte(script), 0o644); err != nil {
		t.Fatal(err)
	}
	rtp, _ := filepath.Abs("vim")
	args := []string{"-u", "NONE", "-i", "NONE", "-n", "-es", "--cmd", "set rtp^=" + rtp,
		"-c", "filetype plugin on", "-c", "syntax on",
		"-c", "edit " + file, "-c", "source " + scriptFile, "-c", "qa!"}
	if filepath.Base(editor) == "vim" {
		args = append([]string{"-N"}, args...)
	}
	cmd := exec.Command(editor, args...)
	cmd.Env = append(os.Environ(), "OUT="+out, "HOME="+dir, "XDG_CONFIG_HOME="+dir, "XDG_DATA_HOME="+dir, "XDG_STATE_HOME="+dir)
	cmd.Stdin = strings.NewReader("")
	var stderr bytes.Buffer
	cmd.Stderr = &stderr
	cmd.Stdout = &stderr
	if err := cmd.Run(); err != nil {
		t.Fatalf("%s: %v\n%s", editor, err, stderr.String())
	}
	b, err := os.ReadFile(out)
	if err != nil {
		t.Fatalf("%s wrote nothing: %v\n%s", editor, err, stderr.String())
	}
	return b
}

// synScript writes, per line, the syntax group of every byte.
const synScript = `let out = [&filetype]
for lnum in range(1, line('$'))
  let s = []
  for c in range(1, col([lnum, '$']) - 1)
    call add(s, synIDattr(synID(lnum, c, 1), 'name'))
  endfor
  call add(out, join(s, ','))
endfor
call writefile(out, $OUT)
`

// spot is a piece of text on a line of the sample and the group or scope
// expected at its first byte.
type spot struct {
	line  int
	text  string
	group string
}

func col(t *testing.T, lines []string, s spot) int {
	t.Helper()
	i := strings.Index(lines[s.line-1], s.text)
	if i < 0 {
		t.Fatalf("line %d has no %q", s.line, s.text)
	}
	return i
}

func sampleLines(t *testing.T) []string {
	b, err := os.ReadFile("testdata/sample.nodal")
	if err != nil {
		t.Fatal(err)
	}
	return strings.Split(string(b), "\n")
}

func TestVimSyntax(t *testing.T) {
	lines := sampleLines(t)
	spots := []spot{
		{1, "#", "nodalComment"},
		{2, "design", "nodalKeyword"},
		{2, `"Highlight`, "nodalString"},
		{3, "include", "nodalKeyword"},
		{5, "port", "nodalKeyword"},
		{5, "nodal: accept", "nodalAccept"},
		{5, "because", "nodalComment"},
		{7, "block", "nodalKeyword"},
		{7, "10", "nodalNumber"},
		{7, "kΩ", "nodalUnit"},
		{8, "resistor", "nodalKind"},
		{8, "*", "nodalOperator"},
		{8, "tol", "nodalAttribute"},
		{8, "1%", "nodalNumber"},
		{8, "rated", "nodalAttribute"},
		{8, "mW", "nodalUnit"},
		{10, "source", "nodalKind"},
		{10, "V1", ""},
		{11, "4.7kΩ", "nodalNumber"},
		{11, "7kΩ", "nodalNumber"},
		{12, "R2", ""},
		{12, "R47", "nodalCode"},
		{13, "open", "nodalState"},
		{14, "stage", "nodalInstance"},
		{14, "meg", "nodalError"},
		{14, "1 meg", "nodalNumber"},
	}
	for _, editor := range vims(t) {
		t.Run(filepath.Base(editor), func(t *testing.T) {
			out := strings.Split(string(runVim(t, editor, "testdata/sample.nodal", synScript)), "\n")
			if out[0] != "nodal" {
				t.Fatalf("file type %q, want nodal", out[0])
			}
			for _, s := range spots {
				groups := strings.Split(out[s.line], ",")
				c := col(t, lines, s)
				if c >= len(groups) || groups[c] != s.group {
					t.Errorf("line %d %q: group %q, want %q", s.line, s.text, groups[min(c, len(groups)-1)], s.group)
				}
			}
		})
	}
}

// TestVimQuickfix runs ":make" with the compiler the ftplugin sets, on a
// design with a finding of each severity, and reads the quickfix list.
func TestVimQuickfix(t *testing.T) {
	editors := vims(t)
	bin := filepath.Join(t.TempDir(), "nodal")
	build := exec.Command("go", "build", "-o", bin, "nodal/cmd/nodal")
	if out, err := build.CombinedOutput(); err != nil {
		t.Fatalf("go build: %v\n%s", err, out)
	}
	script := `let &l:makeprg = $NODAL_BIN . ' check --no-color %:S'
silent make!
call writefile([&l:errorformat, json_encode(getqflist())], $OUT)
`
	for _, editor := range editors {
		t.Run(filepath.Base(editor), func(t *testing.T) {
			t.Setenv("NODAL_BIN", bin)
			out := strings.SplitN(string(runVim(t, editor, "testdata/findings.nodal", script)), "\n", 2)
			if !strings.Contains(out[0], "%trror") {
				t.Fatalf("errorformat %q is not the compiler's", out[0])
			}
			var qf []struct {
				Lnum, Col int
				Type      string
				Text      string
				Valid     int
			}
			if err := json.Unmarshal([]byte(out[1]), &qf); err != nil {
				t.Fatalf("quickfix list %q: %v", out[1], err)
			}
			want := []struct {
				lnum, col int
				typ, rule string
			}{{3, 1, "n", "unused-block"}, {8, 19, "w", "floating-net"}, {9, 26, "e", "unit-mismatch"}}
			if len(qf) != len(want) {
				t.Fatalf("quickfix list has %d entries, want %d (the summary line must not be one): %+v", len(qf), len(want), qf)
			}
			for i, w := range want {
				q := qf[i]
				if q.Valid != 1 || q.Lnum != w.lnum || q.Col != w.col || q.Type != w.typ || !strings.Contains(q.Text, "["+w.rule+"]") {
					t.Errorf("entry %d: %+v, want line %d col %d type %s rule %s", i, q, w.lnum, w.col, w.typ, w.rule)
				}
			}
		})
	}
}
