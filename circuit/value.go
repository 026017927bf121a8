package circuit

// value.go: a part's main value read as a quantity in its kind's unit.

import (
	"fmt"
	"strings"

	"nodal/grammar"
	"nodal/units"
)

// quantity reads a value node as a quantity.
func (b *builder) quantity(v *grammar.Value) (units.Quantity, error) {
	switch {
	case v.Code != "":
		q, ok := units.ParseCode(v.Code)
		if !ok {
			return q, &units.Error{Text: v.Code, Msg: fmt.Sprintf("%q is not a resistor code", v.Code)}
		}
		return q, nil
	case v.Word != "":
		return units.Quantity{}, &units.Error{Text: v.Word, Msg: fmt.Sprintf("%q is a switch state, not a quantity", v.Word)}
	case v.Expr != nil, v.Param != nil:
		return b.eval(v)
	}
	// Large designs repeat a few values millions of times ("10 mΩ" on
	// every segment of a mesh): remember the quantities read so far.
	key := quantityKey{v.Num, v.Unit}
	q, ok := b.quantities[key]
	if !ok {
		var err error
		if q, err = units.Parse(v.Num, v.Unit); err != nil {
			if v.Neg {
				q.Value = -q.Value
			}
			return q, err
		}
		if b.quantities == nil {
			b.quantities = make(map[quantityKey]units.Quantity)
		}
		if len(b.quantities) < maxQuantities {
			b.quantities[key] = q
		}
	}
	if v.Neg {
		q.Value = -q.Value
	}
	return q, nil
}

// quantityKey is the text of a plain quantity: number and unit word.
type quantityKey struct{ num, unit string }

// maxQuantities bounds the builder's table of quantities read.
const maxQuantities = 4096

func (b *builder) describe(v *grammar.Value) string {
	if v.Expr != nil {
		return b.exprText(v)
	}
	if v.Param != nil {
		return v.Param.Text
	}
	s := v.Num
	if v.Unit != "" {
		s += " " + v.Unit
	}
	if v.Code != "" {
		s = v.Code
	}
	if v.Neg {
		s = "-" + s
	}
	return s
}

// value reads the main value. It returns false when the part cannot be
// solved with what was written.
func (b *builder) value(p *Part, pt *grammar.Part) bool {
	word := pt.Kind.Text
	info := p.Kind.Info()
	v := pt.Value
	vpos, vend := p.Pos, p.End // the value's own range, once there is one
	if v != nil {
		vpos, vend = b.valueSpan(v)
	}
	switch {
	case len(info.States) > 0:
		states := strings.Join(info.States, " or ")
		if v == nil || v.Word == "" {
			if v == nil {
				b.report(CodeMissingValue, p.Pos, p.End, "%s %s needs its state: %s", word, b.nameOf(p), states)
			} else {
				b.report(CodeBadValue, vpos, vend, "%s %s: %s is not a %s state; write %s", word, b.nameOf(p), b.describe(v), word, states)
			}
			return false
		}
		// The second state word closes a switch.
		p.Closed = v.Word == info.States[len(info.States)-1]
		return true
	case info.Value == units.None:
		if v != nil {
			b.report(CodeBadValue, vpos, vend, "%s %s takes %s", word, b.nameOf(p), b.noValueHint(p, v))
			return false
		}
		return true
	}
	if v == nil {
		hint := info.ValueHint
		if hint == "" {
			hint = " in " + info.Value.Symbol()
		}
		b.report(CodeMissingValue, p.Pos, p.End, "%s %s needs a value%s", word, b.nameOf(p), hint)
		return false
	}
	if b.notANumber(v) {
		b.report(CodeBadValue, vpos, b.unitWordEnd(pt, vend), "%s %s: %s is not a number; write a finite value with its unit, e.g. %s", word, b.nameOf(p), v.Param.Text, b.example(p.Kind))
		return false
	}
	if v.Word != "" {
		b.report(CodeBadValue, vpos, vend, "%s %s: %s is a switch state, not a %s", word, b.nameOf(p), v.Word, info.Value.Noun())
		return false
	}
	if w := unitWord(pt); w != "" {
		// "1 meg", "10 k", "5 ohms": a word after a bare number that is
		// no attribute was meant as its unit.
		_, err := units.Parse(v.Num, w)
		if err == nil {
			err = &units.Error{Msg: fmt.Sprintf("%q is not a unit", v.Num+" "+w)}
		}
		b.reportFix(b.megWordFix(pt, info.Value), CodeUnitMismatch, vpos, b.unitWordEnd(pt, vend), "%s %s: %s", word, b.nameOf(p), b.unitHint(p.Kind, err))
		return false
	}
	q, err := b.quantity(v)
	if err != nil {
		rule, silent := errRule(err)
		if !silent {
			b.reportFix(b.megFix(v, info.Value), rule, vpos, vend, "%s %s: %s", word, b.nameOf(p), b.unitHint(p.Kind, err))
		}
		return false
	}
	um := b.unitRule(v)
	if q.Percent {
		b.report(um, vpos, vend, "%s %s: %s is a percentage; %% belongs to tol", word, b.nameOf(p), b.describe(v))
		return false
	}
	if p.Kind.shared() {
		// Kinds that share a keyword are told apart by the unit.
		k, found := sibling(p.Kind, q.Dim)
		switch {
		case found:
			p.Kind = k
		case q.Dim == units.None:
			b.report(um, vpos, vend, "%s %s: %s has no unit; write %s", word, b.nameOf(p), b.describe(v), p.Kind.siblings(func(sym, name string) string { return b.describe(v) + " " + sym + " for " + article(name) }))
			return false
		default:
			b.report(um, vpos, vend, "%s %s: %s is a %s; %s is given in %s", word, b.nameOf(p), b.describe(v), q.Dim.Noun(), article(word), p.Kind.siblings(func(sym, name string) string { return sym + " (" + name + ")" }))
			return false
		}
		p.Value = q.Value
		return true
	}
	if q.Dim != info.Value {
		if q.Dim == units.None {
			b.reportFix(unitFix(vend, info.Value), um, vpos, vend, "%s %s: %s has no unit; write %s %s", word, b.nameOf(p), b.describe(v), b.describe(v), info.Value.Symbol())
		} else {
			b.report(um, vpos, vend, "%s %s is given as a %s (%s); %s takes a %s in %s", word, b.nameOf(p), q.Dim.Noun(), b.describeQ(v, q), article(word), info.Value.Noun(), info.Value.Symbol())
		}
		return false
	}
	p.Value = q.Value
	if q.Value <= 0 {
		switch {
		case p.Kind == Resistor && q.Value == 0:
			b.report(CodeBadValue, vpos, vend, "resistor %s is 0 Ω; use a wire for a zero-ohm link", b.nameOf(p))
		default:
			b.report(CodeBadValue, vpos, vend, "%s %s: %s %s must be positive", word, b.nameOf(p), info.Value.Noun(), units.Format(q.Value, q.Dim))
		}
		return false
	}
	return true
}

// unitWord returns the word written right after a value that has a number
// but no unit, when that word is not an attribute: the writer meant it as
// the unit ("1 meg", "10 k").
func unitWord(pt *grammar.Part) string {
	v := pt.Value
	if v == nil || v.Unit != "" || len(pt.Attrs) == 0 || v.Num == "" && (v.Param == nil || !notNumberWord(v.Param.Text)) {
		return ""
	}
	a := pt.Attrs[0]
	if _, known := attrKinds()[a.Key.Text]; known || a.Key.Text == "to" || len(a.Values) > 0 || a.At != nil || strings.HasPrefix(a.Key.Text, "\"") {
		return ""
	}
	return a.Key.Text
}

// errRule returns the rule an evaluation error is reported under, and
// whether it is to be kept quiet (a parameter that already has a finding of
// its own).
func errRule(err error) (Code, bool) {
	if ee, ok := err.(*ExprError); ok {
		return ee.Code, ee.Code == NoCode
	}
	if ue, ok := err.(*units.Error); ok && !ue.Range && (strings.Contains(ue.Msg, "unit") || strings.Contains(ue.Msg, "prefix")) {
		return CodeUnitMismatch, false
	}
	return CodeBadValue, false
}

// unitRule is the rule for a value in the wrong unit: param-unit when the
// value was computed by an expression, unit-mismatch when it was written.
func (b *builder) unitRule(vs ...*grammar.Value) Code {
	for _, v := range vs {
		if v != nil && (v.Expr != nil || v.Param != nil) {
			return CodeParamUnit
		}
	}
	return CodeUnitMismatch
}

// describeQ is describe, with the computed value of an expression.
func (b *builder) describeQ(v *grammar.Value, q units.Quantity) string {
	if v.Expr != nil || v.Param != nil {
		return b.describe(v) + " = " + q.String()
	}
	return b.describe(v)
}
