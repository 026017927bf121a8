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
package grammar

import (
	"errors"
	"fmt"
	"strings"

	"github.com/alecthomas/participle/v2"
	"github.com/alecthomas/participle/v2/lexer"
)

var parser = participle.MustBuild[Statement](
	participle.Lexer(Lexer),
	participle.Elide("Comment"),
	participle.UseLookahead(3),
)

// File is a parsed source file.
type File struct {
	Name     string
	Stmts    []*Statement
	Comments []Comment
	Errors   []*SyntaxError
}

// Comment is a comment with its position, kept for suppression comments.
type Comment struct {
	Offset int
	Line   int
	Text   string // from the # to the end of the line
}

// SyntaxError is a line that does not parse.
type SyntaxError struct {
	Offset int // byte offset of the offending token
	End    int
	Line   int
	Msg    string
}

func (e *SyntaxError) Error() string { return fmt.Sprintf("%d: %s", e.Line, e.Msg) }

// Parse reads a whole file. It never fails: lines that do not parse are
// recorded in File.Errors and skipped.
func Parse(name string, src []byte) *File {
	f := &File{Name: name}
	var toks []lexer.Token
	line := 1
	for off := 0; off <= len(src); {
		end := off
		for end < len(src) && src[end] != '\n' {
			end++
		}
		var comments []lexer.Token
		toks = appendLine(toks[:0], src, off, end, line, &comments)
		for _, c := range comments {
			f.Comments = append(f.Comments, Comment{Offset: c.Pos.Offset, Line: line, Text: c.Value})
		}
		if len(toks) > 0 {
			eol := lexer.Position{Offset: end, Line: line, Column: end - off + 1}
			toks = append(toks, lexer.Token{Type: TokEOF, Pos: eol})
			if st, err := parseLine(toks); err != nil {
				f.Errors = append(f.Errors, err)
			} else {
				// End the statement at its last token, not at a trailing
				// comment or the end of the line.
				last := toks[len(toks)-2]
				st.EndPos = last.Pos
				st.EndPos.Offset += len(last.Value)
				st.EndPos.Column += len(last.Value)
				if st.Part != nil {
					st.Part.EndPos = st.EndPos
				}
				f.Stmts = append(f.Stmts, st)
			}
		}
		off = end + 1
		line++
	}
	return f
}

func parseLine(toks []lexer.Token) (*Statement, *SyntaxError) {
	pl, err := lexer.Upgrade(&sliceLexer{toks: toks})
	if err != nil {
		return nil, &SyntaxError{Offset: toks[0].Pos.Offset, Line: toks[0].Pos.Line, Msg: err.Error()}
	}
	st, err := parser.ParseFromLexer(pl)
	if err == nil {
		return st, nil
	}
	return nil, syntaxError(err, toks)
}

// syntaxError words a participle error in the project's terms.
func syntaxError(err error, toks []lexer.Token) *SyntaxError {
	pos := toks[0].Pos
	msg := err.Error()
	var unexpected *participle.UnexpectedTokenError
	var perr participle.Error
	switch {
	case errors.As(err, &unexpected):
		pos = unexpected.Unexpected.Pos
		msg = describeUnexpected(unexpected.Unexpected, unexpected.Expect)
	case errors.As(err, &perr):
		pos = perr.Position()
		msg = perr.Message()
		for _, t := range toks {
			if t.Pos.Offset == pos.Offset {
				if strings.HasPrefix(msg, "unexpected token") {
					msg = describeUnexpected(t, "")
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
	return &SyntaxError{Offset: pos.Offset, End: end, Line: pos.Line, Msg: msg}
}

func describeUnexpected(t lexer.Token, expect string) string {
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
