package rules

// judged.go: the pass that judges every part's ratings once at the
// nominal operating point, and keeps what the rating rules report from.

import (
	"sync"

	"nodal/circuit"
)

// Judged is the result of the Ratings pass: the few uses the rating rules
// and near-rating report, and the parts unrated-parts looks at, rather
// than every use of every part (a clean design has none of the first).
type Judged struct {
	// Flagged holds every nominal use past its rating (Use.Over) or past
	// its derating limit (Use.Derated), in part order and, within a
	// part, in Judge's order.
	Flagged []PartUse
	// Undetermined lists, in part order, the parts whose voltage or
	// current the circuit does not determine (Quantities.VoltageUnknown,
	// CurrentUnknown): Judge leaves some of their ratings unjudged.
	Undetermined []circuit.PartID
}

// PartUse is one part's use of one rating.
type PartUse struct {
	Part circuit.PartID
	Use  Use
}

// Ratings judges every part's ratings at the nominal operating point
// (Judge), once for all the rules that report them; it reports nothing
// itself. Its result is a *Judged, empty when the design was not solved.
var Ratings = &Analyzer{
	Name:     "ratings",
	Doc:      "every part's ratings judged at the operating point, shared by the rating rules",
	Requires: []*Analyzer{Solve},
	Run: func(p *Pass) (any, error) {
		if op(p) == nil {
			return &Judged{}, nil
		}
		d, pt, der := p.Design, solved(p).Point(), p.Config.Derating
		// On a large design the parts are judged in as many ranges as
		// there are cores, the ranges' lists joined in part order.
		k := workersFor(d)
		if k == 1 {
			j := &Judged{}
			judgeRange(j, d, pt, der, 0, len(d.Parts))
			return j, nil
		}
		parts := make([]Judged, k)
		var wg sync.WaitGroup
		for w := range k {
			lo, hi := len(d.Parts)*w/k, len(d.Parts)*(w+1)/k
			wg.Go(func() { judgeRange(&parts[w], d, pt, der, lo, hi) })
		}
		wg.Wait()
		j := &Judged{}
		for _, r := range parts {
			j.Flagged = append(j.Flagged, r.Flagged...)
			j.Undetermined = append(j.Undetermined, r.Undetermined...)
		}
		return j, nil
	},
}

// judgeRange judges the ratings of parts lo … hi-1 into j.
func judgeRange(j *Judged, d *circuit.Design, pt *Point, der Derating, lo, hi int) {
	var buf []Use
	for i := lo; i < hi; i++ {
		id := circuit.PartID(i)
		q := &d.Parts[i]
		if len(q.Kind.Info().Ratings) == 0 && q.Heat == nil {
			continue // nothing to judge (Judge would return no use)
		}
		qs := pt.Part(id)
		if qs.VoltageUnknown || qs.CurrentUnknown {
			j.Undetermined = append(j.Undetermined, id)
		}
		buf = appendUses(buf[:0], q, qs, der)
		for _, u := range buf {
			if u.Over() || u.Derated() {
				j.Flagged = append(j.Flagged, PartUse{Part: id, Use: u})
			}
		}
	}
}

func judged(p *Pass) *Judged { return p.ResultOf[Ratings].(*Judged) }
