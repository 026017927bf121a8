package circuit

// span.go: where in its statement a value or an attribute is written, so
// that a finding about it points at it rather than at the statement.

import (
	"nodal/diag"
	"nodal/grammar"
)

// valueSpan returns the range of a written value: "4.7 kΩ", "-5 V",
// "(2 * rtop)", "rtop", "open". Without the file's text it returns the
// value's first byte as a point.
func (b *builder) valueSpan(v *grammar.Value) (pos, end diag.Pos) {
	return b.pos(v.Start()), b.pos(v.End(b.srcs[b.file]))
}

// attrSpan returns the range of an attribute: its word through its last
// value ("rated 250 mW, 50 V", "vf 2.0 V at 20 mA").
func (b *builder) attrSpan(a *grammar.Attr) (pos, end diag.Pos) {
	pos = b.pos(a.Start())
	end = b.nameEnd(a.Key)
	last := a.At
	if last == nil && len(a.Values) > 0 {
		last = a.Values[len(a.Values)-1]
	}
	if last != nil {
		if _, e := b.valueSpan(last); e > end {
			end = e
		}
	}
	return pos, end
}
