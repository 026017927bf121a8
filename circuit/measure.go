package circuit

// measure.go: step 3 of elaboration (see hier.go). The expanded size and
// depth of each block, bottom-up, with recursion found on the way; the
// limits are checked against these numbers before anything is expanded.

import (
	"math"
	"strings"
)

// pathText is the bytes of the names an instance of c makes, its own name
// of n bytes included, each name counted once as written: the names below
// it share its path (names.go).
func pathText(n int64, c *blockDef) int64 {
	return addSat(n, c.text)
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
	var text int64
	for _, l := range bd.locals {
		text = addSat(text, int64(len(l)))
	}
	for _, st := range bd.body {
		if !st.ok {
			continue
		}
		c := st.block()
		if c == nil {
			size = addSat(size, 1)
			parts = addSat(parts, 1)
			text = addSat(text, int64(len(b.partName(st))))
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
		text = addSat(text, pathText(int64(len(st.pt.Name.Text)), c))
	}
	bd.size, bd.parts, bd.depth = size, parts, depth+1
	bd.text = text
	bd.state = 2
}

// reserve sizes the design's part slice for the expanded top level, when it
// is within the limits, so that appending never copies it.
func (b *builder) reserve() {
	if b.top.isTop {
		b.measure(b.top, nil)
	}
	if n := b.top.parts; b.top.size <= b.opt.MaxParts {
		if b.opt.Expanding != nil {
			b.opt.Expanding(n)
		}
		if n > 0 {
			b.r.Design.Parts = make([]Part, 0, n)
		}
	}
}
