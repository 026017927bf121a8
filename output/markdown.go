package output

import (
	"bufio"
	"fmt"
	"io"
	"sort"
	"strings"

	"nodal/diag"
	"nodal/docs"
)

// writeMarkdown writes a pull-request summary: counts by severity and by
// rule, then the findings, worst first, capped at MaxRows. Every piece of
// user text (file names, messages with their part and net names) is in a
// code span (see code), so a hostile name renders as text.
func writeMarkdown(w io.Writer, r *Report, opt Options) error {
	bw := bufio.NewWriter(w)
	e, wn, n := r.Count()
	fmt.Fprintf(bw, "### nodal: %s\n\n", r.Summary())
	if len(r.Findings) == 0 {
		fmt.Fprintf(bw, "No findings.\n")
		return bw.Flush()
	}
	fmt.Fprintf(bw, "| severity | findings |\n|---|---:|\n")
	for _, c := range []struct {
		s diag.Severity
		n int
	}{{diag.Error, e}, {diag.Warning, wn}, {diag.Note, n}} {
		if c.n > 0 {
			fmt.Fprintf(bw, "| %s | %d |\n", c.s, c.n)
		}
	}
	type ruleCount struct {
		rule string
		sev  diag.Severity
		n    int
	}
	counts := map[string]*ruleCount{}
	for _, f := range r.Findings {
		rc := counts[f.Rule]
		if rc == nil {
			rc = &ruleCount{rule: f.Rule}
			counts[f.Rule] = rc
		}
		rc.n++
		rc.sev = max(rc.sev, f.Severity)
	}
	byRule := make([]*ruleCount, 0, len(counts))
	for _, rc := range counts {
		byRule = append(byRule, rc)
	}
	sort.Slice(byRule, func(i, j int) bool {
		a, b := byRule[i], byRule[j]
		if a.sev != b.sev {
			return a.sev > b.sev
		}
		if a.n != b.n {
			return a.n > b.n
		}
		return a.rule < b.rule
	})
	fmt.Fprintf(bw, "\n| rule | severity | findings |\n|---|---|---:|\n")
	for _, rc := range byRule {
		fmt.Fprintf(bw, "| %s | %s | %d |\n", ruleLink(rc.rule), rc.sev, rc.n)
	}
	worst := make([]Finding, len(r.Findings))
	copy(worst, r.Findings)
	sort.SliceStable(worst, func(i, j int) bool { return worst[i].Severity > worst[j].Severity })
	limit := opt.MaxRows
	if limit <= 0 {
		limit = 50
	}
	fmt.Fprintf(bw, "\n| location | severity | rule | message |\n|---|---|---|---|\n")
	for i, f := range worst {
		if i == limit {
			break
		}
		fmt.Fprintf(bw, "| %s | %s | %s | %s |\n", code(position(f.File, f.Line, f.Column)), f.Severity, ruleLink(f.Rule), code(f.Message))
	}
	if len(worst) > limit {
		fmt.Fprintf(bw, "\nand %d more.\n", len(worst)-limit)
	}
	return bw.Flush()
}

// ruleLink is a rule's id, linked to its page where an address is
// configured (NODAL_DOCS_URL).
func ruleLink(id string) string {
	if id == "" {
		return ""
	}
	u := docs.RuleURL(id)
	if u == "" {
		return code(id)
	}
	return "[" + id + "](" + u + ")"
}

// code puts user text in a code span that is safe in a table cell: inside
// it Markdown renders no HTML, link, image, mention or emphasis. Control
// characters are escaped (TextSafe), "|" is escaped for the table, and
// the fence is one backtick longer than the longest run in the text.
func code(s string) string {
	s = strings.ReplaceAll(TextSafe(s), "|", "\\|")
	if s == "" {
		return ""
	}
	run, longest := 0, 0
	for i := 0; i < len(s); i++ {
		if s[i] == '`' {
			run++
			longest = max(longest, run)
		} else {
			run = 0
		}
	}
	fence := strings.Repeat("`", longest+1)
	if longest > 0 || s[0] == ' ' || s[len(s)-1] == ' ' {
		return fence + " " + s + " " + fence
	}
	return fence + s + fence
}

// MarkdownCode is code for the other Markdown writers (the comparison of
// nodal diff), so that all of nodal's Markdown escapes user text alike.
func MarkdownCode(s string) string { return code(s) }

// MarkdownRule is ruleLink for the other Markdown writers.
func MarkdownRule(id string) string { return ruleLink(id) }
