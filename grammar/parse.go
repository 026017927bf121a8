// Package grammar reads the nodal circuit language: a hand-written lexer,
// the participle grammar that defines the language, and the syntax tree
// with byte positions.
//
// # Statements
//
// The language has one statement per line, so the parser works line by
// line: each line is lexed and parsed on its own. A syntax error costs only
// its line, and the rest of the file is still read and checked. It also
// bounds the work per parse call, which keeps participle's lookahead cheap
// on files of millions of lines.
//
// # Positions
//
// Offsets, lines and columns are counted in bytes; columns start at 1. The
// lexer is ours, so no conversion from participle's rune columns is needed:
// every lexer.Position the tree holds was made here.
//
// Every position the package hands out is an Offset, a byte offset into the
// parsed file that Offset.At turns into the diag.Pos of a file set: syntax
// errors, comments, and the Start and End of the tree's nodes. The nodes'
// Pos and EndPos fields are participle's lexer.Position only because
// participle fills fields of that type and no other; they are the grammar's
// business, and later stages read positions through Start and End.
package grammar

import (
	"errors"
	"fmt"
	"strings"
	"sync"
	"unicode/utf8"
	"unsafe"

	"github.com/alecthomas/participle/v2"
	"github.com/alecthomas/participle/v2/lexer"

	"nodal/units"
)

// parser is the grammar's parser. Building it takes about a millisecond
// and 0.6 MB, more than the whole check of a small design spends on
// parsing, so it is built the first time a line needs it: the fast path
// (fast.go) reads part lines and the design, ground and include lines
// itself, and a design made only of those is read without it.
var parser = sync.OnceValue(func() *participle.Parser[Statement] {
	return participle.MustBuild[Statement](
		participle.Lexer(Lexer),
		participle.Elide("Comment"),
		participle.UseLookahead(3),
	)
})

// prefetch starts building the grammar's parser on its own goroutine, at
// most once, as soon as the lexer meets a line that will need it, so that
// the build overlaps the rest of the file's reading.
var prefetch sync.Once

func prefetchParser() { prefetch.Do(func() { go parser() }) }

// needsGrammar reports whether a line starting with t is certain to be
// read by the grammar's parser: a statement the fast path does not read
// (port, ambient, block) or a block's closing brace.
func needsGrammar(t *lexer.Token) bool {
	switch t.Type {
	case TokKeyword:
		return t.Value != "design" && t.Value != "ground" && t.Value != "include"
	case TokPunct:
		return t.Value == "}"
	}
	return false
}

// File is a parsed source file.
type File struct {
	Name     string
	Stmts    []*Statement
	Comments []Comment
	Errors   []*SyntaxError

	plain      []plainChunk // ParsePlain's plain part lines, in order (plain.go)
	plainFirst []int        // the index of each chunk's first line
	plainN     int
	src        string // the text the plain lines' offsets point into
}

// Comment is a comment with its position, kept for suppression comments.
type Comment struct {
	Pos   Offset // the #
	Line  int
	Text  string // from the # to the end of the line
	Alone bool   // only blanks precede it on its line
}

// SyntaxError is a line that does not parse.
type SyntaxError struct {
	Pos  Offset // the offending token
	End  Offset // just past it; Pos when the error is at a point
	Line int
	Msg  string
	// Words are the names and quoted strings on the line, so that later
	// stages can tell a net the broken line may have used from one that
	// is really alone.
	Words []string
}

func (e *SyntaxError) Error() string { return fmt.Sprintf("%d: %s", e.Line, e.Msg) }

// Parse reads a whole file. It never fails: lines that do not parse are
// recorded in File.Errors and skipped. Lines are read in batches by the
// fast path (fast.go), a large file in pieces on every core (pieces.go);
// the tree is the one ParseReference builds.
func Parse(name string, src []byte) *File {
	return parse(name, string(src), modeFast) // token values are substrings of this one copy
}

// ParseShared is Parse without the copy of src that Parse makes: the texts
// in the tree are substrings of src itself, so src must not change while
// the tree, or anything made from its texts, is in use. On a large design
// the copy is as large as the file.
func ParseShared(name string, src []byte) *File {
	return parse(name, unsafe.String(unsafe.SliceData(src), len(src)), modeFast)
}

// ParsePlain is ParseShared, except that plain part lines (plain.go) are
// kept as small records instead of statements: Stmts holds every other
// statement, and PlainLines, PlainSpan and PlainStatement give the plain
// ones. A tool that walks Stmts alone must not use it.
func ParsePlain(name string, src []byte) *File {
	if len(src) >= 1<<32-1 {
		return ParseShared(name, src) // plain records hold 32-bit offsets
	}
	return parse(name, unsafe.String(unsafe.SliceData(src), len(src)), modePlain)
}

// ParseReference reads a file one line per participle call with the
// grammar alone, without the fast path. It defines what Parse returns.
func ParseReference(name string, src []byte) *File {
	return parse(name, string(src), modeReference)
}

// How parse reads part lines.
type mode uint8

const (
	modeReference mode = iota // the grammar alone, a line at a time
	modeFast                  // the fast path, in batches
	modePlain                 // plain part lines as records, the rest as modeFast
)

// lineSpan is one non-empty line of a batch: its tokens in the batch's
// token slice, ending before the Newline (or EOF) token.
type lineSpan struct {
	from, to int // token indices
	eol      int // index of the token that ends the line
}

// parseRange reads the lines of src that start in [from, to) into f;
// line is the number of the line that starts at from. With last set, the
// line that starts at to (the end of the file) is read too.
func parseRange(f *File, src string, from, to, line int, last bool, m mode) {
	var toks, lineToks []lexer.Token
	var spans []lineSpan
	var comments []lexer.Token
	var tb tokenBuffer
	var words wordCache
	var ch plainChunk
	flush := func() {
		if len(spans) == 0 {
			return
		}
		parseBatch(f, &tb, toks, spans, &lineToks)
		toks, spans = tb.tokens(), spans[:0]
	}
	for off := from; off < to || last && off == to; {
		end := strings.IndexByte(src[off:], '\n')
		if end < 0 {
			end = len(src)
		} else {
			end += off
		}
		comments = comments[:0]
		first := len(toks)
		toks = appendLine(toks, src, off, end, line, &comments, &words)
		for _, c := range comments {
			f.Comments = append(f.Comments, Comment{Pos: Offset(c.Pos.Offset), Line: line, Text: c.Value, Alone: blanksBefore(src, c.Pos.Offset)})
		}
		switch {
		case len(toks) == first:
		case m == modePlain && ch.room(&f.plain) && readPlain(&ch, toks[first:], line, off):
			toks = toks[:first]
		case m != modeReference:
			if needsGrammar(&toks[first]) {
				prefetchParser()
			}
			eol := lexer.Position{Offset: end, Line: line, Column: end - off + 1}
			toks = append(toks, lexer.Token{Type: TokNewline, Pos: eol})
			spans = append(spans, lineSpan{first, len(toks) - 1, len(toks) - 1})
			if len(spans) == batchLines {
				flush()
			}
		default:
			eol := lexer.Position{Offset: end, Line: line, Column: end - off + 1}
			toks = append(toks, lexer.Token{Type: TokEOF, Pos: eol})
			if st, err := parseLine(toks); err != nil {
				f.Errors = append(f.Errors, err)
			} else {
				f.add(st, toks[len(toks)-2])
			}
			toks = toks[:0]
		}
		off = end + 1
		line++
	}
	flush()
	if len(ch.lines) > 0 {
		f.plain = append(f.plain, ch)
	}
}

// add records a parsed statement, or the syntax error of a statement that
// parses but names a net with an empty string. The fast path and the
// grammar both end here, so they agree on it.
func (f *File) add(st *Statement, last lexer.Token) {
	if n := emptyName(st); n != nil {
		se := &SyntaxError{Pos: n.Start(), End: n.End(), Line: n.Pos.Line,
			Msg: "a name cannot be empty: write the net's name between the quotes, or a plain name such as vin"}
		if st.Part != nil {
			for _, pin := range st.Part.Pins {
				se.Words = append(se.Words, pin.Net.Text)
			}
		}
		f.Errors = append(f.Errors, se)
		return
	}
	f.Stmts = append(f.Stmts, finish(st, last))
}

// emptyName returns the first name of st written as "", or nil.
func emptyName(st *Statement) *Name {
	empty := func(n *Name) bool { return n != nil && n.Text == `""` }
	switch {
	case st.Part != nil:
		p := st.Part
		if empty(p.Kind) {
			return p.Kind
		}
		if empty(p.Name) {
			return p.Name
		}
		for _, pin := range p.Pins {
			if empty(pin.Label) {
				return pin.Label
			}
			if empty(pin.Net) {
				return pin.Net
			}
		}
	case st.Ground != nil && empty(st.Ground.Net):
		return st.Ground.Net
	case st.Port != nil:
		for _, n := range st.Port.Nets {
			if empty(n) {
				return n
			}
		}
	case st.Block != nil:
		if empty(st.Block.Name) {
			return st.Block.Name
		}
		for _, n := range st.Block.Pins {
			if empty(n) {
				return n
			}
		}
	case st.Design != nil && empty(st.Design.Name):
		return st.Design.Name
	}
	return nil
}

// finish ends a statement at its last token, not at a trailing comment or
// the end of the line.
func finish(st *Statement, last lexer.Token) *Statement {
	st.EndPos = last.Pos
	st.EndPos.Offset += len(last.Value)
	st.EndPos.Column += len(last.Value)
	if st.Part != nil {
		st.Part.EndPos = st.EndPos
	}
	return st
}

// parseBatch parses the lines of one batch: runs of part lines by the
// fast path, every other line by the grammar on its own.
func parseBatch(f *File, tb *tokenBuffer, toks []lexer.Token, spans []lineSpan, lineToks *[]lexer.Token) {
	eof := toks[len(toks)-1]
	eof.Type = TokEOF
	toks = append(toks, eof)
	pl, err := tb.lexer(toks)
	k := 0
	for err == nil && k < len(spans) {
		if r := readRun(pl); r != nil {
			for _, st := range r.sts {
				f.add(st, toks[spans[k].to-1])
				k++
			}
		}
		if k < len(spans) {
			parseAlone(f, toks, spans[k], lineToks)
			pl.FastForward(lexer.RawCursor(spans[k].eol))
			k++
		}
	}
	for ; k < len(spans); k++ {
		parseAlone(f, toks, spans[k], lineToks)
	}
}

// parseAlone parses one line with the grammar, as ParseReference does.
func parseAlone(f *File, toks []lexer.Token, sp lineSpan, lineToks *[]lexer.Token) {
	lt := append((*lineToks)[:0], toks[sp.from:sp.to]...)
	nl := toks[sp.eol]
	nl.Type = TokEOF
	lt = append(lt, nl)
	*lineToks = lt
	if st, err := parseLine(lt); err != nil {
		f.Errors = append(f.Errors, err)
	} else {
		f.add(st, lt[len(lt)-2])
	}
}

func parseLine(toks []lexer.Token) (*Statement, *SyntaxError) {
	pl, err := lexer.Upgrade(&sliceLexer{toks: toks})
	if err != nil {
		return nil, &SyntaxError{Pos: Offset(toks[0].Pos.Offset), End: Offset(toks[0].Pos.Offset), Line: toks[0].Pos.Line, Msg: err.Error()}
	}
	st, err := parser().ParseFromLexer(pl)
	if err == nil {
		return st, nil
	}
	se := syntaxError(err, toks)
	for _, t := range toks {
		switch t.Type {
		case TokIdent, TokString, TokCode, TokUnit, TokAttrWord:
			se.Words = append(se.Words, t.Value)
		}
	}
	return nil, se
}

// syntaxError words a participle error in the project's terms.
func syntaxError(err error, toks []lexer.Token) *SyntaxError {
	if se := bracedValue(toks); se != nil {
		return se
	}
	if at, expect, ok := explain(toks); ok && at < len(toks) {
		t := toks[at]
		return &SyntaxError{Pos: Offset(t.Pos.Offset), End: Offset(t.Pos.Offset + len(t.Value)), Line: t.Pos.Line, Msg: describeUnexpected(t, expect, afterNumber(toks, t))}
	}
	pos := toks[0].Pos
	msg := err.Error()
	var unexpected *participle.UnexpectedTokenError
	var perr participle.Error
	switch {
	case errors.As(err, &unexpected):
		pos = unexpected.Unexpected.Pos
		msg = describeUnexpected(unexpected.Unexpected, unexpected.Expect, afterNumber(toks, unexpected.Unexpected))
	case errors.As(err, &perr):
		pos = perr.Position()
		msg = perr.Message()
		for _, t := range toks {
			if t.Pos.Offset == pos.Offset {
				if strings.HasPrefix(msg, "unexpected token") {
					msg = describeUnexpected(t, "", afterNumber(toks, t))
				}
				break
			}
		}
	}
	end := pos.Offset
	for _, t := range toks {
		if t.Pos.Offset == pos.Offset {
			end = pos.Offset + len(t.Value)
			break
		}
	}
	return &SyntaxError{Pos: Offset(pos.Offset), End: Offset(end), Line: pos.Line, Msg: msg}
}

// blanksBefore reports whether only blanks precede offset on its line.
func blanksBefore(src string, offset int) bool {
	for i := offset - 1; i >= 0 && src[i] != '\n'; i-- {
		if src[i] != ' ' && src[i] != '\t' && src[i] != '\r' {
			return false
		}
	}
	return true
}

// afterNumber reports whether t follows a number on its line, where a word
// is meant as a unit.
func afterNumber(toks []lexer.Token, t lexer.Token) bool {
	for i := 1; i < len(toks); i++ {
		if toks[i].Pos.Offset == t.Pos.Offset {
			return toks[i-1].Type == TokNumber
		}
	}
	return false
}

// describeUnexpected words an unexpected token; unitPlace says a unit
// would have stood there.
func describeUnexpected(t lexer.Token, expect string, unitPlace bool) string {
	var what string
	switch t.Type {
	case TokEOF:
		what = "end of line"
	case TokInvalid:
		switch {
		case strings.HasPrefix(t.Value, "\""):
			return "string is not closed: add a \" before the end of the line"
		case t.Value == "…":
			return fmt.Sprintf("line has more than %d tokens", MaxLineTokens)
		case strings.HasSuffix(t.Value, "…"):
			return fmt.Sprintf("token longer than %d bytes", MaxTokenBytes)
		}
		if fix := units.CaseFix(t.Value); fix != "" && unitPlace {
			return fmt.Sprintf("%q is not a unit; %s", t.Value, fix)
		}
		what = fmt.Sprintf("%q, which is not valid here (names use A-Z, a-z, 0-9 and _; other text belongs in double quotes)", t.Value)
	default:
		what = fmt.Sprintf("%q", t.Value)
	}
	msg := "unexpected " + what
	if expect != "" {
		msg += "; expected " + expect
	}
	if v := strings.ToLower(t.Value); v == "meg" || strings.HasPrefix(v, "meg") {
		msg += "; write M for mega (1 MΩ) and m for milli (1 mA)"
	}
	return msg
}

// bracedValue finds a value written in braces ({rtop}, {2 * rtop}), which
// the language does not have: braces only open and close a block. The
// message shows the value as it is written instead. It returns nil when
// every brace on the line is in its place.
func bracedValue(toks []lexer.Token) *SyntaxError {
	n := len(toks)
	if n > 0 && toks[n-1].Type == TokEOF {
		n--
	}
	if n > 0 && toks[0].Type == TokKeyword && toks[0].Value == "block" && punctIs(toks[n-1], "{") {
		n-- // the brace that opens the block
	}
	for i := 0; i < n; i++ {
		if !punctIs(toks[i], "{") || i == 0 {
			continue
		}
		j, depth := i+1, 1
		for ; j < n; j++ {
			if punctIs(toks[j], "{") {
				depth++
			} else if punctIs(toks[j], "}") {
				depth--
				if depth == 0 {
					break
				}
			}
		}
		inner := toks[i+1 : min(j, n)]
		end := toks[min(j, n-1)]
		text := joinTokens(inner)
		const how = "a quantity or a lone parameter stands as it is, and an expression is written in parentheses"
		var msg string
		switch {
		case len(inner) == 0 || !utf8.ValidString(text): // quote only text
			msg = "braces do not hold values: " + how
		case standsAlone(inner):
			msg = "braces do not hold values: write " + text + "; " + how
		default:
			msg = "braces do not hold values: write (" + text + "); " + how
		}
		return &SyntaxError{Pos: Offset(toks[i].Pos.Offset), End: Offset(end.Pos.Offset + len(end.Value)), Line: toks[i].Pos.Line, Msg: msg}
	}
	return nil
}

// standsAlone reports whether toks are one value that needs no
// parentheses: a parameter name, a code, or a number with its unit.
func standsAlone(toks []lexer.Token) bool {
	if len(toks) > 0 && punctIs(toks[0], "-") {
		toks = toks[1:]
	}
	switch {
	case len(toks) == 1:
		return toks[0].Type == TokIdent || toks[0].Type == TokCode || toks[0].Type == TokNumber
	case len(toks) == 2:
		return toks[0].Type == TokNumber && toks[1].Type == TokUnit
	}
	return false
}

// joinTokens writes tokens back as text, with a space wherever the source
// had blanks between them.
func joinTokens(toks []lexer.Token) string {
	var b strings.Builder
	for i, t := range toks {
		if i > 0 && t.Pos.Offset > toks[i-1].Pos.Offset+len(toks[i-1].Value) {
			b.WriteByte(' ')
		}
		b.WriteString(t.Value)
	}
	return b.String()
}
