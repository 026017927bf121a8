package check_test

import (
	"os"
	"path/filepath"
	"strings"
	"testing"

	"nodal/rules"
)

// root is the repository root, seen from this package's folder.
const root = ".."

// README.md lists every rule with its default severity, and gives the two
// set-up commands exactly.
func TestReadmeRulesTable(t *testing.T) {
	b, err := os.ReadFile(filepath.Join(root, "README.md"))
	if err != nil {
		t.Fatal(err)
	}
	readme := string(b)
	for _, a := range rules.All {
		row := "| [`" + a.Name + "`](docs/rules/" + a.Name + ".md) | " + a.Severity.String() + " |"
		if !strings.Contains(readme, row) {
			t.Errorf("README.md has no row %q", row)
		}
	}
	for _, cmd := range []string{"go run ./cmd/nodal check examples", "go test ./..."} {
		if !strings.Contains(readme, "```sh\n"+cmd+"\n```") {
			t.Errorf("README.md does not give %q as a command block", cmd)
		}
	}
}
