package lsp

import (
	"context"
	"slices"
	"strings"

	"go.lsp.dev/protocol"

	"nodal/circuit"
	"nodal/grammar"
	"nodal/units"
)

var statementWords = []string{"design", "ground", "port", "include", "block"}

var prefixes = []string{"p", "n", "µ", "m", "", "k", "M", "G"}

// Completion offers what may come at the cursor: a kind, a keyword or a
// block name at the start of a statement; a net inside the pins; a unit
// after a number; an attribute after the value; a parameter inside [ ].
func (s *Server) Completion(ctx context.Context, p *protocol.CompletionParams) (_ protocol.CompletionResult, err error) {
	defer guard(&err)
	files := s.files(p.TextDocument.URI)
	if files == nil {
		return protocol.CompletionItemSlice{}, nil
	}
	doc := files[0]
	off := doc.t.offset(p.Position)
	line := int(doc.t.position(off).Line)
	before := string(doc.t.src[doc.t.lines[line]:off])
	toks := grammar.LexLine(before)
	// The word being typed is not context: drop it.
	if n := len(toks); n > 0 && !strings.HasSuffix(before, " ") && !strings.HasSuffix(before, "\t") {
		switch toks[n-1].Type {
		case grammar.TokIdent, grammar.TokKeyword, grammar.TokAttrWord, grammar.TokUnit, grammar.TokCode:
			toks = toks[:n-1]
		}
	}
	var items protocol.CompletionItemSlice
	add := func(kind protocol.CompletionItemKind, detail string, labels ...string) {
		for _, l := range labels {
			items = append(items, protocol.CompletionItem{Label: valid(l), Kind: kind, Detail: protocol.NewOptional(valid(detail))})
		}
	}
	depth, bracket := 0, byte(0)
	for _, t := range toks {
		if t.Type != grammar.TokPunct {
			continue
		}
		switch t.Value {
		case "(", "[":
			if depth == 0 {
				bracket = t.Value[0]
			}
			depth++
		case ")", "]":
			depth--
		}
	}
	if depth <= 0 {
		bracket = 0
	}
	switch {
	case len(toks) > 0 && toks[len(toks)-1].Type == grammar.TokComment:
		// in a comment: nothing
	case len(toks) == 0:
		add(protocol.CompletionItemKindClass, "part kind", circuit.KindWords...)
		add(protocol.CompletionItemKindKeyword, "statement", statementWords...)
		for _, f := range files {
			for _, b := range f.ix.blocks {
				add(protocol.CompletionItemKindModule, "block", b.name)
			}
		}
	case bracket == '(' || toks[0].Value == "port" || toks[0].Value == "ground":
		if len(toks) >= 2 || toks[0].Type == grammar.TokKeyword {
			add(protocol.CompletionItemKindVariable, "net", doc.ix.netNames()...)
		}
	case bracket == '[':
		if len(toks) > 0 {
			if _, def := findBlock(files, toks[0].Value); def != nil {
				add(protocol.CompletionItemKindProperty, "parameter of "+def.name, def.params...)
			}
		}
	case toks[len(toks)-1].Type == grammar.TokNumber:
		add(protocol.CompletionItemKindUnit, "unit", unitsFor(toks[0].Value)...)
	case slices.Contains(circuit.KindWords, toks[0].Value) && slices.ContainsFunc(toks, func(t grammar.Token) bool { return t.Value == ")" }):
		add(protocol.CompletionItemKindProperty, "attribute", attrsFor(toks[0].Value)...)
	}
	if items == nil {
		items = protocol.CompletionItemSlice{}
	}
	return items, nil
}

// unitsFor lists the units a value of the kind is written in, with the
// common prefixes, then the other units.
func unitsFor(kind string) []string {
	var first, rest []string
	want := map[units.Dim]bool{}
	for _, k := range circuit.Kinds() {
		if k.Info().Word == kind {
			want[k.Info().Value] = true
			for _, r := range k.Info().Ratings {
				want[r.Dim] = true
			}
		}
	}
	for _, d := range []units.Dim{units.Resistance, units.Capacitance, units.Inductance, units.Voltage, units.Current, units.Power} {
		for _, p := range prefixes {
			u := p + d.Symbol()
			if want[d] {
				first = append(first, u)
			} else {
				rest = append(rest, u)
			}
		}
	}
	return append(append(first, "%"), rest...)
}

// attrsFor lists the attributes the kind takes.
func attrsFor(kind string) []string {
	out := []string{"rated"}
	for _, k := range circuit.Kinds() {
		if k.Info().Word == kind {
			for _, a := range k.Info().Attrs {
				if !slices.Contains(out, a) {
					out = append(out, a)
				}
			}
			for _, st := range k.Info().States {
				if !slices.Contains(out, st) {
					out = append(out, st)
				}
			}
		}
	}
	return out
}
