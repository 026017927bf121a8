package editors_test

import (
	"encoding/json"
	"os"
	"regexp"
	"slices"
	"strings"
	"testing"

	"nodal/circuit"
	"nodal/grammar"
)

type rule struct {
	Match    string
	Name     string
	Captures map[string]struct{ Name string }
	re       *regexp.Regexp
}

type tmGrammar struct {
	Name, ScopeName string
	FileTypes       []string
	Patterns        []*rule
}

func loadGrammar(t *testing.T) *tmGrammar {
	t.Helper()
	b, err := os.ReadFile("textmate/nodal.tmLanguage.json")
	if err != nil {
		t.Fatal(err)
	}
	var g tmGrammar
	if err := json.Unmarshal(b, &g); err != nil {
		t.Fatal(err)
	}
	if g.ScopeName != "source.nodal" || !slices.Contains(g.FileTypes, "nodal") || len(g.Patterns) == 0 {
		t.Fatalf("grammar header: %+v", g)
	}
	for _, r := range g.Patterns {
		if r.Match == "" {
			t.Fatalf("rule without match (only match rules are used): %+v", r)
		}
		if r.re, err = regexp.Compile(r.Match); err != nil {
			t.Fatalf("%q: %v", r.Match, err)
		}
	}
	return &g
}

// scopes applies the grammar's match rules to one line the way a
// TextMate engine does: from the current position, the rule whose match
// starts first wins, the earlier rule on a tie; its name covers the match
// and each capture's name its group. A rule anchored with ^ matches at
// the start of the line only. It returns the innermost scope of each byte.
func scopes(g *tmGrammar, line string) []string {
	out := make([]string, len(line))
	for p := 0; p < len(line); {
		best, bestAt := -1, []int(nil)
		for i, r := range g.Patterns {
			if strings.HasPrefix(r.Match, "^") && p > 0 {
				continue
			}
			m := r.re.FindStringSubmatchIndex(line[p:])
			if m == nil {
				continue
			}
			if bestAt == nil || m[0] < bestAt[0] {
				best, bestAt = i, m
			}
		}
		if best < 0 {
			break
		}
		r := g.Patterns[best]
		from, to := p+bestAt[0], p+bestAt[1]
		for k := from; k < to; k++ {
			out[k] = r.Name
		}
		for c, cap := range r.Captures {
			n := int(c[0] - '0')
			if s := bestAt[2*n]; s >= 0 {
				for k := p + s; k < p+bestAt[2*n+1]; k++ {
					out[k] = cap.Name
				}
			}
		}
		p = max(to, p+1)
	}
	return out
}

func TestTextMateGrammar(t *testing.T) {
	g := loadGrammar(t)
	lines := sampleLines(t)
	for _, s := range []spot{
		{1, "#", "comment.line.number-sign.nodal"},
		{2, "design", "keyword.control.statement.nodal"},
		{2, `"Highlight`, "string.quoted.double.nodal"},
		{3, "include", "keyword.control.statement.nodal"},
		{5, "port", "keyword.control.statement.nodal"},
		{5, "nodal: accept", "keyword.other.directive.accept.nodal"},
		{5, "because", "comment.line.number-sign.nodal"},
		{7, "block", "keyword.control.block.nodal"},
		{7, "stage", "entity.name.function.block.nodal"},
		{7, "10", "constant.numeric.quantity.nodal"},
		{7, "kΩ", "keyword.other.unit.nodal"},
		{8, "resistor", "storage.type.kind.nodal"},
		{8, "R ", "entity.name.part.nodal"},
		{8, "*", "keyword.operator.nodal"},
		{8, "tol", "keyword.other.attribute.nodal"},
		{8, "1%", "constant.numeric.quantity.nodal"},
		{8, "mW", "keyword.other.unit.nodal"},
		{10, "source", "storage.type.kind.nodal"},
		{10, "V1", "entity.name.part.nodal"},
		{10, "vin", "variable.other.name.nodal"},
		{10, "V ", "keyword.other.unit.nodal"},
		{11, "4.7kΩ", "constant.numeric.quantity.nodal"},
		{11, "7kΩ", "constant.numeric.quantity.nodal"},
		{12, "R2", "entity.name.part.nodal"},
		{12, "R47", "constant.numeric.code.nodal"},
		{13, "open", "constant.language.switch-state.nodal"},
		{14, "stage", "entity.name.function.block.instance.nodal"},
		{14, "X1", "entity.name.part.nodal"},
		{14, "meg", "invalid.illegal.meg.nodal"},
		{14, "1 meg", "constant.numeric.quantity.nodal"},
	} {
		got := scopes(g, lines[s.line-1])[col(t, lines, s)]
		if got != s.group {
			t.Errorf("line %d %q: scope %q, want %q", s.line, s.text, got, s.group)
		}
	}
	// Characters outside ASCII in units and numbers.
	for text, want := range map[string]string{
		"resistor R1 (a, b) 4.7 kΩ": "keyword.other.unit.nodal",
		"capacitor C1 (a, b) 22 µF": "keyword.other.unit.nodal",
		"capacitor C1 (a, b) 22µF":  "constant.numeric.quantity.nodal",
		"source V1 (a, b) 5 V":      "keyword.other.unit.nodal",
	} {
		sc := scopes(g, text)
		if got := sc[len(text)-1]; got != want {
			t.Errorf("%q ends in %q, want %q", text, got, want)
		}
	}
}

// TestWordLists keeps the highlighting in step with the language: every
// kind the model knows is highlighted as one by both files, and the
// words they treat as keywords and attributes lex as such.
func TestWordLists(t *testing.T) {
	vimSyntax, err := os.ReadFile("vim/syntax/nodal.vim")
	if err != nil {
		t.Fatal(err)
	}
	tm, err := os.ReadFile("textmate/nodal.tmLanguage.json")
	if err != nil {
		t.Fatal(err)
	}
	for _, k := range circuit.KindWords {
		if !strings.Contains(string(vimSyntax), `\|`+k+`\`) && !strings.Contains(string(vimSyntax), `\%(`+k+`\|`) {
			t.Errorf("vim syntax lacks kind %s", k)
		}
		if !strings.Contains(string(tm), "|"+k+"|") && !strings.Contains(string(tm), "("+k+"|") && !strings.Contains(string(tm), "|"+k+")") {
			t.Errorf("TextMate grammar lacks kind %s", k)
		}
	}
	want := map[string]grammar.TokenType{}
	for _, w := range grammar.Keywords() {
		want[w] = grammar.TokKeyword
	}
	for _, w := range grammar.AttributeWords() {
		want[w] = grammar.TokAttrWord
	}
	for w, typ := range want {
		if toks := grammar.LexLine(w); len(toks) != 1 || toks[0].Type != typ {
			t.Errorf("%s does not lex as the highlighting assumes: %+v", w, toks)
		}
		if !regexp.MustCompile(`\b`+w+`\b`).Match(vimSyntax) || !regexp.MustCompile(`\b`+w+`\b`).Match(tm) {
			t.Errorf("%s is missing from a highlighting file", w)
		}
	}
}
