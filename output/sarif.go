package output

// sarif.go: a SARIF 2.1.0 log (OASIS Static Analysis Results Interchange
// Format, Version 2.1.0, Errata 01). Plain structs keep the field order,
// and so the bytes, fixed.

import (
	"encoding/json"
	"io"
	"net/url"
	"path/filepath"
	"strings"
	"unicode/utf8"

	"nodal/diag"
	"nodal/docs"
	"nodal/rules"
)

const (
	sarifSchema  = "https://docs.oasis-open.org/sarif/sarif/v2.1.0/errata01/os/schemas/sarif-schema-2.1.0.json"
	sarifVersion = "2.1.0"
	// SrcRoot is the uriBaseId of artifact locations: the repository root.
	SrcRoot = "SRCROOT"
)

type sarifLog struct {
	Schema  string     `json:"$schema"`
	Version string     `json:"version"`
	Runs    []sarifRun `json:"runs"`
}

type sarifRun struct {
	Tool       sarifTool     `json:"tool"`
	ColumnKind string        `json:"columnKind"`
	Results    []sarifResult `json:"results"`
}

type sarifTool struct {
	Driver sarifDriver `json:"driver"`
}

type sarifDriver struct {
	Name           string      `json:"name"`
	Version        string      `json:"version,omitempty"`
	InformationURI string      `json:"informationUri,omitempty"`
	Rules          []sarifRule `json:"rules"`
}

type sarifText struct {
	Text     string `json:"text"`
	Markdown string `json:"markdown,omitempty"`
}

type sarifRule struct {
	ID                   string      `json:"id"`
	ShortDescription     sarifText   `json:"shortDescription"`
	FullDescription      sarifText   `json:"fullDescription"`
	DefaultConfiguration sarifConfig `json:"defaultConfiguration"`
	Help                 sarifText   `json:"help"`
	HelpURI              string      `json:"helpUri,omitempty"`
}

type sarifConfig struct {
	Level string `json:"level"`
}

type sarifResult struct {
	RuleID           string          `json:"ruleId"`
	RuleIndex        *int            `json:"ruleIndex,omitempty"`
	Level            string          `json:"level"`
	Message          sarifText       `json:"message"`
	Locations        []sarifLocation `json:"locations"`
	RelatedLocations []sarifLocation `json:"relatedLocations,omitempty"`
	// PartialFingerprints (§3.27.17) name the finding without its line,
	// so that code-scanning services keep one alert across line moves.
	PartialFingerprints map[string]string `json:"partialFingerprints,omitempty"`
	// BaselineState (§3.27.24) is set in a comparison of two revisions.
	BaselineState string `json:"baselineState,omitempty"`
	// Fixes (§3.27.30) are edits that would resolve the finding.
	Fixes []sarifFix `json:"fixes,omitempty"`
}

// sarifFix is a fix object (§3.55): a description and the changes to
// each file (§3.56), each a replacement (§3.57) of a region, empty for
// an insertion, with the inserted text.
type sarifFix struct {
	Description     sarifText             `json:"description"`
	ArtifactChanges []sarifArtifactChange `json:"artifactChanges"`
}

type sarifArtifactChange struct {
	ArtifactLocation sarifArtifact      `json:"artifactLocation"`
	Replacements     []sarifReplacement `json:"replacements"`
}

type sarifReplacement struct {
	DeletedRegion   sarifRegion `json:"deletedRegion"`
	InsertedContent sarifText   `json:"insertedContent"`
}

type sarifLocation struct {
	ID               *int          `json:"id,omitempty"`
	PhysicalLocation sarifPhysical `json:"physicalLocation"`
	Message          *sarifText    `json:"message,omitempty"`
}

type sarifPhysical struct {
	ArtifactLocation sarifArtifact `json:"artifactLocation"`
	Region           *sarifRegion  `json:"region,omitempty"`
}

type sarifArtifact struct {
	URI       string `json:"uri"`
	URIBaseID string `json:"uriBaseId,omitempty"`
}

type sarifRegion struct {
	StartLine   int `json:"startLine"`
	StartColumn int `json:"startColumn"`
	EndLine     int `json:"endLine"`
	EndColumn   int `json:"endColumn"`
}

func level(s diag.Severity) string {
	switch s {
	case diag.Error:
		return "error"
	case diag.Warning:
		return "warning"
	case diag.Note:
		return "note"
	}
	return "none"
}

func writeSARIF(w io.Writer, r *Report, opt Options) error {
	as := opt.Rules
	if as == nil {
		as = rules.All
	}
	driver := sarifDriver{Name: "nodal", Version: opt.Version, InformationURI: docs.BaseURL, Rules: []sarifRule{}}
	index := map[string]int{}
	for _, a := range as {
		index[a.Name] = len(driver.Rules)
		full := a.Title()
		if _, body, ok := strings.Cut(a.Doc, "\n"); ok && strings.TrimSpace(body) != "" {
			full = strings.TrimSpace(strings.ReplaceAll(body, "\n", " "))
		}
		// The rule's page travels in the log itself: a reader of the log
		// needs no address to learn what a rule checks and how to fix it.
		help := sarifText{Text: full}
		if page, ok := docs.Rule(a.Name); ok {
			help = sarifText{Text: page, Markdown: page}
			if what := docs.Section(page, "What nodal looks for"); what != "" {
				full = strings.Join(strings.Fields(what), " ")
			}
		}
		driver.Rules = append(driver.Rules, sarifRule{
			ID:                   a.Name,
			ShortDescription:     sarifText{Text: a.Title()},
			FullDescription:      sarifText{Text: full},
			DefaultConfiguration: sarifConfig{Level: level(a.Severity)},
			Help:                 help,
			HelpURI:              docs.RuleURL(a.Name),
		})
	}
	cols, baseCols := newColumns(r.Source), newColumns(r.BaseSource)
	run := sarifRun{Tool: sarifTool{Driver: driver}, ColumnKind: "unicodeCodePoints", Results: []sarifResult{}}
	prints := Fingerprints(r.Findings, func(file string) string { return artifact(file, opt).URI })

	for i, f := range r.Findings {
		cols := cols
		if f.Baseline == "absent" {
			cols = baseCols
		}
		res := sarifResult{RuleID: f.Rule, Level: level(f.Severity), Message: sarifText{Text: f.Message},
			Locations:           []sarifLocation{{PhysicalLocation: physical(f.File, f.Line, f.Column, f.EndLine, f.EndColumn, opt, cols)}},
			PartialFingerprints: map[string]string{FingerprintName: prints[i]},
			BaselineState:       f.Baseline}
		if i, ok := index[f.Rule]; ok {
			res.RuleIndex = &i
		}
		for k, rel := range f.Related {
			id := k + 1
			res.RelatedLocations = append(res.RelatedLocations, sarifLocation{ID: &id,
				PhysicalLocation: physical(rel.File, rel.Line, rel.Column, rel.EndLine, rel.EndColumn, opt, cols),
				Message:          &sarifText{Text: rel.Message}})
		}
		for _, fix := range f.Fixes {
			sf := sarifFix{Description: sarifText{Text: fix.Message}}
			for _, e := range fix.Edits {
				p := physical(e.File, e.Line, e.Column, e.EndLine, e.EndColumn, opt, cols)
				if p.Region == nil {
					continue
				}
				sf.ArtifactChanges = append(sf.ArtifactChanges, sarifArtifactChange{ArtifactLocation: p.ArtifactLocation,
					Replacements: []sarifReplacement{{DeletedRegion: *p.Region, InsertedContent: sarifText{Text: e.NewText}}}})
			}
			if len(sf.ArtifactChanges) > 0 {
				res.Fixes = append(res.Fixes, sf)
			}
		}
		run.Results = append(run.Results, res)
	}
	enc := json.NewEncoder(w)
	enc.SetEscapeHTML(false)
	enc.SetIndent("", "  ")
	return enc.Encode(sarifLog{Schema: sarifSchema, Version: sarifVersion, Runs: []sarifRun{run}})
}

func physical(file string, line, col, endLine, endCol int, opt Options, cols *columns) sarifPhysical {
	p := sarifPhysical{ArtifactLocation: artifact(file, opt)}
	if line > 0 {
		if endLine < line || (endLine == line && endCol < col) {
			endLine, endCol = line, col
		}
		p.Region = &sarifRegion{StartLine: line, StartColumn: cols.convert(file, line, col),
			EndLine: endLine, EndColumn: cols.convert(file, endLine, endCol)}
	}
	return p
}

// artifact names a file relative to the repository root, with the SRCROOT
// base, or by an absolute file URI when it lies outside the root.
func artifact(file string, opt Options) sarifArtifact {
	if opt.Root == "" {
		return sarifArtifact{URI: escapePath(filepath.ToSlash(file))}
	}
	abs := file
	if !filepath.IsAbs(abs) {
		abs = filepath.Join(opt.Dir, file)
	}
	rel, err := filepath.Rel(opt.Root, abs)
	if err != nil || rel == ".." || strings.HasPrefix(rel, ".."+string(filepath.Separator)) {
		u := url.URL{Scheme: "file", Path: filepath.ToSlash(abs)}
		return sarifArtifact{URI: u.String()}
	}
	return sarifArtifact{URI: escapePath(filepath.ToSlash(rel)), URIBaseID: SrcRoot}
}

func escapePath(p string) string {
	parts := strings.Split(p, "/")
	for i, s := range parts {
		parts[i] = url.PathEscape(s)
	}
	return strings.Join(parts, "/")
}

// columns turns byte columns into code-point columns, keeping each file's
// line starts once computed.
type columns struct {
	source func(string) []byte
	lines  map[string][]int
	src    map[string][]byte
}

func newColumns(source func(string) []byte) *columns {
	return &columns{source: source, lines: map[string][]int{}, src: map[string][]byte{}}
}

func (c *columns) convert(file string, line, col int) int {
	if c.source == nil {
		return col
	}
	ls, ok := c.lines[file]
	if !ok {
		src := c.source(file)
		if src != nil {
			ls = []int{0}
			for i, b := range src {
				if b == '\n' {
					ls = append(ls, i+1)
				}
			}
		}
		c.lines[file], c.src[file] = ls, src
	}
	if line < 1 || line > len(ls) {
		return col
	}
	src := c.src[file]
	start := ls[line-1]
	end := min(start+col-1, len(src))
	if end < start {
		return col
	}
	return utf8.RuneCount(src[start:end]) + 1
}
