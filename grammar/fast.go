package grammar

// fast.go: the fast path of the parser. The grammar in ast.go defines the
// language; this file only speeds up reading the commonest statement, a
// plain part line, through participle's Parseable interface:
//
//   - lines are parsed in batches of up to batchLines statements per
//     participle call, each line's tokens followed by a Newline token, so
//     the per-call set-up of participle is shared;
//   - within a batch, a part line is first offered to fastPart.Parse, a
//     hand-written reader of the subset of Part that has no parameters and
//     no braces. It builds exactly the tree the grammar builds (the same
//     nodes, values and positions: see TestFastPathMatchesGrammar) and
//     gives up with participle.NextMatch on anything else, whereupon the
//     grammar's own Statement production reads the line;
//   - a batch in which any line fails is parsed again line by line by the
//     grammar alone, so that syntax errors and their messages are always
//     the grammar's.

import (
	"github.com/alecthomas/participle/v2"
	"github.com/alecthomas/participle/v2/lexer"
)

// batchLines is how many statements one participle call reads.
const batchLines = 128

// fastLine is one line of a batch: a part by the fast path, or any
// statement by the grammar.
type fastLine struct {
	Part  *fastPart  `parser:"  @@"`
	Other *Statement `parser:"| @@"`
}

// fastBatch is a run of lines, each ended by a Newline token.
type fastBatch struct {
	Lines []*fastLine `parser:"( @@ Newline )*"`
}

var batchParser = participle.MustBuild[fastBatch](
	participle.Lexer(Lexer),
	participle.Elide("Comment"),
	participle.UseLookahead(3),
)

// fastPart is a Part read by hand. It has Part's layout, so a *fastPart is
// a *Part.
type fastPart Part

// partNodes holds the nodes of a typical part line in one allocation.
type partNodes struct {
	kind, name Name
	pinNames   [2]Name
	pins       [2]Pin
	pinPtrs    [2]*Pin
	value      Value
}

func isNameTok(t *lexer.Token) bool {
	switch t.Type {
	case TokIdent, TokUnit, TokCode, TokAttrWord, TokString:
		return true
	}
	return false
}

func isPunctTok(t *lexer.Token, p string) bool { return t.Type == TokPunct && t.Value == p }

// startsValue reports whether t can begin a Value the fast path reads. A
// brace (an expression) is left to the grammar.
func startsValue(t *lexer.Token) bool {
	switch t.Type {
	case TokNumber, TokCode:
		return true
	case TokPunct:
		return t.Value == "-"
	case TokAttrWord:
		return t.Value == "open" || t.Value == "closed"
	}
	return false
}

// Parse implements participle.Parseable.
func (p *fastPart) Parse(lex *lexer.PeekingLexer) error {
	cp := lex.MakeCheckpoint()
	if !p.parse(lex) {
		lex.LoadCheckpoint(cp)
		*p = fastPart{}
		return participle.NextMatch
	}
	return nil
}

func readName(lex *lexer.PeekingLexer, n *Name) bool {
	t := lex.Peek()
	if !isNameTok(t) {
		return false
	}
	lex.Next()
	n.Pos, n.Text, n.EndPos = t.Pos, t.Value, lex.RawPeek().Pos
	return true
}

// readValue reads a Value that startsValue accepted, as the grammar reads
// it: "-"? Number Unit? | Code | open | closed.
func readValue(lex *lexer.PeekingLexer, v *Value) bool {
	t := lex.Peek()
	v.Pos = t.Pos
	switch {
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
	v.EndPos = lex.RawPeek().Pos
	return true
}

func (p *fastPart) parse(lex *lexer.PeekingLexer) bool {
	nodes := &partNodes{}
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
			pin.EndPos = lex.RawPeek().Pos
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
			return false // parameters, braces, stray punctuation: the grammar's
		}
		a := &Attr{Pos: t.Pos, Key: &Name{}}
		readName(lex, a.Key)
		if startsValue(lex.Peek()) {
			for {
				v := &Value{}
				if !readValue(lex, v) {
					return false
				}
				a.Values = append(a.Values, v)
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
		a.EndPos = lex.RawPeek().Pos
		p.Attrs = append(p.Attrs, a)
	}
	p.EndPos = lex.RawPeek().Pos
	return true
}
