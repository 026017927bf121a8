package main

// cli_test.go: the command line's small promises (issue 10, item 7).

import (
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

const badOne = "ground gnd\nresistor R1 (q, gnd) 1 kF\n"

// Flags go anywhere before "--": after the file names too.
func TestFlagsAfterPaths(t *testing.T) {
	dir := t.TempDir()
	f := filepath.Join(dir, "a.nodal")
	write(t, f, badOne)
	code, out, errOut := runCLI(t, "", "check", f, "--format", "json")
	if code != 1 {
		t.Fatalf("exit %d, stderr %q", code, errOut)
	}
	var doc struct{ Diagnostics []struct{ Rule string } }
	if err := json.Unmarshal([]byte(out), &doc); err != nil || len(doc.Diagnostics) == 0 {
		t.Errorf("--format json after the file did not give JSON (%v):\n%s", err, out)
	}
	if strings.Contains(errOut, "--format") {
		t.Errorf("--format taken for a file name: %s", errOut)
	}
	// After "--" a name that looks like a flag is a path.
	code, _, errOut = runCLI(t, "", "check", f, "--", "--format")
	if code != 2 || !strings.Contains(errOut, "--format") {
		t.Errorf("after --: exit %d, stderr %q; want --format taken as a missing path", code, errOut)
	}
	// report too.
	code, out, _ = runCLI(t, "", "report", filepath.Join("..", "..", "demo", "overloaded.nodal"), "--format", "json")
	if code != 0 || !json.Valid([]byte(out)) {
		t.Errorf("report FILE --format json: exit %d\n%s", code, out)
	}
}

func TestConfigCommandEdges(t *testing.T) {
	code, _, errOut := runCLI(t, "", "config", "nosuch/")
	if code != 2 || !strings.Contains(errOut, "nosuch/: no such file or folder") {
		t.Errorf("config nosuch/: exit %d, stderr %q; want 2", code, errOut)
	}
	code, out, errOut := runCLI(t, "", "config", "--help")
	if code != 0 || strings.Count(out+errOut, "Usage: nodal config") != 1 || errOut != "" {
		t.Errorf("config --help: exit %d, usage printed %d times, stderr %q", code, strings.Count(out+errOut, "Usage: nodal config"), errOut)
	}
}

// A file named on the command line that a skip glob matches is said to be
// skipped; it does not vanish.
func TestNamedFileSkippedIsSaid(t *testing.T) {
	dir := t.TempDir()
	write(t, filepath.Join(dir, "nodal.toml"), "skip = [\"scratch/**\"]\n")
	write(t, filepath.Join(dir, "scratch", "try.nodal"), badOne)
	write(t, filepath.Join(dir, "ok.nodal"), "ground gnd\nsource V1 (a, gnd) 5 V\nresistor R1 (a, gnd) 1 kΩ\n")
	t.Chdir(dir)
	code, _, errOut := runCLI(t, "", "check", "scratch/try.nodal", "ok.nodal")
	if code != 0 || !strings.Contains(errOut, "scratch/try.nodal: skipped") || !strings.Contains(errOut, `"scratch/**"`) {
		t.Errorf("exit %d, stderr %q; want 0 and a line saying scratch/try.nodal was skipped by its glob", code, errOut)
	}
	// A walk skips quietly: that is what the glob is for.
	code, _, errOut = runCLI(t, "", "check", ".")
	if code != 0 || strings.Contains(errOut, "skipped") || !strings.Contains(errOut, "in 1 file") {
		t.Errorf("walk: exit %d, stderr %q", code, errOut)
	}
}

// nodal.toml's [limits] apply to the check, not only to "nodal config";
// a flag wins over them.
func TestConfigLimitsApplied(t *testing.T) {
	dir := t.TempDir()
	write(t, filepath.Join(dir, "nodal.toml"), "[limits]\nparts = 3\n")
	write(t, filepath.Join(dir, "a.nodal"), "block pair (p, q) {\n  resistor R1 (p, m) 1 kΩ\n  resistor R2 (m, q) 1 kΩ\n}\n"+
		"ground gnd\nsource V1 (a, gnd) 5 V\npair X1 (a, b)\npair X2 (b, gnd)\n")
	t.Chdir(dir)
	code, out, _ := runCLI(t, "", "check", "a.nodal")
	if code != 1 || !strings.Contains(out, "[expansion-limit]") {
		t.Errorf("limits.parts = 3 with two instances of three: exit %d\n%s", code, out)
	}
	code, out, _ = runCLI(t, "", "check", "--max-parts", "100", "a.nodal")
	if code != 0 || strings.Contains(out, "[expansion-limit]") {
		t.Errorf("--max-parts 100 over limits.parts = 3: exit %d\n%s", code, out)
	}
	write(t, filepath.Join(dir, "nodal.toml"), "[limits]\nfile-mib = 1\n")
	write(t, filepath.Join(dir, "big.nodal"), "ground gnd\n#"+strings.Repeat("x", 1<<20)+"\n")
	code, _, errOut := runCLI(t, "", "check", "big.nodal")
	if code != 2 || !strings.Contains(errOut, "limit of 1 MiB") {
		t.Errorf("limits.file-mib = 1 with a 1 MiB file: exit %d, stderr %q", code, errOut)
	}
}

// SARIF carries each rule's page in the log; a help link is written only
// where NODAL_DOCS_URL gives an address, and Markdown likewise.
func TestRulePagesWithoutPlaceholderLinks(t *testing.T) {
	dir := t.TempDir()
	f := filepath.Join(dir, "a.nodal")
	write(t, f, badOne)
	t.Setenv("NODAL_DOCS_URL", "")
	os.Unsetenv("NODAL_DOCS_URL")
	_, out, _ := runCLI(t, "", "check", "--format", "sarif", f)
	var log struct {
		Runs []struct {
			Tool struct {
				Driver struct {
					InformationURI string `json:"informationUri"`
					Rules          []struct {
						ID              string
						FullDescription struct{ Text string } `json:"fullDescription"`
						Help            struct{ Text, Markdown string }
						HelpURI         *string `json:"helpUri"`
					}
				}
			}
		}
	}
	if err := json.Unmarshal([]byte(out), &log); err != nil {
		t.Fatal(err)
	}
	d := log.Runs[0].Tool.Driver
	if d.InformationURI != "" {
		t.Errorf("informationUri %q without NODAL_DOCS_URL", d.InformationURI)
	}
	for _, r := range d.Rules {
		if r.HelpURI != nil {
			t.Errorf("%s: helpUri %q without NODAL_DOCS_URL", r.ID, *r.HelpURI)
		}
		if !strings.Contains(r.Help.Markdown, "## Putting it right") || !strings.HasPrefix(r.Help.Text, "# "+r.ID) {
			t.Errorf("%s: the rule's page is not in the log: %q", r.ID, r.Help.Text)
		}
		if r.FullDescription.Text == "" {
			t.Errorf("%s: no full description", r.ID)
		}
	}
	_, md, _ := runCLI(t, "", "check", "--format", "markdown", f)
	if strings.Contains(md, "](") || strings.Contains(md, "http") {
		t.Errorf("markdown links without NODAL_DOCS_URL:\n%s", md)
	}
	t.Setenv("NODAL_DOCS_URL", "https://code.example.org/team/nodal/docs")
	_, out, _ = runCLI(t, "", "check", "--format", "sarif", f)
	if !strings.Contains(out, `"helpUri": "https://code.example.org/team/nodal/docs/rules/unit-mismatch.md"`) {
		t.Errorf("no helpUri with NODAL_DOCS_URL set")
	}
	_, md, _ = runCLI(t, "", "check", "--format", "markdown", f)
	if !strings.Contains(md, "[unit-mismatch](https://code.example.org/team/nodal/docs/rules/unit-mismatch.md)") {
		t.Errorf("markdown without its link when NODAL_DOCS_URL is set:\n%s", md)
	}
}

func TestRulesSuggests(t *testing.T) {
	code, _, errOut := runCLI(t, "", "rules", "sourceloop")
	if code != 2 || !strings.Contains(errOut, "did you mean source-loop?") {
		t.Errorf("rules sourceloop: exit %d, stderr %q", code, errOut)
	}
}

// nodal.toml is looked for from the checked file's folder up to the
// repository's top level, also when the file is named from a subfolder;
// one above the repository is not used.
func TestConfigLookupUpToRepositoryTop(t *testing.T) {
	base := t.TempDir()
	repo := filepath.Join(base, "repo")
	write(t, filepath.Join(repo, ".git", "HEAD"), "")
	write(t, filepath.Join(repo, "nodal.toml"), "[rules]\nunit-mismatch = \"off\"\nfloating-net = \"off\"\n")
	write(t, filepath.Join(repo, "sub", "a.nodal"), badOne)
	t.Chdir(filepath.Join(repo, "sub"))
	code, out, errOut := runCLI(t, "", "check", "a.nodal")
	if code != 0 || out != "" {
		t.Errorf("from the subfolder the repository's nodal.toml was not used: exit %d\n%s%s", code, out, errOut)
	}
	// Above the top level: not this repository's settings.
	write(t, filepath.Join(base, "nodal.toml"), "[rules]\nunit-mismatch = \"off\"\nfloating-net = \"off\"\n")
	os.Remove(filepath.Join(repo, "nodal.toml"))
	code, out, _ = runCLI(t, "", "check", "a.nodal")
	if code != 1 || !strings.Contains(out, "[unit-mismatch]") {
		t.Errorf("a nodal.toml above the repository was used: exit %d\n%s", code, out)
	}
}
