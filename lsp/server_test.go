package lsp

import (
	"context"
	"io"
	"os"
	"path/filepath"
	"strings"
	"sync"
	"testing"
	"time"

	"go.lsp.dev/jsonrpc2"
	"go.lsp.dev/protocol"
	"go.lsp.dev/uri"
)

// fakeClient is the editor's side: it records what the server publishes,
// never blocking the connection.
type fakeClient struct {
	protocol.UnimplementedClient
	mu     sync.Mutex
	got    []*protocol.PublishDiagnosticsParams
	signal chan struct{}
}

func (c *fakeClient) PublishDiagnostics(_ context.Context, p *protocol.PublishDiagnosticsParams) error {
	c.mu.Lock()
	c.got = append(c.got, p)
	if len(c.got) > 1000 {
		c.got = append(c.got[:0:0], c.got[len(c.got)-100:]...)
	}
	c.mu.Unlock()
	select {
	case c.signal <- struct{}{}:
	default:
	}
	return nil
}

func (c *fakeClient) LogMessage(context.Context, *protocol.LogMessageParams) error { return nil }

type rwc struct {
	io.Reader
	io.Writer
}

func (p rwc) Close() error {
	p.Reader.(io.Closer).Close()
	return p.Writer.(io.Closer).Close()
}

// session is a server started on pipes, driven through the protocol
// library's client side, as an editor drives it.
type session struct {
	t      testing.TB
	ctx    context.Context
	server protocol.Server
	client *fakeClient
	dir    string
	served chan error
}

func newSession(t testing.TB, opt Options) *session {
	t.Helper()
	ctx, cancel := context.WithCancel(context.Background())
	c2sR, c2sW := io.Pipe()
	s2cR, s2cW := io.Pipe()
	served := make(chan error, 1)
	go func() { served <- Serve(ctx, c2sR, s2cW, opt) }()
	fc := &fakeClient{signal: make(chan struct{}, 1)}
	_, conn, server := protocol.NewClient(ctx, fc, jsonrpc2.NewStream(rwc{s2cR, c2sW}))
	t.Cleanup(func() {
		cancel()
		conn.Close()
	})
	dir := t.TempDir()
	// A repository of its own, so that the tree the server reads is the
	// test's folder.
	os.Mkdir(filepath.Join(dir, ".git"), 0o755)
	return &session{t: t, ctx: ctx, server: server, client: fc, dir: dir, served: served}
}

func (s *session) initialize(encodings ...protocol.PositionEncodingKind) *protocol.InitializeResult {
	s.t.Helper()
	root := uri.File(s.dir)
	res, err := s.server.Initialize(s.ctx, &protocol.InitializeParams{
		RootURI:      &root,
		Capabilities: protocol.ClientCapabilities{General: &protocol.GeneralClientCapabilities{PositionEncodings: encodings}},
	})
	if err != nil {
		s.t.Fatal(err)
	}
	if err := s.server.Initialized(s.ctx, &protocol.InitializedParams{}); err != nil {
		s.t.Fatal(err)
	}
	return res
}

// write puts a file in the session's folder and returns its URI.
func (s *session) write(name, src string) uri.URI {
	s.t.Helper()
	p := filepath.Join(s.dir, name)
	os.MkdirAll(filepath.Dir(p), 0o755)
	if err := os.WriteFile(p, []byte(src), 0o644); err != nil {
		s.t.Fatal(err)
	}
	return uri.File(p)
}

func (s *session) open(u uri.URI, src string) {
	s.t.Helper()
	err := s.server.DidOpen(s.ctx, &protocol.DidOpenTextDocumentParams{TextDocument: protocol.TextDocumentItem{
		URI: u, LanguageID: "nodal", Version: 1, Text: src,
	}})
	if err != nil {
		s.t.Fatal(err)
	}
}

func (s *session) change(u uri.URI, version int32, src string) {
	s.t.Helper()
	err := s.server.DidChange(s.ctx, &protocol.DidChangeTextDocumentParams{
		TextDocument:   protocol.VersionedTextDocumentIdentifier{TextDocumentIdentifier: protocol.TextDocumentIdentifier{URI: u}, Version: version},
		ContentChanges: []protocol.TextDocumentContentChangeEvent{&protocol.TextDocumentContentChangeWholeDocument{Text: src}},
	})
	if err != nil {
		s.t.Fatal(err)
	}
}

// diagnostics waits for the diagnostics of u (of at least version, when
// given) and returns the latest.
func (s *session) diagnostics(u uri.URI, version int32) []protocol.Diagnostic {
	s.t.Helper()
	timeout := time.After(60 * time.Second)
	for {
		s.client.mu.Lock()
		for i := len(s.client.got) - 1; i >= 0; i-- {
			p := s.client.got[i]
			if v, _ := p.Version.Get(); p.URI == u && v >= version {
				s.client.mu.Unlock()
				return p.Diagnostics
			}
		}
		s.client.mu.Unlock()
		select {
		case <-s.client.signal:
		case <-timeout:
			s.t.Fatalf("no diagnostics for %s version %d", u, version)
		}
	}
}

func message(d protocol.Diagnostic) string {
	if m, ok := d.Message.(protocol.String); ok {
		return string(m)
	}
	return ""
}

func code(d protocol.Diagnostic) string {
	if c, ok := d.Code.(protocol.String); ok {
		return string(c)
	}
	return ""
}

// find returns the diagnostic with rule id, failing the test without one.
func find(t testing.TB, ds []protocol.Diagnostic, rule string) protocol.Diagnostic {
	t.Helper()
	for _, d := range ds {
		if code(d) == rule {
			return d
		}
	}
	t.Fatalf("no %s finding among %v", rule, ds)
	return protocol.Diagnostic{}
}

const floating = `# An invented two-resistor design with a test pad left floating.
ground gnd
source   V1 (vin, gnd)   5 V  rated 100 mA
resistor R1 (vin, gnd)   1 kΩ rated 250 mW
resistor R2 (vin, probe) 10 kΩ
`

func TestInitializeAndShutdown(t *testing.T) {
	s := newSession(t, Options{})
	res := s.initialize()
	c := res.Capabilities
	if c.PositionEncoding != protocol.PositionEncodingKindUTF16 {
		t.Errorf("position encoding %q without a UTF-8 offer", c.PositionEncoding)
	}
	for name, v := range map[string]any{"hover": c.HoverProvider, "definition": c.DefinitionProvider,
		"references": c.ReferencesProvider, "documentSymbol": c.DocumentSymbolProvider,
		"workspaceSymbol": c.WorkspaceSymbolProvider, "formatting": c.DocumentFormattingProvider} {
		if v != protocol.Boolean(true) {
			t.Errorf("%s not offered: %v", name, v)
		}
	}
	if c.CompletionProvider == nil || c.CodeActionProvider == nil || c.TextDocumentSync == nil {
		t.Error("completion, code actions or document sync not offered")
	}
	if err := s.server.Shutdown(s.ctx); err != nil {
		t.Fatal(err)
	}
	s.server.Exit(s.ctx)
	select {
	case err := <-s.served:
		if err != nil {
			t.Fatal(err)
		}
	case <-time.After(10 * time.Second):
		t.Fatal("the server did not stop after exit")
	}
}

func TestUTF8Negotiated(t *testing.T) {
	s := newSession(t, Options{})
	res := s.initialize(protocol.PositionEncodingKindUTF16, protocol.PositionEncodingKindUTF8)
	if res.Capabilities.PositionEncoding != protocol.PositionEncodingKindUTF8 {
		t.Errorf("position encoding %q, want utf-8 when offered", res.Capabilities.PositionEncoding)
	}
}

func TestDiagnosticsOnOpenAndChange(t *testing.T) {
	s := newSession(t, Options{})
	s.initialize()
	u := s.write("pad.nodal", floating)
	s.open(u, floating)
	ds := s.diagnostics(u, 1)
	d := find(t, ds, "floating-net")
	if d.Severity != protocol.DiagnosticSeverityWarning || !strings.Contains(message(d), "probe") {
		t.Errorf("floating-net finding: %+v", d)
	}
	// "probe" on line 5 (0-based 4), after "resistor R2 (vin, ".
	if d.Range.Start.Line != 4 || d.Range.Start.Character != uint32(strings.Index("resistor R2 (vin, probe) 10 kΩ", "probe")) {
		t.Errorf("range %+v, want line 4 at probe", d.Range)
	}
	// Unsaved text is what is checked: declare the pad a port.
	s.change(u, 2, floating+"port probe\n")
	if ds := s.diagnostics(u, 2); len(ds) != 0 {
		t.Errorf("after declaring the port: %v", ds)
	}
	// A half-typed line is a syntax finding; the server carries on.
	s.change(u, 3, floating+"resistor R3 (vin,\n")
	find(t, s.diagnostics(u, 3), "syntax")
}

// TestIncludersAndConfig: an open design is checked again when a file it
// includes changes in the editor, and the nodal.toml next to it applies.
func TestIncludersAndConfig(t *testing.T) {
	s := newSession(t, Options{})
	s.initialize()
	const lib = "block pair (a, b) {\n  resistor RA (a, b) 1 kΩ\n}\n"
	const board = "include \"lib.nodal\"\nground gnd\nsource V1 (vin, gnd) 5 V\npair P1 (vin, gnd)\nresistor R9 (vin, pad) 1 kΩ\n"
	s.write("nodal.toml", "[rules]\nfloating-net = \"error\"\n")
	lu := s.write("lib.nodal", lib)
	bu := s.write("board.nodal", board)
	s.open(bu, board)
	d := find(t, s.diagnostics(bu, 1), "floating-net")
	if d.Severity != protocol.DiagnosticSeverityError {
		t.Errorf("nodal.toml makes floating-net an error; got severity %d", d.Severity)
	}
	s.open(lu, lib)
	s.diagnostics(lu, 1)
	// Break the block in the editor, unsaved: the board hears of it.
	s.change(lu, 2, "block pair (a, b) {\n  resistor RA (a, c) 1 kΩ\n}\n")
	deadline := time.Now().Add(20 * time.Second)
	for {
		ds := s.diagnostics(bu, 1)
		found := false
		for _, d := range ds {
			found = found || code(d) == "floating-net" && strings.Contains(message(d), "lib.nodal")
		}
		if found {
			break
		}
		if time.Now().After(deadline) {
			t.Fatalf("the board was not checked again with the edited library: %v", ds)
		}
		time.Sleep(20 * time.Millisecond)
	}
}

// TestVersionsInOrder: across rapid edits, what is published for a
// document never goes back to an older version.
func TestVersionsInOrder(t *testing.T) {
	s := newSession(t, Options{Debounce: -1})
	s.initialize()
	u := s.write("v.nodal", floating)
	s.open(u, floating)
	for v := int32(2); v < 200; v++ {
		src := floating
		if v%2 == 0 {
			src += "port probe\n"
		}
		s.change(u, v, src)
	}
	if ds := s.diagnostics(u, 199); len(ds) != 1 {
		t.Errorf("version 199 (the floating pad) has %d findings", len(ds))
	}
	s.client.mu.Lock()
	defer s.client.mu.Unlock()
	last := int32(0)
	for _, p := range s.client.got {
		v, _ := p.Version.Get()
		if p.URI == u && v < last {
			t.Fatalf("version %d published after %d", v, last)
		}
		if p.URI == u {
			last = v
		}
	}
}
