package output

import (
	"encoding/json"
	"io"

	"nodal/docs"
)

// jsonVersion is the version of the JSON document's shape. It changes
// only when a field changes meaning or goes away.
const jsonVersion = 1

type jsonDoc struct {
	Version     int        `json:"version"`
	Files       int        `json:"files"`
	Diagnostics []jsonDiag `json:"diagnostics"`
}

type jsonDiag struct {
	File      string        `json:"file"`
	Line      int           `json:"line"`
	Column    int           `json:"column"`
	EndLine   int           `json:"end_line"`
	EndColumn int           `json:"end_column"`
	Severity  string        `json:"severity"`
	Rule      string        `json:"rule"`
	Message   string        `json:"message"`
	Related   []jsonRelated `json:"related"`
	HelpURI   string        `json:"help_uri"`
	Fixes     []jsonFix     `json:"fixes,omitempty"`
}

type jsonFix struct {
	Message string     `json:"message"`
	Edits   []jsonEdit `json:"edits"`
}

// jsonEdit replaces the text from line:column up to end_line:end_column
// (equal to insert) with new_text; columns count bytes from 1.
type jsonEdit struct {
	File      string `json:"file"`
	Line      int    `json:"line"`
	Column    int    `json:"column"`
	EndLine   int    `json:"end_line"`
	EndColumn int    `json:"end_column"`
	NewText   string `json:"new_text"`
}

type jsonRelated struct {
	File    string `json:"file"`
	Line    int    `json:"line"`
	Column  int    `json:"column"`
	Message string `json:"message"`
}

func writeJSON(w io.Writer, r *Report) error {
	doc := jsonDoc{Version: jsonVersion, Files: r.Files, Diagnostics: make([]jsonDiag, 0, len(r.Findings))}
	for _, f := range r.Findings {
		d := jsonDiag{File: f.File, Line: f.Line, Column: f.Column, EndLine: f.EndLine, EndColumn: f.EndColumn,
			Severity: f.Severity.String(), Rule: f.Rule, Message: f.Message, Related: []jsonRelated{}}
		if f.Rule != "" {
			d.HelpURI = docs.RuleURL(f.Rule)
		}
		for _, rel := range f.Related {
			d.Related = append(d.Related, jsonRelated{File: rel.File, Line: rel.Line, Column: rel.Column, Message: rel.Message})
		}
		for _, fix := range f.Fixes {
			jf := jsonFix{Message: fix.Message}
			for _, e := range fix.Edits {
				jf.Edits = append(jf.Edits, jsonEdit{File: e.File, Line: e.Line, Column: e.Column, EndLine: e.EndLine, EndColumn: e.EndColumn, NewText: e.NewText})
			}
			d.Fixes = append(d.Fixes, jf)
		}
		doc.Diagnostics = append(doc.Diagnostics, d)
	}
	enc := json.NewEncoder(w)
	enc.SetEscapeHTML(false)
	enc.SetIndent("", "  ")
	return enc.Encode(doc)
}
