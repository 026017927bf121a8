package circuit

// part.go: one built-in part statement made into a Part: its pins bound,
// its value and attributes read (value.go, attrs.go).

import (
	"fmt"
	"strings"

	"nodal/grammar"
)

// part elaborates one built-in part statement in scope sc, its nets already
// bound.
func (b *builder) part(sc *scope, st *bodyStmt, nets []NetID) {
	d := b.r.Design
	pt := st.pt
	pos, end := st.pos, st.end
	word := pt.Kind.Text
	kind := st.kind
	if len(pt.Params) > 0 {
		b.report(CodeSyntax, b.pos(pt.Params[0].Start()), end, "%s %s: parameters in [ ] are for block instances, not built-in parts", word, d.Qualified(sc.inst, pt.Name.Text))
		b.countOnly(nets)
		return
	}
	// The part is written where it will stay, at the end of the part
	// table (reserved for the whole design), and taken back if it cannot
	// be placed: a Part built on the side would be a heap object per part,
	// as the attribute table's setters take its address.
	d.Parts = append(d.Parts, Part{Kind: kind, Local: pt.Name.Text, Pos: pos, End: end, Inst: sc.inst})
	p := &d.Parts[len(d.Parts)-1]
	placed, invalid := b.fill(p, pt, nets)
	if invalid {
		b.r.Invalid = true
	}
	if !placed {
		d.Parts = d.Parts[:len(d.Parts)-1]
		b.countOnly(nets)
		return
	}
	b.placed(p)
}

// fill reads a part statement's value, its pins (bound to nets, the
// statement's nets in the order written) and its attributes into p, which
// holds its kind, name and place. It reports whether p can be placed, and
// whether it has a value the solver cannot use; what is wrong has been
// reported. It reads nothing but the statement, so that plain lines are
// filled on any goroutine (ahead.go).
func (b *builder) fill(p *Part, pt *grammar.Part, nets []NetID) (placed, invalid bool) {
	// Value first: for a source its unit decides the kind, and so the pins.
	valueOK := b.value(p, pt)
	if !valueOK {
		invalid = true
		if p.Kind.shared() {
			// Without a usable value a source is neither kind: its
			// pins cannot be placed.
			return false, invalid
		}
	}
	info := p.Kind.Info()
	if !b.pins(p, pt, nets, info) {
		return false, invalid
	}
	// A refused value has said what the kind needs instead.
	if !b.attrs(p, pt, info, valueOK || pt.Value == nil) {
		invalid = true
	}
	return true, invalid
}

// placed counts part p, just appended to the design, and its pins on
// their nets (as AddPart counts them).
func (b *builder) placed(p *Part) {
	b.count++
	for _, n := range p.Nets() {
		b.r.Design.Nets[n].Pins++
	}
}

// countOnly counts a statement's nets as used even though the statement
// cannot be placed, so that one bad line does not make its neighbours look
// floating; and it marks them unsure, so that a net only that line names
// is not reported floating either: the line's own finding says what to
// fix.
func (b *builder) countOnly(nets []NetID) {
	for _, n := range nets {
		net := &b.r.Design.Nets[n]
		net.Pins++
		if !b.probing { // a scratch design's names are not the design's
			if b.r.Unsure == nil {
				b.r.Unsure = map[string]bool{}
			}
			b.r.Unsure[b.r.Design.NetName(n)] = true
		}
	}
	b.r.Incomplete = true
}

// plural writes a count with its noun: "1 pin", "3 pins", "no pins".
func plural(n int, noun string) string {
	switch n {
	case 0:
		return "no " + noun + "s"
	case 1:
		return "1 " + noun
	}
	return fmt.Sprintf("%d %ss", n, noun)
}

// pins binds the statement's nets to the kind's pins, by position or name.
func (b *builder) pins(p *Part, pt *grammar.Part, nets []NetID, info *KindInfo) bool {
	word := pt.Kind.Text
	n := len(info.Pins)
	if len(pt.Pins) != n {
		b.report(CodePinCount, p.Pos, p.End, "%s %s has %s; %s has %s: (%s)", word, b.nameOf(p), plural(len(pt.Pins), "pin"), article(p.Kind.String()), countWord(n), strings.Join(info.Pins, ", "))
		return false
	}
	var set [MaxPins]bool
	for i, pin := range pt.Pins {
		slot := i
		if pin.Label != nil {
			slot = -1
			for j, pn := range info.Pins {
				if pn == pin.Label.Text {
					slot = j
				}
			}
			if slot < 0 {
				b.report(CodePinCount, p.Pos, p.End, "%s %s has no pin named %q; its pins are %s", word, b.nameOf(p), pin.Label.Text, andList(info.Pins))
				return false
			}
		} else if i > 0 && pt.Pins[0].Label != nil {
			b.report(CodePinCount, p.Pos, p.End, "%s %s mixes named and positional pins; name %s (%s=…) or %s", word, b.nameOf(p), allOf(n), strings.Join(info.Pins, "=…, "), noneOf(n))
			return false
		}
		if set[slot] {
			b.report(CodePinCount, p.Pos, p.End, "%s %s binds pin %s twice", word, b.nameOf(p), info.Pins[slot])
			return false
		}
		set[slot] = true
		p.Pins[slot] = nets[i]
	}
	return true
}

// countWord writes a small count in words: "two", "three".
func countWord(n int) string {
	if n >= 0 && n < len(countWords) {
		return countWords[n]
	}
	return fmt.Sprint(n)
}

var countWords = []string{"none", "one", "two", "three", "four", "five", "six"}

// allOf is "both" for two, "all three" for more.
func allOf(n int) string {
	if n == 2 {
		return "both"
	}
	return "all " + countWord(n)
}

// noneOf is "neither" for two, "none" for more.
func noneOf(n int) string {
	if n == 2 {
		return "neither"
	}
	return "none"
}

// andList joins names with commas and a last "and": "a and b", "in, out
// and common".
func andList(w []string) string {
	if len(w) < 2 {
		return strings.Join(w, "")
	}
	return strings.Join(w[:len(w)-1], ", ") + " and " + w[len(w)-1]
}

// article puts "a" or "an" before a kind: "an inductor", "a led" is
// written "an LED".
func article(kind string) string {
	switch {
	case kind == "led":
		return "an LED"
	case strings.IndexByte("aeiou", kind[0]) >= 0:
		return "an " + kind
	}
	return "a " + kind
}

func contains(list []string, s string) bool {
	for _, x := range list {
		if x == s {
			return true
		}
	}
	return false
}
