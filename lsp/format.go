package lsp

import (
	"bytes"
	"context"
	"unicode/utf8"

	"go.lsp.dev/protocol"

	"nodal/format"
)

// Formatting lays the document out as "nodal fmt" does, as one edit that
// replaces the whole text (none when it is already formatted).
func (s *Server) Formatting(ctx context.Context, p *protocol.DocumentFormattingParams) (_ []protocol.TextEdit, err error) {
	defer guard(&err)
	_, t := s.doc(p.TextDocument.URI)
	if t == nil {
		return nil, nil
	}
	out := format.Source(t.src)
	if bytes.Equal(out, t.src) || !utf8.Valid(t.src) {
		// A text that is not UTF-8 cannot travel back to the editor
		// unchanged; it is left as it is.
		return []protocol.TextEdit{}, nil
	}
	return []protocol.TextEdit{{Range: t.rangeOf(0, len(t.src)), NewText: string(out)}}, nil
}
