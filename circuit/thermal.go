package circuit

// thermal.go: the temperature statement and attributes: ambient, tempco,
// derate, theta, tjmax.

import (
	"nodal/diag"
	"nodal/grammar"
	"nodal/units"
)

// Thermal holds a part's temperature attributes.
type Thermal struct {
	// Tempco is a resistor's relative change of value per kelvin away
	// from 25 °C (tempco 100 ppm/K is 1e-4).
	Tempco float64
	// Knee and Zero are a resistor's power derating: full rating up to
	// Knee, falling linearly to nothing at Zero (°C). HasDerate is false
	// when the part takes the design's defaults.
	Knee, Zero float64
	HasDerate  bool
	// Theta is a junction's thermal resistance to ambient (K/W); 0 when
	// not given.
	Theta float64
	// TjMax is a junction's maximum temperature (°C); HasTjMax is false
	// when not given.
	TjMax    float64
	HasTjMax bool
}

// Ambient is a design's ambient temperature: one value (Low = High) or a
// range, in °C.
type Ambient struct {
	Low, High float64
	Set       bool
	Pos, End  diag.Pos
}

// Temperatures nodal judges, in °C. Outside them the resistor and junction
// models are not meant to hold, and a resistor's tempco within MaxTempco
// keeps its value positive.
const (
	MinAmbient = -100.0
	MaxAmbient = 300.0
	// MaxTempco bounds |tempco| (2000 ppm/K): across the whole ambient
	// range a resistor then keeps at least 45 % of its value.
	MaxTempco = 2000e-6
	// MaxJunction bounds tjmax and the derating temperatures (°C).
	MaxJunction = 1000.0
)

func (p *Part) heat() *Thermal {
	if p.Heat == nil {
		p.Heat = &Thermal{}
	}
	return p.Heat
}

// thermalAttr reads tempco, derate, theta and tjmax; q is the attribute's
// first value and um the rule for a value in the wrong unit.
func (b *builder) thermalAttr(p *Part, a *grammar.Attr, q units.Quantity, um Code, bad func(rule Code, format string, args ...any)) {
	key := a.Key.Text
	switch key {
	case "tempco":
		if q.Dim != units.TempCoefficient {
			bad(um, "tempco %s must be a temperature coefficient, e.g. tempco 100 ppm/K", b.describe(a.Values[0]))
		} else if q.Value < -MaxTempco || q.Value > MaxTempco {
			bad(CodeBadValue, "tempco %s is outside ±2000 ppm/K", units.Format(q.Value*1e6, units.None)+" ppm/K")
		} else {
			p.heat().Tempco = q.Value
		}
	case "theta":
		if q.Dim != units.ThermalResistance {
			bad(um, "theta %s must be a thermal resistance, e.g. theta 250 K/W", b.describe(a.Values[0]))
		} else if q.Value <= 0 {
			bad(CodeBadValue, "theta %s must be positive", units.Format(q.Value, q.Dim))
		} else {
			p.heat().Theta = q.Value
		}
	case "tjmax":
		if q.Dim != units.Temperature {
			bad(um, "tjmax %s must be a temperature, e.g. tjmax 150 °C", b.describe(a.Values[0]))
		} else if q.Value <= MinAmbient || q.Value > MaxJunction {
			bad(CodeBadValue, "tjmax %s is outside %s … %s", units.FormatCelsius(q.Value), units.FormatCelsius(MinAmbient), units.FormatCelsius(MaxJunction))
		} else {
			h := p.heat()
			h.TjMax, h.HasTjMax = q.Value, true
		}
	case "derate":
		if a.To == nil {
			bad(CodeMissingValue, "derate needs where full power ends and where it reaches zero: derate 70 °C to 155 °C")
			return
		}
		hi, err := b.quantity(a.To)
		if err != nil {
			if rule, silent := errRule(err); !silent {
				bad(rule, "derate … to %s", err)
			}
			return
		}
		if q.Dim != units.Temperature || hi.Dim != units.Temperature {
			bad(um, "derate %s to %s: both must be temperatures, e.g. derate 70 °C to 155 °C", b.describe(a.Values[0]), b.describe(a.To))
			return
		}
		if !(q.Value < hi.Value) || q.Value <= MinAmbient || hi.Value > MaxJunction {
			bad(CodeBadValue, "derate %s to %s: full power must end below the zero-power temperature, within %s … %s", units.FormatCelsius(q.Value), units.FormatCelsius(hi.Value), units.FormatCelsius(MinAmbient), units.FormatCelsius(MaxJunction))
			return
		}
		h := p.heat()
		h.Knee, h.Zero, h.HasDerate = q.Value, hi.Value, true
	}
}

// ambient reads the ambient statement: one temperature or a range.
func (b *builder) ambient(st *grammar.Ambient, pos, end diag.Pos) {
	d := b.r.Design
	if d.Ambient.Set {
		b.report(CodeDuplicateName, pos, end, "second ambient statement; the design already states its ambient temperature (line %d)", b.file.Position(d.Ambient.Pos).Line)
		return
	}
	read := func(v *grammar.Value) (float64, bool) {
		q, err := b.quantity(v)
		if err != nil {
			rule, silent := errRule(err)
			if !silent {
				b.report(rule, pos, end, "ambient: %s", err)
			}
			return 0, false
		}
		if q.Dim != units.Temperature {
			b.report(b.unitRule(v), pos, end, "ambient %s must be a temperature in °C (or degC), e.g. ambient 25 °C or ambient 0 °C to 50 °C", b.describe(v))
			return 0, false
		}
		if q.Value < MinAmbient || q.Value > MaxAmbient {
			b.report(CodeBadValue, pos, end, "ambient %s is outside the %s … %s nodal judges", units.FormatCelsius(q.Value), units.FormatCelsius(MinAmbient), units.FormatCelsius(MaxAmbient))
			return 0, false
		}
		return q.Value, true
	}
	lo, ok := read(st.Low)
	if !ok {
		return
	}
	hi := lo
	if st.High != nil {
		if hi, ok = read(st.High); !ok {
			return
		}
		if hi < lo {
			b.report(CodeBadValue, pos, end, "ambient %s to %s: the range must run from low to high", units.FormatCelsius(lo), units.FormatCelsius(hi))
			return
		}
	}
	d.Ambient = Ambient{Low: lo, High: hi, Set: true, Pos: pos, End: end}
}

// ReferenceCelsius is the temperature values are written for: a resistor's
// value and a junction's vf point hold at 25 °C.
const ReferenceCelsius = 25.0

// ValueAt returns p's value at ambient temperature t (°C): a resistor with
// a tempco moves linearly, R·(1 + α·(t − 25 °C)) (the definition of a
// resistor's temperature coefficient of resistance in IEC 60115-1, from
// memory); every other value stays as written.
func (p *Part) ValueAt(t float64) float64 {
	if p.Kind != Resistor || p.Heat == nil || p.Heat.Tempco == 0 {
		return p.Value
	}
	return p.Value * (1 + p.Heat.Tempco*(t-ReferenceCelsius))
}

// AtTemperature returns d with every resistor's value moved to ambient
// temperature t (ValueAt), sharing all but its parts with d; d itself when
// no value moves.
func (d *Design) AtTemperature(t float64) *Design {
	if t == ReferenceCelsius {
		return d
	}
	var c *Design
	for i := range d.Parts {
		p := &d.Parts[i]
		if v := p.ValueAt(t); v != p.Value {
			if c == nil {
				cp := *d
				cp.Parts = append([]Part(nil), d.Parts...)
				c = &cp
			}
			c.Parts[i].Value = v
		}
	}
	if c == nil {
		return d
	}
	return c
}
