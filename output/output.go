// Package output writes the findings of a check in the forms its users
// read: GNU text lines for terminals and editors, a JSON document for
// scripts, a SARIF 2.1.0 log for code-scanning and review tools, and a
// Markdown summary for a pull-request comment.
//
// Every writer is deterministic: the same findings give the same bytes.
// Findings are sorted by file, line, column, rule and message, as the text
// form always was. Lines and columns start at 1 and columns count bytes,
// except in SARIF, whose columns count Unicode code points as that format
// requires (converted when the source text is at hand).
package output

import (
	"fmt"
	"io"
	"sort"

	"nodal/diag"
	"nodal/rules"
)

// Formats lists the names Write accepts.
var Formats = []string{"text", "json", "sarif", "markdown"}

// Finding is one diagnostic with its positions resolved.
type Finding struct {
	File      string
	Line      int // 0 when only the file is known
	Column    int
	EndLine   int // the position just past the last byte
	EndColumn int
	Severity  diag.Severity
	Rule      string
	Message   string
	Related   []Related
	// Design is the checked file the finding came from (File may be a
	// file it includes); Subject the instance path of the part or net the
	// finding is about, or "". Together with Rule they identify a finding
	// across revisions (Key).
	Design  string
	Subject string
	// Baseline is the finding's state against an earlier revision in a
	// comparison ("new", "unchanged", "updated" or "absent"; SARIF 2.1.0
	// §3.27.24), or "" outside one.
	Baseline string
	// Fixes are edits that would resolve the finding (diag.Fix).
	Fixes []Fix
}

// Fix is one way to resolve a finding: what it does, and its edits.
type Fix struct {
	Message string
	Edits   []Edit
}

// Edit replaces a range of a file (empty to insert) with NewText.
type Edit struct {
	File      string
	Line      int
	Column    int
	EndLine   int
	EndColumn int
	NewText   string
}

// Related is another place a finding names.
type Related struct {
	File      string
	Line      int
	Column    int
	EndLine   int
	EndColumn int
	Message   string
}

// Report is everything one run of the checker found.
type Report struct {
	Files    int // how many files were checked
	Findings []Finding
	// Source returns the text of a file named in a finding, or nil. SARIF
	// uses it to count columns in code points; it may be nil.
	Source func(file string) []byte
	// BaseSource does the same for findings whose Baseline is "absent",
	// whose positions are in an earlier revision; it may be nil.
	BaseSource func(file string) []byte
}

// Options change how a report is written.
type Options struct {
	Color   bool              // text only: colour the severity
	Version string            // the tool's version, for SARIF
	Rules   []*rules.Analyzer // the rules SARIF describes (nil: rules.All)
	// Root is the folder artifact paths are made relative to in SARIF
	// (the repository root); relative file names are taken to be
	// relative to Dir. Empty: names are used as they are.
	Root, Dir string
	// MaxRows caps the Markdown table (0: 50).
	MaxRows int
}

// FromDiags resolves a file set's diagnostics into findings.
func FromDiags(fset *diag.FileSet, l diag.List) []Finding {
	out := make([]Finding, 0, len(l))
	for _, d := range l {
		start := fset.Position(d.Pos)
		end := fset.Position(d.End)
		if !end.IsValid() || end.Filename != start.Filename {
			end = start
		}
		f := Finding{File: start.Filename, Line: start.Line, Column: start.Column,
			EndLine: end.Line, EndColumn: end.Column,
			Severity: d.Severity, Rule: d.Rule, Message: d.Message, Subject: d.Subject}
		for _, r := range d.Related {
			p := fset.Position(r.Pos)
			e := fset.Position(r.End)
			if !e.IsValid() || e.Filename != p.Filename {
				e = p
			}
			f.Related = append(f.Related, Related{File: p.Filename, Line: p.Line, Column: p.Column,
				EndLine: e.Line, EndColumn: e.Column, Message: r.Message})
		}
		for _, fix := range d.Fixes {
			of := Fix{Message: fix.Message}
			for _, e := range fix.Edits {
				p, q := fset.Position(e.Pos), fset.Position(e.End)
				if !p.IsValid() || !q.IsValid() || q.Filename != p.Filename {
					of.Edits = nil
					break
				}
				of.Edits = append(of.Edits, Edit{File: p.Filename, Line: p.Line, Column: p.Column,
					EndLine: q.Line, EndColumn: q.Column, NewText: e.NewText})
			}
			if len(of.Edits) > 0 {
				f.Fixes = append(f.Fixes, of)
			}
		}
		out = append(out, f)
	}
	return out
}

// Sort orders findings as every form lists them: by diag.Order, the order
// in which a check's last pass already leaves them.
func Sort(fs []Finding) {
	sort.SliceStable(fs, func(i, j int) bool { return fs[i].order().Less(fs[j].order()) })
}

// Sorted reports whether fs are in the order Sort gives.
func Sorted(fs []Finding) bool {
	return sort.SliceIsSorted(fs, func(i, j int) bool { return fs[i].order().Less(fs[j].order()) })
}

func (f *Finding) order() diag.Order {
	return diag.Order{File: f.File, Line: f.Line, Column: f.Column, Rule: f.Rule, Message: f.Message}
}

// Count returns how many findings have each severity.
func (r *Report) Count() (errors, warnings, notes int) {
	for _, f := range r.Findings {
		switch f.Severity {
		case diag.Error:
			errors++
		case diag.Warning:
			warnings++
		case diag.Note:
			notes++
		}
	}
	return
}

// Write writes the report in the named format.
//
// The findings of one check come in order from its last pass, and are not
// sorted again; those of several checks (several files, the designs of a
// comparison) are sorted here, once.
func Write(w io.Writer, format string, r *Report, opt Options) error {
	if !Sorted(r.Findings) {
		Sort(r.Findings)
	}
	switch format {
	case "text", "":
		return writeText(w, r, opt)
	case "json":
		return writeJSON(w, r)
	case "sarif":
		return writeSARIF(w, r, opt)
	case "markdown":
		return writeMarkdown(w, r, opt)
	}
	return fmt.Errorf("unknown format %q (want text, json, sarif or markdown)", format)
}

// Plural returns "1 error" or "3 errors".
func Plural(n int, word string) string {
	if n == 1 {
		return "1 " + word
	}
	return fmt.Sprintf("%d %ss", n, word)
}

// Summary returns "E errors, W warnings, N notes in F files".
func (r *Report) Summary() string {
	e, w, n := r.Count()
	return fmt.Sprintf("%s, %s, %s in %s", Plural(e, "error"), Plural(w, "warning"), Plural(n, "note"), Plural(r.Files, "file"))
}
