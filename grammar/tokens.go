package grammar

import "github.com/alecthomas/participle/v2/lexer"

// LexLine returns the tokens of one line of source (without its newline),
// comments included, for tools that work on the text rather than the tree:
// the formatter and the language server. Offsets are relative to line and
// Pos.Line is lineNo. The lexer is the parser's own, so the tokens are
// exactly the ones the parser sees; a line with more than MaxLineTokens
// tokens ends in one TokInvalid token.
func LexLine(line string, lineNo int) []lexer.Token {
	return appendLine(nil, line, 0, len(line), lineNo, nil, nil)
}
