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
		doc.Diagnostics = append(doc.Diagnostics, d)
	}
	enc := json.NewEncoder(w)
	enc.SetEscapeHTML(false)
	enc.SetIndent("", "  ")
	return enc.Encode(doc)
}
