package lsp

import (
	"slices"
	"strings"

	"nodal/circuit"
	"nodal/grammar"
)

// index is what one file declares and uses, read from its syntax tree:
// the names the navigation features look up. Offsets are bytes.
type index struct {
	file     string
	src      []byte
	blocks   []blockDef
	parts    []partRef
	nets     []netRef
	includes []includeRef
}

type span struct{ from, to int }

func (s span) has(off int) bool { return off >= s.from && off <= s.to }

type blockDef struct {
	name   string
	at     span // the name
	header span // the header line, up to its "{"
	body   span // from the header to the closing "}" (or the file's end)
	params []string
}

type partRef struct {
	kind     string
	name     string
	kindAt   span
	at       span // the name
	stmt     span
	block    int // the enclosing block, -1 at the top level
	instance bool
}

type netRef struct {
	name  string
	at    span
	block int
}

type includeRef struct {
	path string // as written, without quotes
	at   span   // the quoted string
}

// netName is a net's name without the quotes it may be written in.
func netName(n *grammar.Name) string { return strings.Trim(n.Text, `"`) }

func nameSpan(n *grammar.Name) span {
	return span{int(n.Start()), int(n.End())}
}

// newIndex parses src and indexes it.
func newIndex(file string, src []byte) *index {
	f := grammar.Parse(file, src)
	ix := &index{file: file, src: src}
	cur := -1
	for _, st := range f.Stmts {
		switch {
		case st.Block != nil:
			b := st.Block
			def := blockDef{name: b.Name.Text, at: nameSpan(b.Name),
				header: span{int(st.Start()), int(st.End())}, body: span{int(st.Start()), len(src)}}
			for _, p := range b.Params {
				def.params = append(def.params, p.Name.Text)
			}
			ix.blocks = append(ix.blocks, def)
			cur = len(ix.blocks) - 1
			for _, p := range b.Pins {
				ix.nets = append(ix.nets, netRef{netName(p), nameSpan(p), cur})
			}
		case st.Close != nil:
			if cur >= 0 {
				ix.blocks[cur].body.to = int(st.End())
			}
			cur = -1
		case st.Part != nil:
			p := st.Part
			ix.parts = append(ix.parts, partRef{kind: p.Kind.Text, name: p.Name.Text,
				kindAt: nameSpan(p.Kind), at: nameSpan(p.Name), stmt: span{int(st.Start()), int(st.End())},
				block: cur, instance: !slices.Contains(circuit.KindWords, p.Kind.Text)})
			for _, pin := range p.Pins {
				ix.nets = append(ix.nets, netRef{netName(pin.Net), nameSpan(pin.Net), cur})
			}
		case st.Port != nil:
			for _, n := range st.Port.Nets {
				ix.nets = append(ix.nets, netRef{netName(n), nameSpan(n), cur})
			}
		case st.Ground != nil:
			ix.nets = append(ix.nets, netRef{netName(st.Ground.Net), nameSpan(st.Ground.Net), cur})
		case st.Include != nil && st.Include.Path != nil:
			s := st.Include.Path
			ix.includes = append(ix.includes, includeRef{strings.Trim(s.Text, `"`), span{int(s.Start()), int(s.End())}})
		}
	}
	return ix
}

// block returns the block named name, or nil.
func (ix *index) block(name string) *blockDef {
	for i := range ix.blocks {
		if ix.blocks[i].name == name {
			return &ix.blocks[i]
		}
	}
	return nil
}

// netNames returns the net names used in the file, each once, in order of
// first use.
func (ix *index) netNames() []string {
	var out []string
	seen := map[string]bool{}
	for _, n := range ix.nets {
		if !seen[n.name] {
			seen[n.name] = true
			out = append(out, n.name)
		}
	}
	return out
}

// at says what is at byte offset off.
type at struct {
	part    *partRef // a part's or instance's name
	kind    *partRef // a part's kind word, or an instance's block name
	net     *netRef
	block   *blockDef // a block definition's name
	include *includeRef
}

func (ix *index) at(off int) at {
	for i := range ix.parts {
		p := &ix.parts[i]
		if p.at.has(off) {
			return at{part: p}
		}
		if p.kindAt.has(off) {
			return at{kind: p}
		}
	}
	for i := range ix.nets {
		if ix.nets[i].at.has(off) {
			return at{net: &ix.nets[i]}
		}
	}
	for i := range ix.blocks {
		if ix.blocks[i].at.has(off) {
			return at{block: &ix.blocks[i]}
		}
	}
	for i := range ix.includes {
		if ix.includes[i].at.has(off) {
			return at{include: &ix.includes[i]}
		}
	}
	return at{}
}
