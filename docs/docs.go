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

// BaseURL is where the docs folder is published, set by SetBaseURL from
// NODAL_DOCS_URL; rule pages are at BaseURL + "rules/<id>.md". The
// project publishes no site of its own, so it is empty unless a team sets
// the address where its copy of the repository's docs folder can be read:
// output then carries no link at all rather than one to a placeholder
// (SARIF carries each rule's page in the log itself either way). Set it
// before any output is written.
var BaseURL = ""

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

// RuleURL returns the address of a rule's page, or "" when no address is
// configured.
func RuleURL(id string) string {
	if BaseURL == "" {
		return ""
	}
	return BaseURL + "rules/" + id + ".md"
}

// Section returns the text of the "## heading" section of a page, without
// its heading and trimmed, or "".
func Section(page, heading string) string {
	start := strings.Index(page, "\n## "+heading+"\n")
	if start < 0 {
		return ""
	}
	body := page[start+len("\n## "+heading+"\n"):]
	if end := strings.Index(body, "\n## "); end >= 0 {
		body = body[:end]
	}
	return strings.TrimSpace(body)
}

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
