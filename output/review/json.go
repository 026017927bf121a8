package review

// json.go: the comparison as one JSON document for scripts.

import (
	"encoding/json"
	"io"
	"math"
	"strconv"
)

// jsonVersion is the version of the document's shape; it changes only
// when a field changes meaning or goes away.
const jsonVersion = 1

type jsonDoc struct {
	Version    int            `json:"version"`
	Base       string         `json:"base"`
	Head       string         `json:"head"`
	Thresholds jsonThresholds `json:"thresholds"`
	Unchanged  int            `json:"unchanged_designs"`
	Designs    []jsonDesign   `json:"designs"`
}

type jsonThresholds struct {
	Use      float64 `json:"use"`                // a fraction of a rating
	Volts    float64 `json:"volts,omitempty"`    // absolute, volts
	Relative float64 `json:"relative,omitempty"` // a fraction of the larger magnitude
}

type jsonDesign struct {
	Path     string        `json:"path"`
	Status   string        `json:"status"`
	From     string        `json:"from,omitempty"` // the earlier path of a renamed design
	BaseNote string        `json:"base_note,omitempty"`
	HeadNote string        `json:"head_note,omitempty"`
	Parts    []jsonPart    `json:"parts"`
	Nets     []jsonNet     `json:"nets"`
	Findings []jsonFinding `json:"findings"`
}

type jsonUse struct {
	Rating string  `json:"rating"` // "power", "current", "voltage", "reverse_voltage"
	Use    float64 `json:"use"`
	Value  float64 `json:"value"`
	Limit  float64 `json:"limit"` // the rated value
}

type jsonPart struct {
	Name   string   `json:"name"`
	Kind   string   `json:"kind"`
	Before *jsonUse `json:"before"`
	After  *jsonUse `json:"after"`
	Change float64  `json:"change"` // after − before, a fraction of the rating
	// WorstBefore and WorstAfter are the worst-case uses over tolerances
	// and temperature, present when either differs from the nominal use.
	WorstBefore *float64 `json:"worst_before,omitempty"`
	WorstAfter  *float64 `json:"worst_after,omitempty"`
}

type jsonNet struct {
	Name   string  `json:"name"`
	Before float64 `json:"before"`
	After  float64 `json:"after"`
	// BeforeRange and AfterRange are [low, high] over tolerances and
	// temperature, present when either is wider than a point.
	BeforeRange *[2]float64 `json:"before_range,omitempty"`
	AfterRange  *[2]float64 `json:"after_range,omitempty"`
}

type jsonFinding struct {
	State    string `json:"state"` // new, updated, unchanged, absent
	File     string `json:"file"`
	Line     int    `json:"line"`
	Column   int    `json:"column"`
	Severity string `json:"severity"`
	Rule     string `json:"rule"`
	Subject  string `json:"subject,omitempty"`
	Message  string `json:"message"`
	// Before is the earlier message of an updated finding.
	Before *jsonBefore `json:"before,omitempty"`
}

type jsonBefore struct {
	File     string `json:"file"`
	Line     int    `json:"line"`
	Severity string `json:"severity"`
	Message  string `json:"message"`
}

func useJSON(u *Use) *jsonUse {
	if u == nil {
		return nil
	}
	what := u.What
	if what == "reverse voltage" {
		what = "reverse_voltage"
	}
	return &jsonUse{Rating: what, Use: round(u.Frac), Value: round(u.Value), Limit: round(u.Rating)}
}

// round keeps ten significant figures, so that the last bits of a float
// do not change the document.
func round(v float64) float64 {
	if v == 0 || math.IsNaN(v) || math.IsInf(v, 0) {
		return 0
	}
	r, _ := strconv.ParseFloat(strconv.FormatFloat(v, 'g', 10, 64), 64)
	return r
}

// WriteJSON writes the comparison as one JSON document: SI units as plain
// numbers, uses as fractions of the rating, positions of absent findings
// in the earlier revision.
func (c *Comparison) WriteJSON(w io.Writer) error {
	doc := jsonDoc{Version: jsonVersion, Base: c.Base, Head: c.Head, Unchanged: c.Unchanged, Designs: []jsonDesign{},
		Thresholds: jsonThresholds{Use: c.Thresholds.Use, Volts: c.Thresholds.Volts, Relative: c.Thresholds.Relative}}
	for i := range c.Designs {
		d := &c.Designs[i]
		jd := jsonDesign{Path: d.Path, Status: string(d.Status), From: d.From, BaseNote: d.BaseNote, HeadNote: d.HeadNote,
			Parts: []jsonPart{}, Nets: []jsonNet{}, Findings: []jsonFinding{}}
		for j := range d.Parts {
			p := &d.Parts[j]
			jp := jsonPart{Name: p.Name, Kind: p.Kind, Before: useJSON(p.Before), After: useJSON(p.After), Change: round(p.Delta())}
			if p.HasWorst() {
				wb, wa := round(p.WorstBefore), round(p.WorstAfter)
				jp.WorstBefore, jp.WorstAfter = &wb, &wa
			}
			jd.Parts = append(jd.Parts, jp)
		}
		for _, n := range d.Nets {
			jn := jsonNet{Name: n.Name, Before: round(n.Before), After: round(n.After)}
			if n.HasRange() {
				br := [2]float64{round(n.BeforeRange[0]), round(n.BeforeRange[1])}
				ar := [2]float64{round(n.AfterRange[0]), round(n.AfterRange[1])}
				jn.BeforeRange, jn.AfterRange = &br, &ar
			}
			jd.Nets = append(jd.Nets, jn)
		}
		for _, fc := range d.Findings {
			f := &fc.Finding
			jf := jsonFinding{State: string(fc.State), File: f.File, Line: f.Line, Column: f.Column,
				Severity: f.Severity.String(), Rule: f.Rule, Subject: f.Subject, Message: f.Message}
			if fc.State == Updated && fc.Before != nil {
				jf.Before = &jsonBefore{File: fc.Before.File, Line: fc.Before.Line, Severity: fc.Before.Severity.String(), Message: fc.Before.Message}
			}
			jd.Findings = append(jd.Findings, jf)
		}
		doc.Designs = append(doc.Designs, jd)
	}
	enc := json.NewEncoder(w)
	enc.SetEscapeHTML(false)
	enc.SetIndent("", "  ")
	return enc.Encode(doc)
}
