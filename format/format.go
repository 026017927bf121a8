// Package format lays out nodal source in one canonical way, the layout
// "nodal fmt" writes and the language server's formatting returns.
//
// # Layout
//
//   - Consecutive part statements (parts and block instances) are aligned
//     in columns: kind, name, pins, parameters, value, then one column per
//     attribute, each cell padded to the widest in the run and separated
//     by one space. A comment-only line inside a run does not break it; a
//     blank line or any other statement does.
//   - Elsewhere tokens are separated by one space, except that nothing
//     follows "(" or "[" and nothing precedes ")", "]" or ","; "=" is tight
//     in a pin binding (anode=a) and spaced in a parameter binding
//     ([i = 15 mA]); a sign is tight to what it negates and the operators
//     of an expression are spaced.
//   - Trailing comments of consecutive statements start in one column,
//     one space after the longest statement; comment-only lines keep their
//     text. Block bodies are indented by two spaces per level.
//   - Blank lines are kept but never doubled, and none are kept at the
//     start or end of the file. Lines end in "\n"; trailing blanks go.
//   - Quantities are kept as written (4k7 stays 4k7, 4.7kΩ stays glued).
//
// # Meaning
//
// The formatter only changes the blanks between tokens and the line ends:
// every line keeps exactly its tokens, in order, so the parser reads the
// same statements (TestTokensKept and the fuzz tests hold it to that). A
// line the parser rejects keeps its text as written, only re-indented, so
// a half-typed line is never rearranged into something else. Formatting
// is idempotent.
package format

import (
	"bytes"
	"strings"
	"unicode/utf8"

	"nodal/grammar"
)

type lineKind uint8

const (
	blankLine   lineKind = iota
	commentLine          // only a comment
	brokenLine           // a line the parser rejects: kept as written
	partLine             // a part or block instance, laid out in columns
	stmtLine             // any other statement
)

// Part line cells, in column order; attributes follow from cellAttrs on.
const (
	cellKind = iota
	cellName
	cellPins
	cellParams
	cellValue
	cellAttrs
)

type line struct {
	kind    lineKind
	depth   int
	text    string   // commentLine, brokenLine: the text without indentation
	cells   []string // partLine: the cells; stmtLine: one cell
	comment string   // a trailing comment
	code    string   // the statement laid out, without its comment
}

// Source returns src in the canonical layout. It never fails: lines that
// do not parse are kept as written.
func Source(src []byte) []byte {
	f := grammar.Parse("", src)
	stmts := make(map[int]*grammar.Statement, len(f.Stmts))
	for _, st := range f.Stmts {
		stmts[st.Line()] = st
	}
	broken := make(map[int]bool, len(f.Errors))
	for _, e := range f.Errors {
		broken[e.Line] = true
	}

	var lines []line
	depth := 0
	off := 0
	for n := 1; off <= len(src); n++ {
		end := bytes.IndexByte(src[off:], '\n')
		if end < 0 {
			end = len(src)
		} else {
			end += off
		}
		text := string(src[off:end])
		l := classify(text, off, n, stmts[n], broken[n])
		if st := stmts[n]; st != nil && st.Close != nil && !broken[n] {
			depth = max(depth-1, 0)
		}
		l.depth = depth
		if st := stmts[n]; st != nil && st.Block != nil && !broken[n] {
			depth++
		}
		lines = append(lines, l)
		off = end + 1
	}
	alignParts(lines)
	return render(lines)
}

// classify turns one line of text, starting at byte offset off of the
// file, into a line.
func classify(text string, off, n int, st *grammar.Statement, broken bool) line {
	toks := grammar.LexLine(text)
	if len(toks) == 0 {
		return line{kind: blankLine}
	}
	var comment string
	if last := toks[len(toks)-1]; last.Type == grammar.TokComment {
		comment = strings.TrimRight(last.Value, " \t\r\f\v")
		toks = toks[:len(toks)-1]
	}
	switch {
	case len(toks) == 0:
		return line{kind: commentLine, text: comment}
	case broken || st == nil:
		return line{kind: brokenLine, text: strings.Trim(text, " \t\r\f\v")}
	case st.Part != nil:
		if cells, ok := partCells(st.Part, toks, off); ok {
			return line{kind: partLine, cells: cells, comment: comment}
		}
	}
	return line{kind: stmtLine, cells: []string{join(toks, st.Block != nil)}, comment: comment}
}

// partCells splits a part line's tokens into its cells, at the offsets the
// syntax tree gives for the value and each attribute. It reports false
// when the tokens do not have the shape it expects.
func partCells(p *grammar.Part, toks []grammar.Token, off int) ([]string, bool) {
	if len(toks) < 3 || toks[2].Value != "(" {
		return nil, false
	}
	pinsEnd := closing(toks, 2)
	if pinsEnd < 0 {
		return nil, false
	}
	cells := make([]string, cellAttrs, cellAttrs+len(p.Attrs))
	cells[cellKind] = toks[0].Value
	cells[cellName] = toks[1].Value
	cells[cellPins] = join(toks[2:pinsEnd+1], true)
	i := pinsEnd + 1
	if i < len(toks) && toks[i].Value == "[" && toks[i].Type == grammar.TokPunct {
		end := closing(toks, i)
		if end < 0 {
			return nil, false
		}
		cells[cellParams] = join(toks[i:end+1], false)
		i = end + 1
	}
	// Token indices where the value and each attribute start.
	var starts []int
	if p.Value != nil {
		starts = append(starts, int(p.Value.Start())-off)
	}
	for _, a := range p.Attrs {
		starts = append(starts, int(a.Start())-off)
	}
	idx := make([]int, 0, len(starts)+1)
	for _, s := range starts {
		for i < len(toks) && int(toks[i].Pos) < s {
			i++
		}
		if i == len(toks) || int(toks[i].Pos) != s {
			return nil, false
		}
		idx = append(idx, i)
	}
	if len(idx) > 0 && idx[0] != pinsEndNext(toks, pinsEnd, cells[cellParams] != "") {
		return nil, false // tokens between the brackets and the value
	}
	idx = append(idx, len(toks))
	for k := 0; k+1 < len(idx); k++ {
		cell := join(toks[idx[k]:idx[k+1]], false)
		if k == 0 && p.Value != nil {
			cells[cellValue] = cell
		} else {
			cells = append(cells, cell)
		}
	}
	if len(idx) == 1 && len(toks) != pinsEndNext(toks, pinsEnd, cells[cellParams] != "") {
		return nil, false // tokens the tree does not account for
	}
	return cells, true
}

// pinsEndNext returns the index of the first token after the pins and, if
// present, the parameters.
func pinsEndNext(toks []grammar.Token, pinsEnd int, params bool) int {
	i := pinsEnd + 1
	if params {
		i = closing(toks, i) + 1
	}
	return i
}

// closing returns the index of the bracket that closes the one at open,
// or -1.
func closing(toks []grammar.Token, open int) int {
	depth := 0
	for i := open; i < len(toks); i++ {
		if toks[i].Type != grammar.TokPunct {
			continue
		}
		switch toks[i].Value {
		case "(", "[", "{":
			depth++
		case ")", "]", "}":
			depth--
			if depth == 0 {
				return i
			}
		}
	}
	return -1
}

// join lays out a run of tokens on one line. pins says that the first
// "(" at the top level opens a list of pins or nets, in which "=" binds
// tightly (anode=a); every other parenthesis belongs to an expression.
func join(toks []grammar.Token, pins bool) string {
	var b strings.Builder
	// The open brackets: '(' a pin list, 'e' an expression's parenthesis,
	// '[' parameters, '{' an old-style expression or a block body.
	var stack []byte
	seenPins := false
	operand := false   // the previous token ends an operand
	signTight := false // the previous token is a unary sign
	for i, t := range toks {
		top := byte(0)
		if len(stack) > 0 {
			top = stack[len(stack)-1]
		}
		punct := t.Type == grammar.TokPunct
		if i > 0 && !signTight && spaceBefore(toks[i-1], t, top) {
			b.WriteByte(' ')
		}
		b.WriteString(t.Value)
		signTight = false
		wasOperand := operand
		operand = false
		if !punct {
			switch t.Type {
			case grammar.TokNumber, grammar.TokUnit, grammar.TokCode, grammar.TokIdent, grammar.TokString:
				operand = true
			}
			continue
		}
		switch t.Value {
		case "(":
			if pins && !seenPins && len(stack) == 0 {
				seenPins = true
				stack = append(stack, '(')
			} else {
				stack = append(stack, 'e')
			}
		case "[":
			stack = append(stack, '[')
		case "{":
			stack = append(stack, '{')
		case ")", "]", "}":
			if len(stack) > 0 {
				operand = stack[len(stack)-1] == 'e'
				stack = stack[:len(stack)-1]
			}
		case "+", "-":
			// A sign between two operands of an expression is an
			// operator; anywhere else it negates what follows.
			signTight = !(wasOperand && (top == 'e' || top == '{'))
		}
	}
	return b.String()
}

// spaceBefore reports whether one blank separates prev and t. top is the
// innermost bracket open after prev.
func spaceBefore(prev, t grammar.Token, top byte) bool {
	if prev.Type == grammar.TokPunct {
		switch prev.Value {
		case "(", "[", "{":
			return false
		case "=":
			return top != '('
		}
	}
	if t.Type == grammar.TokPunct {
		switch t.Value {
		case ")", "]", "}", ",":
			return false
		case "=":
			return top != '('
		}
	}
	return true
}

// render writes the lines out.
func render(lines []line) []byte {
	for i := range lines {
		l := &lines[i]
		if l.kind == stmtLine {
			l.code = l.cells[0]
		}
	}
	alignComments(lines)
	var b bytes.Buffer
	blank := false
	for _, l := range lines {
		if l.kind == blankLine {
			blank = b.Len() > 0
			continue
		}
		if blank {
			b.WriteByte('\n')
			blank = false
		}
		b.WriteString(strings.Repeat("  ", l.depth))
		switch l.kind {
		case commentLine, brokenLine:
			b.WriteString(l.text)
		default:
			b.WriteString(l.code)
			if l.comment != "" {
				b.WriteByte(' ')
				b.WriteString(l.comment)
			}
		}
		b.WriteByte('\n')
	}
	return b.Bytes()
}

// width is the width of s in columns, counting one per character.
func width(s string) int { return utf8.RuneCountInString(s) }

// run returns the end (exclusive) of the run of lines starting at i whose
// kinds satisfy in, with comment-only lines allowed inside, all at
// lines[i]'s depth, and the indices of the lines of the run that are not
// comment-only.
func run(lines []line, i int, in func(lineKind) bool) (int, []int) {
	var members []int
	last := i
	for j := i; j < len(lines); j++ {
		l := &lines[j]
		if l.depth != lines[i].depth {
			break
		}
		if in(l.kind) {
			members = append(members, j)
			last = j + 1
			continue
		}
		if l.kind != commentLine {
			break
		}
	}
	return last, members
}

// alignParts lays out each run of part lines in columns.
func alignParts(lines []line) {
	isPart := func(k lineKind) bool { return k == partLine }
	for i := 0; i < len(lines); {
		if lines[i].kind != partLine {
			i++
			continue
		}
		end, members := run(lines, i, isPart)
		var widths []int
		for _, j := range members {
			for c, cell := range lines[j].cells {
				if c == len(widths) {
					widths = append(widths, 0)
				}
				widths[c] = max(widths[c], width(cell))
			}
		}
		for _, j := range members {
			var b strings.Builder
			for c, w := range widths {
				if w == 0 {
					continue
				}
				cell := ""
				if c < len(lines[j].cells) {
					cell = lines[j].cells[c]
				}
				if b.Len() > 0 {
					b.WriteByte(' ')
				}
				b.WriteString(cell)
				b.WriteString(strings.Repeat(" ", w-width(cell)))
			}
			lines[j].cells = []string{strings.TrimRight(b.String(), " ")}
			lines[j].kind = stmtLine
		}
		i = end
	}
}

// alignComments starts the trailing comments of each run of consecutive
// statements in one column.
func alignComments(lines []line) {
	isStmt := func(k lineKind) bool { return k == stmtLine }
	for i := 0; i < len(lines); {
		if lines[i].kind != stmtLine {
			i++
			continue
		}
		end, members := run(lines, i, isStmt)
		col := 0
		for _, j := range members {
			if lines[j].comment != "" {
				col = max(col, width(lines[j].code))
			}
		}
		for _, j := range members {
			if l := &lines[j]; l.comment != "" {
				l.code += strings.Repeat(" ", col-width(l.code))
			}
		}
		i = end
	}
}
