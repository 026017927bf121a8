package rules

// allow.go: inline suppression. A comment
//
//	# nodal: allow floating-net, shorted-part -- test pad for the probe
//
// at the end of a statement's line, or alone on the line just above it,
// silences the named rules' findings that start on that statement's line.
// The reason after "--" is required. The pass runs after every rule, so it
// sees every finding; it reports its own findings under the three rules
// below, which cannot themselves be suppressed.

import (
	"sort"
	"strings"

	"nodal/circuit"
	"nodal/diag"
	"nodal/grammar"
)

// AllowReason reports an allow comment without a reason.
var AllowReason = &Analyzer{
	Name:     "allow-reason",
	Severity: diag.Warning,
	Doc: `an allow comment without a reason after --
An allow comment must say why the finding is acceptable, after "--", so that
a reviewer can judge it later. Until it does, it suppresses nothing.
Reported by the suppression pass, after every other rule has run.`,
}

// UnusedAllow reports an allow comment that suppressed nothing.
var UnusedAllow = &Analyzer{
	Name:     "unused-allow",
	Severity: diag.Note,
	Doc: `an allow comment that suppresses nothing
The finding it was written for is gone (or never started on that line), so
the comment only hides the next, unrelated, finding. Delete it. An allow for
a rule switched off in the configuration is not reported.
Reported by the suppression pass, after every other rule has run.`,
}

// BadAllow reports a nodal: comment that cannot be read.
var BadAllow = &Analyzer{
	Name:     "bad-allow",
	Severity: diag.Warning,
	Doc: `a nodal: comment that names no rule, an unknown rule or an unknown verb
Comments that start with "nodal:" are instructions to the checker. One that
it cannot read suppresses nothing; the message suggests the closest rule id.
Reported by the suppression pass, after every other rule has run.`,
}

// Source is one file's text and comments, for the suppression pass: the
// model's own record of a file.
type Source = circuit.SourceFile

// allowDirective is one parsed allow comment.
type allowDirective struct {
	pos, end diag.Pos
	target   int // line whose findings it covers
	rules    []string
	reason   string
	used     []bool
}

const allowPrefix = "nodal:"

// Suppress drops the findings that allow comments in srcs cover and adds
// the findings of the suppression rules themselves, at severity Off (the
// rule's default, set with the rest in the runner's last pass). known
// reports whether a rule id exists (nil: the registered rules). The result
// is not sorted.
func Suppress(fset *diag.FileSet, srcs []Source, diags diag.List, cfg *Config, known func(string) bool) diag.List {
	if known == nil {
		known = func(id string) bool { return Lookup(id) != nil }
	}
	var extra diag.List
	report := func(a *Analyzer, d diag.Diagnostic) {
		d.Rule, d.Severity = a.Name, diag.Off // the runner's last pass sets it
		extra = append(extra, d)
	}
	type key struct {
		file *diag.File
		line int
	}
	byLine := map[key][]*allowDirective{}
	var all []*allowDirective
	for _, s := range srcs {
		for _, c := range s.Comments {
			ad, ok := parseAllow(s, c, known, report)
			if !ok {
				continue
			}
			all = append(all, ad)
			k := key{s.File, ad.target}
			byLine[k] = append(byLine[k], ad)
		}
	}
	if len(all) == 0 && len(extra) == 0 {
		return diags
	}
	out := diags[:0:0]
	for _, d := range diags {
		f := fset.File(d.Pos)
		suppressed := false
		if f != nil {
			line := f.Position(d.Pos).Line
			for _, ad := range byLine[key{f, line}] {
				for i, r := range ad.rules {
					if r == d.Rule {
						ad.used[i] = true
						suppressed = true
					}
				}
			}
		}
		if !suppressed {
			out = append(out, d)
		}
	}
	for _, ad := range all {
		for i, r := range ad.rules {
			if ad.used[i] {
				continue
			}
			if a := Lookup(r); a != nil {
				if s, ok := cfg.severity(a); ok && s == diag.Off {
					continue
				}
			}
			report(UnusedAllow, diag.Diagnostic{Pos: ad.pos, End: ad.end,
				Message: "allow " + r + " suppresses nothing: no " + r + " finding starts on this statement's line; delete it"})
		}
	}
	return append(out, extra...)
}

// parseAllow reads one comment. It returns ok only for a usable allow
// directive; problems are reported through report.
func parseAllow(s Source, c grammar.Comment, known func(string) bool, report func(*Analyzer, diag.Diagnostic)) (*allowDirective, bool) {
	text := strings.TrimSpace(strings.TrimPrefix(c.Text, "#"))
	if !strings.HasPrefix(text, allowPrefix) {
		return nil, false
	}
	pos := s.File.Pos(c.Offset)
	end := s.File.Pos(c.Offset + len(c.Text))
	bad := func(msg string) (*allowDirective, bool) {
		report(BadAllow, diag.Diagnostic{Pos: pos, End: end, Message: msg})
		return nil, false
	}
	body := strings.TrimSpace(text[len(allowPrefix):])
	verb, rest, _ := strings.Cut(body, " ")
	if verb != "allow" {
		return bad("unknown nodal: instruction " + quote(verb) + "; write \"# nodal: allow RULE -- reason\"")
	}
	ids, reason, hasReason := strings.Cut(rest, "--")
	reason = strings.TrimSpace(reason)
	var rules []string
	for _, f := range strings.FieldsFunc(ids, func(r rune) bool { return r == ',' || r == ' ' || r == '\t' }) {
		if !known(f) {
			msg := "allow names " + quote(f) + ", which is not a rule"
			if sug := diag.Suggest(f, Names()); sug != "" {
				msg += "; did you mean " + sug + "?"
			} else {
				msg += "; \"nodal rules\" lists them"
			}
			report(BadAllow, diag.Diagnostic{Pos: pos, End: end, Message: msg})
			continue
		}
		if f == AllowReason.Name || f == UnusedAllow.Name || f == BadAllow.Name {
			report(BadAllow, diag.Diagnostic{Pos: pos, End: end, Message: "findings of " + f + " cannot be suppressed; fix the allow comment instead"})
			continue
		}
		rules = append(rules, f)
	}
	if len(rules) == 0 {
		if strings.TrimSpace(ids) == "" {
			return bad("allow names no rule; write \"# nodal: allow RULE -- reason\"")
		}
		return nil, false
	}
	if !hasReason || reason == "" {
		report(AllowReason, diag.Diagnostic{Pos: pos, End: end,
			Message: "allow " + strings.Join(rules, ", ") + " has no reason; add one after \"--\" (the finding stays until then)"})
		return nil, false
	}
	sort.Strings(rules)
	ad := &allowDirective{pos: pos, end: end, rules: rules, reason: reason, used: make([]bool, len(rules)), target: c.Line}
	if aloneOnLine(s.Src, c.Offset) {
		ad.target = c.Line + 1
	}
	return ad, true
}

// aloneOnLine reports whether only blanks precede offset on its line.
func aloneOnLine(src []byte, offset int) bool {
	for i := offset - 1; i >= 0 && src[i] != '\n'; i-- {
		if src[i] != ' ' && src[i] != '\t' && src[i] != '\r' {
			return false
		}
	}
	return true
}

func quote(s string) string { return "\"" + s + "\"" }
