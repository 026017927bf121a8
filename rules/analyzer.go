// Package rules holds nodal's checks. Each check is one Analyzer value, in
// the manner of golang.org/x/tools/go/analysis: a name (the rule id), a doc
// whose first line is a short lower-case title, a default severity, the
// analyzers it needs, and a Run function.
//
// # Passes
//
// Some analyzers only compute: Topology runs the graph checks of package
// topology and Solve (in a later version) the operating point. They report
// nothing themselves; rules that need them list them in Requires and read
// their results from Pass.ResultOf. Every analyzer runs at most once per
// design, after the ones it requires.
//
// # Adding a rule
//
// Write a file in this package declaring the Analyzer, add it to All in
// registry.go, and give it a test file that fires it and a near miss that
// stays clean under testdata/rules. See DEVELOPERS.md.
package rules

import (
	"fmt"

	"nodal/circuit"
	"nodal/diag"
)

// Analyzer is one rule, or one computation that rules share.
type Analyzer struct {
	Name     string
	Doc      string
	Severity diag.Severity // default; Off for analyzers that only compute
	Requires []*Analyzer
	// Run is nil for rules that a later pass reports (see Suppress).
	Run func(*Pass) (any, error)
}

// Title returns the first line of the doc.
func (a *Analyzer) Title() string {
	for i, c := range a.Doc {
		if c == '\n' {
			return a.Doc[:i]
		}
	}
	return a.Doc
}

// Pass is what an analyzer sees while it runs on one design.
type Pass struct {
	Analyzer *Analyzer
	Fset     *diag.FileSet
	Build    *circuit.Result
	Design   *circuit.Design
	ResultOf map[*Analyzer]any
	Config   *Config // never nil while a rule runs
	report   func(diag.Diagnostic)
}

// Report records a finding of the running analyzer. A zero Severity means
// the analyzer's default.
func (p *Pass) Report(d diag.Diagnostic) {
	d.Rule = p.Analyzer.Name
	if d.Severity == diag.Off {
		d.Severity = p.Analyzer.Severity
	}
	p.report(d)
}

// Reportf records a finding at pos … end with the default severity.
func (p *Pass) Reportf(pos, end diag.Pos, format string, args ...any) {
	p.Report(diag.Diagnostic{Pos: pos, End: end, Message: fmt.Sprintf(format, args...)})
}

// Config changes what the rules report.
type Config struct {
	// Severity overrides a rule's default severity; Off silences it.
	Severity map[string]diag.Severity
	// Derating holds the limits of near-rating; zero fields take their
	// defaults.
	Derating Derating
}

func (c *Config) severity(a *Analyzer) (diag.Severity, bool) {
	if c == nil || c.Severity == nil {
		return 0, false
	}
	s, ok := c.Severity[a.Name]
	return s, ok
}

// Run runs the analyzers (and whatever they require) on a built design and
// returns every finding, with configured severities applied.
func Run(fset *diag.FileSet, b *circuit.Result, analyzers []*Analyzer, cfg *Config) (diag.List, error) {
	out, _, err := RunResults(fset, b, analyzers, cfg)
	return out, err
}

// RunResults is Run that also returns the result of every analyzer that
// ran, such as the *SolveResult of Solve.
func RunResults(fset *diag.FileSet, b *circuit.Result, analyzers []*Analyzer, cfg *Config) (diag.List, map[*Analyzer]any, error) {
	var out diag.List
	if cfg == nil {
		cfg = &Config{}
	}
	results := map[*Analyzer]any{}
	done := map[*Analyzer]bool{}
	var run func(a *Analyzer) error
	run = func(a *Analyzer) error {
		if done[a] {
			return nil
		}
		done[a] = true
		for _, r := range a.Requires {
			if err := run(r); err != nil {
				return err
			}
		}
		if a.Run == nil {
			return nil // reported by a later pass, such as Suppress
		}
		override, has := cfg.severity(a)
		if has && override == diag.Off && a.Severity != diag.Off {
			return nil
		}
		pass := &Pass{Analyzer: a, Fset: fset, Build: b, Design: b.Design, ResultOf: results, Config: cfg}
		pass.report = func(d diag.Diagnostic) {
			if has {
				d.Severity = override
			}
			out = append(out, d)
		}
		res, err := a.Run(pass)
		if err != nil {
			return fmt.Errorf("%s: %w", a.Name, err)
		}
		results[a] = res
		return nil
	}
	for _, a := range analyzers {
		if err := run(a); err != nil {
			return out, results, err
		}
	}
	return out, results, nil
}
