package grammar

// span.go: where a written value ends. The tree keeps no end for values (a
// design holds millions of them), so it is measured in the source text when
// a finding needs it.

import (
	"bytes"
	"strings"
)

// End returns the offset just past the value as written in src, the text
// the value was parsed from: "4.7 kΩ", "-5 V", "(2 * rtop)", "rtop",
// "open". Where src does not hold the value, it returns the value's start.
func (v *Value) End(src []byte) Offset {
	start := v.Start()
	switch {
	case v.Expr != nil:
		if t, ok := v.ExprSource(src); ok {
			return start + Offset(len(t))
		}
		return start
	case v.Param != nil:
		return v.Param.End()
	case v.Code != "":
		return start + Offset(len(v.Code))
	case v.Word != "":
		return start + Offset(len(v.Word))
	}
	if src == nil || start < 0 || int(start) >= len(src) {
		return start
	}
	line := src[start:]
	if nl := bytes.IndexByte(line, '\n'); nl >= 0 {
		line = line[:nl]
	}
	// The sign, the number, then the unit word after any blanks.
	n := bytes.Index(line, []byte(v.Num))
	if n < 0 {
		return start
	}
	n += len(v.Num)
	if v.Unit != "" {
		if u := bytes.Index(line[n:], []byte(v.Unit)); u >= 0 {
			n += u + len(v.Unit)
		}
	}
	return start + Offset(n)
}

// NumStart returns the offset of the value's number in src: the value's
// start, or past its sign. It reports false when src does not hold the
// number there.
func (v *Value) NumStart(src []byte) (Offset, bool) {
	start := int(v.Start())
	if v.Num == "" || start < 0 || start > len(src) {
		return 0, false
	}
	j := strings.Index(string(src[start:min(start+len(v.Num)+1, len(src))]), v.Num)
	if j < 0 {
		return 0, false
	}
	return Offset(start + j), true
}

// ExprSource returns an expression value as written in src, from its
// opening parenthesis to the one that closes it: "((12 V - vdrop) / i)".
// It reports false when src does not hold an expression at the value.
func (v *Value) ExprSource(src []byte) (string, bool) {
	o := int(v.Start())
	if src == nil || o < 0 || o >= len(src) || src[o] != '(' {
		return "", false
	}
	end, depth := o, 0
	for end < len(src) && src[end] != '\n' {
		switch src[end] {
		case '(':
			depth++
		case ')':
			depth--
		}
		end++
		if depth == 0 {
			break
		}
	}
	return string(src[o:end]), true
}
