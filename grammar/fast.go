package grammar

// fast.go: the fast path of the parser. The grammar in ast.go defines the
// language; this file only speeds up reading the commonest statement, a
// plain part line, by hand:
//
//   - lines are lexed in batches of up to batchLines, each line's tokens
//     followed by a Newline token, and upgraded to one PeekingLexer, so
//     that neither the token slice nor participle's set-up is paid per
//     line;
//   - readRun reads as many consecutive part lines as it can (fastRun),
//     each line by readPart, a hand-written reader of the subset of Part
//     that has no expressions in parentheses, or by readHeader, which reads
//     the design, ground and include lines. They build exactly the tree the
//     grammar builds (the same nodes, values and positions: see
//     TestFastPathMatchesGrammar) and give up on anything else, consuming
//     nothing of that line;
//   - the line it stopped at is read by the grammar alone, on its own, as
//     ParseReference reads every line, so that other statements, syntax
//     errors and their messages are always the grammar's; then the fast
//     path goes on with the next line.
//
// No participle parser is built for the fast path: fastRun reads the
// PeekingLexer itself (its Parse has the form of participle's Parseable,
// NextMatch when it reads nothing), and the grammar's parser is built only
// when a line needs it (parse.go).

import (
	"github.com/alecthomas/participle/v2"
	"github.com/alecthomas/participle/v2/lexer"
)

// batchLines is how many lines are lexed and upgraded at once.
const batchLines = 1024

// fastRun is a run of consecutive part lines (and design, ground and
// include lines), each read by hand with the Newline that ends it.
type fastRun struct {
	sts   []*Statement
	slab  []partNodes // nodes for the next lines, allocated a chunk at a time
	attrs []attrNodes // nodes for the next attributes (rated 1 W), the same way
}

// maxSlab bounds the chunk in which fastRun allocates nodes. Chunks grow
// from 4 so that a short run wastes little.
const maxSlab = 128

// readRun reads as many consecutive lines as the fast path takes from pl
// and returns them, or nil when it takes none (pl is then where it was).
func readRun(pl *lexer.PeekingLexer) *fastRun {
	r := &fastRun{}
	if r.Parse(pl) != nil {
		return nil
	}
	return r
}

// partNodes holds the nodes of a typical part line in one allocation: the
// fast reader's, and the part of a plain line's (PlainNodes).
type partNodes struct {
	st         Statement
	part       Part
	kind, name Name
	pinNames   [2]Name
	pins       [2]Pin
	pinPtrs    [2]*Pin
	value      Value
}

// attrNodes holds the nodes of an attribute with one value, and the
// part's attribute list when it is the first, in one slot of a chunk.
type attrNodes struct {
	attr   Attr
	key    Name
	value  Value
	values [1]*Value
	list   [1]*Attr
}

// attrNode returns the nodes for the next attribute. Like the part nodes
// they come from chunks that grow from 4 to maxSlab, so that a file whose
// every line is rated makes one allocation per maxSlab attributes instead
// of two per line.
func (r *fastRun) attrNode() *attrNodes {
	if len(r.attrs) == 0 {
		r.attrs = make([]attrNodes, min(max(4, 2*len(r.sts)), maxSlab))
	}
	an := &r.attrs[0]
	r.attrs = r.attrs[1:]
	return an
}

func isNameTok(t *lexer.Token) bool {
	switch t.Type {
	case TokIdent, TokUnit, TokCode, TokAttrWord, TokString:
		return true
	}
	return false
}

func isPunctTok(t *lexer.Token, p string) bool { return t.Type == TokPunct && t.Value == p }

// startsValue reports whether t can begin a Value the fast path reads: a
// quantity, a code, a switch state or a lone parameter name. An expression
// in parentheses is left to the grammar.
func startsValue(t *lexer.Token) bool {
	switch t.Type {
	case TokNumber, TokCode, TokIdent:
		return true
	case TokPunct:
		return t.Value == "-"
	case TokAttrWord:
		return t.Value == "open" || t.Value == "closed"
	}
	return false
}

// Parse reads part lines, each with its Newline, up to the first line
// that is not one, and returns participle.NextMatch if there is none.
func (r *fastRun) Parse(lex *lexer.PeekingLexer) error {
	for {
		if len(r.slab) == 0 {
			r.slab = make([]partNodes, min(max(4, 2*len(r.sts)), maxSlab))
		}
		if st := r.readPartLine(lex, &r.slab[0]); st != nil {
			r.slab = r.slab[1:]
			r.sts = append(r.sts, st)
			continue
		}
		if st := readHeader(lex); st != nil {
			r.sts = append(r.sts, st)
			continue
		}
		if len(r.sts) == 0 {
			return participle.NextMatch
		}
		return nil
	}
}

// readPartLine reads one part line and its Newline, or consumes nothing
// and returns nil.
func (r *fastRun) readPartLine(lex *lexer.PeekingLexer, nodes *partNodes) *Statement {
	cp := lex.MakeCheckpoint()
	if !r.readPart(lex, &nodes.part, nodes) || lex.Peek().Type != TokNewline {
		lex.LoadCheckpoint(cp)
		*nodes = partNodes{}
		return nil
	}
	lex.Next()
	nodes.st.Pos = nodes.part.Pos
	nodes.st.Part = &nodes.part
	return &nodes.st
}

// readHeader reads a design, ground or include line and its Newline as
// the grammar reads them (design NAME "title"?, ground NAME, include
// "path"), or consumes nothing and returns nil. The grammar's String node
// ends where the next token starts, the Newline here.
func readHeader(lex *lexer.PeekingLexer) *Statement {
	t := lex.Peek()
	if t.Type != TokKeyword {
		return nil
	}
	cp := lex.MakeCheckpoint()
	lex.Next()
	str := func() *String {
		s := lex.Peek()
		if s.Type != TokString {
			return nil
		}
		lex.Next()
		return &String{Pos: s.Pos, EndPos: lex.Peek().Pos, Text: s.Value}
	}
	st := &Statement{Pos: t.Pos}
	switch t.Value {
	case "design":
		d := &Design{Name: &Name{}}
		if readName(lex, d.Name) {
			d.Title = str()
			st.Design = d
		}
	case "ground":
		g := &Ground{Net: &Name{}}
		if readName(lex, g.Net) {
			st.Ground = g
		}
	case "include":
		if p := str(); p != nil {
			st.Include = &Include{Path: p}
		}
	}
	if st.Design == nil && st.Ground == nil && st.Include == nil || lex.Peek().Type != TokNewline {
		lex.LoadCheckpoint(cp)
		return nil
	}
	lex.Next()
	return st
}

func readName(lex *lexer.PeekingLexer, n *Name) bool {
	t := lex.Peek()
	if !isNameTok(t) {
		return false
	}
	lex.Next()
	n.Pos, n.Text = t.Pos, t.Value
	return true
}

// readValue reads a Value that startsValue accepted, as the grammar reads
// it: "-"? Number Unit? | Code | open | closed | a parameter name.
func readValue(lex *lexer.PeekingLexer, v *Value) bool {
	t := lex.Peek()
	v.Pos = t.Pos
	switch {
	case t.Type == TokIdent:
		lex.Next()
		v.Param = &Ref{Pos: t.Pos, Text: t.Value}
	case t.Type == TokCode:
		lex.Next()
		v.Code = t.Value
	case t.Type == TokAttrWord:
		lex.Next()
		v.Word = t.Value
	default:
		if t.Type == TokPunct {
			lex.Next()
			v.Neg = true
			t = lex.Peek()
		}
		if t.Type != TokNumber {
			return false
		}
		lex.Next()
		v.Num = t.Value
		if u := lex.Peek(); u.Type == TokUnit {
			lex.Next()
			v.Unit = u.Value
		}
	}
	return true
}

// readPart reads a Part as the grammar does, for the subset without
// expressions in parentheses, and reports whether it could.
func (r *fastRun) readPart(lex *lexer.PeekingLexer, p *Part, nodes *partNodes) bool {
	p.Pos = lex.Peek().Pos
	if !readName(lex, &nodes.kind) || !readName(lex, &nodes.name) {
		return false
	}
	p.Kind, p.Name = &nodes.kind, &nodes.name
	if !isPunctTok(lex.Peek(), "(") {
		return false
	}
	lex.Next()
	if !isPunctTok(lex.Peek(), ")") {
		for i := 0; ; i++ {
			var pin *Pin
			var net *Name
			if i < 2 {
				pin, net = &nodes.pins[i], &nodes.pinNames[i]
			} else {
				pin, net = &Pin{}, &Name{}
			}
			pin.Pos = lex.Peek().Pos
			if !readName(lex, net) {
				return false
			}
			if isPunctTok(lex.Peek(), "=") {
				lex.Next()
				label := net
				net = &Name{}
				if !readName(lex, net) {
					return false
				}
				pin.Label = label
			}
			pin.Net = net
			if i < 2 {
				nodes.pinPtrs[i] = pin
				p.Pins = nodes.pinPtrs[: i+1 : 2]
			} else {
				p.Pins = append(p.Pins, pin)
			}
			if !isPunctTok(lex.Peek(), ",") {
				break
			}
			lex.Next()
		}
	}
	if !isPunctTok(lex.Peek(), ")") {
		return false
	}
	lex.Next()
	if isPunctTok(lex.Peek(), "[") {
		if !readParams(lex, p) {
			return false
		}
	}
	if t := lex.Peek(); startsValue(t) {
		if !readValue(lex, &nodes.value) {
			return false
		}
		p.Value = &nodes.value
	}
	for {
		t := lex.Peek()
		if t.Type == TokEOF || t.Type == TokNewline {
			break
		}
		if !isNameTok(t) {
			return false // expressions, stray punctuation: the grammar's
		}
		an := r.attrNode()
		a := &an.attr
		a.Pos, a.Key = t.Pos, &an.key
		readName(lex, a.Key)
		if startsValue(lex.Peek()) {
			for {
				v := &Value{}
				if a.Values == nil {
					v = &an.value
				}
				if !readValue(lex, v) {
					return false
				}
				if a.Values == nil {
					an.values[0] = v
					a.Values = an.values[:1:1]
				} else {
					a.Values = append(a.Values, v)
				}
				if !isPunctTok(lex.Peek(), ",") {
					break
				}
				lex.Next()
				if !startsValue(lex.Peek()) {
					return false
				}
			}
		}
		if at := lex.Peek(); at.Type == TokAttrWord && at.Value == "at" {
			// "at" followed by a value is the operating point; otherwise
			// it would be the next attribute's key: leave that to the
			// grammar.
			lex.Next()
			if !startsValue(lex.Peek()) {
				return false
			}
			a.At = &Value{}
			if !readValue(lex, a.At) {
				return false
			}
		}
		if to := lex.Peek(); to.Type == TokIdent && to.Value == "to" {
			return false // a range (derate 70 °C to 155 °C): the grammar's
		}
		if p.Attrs == nil {
			an.list[0] = a
			p.Attrs = an.list[:1:1]
		} else {
			p.Attrs = append(p.Attrs, a)
		}
	}
	p.EndPos = lex.RawPeek().Pos
	return true
}

// tokenBuffer lends one PeekingLexer to every batch of a file. Upgrade
// copies the tokens it is given into a slice of its own; instead of
// upgrading (and so allocating) per batch, the batches are lexed straight
// into that slice, reached through PeekingLexer.Range, and the lexer is
// rewound to its start. A batch with more tokens than the slice holds gets
// a new, larger one.
type tokenBuffer struct {
	pl    *lexer.PeekingLexer
	buf   []lexer.Token // the PeekingLexer's own tokens
	start lexer.Checkpoint
}

// tokens returns an empty slice to lex a batch into, backed by the
// lexer's own tokens while it fits.
func (tb *tokenBuffer) tokens() []lexer.Token { return tb.buf[:0:len(tb.buf)] }

// lexer returns a PeekingLexer positioned at the first of toks, which ends
// with an EOF token.
func (tb *tokenBuffer) lexer(toks []lexer.Token) (*lexer.PeekingLexer, error) {
	if tb.pl != nil && len(toks) > 0 && len(toks) <= len(tb.buf) && &toks[0] == &tb.buf[0] {
		tb.pl.LoadCheckpoint(tb.start)
		return tb.pl, nil
	}
	// Upgrade copies up to the first EOF: fill the room after the batch
	// with placeholder tokens so that the copy has room to spare, then
	// end the batch in the copy.
	// A quarter to spare covers batches of slightly longer lines; a small
	// file gets a small buffer, since Upgrade's copy is paid per file.
	n := len(toks) + len(toks)/4 + 64
	room := make([]lexer.Token, n)
	copy(room, toks[:len(toks)-1])
	for i := len(toks) - 1; i < n-1; i++ {
		room[i].Type = TokInvalid
	}
	room[n-1] = toks[len(toks)-1]
	pl, err := lexer.Upgrade(&sliceLexer{toks: room})
	if err != nil {
		return nil, err
	}
	tb.pl, tb.start = pl, pl.MakeCheckpoint()
	tb.buf = pl.Range(0, lexer.RawCursor(n))
	tb.buf[len(toks)-1] = toks[len(toks)-1]
	return pl, nil
}

// readParams reads an instance's parameter list as the grammar does:
// "[" ( Assign ( "," Assign )* )? "]", each Assign a name with an
// optional "=" and a value that is no expression.
func readParams(lex *lexer.PeekingLexer, p *Part) bool {
	lex.Next() // [
	if !isPunctTok(lex.Peek(), "]") {
		for {
			a := &Assign{Pos: lex.Peek().Pos, Name: &Name{}}
			if !readName(lex, a.Name) {
				return false
			}
			if isPunctTok(lex.Peek(), "=") {
				lex.Next()
				if !startsValue(lex.Peek()) {
					return false
				}
				a.Value = &Value{}
				if !readValue(lex, a.Value) {
					return false
				}
			}
			a.EndPos = lex.RawPeek().Pos
			p.Params = append(p.Params, a)
			if !isPunctTok(lex.Peek(), ",") {
				break
			}
			lex.Next()
		}
	}
	if !isPunctTok(lex.Peek(), "]") {
		return false
	}
	lex.Next()
	return true
}
