package circuit

// valuerange.go: a range of values written LOW to HIGH (a port's drive,
// port vin 4.5 V to 5.5 V), read from its two ends, and the ranges a design's
// drives may take.

import (
	"math"

	"nodal/grammar"
	"nodal/units"
)

// DriveRange is the range of values a port's drive may take: port vin
// 4.5 V to 5.5 V. The drive's part has the midpoint as its Value, at which
// the nominal operating point is solved; the worst case varies it from Low
// to High.
type DriveRange struct {
	Part      PartID
	Low, High float64 // in the drive's unit (V or A), Low ≤ High
}

// quantityRange reads the range lo to hi, both ends written. what names
// the thing the range belongs to for messages ("port vin"). It reports,
// at the range's place, an end that is no quantity, ends in different
// units or a percentage, and a bottom above the top; the unit the range
// must be in is the caller's to check. It returns false when it reported.
func (b *builder) quantityRange(lo, hi *grammar.Value, what string) (low, high units.Quantity, ok bool) {
	pos, _ := b.valueSpan(lo)
	_, end := b.valueSpan(hi)
	read := func(v *grammar.Value) (units.Quantity, bool) {
		q, err := b.quantity(v)
		if err != nil {
			if rule, silent := errRule(err); !silent {
				vpos, vend := b.valueSpan(v)
				b.report(rule, vpos, vend, "%s: %s", what, err)
			}
			return q, false
		}
		return q, true
	}
	low, okLo := read(lo)
	high, okHi := read(hi)
	if !okLo || !okHi {
		return low, high, false
	}
	rule := b.unitRule(lo, hi)
	switch {
	case low.Percent || high.Percent:
		b.report(rule, pos, end, "%s: %s to %s: the ends of a range are quantities with a unit, not percentages", what, b.describe(lo), b.describe(hi))
		return low, high, false
	case low.Dim != high.Dim:
		if low.Dim == units.None || high.Dim == units.None {
			b.report(rule, pos, end, "%s: %s to %s: write the unit on both ends of the range, as in 4.5 V to 5.5 V", what, b.describe(lo), b.describe(hi))
		} else {
			b.report(rule, pos, end, "%s: %s to %s: the two ends of a range are in one unit, and this one runs from a %s to a %s", what, b.describe(lo), b.describe(hi), low.Dim.Noun(), high.Dim.Noun())
		}
		return low, high, false
	case low.Value > high.Value:
		b.report(CodeBadValue, pos, end, "%s: %s to %s runs downwards; write the bottom of the range first: %s to %s", what, b.describe(lo), b.describe(hi), b.describe(hi), b.describe(lo))
		return low, high, false
	case math.IsInf(high.Value-low.Value, 0):
		// Each end is finite, but not their difference: the range's
		// width and middle could not be computed with.
		b.report(CodeBadValue, pos, end, "%s: %s to %s is wider than nodal can compute with", what, b.describe(lo), b.describe(hi))
		return low, high, false
	}
	return low, high, true
}

// toAttr reports an attribute written "to": a second "to" after a
// range, a "to" with nothing after it, or a range where the statement
// takes one value. It is always an error; bad reports it at the attribute.
func toAttr(p *Part, a *grammar.Attr, bad func(rule Code, format string, args ...any)) {
	switch {
	case p.Kind.Info().OnPort && len(a.Values) == 0:
		bad(CodeMissingValue, "\"to\" needs the top of the range after it, as in port %s 4.5 V to 5.5 V", p.Local) // a drive is at the top level
	case p.Kind.Info().OnPort:
		bad(CodeBadValue, "a range has two ends, LOW to HIGH; this one goes on past its top")
	default:
		bad(CodeBadValue, "its value is one quantity, not a range; LOW to HIGH is written on a port's drive (port vin 4.5 V to 5.5 V)")
	}
}

// driveRange makes the part just placed for a port's drive (the design's
// last part, read at the bottom of the range) stand for the whole range:
// its value is the midpoint, and the range is recorded for the worst case.
func (b *builder) driveRange(low, high units.Quantity) {
	d := b.r.Design
	id := PartID(len(d.Parts) - 1)
	d.Parts[id].Value = low.Value + (high.Value-low.Value)/2 // no overflow: the width is finite
	d.DriveRanges = append(d.DriveRanges, DriveRange{Part: id, Low: low.Value, High: high.Value})
}

// RangeOf returns the range part i's drive may take, if it has one.
func (d *Design) RangeOf(i PartID) (DriveRange, bool) {
	for _, r := range d.DriveRanges {
		if r.Part == i {
			return r, true
		}
	}
	return DriveRange{}, false
}
