package main

import (
	"encoding/json"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strings"
	"testing"
)

// readmeBlock returns the body of the first fenced block of README.md
// whose opening fence is fence and that follows the line after.
func readmeBlock(t *testing.T, after, fence string) string {
	t.Helper()
	b, err := os.ReadFile(filepath.Join("..", "..", "README.md"))
	if err != nil {
		t.Fatal(err)
	}
	s := string(b)
	i := strings.Index(s, after)
	if i < 0 {
		t.Fatalf("README.md has no %q", after)
	}
	s = s[i:]
	j := strings.Index(s, fence+"\n")
	if j < 0 {
		t.Fatalf("README.md has no %s block after %q", fence, after)
	}
	s = s[j+len(fence)+1:]
	k := strings.Index(s, "```\n")
	if k < 0 {
		t.Fatal("unclosed block in README.md")
	}
	return s[:k]
}

// The README's example of nodal diff is what nodal diff prints for the
// change it describes (the commit id aside).
func TestReadmeShowsDiff(t *testing.T) {
	dir := gitRepo(t)
	write(t, filepath.Join(dir, "boards", "psu.nodal"), psuBefore)
	git(t, dir, "add", ".")
	git(t, dir, "commit", "-qm", "psu")
	git(t, dir, "branch", "-M", "main")
	git(t, dir, "checkout", "-q", "-b", "feature")
	write(t, filepath.Join(dir, "boards", "psu.nodal"), psuAfter)
	block := readmeBlock(t, "### Reviewing a change", "```")
	cmd, want, ok := strings.Cut(block, "\n")
	if !ok || cmd != "$ nodal diff main" {
		t.Fatalf("README's example starts %q", cmd)
	}
	_, got, errs := runNodal(t, dir, "", "diff", "main")
	id := regexp.MustCompile(`main \([0-9a-f]{12}\)`)
	got = id.ReplaceAllString(got, "main (ID)")
	want = id.ReplaceAllString(want, "main (ID)")
	if got != want {
		t.Errorf("README.md shows\n%s\nnodal diff prints\n%s%s", want, got, errs)
	}
}

// The README's CI recipe, run as it is written in a pull request's
// checkout (with nodal built from this tree on the path): it writes the
// comment and a SARIF log with fingerprints, and its exit status follows
// the errors the change leaves.
func TestReadmeCIRecipe(t *testing.T) {
	if testing.Short() {
		t.Skip("builds the binary")
	}
	if _, err := exec.LookPath("bash"); err != nil {
		t.Skip("bash is not installed")
	}
	recipe := readmeBlock(t, "Then, in the checkout of the pull request", "```sh")
	bin := t.TempDir()
	if out, err := exec.Command("go", "build", "-o", filepath.Join(bin, "nodal"), ".").CombinedOutput(); err != nil {
		t.Fatalf("go build: %v\n%s", err, out)
	}
	// The forge's repository, and a clone of it checked out at the pull
	// request's head.
	origin := gitRepo(t)
	write(t, filepath.Join(origin, "boards", "psu.nodal"), psuBefore)
	git(t, origin, "add", ".")
	git(t, origin, "commit", "-qm", "psu")
	git(t, origin, "branch", "-M", "main")
	work := filepath.Join(t.TempDir(), "pr")
	git(t, filepath.Dir(work), "clone", "-q", origin, work)
	git(t, work, "config", "user.email", "test@nodal.invalid")
	git(t, work, "config", "user.name", "nodal test")
	git(t, work, "checkout", "-q", "-b", "pr")
	write(t, filepath.Join(work, "boards", "psu.nodal"), psuAfter)
	git(t, work, "commit", "-qam", "raise the supply")

	run := func() (string, error) {
		cmd := exec.Command("bash", "-euc", recipe)
		cmd.Dir = work
		cmd.Env = append(os.Environ(), "TARGET=main", "PATH="+bin+string(os.PathListSeparator)+os.Getenv("PATH"),
			"GIT_CONFIG_GLOBAL=/dev/null", "GIT_CONFIG_NOSYSTEM=1")
		out, err := cmd.CombinedOutput()
		return string(out), err
	}
	if out, err := run(); err != nil {
		t.Fatalf("the recipe failed on a change with a warning only: %v\n%s", err, out)
	}
	comment, err := os.ReadFile(filepath.Join(work, "nodal-review.md"))
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(string(comment), "| `R1` | resistor | power | 40 % (100 mW of 250 mW) | 95 % (237 mW of 250 mW) | +55 points |") {
		t.Errorf("the comment lacks R1's row:\n%s", comment)
	}
	var log struct {
		Runs []struct {
			Results []struct {
				PartialFingerprints map[string]string `json:"partialFingerprints"`
			} `json:"results"`
		} `json:"runs"`
	}
	sarif, err := os.ReadFile(filepath.Join(work, "nodal.sarif"))
	if err != nil {
		t.Fatal(err)
	}
	if err := json.Unmarshal(sarif, &log); err != nil || len(log.Runs) != 1 || len(log.Runs[0].Results) != 1 || len(log.Runs[0].Results[0].PartialFingerprints) != 1 {
		t.Errorf("nodal.sarif: %v\n%s", err, sarif)
	}
	// A change that leaves an error fails the job.
	write(t, filepath.Join(work, "boards", "psu.nodal"), psuAfter+"source V2 (vin, gnd) 3 V\n")
	git(t, work, "commit", "-qam", "a second supply fights the first")
	if out, err := run(); err == nil {
		t.Errorf("the recipe passed a change that leaves an error:\n%s", out)
	}
}
