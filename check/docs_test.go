package check_test

import (
	"os"
	"path/filepath"
	"strings"
	"testing"

	"nodal/check"
)

// The examples in README.md and docs/language.md are clean designs.
func TestDocExamplesAreClean(t *testing.T) {
	for _, doc := range []string{"README.md", "docs/language.md"} {
		b, err := os.ReadFile(filepath.Join(root, doc))
		if err != nil {
			t.Fatal(err)
		}
		blocks := strings.Split(string(b), "```nodal\n")[1:]
		if len(blocks) == 0 {
			t.Errorf("%s has no nodal example", doc)
		}
		for i, blk := range blocks {
			src, _, _ := strings.Cut(blk, "```")
			if strings.Contains(src, "nodal: accept") || strings.Contains(src, "include ") || !strings.Contains(src, "ground") {
				continue // a fragment, or a design that needs files beside it
			}
			res, err := check.Source(doc, []byte(src), nil)
			if err != nil {
				t.Fatal(err)
			}
			for _, d := range res.Diags {
				if solveRules[d.Rule] {
					continue // the solver's findings are tested in solve and rules
				}
				t.Errorf("%s example %d: %s", doc, i+1, d.Message)
			}
		}
	}
}
