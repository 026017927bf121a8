package grammar

import "github.com/alecthomas/participle/v2/lexer"

// The syntax tree. Nodes record Pos, and those whose extent later stages
// quote (statements, parameter bindings, expressions) EndPos too; their
// Offset fields are byte offsets into the file, which is all later stages
// use. The nodes every part line has several of (Name, Pin, Value, Attr)
// keep no EndPos: a million-part design holds millions of them, and a
// name's end is its Pos plus the length of its Text.
//
// One Statement is one line. Statements never span lines: a block's header
// ends with "{" on its line and the block closes with "}" on a line of its
// own.

// Statement is one line of a design.
type Statement struct {
	Pos    lexer.Position
	EndPos lexer.Position

	Design  *Design  `parser:"  \"design\" @@"`
	Ground  *Ground  `parser:"| \"ground\" @@"`
	Port    *Port    `parser:"| \"port\" @@"`
	Include *Include `parser:"| \"include\" @@"`
	Ambient *Ambient `parser:"| \"ambient\" @@"`
	Block   *Block   `parser:"| \"block\" @@"`
	Close   *Close   `parser:"| @@"`
	Part    *Part    `parser:"| @@"`
}

// Design is the optional header: design NAME ["title"].
type Design struct {
	Name  *Name   `parser:"@@"`
	Title *String `parser:"@@?"`
}

// Ground names the 0 V reference net.
type Ground struct {
	Net *Name `parser:"@@"`
}

// Port lists nets that leave the file and may have a single pin. A port
// of one net may say what drives it from outside: a voltage, with an
// optional source resistance (port vin 5 V series 50 Ω), or a current
// (port sense 2 mA); or a range of either, LOW to HIGH, DriveHigh being
// its top (port vin 4.5 V to 5.5 V series 50 Ω).
type Port struct {
	Nets      []*Name `parser:"@@ ( \",\" @@ )*"`
	Drive     *Value  `parser:"( @@"`
	DriveHigh *Value  `parser:"  ( \"to\" @@ )? )?"`
	Attrs     []*Attr `parser:"@@*"`
}

// Ambient states the design's ambient temperature, or its range:
// ambient 25 °C, ambient -20 °C to 50 °C.
type Ambient struct {
	Low  *Value `parser:"@@"`
	High *Value `parser:"( \"to\" @@ )?"`
}

// Include brings the blocks of another file.
type Include struct {
	Path *String `parser:"@@"`
}

// Block opens a block definition: block NAME (PIN, ...) [PARAM = DEFAULT, ...] {
type Block struct {
	Name   *Name     `parser:"@@"`
	Pins   []*Name   `parser:"\"(\" ( @@ ( \",\" @@ )* )? \")\""`
	Params []*Assign `parser:"( \"[\" ( @@ ( \",\" @@ )* )? \"]\" )?"`
	Open   string    `parser:"@\"{\""`
}

// Close ends a block definition.
type Close struct {
	Pos   lexer.Position
	Brace string `parser:"@\"}\""`
}

// Part is one part or block instance: KIND NAME (PINS) [PARAMS] VALUE ATTRS.
type Part struct {
	Pos    lexer.Position
	EndPos lexer.Position

	Kind   *Name     `parser:"@@"`
	Name   *Name     `parser:"@@"`
	Pins   []*Pin    `parser:"\"(\" ( @@ ( \",\" @@ )* )? \")\""`
	Params []*Assign `parser:"( \"[\" ( @@ ( \",\" @@ )* )? \"]\" )?"`
	Value  *Value    `parser:"@@?"`
	Attrs  []*Attr   `parser:"@@*"`
}

// Name is a word with its position: a part, net, kind or parameter name.
// A double-quoted net name keeps its quotes in Text and sets Quoted.
type Name struct {
	Pos  lexer.Position
	Text string `parser:"@(Ident | Unit | Code | AttrWord | String)"`
}

// String is a double-quoted string with its position.
type String struct {
	Pos    lexer.Position
	EndPos lexer.Position
	Text   string `parser:"@String"`
}

// Pin binds a net to a pin, by position or by the pin's name (anode=a).
type Pin struct {
	Pos   lexer.Position
	Label *Name `parser:"( @@ \"=\" )?"`
	Net   *Name `parser:"@@"`
}

// Assign is a parameter binding (NAME = VALUE) or, in a block header, a
// parameter with an optional default.
type Assign struct {
	Pos    lexer.Position
	EndPos lexer.Position
	Name   *Name  `parser:"@@"`
	Value  *Value `parser:"( \"=\" @@ )?"`
}

// Value is a quantity (12 V, 4.7kΩ, 4k7, R47), a switch state, a
// parameter name standing alone (rtop), or an expression in parentheses
// ((vs - vdrop) / i). A quantity starts with a digit, a sign or the R of a
// code, so a lone name cannot be mistaken for one; attribute words are no
// parameter names, so it cannot be mistaken for the next attribute either.
type Value struct {
	Pos   lexer.Position
	Neg   bool   `parser:"( @\"-\"?"`
	Num   string `parser:"  @Number"`
	Unit  string `parser:"  @Unit? )"`
	Code  string `parser:"| @Code"`
	Word  string `parser:"| @(\"open\" | \"closed\")"`
	Param *Ref   `parser:"| @@"`
	Expr  *Expr  `parser:"| \"(\" @@ \")\""`
}

// Ref is a parameter name used as a value or inside an expression. Only a
// plain name (an Ident token) can be one: a word that reads as a unit, a
// resistor code or an attribute word means that, not a parameter.
type Ref struct {
	Pos  lexer.Position
	Text string `parser:"@Ident"`
}

// Attr is an attribute: a word, values separated by commas, for vf an
// operating point after "at", and for derate the end of a range after
// "to".
type Attr struct {
	Pos    lexer.Position
	Key    *Name    `parser:"@@"`
	Values []*Value `parser:"( @@ ( \",\" @@ )* )?"`
	At     *Value   `parser:"( \"at\" @@ )?"`
	To     *Value   `parser:"( \"to\" @@ )?"`
}

// Expr is a sum of terms.
type Expr struct {
	Pos    lexer.Position
	EndPos lexer.Position
	First  *Term     `parser:"@@"`
	Rest   []*OpTerm `parser:"@@*"`
}

// OpTerm is "+ term" or "- term".
type OpTerm struct {
	Op   string `parser:"@(\"+\" | \"-\")"`
	Term *Term  `parser:"@@"`
}

// Term is a product of factors.
type Term struct {
	First *Factor     `parser:"@@"`
	Rest  []*OpFactor `parser:"@@*"`
}

// OpFactor is "* factor" or "/ factor".
type OpFactor struct {
	Op     string  `parser:"@(\"*\" | \"/\")"`
	Factor *Factor `parser:"@@"`
}

// Factor is a quantity, a resistor code, a parameter name, a negation or
// a parenthesised expression.
type Factor struct {
	Pos    lexer.Position
	EndPos lexer.Position
	Neg    *Factor `parser:"  \"-\" @@"`
	Num    string  `parser:"| ( @Number"`
	Unit   string  `parser:"    @Unit? )"`
	Code   string  `parser:"| @Code"`
	Param  *Ref    `parser:"| @@"`
	Sub    *Expr   `parser:"| \"(\" @@ \")\""`
}
