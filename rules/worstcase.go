package rules

// worstcase.go: every rating judged at its worst over the box of
// tolerances and ambient temperature (package worst), and the rules that
// report a part past a rating there but within it at nominal.

import (
	"errors"
	"fmt"
	"strings"

	"nodal/circuit"
	"nodal/diag"
	"nodal/worst"
)

// WorstResult is the result of the WorstCase pass. R is nil when the
// design has no toleranced parameter and no temperature range, or when the
// nominal solve gave no operating point; Skipped says why a design that
// has them was not judged.
type WorstResult struct {
	R       *worst.Result
	Skipped error
}

// worstNames is how many off-nominal parts a corner names in a message.
const worstNames = 6

// WorstCase finds each rated quantity's worst case over the box of
// toleranced parameters and ambient temperature; it reports nothing
// itself.
var WorstCase = &Analyzer{
	Name:     "worst-case",
	Doc:      "worst case over tolerances and temperature, shared by the rating rules",
	Requires: []*Analyzer{Solve},
	Run: func(p *Pass) (any, error) {
		s := solved(p)
		if s.OP == nil {
			return &WorstResult{}, nil
		}
		d, der := p.Design, p.Config.Derating
		judge := func(i circuit.PartID, v, c, pw, t float64) []float64 {
			us := Judge(&d.Parts[i], Quantities{V: v, I: c, P: pw, Ambient: t, HasAmbient: true}, der)
			if len(us) == 0 {
				return nil
			}
			out := make([]float64, len(us))
			for k, u := range us {
				out[k] = u.Frac
			}
			return out
		}
		a := s.Ambient
		r, err := worst.Analyze(d, s.OP, worst.Ambient{Low: a.Low, High: a.High, Nominal: a.Nominal}, judge, worst.Options{ConfirmAbove: confirmAbove(der)})
		var sk *worst.Skipped
		if errors.As(err, &sk) {
			return &WorstResult{Skipped: err}, nil
		}
		if err != nil {
			return nil, err
		}
		return &WorstResult{R: r}, nil
	},
}

// confirmAbove is the use from which a first-order worst case is confirmed
// by a full solve: four fifths of the lowest derating limit, so that every
// quantity a rule could report is solved at its corner.
func confirmAbove(der Derating) float64 {
	lo := 1.0
	for _, k := range circuit.Kinds() {
		for i := range k.Info().Ratings {
			if l := der.limitOf(&k.Info().Ratings[i]); l > 0 && l < lo {
				lo = l
			}
		}
	}
	return 0.8 * lo
}

func worstOf(p *Pass) *WorstResult {
	w, _ := p.ResultOf[WorstCase].(*WorstResult)
	if w == nil {
		return &WorstResult{}
	}
	return w
}

// worstUses returns, for part i, each rating's use at nominal and at its
// worst case, with the case; nil when the design has no worst case.
func worstUses(p *Pass, i int) (nominal, worstUse []Use, cases []worst.Case) {
	w := worstOf(p).R
	if w == nil || w.Worst[i] == nil {
		return nil, nil, nil
	}
	q := &p.Design.Parts[i]
	nominal = Judge(q, solved(p).Point().Part(circuit.PartID(i)), p.Config.Derating)
	cases = w.Worst[i]
	for k, c := range cases {
		us := Judge(q, Quantities{V: c.V, I: c.I, P: c.V * c.I, Ambient: c.T, HasAmbient: true}, p.Config.Derating)
		if k < len(us) {
			u := us[k]
			if !c.Confirmed {
				u.Frac = c.Frac // a first-order estimate: its quantities are the nominal ones
				u.Value = c.Frac * u.Rating
			}
			worstUse = append(worstUse, u)
		}
	}
	if len(worstUse) != len(nominal) {
		return nil, nil, nil
	}
	return nominal, worstUse, cases
}

// cornerText says where a worst case lies, and how it was found.
func cornerText(p *Pass, c worst.Case) string {
	w := worstOf(p).R
	s := " with " + worst.Describe(p.Design, w.Params, c.At, w.RangeT, worstNames)
	if !c.Confirmed {
		s += " (a first-order estimate, not confirmed by a solve)"
	}
	return s
}

// CornerOverRating reports a part within a rating at nominal but past it
// at the worst corner of its tolerances and ambient temperature.
var CornerOverRating = &Analyzer{
	Name:     "corner-over-rating",
	Severity: diag.Error,
	Requires: []*Analyzer{Solve, WorstCase},
	Doc: `a part within its rating at nominal values is past it at the worst corner of tolerances and temperature
Every part written with tol (resistors, sources, batteries and loads) may sit anywhere in its
band, a port's drive written as a range (port vin 4.5 V to 5.5 V) anywhere in
it, and the ambient temperature anywhere in its range; each rating is
judged at its worst over all of them together, and the finding names the
corner that reaches it. A part past a rating at nominal already has its
over-power, over-current, over-voltage, reverse-voltage or over-temperature
finding instead.`,
	Run: func(p *Pass) (any, error) {
		d := p.Design
		for i := range d.Parts {
			nominal, worstUse, cases := worstUses(p, i)
			q := &d.Parts[i]
			for k, u := range worstUse {
				if nominal[k].Over() || !u.Over() {
					continue
				}
				p.Report(diag.Diagnostic{Pos: q.Pos, End: q.End, Subject: d.NameOf(q),
					Message: Describe(d, q, u) + cornerText(p, cases[k]) + fmt.Sprintf("; %s at nominal", FormatUse(nominal[k].Frac, nominal[k].Limit))})
			}
		}
		return nil, nil
	},
}

// CornersNotJudged says when the worst case of a design was not judged,
// or only in part.
var CornersNotJudged = &Analyzer{
	Name:     "corners-not-judged",
	Severity: diag.Note,
	Requires: []*Analyzer{Solve, WorstCase},
	Doc: `the worst case over tolerances and temperature was not judged, or only in part
A design too large for the worst-case analysis, or whose linearised
equations it cannot represent, is judged at nominal values only; a design
with more quantities near their limits than the confirmation budget keeps
some worst cases as first-order estimates; a corner whose operating point
could not be found is not judged. The note says which, so that a clean
check never hides work that was not done.`,
	Run: func(p *Pass) (any, error) {
		w := worstOf(p)
		d := p.Design
		if len(d.Parts) == 0 {
			return nil, nil
		}
		first := &d.Parts[0]
		switch {
		case w.Skipped != nil:
			p.Reportf(first.Pos, first.End, "ratings judged at nominal values only, not over tolerances and temperature: %v", w.Skipped)
		case w.R != nil && (w.R.Unconfirmed > 0 || w.R.Failed > 0):
			var parts []string
			if n := w.R.Failed; n > 0 {
				parts = append(parts, count(n, "corner of the box gives no operating point and is", "corners of the box give no operating point and are")+" not judged")
			}
			if n := w.R.Unconfirmed; n > 0 {
				parts = append(parts, count(n, "worst case near a limit is", "worst cases near a limit are")+" first-order estimates, past the budget of confirming solves")
			}
			p.Reportf(first.Pos, first.End, "worst case over tolerances and temperature judged in part: %s", strings.Join(parts, "; "))
		}
		return nil, nil
	},
}

// count writes n with the singular or plural noun phrase.
func count(n int, one, many string) string {
	if n == 1 {
		return "1 " + one
	}
	return fmt.Sprintf("%d %s", n, many)
}
