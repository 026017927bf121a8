package grammar

// plain.go: plain part lines kept without a syntax tree. A large design is
// mostly lines such as
//
//	resistor h0_1 (n0_1, n0_2) 10 mΩ rated 1 W
//
// and the tree of one such line (a statement, a part, names, pins, a
// value and an attribute, each node with a 40-byte position) is more than
// ten times the size of the line. ParsePlain keeps each of these lines as
// one small record of byte offsets into the source instead, and the builder
// makes its nodes on demand, one line at a time, into nodes it reuses
// (File.PlainStatement). The nodes made are exactly the ones the grammar
// builds for the line: TestPlainMatchesGrammar compares them with
// ParseReference on every line of the test data, of generated designs and
// of random and mutated lines. Every other line, and every plain line that
// strays from the one shape below, is read as Parse reads it.
//
// # The shape
//
// KIND NAME (NET, NET) VALUE? ATTR*, each name any word the grammar takes
// as a name except "" (which is a syntax error), VALUE a number with an
// optional sign and unit or a resistor code, and each ATTR a word followed
// by exactly one such value. No pin labels, no parameters, no expressions,
// no switch states, no "at" or "to", no lists of values.

import (
	"sort"

	"github.com/alecthomas/participle/v2/lexer"
)

// word is a token of a plain line: its offset in the source and its length
// in bytes.
type word struct{ off, n uint32 }

// Value kinds of a plain line's value or attribute.
const (
	plainNoValue  uint8 = iota
	plainNumber         // Number Unit?
	plainNegative       // "-" Number Unit?; the word starts at the number
	plainCode           // 4k7, R47
)

// plainLine is one plain part line.
type plainLine struct {
	line      int32  // its line number
	lineStart uint32 // offset of the line's first byte, for columns
	end       uint32 // just past its last token
	neg       uint32 // offset of the value's "-", when it has one
	kind      word   // the kind word, where the statement starts
	name      word
	nets      [2]word
	num, unit word // the value; unit.n is 0 without a unit
	value     uint8
	nattr     uint8
	attr      uint32 // its first attribute in the chunk's attrs
}

// plainAttr is one attribute of a plain line: a word and one value.
type plainAttr struct {
	key, num, unit word
	neg            uint32
	value          uint8
}

// plainChunk holds the plain lines of one piece of a file, in order.
type plainChunk struct {
	lines []plainLine
	attrs []plainAttr
}

// A chunk holds up to maxChunk lines; the first of a piece holds
// firstChunk, and each next one twice as many as the one before. A slice
// of records grown by append would be copied at every quarter of its
// growth, allocating about five times what it ends up holding.
const (
	firstChunk = 256
	maxChunk   = 1 << 16
)

// room makes sure ch has room for one more line: when it is full it is
// added to chunks and ch starts afresh, larger. It always reports true,
// to be used in a condition before readPlain.
func (ch *plainChunk) room(chunks *[]plainChunk) bool {
	if len(ch.lines) < cap(ch.lines) {
		return true
	}
	n := firstChunk
	if len(ch.lines) > 0 {
		*chunks = append(*chunks, *ch)
		n = min(2*len(ch.lines), maxChunk)
	}
	*ch = plainChunk{lines: make([]plainLine, 0, n), attrs: make([]plainAttr, 0, n)}
	return true
}

// indexPlain records where each chunk's lines start, once they are all
// read.
func (f *File) indexPlain() {
	if len(f.plain) == 0 {
		return
	}
	f.plainFirst, f.plainN = make([]int, len(f.plain)), 0
	for c := range f.plain {
		f.plainFirst[c] = f.plainN
		f.plainN += len(f.plain[c].lines)
	}
}

// maxPlainAttrs bounds the attributes of a line kept as a plain record.
const maxPlainAttrs = 255

// PlainLines returns how many lines of f are kept as plain records rather
// than in Stmts. Only ParsePlain keeps any.
func (f *File) PlainLines() int { return f.plainN }

// plainAt returns plain line i and the chunk that holds it.
func (f *File) plainAt(i int) (*plainLine, *plainChunk) {
	if i < 0 || i >= f.plainN {
		panic("grammar: plain line index out of range")
	}
	c := sort.SearchInts(f.plainFirst, i+1) - 1 // the last chunk starting at or before i
	ch := &f.plain[c]
	return &ch.lines[i-f.plainFirst[c]], ch
}

// PlainSpan returns where plain line i starts (its kind word) and ends
// (just past its last token): the Start and End of its statement.
func (f *File) PlainSpan(i int) (start, end Offset) {
	l, _ := f.plainAt(i)
	return Offset(l.kind.off), Offset(l.end)
}

// PlainKind returns plain line i's kind word.
func (f *File) PlainKind(i int) string {
	l, _ := f.plainAt(i)
	return f.text(l.kind)
}

// PlainName returns plain line i's part name.
func (f *File) PlainName(i int) string {
	l, _ := f.plainAt(i)
	return f.text(l.name)
}

func (f *File) text(w word) string { return f.src[w.off : w.off+w.n] }

// PlainNodes holds the nodes of one plain line: those of its part line
// (partNodes, as the fast reader's) and of its attributes. A builder that
// looks at one line at a time reuses one PlainNodes for all of them.
type PlainNodes struct {
	partNodes
	attrs     []Attr
	keys      []Name
	values    []Value
	valuePtrs []*Value
	attrPtrs  []*Attr
}

// PlainStatement returns the statement of plain line i, the one the
// grammar builds for it, made in nodes: the statement is valid until nodes
// is used again. With nodes nil the statement has nodes of its own.
func (f *File) PlainStatement(i int, nodes *PlainNodes) *Statement {
	if nodes == nil {
		nodes = &PlainNodes{}
	}
	l, ch := f.plainAt(i)
	pos := func(off uint32) lexer.Position {
		return lexer.Position{Offset: int(off), Line: int(l.line), Column: int(off-l.lineStart) + 1}
	}
	name := func(n *Name, w word) *Name {
		*n = Name{Pos: pos(w.off), Text: f.text(w)}
		return n
	}
	value := func(v *Value, kind uint8, neg uint32, num, unit word) {
		*v = Value{Pos: pos(num.off)}
		switch kind {
		case plainCode:
			v.Code = f.text(num)
			return
		case plainNegative:
			v.Pos, v.Neg = pos(neg), true
		}
		v.Num = f.text(num)
		if unit.n > 0 {
			v.Unit = f.text(unit)
		}
	}
	p := &nodes.part
	*p = Part{Pos: pos(l.kind.off), Kind: name(&nodes.kind, l.kind), Name: name(&nodes.name, l.name)}
	for k := range 2 {
		net := name(&nodes.pinNames[k], l.nets[k])
		nodes.pins[k] = Pin{Pos: net.Pos, Net: net}
		nodes.pinPtrs[k] = &nodes.pins[k]
	}
	p.Pins = nodes.pinPtrs[:]
	if l.value != plainNoValue {
		value(&nodes.value, l.value, l.neg, l.num, l.unit)
		p.Value = &nodes.value
	}
	if n := int(l.nattr); n > 0 {
		if cap(nodes.attrs) < n {
			nodes.attrs = make([]Attr, n)
			nodes.keys = make([]Name, n)
			nodes.values = make([]Value, n)
			nodes.valuePtrs = make([]*Value, n)
			nodes.attrPtrs = make([]*Attr, n)
		}
		for k, pa := range ch.attrs[l.attr : l.attr+uint32(n)] {
			a := &nodes.attrs[k]
			value(&nodes.values[k], pa.value, pa.neg, pa.num, pa.unit)
			nodes.valuePtrs[k] = &nodes.values[k]
			*a = Attr{Pos: pos(pa.key.off), Key: name(&nodes.keys[k], pa.key), Values: nodes.valuePtrs[k : k+1 : k+1]}
			nodes.attrPtrs[k] = a
		}
		p.Attrs = nodes.attrPtrs[:n:n]
	}
	end := pos(l.end)
	p.EndPos = end
	nodes.st = Statement{Pos: p.Pos, EndPos: end, Part: p}
	return &nodes.st
}

// readPlain reads the tokens of one line (without its Newline) as a plain
// line, appending it to ch, and reports whether it could. lineStart is the
// offset of the line's first byte.
func readPlain(ch *plainChunk, toks []lexer.Token, line, lineStart int) bool {
	if len(toks) < 7 || len(ch.attrs) >= 1<<32-maxPlainAttrs {
		return false
	}
	name := func(t *lexer.Token) (word, bool) {
		if !isNameTok(t) || t.Value == `""` {
			return word{}, false
		}
		return word{uint32(t.Pos.Offset), uint32(len(t.Value))}, true
	}
	var l plainLine
	var ok [4]bool
	l.kind, ok[0] = name(&toks[0])
	l.name, ok[1] = name(&toks[1])
	l.nets[0], ok[2] = name(&toks[3])
	l.nets[1], ok[3] = name(&toks[5])
	if !ok[0] || !ok[1] || !ok[2] || !ok[3] || !isPunctTok(&toks[2], "(") || !isPunctTok(&toks[4], ",") || !isPunctTok(&toks[6], ")") {
		return false
	}
	l.line, l.lineStart = int32(line), uint32(lineStart)
	last := &toks[len(toks)-1]
	l.end = uint32(last.Pos.Offset + len(last.Value))
	l.attr = uint32(len(ch.attrs))
	fail := func() bool {
		ch.attrs = ch.attrs[:l.attr]
		return false
	}
	i := 7
	// value reads a value at toks[i]: its kind, the "-" and the words.
	value := func() (kind uint8, neg uint32, num, unit word) {
		if i >= len(toks) {
			return
		}
		t := &toks[i]
		switch {
		case t.Type == TokCode:
			i++
			return plainCode, 0, word{uint32(t.Pos.Offset), uint32(len(t.Value))}, word{}
		case t.Type == TokPunct && t.Value == "-":
			if i+1 >= len(toks) || toks[i+1].Type != TokNumber {
				return
			}
			kind, neg = plainNegative, uint32(t.Pos.Offset)
			i++
			t = &toks[i]
		case t.Type == TokNumber:
			kind = plainNumber
		default:
			return
		}
		i++
		num = word{uint32(t.Pos.Offset), uint32(len(t.Value))}
		if i < len(toks) && toks[i].Type == TokUnit {
			unit = word{uint32(toks[i].Pos.Offset), uint32(len(toks[i].Value))}
			i++
		}
		return
	}
	if i < len(toks) && startsValue(&toks[i]) {
		// Anything that starts a value must be a value of the shape: a
		// lone name here would be a parameter, and a switch state a word.
		if l.value, l.neg, l.num, l.unit = value(); l.value == plainNoValue {
			return false
		}
	}
	for i < len(toks) {
		t := &toks[i]
		if t.Type == TokAttrWord && t.Value == "at" || t.Type == TokIdent && t.Value == "to" || l.nattr == maxPlainAttrs {
			return fail()
		}
		key, isName := name(t)
		if !isName {
			return fail()
		}
		i++
		a := plainAttr{key: key}
		if a.value, a.neg, a.num, a.unit = value(); a.value == plainNoValue {
			return fail()
		}
		ch.attrs = append(ch.attrs, a)
		l.nattr++
	}
	ch.lines = append(ch.lines, l)
	return true
}
