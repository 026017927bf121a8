package main

// hostile_test.go: a design from a stranger's pull request is hostile
// input. Each case below was a way, on an earlier version, to read a file
// from outside the repository, hang the check, exhaust memory or forge
// lines of output. Every case runs in every output format, and every run
// is held to the same promises: nothing of the outside file appears, no
// output line can be taken for a CI workflow command, no raw control
// character reaches the terminal, one finding is one text line, and
// Markdown renders user text as text.

import (
	"bytes"
	"fmt"
	"io"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strings"
	"syscall"
	"testing"
)

// secret is the text of the file outside the repository; it must never
// appear in any output.
const secret = "TOPSECRET_7f3a"

type hostileCase struct {
	name  string
	files map[string]string // below the repository
	setup func(t *testing.T, repo, outside string)
	args  []string // after "check"; run in the repository
	stdin func() io.Reader
	code  int      // the exit status
	want  []string // in standard output or standard error (text form)
}

// gnuLine is one finding in the text form.
var gnuLine = regexp.MustCompile(`^[^\n]+:\d+:\d+: (error|warning|note): [^\n]* \[[a-z-]+\]$`)

func hostileCases() []hostileCase {
	inc := func(path string) map[string]string {
		return map[string]string{"top.nodal": fmt.Sprintf("include %q\nground gnd\nsource V1 (a, gnd) 5 V\nresistor R1 (a, gnd) 1 kΩ\n", path)}
	}
	return []hostileCase{
		{name: "include by ..", files: inc("../outside/secret.txt"), args: []string{"top.nodal"}, code: 1,
			want: []string{`include "../outside/secret.txt" leads outside`}},
		{name: "include by absolute path", files: inc("OUTSIDE/secret.txt"), args: []string{"top.nodal"}, code: 1,
			want: []string{"leads outside"}},
		{name: "include through a folder link", files: inc("out/secret.txt"), args: []string{"top.nodal"}, code: 1,
			setup: func(t *testing.T, repo, outside string) { symlink(t, outside, filepath.Join(repo, "out")) },
			want:  []string{`include "out/secret.txt" leads outside`}},
		{name: "include of a link to an outside file", files: inc("lib.nodal"), args: []string{"top.nodal"}, code: 1,
			setup: func(t *testing.T, repo, outside string) {
				symlink(t, filepath.Join(outside, "secret.txt"), filepath.Join(repo, "lib.nodal"))
			},
			want: []string{`include "lib.nodal" leads outside`}},
		{name: "named link to an outside file", args: []string{"evil.nodal"}, code: 2,
			setup: func(t *testing.T, repo, outside string) {
				symlink(t, filepath.Join(outside, "secret.txt"), filepath.Join(repo, "evil.nodal"))
			},
			want: []string{"evil.nodal: leads outside"}},
		{name: "walked link to an outside file", files: map[string]string{"good.nodal": "ground gnd\nsource V1 (a, gnd) 5 V\nresistor R1 (a, gnd) 1 kΩ\n"},
			args: []string{"."}, code: 0,
			setup: func(t *testing.T, repo, outside string) {
				symlink(t, filepath.Join(outside, "secret.txt"), filepath.Join(repo, "evil.nodal"))
			},
			want: []string{"evil.nodal: note: skipped", "in 1 file"}},
		{name: "include of /dev/zero", files: inc("/dev/zero"), args: []string{"top.nodal"}, code: 1,
			want: []string{`include "/dev/zero" leads outside`}},
		{name: "include of /dev/zero with / as the root", files: inc("/dev/zero"), args: []string{"--root", "/", "top.nodal"}, code: 1,
			want: []string{"not a regular file"}},
		{name: "link to /dev/urandom named", args: []string{"--root", "/", "u.nodal"}, code: 2,
			setup: func(t *testing.T, repo, outside string) { symlink(t, "/dev/urandom", filepath.Join(repo, "u.nodal")) },
			want:  []string{"u.nodal: not a regular file"}},
		{name: "FIFO included", files: inc("pipe.nodal"), args: []string{"top.nodal"}, code: 1,
			setup: func(t *testing.T, repo, outside string) { fifo(t, filepath.Join(repo, "pipe.nodal")) },
			want:  []string{"pipe.nodal: not a regular file"}},
		{name: "FIFO named", args: []string{"pipe.nodal"}, code: 2,
			setup: func(t *testing.T, repo, outside string) { fifo(t, filepath.Join(repo, "pipe.nodal")) },
			want:  []string{"nodal: pipe.nodal: not a regular file"}},
		{name: "FIFO found by a walk", args: []string{"."}, code: 2,
			setup: func(t *testing.T, repo, outside string) { fifo(t, filepath.Join(repo, "sub", "pipe.nodal")) },
			want:  []string{"pipe.nodal: not a regular file"}},
		{name: "FIFO as nodal.toml", files: map[string]string{"a.nodal": "ground gnd\n"}, args: []string{"a.nodal"}, code: 2,
			setup: func(t *testing.T, repo, outside string) { fifo(t, filepath.Join(repo, "nodal.toml")) },
			want:  []string{"nodal.toml: not a regular file"}},
		{name: "nodal.toml linked outside", files: map[string]string{"a.nodal": "ground gnd\n"}, args: []string{"a.nodal"}, code: 2,
			setup: func(t *testing.T, repo, outside string) {
				symlink(t, filepath.Join(outside, "secret.txt"), filepath.Join(repo, "nodal.toml"))
			},
			want: []string{"outside the folders nodal reads"}},
		{name: "endless standard input", args: []string{"--max-file-mib", "1", "-"}, code: 2,
			stdin: func() io.Reader { return endless{} },
			want:  []string{"standard input: larger than the limit of 1 MiB"}},
		{name: "file past the size cap", files: map[string]string{"nodal.toml": "[limits]\nfile-mib = 1\n",
			"big.nodal": "ground gnd\n# " + strings.Repeat("x", 1<<20) + "\n"}, args: []string{"big.nodal"}, code: 2,
			want: []string{"big.nodal: ", "larger than the limit of 1 MiB"}},
		{name: "include fan-out through two links to .", files: fanOut(24), args: []string{"f0.nodal"}, code: 0,
			setup: func(t *testing.T, repo, outside string) {
				symlink(t, ".", filepath.Join(repo, "l1"))
				symlink(t, ".", filepath.Join(repo, "l2"))
			},
			want: []string{"in 1 file"}},
		{name: "skip glob of many **", files: map[string]string{
			"nodal.toml":                         `skip = ["` + strings.Repeat("**/", 12) + `x"]` + "\n",
			strings.Repeat("d/", 30) + "y.nodal": "ground gnd\nsource V1 (a, gnd) 5 V\nresistor R1 (a, gnd) 1 kΩ\n"},
			args: []string{"."}, code: 0, want: []string{"in 1 file"}},
		{name: "forged names", files: map[string]string{
			"::error file=a.nodal::forged.nodal": "ground gnd\nsource V1 (a, gnd) 5 V\n" +
				"resistor R1 (a, \"<img src=https://example.invalid/p.png>\") 1 kΩ\n" +
				"resistor R2 (a, \"[click](https://example.invalid) @someone\") 1 kΩ\n" +
				"resistor R3 (a, \"x\\n::error::forged\") 1 kΩ\n",
			"nl\n::warning::x.nodal": "ground gnd\nresistor R1 (q, gnd) 1 kF\n",
			"esc.nodal":              "include \"\x1b]0;title\x07\x1b[2J.nodal\"\nground gnd\n"},
			args: []string{"."}, code: 1,
			want: []string{"./::error file=a.nodal::forged.nodal:3:", `nl\n::warning::x.nodal:2:22: error:`, `\x1b]0;title\x07\x1b[2J.nodal`}},
		{name: "forged keys in nodal.toml", files: map[string]string{
			"nodal.toml": "[rules]\n\"a\\n::error::forged\\u001b[2J\" = \"off\"\n",
			"a.nodal":    "ground gnd\n"},
			args: []string{"a.nodal"}, code: 2, want: []string{`a\n::error::forged\x1b[2J`, "unknown rule id"}},
		{name: "link to a folder named", files: map[string]string{"sub/x.nodal": "ground gnd\nresistor R1 (q, gnd) 1 kF\n"},
			args: []string{"link"}, code: 1,
			setup: func(t *testing.T, repo, outside string) { symlink(t, "sub", filepath.Join(repo, "link")) },
			want:  []string{"link/x.nodal:2:22: error:", "in 1 file"}},
		{name: "link to an outside folder named", args: []string{"outlink"}, code: 2,
			setup: func(t *testing.T, repo, outside string) {
				os.WriteFile(filepath.Join(outside, "o.nodal"), []byte("ground gnd\n"), 0o644)
				symlink(t, outside, filepath.Join(repo, "outlink"))
			},
			want: []string{"outlink/o.nodal: leads outside"}},
	}
}

// fanOut is a chain of n files in which each includes the next twice,
// through links l1 and l2 to the same folder: 2^n reads without file
// identity.
func fanOut(n int) map[string]string {
	files := map[string]string{"f0.nodal": "include \"l1/f1.nodal\"\ninclude \"l2/f1.nodal\"\nground gnd\nsource V1 (a, gnd) 5 V\nresistor R1 (a, gnd) 1 kΩ\nb1 X1 (a, gnd)\n"}
	for i := 1; i < n; i++ {
		s := ""
		if i+1 < n {
			s = fmt.Sprintf("include \"l1/f%d.nodal\"\ninclude \"l2/f%d.nodal\"\n", i+1, i+1)
		}
		files[fmt.Sprintf("f%d.nodal", i)] = s + fmt.Sprintf("block b%d (p, q) {\n  resistor R (p, q) 1 kΩ\n}\n", i)
	}
	files["f0.nodal"] += "# nodal: accept unused-block because library blocks\n"
	return files
}

type endless struct{}

func (endless) Read(p []byte) (int, error) {
	for i := range p {
		p[i] = 'z'
	}
	return len(p), nil
}

func symlink(t *testing.T, target, name string) {
	t.Helper()
	if err := os.Symlink(target, name); err != nil {
		t.Skipf("no symlinks here: %v", err)
	}
}

func fifo(t *testing.T, name string) {
	t.Helper()
	os.MkdirAll(filepath.Dir(name), 0o755)
	if err := syscall.Mkfifo(name, 0o644); err != nil {
		t.Skipf("no FIFOs here: %v", err)
	}
}

// hostileRepo lays out base/repo (with a .git folder) and base/outside.
func hostileRepo(t *testing.T, c hostileCase) (repo, outside string) {
	t.Helper()
	base := t.TempDir()
	repo, outside = filepath.Join(base, "repo"), filepath.Join(base, "outside")
	for _, d := range []string{filepath.Join(repo, ".git"), filepath.Join(repo, "sub"), outside} {
		if err := os.MkdirAll(d, 0o755); err != nil {
			t.Fatal(err)
		}
	}
	if err := os.WriteFile(filepath.Join(outside, "secret.txt"), []byte(secret+" more words\n"+secret+"\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	for name, text := range c.files {
		text = strings.ReplaceAll(text, "OUTSIDE", outside)
		p := filepath.Join(repo, filepath.FromSlash(name))
		if err := os.MkdirAll(filepath.Dir(p), 0o755); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(p, []byte(text), 0o644); err != nil {
			t.Skipf("file name %q not possible here: %v", name, err)
		}
	}
	if c.setup != nil {
		c.setup(t, repo, outside)
	}
	return repo, outside
}

func TestHostileInput(t *testing.T) {
	for _, c := range hostileCases() {
		t.Run(c.name, func(t *testing.T) {
			repo, _ := hostileRepo(t, c)
			t.Chdir(repo)
			for _, format := range []string{"text", "json", "sarif", "markdown"} {
				var out, errb bytes.Buffer
				var stdin io.Reader = strings.NewReader("")
				if c.stdin != nil {
					stdin = c.stdin()
				}
				args := append([]string{"check", "--format", format}, c.args...)
				code := run(args, stdin, &out, &errb)
				if code != c.code {
					t.Errorf("%s: exit %d, want %d\nstdout:\n%s\nstderr:\n%s", format, code, c.code, out.String(), errb.String())
				}
				if format == "text" {
					both := out.String() + errb.String()
					for _, w := range c.want {
						if !strings.Contains(both, w) {
							t.Errorf("text: output lacks %q\nstdout:\n%s\nstderr:\n%s", w, out.String(), errb.String())
						}
					}
					for _, l := range lines(out.String()) {
						if !gnuLine.MatchString(l) {
							t.Errorf("text: a line that is not one whole finding: %q", l)
						}
					}
				}
				checkSafe(t, format, out.String(), errb.String())
			}
		})
	}
}

// checkSafe holds one run's output to the promises every format keeps.
func checkSafe(t *testing.T, format, stdout, stderr string) {
	t.Helper()
	for _, s := range []struct{ name, text string }{{"stdout", stdout}, {"stderr", stderr}} {
		if strings.Contains(s.text, secret) {
			t.Errorf("%s %s shows the outside file's text:\n%s", format, s.name, s.text)
		}
		for _, l := range lines(s.text) {
			if strings.HasPrefix(strings.TrimLeft(l, " \t"), "::") {
				t.Errorf("%s %s: a line that a CI log takes for a workflow command: %q", format, s.name, l)
			}
			for _, r := range l {
				if r < 0x20 && r != '\t' || r == 0x7f || r >= 0x80 && r < 0xa0 {
					t.Errorf("%s %s: a raw control character %U in %q", format, s.name, r, l)
					break
				}
			}
		}
	}
	if format == "markdown" {
		text := codeSpan.ReplaceAllString(stdout, "")
		for _, bad := range []string{"<", "](", "@", "http"} {
			if strings.Contains(text, bad) {
				t.Errorf("markdown: %q outside a code span:\n%s", bad, stdout)
			}
		}
	}
}

// codeSpan matches a Markdown code span of up to three backticks.
var codeSpan = regexp.MustCompile("```[^`](?:[^`]|`[^`]|``[^`])*```|``[^`](?:[^`]|`[^`])*``|`[^`]+`")

func lines(s string) []string {
	s = strings.TrimSuffix(s, "\n")
	if s == "" {
		return nil
	}
	return strings.Split(s, "\n")
}

// --staged in ordinary git states: a folder name with a space, a merge
// stopped on a conflict, a file name with a line break.
func TestStagedGitStates(t *testing.T) {
	const bad = "ground gnd\nresistor R1 (q, gnd) 1 kF\n"
	t.Run("folder with a space", func(t *testing.T) {
		dir := gitRepo(t)
		write(t, filepath.Join(dir, "sp ace", "a.nodal"), bad)
		git(t, dir, "add", ".")
		t.Chdir(dir)
		code, out, errOut := runCLI(t, "", "check", "--staged")
		if code != 1 || !strings.Contains(out, "sp ace/a.nodal:2:22: error:") {
			t.Errorf("exit %d, want 1 and the finding\nstdout:\n%s\nstderr:\n%s", code, out, errOut)
		}
		code, out, errOut = runCLI(t, "", "check", "--staged", "sp ace/a.nodal")
		if code != 1 || !strings.Contains(out, "sp ace/a.nodal:2:22: error:") {
			t.Errorf("named: exit %d, want 1\nstdout:\n%s\nstderr:\n%s", code, out, errOut)
		}
	})
	t.Run("unmerged entry", func(t *testing.T) {
		dir := gitRepo(t)
		write(t, filepath.Join(dir, "m.nodal"), "ground gnd\n# base\n")
		git(t, dir, "add", ".")
		git(t, dir, "commit", "-qm", "base")
		git(t, dir, "checkout", "-qb", "other")
		write(t, filepath.Join(dir, "m.nodal"), "ground gnd\n# other\n")
		git(t, dir, "commit", "-qam", "other")
		git(t, dir, "checkout", "-q", "-")
		write(t, filepath.Join(dir, "m.nodal"), "ground gnd\n# mine\n")
		git(t, dir, "commit", "-qam", "mine")
		cmd := exec.Command("git", "merge", "-q", "other")
		cmd.Dir = dir
		cmd.Env = append(os.Environ(), "GIT_CONFIG_GLOBAL=/dev/null", "GIT_CONFIG_NOSYSTEM=1")
		if err := cmd.Run(); err == nil {
			t.Fatal("the merge did not stop on a conflict")
		}
		t.Chdir(dir)
		for _, args := range [][]string{{"check", "--staged"}, {"check", "--staged", "m.nodal"}} {
			code, _, errOut := runCLI(t, "", args...)
			if code != 2 || !strings.Contains(errOut, "m.nodal: unmerged") || !strings.Contains(errOut, "resolve the merge first") {
				t.Errorf("%v: exit %d, want 2 and a message naming m.nodal\nstderr:\n%s", args, code, errOut)
			}
		}
	})
	t.Run("name with a line break", func(t *testing.T) {
		dir := gitRepo(t)
		name := "two\nlines.nodal"
		if err := os.WriteFile(filepath.Join(dir, name), []byte(bad), 0o644); err != nil {
			t.Skipf("no such file names here: %v", err)
		}
		git(t, dir, "add", ".")
		t.Chdir(dir)
		code, out, errOut := runCLI(t, "", "check", "--staged")
		if code != 1 || !strings.Contains(out, `two\nlines.nodal:2:22: error:`) {
			t.Errorf("exit %d, want 1 and the finding on one line\nstdout:\n%s\nstderr:\n%s", code, out, errOut)
		}
		for _, l := range lines(out) {
			if !gnuLine.MatchString(l) {
				t.Errorf("a line that is not one whole finding: %q", l)
			}
		}
	})
}

// nodal report prints the title, the design name and net and part names
// escaped: no line it writes can begin with "::" or hold a raw control
// character.
func TestReportForgedNames(t *testing.T) {
	dir := t.TempDir()
	write(t, filepath.Join(dir, ".git", "HEAD"), "")
	src := "design board \"title\x1b[2J\x07\"\nground gnd\n" +
		"source V1 (\"::warning::net\", gnd) 5 V\nresistor R1 (\"::warning::net\", \"<b>x</b>\") 1 kΩ\nresistor R2 (\"<b>x</b>\", gnd) 1 kΩ\n"
	write(t, filepath.Join(dir, "r.nodal"), src)
	t.Chdir(dir)
	code, out, errOut := runCLI(t, "", "report", "r.nodal")
	if code != 0 {
		t.Fatalf("exit %d\n%s\n%s", code, out, errOut)
	}
	if !strings.Contains(out, `\x3a:warning::net`) || !strings.Contains(out, `title\x1b[2J\x07`) {
		t.Errorf("the title or a net name is not shown escaped:\n%s", out)
	}
	checkSafe(t, "report", out, errOut)
}

// deepNames is a design of depth levels of blocks, each holding one
// instance named with nameLen bytes, a leaf of leaf parts and top
// instances of the outermost level, also long-named: every part's name
// carries the whole chain of long names.
func deepNames(depth, nameLen, leaf, top int) string {
	var b strings.Builder
	b.WriteString("block l0 (p, q) {\n")
	for i := 0; i < leaf; i++ {
		fmt.Fprintf(&b, "  resistor R%d (p, q) 1 kΩ\n", i)
	}
	b.WriteString("}\n")
	for lv := 1; lv <= depth; lv++ {
		fmt.Fprintf(&b, "block l%d (p, q) {\n  l%d N%d%s (p, m)\n  resistor RM (m, q) 1 kΩ\n}\n", lv, lv-1, lv, strings.Repeat("x", nameLen))
	}
	b.WriteString("block w (p, q) {\n")
	for i := 0; i < top; i++ {
		fmt.Fprintf(&b, "  l%d T%d%s (p, q)\n", depth, i, strings.Repeat("x", nameLen))
	}
	b.WriteString("}\nground gnd\nsource V (a, gnd) 1 V\nresistor RA (a, gnd) 1 kΩ\nw W (a, gnd)\n")
	return b.String()
}

// The deep design of long names is checked (the model keeps each name
// once), but nodal report, which lists every part by its whole path,
// would list 3.7 GiB of names: it refuses, naming the limit, before
// building any, and so does nodal diff for that side.
func TestReportDeepNamesRefused(t *testing.T) {
	dir := t.TempDir()
	write(t, filepath.Join(dir, ".git", "HEAD"), "")
	write(t, filepath.Join(dir, "deep.nodal"), deepNames(60, 4000, 100, 100))
	t.Chdir(dir)
	if code, out, errOut := runCLI(t, "", "check", "deep.nodal"); code != 0 {
		t.Fatalf("check: exit %d\n%s\n%.2000s", code, out, errOut)
	}
	code, out, errOut := runCLI(t, "", "report", "deep.nodal")
	if code != 2 || out != "" || !strings.Contains(errOut, "over the limit of 256 MiB") || len(errOut) > 1000 {
		t.Errorf("report: exit %d, %d bytes out, stderr %.1000q", code, len(out), errOut)
	}
}
