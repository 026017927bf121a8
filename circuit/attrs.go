package circuit

// attrs.go: a part's attributes (tol, rated, vf … at, dcr, …) read and
// checked against what its kind takes.

import (
	"fmt"
	"strings"
	"sync"

	"nodal/grammar"
	"nodal/units"
)

// attrKinds maps each attribute to the kinds that take it, from the kind
// table. It is made the first time an attribute is read, not at every
// start of the program.
var attrKinds = sync.OnceValue(func() map[string]string {
	m := map[string]string{"rated": "every kind"}
	seen := map[[2]string]bool{} // attribute and keyword, listed once
	for k := range kinds {
		w := kinds[k].Word
		for _, a := range kinds[k].Attrs {
			switch {
			case seen[[2]string{a, w}]:
			case m[a] == "":
				m[a] = w
			default:
				m[a] += ", " + w
			}
			seen[[2]string{a, w}] = true
		}
	}
	return m
})

// attrs reads the attributes. It returns false when one is unusable.
// A kind's required attribute (vf) is asked for when needs is set.
func (b *builder) attrs(p *Part, pt *grammar.Part, info *KindInfo, needs bool) bool {
	word := pt.Kind.Text
	ok := true
	var seenKeys [8]string
	seen := seenKeys[:0]  // the attributes read; a part has a few
	var cur *grammar.Attr // the attribute being read; nil: the statement is reported
	bad := func(rule Code, format string, args ...any) {
		apos, aend := p.Pos, p.End
		if cur != nil {
			apos, aend = b.attrSpan(cur) // found only for a finding
		}
		b.report(rule, apos, aend, "%s %s: %s", word, b.nameOf(p), fmt.Sprintf(format, args...))
		ok = false
	}
	attrs := pt.Attrs
	if unitWord(pt) != "" {
		attrs = attrs[1:] // reported with the value
	}
	for _, a := range attrs {
		key := a.Key.Text
		cur = a
		kinds, knownAttr := attrKinds()[key]
		if key == "to" {
			toAttr(p, a, bad)
			continue
		}
		if !knownAttr {
			bad(CodeBadAttribute, "unknown attribute %q; %s", key, takes(p.Kind))
			continue
		}
		if key != "rated" && !contains(info.Attrs, key) {
			bad(CodeBadAttribute, "%s takes no %s (%s is for: %s)", article(p.Kind.String()), key, key, kinds)
			continue
		}
		if contains(seen, key) {
			bad(CodeBadAttribute, "%s is given twice", key)
			continue
		}
		seen = append(seen, key)
		if a.At != nil && key != "vf" && key != "breakdown" {
			bad(CodeBadAttribute, "only vf and breakdown take \"at\" (vf 2.0 V at 20 mA, breakdown 5.1 V at 5 mA)")
			continue
		}
		if a.To != nil && key != "derate" && key != "input" {
			bad(CodeBadAttribute, "only derate takes \"to\", and a converter's input (derate 70 °C to 155 °C, input 6 V to 28 V)")
			continue
		}
		if len(a.Values) == 0 {
			bad(CodeMissingValue, "%s needs a value", key)
			continue
		}
		if key != "rated" && len(a.Values) > 1 {
			bad(CodeBadAttribute, "%s takes one value", key)
			continue
		}
		qs := make([]units.Quantity, len(a.Values))
		failed := false
		for i, v := range a.Values {
			q, err := b.quantity(v)
			if err != nil {
				failed = true
				if rule, silent := errRule(err); !silent {
					bad(rule, "%s %s", key, err)
				} else {
					ok = false
				}
				break
			}
			qs[i] = q
		}
		if failed {
			continue
		}
		q := qs[0]
		um := b.unitRule(a.Values...)
		if a.At != nil {
			um = b.unitRule(append(a.Values[:len(a.Values):len(a.Values)], a.At)...)
		}
		switch key {
		case "tempco", "derate", "theta", "tjmax":
			b.thermalAttr(p, a, q, um, bad)
		case "tol":
			if !q.Percent {
				bad(um, "tol %s must be a percentage, e.g. tol 5%%", b.describe(a.Values[0]))
			} else if q.Value < 0 || q.Value > 1 {
				bad(CodeBadValue, "tol %s is outside 0 %% … 100 %%", units.FormatPercent(q.Value))
			} else {
				p.Tol = q.Value
			}
		case "efficiency":
			if !q.Percent {
				bad(um, "efficiency %s must be a percentage, e.g. efficiency 90%%", b.describe(a.Values[0]))
			} else if q.Value <= 0 || q.Value > 1 {
				bad(CodeBadValue, "efficiency %s is outside 0 %% … 100 %% (0 excluded)", units.FormatPercent(q.Value))
			} else {
				p.conv().Efficiency = q.Value
			}
		case "input":
			if !b.rangeAttr(p, a, word, bad) {
				ok = false
			}
		case "dcr", "series", "capacity", "dropout", "quiescent", "limit":
			spec := quantityAttrs[key]
			switch {
			case q.Dim != spec.Dim || q.Percent:
				bad(um, "%s %s must be a %s in %s", key, b.describe(a.Values[0]), spec.Dim.Noun(), spec.Dim.Symbol())
			case spec.Zero && q.Value < 0:
				bad(CodeBadValue, "%s %s must not be negative", key, units.Format(q.Value, q.Dim))
			case !spec.Zero && q.Value <= 0:
				bad(CodeBadValue, "%s %s must be positive", key, units.Format(q.Value, q.Dim))
			default:
				*spec.Field(p) = q.Value
			}
		case "ideality":
			if q.Dim != units.None || q.Percent {
				bad(um, "ideality is a plain number (1 to 2 for most junctions), not %s", b.describe(a.Values[0]))
			} else if q.Value <= 0 {
				bad(CodeBadValue, "ideality %g must be positive", q.Value)
			} else {
				p.Ideality = q.Value
			}
		case "vf", "breakdown":
			v, at, pok := b.pointAttr(key, a, q, um, bad)
			switch {
			case !pok:
				ok = false
			case key == "vf":
				p.VF, p.VFAt = v, at
			default:
				p.Breakdown, p.BreakdownAt = v, at
			}
		case "rated":
			if !takesRating(info, units.None, true) {
				bad(CodeBadAttribute, "%s takes no rating: it stands for what the outside world connects, which the design does not contain", article(p.Kind.String()))
				continue
			}
			for i, r := range qs {
				if r.Percent || !takesRating(info, r.Dim, false) {
					bad(um, "rated %s: %s is rated in %s", b.describe(a.Values[i]), article(p.Kind.String()), dimList(info.RatedDims()))
					continue
				}
				if r.Value <= 0 {
					bad(CodeBadValue, "rated %s must be positive", units.Format(r.Value, r.Dim))
					continue
				}
				var slot *float64
				switch r.Dim {
				case units.Power:
					slot = &p.RatedPower
				case units.Voltage:
					slot = &p.RatedVoltage
				case units.Current:
					slot = &p.RatedCurrent
				}
				if *slot != 0 {
					bad(CodeBadAttribute, "rated gives two %s ratings", r.Dim.Noun())
					continue
				}
				*slot = r.Value
			}
		}
	}
	if p.Breakdown > 0 && p.RatedVoltage > 0 && p.RatedVoltage < p.Breakdown {
		cur = nil
		bad(CodeBadValue, "its reverse rating %s is below its breakdown voltage %s, so it would be past its rating whenever it breaks down; a clamp or reference diode is rated by its power and current in breakdown (rated W, A)",
			units.Format(p.RatedVoltage, units.Voltage), units.Format(p.Breakdown, units.Voltage))
	}
	for _, need := range info.Needs {
		if !contains(seen, need.Attr) && needs {
			cur = nil
			bad(CodeMissingValue, "%s", need.Hint)
		}
	}
	return ok
}

// rangeAttr reads a converter's input range, "input LOW to HIGH", both
// voltages, 0 ≤ LOW < HIGH (the ends read by quantityRange, shared with a
// port's drive range). It returns false for an unusable one, which it has
// reported.
func (b *builder) rangeAttr(p *Part, a *grammar.Attr, word string, bad func(Code, string, ...any)) bool {
	if a.To == nil {
		bad(CodeMissingValue, "input needs its range, from the lowest to the highest input voltage: input %s to 28 V", b.describe(a.Values[0]))
		return false
	}
	lo, hi, ok := b.quantityRange(a.Values[0], a.To, word+" "+p.Local+" input")
	switch {
	case !ok:
		return false
	case lo.Dim != units.Voltage:
		bad(b.unitRule(a.Values[0], a.To), "input %s to %s must be a range of voltages in V", b.describe(a.Values[0]), b.describe(a.To))
		return false
	case lo.Value < 0 || hi.Value <= lo.Value:
		bad(CodeBadValue, "input %s to %s: the range must run from a voltage of at least 0 V up to a higher one",
			units.Format(lo.Value, units.Voltage), units.Format(hi.Value, units.Voltage))
		return false
	}
	c := p.conv()
	c.InLow, c.InHigh = lo.Value, hi.Value
	return true
}

// pointAttr reads "KEY V at A", a voltage measured at a current, both
// positive (vf, breakdown). ok is false when it is unusable, which bad
// has said.
func (b *builder) pointAttr(key string, a *grammar.Attr, q units.Quantity, um Code, bad func(Code, string, ...any)) (v, at float64, ok bool) {
	if q.Dim != units.Voltage || q.Percent {
		bad(um, "%s %s must be a voltage in V", key, b.describe(a.Values[0]))
		return 0, 0, false
	}
	if a.At == nil {
		bad(CodeMissingValue, "%s needs the current it is measured at: %s %s at 10 mA", key, key, b.describe(a.Values[0]))
		return 0, 0, false
	}
	aq, err := b.quantity(a.At)
	if err != nil {
		if rule, silent := errRule(err); !silent {
			bad(rule, "%s … at %s", key, err)
		} // else already reported where the value was read
		return 0, 0, false
	}
	if aq.Dim != units.Current || aq.Percent {
		bad(um, "%s %s at %s: the operating point must be a current in A", key, b.describe(a.Values[0]), b.describe(a.At))
		return 0, 0, false
	}
	if q.Value <= 0 || aq.Value <= 0 {
		bad(CodeBadValue, "%s %s at %s: both must be positive", key, units.Format(q.Value, units.Voltage), units.Format(aq.Value, units.Current))
		return 0, 0, false
	}
	return q.Value, aq.Value, true
}

// takesRating reports whether the kind takes a written rating in d (any,
// when anyDim is set): RatedDims without building its list, which would be
// an allocation per rated part.
func takesRating(info *KindInfo, d units.Dim, anyDim bool) bool {
	for _, r := range info.Ratings {
		if !r.FromValue && (anyDim || r.Dim == d) {
			return true
		}
	}
	return false
}

func dimList(list []units.Dim) string {
	s := make([]string, len(list))
	for i, d := range list {
		s[i] = d.Symbol() + " (" + d.Noun() + ")"
	}
	return strings.Join(s, " or ")
}
