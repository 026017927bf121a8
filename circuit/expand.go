package circuit

// expand.go: step 4 of elaboration (see hier.go). Top-level statements in
// order, each instance walking its block's prepared statements with its
// pin nets and parameter values.

import (
	"fmt"
	"math"

	"nodal/diag"
	"nodal/grammar"
	"nodal/units"
)

// stmt elaborates one prepared statement in scope sc; the top level's
// plain lines are built by ahead.go instead.
func (b *builder) stmt(sc *scope, st *bodyStmt) {
	b.sc = sc
	savedSubject := b.subject
	b.subject = subject{sc.inst, st.pt.Name.Text}
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
		return d.Net(b.groundName, b.pos(n.Start()), b.nameEnd(n))
	case refLocal:
		id := sc.local[r.idx]
		if id == NoNet {
			id = d.localNet(sc.blk.locals[r.idx], b.pos(n.Start()), b.nameEnd(n), sc.inst)
			sc.local[r.idx] = id
		}
		return id
	}
	return d.Net(r.name, b.pos(n.Start()), b.nameEnd(n))
}

// instance expands one instance statement.
func (b *builder) instance(parent *scope, st *bodyStmt, nets []NetID) {
	d := b.r.Design
	c := st.blk
	name := st.pt.Name.Text
	if parent.depth+c.depth > b.opt.MaxDepth {
		b.report(CodeExpansionLimit, st.pos, st.end, "instance %s of block %s nests blocks %d deep, over the limit of %d (--max-depth)", d.Qualified(parent.inst, name), c.name, parent.depth+c.depth, b.opt.MaxDepth)
		b.countOnly(nets)
		return
	}
	if b.refused {
		b.countOnly(nets) // the first instance over the size limit has been reported
		return
	}
	if addSat(b.count, c.size) > b.opt.MaxParts {
		b.refused = true
		b.report(CodeExpansionLimit, st.pos, st.end, "instance %s of block %s expands to %s parts and instances; with the %s before it that is over the limit of %s (--max-parts)", d.Qualified(parent.inst, name), c.name, count(c.size), count(b.count), count(b.opt.MaxParts))
		b.countOnly(nets)
		return
	}
	// An instance at the top level accounts for every name below it (see
	// measure); nested ones are counted there.
	if text := pathText(int64(len(name)), c); parent.blk.isTop && addSat(b.text, text) > b.opt.MaxNameBytes {
		// Each name is kept once, as written (names.go), so the names
		// grow with the parts; a long name used often is bounded here.
		b.refused = true
		b.report(CodeExpansionLimit, st.pos, st.end, "instance %s of block %s makes %s of part, net and instance names; with the %s before it that is over the limit of %s on the names of one design (use shorter names or fewer instances)", name, c.name, byteCount(text), byteCount(b.text), byteCount(b.opt.MaxNameBytes))
		b.countOnly(nets)
		return
	}
	if parent.blk.isTop {
		b.text = addSat(b.text, pathText(int64(len(name)), c))
	}
	b.count++
	c.expanded = true
	sc := &scope{blk: c, inst: int32(len(d.Instances)), depth: parent.depth + 1}
	d.Instances = append(d.Instances, Instance{Local: name, Block: c.name, Pos: st.pos, End: st.end, Parent: parent.inst})
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
			q, ok := b.paramValue(a.Value, b.pos(a.Start()), b.pos(a.End()), st.pt.Name.Text, pd)
			if ok && pd.dimKnown && (q.Dim != pd.dim || q.Percent != pd.percent) {
				b.report(CodeParamUnit, b.pos(a.Start()), b.pos(a.End()), "instance %s: parameter %s of block %s is a %s (default %s), but is given %s, a %s", b.r.Design.Qualified(parent.inst, st.pt.Name.Text), pd.name, c.name, nounOf(pd.dim, pd.percent), b.describe(pd.def), b.describe(a.Value), nounOf(q.Dim, q.Percent))
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
