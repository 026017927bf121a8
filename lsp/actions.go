package lsp

import (
	"context"
	"strings"

	"go.lsp.dev/protocol"
	"go.lsp.dev/uri"

	"nodal/grammar"
)

// acceptPlaceholder stands for the reason in an added accept comment; the
// person accepting the finding writes theirs over it.
const acceptPlaceholder = "<reason>"

// CodeAction offers, for the findings in the range, the fixes the checker
// attached to them (a did-you-mean net, M for meg, the kind's unit after
// a bare number, a port for a one-pin net) and a comment that accepts the
// finding, with a placeholder for the reason. Nothing is offered while
// the latest check is of an older text.
func (s *Server) CodeAction(ctx context.Context, p *protocol.CodeActionParams) (_ []protocol.CommandOrCodeAction, err error) {
	defer guard(&err)
	s.mu.Lock()
	d := s.docs[p.TextDocument.URI]
	var last *snapshot
	if d != nil && d.last != nil && d.last.gen == d.gen {
		last = d.last
	}
	s.mu.Unlock()
	out := []protocol.CommandOrCodeAction{}
	if last == nil {
		return out, nil
	}
	t := last.text
	from, to := t.offset(p.Range.Start), t.offset(p.Range.End)
	quickfix := protocol.CodeActionKindQuickFix
	for _, pub := range last.diags {
		if pub.d.Rule == "" || pub.from > to || pub.to < from {
			continue
		}
		for i, fix := range pub.d.Fixes {
			var edits []protocol.TextEdit
			for _, e := range fix.Edits {
				pp, pe := last.res.Fset.Position(e.Pos), last.res.Fset.Position(e.End)
				if pp.Filename != last.name || pe.Filename != last.name || pe.Offset < pp.Offset {
					edits = nil
					break
				}
				edits = append(edits, protocol.TextEdit{Range: t.rangeOf(pp.Offset, pe.Offset), NewText: valid(e.NewText)})
			}
			if len(edits) == 0 {
				continue
			}
			preferred := i == 0
			out = append(out, &protocol.CodeAction{Title: valid(fix.Message), Kind: &quickfix, IsPreferred: &preferred,
				Diagnostics: []protocol.Diagnostic{pub.lsp},
				Edit:        &protocol.WorkspaceEdit{Changes: map[uri.URI][]protocol.TextEdit{p.TextDocument.URI: edits}}})
		}
		if pub.own {
			if e, ok := acceptEdit(t, pub.from, pub.d.Rule); ok {
				out = append(out, &protocol.CodeAction{Title: "Accept this " + pub.d.Rule + " finding (write the reason)", Kind: &quickfix,
					Diagnostics: []protocol.Diagnostic{pub.lsp},
					Edit:        &protocol.WorkspaceEdit{Changes: map[uri.URI][]protocol.TextEdit{p.TextDocument.URI: {e}}}})
			}
		}
	}
	return out, nil
}

// acceptEdit adds an accept comment for rule to the statement on the line
// of off: at the end of the line, or on a line of its own above it when
// the line has a comment already.
func acceptEdit(t *text, off int, rule string) (protocol.TextEdit, bool) {
	l := int(t.position(off).Line)
	start, end := t.lines[l], t.lineEnd(l)
	line := strings.TrimRight(string(t.src[start:end]), " \t\r")
	comment := "# nodal: accept " + rule + " because " + acceptPlaceholder
	toks := grammar.LexLine(line)
	if len(toks) == 0 {
		return protocol.TextEdit{}, false
	}
	if toks[len(toks)-1].Type == grammar.TokComment {
		indent := line[:len(line)-len(strings.TrimLeft(line, " \t"))]
		p := t.position(start)
		return protocol.TextEdit{Range: protocol.Range{Start: p, End: p}, NewText: indent + comment + "\n"}, true
	}
	p := t.position(start + len(line))
	return protocol.TextEdit{Range: protocol.Range{Start: p, End: t.position(end)}, NewText: "  " + comment}, true
}
