// Package lsp is nodal's language server: the checks, the operating
// point and the formatter, offered to editors over the Language Server
// Protocol 3.17 (JSON-RPC 2.0 on standard input and output).
//
// # Protocol
//
// The protocol types and the transport are go.lsp.dev/protocol and
// go.lsp.dev/jsonrpc2. Documents are synchronised whole (the files are
// small and a check reads the whole file anyway). Positions count UTF-16
// code units, as the protocol requires, unless the client offers UTF-8,
// which the server then prefers: nodal counts columns in bytes.
//
// # Checks
//
// A document is checked when it is opened or saved, and after an edit
// once the edits pause (Options.Debounce). Checks run off the connection's
// thread, at most Options.Parallel at a time; an edit made while a check
// runs supersedes it: its findings are dropped, never published, and the
// document is checked again. Included files are read from the editor's
// buffers when they are open and from disk otherwise, confined to the
// tree the document is in, as "nodal check" confines its reads; the
// nodal.toml that applies to the file on disk applies. When a document
// changes, the open documents that include it are checked again.
//
// # Memory
//
// The server keeps, per open document, its text and its latest check (the
// model and the operating point, for hover); a closed document is
// forgotten. Nothing else grows with the length of a session.
//
// # Safety
//
// Hover shows each rating's use; a part past a rating is said to be able
// to overheat or fail. nodal is a design aid, not a sign-off.
package lsp

import (
	"context"
	"io"
	"path/filepath"
	"sync"
	"time"

	"go.lsp.dev/jsonrpc2"
	"go.lsp.dev/protocol"
	"go.lsp.dev/uri"
)

// Options tune the server.
type Options struct {
	// Debounce is how long the server waits after an edit before it
	// checks (0: 30 ms; negative: no wait).
	Debounce time.Duration
	// Parallel bounds the checks that run at once (0: 2).
	Parallel int
	// MaxParts bounds the parts a design may expand to, as --max-parts
	// does (0: the command line's default).
	MaxParts int64
}

// Server is one session with one editor.
type Server struct {
	protocol.UnimplementedServer

	client   protocol.Client
	opt      Options
	sem      chan struct{}
	done     chan struct{}
	doneOnce sync.Once

	mu       sync.Mutex
	docs     map[uri.URI]*document
	utf8     bool
	roots    []string // workspace folders, for workspace symbols
	shutdown bool
}

// Serve runs a session on in and out (an editor's pipe to the server)
// until the client exits or the connection closes.
func Serve(ctx context.Context, in io.Reader, out io.Writer, opt Options) error {
	s := newServer(opt)
	conn := jsonrpc2.NewConn(jsonrpc2.NewStream(&pipe{in, out}), jsonrpc2.WithCodec(codec{}))
	s.client = protocol.ClientDispatcher(conn)
	ctx = protocol.WithClient(ctx, s.client)
	conn.Go(ctx, ordered(protocol.ServerHandler(s, jsonrpc2.MethodNotFoundHandler)))
	select {
	case <-conn.Done():
	case <-s.done:
		conn.Close()
	case <-ctx.Done():
		conn.Close()
	}
	return nil
}

func newServer(opt Options) *Server {
	if opt.Debounce == 0 {
		opt.Debounce = 30 * time.Millisecond
	}
	if opt.Parallel <= 0 {
		opt.Parallel = 2
	}
	return &Server{opt: opt, sem: make(chan struct{}, opt.Parallel), done: make(chan struct{}),
		docs: map[uri.URI]*document{}}
}

// ordered handles the lifecycle and document notifications one at a
// time, in the order they arrive (an older edit applied after a newer one
// would bring back text the editor no longer shows); they only record
// state and schedule checks, so they are quick. Every other request runs
// concurrently, so that a slow one holds up nothing.
func ordered(h jsonrpc2.Handler) jsonrpc2.Handler {
	concurrent := protocol.CancelHandler(jsonrpc2.AsyncHandler(h))
	return func(ctx context.Context, req *jsonrpc2.Request) (any, error) {
		switch req.Method() {
		case protocol.MethodInitialize, protocol.MethodInitialized, protocol.MethodShutdown, protocol.MethodExit,
			protocol.MethodTextDocumentDidOpen, protocol.MethodTextDocumentDidChange,
			protocol.MethodTextDocumentDidSave, protocol.MethodTextDocumentDidClose:
			return h(ctx, req)
		}
		return concurrent(ctx, req)
	}
}

// codec is the protocol package's own payload codec (protocol.Marshal and
// protocol.Unmarshal, which know the protocol's union types), wired here
// because the server builds its connection itself to keep notifications
// in order.
type codec struct{}

func (codec) Marshal(v any) ([]byte, error) {
	switch m := v.(type) {
	case jsonrpc2.RawMessage:
		if m == nil {
			return []byte("null"), nil
		}
		return m, nil
	case *jsonrpc2.RawMessage:
		if m == nil || *m == nil {
			return []byte("null"), nil
		}
		return *m, nil
	}
	return protocol.Marshal(v)
}

func (codec) Unmarshal(data []byte, v any) error {
	if p, ok := v.(*jsonrpc2.RawMessage); ok {
		*p = append(jsonrpc2.RawMessage(nil), data...)
		return nil
	}
	return protocol.Unmarshal(data, v)
}

// pipe joins standard input and output into one stream.
type pipe struct {
	io.Reader
	io.Writer
}

func (p *pipe) Close() error {
	if c, ok := p.Reader.(io.Closer); ok {
		c.Close()
	}
	if c, ok := p.Writer.(io.Closer); ok {
		c.Close()
	}
	return nil
}

// guard turns a panic in a handler into an error for that request: one
// bad input must not end the session.
func guard(err *error) {
	if r := recover(); r != nil {
		*err = &jsonrpc2.Error{Code: jsonrpc2.InternalError, Message: "nodal: internal error; please report it with the file that caused it"}
	}
}

func (s *Server) Initialize(ctx context.Context, p *protocol.InitializeParams) (_ *protocol.InitializeResult, err error) {
	defer guard(&err)
	s.mu.Lock()
	defer s.mu.Unlock()
	enc := protocol.PositionEncodingKindUTF16
	if g := p.Capabilities.General; g != nil {
		for _, e := range g.PositionEncodings {
			if e == protocol.PositionEncodingKindUTF8 {
				enc, s.utf8 = e, true
			}
		}
	}
	if folders, ok := p.WorkspaceFolders.Get(); ok {
		for _, f := range folders {
			s.roots = append(s.roots, filepath.Clean(f.URI.FsPath()))
		}
	}
	if len(s.roots) == 0 && p.RootURI != nil && *p.RootURI != "" {
		s.roots = append(s.roots, filepath.Clean(p.RootURI.FsPath()))
	}
	yes := true
	full := protocol.TextDocumentSyncKindFull
	return &protocol.InitializeResult{
		Capabilities: protocol.ServerCapabilities{
			PositionEncoding: enc,
			TextDocumentSync: &protocol.TextDocumentSyncOptions{
				OpenClose: &yes, Change: &full, Save: &protocol.SaveOptions{IncludeText: &yes},
			},
			HoverProvider:           protocol.Boolean(true),
			DefinitionProvider:      protocol.Boolean(true),
			ReferencesProvider:      protocol.Boolean(true),
			DocumentSymbolProvider:  protocol.Boolean(true),
			WorkspaceSymbolProvider: protocol.Boolean(true),
			CompletionProvider:      &protocol.CompletionOptions{TriggerCharacters: []string{"(", ",", " "}},
			CodeActionProvider: &protocol.CodeActionOptions{
				CodeActionKinds: []protocol.CodeActionKind{protocol.CodeActionKindQuickFix},
			},
			DocumentFormattingProvider: protocol.Boolean(true),
		},
		ServerInfo: protocol.ServerInfo{Name: "nodal", Version: protocol.NewOptional("0.1.0")},
	}, nil
}

func (s *Server) Initialized(context.Context, *protocol.InitializedParams) error { return nil }

func (s *Server) Shutdown(context.Context) error {
	s.mu.Lock()
	s.shutdown = true
	for _, d := range s.docs {
		d.stop()
	}
	s.mu.Unlock()
	return nil
}

func (s *Server) Exit(context.Context) error {
	s.doneOnce.Do(func() { close(s.done) })
	return nil
}

func (s *Server) SetTrace(context.Context, *protocol.SetTraceParams) error { return nil }

func (s *Server) DidChangeConfiguration(context.Context, *protocol.DidChangeConfigurationParams) error {
	return nil
}

func (s *Server) DidChangeWatchedFiles(context.Context, *protocol.DidChangeWatchedFilesParams) error {
	// A file changed on disk (an include, a nodal.toml): check again.
	s.mu.Lock()
	defer s.mu.Unlock()
	for _, d := range s.docs {
		s.schedule(d, true)
	}
	return nil
}

func (s *Server) DidOpen(ctx context.Context, p *protocol.DidOpenTextDocumentParams) (err error) {
	defer guard(&err)
	s.mu.Lock()
	defer s.mu.Unlock()
	u := p.TextDocument.URI
	d := s.docs[u]
	if d == nil {
		d = &document{uri: u, path: docPath(u)}
		s.docs[u] = d
	}
	d.setText([]byte(p.TextDocument.Text), p.TextDocument.Version)
	s.schedule(d, false)
	s.dependents(d)
	return nil
}

func (s *Server) DidChange(ctx context.Context, p *protocol.DidChangeTextDocumentParams) (err error) {
	defer guard(&err)
	s.mu.Lock()
	defer s.mu.Unlock()
	d := s.docs[p.TextDocument.URI]
	if d == nil {
		return nil
	}
	src := d.text
	for _, c := range p.ContentChanges {
		switch c := c.(type) {
		case *protocol.TextDocumentContentChangeWholeDocument:
			src = []byte(c.Text)
		case *protocol.TextDocumentContentChangePartial:
			// Full sync is what the server asks for; apply a range
			// edit all the same, for clients that send them.
			t := newText(src, s.utf8)
			from, to := t.offset(c.Range.Start), t.offset(c.Range.End)
			if to < from {
				from, to = to, from
			}
			next := make([]byte, 0, len(src)-(to-from)+len(c.Text))
			next = append(append(append(next, src[:from]...), c.Text...), src[to:]...)
			src = next
		}
	}
	d.setText(src, p.TextDocument.Version)
	s.schedule(d, true)
	s.dependents(d)
	return nil
}

func (s *Server) DidSave(ctx context.Context, p *protocol.DidSaveTextDocumentParams) (err error) {
	defer guard(&err)
	s.mu.Lock()
	defer s.mu.Unlock()
	d := s.docs[p.TextDocument.URI]
	if d == nil {
		return nil
	}
	if p.Text != nil && *p.Text != string(d.text) {
		d.setText([]byte(*p.Text), d.version)
	}
	s.schedule(d, false)
	s.dependents(d)
	return nil
}

func (s *Server) DidClose(ctx context.Context, p *protocol.DidCloseTextDocumentParams) (err error) {
	defer guard(&err)
	s.mu.Lock()
	d := s.docs[p.TextDocument.URI]
	if d != nil {
		d.stop()
		delete(s.docs, p.TextDocument.URI)
		s.dependents(d)
	}
	s.mu.Unlock()
	if d != nil {
		// The editor forgets a closed file's findings.
		return s.client.PublishDiagnostics(ctx, &protocol.PublishDiagnosticsParams{URI: d.uri, Diagnostics: []protocol.Diagnostic{}})
	}
	return nil
}

// docPath returns the file path of a document's URI, or "" for a URI that
// names no file (an unsaved buffer): it is checked with no folder, so it
// reads no includes and no nodal.toml.
func docPath(u uri.URI) string {
	if u.Scheme() != "file" {
		return ""
	}
	return filepath.Clean(u.FsPath())
}

// doc returns the open document u and a snapshot of its text.
func (s *Server) doc(u uri.URI) (*document, *text) {
	s.mu.Lock()
	defer s.mu.Unlock()
	d := s.docs[u]
	if d == nil {
		return nil, nil
	}
	return d, newText(d.text, s.utf8)
}
