// Package docs carries nodal's documentation inside the binary: the page
// of every rule (rules/<id>.md), which "nodal rules <id>" prints, and the
// address where the same pages are published, which the JSON and SARIF
// output link to. It lives in the docs folder because go:embed cannot
// reach a parent folder.
package docs

import (
	"embed"
	"io/fs"
)

//go:embed rules/*.md
var rulePages embed.FS

// BaseURL is where the docs folder is published; rule pages are at
// BaseURL + "rules/<id>.md". Output that links to the docs uses it.
const BaseURL = "https://nodal.example/docs/"

// RuleURL returns the address of a rule's page.
func RuleURL(id string) string { return BaseURL + "rules/" + id + ".md" }

// Rule returns the Markdown page of a rule, or false if it has none.
func Rule(id string) (string, bool) {
	b, err := fs.ReadFile(rulePages, "rules/"+id+".md")
	if err != nil {
		return "", false
	}
	return string(b), true
}

// RuleIDs returns the ids of every rule that has a page, sorted.
func RuleIDs() []string {
	ents, _ := fs.ReadDir(rulePages, "rules")
	var ids []string
	for _, e := range ents {
		if n := e.Name(); len(n) > 3 && n[len(n)-3:] == ".md" {
			ids = append(ids, n[:len(n)-3])
		}
	}
	return ids
}
