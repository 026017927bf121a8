package rules

// allow.go: accepting a finding. A comment
//
//	# nodal: accept floating-net, shorted-part because test pad for the probe
//
// at the end of a statement's line, or alone on the line just above it,
// accepts the named rules' findings that start on that statement's line:
// they are dropped from the output. The reason after "because" is
// required. The pass runs after every rule, so it sees every finding; it
// reports its own findings under the three rules below, which cannot
// themselves be accepted.

import (
	"sort"
	"strconv"
	"strings"
	"unicode"
	"unicode/utf8"

	"nodal/circuit"
	"nodal/config"
	"nodal/diag"
	"nodal/grammar"
)

// AcceptReason reports an accept comment without a reason.
var AcceptReason = &Analyzer{
	Name:     "accept-reason",
	Severity: diag.Warning,
	Doc: `an accept comment without a reason after because
An accept comment must say why the finding is acceptable, after "because",
so that a reviewer can judge it later. Until it does, it accepts nothing.
Reported by the acceptance pass, after every other rule has run.`,
}

// StaleAccept reports an accept comment that matched no finding.
var StaleAccept = &Analyzer{
	Name:     "stale-accept",
	Severity: diag.Note,
	Doc: `an accept comment that matches no finding
The finding it was written for is gone (or never started on that line), so
the comment would only hide the next, unrelated, finding. Delete it. An
accept for a rule switched off in the configuration is not reported.
Reported by the acceptance pass, after every other rule has run.`,
}

// BadAccept reports a nodal: comment that cannot be read.
var BadAccept = &Analyzer{
	Name:     "bad-accept",
	Severity: diag.Error,
	Doc: `a nodal: comment that names no rule, an unknown rule, an unknown verb or an old form
Comments that start with "nodal:" are instructions to the checker. One that
it cannot read accepts nothing, so the finding it was meant for stays; the
message suggests the closest rule id, or shows an old form written anew.
Reported by the acceptance pass, after every other rule has run.`,
}

// acceptDirective is one parsed accept comment.
type acceptDirective struct {
	pos, end diag.Pos
	target   int // line whose findings it covers
	rules    []string
	reason   string
	used     []bool
}

const directivePrefix = "nodal:"

// Suppress drops the findings that accept comments in srcs cover and adds
// the findings of the suppression rules themselves, at severity Off (the
// rule's default, set with the rest in the runner's last pass). known
// reports whether a rule id exists (nil: the registered rules). The result
// is not sorted.
func Suppress(fset *diag.FileSet, srcs []circuit.SourceFile, diags diag.List, cfg *Config, known func(string) bool) diag.List {
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
	byLine := map[key][]*acceptDirective{}
	var all []*acceptDirective
	for _, s := range srcs {
		for _, c := range s.Comments {
			ad, ok := parseAccept(s, c, known, report)
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
			report(StaleAccept, diag.Diagnostic{Pos: ad.pos, End: ad.end,
				Message: "accept " + r + " matches nothing: no " + r + " finding starts on this statement's line; delete it"})
		}
	}
	return append(out, extra...)
}

// parseAccept reads one comment. It returns ok only for a usable accept
// directive; problems are reported through report.
func parseAccept(s circuit.SourceFile, c grammar.Comment, known func(string) bool, report func(*Analyzer, diag.Diagnostic)) (*acceptDirective, bool) {
	text := strings.TrimSpace(strings.TrimPrefix(c.Text, "#"))
	if !strings.HasPrefix(text, directivePrefix) {
		return nil, false
	}
	pos, end := c.Pos.At(s.File), c.End().At(s.File)
	bad := func(msg string) (*acceptDirective, bool) {
		report(BadAccept, diag.Diagnostic{Pos: pos, End: end, Message: msg})
		return nil, false
	}
	body := strings.TrimSpace(text[len(directivePrefix):])
	verb, rest, _ := strings.Cut(body, " ")
	switch {
	case verb == "allow":
		return bad("the form \"allow RULE -- reason\" is not read and accepts nothing; write " + quote(rewriteOld(rest)))
	case verb != "accept":
		return bad("unknown nodal: instruction " + quote(verb) + "; write \"# nodal: accept RULE because reason\"")
	}
	ids, reason, hasReason := cutWord(rest, "because")
	reason = strings.TrimSpace(reason)
	if !hasReason && strings.Contains(ids, "--") {
		return bad("the reason follows the word because, not --; write " + quote(rewriteOld(rest)))
	}
	var rules []string
	for _, f := range strings.Split(ids, ",") {
		f = strings.TrimSpace(f)
		switch {
		case f == "":
			continue
		case strings.ContainsAny(f, " \t"):
			report(BadAccept, diag.Diagnostic{Pos: pos, End: end,
				Message: "accept lists " + quote(f) + "; separate rule ids with commas (accept floating-net, case-clash because ...)"})
			continue
		case !known(f):
			msg := "accept names " + quote(f) + ", which is not a rule"
			if now, ok := config.RenamedRules[f]; ok {
				msg += "; it is now called " + now
			} else if sug := diag.Suggest(f, Names()); sug != "" {
				msg += "; did you mean " + sug + "?"
			} else {
				msg += "; \"nodal rules\" lists them"
			}
			report(BadAccept, diag.Diagnostic{Pos: pos, End: end, Message: msg})
			continue
		case f == AcceptReason.Name || f == StaleAccept.Name || f == BadAccept.Name:
			report(BadAccept, diag.Diagnostic{Pos: pos, End: end, Message: "findings of " + f + " cannot be accepted; fix the accept comment instead"})
			continue
		}
		rules = append(rules, f)
	}
	if len(rules) == 0 {
		if strings.TrimSpace(ids) == "" {
			return bad("accept names no rule; write \"# nodal: accept RULE because reason\"")
		}
		return nil, false
	}
	if !hasReason || reason == "" {
		report(AcceptReason, diag.Diagnostic{Pos: pos, End: end,
			Message: "accept " + strings.Join(rules, ", ") + " has no reason; add one after \"because\" (the finding stays until then)"})
		return nil, false
	}
	sort.Strings(rules)
	ad := &acceptDirective{pos: pos, end: end, rules: rules, reason: reason, used: make([]bool, len(rules)), target: c.Line}
	if c.Alone {
		ad.target = c.Line + 1
	}
	return ad, true
}

// cutWord cuts s around the first occurrence of word standing as a word
// of its own (not inside a rule id or another word).
func cutWord(s, word string) (before, after string, found bool) {
	for i := 0; ; {
		j := strings.Index(s[i:], word)
		if j < 0 {
			return s, "", false
		}
		j += i
		k := j + len(word)
		if (j == 0 || isSpace(s[j-1]) || s[j-1] == ',') && (k == len(s) || isSpace(s[k])) {
			return s[:j], s[k:], true
		}
		i = j + 1
	}
}

func isSpace(c byte) bool { return c == ' ' || c == '\t' }

// rewriteOld writes the text after an old "allow" verb (RULE, RULE --
// reason) as an accept comment.
func rewriteOld(rest string) string {
	ids, reason, _ := strings.Cut(rest, "--")
	var list []string
	for _, f := range strings.FieldsFunc(ids, func(r rune) bool { return r == ',' || r == ' ' || r == '\t' }) {
		if now, ok := config.RenamedRules[f]; ok {
			f = now
		}
		list = append(list, f)
	}
	names := strings.Join(list, ", ")
	if names == "" {
		names = "RULE"
	}
	reason = strings.TrimSpace(reason)
	if reason == "" {
		reason = "REASON"
	}
	return "# nodal: accept " + names + " because " + reason
}

// quote puts a word from a comment in quotes for a message, escaping it
// when it is not printable UTF-8, so that every message stays text.
func quote(s string) string {
	for _, r := range s {
		if r == utf8.RuneError || !unicode.IsPrint(r) {
			return strconv.Quote(s)
		}
	}
	return "\"" + s + "\""
}
