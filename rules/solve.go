package rules

// solve.go: the pass that finds the DC operating point, and the rules that
// say when it could not be found or cannot be trusted.

import (
	"errors"
	"fmt"
	"math"
	"sync"

	"nodal/circuit"
	"nodal/diag"
	"nodal/solve"
	"nodal/units"
)

// SolveResult is the result of the Solve pass. OP is nil when the solve
// did not run or failed: NotRun says why it did not run, Err why it failed.
// unrated-parts reports every such design that has ratings.
type SolveResult struct {
	OP  *solve.Result
	Err error
	Ran bool
	// NotRun says why the solve was not tried: the design cannot be
	// modelled (its build failed), has no ground, or its wiring leaves no
	// operating point at all (a loop of voltage sources whose voltages do
	// not sum to zero, current sources that cannot all be obeyed).
	NotRun string
	// Skipped says why the solve was not tried on a design the topology
	// rules accept: it is too large for this version's solver (an
	// *solve.Error of kind TooLarge).
	Skipped error
	// NoCondEstimate says that the solve made no condition estimate (the
	// iterative solver, used for the largest designs, makes none), so
	// ill-conditioned could not judge the design; the KCL self-check still
	// guards its results.
	NoCondEstimate bool
	// Ambient is the ambient temperature range the design is judged over
	// (°C), and Nominal the temperature of the nominal operating point
	// OP: 25 °C, or the end of the range nearest to it.
	Ambient Ambient

	// point is OP's reader, made once: the rules that read the operating
	// point (some of them once per part) may run at the same time.
	point     *Point
	pointOnce sync.Once
}

// Ambient is the ambient temperature a design is judged at: Low … High in
// °C, Nominal within it, and where it came from.
type Ambient struct {
	Low, High, Nominal float64
	From               string // "the design", "nodal.toml", "--ambient" or "the default"
}

// Range reports whether the ambient is a range rather than one value.
func (a Ambient) Range() bool { return a.High > a.Low }

// AmbientOf returns the ambient temperature of design d under cfg:
// cfg.ForceAmbient, else the design's own statement, else cfg.Ambient,
// else 25 °C.
func AmbientOf(d *circuit.Design, cfg *Config) Ambient {
	a, from := circuit.Ambient{Low: RoomCelsius, High: RoomCelsius}, "the default"
	switch {
	case cfg != nil && cfg.ForceAmbient.Set:
		a, from = cfg.ForceAmbient, "--ambient"
	case d.Ambient.Set:
		a, from = d.Ambient, "the design"
	case cfg != nil && cfg.Ambient.Set:
		a, from = cfg.Ambient, "nodal.toml"
	}
	return Ambient{Low: a.Low, High: a.High, Nominal: math.Min(math.Max(RoomCelsius, a.Low), a.High), From: from}
}

// Point returns the reader of the nominal operating point, at its
// ambient temperature.
func (s *SolveResult) Point() *Point {
	s.pointOnce.Do(func() { s.point = NewPoint(s.OP).At(s.Ambient.Nominal) })
	pt := *s.point // a copy: At on it changes no other rule's
	return &pt
}

// Solve computes the DC operating point; it reports nothing itself. Its
// result is a *SolveResult. It runs on every design whose node voltages are
// determined, whatever the wiring findings' severities or acceptances:
// loops of shorts and sources whose voltages sum to zero and sections with
// no DC path are solved around (package solve marks what they leave
// open). It does not run when the build is incomplete or invalid, when
// there is no ground, or when no operating point exists (an unbalanced
// loop of sources, a current-source cutset); NotRun says which.
var Solve = &Analyzer{
	Name:     "solve",
	Doc:      "DC operating point shared by the rating rules",
	Requires: []*Analyzer{Topology},
	Run: func(p *Pass) (any, error) {
		if why := notSolvable(p); why != "" {
			return &SolveResult{NotRun: why}, nil
		}
		amb := AmbientOf(p.Design, p.Config)
		op, err := solve.Solve(p.Design.AtTemperature(amb.Nominal), &solve.Options{Temperature: units.Kelvin(amb.Nominal)})
		var se *solve.Error
		if errors.As(err, &se) && se.Kind == solve.TooLarge {
			return &SolveResult{Skipped: err, Ambient: amb}, nil
		}
		if err != nil {
			return &SolveResult{Err: err, Ran: true, Ambient: amb}, nil
		}
		return &SolveResult{OP: op, Ran: true, NoCondEstimate: !op.CondEstimated, Ambient: amb}, nil
	},
}

// notSolvable says why design p cannot be solved at all, or "" when its
// node voltages are determined.
func notSolvable(p *Pass) string {
	t := topo(p)
	switch {
	case p.Build.Incomplete || p.Build.Invalid:
		return "the design has errors that stop it from being modelled"
	case !t.Grounded:
		return "the design has no ground to measure voltages from"
	case len(t.Cutsets) > 0:
		return "current sources force currents that cannot all flow (current-cutset), so no operating point exists"
	}
	for i := range t.Loops {
		if !t.Loops[i].Balanced() {
			return "voltage sources around a loop contradict each other (source-loop), so no operating point exists"
		}
	}
	return ""
}

func solved(p *Pass) *SolveResult { return p.ResultOf[Solve].(*SolveResult) }

func op(p *Pass) *solve.Result { return solved(p).OP }

// failure reports a solve error at the first place it names.
func failure(p *Pass, e *solve.Error, msg string) {
	d := p.Design
	dg := diag.Diagnostic{Message: msg}
	for _, id := range e.Parts {
		q := &d.Parts[id]
		if !dg.Pos.IsValid() {
			dg.Pos, dg.End, dg.Subject = q.Pos, q.End, d.NameOf(q)
			continue
		}
		dg.Related = append(dg.Related, diag.Related{Pos: q.Pos, End: q.End, Message: d.NameOf(q) + " is involved"})
	}
	for _, n := range e.Nets {
		net := &d.Nets[n]
		if !dg.Pos.IsValid() {
			dg.Pos, dg.End, dg.Subject = net.Pos, net.End, d.NetNameOf(net)
			continue
		}
		if len(dg.Related) < 10 {
			dg.Related = append(dg.Related, diag.Related{Pos: net.Pos, End: net.End, Message: "net " + netName(d, n) + " is involved"})
		}
	}
	if !dg.Pos.IsValid() && len(d.Parts) > 0 {
		dg.Pos, dg.End = d.Parts[0].Pos, d.Parts[0].End
	}
	p.Report(dg)
}

func partNames(d *circuit.Design, ids []circuit.PartID, max int) string {
	s := ""
	for i, id := range ids {
		if i == max {
			s += fmt.Sprintf(" and %d more", len(ids)-max)
			break
		}
		if i > 0 {
			s += ", "
		}
		s += d.NameOf(&d.Parts[id])
	}
	return s
}

// SolveFailed reports a design the topology rules accept but that the
// solver could not solve, or whose solution fails its self-checks.
var SolveFailed = &Analyzer{
	Name:     "solve-failed",
	Severity: diag.Error,
	Requires: []*Analyzer{Solve},
	Doc: `the DC operating point could not be found or failed its self-checks
The topology rules found nothing wrong, yet the equations were singular, a
part could not be modelled, or the solution broke Kirchhoff's current law
or Tellegen's theorem. The finding names the nets or parts involved.`,
	Run: func(p *Pass) (any, error) {
		var se *solve.Error
		if err := solved(p).Err; errors.As(err, &se) && se.Kind != solve.NoConvergence && se.Kind != solve.Starved {
			msg := "the DC operating point could not be found: " + se.Msg
			if len(se.Nets) > 0 {
				msg += " (nets " + netList(p.Design, se.Nets, 5) + ")"
			}
			failure(p, se, msg)
		}
		return nil, nil
	},
}

// NoConvergence reports diodes and LEDs that did not settle.
var NoConvergence = &Analyzer{
	Name:     "no-convergence",
	Severity: diag.Error,
	Requires: []*Analyzer{Solve},
	Doc: `the nonlinear parts did not settle on an operating point
Newton–Raphson, then gmin stepping, then source stepping were tried, each
with an iteration cap; the diodes and LEDs named did not settle.`,
	Run: func(p *Pass) (any, error) {
		var se *solve.Error
		if err := solved(p).Err; errors.As(err, &se) && se.Kind == solve.NoConvergence {
			failure(p, &solve.Error{Parts: se.Parts}, fmt.Sprintf("%s; these parts did not settle: %s", se.Msg, partNames(p.Design, se.Parts, 8)))
		}
		return nil, nil
	},
}

// IllConditionedLimit is the condition number above which results are
// flagged: a solve then keeps about four of the sixteen significant digits
// of a float64 (forward error ≲ κ·u; Higham, Accuracy and Stability of
// Numerical Algorithms, 2nd ed., 2002).
const IllConditionedLimit = 1e12

// IllConditioned warns when the equations are so ill-conditioned that the
// solved values may have lost their accuracy.
var IllConditioned = &Analyzer{
	Name:     "ill-conditioned",
	Severity: diag.Warning,
	Requires: []*Analyzer{Solve},
	Doc: `the equations are so ill-conditioned that the results may be inaccurate
The condition number of the final system, equilibrated by a symmetric
diagonal scaling, is estimated; above 1e12 a plain float64 solve keeps few
of its digits. The usual cause is a tiny resistance between nets that the
rest of the circuit holds only by huge ones. The solver refines such
solutions in extended precision; the finding says whether that certified
every part's values, and where it did not the rating findings say so too.
Designs solved iteratively (the largest) get no estimate and no finding.`,
	Run: func(p *Pass) (any, error) {
		r := op(p)
		if r == nil || !(r.Cond > IllConditionedLimit) {
			return nil, nil
		}
		d := p.Design
		msg := fmt.Sprintf("the equations are ill-conditioned (condition number about %.1e), so the solved values may be inaccurate", r.Cond)
		if r.Uncertified == nil {
			msg = fmt.Sprintf("the equations are ill-conditioned (condition number about %.1e); refinement in extended precision certified every part's values to 1e-10, but values this far apart are often a unit slip", r.Cond)
		}
		lo, hi, rlo, rhi, ok := solve.Span(d)
		if !ok {
			first := &d.Parts[0]
			p.Reportf(first.Pos, first.End, "%s", msg)
			return nil, nil
		}
		a, b := &d.Parts[lo], &d.Parts[hi]
		p.Report(diag.Diagnostic{Pos: a.Pos, End: a.End, Subject: d.NameOf(a),
			Message: fmt.Sprintf("%s; resistances span %s (%s) to %s (%s)", msg, units.Format(rlo, units.Resistance), d.NameOf(a), units.Format(rhi, units.Resistance), d.NameOf(b)),
			Related: []diag.Related{{Pos: b.Pos, End: b.End, Message: d.NameOf(b) + " is the largest resistance"}}})
		return nil, nil
	},
}
