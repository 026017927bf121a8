package grammar

import "github.com/alecthomas/participle/v2/lexer"

// TokenType tells tokens apart: TokIdent, TokPunct and the other Tok
// constants. It is participle's type because the parser reads the same
// tokens.
type TokenType = lexer.TokenType

// Token is one token of a line, as LexLine gives it.
type Token struct {
	Type  TokenType
	Value string
	Pos   Offset // from the start of the line
}

// LexLine returns the tokens of one line of source (without its newline),
// comments included, for tools that work on the text rather than the tree:
// the formatter and the language server. The lexer is the parser's own, so
// the tokens are exactly the ones the parser sees; a line with more than
// MaxLineTokens tokens ends in one TokInvalid token.
func LexLine(line string) []Token {
	lt := appendLine(nil, line, 0, len(line), 1, nil, nil)
	toks := make([]Token, len(lt))
	for i, t := range lt {
		toks[i] = Token{Type: t.Type, Value: t.Value, Pos: Offset(t.Pos.Offset)}
	}
	return toks
}

// Line returns the statement's line number, counted from 1.
func (s *Statement) Line() int { return s.Pos.Line }
