package review

import (
	"bytes"
	"fmt"
	"regexp"
	"strings"
	"testing"

	"github.com/yuin/goldmark"
	"github.com/yuin/goldmark/ast"
	"github.com/yuin/goldmark/extension"
	east "github.com/yuin/goldmark/extension/ast"
	"github.com/yuin/goldmark/text"
)

// hostile is a net name that would be markup if it were not escaped: a
// mention, HTML, a link, an image, a bare address and a table pipe.
const hostile = `@reviewers <img src=x onerror=alert(1)> [click](http://x.invalid) ![i](http://x.invalid/i.png) www.x.invalid | cell`

// The Markdown form renders as tables under GitHub-flavoured Markdown,
// parsed here by goldmark with its GFM extensions (tables, autolinks);
// every hostile piece of a name stays text inside a code span.
func TestMarkdownRendersAndEscapes(t *testing.T) {
	// R9 leaves the hostile net with one pin: a new floating-net finding
	// that names it.
	after := stressAfter + "resistor R9 (aux, \"" + hostile + "\") 1 kΩ\n"
	c := &Comparison{Base: "main", Head: "the work tree", Thresholds: DefaultThresholds}
	c.Designs = []Design{
		Compare("boards/psu.nodal", side(t, "boards/psu.nodal", stressBefore), side(t, "boards/psu.nodal", after), DefaultThresholds),
		Compare("boards/@team <b>x</b>.nodal", nil, side(t, "x.nodal", stressBefore), DefaultThresholds),
	}
	if c.Designs[0].Count(New) == 0 || len(c.Designs[0].Parts) == 0 {
		t.Fatalf("the test needs a new finding and a moved part: %+v", c.Designs[0])
	}
	var buf bytes.Buffer
	if err := c.WriteMarkdown(&buf); err != nil {
		t.Fatal(err)
	}
	src := buf.Bytes()
	md := goldmark.New(goldmark.WithExtensions(extension.GFM))
	doc := md.Parser().Parse(text.NewReader(src))

	var tables []*east.Table
	var codeText strings.Builder
	allowedHTML := regexp.MustCompile(`^(<details><summary>[0-9a-z ,;]+</summary>|</details>)\s*$`)
	walkChecked(t, doc, src, allowedHTML, &tables, &codeText)
	// The parts table of psu.nodal, worst change first, and its new
	// findings; the added design's parts table.
	if len(tables) < 3 {
		t.Fatalf("%d tables rendered; want at least 3:\n%s", len(tables), src)
	}
	header := tableRow(tables[0].FirstChild(), src)
	first := tableRow(tables[0].FirstChild().NextSibling(), src)
	if header[0] != "part" || first[0] != "R1" || !strings.HasPrefix(first[5], "+55") {
		t.Errorf("parts table: header %q, first row %q; want R1 first, +55 points", header, first)
	}
	// The hostile name arrives whole, as code (the pipe escaped for the
	// table).
	for _, piece := range []string{"@reviewers", "<img src=x onerror=alert(1)>", "[click](http://x.invalid)", "www.x.invalid", "| cell", "@team <b>x</b>"} {
		if !strings.Contains(codeText.String(), piece) {
			t.Errorf("%q is not in any code span:\n%s", piece, codeText.String())
		}
	}
}

// walkChecked walks a parsed comment, collecting its tables and the text
// of its code spans, and fails on any markup that is not ours.
func walkChecked(t *testing.T, doc ast.Node, src []byte, allowedHTML *regexp.Regexp, tables *[]*east.Table, codeText *strings.Builder) {
	t.Helper()
	err := ast.Walk(doc, func(n ast.Node, entering bool) (ast.WalkStatus, error) {
		if !entering {
			return ast.WalkContinue, nil
		}
		switch n := n.(type) {
		case *east.Table:
			*tables = append(*tables, n)
		case *ast.Link, *ast.Image, *ast.AutoLink, *ast.RawHTML:
			t.Errorf("user text became markup: %T %q", n, nodeText(n, src))
		case *ast.HTMLBlock:
			var raw strings.Builder
			for i := 0; i < n.Lines().Len(); i++ {
				seg := n.Lines().At(i)
				raw.Write(seg.Value(src))
			}
			if !allowedHTML.MatchString(raw.String()) {
				t.Errorf("HTML block that is not ours: %q", raw.String())
			}
		case *ast.CodeSpan:
			codeText.WriteString(nodeText(n, src))
			codeText.WriteByte('\n')
			return ast.WalkSkipChildren, nil
		case *ast.Text:
			s := string(n.Segment.Value(src))
			for _, bad := range []string{"@", "<", "http", "www."} {
				if strings.Contains(s, bad) {
					t.Errorf("text outside a code span holds %q: %q", bad, s)
				}
			}
		}
		return ast.WalkContinue, nil
	})
	if err != nil {
		t.Fatal(err)
	}
}

// Past MaxDesigns, designs are listed a line each in a collapsed table.
func TestMarkdownManyDesigns(t *testing.T) {
	c := &Comparison{Base: "main", Head: "the work tree", Thresholds: DefaultThresholds}
	for i := 0; i < MaxDesigns+5; i++ {
		c.Designs = append(c.Designs, Compare(fmt.Sprintf("boards/b%02d @x.nodal", i), side(t, "a.nodal", stressBefore), side(t, "a.nodal", stressAfter), DefaultThresholds))
	}
	var buf bytes.Buffer
	if err := c.WriteMarkdown(&buf); err != nil {
		t.Fatal(err)
	}
	src := buf.Bytes()
	doc := goldmark.New(goldmark.WithExtensions(extension.GFM)).Parser().Parse(text.NewReader(src))
	var tables []*east.Table
	var codeText strings.Builder
	walkChecked(t, doc, src, regexp.MustCompile(`^(<details><summary>[0-9a-z ,;]+</summary>|</details>)\s*$`), &tables, &codeText)
	if got := strings.Count(string(src), "\n#### "); got != MaxDesigns {
		t.Errorf("%d designs shown in full, want %d", got, MaxDesigns)
	}
	last := tables[len(tables)-1]
	rows := 0
	for r := last.FirstChild(); r != nil; r = r.NextSibling() {
		rows++
	}
	if rows != 1+5 || !strings.Contains(codeText.String(), "boards/b29 @x.nodal") {
		t.Errorf("the collapsed table has %d rows (header included); want 6 naming the last design", rows)
	}
}

// nodeText is the text of a node's children.
func nodeText(n ast.Node, src []byte) string {
	var b strings.Builder
	for c := n.FirstChild(); c != nil; c = c.NextSibling() {
		if t, ok := c.(*ast.Text); ok {
			b.Write(t.Segment.Value(src))
		} else {
			b.WriteString(nodeText(c, src))
		}
	}
	return b.String()
}

// tableRow returns the text of a table row's cells.
func tableRow(row ast.Node, src []byte) []string {
	var out []string
	for c := row.FirstChild(); c != nil; c = c.NextSibling() {
		out = append(out, strings.TrimSpace(nodeText(c, src)))
	}
	return out
}
