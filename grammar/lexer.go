package grammar

import (
	"io"
	"sort"
	"strings"
	"unicode"
	"unicode/utf8"

	"github.com/alecthomas/participle/v2/lexer"

	"nodal/units"
)

// Token types. The lexer is written by hand rather than generated from
// regular expressions: it is the hot loop on files of millions of lines,
// and a hand-written scanner also makes the byte-counted columns explicit.
const (
	TokEOF lexer.TokenType = lexer.EOF - iota
	TokNewline
	TokComment
	TokIdent    // a name: [A-Za-z_][A-Za-z0-9_]*
	TokKeyword  // a statement keyword: design ground port include block
	TokAttrWord // an attribute word: tol rated vf at ideality series dcr tempco derate theta tjmax capacity breakdown dropout quiescent limit efficiency input open closed
	TokUnit     // a unit with optional prefix standing alone: Ω kΩ mA V %, °C, K/W
	TokCode     // an IEC 60062 resistor code starting with R: R47
	TokNumber   // a number with any letters glued to it: 12, 4.7k, 4k7, 100nF
	TokString   // a double-quoted string, quotes included
	TokPunct    // ( ) , = [ ] { } + - * /
	TokInvalid  // bytes that start no token: the parser rejects them with a position
)

var symbols = map[string]lexer.TokenType{
	"EOF": TokEOF, "Newline": TokNewline, "Comment": TokComment, "Ident": TokIdent,
	"Keyword": TokKeyword, "AttrWord": TokAttrWord, "Unit": TokUnit, "Code": TokCode,
	"Number": TokNumber, "String": TokString, "Punct": TokPunct, "Invalid": TokInvalid,
}

// Keywords that begin statements. "block" and "include" belong to the
// hierarchy; all are reserved so no design can use them as names.
var keywords = map[string]bool{
	"design": true, "ground": true, "port": true, "include": true, "block": true,
	"ambient": true,
}

// Attribute words, and the two switch states. Every attribute a kind takes
// is one (circuit's TestAttributesAreAttributeWords checks it): a word in
// a value's place that is not one is read as a parameter standing alone.
var attrWords = map[string]bool{
	"tol": true, "rated": true, "vf": true, "at": true, "ideality": true,
	"series": true, "dcr": true, "open": true, "closed": true,
	"tempco": true, "derate": true, "theta": true, "tjmax": true, "capacity": true,
	"breakdown": true, "dropout": true, "quiescent": true, "limit": true,
	"efficiency": true, "input": true,
}

// byteOrderMark is U+FEFF in UTF-8, which some editors write at the start
// of a file.
const byteOrderMark = "\ufeff"

// attributeList names the attributes for messages, commonest first: the
// attribute words but at and the switch states.
const attributeList = "tol, rated, vf, ideality, series, dcr, tempco, derate, theta, tjmax, capacity, breakdown, dropout, quiescent, limit, efficiency, input"

// MaxLineTokens bounds the tokens of one line; a longer line is a syntax
// error rather than a reason to allocate without limit.
const MaxLineTokens = 4096

// MaxTokenBytes bounds one token; a longer one is rejected as invalid.
const MaxTokenBytes = 4096

// definition is the participle lexer.Definition of the language.
type definition struct{}

// Lexer is the language's lexer definition, for participle.
var Lexer lexer.Definition = definition{}

func (definition) Symbols() map[string]lexer.TokenType { return symbols }

func (definition) Lex(filename string, r io.Reader) (lexer.Lexer, error) {
	b, err := io.ReadAll(r)
	if err != nil {
		return nil, err
	}
	src := string(b)
	var words wordCache
	var toks []lexer.Token
	line := 1
	for off := 0; off < len(src); {
		end := off
		for end < len(src) && src[end] != '\n' {
			end++
		}
		toks = appendLine(toks, src, off, end, line, nil, &words)
		if end < len(src) {
			toks = append(toks, lexer.Token{Type: TokNewline, Value: "\n", Pos: lexer.Position{Filename: filename, Offset: end, Line: line, Column: end - off + 1}})
		}
		off = end + 1
		line++
	}
	toks = append(toks, lexer.Token{Type: TokEOF, Pos: lexer.Position{Filename: filename, Offset: len(src), Line: line}})
	return &sliceLexer{toks: toks}, nil
}

// sliceLexer hands out tokens that were already scanned.
type sliceLexer struct {
	toks []lexer.Token
	i    int
}

func (l *sliceLexer) Next() (lexer.Token, error) {
	if l.i >= len(l.toks) {
		return lexer.Token{Type: TokEOF}, nil
	}
	t := l.toks[l.i]
	l.i++
	return t, nil
}

func isWordStart(r rune) bool { return r == '_' || unicode.IsLetter(r) }
func isWordPart(r rune) bool  { return r == '_' || unicode.IsLetter(r) || unicode.IsDigit(r) }

// appendLine scans src[off:end] (one line, without its newline) and appends
// its tokens. Token values are substrings of src, so scanning allocates
// nothing but the growth of toks. Columns count bytes from 1. Comments are kept as tokens so
// that suppression comments can be read; the parser elides them. When more
// than MaxLineTokens tokens are found, the rest of the line becomes one
// TokInvalid token.
func appendLine(toks []lexer.Token, src string, off, end, line int, comments *[]lexer.Token, words *wordCache) []lexer.Token {
	start := len(toks)
	i := off
	if i == 0 && strings.HasPrefix(src[:end], byteOrderMark) {
		i += len(byteOrderMark) // a byte-order mark opening the file is no token
	}
	for i < end {
		c := src[i]
		if c == ' ' || c == '\t' || c == '\r' || c == '\f' || c == '\v' {
			i++
			continue
		}
		pos := lexer.Position{Offset: i, Line: line, Column: i - off + 1}
		if len(toks)-start >= MaxLineTokens {
			toks = append(toks, lexer.Token{Type: TokInvalid, Value: "…", Pos: pos})
			return toks
		}
		j := i + 1
		typ := TokInvalid
		switch {
		case c == '#':
			t := lexer.Token{Type: TokComment, Value: src[i:end], Pos: pos}
			if comments != nil {
				*comments = append(*comments, t)
			} else {
				toks = append(toks, t)
			}
			return toks
		case c == '"':
			for j < end && src[j] != '"' {
				j++
			}
			if j < end {
				j++
				typ = TokString
			} else {
				typ = TokInvalid // unterminated: reported at its opening quote
			}
		case c >= '0' && c <= '9' || c == '.' && i+1 < end && src[i+1] >= '0' && src[i+1] <= '9':
			j = scanNumber(src, i, end)
			typ = TokNumber
		case c < utf8.RuneSelf && isPunct(c):
			typ = TokPunct
		default:
			r, size := utf8.DecodeRuneInString(src[i:end])
			if r == utf8.RuneError && size <= 1 {
				// invalid UTF-8: one token for the run of bad bytes
				for j < end {
					r2, s2 := utf8.DecodeRuneInString(src[j:end])
					if r2 != utf8.RuneError || s2 > 1 {
						break
					}
					j++
				}
				break
			}
			j = i + size
			if r == '%' {
				typ = TokUnit
				break
			}
			if !isWordStart(r) && r != '°' {
				break
			}
			for j < end {
				if c := src[j]; c < utf8.RuneSelf {
					if !(c == '_' || c >= 'a' && c <= 'z' || c >= 'A' && c <= 'Z' || c >= '0' && c <= '9') {
						break
					}
					j++
					continue
				}
				r2, s2 := utf8.DecodeRuneInString(src[j:end])
				if !isWordPart(r2) && r2 != '°' {
					break
				}
				j += s2
			}
			if k := compoundEnd(src, i, j, end); k > j {
				j, typ = k, TokUnit
				break
			}
			typ = words.classify(src[i:j])
		}
		if j-i > MaxTokenBytes {
			// a token this long is junk; keep a short prefix for the message
			toks = append(toks, lexer.Token{Type: TokInvalid, Value: src[i:i+32] + "…", Pos: pos})
			i = j
			continue
		}
		toks = append(toks, lexer.Token{Type: typ, Value: src[i:j], Pos: pos})
		i = j
	}
	return toks
}

func isPunct(c byte) bool {
	switch c {
	case '(', ')', ',', '=', '[', ']', '{', '}', '+', '-', '*', '/':
		return true
	}
	return false
}

// scanNumber returns the end of a number starting at i: digits, a decimal
// point, an exponent, and any letters, digits or % glued to it (4.7kΩ, 4k7).
func scanNumber(src string, i, end int) int {
	j := scanDigits(src, i, end)
	u := j
	for j < end {
		if src[j] == '%' {
			j++
			continue
		}
		if c := src[j]; c < utf8.RuneSelf {
			if !(c == '_' || c >= 'a' && c <= 'z' || c >= 'A' && c <= 'Z' || c >= '0' && c <= '9') {
				break
			}
			j++
			continue
		}
		r, s := utf8.DecodeRuneInString(src[j:end])
		if !isWordPart(r) && r != '°' || r == utf8.RuneError {
			break
		}
		j += s
	}
	return compoundEnd(src, u, j, end)
}

// compoundEnd returns the end of a unit written with a slash (K/W, ppm/K,
// °C/W) whose first part is src[u:j] and that goes on at j with "/"; or j
// when there is none. Only the units of units.IsCompound are read this
// way, so an expression's division is never swallowed.
func compoundEnd(src string, u, j, end int) int {
	if j >= end || src[j] != '/' || j == u {
		return j
	}
	k := j + 1
	for k < end {
		r, s := utf8.DecodeRuneInString(src[k:end])
		if !(r == '°' || r < utf8.RuneSelf && (r >= 'a' && r <= 'z' || r >= 'A' && r <= 'Z')) {
			break
		}
		k += s
	}
	if units.IsCompound(src[u:k]) {
		return k
	}
	return j
}

// scanDigits returns the end of the digits, decimal point and exponent of
// a number starting at i.
func scanDigits(src string, i, end int) int {
	j := i
	for j < end && (src[j] >= '0' && src[j] <= '9' || src[j] == '.') {
		j++
	}
	if j < end && (src[j] == 'e' || src[j] == 'E') {
		k := j + 1
		if k < end && (src[k] == '+' || src[k] == '-') {
			k++
		}
		if k < end && src[k] >= '0' && src[k] <= '9' {
			for k < end && src[k] >= '0' && src[k] <= '9' {
				k++
			}
			j = k
		}
	}
	return j
}

// wordCache remembers how the short words of one file were classified:
// the few that are neither plain names nor long (gnd, mΩ, kΩ, tol) recur on
// most lines and would otherwise go through the keyword and unit tables
// every time. Its size is bounded.
type wordCache struct {
	m map[string]lexer.TokenType
}

const maxCachedWords = 1024

func (c *wordCache) classify(w string) lexer.TokenType {
	if c == nil || len(w) > maxUnitBytes {
		return classifyWord(w)
	}
	if plainName(w) {
		return TokIdent // decided without the tables: not worth a slot
	}
	if t, ok := c.m[w]; ok {
		return t
	}
	t := classifyWord(w)
	if c.m == nil {
		c.m = make(map[string]lexer.TokenType)
	}
	if len(c.m) < maxCachedWords {
		c.m[w] = t
	}
	return t
}

// maxUnitBytes bounds the length of a unit word: a prefix of at most two
// bytes (µ) and a symbol of at most three (ohm, the ohm sign U+2126).
// Longer words (resistor, capacitor) skip the unit tables.
const maxUnitBytes = 5

// plainName reports whether w is a plain ASCII name with a digit or an
// underscore in it (n12_7, r3) that does not start with R: no keyword,
// attribute word or unit has a digit or an underscore, and only a word
// starting with R can be a code, so such a word is a name.
func plainName(w string) bool {
	digitOrUnderscore := false
	for i := 0; i < len(w); i++ {
		c := w[i]
		switch {
		case c >= '0' && c <= '9' || c == '_':
			digitOrUnderscore = true
		case c >= 'a' && c <= 'z' || c >= 'A' && c <= 'Z':
		default:
			return false
		}
	}
	return digitOrUnderscore && w[0] != 'R'
}

func classifyWord(w string) lexer.TokenType {
	// Most words are plain names (n12_7, r3): decided without the table
	// lookups.
	if plainName(w) {
		return TokIdent
	}
	switch {
	case keywords[w]:
		return TokKeyword
	case attrWords[w]:
		return TokAttrWord
	case len(w) <= maxUnitBytes && units.IsUnit(w):
		return TokUnit
	}
	if _, ok := units.ParseCode(w); ok {
		return TokCode
	}
	for i := 0; i < len(w); i++ {
		c := w[i]
		if !(c == '_' || c >= 'a' && c <= 'z' || c >= 'A' && c <= 'Z' || c >= '0' && c <= '9') {
			return TokInvalid // a word with letters outside the name alphabet
		}
	}
	return TokIdent
}

// ParamNameTrouble says why name cannot be a block parameter's name, or
// returns "" when it can. A parameter is used by writing its name alone
// where a value goes, so its name must read as a plain name there: not as
// a statement keyword, an attribute word, a unit or a resistor code.
func ParamNameTrouble(name string) string {
	switch classifyWord(name) {
	case TokIdent:
		if name != "" && (name[0] < '0' || name[0] > '9') {
			return ""
		}
	case TokKeyword:
		return name + " is a statement word"
	case TokAttrWord:
		return name + " is an attribute word"
	case TokUnit:
		return name + " reads as a unit"
	case TokCode:
		return name + " reads as a resistor code"
	}
	return name + " is not a plain name (A-Z, a-z, 0-9 and _, not starting with a digit)"
}

// Keywords returns the statement keywords, sorted. The editors' highlighting
// files are checked against it.
func Keywords() []string { return sortedKeys(keywords) }

// AttributeWords returns the attribute words and the switch states, sorted.
func AttributeWords() []string { return sortedKeys(attrWords) }

func sortedKeys(m map[string]bool) []string {
	out := make([]string, 0, len(m))
	for w := range m {
		out = append(out, w)
	}
	sort.Strings(out)
	return out
}
