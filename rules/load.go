package rules

// load.go: the rule for constant-power loads that no operating point can
// feed.

import (
	"errors"

	"nodal/diag"
	"nodal/solve"
)

// StarvedLoad reports constant-power loads that demand more power than
// the circuit feeding them can deliver.
var StarvedLoad = &Analyzer{
	Name:     "starved-load",
	Severity: diag.Error,
	Requires: []*Analyzer{Solve},
	Doc: `a constant-power load demands more power than the rail can deliver
A load that draws a set power P through a source of voltage V_th and
resistance R_th has an operating point only while P ≤ V_th²/(4·R_th) (the
maximum power transfer theorem); past it there is none, and in the real
circuit the rail collapses or the load drops out. The finding gives the
power asked for and the most the rail can deliver.`,
	Run: func(p *Pass) (any, error) {
		var se *solve.Error
		if err := solved(p).Err; errors.As(err, &se) && se.Kind == solve.Starved {
			failure(p, se, se.Msg)
		}
		return nil, nil
	},
}
