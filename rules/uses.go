package rules

// uses.go: the one place that judges a part's operating point against its
// ratings. The rating rules, near-rating and "nodal report" all read it.

import (
	"fmt"
	"math"
	"strconv"

	"nodal/circuit"
	"nodal/solve"
	"nodal/units"
)

// Quantities are one part's values at an operating point, in package
// solve's sign convention: V is V(first pin) − V(second pin), I flows from
// the first pin to the second through the part, P is positive when
// absorbed.
type Quantities struct {
	V, I, P float64
	// Uncertified says that the solver could not certify the accuracy of
	// these values; every use judged from them says so.
	Uncertified bool
	// Ambient is the ambient temperature in °C when HasAmbient is set,
	// and 25 °C otherwise: it derates resistors' power ratings and sets
	// junction temperatures (see thermal.go).
	Ambient    float64
	HasAmbient bool
	// VoltageUnknown and CurrentUnknown say that the circuit does not
	// determine the part's voltage (a pin on a section with no DC path) or
	// its current (it closes a loop of ideal shorts and voltage sources):
	// Judge then leaves the ratings that need them unjudged, and
	// unrated-parts names them. (Set from solve.Result.Undetermined.)
	VoltageUnknown, CurrentUnknown bool
}

// unknown reports whether a rating of dimension dim needs a value the
// circuit does not determine: power needs both.
func (q Quantities) unknown(dim units.Dim) bool {
	switch dim {
	case units.Voltage:
		return q.VoltageUnknown
	case units.Current:
		return q.CurrentUnknown
	}
	return q.VoltageUnknown || q.CurrentUnknown
}

// Point reads parts' quantities from a solved operating point, with
// rounding noise cleared, so that the rules and the report judge and show
// the same values.
type Point struct {
	r      *solve.Result
	vs, is float64 // the largest voltage and current in the design
	// ambient (°C) is carried into every part's Quantities when
	// hasAmbient is set.
	ambient    float64
	hasAmbient bool
}

// NewPoint prepares to read r.
func NewPoint(r *solve.Result) *Point {
	pt := &Point{r: r}
	for _, v := range r.NetV {
		pt.vs = math.Max(pt.vs, math.Abs(v))
	}
	for _, c := range r.I {
		pt.is = math.Max(pt.is, math.Abs(c))
	}
	return pt
}

// At sets the ambient temperature (°C) carried into the quantities pt
// returns, and returns pt.
func (pt *Point) At(celsius float64) *Point {
	pt.ambient, pt.hasAmbient = celsius, true
	return pt
}

// Part returns part i's quantities. A voltage or current that is rounding
// noise reads 0 (see Clean); the power is the product of the two.
func (pt *Point) Part(i circuit.PartID) Quantities {
	v, c := Clean(pt.r.V[i], pt.vs, FloorV), Clean(pt.r.I[i], pt.is, FloorI)
	q := Quantities{V: v, I: c, P: v * c, Ambient: pt.ambient, HasAmbient: pt.hasAmbient}
	if pt.r.MultiAt(i) != nil {
		// A part with more pins absorbs more than the product across its
		// ends: what it dissipates in all (solve.Result.P).
		q.P = Clean(pt.r.P[i], pt.vs*pt.is, FloorV*FloorI)
	}
	// The solver's own verdicts on these values (solve owns them): what it
	// could not certify, and what the circuit leaves undetermined.
	q.Uncertified = pt.r.Uncertified != nil && pt.r.Uncertified[i]
	if pt.r.Undetermined != nil {
		u := pt.r.Undetermined[i]
		q.VoltageUnknown, q.CurrentUnknown = u&solve.UnknownVoltage != 0, u&solve.UnknownCurrent != 0
	}
	return q
}

// Net returns net n's voltage, cleaned as Part cleans a part's.
func (pt *Point) Net(n circuit.NetID) float64 { return Clean(pt.r.NetV[n], pt.vs, FloorV) }

// Below these a voltage or current reads 0: a picovolt, and a femtoampere
// (the leakage of a reverse-biased junction, 1 pS per volt, is well above
// it).
const (
	FloorV = 1e-12
	FloorI = 1e-15
)

// Clean returns 0 for a value that is rounding noise: below floor, or below
// 1e-13 of the largest value of its kind in the design (scale), such as a
// current of 1e-19 A through a wire that carries nothing in a design whose
// largest current is 1 A. The solver's self-checks hold currents to 1e-9 of
// the largest, so 1e-13 is well below anything it resolves.
func Clean(v, scale, floor float64) float64 {
	if math.Abs(v) <= math.Max(1e-13*scale, floor) || v == 0 {
		return 0 // also turns −0 into 0
	}
	return v
}

// Use is how much of one rating a part uses at an operating point.
type Use struct {
	What   string    // "power", "current", "voltage", "reverse voltage", "discharge current"
	Rule   string    // the rule that reports it past the rating
	Dim    units.Dim // of Value and Rating
	Value  float64   // the magnitude the rating limits
	Rating float64
	Frac   float64 // Value / Rating
	// Limit is the derating limit of this rating (a fraction of it), or
	// 0 when none applies.
	Limit float64
	// Uncertified is copied from the quantities the use was judged on.
	Uncertified bool
	// Nameplate is the rating as written when Rating is it derated for
	// temperature (a resistor's power above its knee), and 0 otherwise;
	// At is then the ambient temperature in °C.
	Nameplate, At float64
}

// overLimit is the use above which a rating counts as exceeded; the
// margin keeps a part sized exactly at its rating (or at its derating
// limit) from firing on rounding.
const overLimit = 1 + 1e-9

// Over reports whether the use is past the rating.
func (u Use) Over() bool { return u.Frac > overLimit }

// Derated reports whether the use is past its derating limit but within
// the rating.
func (u Use) Derated() bool { return u.Limit > 0 && u.Frac > u.Limit*overLimit && !u.Over() }

// Judge lists every rating written on p with the use the quantities q make
// of it, each with the derating limit der sets for it. It is the only
// place that judges a rating; which magnitude each rating limits is
// declared with the kind (circuit.Rating): power |P|; current |I|, but a
// diode's or LED's forward current max(I, 0); voltage |V|, but a diode's
// or LED's "rated V" is its reverse rating, max(−V, 0). A part with no
// rating has no use. A resistor's power is judged against its rating
// derated for the ambient temperature (DeratingFactor); a diode's or
// LED's junction temperature Ta + θ·|P| against its tjmax, when both theta
// and tjmax are written (JunctionTemperature). A diode with a breakdown
// voltage that conducts in reverse has its current rating judged on the
// reverse current, and that use and its power reported by reverse-voltage
// (breakdownUse).
func Judge(p *circuit.Part, q Quantities, der Derating) []Use {
	return appendUses(nil, p, q, der)
}

// appendUses appends Judge's uses of p to out and returns the extended
// slice, so that a pass over every part can reuse one buffer.
func appendUses(out []Use, p *circuit.Part, q Quantities, der Derating) []Use {
	rs := p.Kind.Info().Ratings
	for i := range rs {
		r := &rs[i]
		rating := p.Rated(r)
		if !(rating > 0) || q.unknown(r.Dim) { // a value the circuit leaves open is not judged (unrated-parts says so)
			continue
		}
		var x float64
		switch r.Dim {
		case units.Power:
			x = q.P
		case units.Voltage:
			x = q.V
		case units.Current:
			x = q.I
		}
		switch r.Measure {
		case circuit.Forward:
			x = math.Max(x, 0)
		case circuit.Reverse:
			x = math.Max(-x, 0)
		default:
			x = math.Abs(x)
		}
		if r.Dim == units.Power && p.Kind == circuit.Resistor {
			out = append(out, resistorPowerUse(p, q, rating, der.limitOf(r), der))
			continue
		}
		what, rule := r.What, r.RuleName()
		if w, v, ok := breakdownUse(p, r, q); ok {
			what, rule, x = w, "reverse-voltage", v
		}
		out = append(out, Use{What: what, Rule: rule, Dim: r.Dim, Value: x, Rating: rating, Frac: x / rating,
			Limit: der.limitOf(r), Uncertified: q.Uncertified})
	}
	if u, ok := junctionUse(p, q); ok {
		out = append(out, u)
	}
	return out
}

// breakdownUse says how a diode with a breakdown voltage uses rating r
// while it conducts in reverse (q.I < 0): its current rating limits the
// reverse current, and both that and its power are reported by
// reverse-voltage, "current in breakdown" and "power in breakdown". ok is
// false for other parts, forward bias and other ratings: a rated reverse
// voltage stays judged as written.
func breakdownUse(p *circuit.Part, r *circuit.Rating, q Quantities) (what string, use float64, ok bool) {
	if p.Breakdown <= 0 || !(q.I < 0) {
		return "", 0, false
	}
	switch {
	case r.Dim == units.Current && r.Measure == circuit.Forward:
		return "current in breakdown", -q.I, true
	case r.Dim == units.Power:
		return "power in breakdown", math.Abs(q.P), true
	}
	return "", 0, false
}

// Worst returns the index of the use with the largest fraction, or -1 when
// there is none.
func Worst(us []Use) int {
	w := -1
	for i, u := range us {
		if w < 0 || u.Frac > us[w].Frac {
			w = i
		}
	}
	return w
}

// FormatUse formats a fraction of a rating as a percentage that never
// hides which side of the rating it is on, nor that it is past limit (a
// derating limit, or 0 for none): 1.0016 is "100.16 %", not "100 %", and
// 0.9996 is "99.96 %". Other values get units.FormatPercent's figures.
func FormatUse(f, limit float64) string {
	s := units.FormatPercent(f)
	if math.IsNaN(f) || math.IsInf(f, 0) {
		return s
	}
	for digits := 1; digits <= 12 && !faithful(s, f, limit); digits++ {
		s = strconv.FormatFloat(f*100, 'f', digits, 64) + " %"
	}
	return s
}

// faithful reports whether the percentage s sits on the same side of 1 as
// f does, and past limit when f is, by the tests the rules apply.
func faithful(s string, f, limit float64) bool {
	p, err := strconv.ParseFloat(s[:len(s)-2], 64)
	if err != nil {
		return true
	}
	if f > overLimit && !(p > 100) || f < 1 && !(p < 100) {
		return false
	}
	// Past a derating limit, the figure must be past it too.
	return !(limit > 0 && f > limit*overLimit && !(p > limit*100))
}

// Describe says what a use is, e.g. "R3 dissipates 312 mW, 125 % of its
// 250 mW rating", in the wording the kind table gives the rating.
func Describe(d *circuit.Design, p *circuit.Part, u Use) string {
	val, rating, frac := units.Format(u.Value, u.Dim), units.Format(u.Rating, u.Dim), FormatUse(u.Frac, u.Limit)
	uncertified := ""
	if u.Uncertified {
		uncertified = " (the solver could not certify the accuracy of this operating point)"
	}
	switch {
	case u.What == "junction temperature":
		return describeJunction(d, p, u) + uncertified
	case u.What == "power" && u.Nameplate > 0:
		return fmt.Sprintf("%s dissipates %s, %s of its %s rating derated to %s at %s", d.NameOf(p), val, frac, units.Format(u.Nameplate, u.Dim), rating, units.FormatCelsius(u.At)) + uncertified
	}
	says, of := "", "rating"
	for _, r := range p.Kind.Info().Ratings {
		if r.What == u.What && r.Dim == u.Dim {
			says = r.Says
			if r.Of != "" {
				of = r.Of
			}
			break
		}
	}
	if says == "" {
		switch u.What {
		case "power":
			says = "dissipates %s"
		case "power in breakdown":
			says = "dissipates %s in reverse breakdown"
		case "current in breakdown":
			says = "carries %s in reverse breakdown"
		case "current":
			says = "carries %s"
		default:
			says = "has %s across it"
		}
	}
	s := fmt.Sprintf("%s "+says+", %s of its %s %s", d.NameOf(p), val, frac, rating, of)
	if u.Uncertified {
		s += " (the solver could not certify the accuracy of this operating point)"
	}
	return s
}
