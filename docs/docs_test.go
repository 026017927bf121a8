package docs_test

import (
	"strings"
	"testing"

	"nodal/check"
	"nodal/docs"
	"nodal/rules"
)

var sections = []string{"## What nodal looks for", "## What can go wrong", "## Example", "## Putting it right", "## Accepting a finding"}

// noShortExample lists rules that no small design can fire: no-convergence
// needs a design that defeats Newton, gmin and source stepping, and every
// small one found converges.
var noShortExample = map[string]bool{"no-convergence": true}

// Every registered rule has a page with the sections in order, and the
// page's example, checked, fires that rule.
func TestEveryRuleHasAPage(t *testing.T) {
	for _, a := range rules.All {
		page, ok := docs.Rule(a.Name)
		if !ok {
			t.Errorf("rule %s has no page docs/rules/%s.md", a.Name, a.Name)
			continue
		}
		lines := strings.Split(page, "\n")
		if lines[0] != "# "+a.Name {
			t.Errorf("%s.md: first line %q, want %q", a.Name, lines[0], "# "+a.Name)
		}
		if len(lines) < 3 || lines[1] != "" || strings.TrimSpace(lines[2]) == "" || strings.HasPrefix(lines[2], "#") {
			t.Errorf("%s.md: no one-line summary under the title", a.Name)
		}
		at := 0
		for _, s := range sections {
			i := strings.Index(page[at:], "\n"+s+"\n")
			if i < 0 {
				t.Errorf("%s.md: no %q section after the previous one", a.Name, s)
				break
			}
			at += i + 1
		}
		example := exampleBlock(page)
		if noShortExample[a.Name] {
			// No small design triggers it; the page must show the finding.
			if !strings.Contains(page, "["+a.Name+"]") {
				t.Errorf("%s.md: shows no finding of the rule", a.Name)
			}
			continue
		}
		if example == "" {
			t.Errorf("%s.md: the Example section has no ```nodal block", a.Name)
			continue
		}
		res, err := check.Source(a.Name+".md", []byte(example), nil)
		if err != nil {
			t.Fatal(err)
		}
		fired := false
		for _, d := range res.Diags {
			fired = fired || d.Rule == a.Name
		}
		if !fired {
			t.Errorf("%s.md: the example does not fire %s; it reports %v", a.Name, a.Name, res.Diags)
		}
	}
}

// No page for a rule that does not exist.
func TestNoStrayPages(t *testing.T) {
	for _, id := range docs.RuleIDs() {
		if rules.Lookup(id) == nil {
			t.Errorf("docs/rules/%s.md describes no registered rule", id)
		}
	}
}

// exampleBlock returns the first ```nodal block of the Example section.
func exampleBlock(page string) string {
	i := strings.Index(page, "\n## Example\n")
	if i < 0 {
		return ""
	}
	rest := page[i:]
	if j := strings.Index(rest[1:], "\n## "); j >= 0 {
		rest = rest[:j+1]
	}
	start := strings.Index(rest, "```nodal\n")
	if start < 0 {
		return ""
	}
	body := rest[start+len("```nodal\n"):]
	end := strings.Index(body, "```")
	if end < 0 {
		return ""
	}
	return body[:end]
}
