package grammar

// pos.go: the positions grammar hands out. Every position that leaves the
// package is an Offset, a byte offset into the parsed file, which At turns
// into the diag.Pos of a file set. The syntax tree's own Pos and EndPos
// fields are participle's lexer.Position only because participle fills
// fields of that type and no other; later stages read them through the
// methods below, never through their fields.

import "nodal/diag"

// Offset is a byte offset into the parsed file.
type Offset int

// At returns the diag.Pos of o in f, the file set's entry for the parsed
// source. An offset past the end of f is taken as its end.
func (o Offset) At(f *diag.File) diag.Pos {
	switch {
	case o < 0:
		o = 0
	case int(o) > f.Size():
		o = Offset(f.Size())
	}
	return f.Pos(int(o))
}

// Start returns the offset of the statement's first token.
func (s *Statement) Start() Offset { return Offset(s.Pos.Offset) }

// End returns the offset just past the statement's last token.
func (s *Statement) End() Offset { return Offset(s.EndPos.Offset) }

// Start returns the offset of the part's kind word.
func (p *Part) Start() Offset { return Offset(p.Pos.Offset) }

// End returns the offset just past the part's last token.
func (p *Part) End() Offset { return Offset(p.EndPos.Offset) }

// Start returns the offset of the name's first byte.
func (n *Name) Start() Offset { return Offset(n.Pos.Offset) }

// End returns the offset just past the name.
func (n *Name) End() Offset { return Offset(n.Pos.Offset + len(n.Text)) }

// Start returns the offset of the string's opening quote.
func (s *String) Start() Offset { return Offset(s.Pos.Offset) }

// End returns the offset just past the string's closing quote.
func (s *String) End() Offset { return Offset(s.Pos.Offset + len(s.Text)) }

// Start returns the offset of the pin binding's first token.
func (p *Pin) Start() Offset { return Offset(p.Pos.Offset) }

// Start returns the offset of the binding's name.
func (a *Assign) Start() Offset { return Offset(a.Pos.Offset) }

// End returns the offset just past the binding's last token.
func (a *Assign) End() Offset { return Offset(a.EndPos.Offset) }

// Start returns the offset of the value's first token.
func (v *Value) Start() Offset { return Offset(v.Pos.Offset) }

// Start returns the offset of the parameter name.
func (r *Ref) Start() Offset { return Offset(r.Pos.Offset) }

// End returns the offset just past the parameter name.
func (r *Ref) End() Offset { return Offset(r.Pos.Offset + len(r.Text)) }

// Start returns the offset of the attribute's word.
func (a *Attr) Start() Offset { return Offset(a.Pos.Offset) }

// Start returns the offset of the expression's first token.
func (e *Expr) Start() Offset { return Offset(e.Pos.Offset) }

// End returns the offset just past the expression's last token.
func (e *Expr) End() Offset { return Offset(e.EndPos.Offset) }

// Start returns the offset of the term's first factor.
func (t *Term) Start() Offset { return t.First.Start() }

// Start returns the offset of the factor's first token.
func (f *Factor) Start() Offset { return Offset(f.Pos.Offset) }

// End returns the offset just past the factor's last token.
func (f *Factor) End() Offset { return Offset(f.EndPos.Offset) }

// Start returns the offset of the closing brace.
func (c *Close) Start() Offset { return Offset(c.Pos.Offset) }

// End returns the offset just past the comment.
func (c Comment) End() Offset { return c.Pos + Offset(len(c.Text)) }
