package lsp

import (
	"context"
	"io/fs"
	"os"
	"path/filepath"
	"strings"

	"go.lsp.dev/protocol"
	"go.lsp.dev/uri"
)

// indexed is a file of a design with its index and text.
type indexed struct {
	uri uri.URI
	ix  *index
	t   *text
}

// files returns the document u indexed from its current text, then the
// files its latest check included.
func (s *Server) files(u uri.URI) []indexed {
	s.mu.Lock()
	d := s.docs[u]
	if d == nil {
		s.mu.Unlock()
		return nil
	}
	src, last, utf8 := d.text, d.last, s.utf8
	s.mu.Unlock()
	out := []indexed{{u, newIndex(string(u), src), newText(src, utf8)}}
	if last != nil && last.res != nil {
		for _, f := range last.res.Build.Files[1:] {
			out = append(out, indexed{fileURI(f.File.Name()), newIndex(f.File.Name(), f.Src), newText(f.Src, utf8)})
		}
	}
	return out
}

func (f indexed) loc(sp span) protocol.Location {
	return protocol.Location{URI: f.uri, Range: f.t.rangeOf(sp.from, sp.to)}
}

// findBlock returns the file and definition of the block named name.
func findBlock(files []indexed, name string) (indexed, *blockDef) {
	for _, f := range files {
		if b := f.ix.block(name); b != nil {
			return f, b
		}
	}
	return indexed{}, nil
}

// Definition goes from an instance's block name to the block, and from an
// include's path to the file.
func (s *Server) Definition(ctx context.Context, p *protocol.DefinitionParams) (_ protocol.DefinitionResult, err error) {
	defer guard(&err)
	files := s.files(p.TextDocument.URI)
	if files == nil {
		return nil, nil
	}
	doc := files[0]
	a := doc.ix.at(doc.t.offset(p.Position))
	switch {
	case a.kind != nil && a.kind.instance:
		if f, b := findBlock(files, a.kind.kind); b != nil {
			l := f.loc(b.at)
			return &l, nil
		}
	case a.block != nil:
		l := doc.loc(a.block.at)
		return &l, nil
	case a.include != nil:
		dir := filepath.Dir(p.TextDocument.URI.FsPath())
		target := filepath.Join(dir, filepath.FromSlash(a.include.path))
		if info, err := os.Stat(target); err == nil && info.Mode().IsRegular() {
			return &protocol.Location{URI: uri.File(target)}, nil
		}
	}
	return nil, nil
}

// References finds the uses of a net (in its scope: the top level or one
// block) and of a block (its definition and its instances).
func (s *Server) References(ctx context.Context, p *protocol.ReferenceParams) (_ []protocol.Location, err error) {
	defer guard(&err)
	files := s.files(p.TextDocument.URI)
	if files == nil {
		return nil, nil
	}
	doc := files[0]
	a := doc.ix.at(doc.t.offset(p.Position))
	var out []protocol.Location
	switch {
	case a.net != nil:
		for _, n := range doc.ix.nets {
			if n.name == a.net.name && n.block == a.net.block {
				out = append(out, doc.loc(n.at))
			}
		}
	case a.block != nil || a.kind != nil && a.kind.instance:
		name := ""
		if a.block != nil {
			name = a.block.name
		} else {
			name = a.kind.kind
		}
		for _, f := range files {
			if b := f.ix.block(name); b != nil && p.Context.IncludeDeclaration {
				out = append(out, f.loc(b.at))
			}
			for _, part := range f.ix.parts {
				if part.instance && part.kind == name {
					out = append(out, f.loc(part.kindAt))
				}
			}
		}
	}
	return out, nil
}

// DocumentSymbol lists the blocks (with their parts), the parts and
// instances, and the nets of the top level.
func (s *Server) DocumentSymbol(ctx context.Context, p *protocol.DocumentSymbolParams) (_ protocol.DocumentSymbolResult, err error) {
	defer guard(&err)
	files := s.files(p.TextDocument.URI)
	if files == nil {
		return protocol.DocumentSymbolSlice{}, nil
	}
	doc := files[0]
	out := protocol.DocumentSymbolSlice{}
	blocks := make([]protocol.DocumentSymbol, len(doc.ix.blocks))
	for i, b := range doc.ix.blocks {
		detail := valid(string(doc.t.src[b.header.from:b.header.to]))
		blocks[i] = protocol.DocumentSymbol{Name: valid(b.name), Detail: &detail, Kind: protocol.SymbolKindClass,
			Range: doc.t.rangeOf(b.body.from, b.body.to), SelectionRange: doc.t.rangeOf(b.at.from, b.at.to)}
	}
	var top []protocol.DocumentSymbol
	for _, part := range doc.ix.parts {
		sym := partSymbol(doc, part)
		if part.block >= 0 {
			blocks[part.block].Children = append(blocks[part.block].Children, sym)
		} else {
			top = append(top, sym)
		}
	}
	out = append(out, blocks...)
	out = append(out, top...)
	seen := map[string]bool{}
	for _, n := range doc.ix.nets {
		if n.block >= 0 || seen[n.name] {
			continue
		}
		seen[n.name] = true
		detail := "net"
		out = append(out, protocol.DocumentSymbol{Name: valid(n.name), Detail: &detail, Kind: protocol.SymbolKindVariable,
			Range: doc.t.rangeOf(n.at.from, n.at.to), SelectionRange: doc.t.rangeOf(n.at.from, n.at.to)})
	}
	return out, nil
}

func partSymbol(f indexed, part partRef) protocol.DocumentSymbol {
	kind := protocol.SymbolKindField
	detail := part.kind
	if part.instance {
		kind, detail = protocol.SymbolKindObject, "instance of "+part.kind
	}
	detail = valid(detail)
	return protocol.DocumentSymbol{Name: valid(part.name), Detail: &detail, Kind: kind,
		Range: f.t.rangeOf(part.stmt.from, part.stmt.to), SelectionRange: f.t.rangeOf(part.at.from, part.at.to)}
}

// Limits of the workspace symbol search: it reads at most this many
// files, each at most this large, and returns at most this many symbols.
const (
	maxSymbolFiles   = 2000
	maxSymbolFileLen = 4 << 20
	maxSymbols       = 500
)

// Symbols finds blocks, parts and instances whose names contain the query
// (in any letter case), in the open documents and the .nodal files of the
// workspace folders.
func (s *Server) Symbols(ctx context.Context, p *protocol.WorkspaceSymbolParams) (_ protocol.WorkspaceSymbolResult, err error) {
	defer guard(&err)
	q := strings.ToLower(p.Query)
	s.mu.Lock()
	open := map[string][]byte{}
	for _, d := range s.docs {
		if d.path != "" {
			open[d.path] = d.text
		}
	}
	roots, utf8 := s.roots, s.utf8
	s.mu.Unlock()
	out := protocol.WorkspaceSymbolSlice{}
	add := func(f indexed, name, container string, kind protocol.SymbolKind, sp span) bool {
		if len(out) >= maxSymbols {
			return false
		}
		if strings.Contains(strings.ToLower(name), q) {
			l := f.loc(sp)
			sym := protocol.WorkspaceSymbol{Location: &l}
			sym.Name, sym.Kind = valid(name), kind
			if container != "" {
				c := valid(container)
				sym.ContainerName = &c
			}
			out = append(out, sym)
		}
		return true
	}
	visit := func(path string, src []byte) bool {
		f := indexed{uri.File(path), newIndex(path, src), newText(src, utf8)}
		for _, b := range f.ix.blocks {
			if !add(f, b.name, "", protocol.SymbolKindClass, b.at) {
				return false
			}
		}
		for _, part := range f.ix.parts {
			kind, container := protocol.SymbolKindField, ""
			if part.instance {
				kind = protocol.SymbolKindObject
			}
			if part.block >= 0 {
				container = f.ix.blocks[part.block].name
			}
			if !add(f, part.name, container, kind, part.at) {
				return false
			}
		}
		return true
	}
	seen := map[string]bool{}
	for path, src := range open {
		seen[path] = true
		if !visit(path, src) {
			return out, nil
		}
	}
	n := 0
	for _, root := range roots {
		filepath.WalkDir(root, func(path string, e fs.DirEntry, err error) error {
			if err != nil || ctx.Err() != nil {
				return filepath.SkipDir
			}
			if e.IsDir() {
				if path != root && strings.HasPrefix(e.Name(), ".") {
					return filepath.SkipDir
				}
				return nil
			}
			if !strings.HasSuffix(path, ".nodal") || !e.Type().IsRegular() || seen[path] {
				return nil
			}
			if n++; n > maxSymbolFiles {
				return fs.SkipAll
			}
			info, err := e.Info()
			if err != nil || info.Size() > maxSymbolFileLen {
				return nil
			}
			src, err := os.ReadFile(path)
			if err != nil {
				return nil
			}
			seen[path] = true
			if !visit(path, src) {
				return fs.SkipAll
			}
			return nil
		})
	}
	return out, nil
}
