package circuit

// prepare.go: step 2 of elaboration (see hier.go). Every statement of every
// block is resolved once: its kind or block, its nets, its pin and
// parameter bindings. Findings about a block's text are made here, once,
// whatever the number of instances.

import (
	"fmt"
	"strings"
	"unicode/utf8"

	"nodal/diag"
	"nodal/grammar"
)

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
				b.report(CodeBlockPin, b.pos(pn.Start()), b.nameEnd(pn), "block %s lists pin %s twice", bd.name, name)
				continue
			}
			bd.pinIndex[name] = len(bd.pins)
			bd.pins = append(bd.pins, name)
			bd.pinPos = append(bd.pinPos, b.pos(pn.Start()))
		}
		bd.parIndex = make(map[string]int, len(h.Params))
		for _, a := range h.Params {
			name := a.Name.Text
			if _, dup := bd.parIndex[name]; dup {
				b.report(CodeDuplicateName, b.pos(a.Start()), b.pos(a.End()), "block %s lists parameter %s twice", bd.name, name)
				continue
			}
			if why := grammar.ParamNameTrouble(name); why != "" {
				// Kept as a parameter, so that instances setting it are
				// not reported again; the block's statements cannot name it.
				b.report(CodeSyntax, b.pos(a.Start()), b.nameEnd(a.Name), "parameter %s of block %s: %s, so it cannot stand for a value; rename it (for example %s)", name, bd.name, why, paramRename(name))
			}
			bd.parIndex[name] = len(bd.params)
			bd.params = append(bd.params, paramDef{name: name, def: a.Value, pos: b.pos(a.Start()), end: b.pos(a.End())})
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
	repeats := b.repeats(bd)
	pinUsed := make([]bool, len(bd.pins))
	defer func() { b.subject = subject{inst: -1} }()
	for k, st := range bd.body {
		st.ok = true
		b.subject = subject{inst: -1}
		if st.plain > 0 {
			// A plain line of the top level: a built-in part (collect.go)
			// whose kind and nets are read as it is built (ahead.go).
			if r := repeats[k]; r >= 0 {
				b.subject.name = b.partName(st)
				b.repeated(st, bd.body[r])
			}
			continue
		}
		if bd.isTop {
			b.subject.name = st.pt.Name.Text // a block's text has no instance path
		}
		pt := st.pt
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
		if kind, builtin := kindOf(word); builtin {
			st.kind = kind
		} else if c, isBlock := b.blocks[word]; isBlock {
			st.blk = c
			c.used = true
		} else {
			b.unknownKind(bd, st)
			st.ok = false
			continue
		}
		if r := repeats[k]; r >= 0 {
			b.repeated(st, bd.body[r])
			continue
		}
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

// repeated reports statement st, whose name statement prev already uses,
// and leaves it out.
func (b *builder) repeated(st, prev *bodyStmt) {
	what := prev.kind.String()
	switch {
	case prev.plain > 0:
		k, _ := kindOf(b.partKind(prev))
		what = k.String()
	case prev.blk != nil:
		what = b.partKind(prev)
	}
	b.report(CodeDuplicateName, st.pos, st.end, "part name %s is already used by the %s on line %d", b.partName(st), what, b.file.Position(prev.pos).Line)
	st.ok = false
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
		apos, aend := b.pos(a.Start()), b.pos(a.End())
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
