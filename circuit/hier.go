package circuit

// hier.go: blocks, instances, parameters and includes.
//
// Elaboration runs in four steps, each linear in what it walks:
//
//  1. collect: split each file into its top-level statements and its block
//     definitions, following includes (each file is read and parsed once).
//  2. prepare: resolve every statement of every block once: its kind or
//     block, its nets (a block pin, the ground, or a net local to the
//     block), its pin and parameter bindings. Findings about a block's text
//     are made here, once, whatever the number of instances.
//  3. measure: the expanded size and depth of each block, bottom-up, with
//     recursion found on the way. Limits are checked against these numbers
//     before anything is expanded.
//  4. expand: top-level statements in order, each instance walking its
//     block's prepared statements with its pin nets and parameter values.
//     Per instance this allocates its path, its pin, local-net and
//     parameter slices, and the parts themselves: nothing is re-parsed and
//     no name is built more than once.

import (
	"errors"
	"fmt"
	"io/fs"
	"math"
	"path/filepath"
	"strconv"
	"strings"
	"unicode/utf8"

	"nodal/diag"
	"nodal/grammar"
	"nodal/input"
	"nodal/units"
)

// Default limits on expansion.
const (
	DefaultMaxDepth = 64
	DefaultMaxParts = 10_000_000
	// DefaultMaxNameBytes bounds the instance-path text of one design:
	// 256 MiB, some 25 bytes a name at the part limit.
	DefaultMaxNameBytes = 256 << 20
)

// Options change elaboration.
type Options struct {
	// ReadFile reads an included file. Nil refuses includes.
	ReadFile func(path string) ([]byte, error)
	// Identify returns the identity of a file before it is read: paths
	// that reach the same file (through symbolic links, say) must give the
	// same identity, so that each file is read and parsed once. An error
	// wrapping input.ErrOutside refuses the include without reading it.
	// Nil: the cleaned path is the identity.
	Identify func(path string) (string, error)
	// MaxDepth bounds the nesting of instances; 0 means DefaultMaxDepth.
	MaxDepth int
	// MaxParts bounds the parts and instances the design expands to; 0
	// means DefaultMaxParts.
	MaxParts int64
	// MaxNameBytes bounds the bytes of the dotted names (parts, local
	// nets, instances) that instances make; 0 means DefaultMaxNameBytes.
	MaxNameBytes int64
}

// blockDef is a block definition, or (isTop) the top level of the checked
// file seen as a block without pins or parameters.
type blockDef struct {
	name     string
	file     *diag.File
	pos, end diag.Pos // the header line
	nameEnd  diag.Pos
	header   *grammar.Block
	isTop    bool
	lib      bool // defined in an included file
	closed   bool

	pins     []string
	pinPos   []diag.Pos
	pinIndex map[string]int
	params   []paramDef
	parIndex map[string]int
	body     []*bodyStmt
	locals   []string // nets local to the block, by first use

	state     uint8 // measure: 0 new, 1 on the stack, 2 done
	recursive bool
	size      int64 // parts and instances one instance makes, itself included
	names     int64 // names one instance makes below its own path: parts, instances, local nets
	text      int64 // bytes of those names, without the instance's own path in front
	parts     int64 // built-in parts one instance makes
	depth     int   // 1 for a block that instantiates no block
	used      bool  // named by some instance statement
	expanded  bool
}

type paramDef struct {
	name     string
	def      *grammar.Value // nil when the parameter has no default
	pos, end diag.Pos
	dim      units.Dim // the default's unit, when known
	percent  bool
	dimKnown bool
}

// Net references in a prepared statement.
const (
	refNamed  = iota // a top-level net, by name
	refPin           // a pin of the enclosing block
	refGround        // the design's ground
	refLocal         // a net local to the block
)

type netRef struct {
	kind uint8
	idx  int32
	name string
}

// bodyStmt is one prepared part or instance statement.
type bodyStmt struct {
	pt       *grammar.Part
	pos, end diag.Pos
	kind     Kind
	blk      *blockDef // set for an instance
	ok       bool      // false: the statement cannot be placed
	nets     []netRef  // one per written pin
	pinNets  [2]netRef // nets of a two-pin statement, without an allocation
	bind     []int     // instance: for each pin of blk, the index in nets
	assign   []int     // instance: for each parameter of blk, the index in pt.Params, or -1
	valueErr bool      // instance: carries a value or attributes it cannot take
}

// scope is one block instance being expanded (or the top level).
type scope struct {
	blk    *blockDef
	prefix string // "CH2." inside instance CH2; "" at the top
	pins   []NetID
	local  []NetID
	env    []binding
	inst   int32
	depth  int
}

type binding struct {
	q   units.Quantity
	set bool
}

// collect splits a parsed file into its top-level statements and its
// blocks, and follows its includes. stack holds the files being included,
// outermost first, to find cycles.
func (b *builder) collect(ast *grammar.File, stack []string) []*grammar.Statement {
	var top []*grammar.Statement
	var open *blockDef
	lib := len(stack) > 1
	for _, st := range ast.Stmts {
		pos, end := b.pos(st.Pos), b.pos(st.EndPos)
		switch {
		case st.Block != nil:
			if open != nil {
				b.report(CodeSyntax, open.pos, open.end, "block %s is not closed before block %s starts (line %d); blocks do not nest: add a line with } after its last statement", open.name, st.Block.Name.Text, b.file.Position(pos).Line)
				b.r.Incomplete = true
			}
			open = b.define(st.Block, pos, end, lib)
		case st.Close != nil:
			if open == nil {
				b.report(CodeSyntax, pos, end, "} closes no block")
				b.r.Incomplete = true
				continue
			}
			open.closed = true
			open = nil
		case st.Include != nil:
			if open != nil {
				b.report(CodeSyntax, pos, end, "include belongs at the top level of a file, not inside block %s", open.name)
				continue
			}
			b.include(st.Include, pos, end, stack)
		case open != nil && st.Part != nil:
			open.body = append(open.body, &bodyStmt{pt: st.Part, pos: pos, end: end})
		case open != nil:
			what := "ground"
			switch {
			case st.Port != nil:
				what = "port"
			case st.Design != nil:
				what = "design"
			case st.Ambient != nil:
				what = "ambient"
			}
			msg := what + " belongs at the top level, not inside block " + open.name
			if what == "ground" {
				msg += "; inside a block the design's ground net is reached by its name"
			} else if what == "port" {
				msg += "; a block's pins are its ports"
			}
			b.report(CodeSyntax, pos, end, "%s", msg)
		default:
			top = append(top, st)
		}
	}
	if open != nil {
		b.report(CodeSyntax, open.pos, open.end, "block %s is not closed; add a line with } after its last statement", open.name)
		b.r.Incomplete = true
	}
	return top
}

// define records a block header.
func (b *builder) define(h *grammar.Block, pos, end diag.Pos, lib bool) *blockDef {
	bd := &blockDef{name: h.Name.Text, file: b.file, pos: pos, end: end, nameEnd: b.nameEnd(h.Name), header: h, lib: lib}
	if _, builtin := kindOf(bd.name); builtin {
		b.report(CodeDuplicateName, pos, end, "block %s has the name of a built-in kind; choose another name", bd.name)
		return bd // defined, but never found by name
	}
	if prev, dup := b.blocks[bd.name]; dup {
		b.report(CodeDuplicateName, pos, end, "block %s is already defined at %s", bd.name, b.where(prev.pos))
		return bd
	}
	b.blocks[bd.name] = bd
	b.blockList = append(b.blockList, bd)
	return bd
}

// include reads, parses and collects an included file.
func (b *builder) include(inc *grammar.Include, pos, end diag.Pos, stack []string) {
	rel := unquote(inc.Path.Text)
	if strings.TrimSpace(rel) == "" {
		b.report(CodeBadInclude, pos, end, "include needs a file name")
		b.r.Incomplete = true
		return
	}
	path := filepath.FromSlash(rel)
	if !filepath.IsAbs(path) {
		path = filepath.Join(filepath.Dir(b.file.Name()), path)
	}
	path = filepath.Clean(path)
	if b.opt.ReadFile == nil || b.fset == nil {
		b.report(CodeBadInclude, pos, end, "cannot include %s: this check reads no files", showPath(rel))
		b.r.Incomplete = true
		b.failed = append(b.failed, fmt.Sprintf("%s (%s)", showPath(rel), b.where(pos)))
		return
	}
	id, err := b.identify(path)
	if err == nil {
		if i, open := b.active[id]; open {
			chain := append(append([]string{}, stack[i:]...), path)
			b.report(CodeBadInclude, pos, end, "include cycle: %s", strings.Join(chain, " → "))
			b.r.Incomplete = true
			return
		}
		if b.included[id] {
			return // already brought in by another include
		}
	}
	var src []byte
	if err == nil {
		src, err = b.opt.ReadFile(path)
	}
	if err != nil {
		b.report(CodeBadInclude, pos, end, "%s", includeError(rel, path, err))
		b.r.Incomplete = true
		b.failed = append(b.failed, fmt.Sprintf("%s (%s)", showPath(rel), b.where(pos)))
		return
	}
	b.included[id] = true
	file := b.fset.AddFile(path, src)
	b.srcs[file] = src
	ast := grammar.ParseShared(path, src) // src is kept unchanged in b.r.Files
	b.r.Files = append(b.r.Files, SourceFile{File: file, Src: src, Comments: ast.Comments})
	saved := b.file
	b.file = file
	b.syntaxErrors(ast)
	b.active[id] = len(stack)
	b.collect(ast, append(stack, path)) // top-level statements of a library are its own
	delete(b.active, id)
	b.file = saved
}

// identify is Options.Identify, or the cleaned path.
func (b *builder) identify(path string) (string, error) {
	if b.opt.Identify == nil {
		return filepath.Clean(path), nil
	}
	return b.opt.Identify(path)
}

// includeError says why an included file could not be read. A path that
// leads outside the folders nodal reads is named only as written, and
// nothing about its target is said.
func includeError(rel, path string, err error) string {
	switch {
	case errors.Is(err, input.ErrOutside):
		return fmt.Sprintf("include %s leads outside the folders nodal reads (the repository, or the roots set in nodal.toml or by --root); nothing of it was read", strconv.Quote(rel))
	case errors.Is(err, fs.ErrNotExist):
		return fmt.Sprintf("included file %s does not exist (an include path is relative to the file that includes it)", showPath(path))
	}
	return fmt.Sprintf("cannot read included file %s: %v", showPath(path), unwrapPath(err))
}

func unwrapPath(err error) error {
	var pe *fs.PathError
	if errors.As(err, &pe) {
		return pe.Err
	}
	return err
}

// prepareHeader resolves a block's pins and parameters.
func (b *builder) prepareHeader(bd *blockDef) {
	saved := b.file
	b.file = bd.file
	defer func() { b.file = saved }()
	if h := bd.header; h != nil {
		bd.pinIndex = make(map[string]int, len(h.Pins))
		for _, pn := range h.Pins {
			name := netName(pn.Text)
			if _, dup := bd.pinIndex[name]; dup {
				b.report(CodeBlockPin, b.pos(pn.Pos), b.nameEnd(pn), "block %s lists pin %s twice", bd.name, name)
				continue
			}
			bd.pinIndex[name] = len(bd.pins)
			bd.pins = append(bd.pins, name)
			bd.pinPos = append(bd.pinPos, b.pos(pn.Pos))
		}
		bd.parIndex = make(map[string]int, len(h.Params))
		for _, a := range h.Params {
			name := a.Name.Text
			if _, dup := bd.parIndex[name]; dup {
				b.report(CodeDuplicateName, b.pos(a.Pos), b.pos(a.EndPos), "block %s lists parameter %s twice", bd.name, name)
				continue
			}
			if why := grammar.ParamNameTrouble(name); why != "" {
				// Kept as a parameter, so that instances setting it are
				// not reported again; the block's statements cannot name it.
				b.report(CodeSyntax, b.pos(a.Pos), b.nameEnd(a.Name), "parameter %s of block %s: %s, so it cannot stand for a value; rename it (for example %s)", name, bd.name, why, paramRename(name))
			}
			bd.parIndex[name] = len(bd.params)
			bd.params = append(bd.params, paramDef{name: name, def: a.Value, pos: b.pos(a.Pos), end: b.pos(a.EndPos)})
		}
		b.defaultUnits(bd)
	}
}

// paramRename suggests a name for a parameter whose name is refused: the
// parameters of this language's own examples where one fits, otherwise the
// name with a suffix.
func paramRename(name string) string {
	switch name {
	case "vf":
		return "vdrop"
	case "tol":
		return "tolerance"
	case "rated":
		return "rating"
	case "dcr":
		return "rdc"
	}
	var b strings.Builder
	for _, r := range name {
		if r == '_' || r < utf8.RuneSelf && (r >= 'a' && r <= 'z' || r >= 'A' && r <= 'Z' || r >= '0' && r <= '9') {
			b.WriteRune(r)
		}
	}
	s := b.String()
	if s == "" || s[0] >= '0' && s[0] <= '9' {
		s = "p" + s
	}
	if grammar.ParamNameTrouble(s) != "" {
		s += "_value"
	}
	return s
}

// prepare resolves a block's statements once; every block's header is
// already prepared.
func (b *builder) prepare(bd *blockDef) {
	saved := b.file
	b.file = bd.file
	defer func() { b.file = saved }()
	localIndex := map[string]int{}
	names := make(map[string]*bodyStmt, len(bd.body))
	pinUsed := make([]bool, len(bd.pins))
	defer func() { b.subject = [2]string{} }()
	for _, st := range bd.body {
		pt := st.pt
		st.ok = true
		b.subject = [2]string{}
		if bd.isTop {
			b.subject[1] = pt.Name.Text // a block's text has no instance path
		}
		if len(pt.Pins) <= len(st.pinNets) {
			st.nets = st.pinNets[:len(pt.Pins)]
		} else {
			st.nets = make([]netRef, len(pt.Pins))
		}
		for i, pin := range pt.Pins {
			name := netName(pin.Net.Text)
			r := netRef{kind: refNamed, name: name}
			if !bd.isTop {
				if j, isPin := bd.pinIndex[name]; isPin {
					r = netRef{kind: refPin, idx: int32(j)}
					pinUsed[j] = true
				} else if name == b.groundName && name != "" {
					r = netRef{kind: refGround}
				} else {
					j, seen := localIndex[name]
					if !seen {
						j = len(bd.locals)
						localIndex[name] = j
						bd.locals = append(bd.locals, name)
					}
					r = netRef{kind: refLocal, idx: int32(j)}
				}
			}
			st.nets[i] = r
		}
		word := pt.Kind.Text
		if k, builtin := kindOf(word); builtin {
			st.kind = k
		} else if c, isBlock := b.blocks[word]; isBlock {
			st.blk = c
			c.used = true
		} else {
			b.unknownKind(bd, st)
			st.ok = false
			continue
		}
		if prev, dup := names[pt.Name.Text]; dup {
			what := prev.pt.Kind.Text
			if prev.blk == nil {
				what = prev.kind.String()
			}
			b.report(CodeDuplicateName, st.pos, st.end, "part name %s is already used by the %s on line %d", pt.Name.Text, what, b.file.Position(prev.pos).Line)
			st.ok = false
			continue
		}
		names[pt.Name.Text] = st
		if st.blk != nil {
			st.ok = b.bindInstance(bd, st)
		}
	}
	for j, used := range pinUsed {
		if !used {
			b.reportSev(CodeFloatingNet, diag.Warning, bd.pinPos[j], bd.pinPos[j]+diag.Pos(len(bd.pins[j])), "pin %s of block %s is connected to nothing inside the block; connect it, or remove it from the pin list", bd.pins[j], bd.name)
		}
	}
}

// defaultUnits evaluates the parameter defaults once, in order, so that an
// instance's value can be checked against the default's unit and a bad
// default is reported once at the block.
func (b *builder) defaultUnits(bd *blockDef) {
	env := make([]binding, len(bd.params))
	sc := &scope{blk: bd, env: env, inst: -1}
	saved := b.sc
	b.sc = sc
	defer func() { b.sc = saved }()
	for i := range bd.params {
		pd := &bd.params[i]
		if pd.def == nil {
			continue
		}
		if pd.def.Word != "" {
			b.report(CodeParamUnit, pd.pos, pd.end, "parameter %s of block %s: %s is a switch state; parameters are quantities", pd.name, bd.name, pd.def.Word)
			continue
		}
		q, err := b.quantity(pd.def)
		if err != nil {
			if rule, silent := errRule(err); !silent {
				b.report(rule, pd.pos, pd.end, "parameter %s of block %s: %s", pd.name, bd.name, err)
			}
			continue
		}
		pd.dim, pd.percent, pd.dimKnown = q.Dim, q.Percent, true
		env[i] = binding{q, true}
	}
}

// unknownKind reports a statement whose kind is neither built in nor a
// block.
func (b *builder) unknownKind(bd *blockDef, st *bodyStmt) {
	word, name := st.pt.Kind.Text, st.pt.Name.Text
	blockNames := make([]string, 0, len(b.blockList))
	for _, c := range b.blockList {
		blockNames = append(blockNames, c.name)
	}
	if s := diag.Suggest(word, blockNames); s != "" {
		b.report(CodeUnknownBlock, st.pos, st.end, "unknown block %q for %s; did you mean block %s?", word, name, s)
		return
	}
	if s := diag.Suggest(word, KindWords); s != "" {
		b.report(CodeUnknownKind, st.pos, st.end, "unknown part kind %q for %s; did you mean %q?", word, name, s)
		return
	}
	// Not near any kind: an instance of a block that is not defined,
	// whether or not it gives parameters.
	msg := fmt.Sprintf("no block or part kind is named %q (for %s)", word, name)
	switch {
	case len(blockNames) > 0:
		msg += "; blocks are " + listWords(blockNames, 10)
	case len(b.failed) > 0:
		msg += "; no block is defined"
	default:
		msg += "; no block is defined or included, and kinds are " + strings.Join(KindWords, ", ")
	}
	if len(b.failed) > 0 {
		what := "include " + b.failed[0] + " failed"
		if len(b.failed) > 1 {
			what = fmt.Sprintf("%d includes failed (%s)", len(b.failed), listWords(b.failed, 4))
		}
		msg += "; " + what + ", so the blocks it should bring are unknown"
	}
	b.report(CodeUnknownBlock, st.pos, st.end, "%s", msg)
}

func listWords(ws []string, max int) string {
	if len(ws) > max {
		return strings.Join(ws[:max], ", ") + fmt.Sprintf(" and %d more", len(ws)-max)
	}
	return strings.Join(ws, ", ")
}

// bindInstance binds an instance statement's nets to the block's pins and
// its parameter values to the block's parameters.
func (b *builder) bindInstance(bd *blockDef, st *bodyStmt) bool {
	c, pt := st.blk, st.pt
	inst := pt.Name.Text
	ok := true
	pinList := "(" + strings.Join(c.pins, ", ") + ")"
	if len(pt.Pins) != len(c.pins) {
		b.report(CodeBlockPin, st.pos, st.end, "instance %s binds %s; block %s has %s: %s", inst, plural(len(pt.Pins), "net"), c.name, plural(len(c.pins), "pin"), pinList)
		return false
	}
	st.bind = make([]int, len(c.pins))
	for j := range st.bind {
		st.bind[j] = -1
	}
	named := len(pt.Pins) > 0 && pt.Pins[0].Label != nil
	for i, pin := range pt.Pins {
		slot := i
		if (pin.Label != nil) != named {
			b.report(CodeBlockPin, st.pos, st.end, "instance %s mixes named and positional pins; name every pin (%s=…) or none", inst, c.pins[0])
			return false
		}
		if pin.Label != nil {
			j, found := c.pinIndex[pin.Label.Text]
			if !found {
				msg := fmt.Sprintf("block %s has no pin named %q; its pins are %s", c.name, pin.Label.Text, pinList)
				if s := diag.Suggest(pin.Label.Text, c.pins); s != "" {
					msg += fmt.Sprintf("; did you mean %s?", s)
				}
				b.report(CodeBlockPin, st.pos, st.end, "instance %s: %s", inst, msg)
				return false
			}
			slot = j
		}
		if st.bind[slot] >= 0 {
			b.report(CodeBlockPin, st.pos, st.end, "instance %s binds pin %s of block %s twice", inst, c.pins[slot], c.name)
			return false
		}
		st.bind[slot] = i
	}
	if pt.Value != nil || len(pt.Attrs) > 0 {
		b.report(CodeUnknownParam, st.pos, st.end, "instance %s of block %s takes no value or attributes after its pins; give its parameters in [ ]: %s", inst, c.name, paramList(c))
		st.valueErr = true
	}
	st.assign = make([]int, len(c.params))
	for j := range st.assign {
		st.assign[j] = -1
	}
	for i, a := range pt.Params {
		name := a.Name.Text
		j, found := c.parIndex[name]
		apos, aend := b.pos(a.Pos), b.pos(a.EndPos)
		switch {
		case !found:
			msg := fmt.Sprintf("block %s has no parameter %s", c.name, name)
			names := make([]string, len(c.params))
			for k := range c.params {
				names[k] = c.params[k].name
			}
			if s := diag.Suggest(name, names); s != "" {
				msg += fmt.Sprintf("; did you mean %s?", s)
			} else if len(names) > 0 {
				msg += "; its parameters are " + paramList(c)
			} else {
				msg += "; it takes none"
			}
			b.report(CodeUnknownParam, apos, aend, "instance %s: %s", inst, msg)
		case st.assign[j] >= 0:
			b.report(CodeDuplicateName, apos, aend, "instance %s gives parameter %s twice", inst, name)
		case a.Value == nil:
			b.report(CodeMissingParam, apos, aend, "instance %s: parameter %s needs a value (%s = …)", inst, name, name)
		default:
			st.assign[j] = i
		}
	}
	for j := range c.params {
		if st.assign[j] < 0 && c.params[j].def == nil {
			b.report(CodeMissingParam, st.pos, st.end, "instance %s of block %s needs parameter %s, which has no default: add [%s = …]", inst, c.name, c.params[j].name, c.params[j].name)
		}
	}
	return ok
}

func paramList(c *blockDef) string {
	if len(c.params) == 0 {
		return "none"
	}
	s := make([]string, len(c.params))
	for i, p := range c.params {
		s[i] = p.name
	}
	return listWords(s, 12)
}

// pathText is the bytes of the names an instance of c makes, its own path
// of n bytes included: every name below it carries that path and a dot.
func pathText(n int64, c *blockDef) int64 {
	return addSat(addSat(n, mulSat(n+1, c.names)), c.text)
}

func mulSat(a, b int64) int64 {
	if a != 0 && b > math.MaxInt64/a {
		return math.MaxInt64
	}
	return a * b
}

func addSat(a, b int64) int64 {
	if a > math.MaxInt64-b {
		return math.MaxInt64
	}
	return a + b
}

// measure computes the expanded size and depth of a block, reporting the
// instance statement that closes a cycle of blocks.
func (b *builder) measure(bd *blockDef, stack []*blockDef) {
	if bd.state != 0 {
		return
	}
	bd.state = 1
	stack = append(stack, bd)
	size, parts, depth := int64(1), int64(0), 0
	names := int64(len(bd.locals))
	var text int64
	for _, l := range bd.locals {
		text = addSat(text, int64(len(l)))
	}
	for _, st := range bd.body {
		if !st.ok {
			continue
		}
		c := st.blk
		if c == nil {
			size = addSat(size, 1)
			parts = addSat(parts, 1)
			names = addSat(names, 1)
			text = addSat(text, int64(len(st.pt.Name.Text)))
			continue
		}
		if c.state == 1 {
			var chain []string
			for i, s := range stack {
				if s == c {
					for _, t := range stack[i:] {
						t.recursive = true
						chain = append(chain, t.name)
					}
					break
				}
			}
			chain = append(chain, c.name)
			saved := b.file
			b.file = bd.file
			what := "instantiates itself"
			if len(chain) > 2 {
				what = "instantiates itself through " + strings.Join(chain[1:len(chain)-1], ", ")
			}
			b.report(CodeRecursiveBlock, st.pos, st.end, "block %s %s (%s): its expansion would never end", c.name, what, strings.Join(chain, " → "))
			b.file = saved
			st.ok = false
			b.r.Incomplete = true
			continue
		}
		b.measure(c, stack)
		if c.recursive {
			st.ok = false
			b.r.Incomplete = true
			continue
		}
		size = addSat(size, c.size)
		parts = addSat(parts, c.parts)
		depth = max(depth, c.depth)
		names = addSat(names, addSat(1, c.names))
		text = addSat(text, pathText(int64(len(st.pt.Name.Text)), c))
	}
	bd.size, bd.parts, bd.depth = size, parts, depth+1
	bd.names, bd.text = names, text
	bd.state = 2
}

// stmt elaborates one prepared statement in scope sc.
func (b *builder) stmt(sc *scope, st *bodyStmt) {
	b.sc = sc
	savedSubject := b.subject
	b.subject = [2]string{sc.prefix, st.pt.Name.Text}
	defer func() { b.sc, b.subject = nil, savedSubject }()
	nets := make([]NetID, len(st.nets))
	for i := range st.nets {
		nets[i] = b.net(sc, st, i)
	}
	switch {
	case !st.ok:
		b.countOnly(nets)
	case st.blk != nil:
		b.instance(sc, st, nets)
		b.sc = sc
	default:
		b.part(sc, st, nets)
	}
}

// net returns the net of a statement's i-th written pin in scope sc.
func (b *builder) net(sc *scope, st *bodyStmt, i int) NetID {
	d := b.r.Design
	r := st.nets[i]
	n := st.pt.Pins[i].Net
	switch r.kind {
	case refPin:
		return sc.pins[r.idx]
	case refGround:
		return d.Net(b.groundName, b.pos(n.Pos), b.nameEnd(n))
	case refLocal:
		id := sc.local[r.idx]
		if id == NoNet {
			id = d.localNet(sc.prefix+sc.blk.locals[r.idx], b.pos(n.Pos), b.nameEnd(n), sc.inst)
			sc.local[r.idx] = id
		}
		return id
	}
	return d.Net(r.name, b.pos(n.Pos), b.nameEnd(n))
}

// instance expands one instance statement.
func (b *builder) instance(parent *scope, st *bodyStmt, nets []NetID) {
	d := b.r.Design
	c := st.blk
	path := parent.prefix + st.pt.Name.Text
	if parent.depth+c.depth > b.opt.MaxDepth {
		b.report(CodeExpansionLimit, st.pos, st.end, "instance %s of block %s nests blocks %d deep, over the limit of %d (--max-depth)", path, c.name, parent.depth+c.depth, b.opt.MaxDepth)
		b.countOnly(nets)
		return
	}
	if b.refused {
		b.countOnly(nets) // the first instance over the size limit has been reported
		return
	}
	if addSat(b.count, c.size) > b.opt.MaxParts {
		b.refused = true
		b.report(CodeExpansionLimit, st.pos, st.end, "instance %s of block %s expands to %s parts and instances; with the %s before it that is over the limit of %s (--max-parts)", path, c.name, count(c.size), count(b.count), count(b.opt.MaxParts))
		b.countOnly(nets)
		return
	}
	// An instance at the top level accounts for every name below it (see
	// measure); nested ones are counted there.
	if text := pathText(int64(len(path)), c); parent.blk.isTop && addSat(b.text, text) > b.opt.MaxNameBytes {
		// Every part keeps its whole instance path, so long names nested
		// deep multiply: the names are bounded as the parts are.
		b.refused = true
		b.report(CodeExpansionLimit, st.pos, st.end, "instance %s of block %s makes %s of part, net and instance names; with the %s before it that is over the limit of %s on the names of one design (nest fewer levels or use shorter names)", path, c.name, byteCount(text), byteCount(b.text), byteCount(b.opt.MaxNameBytes))
		b.countOnly(nets)
		return
	}
	if parent.blk.isTop {
		b.text = addSat(b.text, pathText(int64(len(path)), c))
	}
	b.count++
	c.expanded = true
	sc := &scope{blk: c, prefix: path + ".", inst: int32(len(d.Instances)), depth: parent.depth + 1}
	d.Instances = append(d.Instances, Instance{Path: path, Block: c.name, Pos: st.pos, End: st.end, Parent: parent.inst})
	sc.pins = make([]NetID, len(c.pins))
	for j, i := range st.bind {
		sc.pins[j] = nets[i]
	}
	sc.local = make([]NetID, len(c.locals))
	for i := range sc.local {
		sc.local[i] = NoNet
	}
	sc.env = b.params(parent, st, c)
	if st.valueErr {
		b.r.Invalid = true
	}
	saved := b.file
	b.file = c.file
	for _, s := range c.body {
		b.stmt(sc, s)
	}
	b.file = saved
}

// params evaluates an instance's parameters: given values in the scope of
// the instance statement, defaults in the block's own scope (so a default
// may use the parameters before it).
func (b *builder) params(parent *scope, st *bodyStmt, c *blockDef) []binding {
	env := make([]binding, len(c.params))
	for j := range c.params {
		pd := &c.params[j]
		if i := st.assign[j]; i >= 0 {
			a := st.pt.Params[i]
			b.sc = parent
			q, ok := b.paramValue(a.Value, b.pos(a.Pos), b.pos(a.EndPos), st.pt.Name.Text, pd)
			if ok && pd.dimKnown && (q.Dim != pd.dim || q.Percent != pd.percent) {
				b.report(CodeParamUnit, b.pos(a.Pos), b.pos(a.EndPos), "instance %s: parameter %s of block %s is a %s (default %s), but is given %s, a %s", parent.prefix+st.pt.Name.Text, pd.name, c.name, nounOf(pd.dim, pd.percent), b.describe(pd.def), b.describe(a.Value), nounOf(q.Dim, q.Percent))
				ok = false
			}
			env[j] = binding{q, ok}
			continue
		}
		if pd.def == nil {
			continue // missing-param has said it
		}
		saved := b.file
		b.file = c.file
		b.sc = &scope{blk: c, env: env, inst: -1}
		q, err := b.quantity(pd.def)
		b.file = saved
		// a bad default was reported once, at the block
		env[j] = binding{q, err == nil}
	}
	b.sc = parent
	return env
}

// paramValue evaluates a parameter value given at an instance.
func (b *builder) paramValue(v *grammar.Value, pos, end diag.Pos, inst string, pd *paramDef) (units.Quantity, bool) {
	if v.Word != "" {
		b.report(CodeParamUnit, pos, end, "instance %s: parameter %s: %s is a switch state; parameters are quantities", inst, pd.name, v.Word)
		return units.Quantity{}, false
	}
	q, err := b.quantity(v)
	if err != nil {
		if rule, silent := errRule(err); !silent {
			b.report(rule, pos, end, "instance %s: parameter %s: %s", inst, pd.name, err)
		}
		return q, false
	}
	return q, true
}

func nounOf(d units.Dim, percent bool) string {
	if percent {
		return "percentage"
	}
	return d.Noun()
}

// count writes a number of parts: 1200, 1.5 million, 10 billion.
func count(n int64) string {
	switch {
	case n == math.MaxInt64:
		return "more than 9 × 10¹⁸"
	case n >= 1e9 && n%1e9 == 0:
		return fmt.Sprintf("%d billion", n/1e9)
	case n >= 1e9:
		return fmt.Sprintf("%.1f billion", float64(n)/1e9)
	case n >= 1e6 && n%1e6 == 0:
		return fmt.Sprintf("%d million", n/1e6)
	case n >= 1e6:
		return fmt.Sprintf("%.1f million", float64(n)/1e6)
	}
	return fmt.Sprint(n)
}

// eval evaluates an expression value in the current scope.
func (b *builder) eval(v *grammar.Value) (units.Quantity, error) {
	sc := b.sc
	look := func(name string) (units.Quantity, bool) { return units.Quantity{}, false }
	if sc != nil && sc.blk != nil && sc.blk.parIndex != nil {
		look = func(name string) (units.Quantity, bool) {
			j, ok := sc.blk.parIndex[name]
			if !ok {
				return units.Quantity{}, false
			}
			if j >= len(sc.env) || !sc.env[j].set {
				panic(unboundParam{})
			}
			return sc.env[j].q, true
		}
	}
	q, err := evalGuarded(v, look)
	if err == nil {
		return q, nil
	}
	ee, ok := err.(*ExprError)
	if !ok {
		return q, err
	}
	if ee.Code == CodeUnknownParam {
		if sc == nil || sc.blk == nil || sc.blk.isTop {
			ee.Msg += "; only a block's statements can use parameters"
		} else {
			names := make([]string, len(sc.blk.params))
			for i := range sc.blk.params {
				names[i] = sc.blk.params[i].name
			}
			if s := diag.Suggest(ee.Name, names); s != "" {
				ee.Msg += fmt.Sprintf(" in block %s; did you mean %s?", sc.blk.name, s)
			} else {
				ee.Msg += fmt.Sprintf(" in block %s; its parameters are %s", sc.blk.name, paramList(sc.blk))
			}
		}
	}
	if ee.Code != NoCode && v.Expr != nil {
		ee.Msg = b.exprText(v) + ": " + ee.Msg
	}
	return q, ee
}

// unboundParam stops an evaluation that uses a parameter whose own value
// was already reported as wrong.
type unboundParam struct{}

func evalGuarded(v *grammar.Value, look Lookup) (q units.Quantity, err error) {
	defer func() {
		if r := recover(); r != nil {
			if _, ok := r.(unboundParam); !ok {
				panic(r)
			}
			err = &ExprError{}
		}
	}()
	return EvalValue(v, look)
}

// exprText quotes an expression value as written, from its opening
// parenthesis to the one that closes it: "((12 V - vdrop) / i)".
func (b *builder) exprText(v *grammar.Value) string {
	src := b.srcs[b.file]
	o := v.Pos.Offset
	if src == nil || o < 0 || o >= len(src) || src[o] != '(' {
		return "(…)"
	}
	end, depth := o, 0
	for end < len(src) && src[end] != '\n' {
		switch src[end] {
		case '(':
			depth++
		case ')':
			depth--
		}
		end++
		if depth == 0 {
			break
		}
	}
	return string(src[o:end])
}

// probeUnused elaborates, into a scratch design, each block that no
// statement instantiates (expanding with it the blocks it uses), with its
// parameter defaults, so that a library checked on its
// own still has its values and pins checked. Parameters without a default
// stay unbound and what depends on them is not checked.
func (b *builder) probeUnused() {
	real := b.r.Design
	incomplete, invalid := b.r.Incomplete, b.r.Invalid
	for _, c := range b.blockList {
		if c.used || c.expanded || c.recursive || c.size > b.opt.MaxParts || c.depth > b.opt.MaxDepth || c.text > b.opt.MaxNameBytes {
			continue
		}
		scratch := NewDesign(real.File)
		b.r.Design = scratch
		b.probing = true
		saved := b.count
		b.count = 0
		sc := &scope{blk: c, inst: -1, depth: 1}
		sc.pins = make([]NetID, len(c.pins))
		for j, name := range c.pins {
			sc.pins[j] = scratch.Net(name, c.pinPos[j], c.pinPos[j])
		}
		sc.local = make([]NetID, len(c.locals))
		for i := range sc.local {
			sc.local[i] = NoNet
		}
		sc.env = make([]binding, len(c.params))
		b.file = c.file
		b.sc = &scope{blk: c, env: sc.env, inst: -1}
		for j := range c.params {
			if pd := &c.params[j]; pd.def != nil {
				q, err := b.quantity(pd.def)
				sc.env[j] = binding{q, err == nil}
			}
		}
		for _, s := range c.body {
			b.stmt(sc, s)
		}
		b.count = saved
		b.probing = false
		c.expanded = true // blocks it instantiates were expanded with it
	}
	b.r.Design = real
	b.r.Incomplete, b.r.Invalid = incomplete, invalid
	b.file = b.top.file
}

// unusedBlocks notes blocks of the checked file that no statement uses,
// when the file also has parts (a file of blocks alone is a library).
func (b *builder) unusedBlocks() {
	if len(b.top.body) == 0 {
		return
	}
	for _, c := range b.blockList {
		if !c.lib && !c.used {
			b.reportSev(CodeUnusedBlock, diag.Note, c.pos, c.nameEnd, "block %s is defined but no instance uses it", c.name)
		}
	}
}

// reserve sizes the design's part slice for the expanded top level, when it
// is within the limits, so that appending never copies it.
func (b *builder) reserve() {
	if b.top.isTop {
		b.measure(b.top, nil)
	}
	if n := b.top.parts; n > 0 && b.top.size <= b.opt.MaxParts {
		b.r.Design.Parts = make([]Part, 0, n)
	}
}

// showPath writes a path for a message: as it is, or quoted with escapes
// when it is not valid UTF-8, so that every message stays printable.
func showPath(p string) string {
	if utf8.ValidString(p) {
		return p
	}
	return strconv.Quote(p)
}

// byteCount formats a number of bytes for a message.
func byteCount(n int64) string {
	switch {
	case n >= 1<<30:
		return fmt.Sprintf("%.1f GiB", float64(n)/(1<<30))
	case n >= 1<<20:
		return fmt.Sprintf("%.1f MiB", float64(n)/(1<<20))
	case n >= 1<<10:
		return fmt.Sprintf("%.1f KiB", float64(n)/(1<<10))
	}
	return fmt.Sprintf("%d bytes", n)
}
