// Package rules holds nodal's checks. Each check is one Analyzer value, in
// the manner of golang.org/x/tools/go/analysis: a name (the rule id), a doc
// whose first line is a short lower-case title, a default severity, the
// analyzers it needs, and a Run function.
//
// # Passes
//
// Some analyzers only compute: Topology runs the graph checks of package
// topology, Solve finds the operating point, Ratings judges every part's
// ratings there once (Judge) for all the rating rules, and WorstCase the
// worst case over tolerances and temperature. They report nothing
// themselves; rules that need them list them in Requires and read their
// results from Pass.ResultOf, which holds the results of the analyzers a
// rule requires (directly or through another) and no others. Every
// analyzer runs at most once per design, after the ones it requires.
//
// # Concurrency
//
// On a large design the analyzers whose requirements have run run at the
// same time, on up to GOMAXPROCS goroutines: the solve beside the wiring
// rules and the case-clash rule, the rating rules beside each other. What
// a run gives (findings, results, errors) is what running them one after
// another gives (see schedule.go). An analyzer's Run may therefore be
// called concurrently with another's on the same design: it must treat the
// design, the build and its requirements' results as read-only.
//
// # Findings
//
// Findings made while the model is built carry a circuit.Code, which one
// analyzer claims (Analyzer.Codes); the rules' own are reported through
// Pass.Report. All of them meet in RunResults' last pass, which merges
// their repeats across block instances, adds the instance chain, applies
// accept comments and configured severities, and sorts, the same way for
// every rule.
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
	// Codes lists the findings of elaboration (circuit.Code) that are this
	// rule's; the runner hands them on. Every code has exactly one
	// analyzer in All.
	Codes []circuit.Code
	// Run is nil for rules whose findings only elaboration or a later
	// pass (see Suppress) makes.
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
// the analyzer's default. A finding about a part or a net names it in
// Subject; the runner's last pass finds its instance from that.
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
	// NoSuppress ignores accept comments: every finding is reported.
	NoSuppress bool
	// Ambient is the ambient temperature for designs that state none
	// (nodal.toml); ForceAmbient, when set, overrides every design's own
	// (check --ambient). Neither set: 25 °C.
	Ambient, ForceAmbient circuit.Ambient
}

func (c *Config) severity(a *Analyzer) (diag.Severity, bool) {
	if c == nil || c.Severity == nil {
		return 0, false
	}
	s, ok := c.Severity[a.Name]
	return s, ok
}

// Run runs the analyzers (and whatever they require) on a built design and
// returns every finding after the last pass (see RunResults).
func Run(fset *diag.FileSet, b *circuit.Result, analyzers []*Analyzer, cfg *Config) (diag.List, error) {
	out, _, err := RunResults(fset, b, analyzers, cfg)
	return out, err
}

// RunResults runs the analyzers (and whatever they require) on a built
// design, then the last pass, the same for every finding whether the
// builder or a rule made it:
//
//  1. the findings of elaboration whose rule is among the analyzers, and
//     every rule's findings, go through one circuit.Findings: repeats
//     across instances are merged into one with a count, and findings
//     about a part or net inside an instance get the instance chain as
//     related locations;
//  2. accept comments suppress what they name (Suppress), unless
//     cfg.NoSuppress;
//  3. each finding takes its rule's severity: the one it was reported
//     with, else the rule's default, overridden by cfg; Off drops it;
//     and on a design that was not solved, unrated-parts (which then
//     says that no rating was judged, and why) is left out while another
//     finding at error severity already fails the check (see
//     unsolvedNoise);
//  4. the list is sorted and exact repeats dropped, once.
//
// It also returns the result of every analyzer that ran, such as the
// *SolveResult of Solve.
func RunResults(fset *diag.FileSet, b *circuit.Result, analyzers []*Analyzer, cfg *Config) (diag.List, map[*Analyzer]any, error) {
	if cfg == nil {
		cfg = &Config{}
	}
	var found circuit.Findings
	found.Use(b.Design)
	results, done, err := newPlan(fset, b, analyzers, cfg, &found).run(workersFor(b.Design))
	var owner [circuit.NumCodes]*Analyzer
	for a := range done {
		for _, c := range a.Codes {
			owner[c] = a
		}
	}
	for _, f := range b.Findings {
		if f.Code < circuit.NumCodes && owner[f.Code] != nil {
			found.Add(f)
		}
	}
	sr, _ := results[Solve].(*SolveResult)
	unsolved := sr != nil && sr.OP == nil
	return lastPass(fset, b, found.Finish(b.Design), done, cfg, unsolved), results, err
}

// lastPass suppresses, sets severities, sorts and de-duplicates: steps 2
// to 4 of RunResults. ran holds the analyzers that ran; their severities,
// and those of the registered rules, are known. unsolved says the design
// has no operating point.
func lastPass(fset *diag.FileSet, b *circuit.Result, diags diag.List, ran map[*Analyzer]bool, cfg *Config, unsolved bool) diag.List {
	if !cfg.NoSuppress {
		diags = Suppress(fset, b.Files, diags, cfg, nil)
	}
	byName := make(map[string]*Analyzer, len(ran))
	for a := range ran {
		byName[a.Name] = a
	}
	out := diags[:0]
	for _, d := range diags {
		a := byName[d.Rule]
		if a == nil {
			a = Lookup(d.Rule)
		}
		switch {
		case a == nil && d.Severity == diag.Off:
			// A finding no analyzer owns is a slip in nodal itself;
			// it is shown as an error rather than lost.
			d.Severity = diag.Error
		case a != nil:
			if d.Severity == diag.Off {
				d.Severity = a.Severity
			}
			if s, ok := cfg.severity(a); ok {
				d.Severity = s
			}
		}
		if d.Severity == diag.Off {
			continue
		}
		out = append(out, d)
	}
	if unsolved {
		out = unsolvedNoise(out)
	}
	out.Sort(fset)
	return out.Dedup()
}

// unsolvedNoise leaves out the unrated-parts finding of a design that was
// not solved while another finding at error severity is shown: that error
// already fails the check and says where (a value that cannot be read, no
// ground, sources that contradict each other, a load no rail can feed),
// and repeating on the first rated part that nothing was rated points at
// a line that is not at fault. Once no error is shown (the causes fixed,
// accepted, switched off or made warnings) the finding stays, so that a
// check that passes always says that its ratings were not judged.
func unsolvedNoise(diags diag.List) diag.List {
	failed := false
	for _, d := range diags {
		if d.Severity == diag.Error && d.Rule != UnratedParts.Name {
			failed = true
			break
		}
	}
	if !failed {
		return diags
	}
	out := diags[:0]
	for _, d := range diags {
		if d.Rule != UnratedParts.Name {
			out = append(out, d)
		}
	}
	return out
}
