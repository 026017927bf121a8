package editors_test

import (
	"os/exec"
	"strings"
	"testing"
)

// TestTextMateWithVSCodeEngine runs the grammar's own test file
// (textmate/sample.test.nodal, assertions in comments under each line)
// through vscode-tmgrammar-test, which tokenises with vscode-textmate and
// Oniguruma, the engine VS Code uses, and reads the grammar from the
// folder's package.json as VS Code does.
func TestTextMateWithVSCodeEngine(t *testing.T) {
	tool, err := exec.LookPath("vscode-tmgrammar-test")
	if err != nil {
		t.Skip("vscode-tmgrammar-test is not installed (npm install -g vscode-tmgrammar-test@0.1.3); the grammar is tested by TestTextMateGrammar alone")
	}
	cmd := exec.Command(tool, "sample.test.nodal")
	cmd.Dir = "textmate"
	out, err := cmd.CombinedOutput()
	if err != nil || !strings.Contains(string(out), "successfuly") {
		t.Fatalf("vscode-tmgrammar-test: %v\n%s", err, out)
	}
}
