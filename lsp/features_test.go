package lsp

import (
	"slices"
	"strings"
	"testing"

	"go.lsp.dev/protocol"
	"go.lsp.dev/uri"
)

// The designs below are invented for the tests. The operating point of
// the divider is Ohm's law: 12 V across 1 kΩ + 2 kΩ gives 4 mA, 8.00 V at
// the tap and 32.0 mW in R2.
const lib = `# Blocks for the tests.
block pair (top, bottom) [r = 1 kΩ] {
  resistor RA (top, mid) r rated 250 mW
  resistor RB (mid, bottom) r rated 250 mW
}
`

const board = `# An invented board: a divider and a pair of resistors.
include "lib.nodal"
ground gnd
source   V1 (vin, gnd) 12 V rated 100 mA
resistor R1 (vin, tap) 1 kΩ rated 250 mW
resistor R2 (tap, gnd) 2 kΩ rated 50 mW
pair     P1 (vin, gnd)
`

// pos returns the position of the n-th (0-based) occurrence of what in
// src, plus off bytes; the sources here are ASCII before every probe.
func pos(t *testing.T, src, what string, n, off int) protocol.Position {
	t.Helper()
	i := -1
	for k := 0; k <= n; k++ {
		j := strings.Index(src[i+1:], what)
		if j < 0 {
			t.Fatalf("no %q #%d", what, n)
		}
		i += j + 1
	}
	i += off
	line := strings.Count(src[:i], "\n")
	return protocol.Position{Line: uint32(line), Character: uint32(i - (strings.LastIndex(src[:i], "\n") + 1))}
}

func openBoard(t *testing.T) (*session, uri.URI) {
	s := newSession(t, Options{})
	s.initialize()
	s.write("lib.nodal", lib)
	u := s.write("board.nodal", board)
	s.open(u, board)
	s.diagnostics(u, 1)
	return s, u
}

func hoverText(t *testing.T, s *session, u uri.URI, p protocol.Position) string {
	t.Helper()
	h, err := s.server.Hover(s.ctx, &protocol.HoverParams{TextDocumentPositionParams: protocol.TextDocumentPositionParams{
		TextDocument: protocol.TextDocumentIdentifier{URI: u}, Position: p}})
	if err != nil {
		t.Fatal(err)
	}
	if h == nil {
		t.Fatalf("no hover at %+v", p)
	}
	m, ok := h.Contents.(*protocol.MarkupContent)
	if !ok || m.Kind != protocol.MarkupKindMarkdown {
		t.Fatalf("hover contents %T", h.Contents)
	}
	return m.Value
}

func TestHover(t *testing.T) {
	s, u := openBoard(t)
	// R2: 2 kΩ with 8 V across it (Ohm's law, see above), past its 50 mW
	// rating at 32.0 mW? No: 32 mW is 64 % of 50 mW, past the derating
	// limit (60 %, nodal's default) but within the rating.
	h := hoverText(t, s, u, pos(t, board, "R2", 0, 1))
	for _, want := range []string{"**R2**", "resistor 2\\.00 kΩ", "8\\.00 V", "4\\.00 mA", "32\\.0 mW", "64 \\%", "past the derating limit"} {
		if !strings.Contains(h, want) {
			t.Errorf("hover on R2 lacks %q:\n%s", want, h)
		}
	}
	// A net's voltage.
	if h := hoverText(t, s, u, pos(t, board, "tap", 0, 0)); !strings.Contains(h, "8\\.00 V") {
		t.Errorf("hover on tap:\n%s", h)
	}
	// An instance shows its block's header, from the included file.
	if h := hoverText(t, s, u, pos(t, board, "pair ", 1, 1)); !strings.Contains(h, "block pair (top, bottom) [r = 1 kΩ] {") {
		t.Errorf("hover on the instance:\n%s", h)
	}
}

func TestHoverPastRatingWarns(t *testing.T) {
	s := newSession(t, Options{})
	s.initialize()
	// 12 V across 100 Ω: 1.44 W in a 250 mW part (P = V²/R).
	src := "ground gnd\nsource V1 (vin, gnd) 12 V\nresistor R1 (vin, gnd) 100 Ω rated 250 mW\n"
	u := s.write("hot.nodal", src)
	s.open(u, src)
	s.diagnostics(u, 1)
	h := hoverText(t, s, u, pos(t, src, "R1", 0, 0))
	for _, want := range []string{"1\\.44 W", "past the rating", "can overheat", "not a sign-off"} {
		if !strings.Contains(h, want) {
			t.Errorf("hover lacks %q:\n%s", want, h)
		}
	}
}

func TestHoverEscapesNames(t *testing.T) {
	src := "ground gnd\nsource V1 (\"<img src=x>*\", gnd) 5 V\nresistor R1 (\"<img src=x>*\", gnd) 1 kΩ\n"
	s, u := openChecked(t, "odd.nodal", src)
	h := hoverText(t, s, u, pos(t, src, "<img", 1, 0))
	if strings.Contains(strings.ReplaceAll(h, `\<`, ""), "<img") || !strings.Contains(h, `\<img src\=x\>\*`) || !strings.Contains(h, "5\\.00 V") {
		t.Errorf("net name not escaped:\n%s", h)
	}
}

func TestDefinition(t *testing.T) {
	s, u := openBoard(t)
	def := func(p protocol.Position) *protocol.Location {
		r, err := s.server.Definition(s.ctx, &protocol.DefinitionParams{TextDocumentPositionParams: protocol.TextDocumentPositionParams{
			TextDocument: protocol.TextDocumentIdentifier{URI: u}, Position: p}})
		if err != nil {
			t.Fatal(err)
		}
		l, ok := r.(*protocol.Location)
		if !ok {
			t.Fatalf("definition at %+v: %T %v", p, r, r)
		}
		return l
	}
	l := def(pos(t, board, "pair ", 1, 2))
	if !strings.HasSuffix(string(l.URI), "/lib.nodal") || l.Range.Start.Line != 1 || l.Range.Start.Character != 6 {
		t.Errorf("block definition at %+v", l)
	}
	l = def(pos(t, board, "lib.nodal", 0, 0))
	if !strings.HasSuffix(string(l.URI), "/lib.nodal") {
		t.Errorf("include definition at %+v", l)
	}
}

func TestReferencesAndSymbols(t *testing.T) {
	s, u := openBoard(t)
	refs, err := s.server.References(s.ctx, &protocol.ReferenceParams{TextDocumentPositionParams: protocol.TextDocumentPositionParams{
		TextDocument: protocol.TextDocumentIdentifier{URI: u}, Position: pos(t, board, "vin", 0, 0)}})
	if err != nil {
		t.Fatal(err)
	}
	if len(refs) != 3 {
		t.Errorf("references of vin: %v, want 3", refs)
	}
	syms, err := s.server.DocumentSymbol(s.ctx, &protocol.DocumentSymbolParams{TextDocument: protocol.TextDocumentIdentifier{URI: u}})
	if err != nil {
		t.Fatal(err)
	}
	var names []string
	for _, sym := range syms.(protocol.DocumentSymbolSlice) {
		names = append(names, sym.Name)
	}
	for _, want := range []string{"V1", "R1", "R2", "P1", "vin", "tap", "gnd"} {
		if !slices.Contains(names, want) {
			t.Errorf("document symbols %v lack %s", names, want)
		}
	}
	ws, err := s.server.Symbols(s.ctx, &protocol.WorkspaceSymbolParams{Query: "pai"})
	if err != nil {
		t.Fatal(err)
	}
	found := false
	switch ws := ws.(type) {
	case protocol.WorkspaceSymbolSlice:
		for _, sym := range ws {
			found = found || sym.Name == "pair" && sym.Kind == protocol.SymbolKindClass
		}
	case protocol.SymbolInformationSlice: // how the client side may decode it
		for _, sym := range ws {
			found = found || sym.Name == "pair" && sym.Kind == protocol.SymbolKindClass
		}
	}
	if !found {
		t.Errorf("workspace symbols for \"pai\": %v", ws)
	}
}

func TestCompletion(t *testing.T) {
	s, u := openBoard(t)
	complete := func(src string, p protocol.Position) []string {
		s.change(u, 9, src)
		r, err := s.server.Completion(s.ctx, &protocol.CompletionParams{TextDocumentPositionParams: protocol.TextDocumentPositionParams{
			TextDocument: protocol.TextDocumentIdentifier{URI: u}, Position: p}})
		if err != nil {
			t.Fatal(err)
		}
		var out []string
		for _, it := range r.(protocol.CompletionItemSlice) {
			out = append(out, it.Label)
		}
		return out
	}
	src := board + "res"
	if got := complete(src, endPos(src)); !slices.Contains(got, "resistor") || !slices.Contains(got, "pair") {
		t.Errorf("at a statement's start: %v", got)
	}
	src = board + "resistor R9 (ta"
	if got := complete(src, endPos(src)); !slices.Contains(got, "tap") || !slices.Contains(got, "vin") {
		t.Errorf("in the pins: %v", got)
	}
	src = board + "resistor R9 (tap, gnd) 10 "
	if got := complete(src, endPos(src)); !slices.Contains(got, "kΩ") {
		t.Errorf("after a number: %v", got)
	}
	src = board + "resistor R9 (tap, gnd) 10 kΩ "
	if got := complete(src, endPos(src)); !slices.Contains(got, "tol") || !slices.Contains(got, "rated") {
		t.Errorf("after the value: %v", got)
	}
}

func TestFormatting(t *testing.T) {
	s := newSession(t, Options{})
	s.initialize()
	src := "ground  gnd\nresistor R1 (a,gnd) 1 kΩ\n"
	u := s.write("f.nodal", src)
	s.open(u, src)
	edits, err := s.server.Formatting(s.ctx, &protocol.DocumentFormattingParams{TextDocument: protocol.TextDocumentIdentifier{URI: u}})
	if err != nil {
		t.Fatal(err)
	}
	if len(edits) != 1 || edits[0].NewText != "ground gnd\nresistor R1 (a, gnd) 1 kΩ\n" || edits[0].Range.End.Line != 2 {
		t.Errorf("formatting edits: %+v", edits)
	}
}

func TestCodeActions(t *testing.T) {
	src := "ground gnd\nsource V1 (vin, gnd) 5 V\nresistor R1 (vin, gnd) 1 kΩ\nresistor R2 (vim, gnd) 4.7\n"
	s, u := openChecked(t, "a.nodal", src)
	acts, err := s.server.CodeAction(s.ctx, &protocol.CodeActionParams{TextDocument: protocol.TextDocumentIdentifier{URI: u},
		Range: protocol.Range{Start: protocol.Position{Line: 3}, End: protocol.Position{Line: 3, Character: 30}}})
	if err != nil {
		t.Fatal(err)
	}
	got := map[string]string{}
	for _, a := range acts {
		ca := a.(*protocol.CodeAction)
		edits := ca.Edit.Changes[u]
		if len(edits) != 1 {
			t.Fatalf("%s: %d edits", ca.Title, len(edits))
		}
		got[ca.Title] = edits[0].NewText
	}
	for title, text := range map[string]string{
		"write vin":         "vin",
		"write the unit: Ω": " Ω",
		"declare vim a port (a net that leaves the file)":     "port vim\n",
		"Accept this floating-net finding (write the reason)": "  # nodal: accept floating-net because <reason>",
	} {
		if got[title] != text {
			t.Errorf("action %q: %q (all: %q)", title, got[title], got)
		}
	}
}

// TestBrokenInputNeverStops feeds the server half-typed and hostile text
// and asks it for everything: it answers and keeps publishing.
func TestBrokenInputNeverStops(t *testing.T) {
	s := newSession(t, Options{})
	s.initialize()
	u := s.write("b.nodal", "")
	s.open(u, "")
	s.diagnostics(u, 1)
	for i, src := range []string{"resistor R1 (", "\xff\xfe\x00ground\x80", "block b (x) {\n  b B (x)\n}\nb X (y)\n", "\"" + strings.Repeat("x", 5000), "(((((", "include \"../../../../etc/passwd\"\n"} {
		v := int32(i + 2)
		s.change(u, v, src)
		s.diagnostics(u, v)
		for line := uint32(0); line < 3; line++ {
			p := protocol.TextDocumentPositionParams{TextDocument: protocol.TextDocumentIdentifier{URI: u}, Position: protocol.Position{Line: line, Character: 3}}
			s.server.Hover(s.ctx, &protocol.HoverParams{TextDocumentPositionParams: p})
			s.server.Definition(s.ctx, &protocol.DefinitionParams{TextDocumentPositionParams: p})
			s.server.Completion(s.ctx, &protocol.CompletionParams{TextDocumentPositionParams: p})
			s.server.References(s.ctx, &protocol.ReferenceParams{TextDocumentPositionParams: p})
		}
		if _, err := s.server.Formatting(s.ctx, &protocol.DocumentFormattingParams{TextDocument: protocol.TextDocumentIdentifier{URI: u}}); err != nil {
			t.Fatalf("formatting %q: %v", src, err)
		}
	}
}

// endPos is the position at the end of src (ASCII on its last line).
func endPos(src string) protocol.Position {
	return protocol.Position{Line: uint32(strings.Count(src, "\n")), Character: uint32(len(src) - strings.LastIndex(src, "\n") - 1)}
}

// TestHoverWorstCase: with tolerances, hover gives each rating's worst
// case and a net's range. The divider is invented: 12 V over 1 kΩ and
// 2 kΩ, each 5 %; the tap moves around 8 V.
func TestHoverWorstCase(t *testing.T) {
	src := "ground gnd\nsource V1 (vin, gnd) 12 V\nresistor R1 (vin, tap) 1 kΩ tol 5% rated 250 mW\nresistor R2 (tap, gnd) 2 kΩ tol 5% rated 250 mW\n"
	s, u := openChecked(t, "w.nodal", src)
	if h := hoverText(t, s, u, pos(t, src, "R2", 0, 0)); !strings.Contains(h, "worst case over the tolerances") {
		t.Errorf("hover on R2 without its worst case:\n%s", h)
	}
	if h := hoverText(t, s, u, pos(t, src, "tap", 0, 0)); !strings.Contains(h, "over the tolerances") {
		t.Errorf("hover on tap without its range:\n%s", h)
	}
}

// TestHoverDriveRange: on a port whose drive is a range, hover says the
// range, the middle it is solved at, and the net's range. The port sits
// behind no resistance here, so its net spans the drive's range exactly.
func TestHoverDriveRange(t *testing.T) {
	src := "ground gnd\nport vin 4.5 V to 5.5 V\nresistor R1 (vin, gnd) 1 kΩ\nport vb 2 V series 10 Ω\nresistor R2 (vb, gnd) 1 kΩ\n"
	s, u := openChecked(t, "r.nodal", src)
	h := hoverText(t, s, u, pos(t, src, "vin", 0, 0))
	for _, want := range []string{"voltage drive of 4\\.50 V to 5\\.50 V", "5\\.00 V", "from 4\\.50 V to 5\\.50 V over the tolerances and drive ranges"} {
		if !strings.Contains(h, want) {
			t.Errorf("hover on vin lacks %q:\n%s", want, h)
		}
	}
	if h := hoverText(t, s, u, pos(t, src, "vb", 0, 0)); !strings.Contains(h, "voltage drive of 2\\.00 V behind 10\\.0 Ω") {
		t.Errorf("hover on vb:\n%s", h)
	}
}

// TestHoverRegulator: hover on a regulator in dropout says what it
// delivers, draws and dissipates, and its region.
func TestHoverRegulator(t *testing.T) {
	src := "ground gnd\nsource VB (vb, gnd) 3.4 V\nregulator U1 (vb, v3, gnd) 3.3 V dropout 300 mV quiescent 1 mA\nresistor RL (v3, gnd) 31 Ω\n"
	s, u := openChecked(t, "r.nodal", src)
	h := hoverText(t, s, u, pos(t, src, "U1", 0, 0))
	// 3.1 V into 31 Ω: 100 mA out, 101 mA in at 3.4 V; (3.4 − 3.1)·0.1 +
	// 3.4·0.001 = 33.4 mW dissipated (energy balance).
	for _, want := range []string{"delivers 100 mA at 3\\.10 V", "draws 101 mA at 3\\.40 V", "dissipates 33\\.4 mW", "in dropout"} {
		if !strings.Contains(h, want) {
			t.Errorf("hover on U1 lacks %q:\n%s", want, h)
		}
	}
}

// openChecked starts a session, writes src to a file of that name, opens
// it and waits for its first diagnostics: the design has been checked.
func openChecked(t *testing.T, name, src string) (*session, uri.URI) {
	t.Helper()
	s := newSession(t, Options{})
	s.initialize()
	u := s.write(name, src)
	s.open(u, src)
	s.diagnostics(u, 1)
	return s, u
}
