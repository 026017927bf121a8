package circuit

// hints.go: what a message about a value suggests, fitted to the kind of
// part and to the mistake.

import (
	"fmt"
	"strings"

	"nodal/diag"
	"nodal/grammar"
	"nodal/units"
)

// notNumberWords are the spellings of values that are no numbers, which
// the lexer reads as names.
var notNumberWords = []string{"nan", "inf", "infinity"}

// notNumberWord reports whether w spells NaN or infinity.
func notNumberWord(w string) bool {
	for _, n := range notNumberWords {
		if strings.EqualFold(w, n) {
			return true
		}
	}
	return false
}

// notANumber reports whether v is NaN or infinity written as a value, and
// not the name of a parameter in scope.
func (b *builder) notANumber(v *grammar.Value) bool {
	if v.Param == nil || !notNumberWord(v.Param.Text) {
		return false
	}
	if sc := b.sc; sc != nil && sc.blk != nil && sc.blk.parIndex != nil {
		if _, isParam := sc.blk.parIndex[v.Param.Text]; isParam {
			return false
		}
	}
	return true
}

// unitWordEnd extends a value's range over the word after it that was
// meant as its unit ("10 k", "NaN Ω").
func (b *builder) unitWordEnd(pt *grammar.Part, end0 diag.Pos) diag.Pos {
	if unitWord(pt) == "" {
		return end0
	}
	_, end := b.attrSpan(pt.Attrs[0])
	return end
}

// example writes a value of kind k: "10 Ω", "10 V or 10 A".
func (b *builder) example(k Kind) string {
	if k.shared() {
		return k.siblings(func(sym, name string) string { return "10 " + sym })
	}
	return "10 " + k.Info().Value.Symbol()
}

// unitHint rewrites an error about a prefix with no unit ("10k") to name
// the unit the kind takes: "write 10 kΩ", not a list of every unit.
func (b *builder) unitHint(k Kind, err error) error {
	ue, ok := err.(*units.Error)
	if !ok || ue.Prefix == "" || k.Info().Value == units.None {
		return err
	}
	write := func(sym string) string { return ue.Number + " " + ue.Prefix + sym }
	what := write(k.Info().Value.Symbol())
	if k.shared() {
		what = k.siblings(func(sym, name string) string { return write(sym) + " for " + article(name) })
	}
	return &units.Error{Text: ue.Text, Msg: ue.Msg, Hint: "write " + what}
}

// noValueHint completes "KIND NAME takes …" for a value written on a kind
// that takes none. A voltage on a diode or LED was meant as its forward
// voltage: the hint shows it in the form that says so.
func (b *builder) noValueHint(p *Part, v *grammar.Value) string {
	info := p.Kind.Info()
	if len(info.Needs) > 0 && info.Needs[0].Attr == "vf" && v.Num != "" {
		if q, err := units.Parse(v.Num, v.Unit); err == nil && q.Dim == units.Voltage && !q.Percent && !v.Neg {
			return fmt.Sprintf("no plain value; a forward voltage is written with the current it is measured at: vf %s at 10 mA", b.describe(v))
		}
	}
	return info.NoValue
}

// takes lists the attributes kind k takes, for a message about one it
// does not: "a switch takes only rated (its state is open or closed)".
func takes(k Kind) string {
	info := k.Info()
	var ws []string
	for _, a := range info.Attrs {
		switch a {
		case "vf":
			a = "vf … at"
		case "derate":
			a = "derate … to"
		}
		ws = append(ws, a)
	}
	ws = append(ws, "rated")
	s := article(k.String()) + " takes "
	if len(ws) == 1 {
		s += "only " + ws[0]
	} else {
		s += strings.Join(ws[:len(ws)-1], ", ") + " and " + ws[len(ws)-1]
	}
	if len(info.States) > 0 {
		s += " (its state is " + strings.Join(info.States, " or ") + ")"
	}
	return s
}
