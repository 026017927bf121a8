package circuit

// span.go: where in its statement a value or an attribute is written, so
// that a finding about it points at it rather than at the statement.

import (
	"bytes"

	"nodal/diag"
	"nodal/grammar"
)

// valueSpan returns the range of a written value: "4.7 kΩ", "-5 V",
// "(2 * rtop)", "rtop", "open". Without the file's text it returns the
// value's first byte as a point.
func (b *builder) valueSpan(v *grammar.Value) (pos, end diag.Pos) {
	pos = b.pos(v.Start())
	start := b.file.Offset(pos)
	return pos, b.pos(grammar.Offset(start + b.valueLen(v, start)))
}

// valueLen measures the value that starts at offset start.
func (b *builder) valueLen(v *grammar.Value, start int) int {
	src := b.srcs[b.file]
	switch {
	case v.Expr != nil:
		if t := b.exprText(v); t != "(…)" {
			return len(t)
		}
		return 0
	case v.Param != nil:
		return int(v.Param.End()) - start
	case v.Code != "":
		return len(v.Code)
	case v.Word != "":
		return len(v.Word)
	}
	if src == nil || start >= len(src) {
		return 0
	}
	line := src[start:]
	if nl := bytes.IndexByte(line, '\n'); nl >= 0 {
		line = line[:nl]
	}
	// The sign, the number, then the unit word after any blanks.
	n := bytes.Index(line, []byte(v.Num))
	if n < 0 {
		return 0
	}
	n += len(v.Num)
	if v.Unit != "" {
		if u := bytes.Index(line[n:], []byte(v.Unit)); u >= 0 {
			n += u + len(v.Unit)
		}
	}
	return n
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
