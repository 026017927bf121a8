package diag

import (
	"fmt"
	"sort"
	"strings"
)

// Severity orders findings: Note < Warning < Error. Off disables a rule.
type Severity int8

const (
	Off Severity = iota
	Note
	Warning
	Error
)

var severityNames = [...]string{Off: "off", Note: "note", Warning: "warning", Error: "error"}

// String returns the lower-case name used in output and configuration.
func (s Severity) String() string {
	if int(s) < len(severityNames) && s >= 0 {
		return severityNames[s]
	}
	return fmt.Sprintf("severity(%d)", int(s))
}

// ParseSeverity reads "off", "note", "warning" or "error".
func ParseSeverity(s string) (Severity, bool) {
	for i, n := range severityNames {
		if n == s {
			return Severity(i), true
		}
	}
	return Off, false
}

// Related is another place a finding names: a part around a loop, the
// instance line of a block.
type Related struct {
	Pos     Pos
	End     Pos
	Message string
}

// Edit replaces the source text from Pos up to End with NewText. An edit
// with End equal to Pos inserts.
type Edit struct {
	Pos, End Pos
	NewText  string
}

// Fix is one way to resolve a finding: a message for the person choosing
// it ("write 10 kΩ") and the edits that make it. Edits of one fix do not
// overlap.
type Fix struct {
	Message string
	Edits   []Edit
}

// Diagnostic is one finding.
type Diagnostic struct {
	Pos      Pos
	End      Pos // NoPos when only a point is known
	Rule     string
	Severity Severity
	// Category groups findings of one rule by what they are about, in the
	// rule's own words ("value", "pins"); it may be empty.
	Category string
	Message  string
	// Subject is the instance path of the part or net the finding is about
	// ("R1", "ROW2.C4.R", "ROW2.mid"), or empty for a finding about the
	// file or a block's text. It identifies the finding across revisions of
	// a design, where positions move.
	Subject string
	Related []Related
	// Fixes are the edits that would resolve the finding, for editors
	// that offer them; most findings have none.
	Fixes []Fix
}

// List is a set of diagnostics that sorts and de-duplicates.
type List []Diagnostic

// Add appends a diagnostic.
func (l *List) Add(d Diagnostic) { *l = append(*l, d) }

// Order is the order in which findings are listed: by file name, line and
// column, then rule and message. List.Sort uses it, and output, which
// lists the findings of several checks together, uses the same.
type Order struct {
	File         string
	Line, Column int
	Rule         string
	Message      string
}

// Less reports whether a is listed before b.
func (a Order) Less(b Order) bool {
	if a.File != b.File {
		return a.File < b.File
	}
	if a.Line != b.Line {
		return a.Line < b.Line
	}
	if a.Column != b.Column {
		return a.Column < b.Column
	}
	if a.Rule != b.Rule {
		return a.Rule < b.Rule
	}
	return a.Message < b.Message
}

// Sort orders the list by Order (file names as the file set resolves
// them), so that output is deterministic.
func (l List) Sort(fset *FileSet) {
	keys := make([]Order, len(l))
	for i := range l {
		p := fset.Position(l[i].Pos)
		keys[i] = Order{p.Filename, p.Line, p.Column, l[i].Rule, l[i].Message}
	}
	idx := make([]int, len(l))
	for i := range idx {
		idx[i] = i
	}
	sort.SliceStable(idx, func(a, b int) bool { return keys[idx[a]].Less(keys[idx[b]]) })
	out := make(List, len(l))
	for i, j := range idx {
		out[i] = l[j]
	}
	copy(l, out)
}

// Dedup removes exact repeats (same position, rule and message) from a
// sorted list and returns the shortened list.
func (l List) Dedup() List {
	if len(l) < 2 {
		return l
	}
	out := l[:1]
	for _, d := range l[1:] {
		last := &out[len(out)-1]
		if d.Pos == last.Pos && d.Rule == last.Rule && d.Message == last.Message {
			continue
		}
		out = append(out, d)
	}
	return out
}

// Count returns how many diagnostics have each severity.
func (l List) Count() (errors, warnings, notes int) {
	for _, d := range l {
		switch d.Severity {
		case Error:
			errors++
		case Warning:
			warnings++
		case Note:
			notes++
		}
	}
	return
}

// Max returns the highest severity in the list (Off when empty).
func (l List) Max() Severity {
	m := Off
	for _, d := range l {
		if d.Severity > m {
			m = d.Severity
		}
	}
	return m
}

// Format returns the GNU form "file:line:col: severity: message [rule]".
func Format(fset *FileSet, d Diagnostic) string {
	var b strings.Builder
	b.WriteString(fset.Position(d.Pos).String())
	b.WriteString(": ")
	b.WriteString(d.Severity.String())
	b.WriteString(": ")
	b.WriteString(d.Message)
	if d.Rule != "" {
		b.WriteString(" [")
		b.WriteString(d.Rule)
		b.WriteString("]")
	}
	return b.String()
}
