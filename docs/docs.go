// Package docs carries nodal's documentation inside the binary: the page
// of every rule (rules/<id>.md), which "nodal rules <id>" prints, and the
// address where the same pages are published, which the JSON and SARIF
// output link to. It lives in the docs folder because go:embed cannot
// reach a parent folder.
package docs

import (
	"embed"
	"fmt"
	"io/fs"
	"net/url"
	"strings"
)

//go:embed rules/*.md
var rulePages embed.FS

// DefaultBaseURL is the placeholder address of the published docs folder.
// The project publishes no site of its own: a team sets the address where
// its copy of the repository's docs folder can be read (NODAL_DOCS_URL on
// the command line), so that links in JSON, SARIF and Markdown open.
const DefaultBaseURL = "https://nodal.example/docs/"

// BaseURL is where the docs folder is published; rule pages are at
// BaseURL + "rules/<id>.md". Output that links to the docs uses it. Set it
// with SetBaseURL before any output is written.
var BaseURL = DefaultBaseURL

// SetBaseURL checks that s is an absolute http(s) address (SARIF requires
// absolute URIs) and makes it BaseURL, adding a trailing slash if missing.
func SetBaseURL(s string) error {
	u, err := url.Parse(s)
	if err != nil || !u.IsAbs() || (u.Scheme != "https" && u.Scheme != "http") || u.Host == "" {
		return fmt.Errorf("docs address %q is not an absolute http(s) URL", s)
	}
	if !strings.HasSuffix(s, "/") {
		s += "/"
	}
	BaseURL = s
	return nil
}

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
