package lsp

import (
	"context"
	"testing"
	"time"

	"go.lsp.dev/protocol"
	"go.lsp.dev/uri"
)

type quietClient struct{ protocol.UnimplementedClient }

func (quietClient) PublishDiagnostics(context.Context, *protocol.PublishDiagnosticsParams) error {
	return nil
}

// FuzzRequests opens arbitrary text and asks for everything at many
// positions: no request may fail (a panic would come back as an error).
//
//	go test -run='^$' -fuzz=FuzzRequests -fuzztime=1m ./lsp/
func FuzzRequests(f *testing.F) {
	f.Add([]byte(board), uint16(3))
	f.Add([]byte(lib), uint16(7))
	f.Add([]byte(floating+"resistor R3 (vin,"), uint16(1))
	f.Add([]byte("stage X (a, b) [r = (1 kΩ * \"q\")]\n\xff\"\n"), uint16(2))
	f.Fuzz(func(t *testing.T, src []byte, step uint16) {
		s := newServer(Options{Debounce: time.Hour, MaxParts: 10000})
		s.client = quietClient{}
		ctx := context.Background()
		u := uri.File(t.TempDir() + "/f.nodal")
		if err := s.DidOpen(ctx, &protocol.DidOpenTextDocumentParams{TextDocument: protocol.TextDocumentItem{URI: u, Version: 1, Text: string(src)}}); err != nil {
			t.Fatal(err)
		}
		d := s.docs[u]
		s.mu.Lock()
		snap := s.check(d.path, d.text, nil, false)
		snap.gen = d.gen
		d.last = snap
		s.mu.Unlock()
		doc := protocol.TextDocumentIdentifier{URI: u}
		lines := 1
		for _, c := range src {
			if c == '\n' {
				lines++
			}
		}
		// A bounded number of probes: each request reads the whole text.
		for k := 0; k < 24; k++ {
			l, c := (k*int(step|1))%(lines+1), (k*7)%40
			p := protocol.TextDocumentPositionParams{TextDocument: doc, Position: protocol.Position{Line: uint32(l), Character: uint32(c)}}
			if _, err := s.Hover(ctx, &protocol.HoverParams{TextDocumentPositionParams: p}); err != nil {
				t.Fatal("hover:", err)
			}
			if _, err := s.Definition(ctx, &protocol.DefinitionParams{TextDocumentPositionParams: p}); err != nil {
				t.Fatal("definition:", err)
			}
			if _, err := s.References(ctx, &protocol.ReferenceParams{TextDocumentPositionParams: p}); err != nil {
				t.Fatal("references:", err)
			}
			if _, err := s.Completion(ctx, &protocol.CompletionParams{TextDocumentPositionParams: p}); err != nil {
				t.Fatal("completion:", err)
			}
			r := protocol.Range{Start: protocol.Position{Line: uint32(l)}, End: protocol.Position{Line: uint32(l + 1)}}
			if _, err := s.CodeAction(ctx, &protocol.CodeActionParams{TextDocument: doc, Range: r}); err != nil {
				t.Fatal("code action:", err)
			}
		}
		if _, err := s.DocumentSymbol(ctx, &protocol.DocumentSymbolParams{TextDocument: doc}); err != nil {
			t.Fatal("symbols:", err)
		}
		if _, err := s.Formatting(ctx, &protocol.DocumentFormattingParams{TextDocument: doc}); err != nil {
			t.Fatal("formatting:", err)
		}
		s.Shutdown(ctx)
	})
}

// TestPositions converts between byte offsets and LSP positions in UTF-16
// (the protocol's default; a character outside the Basic Multilingual
// Plane is two code units, LSP 3.17 "Text Documents") and in UTF-8.
func TestPositions(t *testing.T) {
	src := []byte("ab\nΩ𝄞x\n")
	u16, u8 := newText(src, false), newText(src, true)
	for _, c := range []struct {
		off       int
		line, u16 uint32
	}{{0, 0, 0}, {2, 0, 2}, {3, 1, 0}, {5, 1, 1}, {9, 1, 3}, {10, 1, 4}, {11, 2, 0}} {
		if p := u16.position(c.off); p.Line != c.line || p.Character != c.u16 {
			t.Errorf("utf-16 position of %d: %+v, want %d:%d", c.off, p, c.line, c.u16)
		}
		if o := u16.offset(protocol.Position{Line: c.line, Character: c.u16}); o != c.off {
			t.Errorf("utf-16 offset of %d:%d: %d, want %d", c.line, c.u16, o, c.off)
		}
		p8 := u8.position(c.off)
		if o := u8.offset(p8); o != c.off {
			t.Errorf("utf-8 round trip of %d: %+v gives %d", c.off, p8, o)
		}
	}
	// Past the end of a line or of the text, positions clamp.
	if o := u16.offset(protocol.Position{Line: 0, Character: 99}); o != 2 {
		t.Errorf("past the line's end: %d", o)
	}
	if o := u16.offset(protocol.Position{Line: 99}); o != len(src) {
		t.Errorf("past the text's end: %d", o)
	}
}
