package lsp

import (
	"context"
	"errors"
	"fmt"
	"io/fs"
	"path/filepath"
	"slices"
	"time"

	"go.lsp.dev/protocol"
	"go.lsp.dev/uri"

	"nodal/check"
	"nodal/config"
	"nodal/diag"
	"nodal/input"
	"nodal/rules"
)

// document is an open file.
type document struct {
	uri     uri.URI
	path    string // "" for a buffer with no file
	text    []byte // never changed in place: an edit makes a new slice
	version int32
	gen     uint64 // counts edits

	timer   *time.Timer
	running bool // a check of this document runs
	again   bool // check again when it ends
	closed  bool

	last *snapshot // the latest check whose findings were published
}

func (d *document) setText(src []byte, version int32) {
	d.text, d.version = src, version
	d.gen++
}

func (d *document) stop() {
	d.closed = true
	if d.timer != nil {
		d.timer.Stop()
	}
}

// snapshot is one finished check of a document.
type snapshot struct {
	gen     uint64
	version int32
	text    *text
	res     *check.Result // nil when the check failed
	name    string        // the file name the check used
	cfg     *rules.Config // the settings it used; nil: the defaults
	files   []string      // the files it read, the document first
	diags   []published   // the findings shown on this document
}

// published is a finding as shown in the document.
type published struct {
	d        diag.Diagnostic
	from, to int  // byte offsets in the document
	own      bool // the finding is in this document, not in an included file
	lsp      protocol.Diagnostic
}

// schedule asks for a check of d, after the debounce delay when
// debounce is set. s.mu is held.
func (s *Server) schedule(d *document, debounce bool) {
	if s.shutdown || d.closed {
		return
	}
	d.gen++ // whatever asked for the check, the one before it is stale
	if d.timer != nil {
		d.timer.Stop()
	}
	if debounce && s.opt.Debounce > 0 {
		d.timer = time.AfterFunc(s.opt.Debounce, func() { s.start(d) })
		return
	}
	go s.start(d)
}

// dependents schedules a check of every open document whose latest check
// read d's file. s.mu is held.
func (s *Server) dependents(d *document) {
	if d.path == "" {
		return
	}
	for _, o := range s.docs {
		if o != d && o.last != nil && slices.Contains(o.last.files[1:], d.path) {
			s.schedule(o, true)
		}
	}
}

// start checks d unless a check of it runs; then that one is told to
// run again when it ends.
func (s *Server) start(d *document) {
	s.mu.Lock()
	if d.closed || s.shutdown {
		s.mu.Unlock()
		return
	}
	if d.running {
		d.again = true
		s.mu.Unlock()
		return
	}
	if d.last != nil && d.last.gen == d.gen {
		s.mu.Unlock()
		return // this text is checked and published already
	}
	d.running = true
	gen, version, src, path := d.gen, d.version, d.text, d.path
	overlay := make(map[string][]byte, len(s.docs))
	for _, o := range s.docs {
		if o.path != "" {
			overlay[o.path] = o.text
		}
	}
	utf8 := s.utf8
	s.mu.Unlock()

	s.sem <- struct{}{}
	snap := s.check(path, src, overlay, utf8)
	<-s.sem
	snap.gen, snap.version = gen, version

	s.mu.Lock()
	stale := d.gen != gen || d.closed
	if !stale {
		d.last = snap
	}
	s.mu.Unlock()
	if !stale {
		// Published while d still counts as running, so that no newer
		// check's findings can go out before these.
		diags := make([]protocol.Diagnostic, len(snap.diags))
		for i := range snap.diags {
			diags[i] = snap.diags[i].lsp
		}
		s.client.PublishDiagnostics(context.Background(), &protocol.PublishDiagnosticsParams{
			URI: d.uri, Version: protocol.NewOptional(version), Diagnostics: diags,
		})
	}
	s.mu.Lock()
	d.running = false
	again := d.again && !d.closed
	d.again = false
	s.mu.Unlock()
	if again {
		go s.start(d)
	}
}

// check runs nodal's check on a document's text. It never panics: an
// internal error becomes a finding at the top of the document.
func (s *Server) check(path string, src []byte, overlay map[string][]byte, utf8 bool) (snap *snapshot) {
	t := newText(src, utf8)
	name := path
	if name == "" {
		name = "untitled.nodal"
	}
	snap = &snapshot{text: t, name: name, files: []string{path}}
	var extra []published
	defer func() {
		if r := recover(); r != nil {
			snap.res = nil
			snap.diags = []published{topFinding(t, fmt.Sprintf("nodal: internal error while checking: %v; please report it with this file", r))}
		}
	}()
	opts := &check.Options{MaxParts: s.opt.MaxParts}
	if path == "" {
		opts.ReadFile = func(string) ([]byte, error) {
			return nil, errors.New("a file that is not saved reads no includes")
		}
	} else {
		read, identify, root, err := s.reader(path, overlay)
		if err != nil {
			extra = append(extra, topFinding(t, "nodal: "+err.Error()))
			opts.ReadFile = func(string) ([]byte, error) { return nil, err }
		} else {
			opts.ReadFile, opts.Identify = read, identify
			cfg, cerr := loadConfig(filepath.Dir(path), root, read)
			switch {
			case cerr != nil:
				extra = append(extra, topFinding(t, "nodal.toml: "+cerr.Error()))
			case cfg != nil && cfg.Skipped(path):
				snap.diags = nil // nodal.toml skips this file
				return snap
			case cfg != nil:
				rc := &rules.Config{Severity: cfg.Severity}
				for k, f := range cfg.Derating {
					rc.Derating.Set(k, f)
				}
				opts.Config = rc
				snap.cfg = rc
			}
		}
	}
	res, err := check.Source(name, src, opts)
	if err != nil {
		extra = append(extra, topFinding(t, "nodal: internal error: "+err.Error()))
	}
	snap.res = res
	if res != nil {
		for _, f := range res.Build.Files[1:] {
			snap.files = append(snap.files, filepath.Clean(f.File.Name()))
		}
		snap.diags = convert(res, t, name)
	}
	snap.diags = append(extra, snap.diags...)
	return snap
}

// reader returns how a check of the file at path reads its includes: the
// editor's buffers first, then the disk, both only below the file's tree
// (its repository's top level, or its folder outside one).
func (s *Server) reader(path string, overlay map[string][]byte) (read func(string) ([]byte, error), identify func(string) (string, error), root string, err error) {
	root, err = input.TreeRoot(filepath.Dir(path))
	if err != nil {
		return nil, nil, "", err
	}
	r, err := input.New([]string{root}, 0)
	if err != nil {
		return nil, nil, "", err
	}
	read = func(p string) ([]byte, error) {
		abs, err := filepath.Abs(p)
		if err != nil {
			return nil, err
		}
		if b, ok := overlay[abs]; ok && input.Within(abs, root) {
			return b, nil
		}
		return r.ReadFile(p)
	}
	identify = func(p string) (string, error) {
		id, err := r.Resolve(p)
		if err != nil {
			if abs, aerr := filepath.Abs(p); aerr == nil && overlay[abs] != nil && input.Within(abs, root) {
				return abs, nil // a buffer not saved yet
			}
		}
		return id, err
	}
	return read, identify, root, nil
}

// loadConfig reads the nodal.toml that applies to files in dir, or nil
// when there is none.
func loadConfig(dir, top string, read func(string) ([]byte, error)) (*config.Config, error) {
	p, src, err := config.Find(dir, top, func(p string) ([]byte, error) {
		b, err := read(p)
		if errors.Is(err, input.ErrOutside) {
			return nil, fs.ErrNotExist
		}
		return b, err
	})
	if err != nil || p == "" {
		return nil, err
	}
	known := func(id string) bool { return rules.Lookup(id) != nil }
	suggest := func(id string) string { return diag.Suggest(id, rules.Names()) }
	keys, _ := rules.DeratingDefaults()
	return config.Parse(p, src, known, suggest, keys)
}

func topFinding(t *text, msg string) published {
	return published{lsp: protocol.Diagnostic{
		Range:    t.rangeOf(0, 0),
		Severity: protocol.DiagnosticSeverityError,
		Source:   protocol.NewOptional("nodal"),
		Message:  protocol.String(valid(msg)),
	}}
}

var severities = map[diag.Severity]protocol.DiagnosticSeverity{
	diag.Error:   protocol.DiagnosticSeverityError,
	diag.Warning: protocol.DiagnosticSeverityWarning,
	diag.Note:    protocol.DiagnosticSeverityInformation,
}

// convert turns a check's findings into the document's diagnostics. A
// finding in an included file is shown where the document leads to it
// (the instance or include line that a related location names), with the
// file and line it is at.
func convert(res *check.Result, t *text, name string) []published {
	texts := map[string]*text{name: t}
	textOf := func(file string) *text {
		if x, ok := texts[file]; ok {
			return x
		}
		for _, f := range res.Build.Files {
			if f.File.Name() == file {
				x := newText(f.Src, t.utf8)
				texts[file] = x
				return x
			}
		}
		return nil
	}
	span := func(p, e diag.Pos) (string, int, int) {
		pp := res.Fset.Position(p)
		to := pp.Offset
		if e.IsValid() {
			if ep := res.Fset.Position(e); ep.Filename == pp.Filename {
				to = ep.Offset
			}
		}
		return pp.Filename, pp.Offset, to
	}
	var out []published
	for _, d := range res.Diags {
		if !d.Pos.IsValid() {
			continue
		}
		file, from, to := span(d.Pos, d.End)
		msg := d.Message
		own := file == name
		if !own {
			found := false
			for _, r := range d.Related {
				if f, rf, rt := span(r.Pos, r.End); f == name {
					at := res.Fset.Position(d.Pos)
					msg = fmt.Sprintf("%s (at %s:%d:%d)", msg, filepath.Base(at.Filename), at.Line, at.Column)
					from, to, found = rf, rt, true
					break
				}
			}
			if !found {
				continue
			}
		}
		if to <= from {
			to = wordEnd(t.src, from)
		}
		pd := protocol.Diagnostic{
			Range:    t.rangeOf(from, to),
			Severity: severities[d.Severity],
			Code:     protocol.String(d.Rule),
			Source:   protocol.NewOptional("nodal"),
			Message:  protocol.String(valid(msg)),
		}
		for _, r := range d.Related {
			f, rf, rt := span(r.Pos, r.End)
			x := textOf(f)
			if x == nil {
				continue
			}
			pd.RelatedInformation = append(pd.RelatedInformation, protocol.DiagnosticRelatedInformation{
				Location: protocol.Location{URI: fileURI(f), Range: x.rangeOf(rf, max(rt, rf))},
				Message:  valid(r.Message),
			})
		}
		if !own {
			f, rf, rt := span(d.Pos, d.End)
			if x := textOf(f); x != nil {
				pd.RelatedInformation = append(pd.RelatedInformation, protocol.DiagnosticRelatedInformation{
					Location: protocol.Location{URI: fileURI(f), Range: x.rangeOf(rf, max(rt, wordEnd(x.src, rf)))},
					Message:  "the finding is here",
				})
			}
		}
		out = append(out, published{d: d, from: from, to: to, own: own, lsp: pd})
	}
	return out
}

func fileURI(path string) uri.URI {
	abs, err := filepath.Abs(path)
	if err != nil {
		abs = path
	}
	return uri.File(abs)
}

// wordEnd returns the end of the token at off: the run of characters up
// to a blank, a bracket or a comma, at least one byte when one is left on
// the line.
func wordEnd(src []byte, off int) int {
	i := off
	for i < len(src) {
		switch src[i] {
		case ' ', '\t', '\r', '\n', '(', ')', '[', ']', ',':
			if i == off && src[i] != '\n' && src[i] != '\r' {
				return i + 1
			}
			return i
		}
		i++
	}
	return i
}
