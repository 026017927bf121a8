package grammar

// explain.go: what a rejected line was expected to hold. Participle reports
// the token it could not use, but after backtracking over optional groups it
// rarely knows what would have fitted. The statement shapes are few and
// fixed, so a small walk over the line's tokens finds the first place the
// line leaves its shape and names what belongs there ("expected , or )").

import "github.com/alecthomas/participle/v2/lexer"

// isName reports whether t can be a name in the grammar: a word, a unit or
// code that is also a word, an attribute word, or a quoted string.
func nameLike(t lexer.Token) bool {
	switch t.Type {
	case TokIdent, TokUnit, TokCode, TokAttrWord, TokString:
		return true
	}
	return false
}

func punctIs(t lexer.Token, s string) bool { return t.Type == TokPunct && t.Value == s }

type walker struct {
	toks []lexer.Token
	i    int
}

func (w *walker) peek() lexer.Token {
	if w.i < len(w.toks) {
		return w.toks[w.i]
	}
	return lexer.Token{Type: TokEOF}
}

func (w *walker) eol() bool { return w.peek().Type == TokEOF }

// explain returns the index of the first token where the line leaves the
// shape of its statement, and what was expected there. ok is false when the
// walk finds nothing wrong (or the statement is one it does not know, such
// as a block header), and the caller falls back to participle's report.
func explain(toks []lexer.Token) (at int, expect string, ok bool) {
	w := &walker{toks: toks}
	fail := func(e string) (int, string, bool) { return w.i, e, true }
	t := w.peek()
	switch {
	case t.Type == TokKeyword && t.Value == "design":
		w.i++
		if !nameLike(w.peek()) || w.peek().Type == TokString {
			return fail("the design's name (design NAME \"title\")")
		}
		w.i++
		if w.peek().Type == TokString {
			w.i++
		}
		if !w.eol() {
			return fail("end of line after the design header")
		}
		return 0, "", false
	case t.Type == TokKeyword && t.Value == "ground":
		w.i++
		if !nameLike(w.peek()) {
			return fail("the name of the ground net (ground gnd)")
		}
		w.i++
		if !w.eol() {
			return fail("end of line: ground names one net")
		}
		return 0, "", false
	case t.Type == TokKeyword && t.Value == "port":
		w.i++
		for {
			if !nameLike(w.peek()) {
				return fail("a net name")
			}
			w.i++
			if w.eol() {
				return 0, "", false
			}
			if !punctIs(w.peek(), ",") {
				break
			}
			w.i++
		}
		// A drive: a value, a range of values, attributes.
		if t := w.peek(); t.Type == TokIdent && t.Value == "to" {
			return fail("the bottom of the range before to (port vin 4.5 V to 5.5 V)")
		}
		if !w.startsValue() {
			return fail(", or end of line, or what drives the port (port vin 5 V series 50 Ω, port vin 4.5 V to 5.5 V)")
		}
		if at, e, ok := w.value(true); ok {
			return at, e, ok
		}
		if w.peek().Type == TokIdent && w.peek().Value == "to" {
			w.i++
			if !w.startsValue() {
				return fail("the top of the range after to (port vin 4.5 V to 5.5 V)")
			}
			if at, e, ok := w.value(true); ok {
				return at, e, ok
			}
		}
		return w.attrs(true)
	case t.Type == TokKeyword && t.Value == "include":
		w.i++
		if w.peek().Type != TokString {
			return fail("a file name in double quotes")
		}
		w.i++
		if !w.eol() {
			return fail("end of line after the file name")
		}
		return 0, "", false
	case t.Type == TokKeyword && t.Value == "ambient":
		w.i++
		for k := 0; k < 2; k++ {
			if !startsQuantity(w.peek()) {
				return fail("a temperature (ambient 25 °C, or ambient 0 °C to 50 °C)")
			}
			if punctIs(w.peek(), "-") {
				w.i++
			}
			if w.peek().Type != TokNumber {
				return fail("a temperature (ambient 25 °C, or ambient 0 °C to 50 °C)")
			}
			w.i++
			if w.peek().Type == TokUnit {
				w.i++
			}
			if w.eol() {
				return 0, "", false
			}
			if k == 1 || w.peek().Value != "to" {
				return fail("\"to\" and the top of the range, or end of line")
			}
			w.i++
		}
		return 0, "", false
	case t.Type == TokKeyword && t.Value == "block":
		return w.blockHeader()
	case punctIs(t, "}"):
		w.i++
		if !w.eol() {
			return fail("end of line after }")
		}
		return 0, "", false
	case nameLike(t) && t.Type != TokString:
		return w.part()
	}
	return 0, "a statement: a part (KIND NAME (NET, NET) VALUE ...), ground, port, ambient or design", true
}

func (w *walker) part() (int, string, bool) {
	fail := func(e string) (int, string, bool) { return w.i, e, true }
	kind := w.peek().Value
	w.i++
	if punctIs(w.peek(), "(") {
		return fail("a part name after the kind " + kind + " (KIND NAME (NET, NET) VALUE)")
	}
	if !nameLike(w.peek()) || w.peek().Type == TokString {
		return fail("a part name after " + kind)
	}
	w.i++
	if !punctIs(w.peek(), "(") {
		return fail("( and the part's nets")
	}
	w.i++
	if e := w.nameList("a net name", true); e != "" {
		return fail(e)
	}
	if punctIs(w.peek(), "[") {
		return 0, "", false // block parameters: the hierarchy's grammar
	}
	// The value.
	hasValue := w.startsValue()
	if at, e, ok := w.value(false); ok {
		return at, e, ok
	}
	return w.attrs(hasValue)
}

// attrs walks a statement's attributes up to the end of the line;
// hasValue says a value came before them.
func (w *walker) attrs(hasValue bool) (int, string, bool) {
	fail := func(e string) (int, string, bool) { return w.i, e, true }
	lastKey, lastHadValues := "", false
	for !w.eol() {
		t := w.peek()
		if !nameLike(t) || t.Type == TokString {
			if lastHadValues && w.startsValue() {
				return fail("a comma between the values of " + lastKey + " (rated 0.5 W, 50 V)")
			}
			if !hasValue {
				return fail("a value, an attribute (" + attributeList + ") or end of line")
			}
			return fail("an attribute (" + attributeList + ") or end of line")
		}
		key := t.Value
		w.i++
		lastKey, lastHadValues = key, key == "rated" && w.startsValue() // rated alone takes several values
		if w.startsValue() {
			for {
				if at, e, ok := w.value(true); ok {
					return at, e, ok
				}
				if !punctIs(w.peek(), ",") {
					break
				}
				w.i++
				if !w.startsValue() {
					return fail("another value after , in " + key)
				}
			}
		}
		if w.peek().Type == TokAttrWord && w.peek().Value == "at" && key != "at" {
			w.i++
			if !w.startsValue() {
				return fail("the current after at (vf 2.0 V at 20 mA)")
			}
			if at, e, ok := w.value(true); ok {
				return at, e, ok
			}
		}
	}
	return 0, "", false
}

func (w *walker) startsValue() bool {
	t := w.peek()
	return t.Type == TokNumber || t.Type == TokCode || t.Type == TokIdent || punctIs(t, "-") || punctIs(t, "(") ||
		t.Type == TokAttrWord && (t.Value == "open" || t.Value == "closed")
}

// nameList walks the names of a list just opened by "(" up to and past its
// ")": what, one after another, separated by commas; with named, each may
// be "name = name" (a pin bound by name). It returns what was expected
// where the list goes wrong, or "".
func (w *walker) nameList(what string, named bool) string {
	if punctIs(w.peek(), ")") {
		w.i++
		return ""
	}
	for {
		if !nameLike(w.peek()) {
			return what
		}
		w.i++
		if named && punctIs(w.peek(), "=") {
			w.i++
			if !nameLike(w.peek()) {
				return what + " after ="
			}
			w.i++
		}
		if punctIs(w.peek(), ")") {
			w.i++
			return ""
		}
		if !punctIs(w.peek(), ",") {
			return ", or )"
		}
		w.i++
	}
}

// blockHeader walks block NAME (PIN, ...) [PARAM = VALUE, ...] {
func (w *walker) blockHeader() (int, string, bool) {
	fail := func(e string) (int, string, bool) { return w.i, e, true }
	w.i++
	if !nameLike(w.peek()) || w.peek().Type == TokString {
		return fail("the block's name (block NAME (PIN, ...) {)")
	}
	w.i++
	if !punctIs(w.peek(), "(") {
		return fail("( and the block's pins")
	}
	w.i++
	if e := w.nameList("a pin name", false); e != "" {
		return fail(e)
	}
	if punctIs(w.peek(), "[") {
		w.i++
		for !punctIs(w.peek(), "]") {
			t := w.peek()
			if t.Type == TokKeyword {
				return fail("a parameter name; " + ParamNameTrouble(t.Value) + ": choose another name")
			}
			if !nameLike(t) {
				return fail("a parameter name")
			}
			w.i++
			if punctIs(w.peek(), "=") {
				w.i++
				if !w.startsValue() {
					return fail("a value after = (a quantity, a parameter or an expression in parentheses)")
				}
				if at, e, ok := w.value(true); ok {
					return at, e, ok
				}
			}
			if punctIs(w.peek(), "]") {
				break
			}
			if !punctIs(w.peek(), ",") {
				return fail(", or ]")
			}
			w.i++
		}
		w.i++
	}
	if !punctIs(w.peek(), "{") {
		return fail("{ at the end of the block's header line")
	}
	w.i++
	if !w.eol() {
		return fail("end of line after {: the block's statements go on the lines below")
	}
	return 0, "", false
}

// value walks an optional value; with required set the value must be there.
// It reports ok when it found something wrong.
func (w *walker) value(required bool) (int, string, bool) {
	fail := func(e string) (int, string, bool) { return w.i, e, true }
	t := w.peek()
	switch {
	case punctIs(t, "-"):
		w.i++
		if w.peek().Type != TokNumber {
			return fail("a number after -")
		}
		w.i++
		if w.peek().Type == TokUnit {
			w.i++
		}
	case t.Type == TokNumber:
		w.i++
		if w.peek().Type == TokUnit {
			w.i++
		}
	case t.Type == TokCode, t.Type == TokIdent, t.Type == TokAttrWord && (t.Value == "open" || t.Value == "closed"):
		w.i++
	case punctIs(t, "("):
		// an expression: its inside is left to participle
		depth := 0
		for !w.eol() {
			if punctIs(w.peek(), "(") {
				depth++
			} else if punctIs(w.peek(), ")") {
				depth--
				if depth == 0 {
					break
				}
			}
			w.i++
		}
		if w.eol() {
			return fail(") to close the expression")
		}
		w.i++
	default:
		if required {
			return fail("a value")
		}
	}
	return 0, "", false
}

// startsQuantity reports whether t can begin a plain quantity: a number or
// a minus sign.
func startsQuantity(t lexer.Token) bool {
	return t.Type == TokNumber || punctIs(t, "-")
}
