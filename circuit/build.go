package circuit

// build.go: Build and the builder: its state, how it records findings,
// and the top level of a file in order. The steps of elaboration are listed
// in hier.go; a part statement is read in part.go.

import (
	"fmt"
	"path/filepath"

	"nodal/diag"
	"nodal/grammar"
	"nodal/units"
)

// Result is a built design with what elaboration found.
type Result struct {
	Design *Design
	// Findings are the findings of elaboration, repeats across instances
	// merged; package rules finishes them with the rules' own.
	Findings []Finding
	// Incomplete is set when a statement could not be placed in the design
	// at all (unknown kind, wrong pins): connectivity is then not fully
	// known and rules that reason about whole islands stay quiet.
	Incomplete bool
	// Invalid is set when a part has a value the solver cannot use.
	Invalid bool
	// Files lists the checked file and then the files brought in by
	// include, in the order they were first read, each once.
	Files []SourceFile
	// Unsure holds the net names that a line which did not parse, or a
	// statement that could not be placed, may have used: such a net may
	// have more pins than the design shows.
	Unsure map[string]bool
}

// SourceFile is a file of the design with its text and comments (for
// accept comments and for quoting source lines).
type SourceFile struct {
	File     *diag.File
	Src      []byte
	Comments []grammar.Comment
}

// Build elaborates a parsed file into a design, with default limits and no
// includes (an include is reported as an error).
func Build(file *diag.File, ast *grammar.File) *Result {
	return BuildFile(nil, file, nil, ast, nil)
}

// BuildFile elaborates a parsed file into a design: its blocks, the blocks
// of the files it includes (read through opt.ReadFile and added to fset),
// and its top-level statements with every block instance expanded. src is
// the file's text, used to quote expressions in messages; it may be nil.
func BuildFile(fset *diag.FileSet, file *diag.File, src []byte, ast *grammar.File, opt *Options) *Result {
	b := &builder{
		fset: fset, file: file, r: &Result{Design: NewDesign(file.Name())},
		srcs: map[*diag.File][]byte{file: src}, blocks: map[string]*blockDef{},
		included: map[string]bool{}, active: map[string]int{},
	}
	if opt != nil {
		b.opt = *opt
	}
	if b.opt.MaxDepth <= 0 {
		b.opt.MaxDepth = DefaultMaxDepth
	}
	if b.opt.MaxNameBytes <= 0 {
		b.opt.MaxNameBytes = DefaultMaxNameBytes
	}
	if b.opt.MaxParts <= 0 {
		b.opt.MaxParts = DefaultMaxParts
	}
	b.found.Use(b.r.Design)
	b.r.Files = append(b.r.Files, SourceFile{File: file, Src: src, Comments: ast.Comments})
	b.run(ast)
	b.r.Findings = b.found.All()
	return b.r
}

type builder struct {
	fixes      []diag.Fix                     // for the next finding reported (see reportFix)
	quantities map[quantityKey]units.Quantity // see quantity
	fset       *diag.FileSet
	opt        Options
	file       *diag.File // the file of the statement being elaborated
	srcs       map[*diag.File][]byte
	r          *Result
	designPos  diag.Pos
	firstPart  diag.Pos
	groundStmt diag.Pos
	groundName string

	blocks    map[string]*blockDef
	blockList []*blockDef
	included  map[string]bool // identities of the files read
	active    map[string]int  // identities of the files being included: their index in the stack
	top       *blockDef       // the top level, as a block without pins

	sc *scope // the scope being elaborated
	// subject is the part or instance whose statement is being
	// elaborated: its instance and its own name, joined into its path only
	// when a finding is made about it.
	subject subject
	count   int64 // parts and instances made so far
	text    int64 // bytes of the names made so far
	refused bool  // an instance was refused for the size limit

	// Findings inside blocks are made once per instance; the collector
	// merges the repeats as they come.
	found   Findings
	probing bool
	failed  []string // includes that could not be read, for later messages

	// plain is the checked file's tree, whose plain lines (see topStmt)
	// are built ahead (ahead.go).
	plain *grammar.File
	// sink, when set, takes the findings reported instead of found: a
	// builder that fills plain lines ahead keeps them for the walk in file
	// order to add (ahead.go).
	sink *[]Finding
}

// partName is st's part or instance name, without making a plain line's
// nodes.
func (b *builder) partName(st *bodyStmt) string {
	if st.plain > 0 {
		return b.plain.PlainName(int(st.plain - 1))
	}
	return st.pt.Name.Text
}

// partKind is st's kind or block word, without making a plain line's
// nodes.
func (b *builder) partKind(st *bodyStmt) string {
	if st.plain > 0 {
		return b.plain.PlainKind(int(st.plain - 1))
	}
	return st.pt.Kind.Text
}

// subject is a name being elaborated, inside instance inst (-1: the top
// level, or a block's text).
type subject struct {
	inst int32
	name string
}

// nameOf is part p's name with its instance path, for a message.
func (b *builder) nameOf(p *Part) string { return b.r.Design.NameOf(p) }

// pos returns the diag.Pos of an offset the grammar gave for the file
// being read.
func (b *builder) pos(o grammar.Offset) diag.Pos { return o.At(b.file) }

// report records a finding of elaboration with its rule's default
// severity.
func (b *builder) report(code Code, pos, end diag.Pos, format string, args ...any) {
	b.reportSev(code, diag.Off, pos, end, format, args...)
}

// reportSev records a finding with the given severity (Off: the rule's
// default). A finding made inside an instance (or while probing an unused
// block) carries the instance's path, so that the collector merges its
// repeats across instances.
func (b *builder) reportSev(code Code, sev diag.Severity, pos, end diag.Pos, format string, args ...any) {
	f := Finding{Diagnostic: diag.Diagnostic{Pos: pos, End: end, Rule: code.String(), Severity: sev,
		Message: fmt.Sprintf(format, args...), Subject: b.r.Design.Qualified(b.subject.inst, b.subject.name), Fixes: b.fixes}, Code: code, Inst: -1}
	b.fixes = nil
	if sc := b.sc; sc != nil && (sc.inst >= 0 || b.probing) {
		f.Path = b.r.Design.InstancePath(sc.inst)
		if !b.probing {
			f.Inst = sc.inst // the scratch design's instances are not kept
		}
	}
	if b.sink != nil {
		*b.sink = append(*b.sink, f)
		return
	}
	b.found.Add(f)
}

// where names a position for a message: "line 4" in the same file,
// "lib/stages.nodal:4" in another.
func (b *builder) where(p diag.Pos) string {
	if b.fset == nil {
		return fmt.Sprintf("line %d", b.file.Position(p).Line)
	}
	pp := b.fset.Position(p)
	if pp.Filename == b.file.Name() {
		return fmt.Sprintf("line %d", pp.Line)
	}
	return fmt.Sprintf("%s:%d", pp.Filename, pp.Line)
}

func (b *builder) syntaxErrors(ast *grammar.File) {
	for _, e := range ast.Errors {
		end := e.End
		if end <= e.Pos {
			end = e.Pos
		}
		b.report(CodeSyntax, b.pos(e.Pos), b.pos(end), "%s", e.Msg)
		b.r.Incomplete = true
		for _, w := range e.Words {
			if b.r.Unsure == nil {
				b.r.Unsure = map[string]bool{}
			}
			b.r.Unsure[netName(w)] = true
		}
	}
}

func (b *builder) run(ast *grammar.File) {
	d := b.r.Design
	// Size the net table once (reserve sizes the parts): a mesh has about
	// one net per two parts.
	d.Reserve(0, (len(ast.Stmts)+ast.PlainLines())/2+1)
	b.syntaxErrors(ast)
	topFile := b.file
	topID, err := b.identify(topFile.Name())
	if err != nil {
		topID = filepath.Clean(topFile.Name()) // standard input, or a file read elsewhere
	}
	b.included[topID] = true
	b.active[topID] = 0
	b.plain = ast
	top := b.collect(ast, []string{filepath.Clean(topFile.Name())})
	delete(b.active, topID)
	b.file = topFile
	for _, ts := range top {
		if st := ts.st; st != nil && st.Ground != nil {
			b.groundName = netName(st.Ground.Net.Text)
			break
		}
	}
	b.top = &blockDef{file: topFile, isTop: true}
	n, trees := 0, 0
	for _, ts := range top {
		switch {
		case ts.st == nil:
			n++
		case ts.st.Part != nil:
			n++
			trees++
		}
	}
	// The top level's statements, in two allocations.
	slab, treeSlab := make([]bodyStmt, n), make([]stmtTree, trees)
	b.top.body = make([]*bodyStmt, 0, n)
	for _, ts := range top {
		switch st := ts.st; {
		case st == nil:
			start, end := ast.PlainSpan(ts.plain)
			slab[len(b.top.body)] = bodyStmt{plain: int32(ts.plain) + 1, pos: b.pos(start), end: b.pos(end)}
		case st.Part != nil:
			tree := &treeSlab[0]
			treeSlab = treeSlab[1:]
			tree.pt = st.Part
			slab[len(b.top.body)] = bodyStmt{pos: b.pos(st.Start()), end: b.pos(st.End()), stmtTree: tree}
		default:
			continue
		}
		b.top.body = append(b.top.body, &slab[len(b.top.body)])
	}
	plain := b.startAhead(topFile) // while the statements are prepared
	for _, bd := range b.blockList {
		b.prepareHeader(bd)
	}
	for _, bd := range b.blockList {
		b.prepare(bd)
	}
	b.prepare(b.top)
	for _, bd := range b.blockList {
		b.measure(bd, nil)
	}
	b.reserve()

	b.file = topFile
	topScope := &scope{blk: b.top, inst: -1}
	plain.walk(b)
	next := 0
	var ports []pendingDrive
	for _, ts := range top {
		st := ts.st
		if st == nil {
			if bs := b.top.body[next]; !b.firstPart.IsValid() {
				b.firstPart = bs.pos
			}
			b.placePlain(plain, next)
			next++
			continue
		}
		pos, end := b.pos(st.Start()), b.pos(st.End())
		switch {
		case st.Design != nil:
			if b.designPos.IsValid() {
				b.report(CodeDuplicateName, pos, end, "second design header; the file already has one (line %d)", b.file.Position(b.designPos).Line)
				continue
			}
			b.designPos = pos
			d.Name = st.Design.Name.Text
			if st.Design.Title != nil {
				d.Title = unquote(st.Design.Title.Text)
			}
		case st.Ground != nil:
			n := st.Ground.Net
			name := netName(n.Text)
			if d.Ground != NoNet {
				if d.Nets[d.Ground].Local == name {
					b.reportSev(CodeExtraGround, diag.Warning, pos, end, "ground %s is already declared (line %d)", name, b.file.Position(b.groundStmt).Line)
				} else {
					b.report(CodeExtraGround, pos, end, "second ground %s: the design already takes %s (line %d) as its 0 V reference; join the two with a wire if they are the same net", name, d.Nets[d.Ground].Local, b.file.Position(b.groundStmt).Line)
				}
				continue
			}
			d.Ground = d.Net(name, b.pos(n.Start()), b.nameEnd(n))
			d.GroundPos = pos
			b.groundStmt = pos
		case st.Ambient != nil:
			b.ambient(st.Ambient, pos, end)
		case st.Port != nil:
			for _, n := range st.Port.Nets {
				id := d.Net(netName(n.Text), b.pos(n.Start()), b.nameEnd(n))
				d.Nets[id].Port = true
			}
			ports = append(ports, pendingDrive{port: st.Port, pos: pos, end: end})
		case st.Part != nil:
			if !b.firstPart.IsValid() {
				b.firstPart = pos
			}
			b.stmt(topScope, b.top.body[next])
			next++
		}
	}
	plain.finish(d)
	b.drives(ports)
	b.probeUnused()
	b.unusedBlocks()
	if d.Ground == NoNet && len(d.Parts) > 0 || d.Ground == NoNet && b.firstPart.IsValid() {
		p := b.firstPart
		b.report(CodeNoGround, p, p, "the design has parts but no ground net; add a line such as \"ground gnd\" naming its 0 V reference")
	}
}

func (b *builder) nameEnd(n *grammar.Name) diag.Pos {
	return b.pos(n.End())
}

func unquote(s string) string {
	if len(s) >= 2 && s[0] == '"' && s[len(s)-1] == '"' {
		return s[1 : len(s)-1]
	}
	return s
}

func netName(s string) string { return unquote(s) }
