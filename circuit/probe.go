package circuit

// probe.go: after expansion, the blocks no statement instantiates are
// elaborated into a scratch design, so that a library checked on its own
// still has its values and pins checked, and are noted as unused.

import (
	"nodal/diag"
)

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
