package worst

// analyze.go: the worst case of every rated quantity over the box, by
// first-order sensitivities confirmed by full solves, a golden-section
// search of a resistor's own value for its power, and every corner when
// the box is small.

import (
	"fmt"
	"math"
	"strconv"

	"nodal/circuit"
	"nodal/solve"
	"nodal/units"
)

// Judge returns, for part i with voltage v, current c and power p at an
// operating point at ambient temperature t (°C), the fraction of each of
// its ratings it uses, always in the same order; nil for a part with no
// rating. Larger is worse.
type Judge func(i circuit.PartID, v, c, p, t float64) []float64

// Options bound the work. Zero fields take the defaults.
type Options struct {
	// MaxCorners: with at most this many parameters (temperature
	// included) every corner is solved too (12).
	MaxCorners int
	// MaxCornerWork bounds corners × parts for that enumeration (4e6).
	MaxCornerWork float64
	// MaxUnknowns: designs with more unknowns in the linearised system are
	// not judged (10 000): its sparse LU has no fill budget of its own.
	MaxUnknowns int
	// MaxWork bounds the floating-point operations of the direct solves
	// (2e9, about a second).
	MaxWork float64
	// ConfirmAbove: quantities whose first-order worst use reaches this
	// fraction of their rating are confirmed by a full solve (0.5).
	ConfirmAbove float64
	// MaxConfirm bounds the confirmation and search solves (4000).
	MaxConfirm int
}

func (o *Options) defaults() {
	if o.MaxCorners == 0 {
		o.MaxCorners = 12
	}
	if o.MaxCornerWork == 0 {
		o.MaxCornerWork = 4e6
	}
	if o.MaxUnknowns == 0 {
		o.MaxUnknowns = 10_000
	}
	if o.MaxWork == 0 {
		o.MaxWork = 2e9
	}
	if o.ConfirmAbove == 0 {
		o.ConfirmAbove = 0.5
	}
	if o.MaxConfirm == 0 {
		o.MaxConfirm = 4000
	}
}

// Case is where one rated quantity of one part is at its worst.
type Case struct {
	Frac       float64 // the use of the rating there
	V, I, P, T float64 // the part's voltage, current and power, and the ambient temperature (°C)
	At         Corner
	// Confirmed says Frac was found by a full solve at At; otherwise it
	// is a first-order estimate.
	Confirmed bool
}

// Result is the worst case of a design.
type Result struct {
	Params []Param
	RangeT bool    // the ambient temperature is a range, and part of the box
	Amb    Ambient // the ambient temperature
	// Worst holds per part, per rating (in Judge's order), the worst case
	// found; nil for parts with no rating.
	Worst [][]Case
	// NetLow and NetHigh are every net's voltage range over the box: the
	// extremes over every corner when Corners is set, first-order
	// otherwise.
	NetLow, NetHigh []float64
	// Corners says every corner of the box was solved.
	Corners bool
	// Unconfirmed counts quantities near a limit whose worst case is a
	// first-order estimate, the confirmation budget being spent.
	Unconfirmed int
	// Failed counts solves of a corner that did not give an operating
	// point; those corners are not judged, and Unconfirmed counts them.
	Failed int
	Solves int
	// Supplies holds, for a design with regulators or converters whose
	// every corner was solved, each one's input over the box, in part
	// order.
	Supplies []SupplyRange
}

// SupplyRange is a regulator's or converter's input over the corners of
// the box, and the first corner (in the order they are solved) where it
// is out of regulation.
type SupplyRange struct {
	Part circuit.PartID
	// InLow and InHigh are its lowest and highest input voltage (in −
	// common) over the corners, at LowAt and HighAt.
	InLow, InHigh float64
	LowAt, HighAt Corner
	// Region is Regulating when it regulates at every corner; otherwise
	// its region at Out, with its input and output voltages and its set
	// voltage (moved by its tolerance) there.
	Region                solve.Region
	Out                   Corner
	OutIn, OutOut, OutSet float64
}

// Skipped says why a design's worst case was not judged.
type Skipped struct{ Reason string }

func (s *Skipped) Error() string { return s.Reason }

// Analyze finds the worst case of every rated quantity of d over its box.
// nominal is d solved at amb.Nominal (with resistor values moved to it).
// It returns nil and no error when d has no parameter, and a *Skipped when
// the design is past the limits of opt.
func Analyze(d *circuit.Design, nominal *solve.Result, amb Ambient, judge Judge, opt Options) (*Result, error) {
	opt.defaults()
	ps, rangeT := params(d, amb)
	if len(ps) == 0 && !rangeT {
		return nil, nil
	}
	a := &analysis{d: d, dn: d.AtTemperature(amb.Nominal), nominal: nominal, judge: judge, opt: opt,
		res: &Result{Params: ps, RangeT: rangeT, Amb: amb}}
	nparam := len(ps)
	if rangeT {
		nparam++
	}
	small := nparam <= opt.MaxCorners && math.Ldexp(1, nparam)*float64(len(d.Parts)) <= opt.MaxCornerWork
	for i := range d.Parts {
		if p := &d.Parts[i]; p.Multi() {
			// The linearised equations would need each regulator's
			// region and what each supply draws from its input rail
			// (solve/supply.go), which change from corner to corner: a
			// design with one has every corner of its box solved in full
			// instead, when the box is small enough.
			if !small {
				return nil, &Skipped{Reason: fmt.Sprintf("with a %s (%s) every corner of the box is solved in full, and %d parameters are more than the %d that takes",
					p.Kind, d.NameOf(p), nparam, opt.MaxCorners)}
			}
			a.nominalCases()
			a.everyCorner()
			return a.res, nil
		}
	}
	if err := a.sensitivities(); err != nil {
		return nil, err
	}
	if small {
		a.everyCorner()
	}
	a.confirm()
	return a.res, nil
}

// analysis is one run of Analyze.
type analysis struct {
	d, dn   *circuit.Design // as written; at the nominal temperature
	nominal *solve.Result
	judge   Judge
	opt     Options
	res     *Result
	scratch []circuit.Part

	// First-order results, per quantity q (parts' ratings in order):
	// owner part and rating index, nominal use, estimate, corner.
	qPart []circuit.PartID
	qIdx  []int
	f0    []float64
	est   []float64
	// pending: the estimate exceeded the nominal use, so the quantity's
	// own first-order corner is to be solved (confirm), even where a
	// solve at another corner has since confirmed a value.
	pending []bool
	dir     [][]int8 // per quantity, per part parameter: −1, 0, +1
	tEnd    []float64
	rth     []float64 // per quantity: Thévenin resistance its own resistor sees (power only), or NaN
	tgain   []float64 // per quantity: the gain of its temperature end
	// held: per part, per rating, the largest use solved below a
	// first-order estimate while the estimate stood (record).
	held [][]Case
}

func (a *analysis) tGain(q int) float64 {
	if a.tgain == nil {
		a.tgain = make([]float64, len(a.f0))
	}
	return a.tgain[q]
}

// temperature ends of the box.
func (a *analysis) tEnds() []float64 {
	if a.res.RangeT {
		return []float64{a.res.Amb.Low, a.res.Amb.High}
	}
	return []float64{a.res.Amb.Nominal}
}

// nominalCases lists every rated quantity with its nominal use as its
// worst case so far, and every net's range as its nominal voltage.
func (a *analysis) nominalCases() {
	d, r, ps := a.d, a.nominal, a.res.Params
	tNom := a.res.Amb.Nominal
	// The quantities and their nominal uses.
	for i := range d.Parts {
		fr := a.judge(circuit.PartID(i), r.V[i], r.I[i], r.P[i], tNom)
		for k, f := range fr {
			a.qPart = append(a.qPart, circuit.PartID(i))
			a.qIdx = append(a.qIdx, k)
			a.f0 = append(a.f0, f)
		}
	}
	nq := len(a.f0)
	a.res.Worst = make([][]Case, len(d.Parts))
	for q := 0; q < nq; q++ {
		i := a.qPart[q]
		if a.res.Worst[i] == nil {
			a.res.Worst[i] = make([]Case, 0, 2)
		}
		nomCorner := Corner{S: make([]float64, len(ps)), T: tNom}
		a.res.Worst[i] = append(a.res.Worst[i], Case{Frac: a.f0[q], V: r.V[i], I: r.I[i], P: r.P[i], T: tNom, At: nomCorner, Confirmed: true})
	}
	a.res.NetLow = append([]float64(nil), r.NetV...)
	a.res.NetHigh = append([]float64(nil), r.NetV...)
}

// sensitivities builds the first-order estimate and corner of every
// quantity, and every net's first-order range.
func (a *analysis) sensitivities() error {
	a.nominalCases()
	d, r, ps := a.d, a.nominal, a.res.Params
	tNom := a.res.Amb.Nominal
	nq := len(a.f0)
	nparam := len(ps)
	if a.res.RangeT {
		nparam++
	}
	// The work of the direct solves: one pass over the factors each, or
	// the inverse (n solves) and two of its columns per parameter; asked
	// with the symbolic fill before factoring and again with the real one.
	budget := func(n, fill int) error {
		work := float64(nparam) * 2 * float64(fill)
		if nparam > n && n <= maxInverse {
			work = float64(n)*2*float64(fill) + float64(nparam)*2*float64(n)
		}
		if work > a.opt.MaxWork {
			return &Skipped{Reason: fmt.Sprintf("%d toleranced parameters on %d unknowns is more work than the worst-case analysis takes (%.1e of %.1e operations)", nparam, n, work, a.opt.MaxWork)}
		}
		return nil
	}
	j, err := newJacobian(a.dn, r, units.Kelvin(tNom), a.opt.MaxUnknowns, budget)
	if err != nil {
		return err
	}
	if err := budget(j.n, j.fill()); err != nil {
		return err
	}
	// Partial derivatives of each quantity's use in the part's V, I and
	// P, by central differences on the judge.
	fv, fi, fp := make([]float64, nq), make([]float64, nq), make([]float64, nq)
	for q := 0; q < nq; {
		i := a.qPart[q]
		v, c, p := r.V[i], r.I[i], r.P[i]
		hv, hc, hp := step(v), step(c), step(p)
		up := func(dv, dc, dp float64) []float64 { return a.judge(i, v+dv, c+dc, p+dp, tNom) }
		vp, vm := up(hv, 0, 0), up(-hv, 0, 0)
		cp, cm := up(0, hc, 0), up(0, -hc, 0)
		pp, pm := up(0, 0, hp), up(0, 0, -hp)
		for k := range vp {
			fv[q+k] = (vp[k] - vm[k]) / (2 * hv)
			fi[q+k] = (cp[k] - cm[k]) / (2 * hc)
			fp[q+k] = (pp[k] - pm[k]) / (2 * hp)
		}
		q += len(vp)
	}
	a.est = append([]float64(nil), a.f0...)
	a.dir = make([][]int8, nq)
	a.rth = make([]float64, nq)
	for q := range a.dir {
		a.dir[q] = make([]int8, len(ps))
		a.rth[q] = math.NaN()
	}
	a.tEnd = make([]float64, nq)
	for q := range a.tEnd {
		a.tEnd[q] = tNom
	}
	rhs, dx := make([]float64, j.n), make([]float64, j.n)
	// With more parameters than unknowns, a part parameter's right side
	// (two entries) is cheaper as a combination of the columns of J⁻¹.
	inverse := nparam > j.n && j.n <= maxInverse
	if inverse {
		j.invert()
	}
	dv, di, dnet := make([]float64, len(d.Parts)), make([]float64, len(d.Parts)), make([]float64, len(d.Nets))
	for k := 0; k < nparam; k++ {
		p := Param{Part: -1}
		if k < len(ps) {
			p = ps[k]
		}
		j.rhs(rhs, p, d.Parts)
		j.solve(dx, rhs, p.Part >= 0 && inverse)
		j.partDeltas(dx, p, d.Parts, dv, di)
		j.netDeltas(dx, dnet)
		if p.Part >= 0 {
			for n, x := range dnet {
				a.res.NetLow[n] -= math.Abs(x)
				a.res.NetHigh[n] += math.Abs(x)
			}
			for q := 0; q < nq; q++ {
				i := a.qPart[q]
				g := fv[q]*dv[i] + fi[q]*di[i] + fp[q]*(r.V[i]*di[i]+r.I[i]*dv[i])
				switch {
				case g > 0:
					a.dir[q][k] = 1
					a.est[q] += g
				case g < 0:
					a.dir[q][k] = -1
					a.est[q] -= g
				}
				if p.Part == i && a.d.Parts[i].Kind == circuit.Resistor && di[i] != 0 {
					// The Thévenin resistance the resistor sees:
					// I = Vth/(Rth + R), so Rth = −I/(dI/dR) − R.
					R := j.d.Parts[i].Value
					a.rth[q] = -r.I[i]/(di[i]/(R*p.Tol)) - R
				}
			}
			continue
		}
		// The ambient temperature: each end, with the state moved to first
		// order and the judge's own dependence on temperature exact.
		ends := a.tEnds()
		for n, x := range dnet {
			lo, hi := 0.0, 0.0
			for _, t := range ends {
				lo, hi = math.Min(lo, x*(t-tNom)), math.Max(hi, x*(t-tNom))
			}
			a.res.NetLow[n] += lo
			a.res.NetHigh[n] += hi
		}
		for q := 0; q < nq; {
			i := a.qPart[q]
			nk := 0
			for _, t := range ends {
				dt := t - tNom
				v, c := r.V[i]+dv[i]*dt, r.I[i]+di[i]*dt
				fr := a.judge(i, v, c, v*c, t)
				nk = len(fr)
				for m, f := range fr {
					if g := f - a.f0[q+m]; g > a.tGain(q+m) {
						a.tEnd[q+m] = t
						a.tgain[q+m] = g
					}
				}
			}
			q += nk
		}
		for q := range a.est {
			a.est[q] += a.tGain(q)
		}
	}
	// First-order estimates are kept where they exceed the nominal use;
	// confirm replaces them by solved values.
	a.pending = make([]bool, nq)
	for q := 0; q < nq; q++ {
		w := &a.res.Worst[a.qPart[q]][a.qIdx[q]]
		if a.est[q] > w.Frac {
			w.Frac, w.Confirmed = a.est[q], false
			w.At = a.corner(q)
			a.pending[q] = true
		}
	}
	return nil
}

// step returns a central-difference step for a value x.
func step(x float64) float64 { return 1e-6 * math.Max(math.Abs(x), 1e-9) }

// corner returns quantity q's first-order worst corner.
func (a *analysis) corner(q int) Corner {
	c := Corner{S: make([]float64, len(a.res.Params)), T: a.tEnd[q]}
	for k, s := range a.dir[q] {
		c.S[k] = float64(s)
	}
	return c
}

// solveAt solves d at corner c and returns each part's uses there.
func (a *analysis) solveAt(c Corner) (*solve.Result, error) {
	if len(a.scratch) == 0 {
		a.scratch = make([]circuit.Part, len(a.d.Parts))
	}
	dc := at(a.d, a.res.Params, c, a.scratch)
	a.res.Solves++
	return solve.Solve(dc, &solve.Options{Temperature: units.Kelvin(c.T)})
}

// record keeps the uses of r (solved at c) where they beat the worst seen.
func (a *analysis) record(r *solve.Result, c Corner, only circuit.PartID) {
	for i, ws := range a.res.Worst {
		if ws == nil || (only >= 0 && circuit.PartID(i) != only) {
			continue
		}
		fr := a.judge(circuit.PartID(i), r.V[i], r.I[i], r.P[i], c.T)
		for m, f := range fr {
			w := &ws[m]
			solved := Case{Frac: f, V: r.V[i], I: r.I[i], P: r.P[i], T: c.T, At: Corner{S: append([]float64(nil), c.S...), T: c.T}, Confirmed: true}
			switch {
			case f > w.Frac || !w.Confirmed && f >= w.Frac*(1-1e-9):
				*w = solved
			case !w.Confirmed && sameCorner(w.At, c):
				// The first-order estimate at this corner overshot: the
				// solved value stands, or the largest solved at another
				// corner while the estimate was held, if that is larger.
				if b := a.bestSolved(i, m); b != nil && b.Frac > f {
					solved = *b
				}
				*w = solved
			case !w.Confirmed:
				// Below the estimate held: kept, so that it is not lost
				// if the estimate's own corner comes out lower still.
				if b := a.bestSolved(i, m); b == nil || f > b.Frac {
					a.keepSolved(i, m, solved)
				}
			}
		}
	}
}

// bestSolved returns the largest use of part i's rating m solved at a
// corner while a first-order estimate above it was held, or nil.
func (a *analysis) bestSolved(i, m int) *Case {
	if a.held == nil || a.held[i] == nil || !a.held[i][m].Confirmed {
		return nil
	}
	return &a.held[i][m]
}

// keepSolved keeps c as the largest use of part i's rating m solved while
// an estimate was held.
func (a *analysis) keepSolved(i, m int, c Case) {
	if a.held == nil {
		a.held = make([][]Case, len(a.res.Worst))
	}
	if a.held[i] == nil {
		a.held[i] = make([]Case, len(a.res.Worst[i]))
	}
	a.held[i][m] = c
}

func sameCorner(x, y Corner) bool {
	if x.T != y.T || len(x.S) != len(y.S) {
		return false
	}
	for k := range x.S {
		if x.S[k] != y.S[k] {
			return false
		}
	}
	return true
}

// recordSupplies keeps each regulator's and converter's input extremes
// and its first corner out of regulation, from r solved at c.
func (a *analysis) recordSupplies(r *solve.Result, c Corner) {
	if len(r.Multi) == 0 {
		return
	}
	at := Corner{S: append([]float64(nil), c.S...), T: c.T}
	if a.res.Supplies == nil {
		a.res.Supplies = make([]SupplyRange, len(r.Multi))
		for k, mp := range r.Multi {
			a.res.Supplies[k] = SupplyRange{Part: mp.Part, InLow: math.Inf(1), InHigh: math.Inf(-1)}
		}
	}
	for k, mp := range r.Multi {
		sr := &a.res.Supplies[k]
		p := &a.d.Parts[mp.Part]
		sp := p.Kind.Info().Supply
		vin := r.NetV[p.Pins[sp.In]] - r.NetV[p.Pins[sp.InRef]]
		if vin < sr.InLow {
			sr.InLow, sr.LowAt = vin, at
		}
		if vin > sr.InHigh {
			sr.InHigh, sr.HighAt = vin, at
		}
		if mp.Region != solve.Regulating && sr.Region == solve.Regulating {
			sr.Region, sr.Out = mp.Region, at
			sr.OutIn, sr.OutOut = vin, r.NetV[p.Pins[sp.Out]]-r.NetV[p.Pins[sp.OutRef]]
			sr.OutSet = p.Value
			for j, pm := range a.res.Params {
				if pm.Part == mp.Part {
					sr.OutSet = pm.valueAt(p.Value, c.S[j])
				}
			}
		}
	}
}

// everyCorner solves every corner of the box.
func (a *analysis) everyCorner() {
	ps := a.res.Params
	ends := a.tEnds()
	lo := append([]float64(nil), a.nominal.NetV...)
	hi := append([]float64(nil), a.nominal.NetV...)
	ok := true
	for mask := 0; mask < 1<<len(ps); mask++ {
		for _, t := range ends {
			c := Corner{S: make([]float64, len(ps)), T: t}
			for k := range ps {
				c.S[k] = -1
				if mask&(1<<k) != 0 {
					c.S[k] = 1
				}
			}
			r, err := a.solveAt(c)
			if err != nil {
				a.res.Failed++
				ok = false
				continue
			}
			a.record(r, c, -1)
			a.recordSupplies(r, c)
			for n, v := range r.NetV {
				lo[n] = math.Min(lo[n], v)
				hi[n] = math.Max(hi[n], v)
			}
		}
	}
	if ok {
		a.res.NetLow, a.res.NetHigh, a.res.Corners = lo, hi, true
	}
}

// confirm solves the first-order worst corner of every quantity that comes
// near a limit, and searches a resistor's own value for its power where
// the maximum may lie inside its band. A quantity's own corner is solved
// even when a solve at another quantity's corner has already beaten its
// estimate: a first-order estimate can fall short of the value at its
// corner (second-order terms), so another corner beating the estimate
// says nothing of its own corner, where the quantity may be larger still.
//
// Where the first-order change reaches the nominal use itself, a use
// judged on a magnitude (|V|, |I|) may pass through zero inside the box;
// the magnitude is then largest at one of two opposite corners (those of
// the signed quantity's maximum and minimum), and which one the
// first-order signs cannot tell, so the opposite corner is solved too.
func (a *analysis) confirm() {
	seen := map[string]bool{}
	for q := range a.f0 {
		if !a.pending[q] || a.est[q] < a.opt.ConfirmAbove {
			continue
		}
		own := a.corner(q)
		cs := []Corner{own}
		if a.est[q]-a.f0[q] >= a.f0[q] {
			op := Corner{S: make([]float64, len(own.S)), T: own.T}
			for k, s := range own.S {
				op.S[k] = -s
			}
			cs = append(cs, op)
		}
		for _, c := range cs {
			key := cornerKey(c)
			if seen[key] {
				continue
			}
			if a.res.Solves >= a.opt.MaxConfirm {
				a.res.Unconfirmed++
				continue
			}
			seen[key] = true
			r, err := a.solveAt(c)
			if err != nil {
				a.res.Failed++
				a.res.Unconfirmed++
				continue
			}
			a.record(r, c, -1)
		}
	}
	for q := range a.f0 {
		if math.IsNaN(a.rth[q]) {
			continue
		}
		i, m := a.qPart[q], a.qIdx[q]
		w := &a.res.Worst[i][m]
		if w.Frac < a.opt.ConfirmAbove {
			continue
		}
		k := a.paramOf(i)
		R, tol := a.dn.Parts[i].Value, a.res.Params[k].Tol
		if rth := a.rth[q]; !(rth > R*(1-2*tol) && rth < R*(1+2*tol)) {
			continue
		}
		a.searchOwn(q, k)
	}
}

// paramOf returns the index of part i's parameter.
func (a *analysis) paramOf(i circuit.PartID) int {
	for k, p := range a.res.Params {
		if p.Part == i {
			return k
		}
	}
	return -1
}

// searchOwn maximises quantity q over its own resistor's position k in
// [−1, 1] by golden-section search (Kiefer 1953), the other parameters at
// the quantity's worst corner so far; the use is unimodal in the resistor's
// value for a Thévenin source (the maximum power transfer theorem).
func (a *analysis) searchOwn(q, k int) {
	i, m := a.qPart[q], a.qIdx[q]
	base := a.res.Worst[i][m].At
	c := Corner{S: append([]float64(nil), base.S...), T: base.T}
	f := func(s float64) float64 {
		if a.res.Solves >= a.opt.MaxConfirm {
			return math.Inf(-1)
		}
		c.S[k] = s
		r, err := a.solveAt(c)
		if err != nil {
			a.res.Failed++
			return math.Inf(-1)
		}
		a.record(r, c, i)
		return a.judge(i, r.V[i], r.I[i], r.P[i], c.T)[m]
	}
	const g = 0.6180339887498949 // (√5 − 1)/2
	lo, hi := -1.0, 1.0
	x1, x2 := hi-g*(hi-lo), lo+g*(hi-lo)
	f1, f2 := f(x1), f(x2)
	for it := 0; it < 24 && hi-lo > 1e-4; it++ {
		if f1 >= f2 {
			hi, x2, f2 = x2, x1, f1
			x1 = hi - g*(hi-lo)
			f1 = f(x1)
		} else {
			lo, x1, f1 = x1, x2, f2
			x2 = lo + g*(hi-lo)
			f2 = f(x2)
		}
	}
}

func cornerKey(c Corner) string {
	b := make([]byte, 0, len(c.S)+16)
	for _, s := range c.S {
		b = append(b, byte(int8(s)+1))
	}
	return string(strconv.AppendFloat(b, c.T, 'g', -1, 64))
}
