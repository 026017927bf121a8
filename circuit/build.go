package circuit

import (
	"fmt"
	"path/filepath"
	"strings"

	"github.com/alecthomas/participle/v2/lexer"

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
	// subject is the instance path of the part or instance whose
	// statement is being elaborated, in two pieces (the instance's prefix
	// and the name), joined only when a finding is made about it.
	subject [2]string
	count   int64 // parts and instances made so far
	text    int64 // bytes of the instance-path names made so far
	refused bool  // an instance was refused for the size limit

	// Findings inside blocks are made once per instance; the collector
	// merges the repeats as they come.
	found   Findings
	probing bool
	failed  []string // includes that could not be read, for later messages
}

func (b *builder) pos(p lexer.Position) diag.Pos { return b.file.Pos(clamp(p.Offset, b.file.Size())) }

func clamp(o, n int) int {
	if o < 0 {
		return 0
	}
	if o > n {
		return n
	}
	return o
}

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
		Message: fmt.Sprintf(format, args...), Subject: b.subject[0] + b.subject[1], Fixes: b.fixes}, Code: code, Inst: -1}
	b.fixes = nil
	if sc := b.sc; sc != nil && (sc.inst >= 0 || b.probing) {
		f.Path = strings.TrimSuffix(sc.prefix, ".")
		if !b.probing {
			f.Inst = sc.inst // the scratch design's instances are not kept
		}
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
		if end <= e.Offset {
			end = e.Offset
		}
		b.report(CodeSyntax, b.file.Pos(clamp(e.Offset, b.file.Size())), b.file.Pos(clamp(end, b.file.Size())), "%s", e.Msg)
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
	d.Reserve(0, len(ast.Stmts)/2+1)
	b.syntaxErrors(ast)
	topFile := b.file
	topID, err := b.identify(topFile.Name())
	if err != nil {
		topID = filepath.Clean(topFile.Name()) // standard input, or a file read elsewhere
	}
	b.included[topID] = true
	b.active[topID] = 0
	top := b.collect(ast, []string{filepath.Clean(topFile.Name())})
	delete(b.active, topID)
	b.file = topFile
	for _, st := range top {
		if st.Ground != nil {
			b.groundName = netName(st.Ground.Net.Text)
			break
		}
	}
	b.top = &blockDef{file: topFile, isTop: true}
	n := 0
	for _, st := range top {
		if st.Part != nil {
			n++
		}
	}
	// The top level's statements, in one allocation.
	slab := make([]bodyStmt, n)
	b.top.body = make([]*bodyStmt, 0, n)
	for _, st := range top {
		if st.Part != nil {
			bs := &slab[len(b.top.body)]
			*bs = bodyStmt{pt: st.Part, pos: b.pos(st.Pos), end: b.pos(st.EndPos)}
			b.top.body = append(b.top.body, bs)
		}
	}
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
	next := 0
	for _, st := range top {
		pos, end := b.pos(st.Pos), b.pos(st.EndPos)
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
				if d.Nets[d.Ground].Name == name {
					b.reportSev(CodeExtraGround, diag.Warning, pos, end, "ground %s is already declared (line %d)", name, b.file.Position(b.groundStmt).Line)
				} else {
					b.report(CodeExtraGround, pos, end, "second ground %s: the design already takes %s (line %d) as its 0 V reference; join the two with a wire if they are the same net", name, d.Nets[d.Ground].Name, b.file.Position(b.groundStmt).Line)
				}
				continue
			}
			d.Ground = d.Net(name, b.pos(n.Pos), b.nameEnd(n))
			d.GroundPos = pos
			b.groundStmt = pos
		case st.Ambient != nil:
			b.ambient(st.Ambient, pos, end)
		case st.Port != nil:
			for _, n := range st.Port.Nets {
				id := d.Net(netName(n.Text), b.pos(n.Pos), b.nameEnd(n))
				d.Nets[id].Port = true
			}
		case st.Part != nil:
			if !b.firstPart.IsValid() {
				b.firstPart = pos
			}
			b.stmt(topScope, b.top.body[next])
			next++
		}
	}
	b.probeUnused()
	b.unusedBlocks()
	if d.Ground == NoNet && len(d.Parts) > 0 || d.Ground == NoNet && b.firstPart.IsValid() {
		p := b.firstPart
		b.report(CodeNoGround, p, p, "the design has parts but no ground net; add a line such as \"ground gnd\" naming its 0 V reference")
	}
}

func (b *builder) nameEnd(n *grammar.Name) diag.Pos {
	return b.file.Pos(clamp(n.Pos.Offset+len(n.Text), b.file.Size()))
}

func unquote(s string) string {
	if len(s) >= 2 && s[0] == '"' && s[len(s)-1] == '"' {
		return s[1 : len(s)-1]
	}
	return s
}

func netName(s string) string { return unquote(s) }

// part elaborates one built-in part statement in scope sc, its nets already
// bound.
func (b *builder) part(sc *scope, st *bodyStmt, nets []NetID) {
	d := b.r.Design
	pt := st.pt
	pos, end := st.pos, st.end
	name := pt.Name.Text
	if sc.prefix != "" {
		name = sc.prefix + name
	}
	word := pt.Kind.Text
	kind := st.kind
	if len(pt.Params) > 0 {
		b.report(CodeSyntax, b.pos(pt.Params[0].Pos), end, "%s %s: parameters in [ ] are for block instances, not built-in parts", word, name)
		b.countOnly(nets)
		return
	}
	p := Part{Kind: kind, Name: name, Pos: pos, End: end, Inst: sc.inst, Ideality: 0}

	// Value first: for a source its unit decides the kind, and so the pins.
	valueOK := b.value(&p, pt)
	if !valueOK {
		b.r.Invalid = true
		if p.Kind.shared() {
			// Without a usable value a source is neither kind: its
			// pins cannot be placed.
			b.countOnly(nets)
			return
		}
	}
	info := p.Kind.Info()
	if !b.pins(&p, pt, nets, info) {
		b.countOnly(nets)
		return
	}
	// A refused value has said what the kind needs instead.
	if !b.attrs(&p, pt, info, valueOK || pt.Value == nil) {
		b.r.Invalid = true
	}
	b.count++
	d.AddPart(p)
}

// countOnly counts a statement's nets as used even though the statement
// cannot be placed, so that one bad line does not make its neighbours look
// floating; and it marks them unsure, so that a net only that line names
// is not reported floating either: the line's own finding says what to
// fix.
func (b *builder) countOnly(nets []NetID) {
	for _, n := range nets {
		net := &b.r.Design.Nets[n]
		net.Pins++
		if !b.probing { // a scratch design's names are not the design's
			if b.r.Unsure == nil {
				b.r.Unsure = map[string]bool{}
			}
			b.r.Unsure[net.Name] = true
		}
	}
	b.r.Incomplete = true
}

// plural writes a count with its noun: "1 pin", "3 pins", "no pins".
func plural(n int, noun string) string {
	switch n {
	case 0:
		return "no " + noun + "s"
	case 1:
		return "1 " + noun
	}
	return fmt.Sprintf("%d %ss", n, noun)
}

// pins binds the statement's nets to the kind's pins, by position or name.
func (b *builder) pins(p *Part, pt *grammar.Part, nets []NetID, info *KindInfo) bool {
	word := pt.Kind.Text
	if len(pt.Pins) != 2 {
		b.report(CodePinCount, p.Pos, p.End, "%s %s has %s; %s has two: (%s, %s)", word, p.Name, plural(len(pt.Pins), "pin"), article(p.Kind.String()), info.Pins[0], info.Pins[1])
		return false
	}
	var set [2]bool
	for i, pin := range pt.Pins {
		slot := i
		if pin.Label != nil {
			slot = -1
			for j, pn := range info.Pins {
				if pn == pin.Label.Text {
					slot = j
				}
			}
			if slot < 0 {
				b.report(CodePinCount, p.Pos, p.End, "%s %s has no pin named %q; its pins are %s and %s", word, p.Name, pin.Label.Text, info.Pins[0], info.Pins[1])
				return false
			}
		} else if i > 0 && pt.Pins[0].Label != nil {
			b.report(CodePinCount, p.Pos, p.End, "%s %s mixes named and positional pins; name both (%s=…, %s=…) or neither", word, p.Name, info.Pins[0], info.Pins[1])
			return false
		}
		if set[slot] {
			b.report(CodePinCount, p.Pos, p.End, "%s %s binds pin %s twice", word, p.Name, info.Pins[slot])
			return false
		}
		set[slot] = true
		p.Pins[slot] = nets[i]
		p.PinPos[slot] = b.pos(pin.Net.Pos)
	}
	return true
}

// quantity reads a value node as a quantity.
func (b *builder) quantity(v *grammar.Value) (units.Quantity, error) {
	switch {
	case v.Code != "":
		q, ok := units.ParseCode(v.Code)
		if !ok {
			return q, &units.Error{Text: v.Code, Msg: fmt.Sprintf("%q is not a resistor code", v.Code)}
		}
		return q, nil
	case v.Word != "":
		return units.Quantity{}, &units.Error{Text: v.Word, Msg: fmt.Sprintf("%q is a switch state, not a quantity", v.Word)}
	case v.Expr != nil, v.Param != nil:
		return b.eval(v)
	}
	// Large designs repeat a few values millions of times ("10 mΩ" on
	// every segment of a mesh): remember the quantities read so far.
	key := quantityKey{v.Num, v.Unit}
	q, ok := b.quantities[key]
	if !ok {
		var err error
		if q, err = units.Parse(v.Num, v.Unit); err != nil {
			if v.Neg {
				q.Value = -q.Value
			}
			return q, err
		}
		if b.quantities == nil {
			b.quantities = make(map[quantityKey]units.Quantity)
		}
		if len(b.quantities) < maxQuantities {
			b.quantities[key] = q
		}
	}
	if v.Neg {
		q.Value = -q.Value
	}
	return q, nil
}

// quantityKey is the text of a plain quantity: number and unit word.
type quantityKey struct{ num, unit string }

// maxQuantities bounds the builder's table of quantities read.
const maxQuantities = 4096

func (b *builder) describe(v *grammar.Value) string {
	if v.Expr != nil {
		return b.exprText(v)
	}
	if v.Param != nil {
		return v.Param.Text
	}
	s := v.Num
	if v.Unit != "" {
		s += " " + v.Unit
	}
	if v.Code != "" {
		s = v.Code
	}
	if v.Neg {
		s = "-" + s
	}
	return s
}

// value reads the main value. It returns false when the part cannot be
// solved with what was written.
func (b *builder) value(p *Part, pt *grammar.Part) bool {
	word := pt.Kind.Text
	info := p.Kind.Info()
	v := pt.Value
	vpos, vend := p.Pos, p.End // the value's own range, once there is one
	if v != nil {
		vpos, vend = b.valueSpan(v)
	}
	switch {
	case len(info.States) > 0:
		states := strings.Join(info.States, " or ")
		if v == nil || v.Word == "" {
			if v == nil {
				b.report(CodeMissingValue, p.Pos, p.End, "%s %s needs its state: %s", word, p.Name, states)
			} else {
				b.report(CodeBadValue, vpos, vend, "%s %s: %s is not a %s state; write %s", word, p.Name, b.describe(v), word, states)
			}
			return false
		}
		// The second state word closes a switch.
		p.Closed = v.Word == info.States[len(info.States)-1]
		return true
	case info.Value == units.None:
		if v != nil {
			b.report(CodeBadValue, vpos, vend, "%s %s takes %s", word, p.Name, b.noValueHint(p, v))
			return false
		}
		return true
	}
	if v == nil {
		hint := info.ValueHint
		if hint == "" {
			hint = " in " + info.Value.Symbol()
		}
		b.report(CodeMissingValue, p.Pos, p.End, "%s %s needs a value%s", word, p.Name, hint)
		return false
	}
	if b.notANumber(v) {
		b.report(CodeBadValue, vpos, b.unitWordEnd(pt, vend), "%s %s: %s is not a number; write a finite value with its unit, e.g. %s", word, p.Name, v.Param.Text, b.example(p.Kind))
		return false
	}
	if v.Word != "" {
		b.report(CodeBadValue, vpos, vend, "%s %s: %s is a switch state, not a %s", word, p.Name, v.Word, info.Value.Noun())
		return false
	}
	if w := unitWord(pt); w != "" {
		// "1 meg", "10 k", "5 ohms": a word after a bare number that is
		// no attribute was meant as its unit.
		_, err := units.Parse(v.Num, w)
		if err == nil {
			err = &units.Error{Msg: fmt.Sprintf("%q is not a unit", v.Num+" "+w)}
		}
		b.reportFix(b.megWordFix(pt, info.Value), CodeUnitMismatch, vpos, b.unitWordEnd(pt, vend), "%s %s: %s", word, p.Name, b.unitHint(p.Kind, err))
		return false
	}
	q, err := b.quantity(v)
	if err != nil {
		rule, silent := errRule(err)
		if !silent {
			b.reportFix(b.megFix(v, vpos, vend, info.Value), rule, vpos, vend, "%s %s: %s", word, p.Name, b.unitHint(p.Kind, err))
		}
		return false
	}
	um := b.unitRule(v)
	if q.Percent {
		b.report(um, vpos, vend, "%s %s: %s is a percentage; %% belongs to tol", word, p.Name, b.describe(v))
		return false
	}
	if p.Kind.shared() {
		// Kinds that share a keyword are told apart by the unit.
		k, found := sibling(p.Kind, q.Dim)
		switch {
		case found:
			p.Kind = k
		case q.Dim == units.None:
			b.report(um, vpos, vend, "%s %s: %s has no unit; write %s", word, p.Name, b.describe(v), p.Kind.siblings(func(sym, name string) string { return b.describe(v) + " " + sym + " for " + article(name) }))
			return false
		default:
			b.report(um, vpos, vend, "%s %s: %s is a %s; %s is given in %s", word, p.Name, b.describe(v), q.Dim.Noun(), article(word), p.Kind.siblings(func(sym, name string) string { return sym + " (" + name + ")" }))
			return false
		}
		p.Value = q.Value
		return true
	}
	if q.Dim != info.Value {
		if q.Dim == units.None {
			b.reportFix(unitFix(vend, info.Value), um, vpos, vend, "%s %s: %s has no unit; write %s %s", word, p.Name, b.describe(v), b.describe(v), info.Value.Symbol())
		} else {
			b.report(um, vpos, vend, "%s %s is given as a %s (%s); %s takes a %s in %s", word, p.Name, q.Dim.Noun(), b.describeQ(v, q), article(word), info.Value.Noun(), info.Value.Symbol())
		}
		return false
	}
	p.Value = q.Value
	if q.Value <= 0 {
		switch {
		case p.Kind == Resistor && q.Value == 0:
			b.report(CodeBadValue, vpos, vend, "resistor %s is 0 Ω; use a wire for a zero-ohm link", p.Name)
		default:
			b.report(CodeBadValue, vpos, vend, "%s %s: %s %s must be positive", word, p.Name, info.Value.Noun(), units.Format(q.Value, q.Dim))
		}
		return false
	}
	return true
}

// unitWord returns the word written right after a value that has a number
// but no unit, when that word is not an attribute: the writer meant it as
// the unit ("1 meg", "10 k").
func unitWord(pt *grammar.Part) string {
	v := pt.Value
	if v == nil || v.Unit != "" || len(pt.Attrs) == 0 || v.Num == "" && (v.Param == nil || !notNumberWord(v.Param.Text)) {
		return ""
	}
	a := pt.Attrs[0]
	if _, known := attrKinds[a.Key.Text]; known || len(a.Values) > 0 || a.At != nil || strings.HasPrefix(a.Key.Text, "\"") {
		return ""
	}
	return a.Key.Text
}

// attrKinds maps each attribute to the kinds that take it, from the kind
// table.
var attrKinds = func() map[string]string {
	m := map[string]string{"rated": "every kind"}
	for _, w := range KindWords {
		k, _ := kindOf(w)
		for _, a := range k.Info().Attrs {
			if m[a] == "" {
				m[a] = w
			} else {
				m[a] += ", " + w
			}
		}
	}
	return m
}()

// attrs reads the attributes. It returns false when one is unusable.
// A kind's required attribute (vf) is asked for when needs is set.
func (b *builder) attrs(p *Part, pt *grammar.Part, info *KindInfo, needs bool) bool {
	word := pt.Kind.Text
	ok := true
	seen := map[string]bool{}
	apos, aend := p.Pos, p.End // the attribute being read
	bad := func(rule Code, format string, args ...any) {
		b.report(rule, apos, aend, "%s %s: %s", word, p.Name, fmt.Sprintf(format, args...))
		ok = false
	}
	attrs := pt.Attrs
	if unitWord(pt) != "" {
		attrs = attrs[1:] // reported with the value
	}
	for _, a := range attrs {
		key := a.Key.Text
		apos, aend = b.attrSpan(a)
		kinds, knownAttr := attrKinds[key]
		if !knownAttr {
			bad(CodeBadAttribute, "unknown attribute %q; %s", key, takes(p.Kind))
			continue
		}
		if key != "rated" && !contains(info.Attrs, key) {
			bad(CodeBadAttribute, "%s takes no %s (%s is for: %s)", article(p.Kind.String()), key, key, kinds)
			continue
		}
		if seen[key] {
			bad(CodeBadAttribute, "%s is given twice", key)
			continue
		}
		seen[key] = true
		if a.At != nil && key != "vf" {
			bad(CodeBadAttribute, "only vf takes \"at\" (vf 2.0 V at 20 mA)")
			continue
		}
		if a.To != nil && key != "derate" {
			bad(CodeBadAttribute, "only derate takes \"to\" (derate 70 °C to 155 °C)")
			continue
		}
		if len(a.Values) == 0 {
			bad(CodeMissingValue, "%s needs a value", key)
			continue
		}
		if key != "rated" && len(a.Values) > 1 {
			bad(CodeBadAttribute, "%s takes one value", key)
			continue
		}
		qs := make([]units.Quantity, len(a.Values))
		failed := false
		for i, v := range a.Values {
			q, err := b.quantity(v)
			if err != nil {
				failed = true
				if rule, silent := errRule(err); !silent {
					bad(rule, "%s %s", key, err)
				} else {
					ok = false
				}
				break
			}
			qs[i] = q
		}
		if failed {
			continue
		}
		q := qs[0]
		um := b.unitRule(a.Values...)
		if a.At != nil {
			um = b.unitRule(append(a.Values[:len(a.Values):len(a.Values)], a.At)...)
		}
		switch key {
		case "tempco", "derate", "theta", "tjmax":
			b.thermalAttr(p, a, q, um, bad)
		case "tol":
			if !q.Percent {
				bad(um, "tol %s must be a percentage, e.g. tol 5%%", b.describe(a.Values[0]))
			} else if q.Value < 0 || q.Value > 1 {
				bad(CodeBadValue, "tol %s is outside 0 %% … 100 %%", units.FormatPercent(q.Value))
			} else {
				p.Tol = q.Value
			}
		case "dcr", "series", "capacity":
			spec := quantityAttrs[key]
			switch {
			case q.Dim != spec.Dim || q.Percent:
				bad(um, "%s %s must be a %s in %s", key, b.describe(a.Values[0]), spec.Dim.Noun(), spec.Dim.Symbol())
			case spec.Zero && q.Value < 0:
				bad(CodeBadValue, "%s %s must not be negative", key, units.Format(q.Value, q.Dim))
			case !spec.Zero && q.Value <= 0:
				bad(CodeBadValue, "%s %s must be positive", key, units.Format(q.Value, q.Dim))
			default:
				*spec.Field(p) = q.Value
			}
		case "ideality":
			if q.Dim != units.None || q.Percent {
				bad(um, "ideality is a plain number (1 to 2 for most junctions), not %s", b.describe(a.Values[0]))
			} else if q.Value <= 0 {
				bad(CodeBadValue, "ideality %g must be positive", q.Value)
			} else {
				p.Ideality = q.Value
			}
		case "vf":
			if q.Dim != units.Voltage {
				bad(um, "vf %s must be a voltage in V", b.describe(a.Values[0]))
				continue
			}
			if a.At == nil {
				bad(CodeMissingValue, "vf needs the current it is measured at: vf %s at 10 mA", b.describe(a.Values[0]))
				continue
			}
			at, err := b.quantity(a.At)
			if err != nil {
				if rule, silent := errRule(err); !silent {
					bad(rule, "vf … at %s", err)
				} else {
					ok = false
				}
				continue
			}
			if at.Dim != units.Current {
				bad(um, "vf %s at %s: the operating point must be a current in A", b.describe(a.Values[0]), b.describe(a.At))
				continue
			}
			if q.Value <= 0 || at.Value <= 0 {
				bad(CodeBadValue, "vf %s at %s: both must be positive", units.Format(q.Value, units.Voltage), units.Format(at.Value, units.Current))
				continue
			}
			p.VF, p.VFAt = q.Value, at.Value
		case "rated":
			for i, r := range qs {
				if r.Percent || !containsDim(info.RatedDims(), r.Dim) {
					bad(um, "rated %s: %s is rated in %s", b.describe(a.Values[i]), article(p.Kind.String()), dimList(info.RatedDims()))
					continue
				}
				if r.Value <= 0 {
					bad(CodeBadValue, "rated %s must be positive", units.Format(r.Value, r.Dim))
					continue
				}
				var slot *float64
				switch r.Dim {
				case units.Power:
					slot = &p.RatedPower
				case units.Voltage:
					slot = &p.RatedVoltage
				case units.Current:
					slot = &p.RatedCurrent
				}
				if *slot != 0 {
					bad(CodeBadAttribute, "rated gives two %s ratings", r.Dim.Noun())
					continue
				}
				*slot = r.Value
			}
		}
	}
	if need := info.Needs; need != "" && !seen[need] && needs {
		apos, aend = p.Pos, p.End
		bad(CodeMissingValue, "%s", info.NeedsHint)
	}
	return ok
}

// article puts "a" or "an" before a kind: "an inductor", "a led" is
// written "an LED".
func article(kind string) string {
	switch {
	case kind == "led":
		return "an LED"
	case strings.IndexByte("aeiou", kind[0]) >= 0:
		return "an " + kind
	}
	return "a " + kind
}

func contains(list []string, s string) bool {
	for _, x := range list {
		if x == s {
			return true
		}
	}
	return false
}

func containsDim(list []units.Dim, d units.Dim) bool {
	for _, x := range list {
		if x == d {
			return true
		}
	}
	return false
}

func dimList(list []units.Dim) string {
	s := make([]string, len(list))
	for i, d := range list {
		s[i] = d.Symbol() + " (" + d.Noun() + ")"
	}
	return strings.Join(s, " or ")
}

// errRule returns the rule an evaluation error is reported under, and
// whether it is to be kept quiet (a parameter that already has a finding of
// its own).
func errRule(err error) (Code, bool) {
	if ee, ok := err.(*ExprError); ok {
		return ee.Code, ee.Code == NoCode
	}
	if ue, ok := err.(*units.Error); ok && (strings.Contains(ue.Msg, "unit") || strings.Contains(ue.Msg, "prefix")) {
		return CodeUnitMismatch, false
	}
	return CodeBadValue, false
}

// unitRule is the rule for a value in the wrong unit: param-unit when the
// value was computed by an expression, unit-mismatch when it was written.
func (b *builder) unitRule(vs ...*grammar.Value) Code {
	for _, v := range vs {
		if v != nil && (v.Expr != nil || v.Param != nil) {
			return CodeParamUnit
		}
	}
	return CodeUnitMismatch
}

// describeQ is describe, with the computed value of an expression.
func (b *builder) describeQ(v *grammar.Value, q units.Quantity) string {
	if v.Expr != nil || v.Param != nil {
		return b.describe(v) + " = " + q.String()
	}
	return b.describe(v)
}
