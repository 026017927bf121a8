package circuit

// names.go: the names of parts, nets and instances. Instances form a
// tree: each keeps its own name as written and its parent. A part or a
// net inside an instance keeps its own name and its instance, so that the
// model holds every name once, as the source spells it, however deep the
// blocks nest. The dotted name ("ROW2.C4.R") is built only where a
// message, a report line or a lookup needs it, by the accessors below.

import (
	"strings"
	"sync"
	"unicode/utf8"
)

// localKey names a net or an instance inside instance inst (-1: the top
// level).
type localKey struct {
	inst int32
	name string
}

// Qualified returns local, written inside instance inst, with the
// instance's path in front: "ROW2.C4.R" for R in instance C4 of ROW2. At
// the top level (inst < 0) it returns local itself, without building
// anything; so does a nil design (a part made outside any design).
func (d *Design) Qualified(inst int32, local string) string {
	if d == nil || inst < 0 || int(inst) >= len(d.Instances) {
		return local
	}
	n := len(local)
	for i := inst; i >= 0; i = d.Instances[i].Parent {
		n += len(d.Instances[i].Local) + 1
	}
	buf := make([]byte, n)
	k := copy(buf[n-len(local):], local)
	at := n - k
	for i := inst; i >= 0; i = d.Instances[i].Parent {
		at--
		buf[at] = '.'
		l := d.Instances[i].Local
		at -= len(l)
		copy(buf[at:], l)
	}
	return string(buf)
}

// PartName returns part i's name with its instance path.
func (d *Design) PartName(i PartID) string {
	p := &d.Parts[i]
	return d.Qualified(p.Inst, p.Local)
}

// NameOf returns part p's name with its instance path; p is one of d's
// parts.
func (d *Design) NameOf(p *Part) string { return d.Qualified(p.Inst, p.Local) }

// NetName returns net i's name with its instance path.
func (d *Design) NetName(i NetID) string {
	n := &d.Nets[i]
	return d.Qualified(n.Inst, n.Local)
}

// InstancePath returns the dotted path of instance i ("BOARD.CH2"), or ""
// for -1, the top level.
func (d *Design) InstancePath(i int32) string {
	if i < 0 || int(i) >= len(d.Instances) {
		return ""
	}
	in := &d.Instances[i]
	return d.Qualified(in.Parent, in.Local)
}

// PathLen returns the length in bytes of InstancePath(i), without
// building it.
func (d *Design) PathLen(i int32) int {
	n := -1
	for ; i >= 0 && int(i) < len(d.Instances); i = d.Instances[i].Parent {
		n += len(d.Instances[i].Local) + 1
	}
	return max(n, 0)
}

// ComparePaths compares InstancePath(a) with InstancePath(b) as strings
// compare, without building either.
func (d *Design) ComparePaths(a, b int32) int {
	if a == b {
		return 0
	}
	var ba, bb [DefaultMaxDepth + 1]int32
	ra := pathReader{d: d, chain: d.chain(a, ba[:0])}
	rb := pathReader{d: d, chain: d.chain(b, bb[:0])}
	return compareReaders(&ra, &rb)
}

// CompareParts compares PartName(a) with PartName(b) as strings compare,
// building neither; for two parts at the top level it compares their
// names directly.
func (d *Design) CompareParts(a, b PartID) int {
	p, q := &d.Parts[a], &d.Parts[b]
	if p.Inst < 0 && q.Inst < 0 {
		return strings.Compare(p.Local, q.Local)
	}
	var ba, bb [DefaultMaxDepth + 1]int32
	ra := pathReader{d: d, chain: d.chain(p.Inst, ba[:0]), tail: p.Local, hasTail: true}
	rb := pathReader{d: d, chain: d.chain(q.Inst, bb[:0]), tail: q.Local, hasTail: true}
	return compareReaders(&ra, &rb)
}

func compareReaders(ra, rb *pathReader) int {
	for {
		x, okA := ra.next()
		y, okB := rb.next()
		switch {
		case !okA && !okB:
			return 0
		case !okA:
			return -1
		case !okB:
			return 1
		case x != y:
			if x < y {
				return -1
			}
			return 1
		}
	}
}

// chain appends the instances from the outermost to i.
func (d *Design) chain(i int32, out []int32) []int32 {
	for ; i >= 0 && int(i) < len(d.Instances); i = d.Instances[i].Parent {
		out = append(out, i)
	}
	for l, r := 0, len(out)-1; l < r; l, r = l+1, r-1 {
		out[l], out[r] = out[r], out[l]
	}
	return out
}

// pathReader yields the bytes of a dotted name one at a time: the names
// of the instances in chain, then tail when hasTail, joined by dots.
type pathReader struct {
	d       *Design
	chain   []int32
	tail    string
	hasTail bool
	k, at   int // piece (len(chain): the tail), byte in it
}

func (r *pathReader) next() (byte, bool) {
	pieces := len(r.chain)
	if r.hasTail {
		pieces++
	}
	for r.k < pieces {
		l := r.tail
		if r.k < len(r.chain) {
			l = r.d.Instances[r.chain[r.k]].Local
		}
		switch {
		case r.at < len(l):
			r.at++
			return l[r.at-1], true
		case r.at == len(l) && r.k+1 < pieces:
			r.at, r.k = 0, r.k+1
			return '.', true
		}
		r.k, r.at = r.k+1, 0
	}
	return 0, false
}

// nameIndex finds instances, and the parts of instances, by the name
// they have in their parent; it is built the first time a name is looked
// up, so that a design nobody asks about by name pays nothing for it.
type nameIndex struct {
	once     sync.Once
	children map[localKey]int32  // the first instance of a name in its parent
	same     []int32             // the next instance of the same name in the same parent, or -1
	parts    map[localKey]PartID // parts inside instances; the first of a name
	nets     map[localKey]NetID  // nets local to instances
	// dotted holds the lengths of the instance names that have a dot in
	// them (quoted names): a path is split at its first dot, and at a
	// later one only where a name of that length could end.
	dotted map[int]bool
}

func (d *Design) names() *nameIndex {
	if d.index == nil {
		d.index = &nameIndex{} // a design not made by NewDesign
	}
	d.index.once.Do(func() {
		x := d.index
		x.children = make(map[localKey]int32, len(d.Instances))
		x.same = make([]int32, len(d.Instances))
		last := map[localKey]int32{} // only for names given twice
		for i := range d.Instances {
			x.same[i] = -1
			k := localKey{d.Instances[i].Parent, d.Instances[i].Local}
			if first, ok := x.children[k]; !ok {
				x.children[k] = int32(i)
			} else {
				prev, ok := last[k]
				if !ok {
					prev = first
				}
				x.same[prev], last[k] = int32(i), int32(i)
			}
			if strings.IndexByte(k.name, '.') >= 0 {
				if x.dotted == nil {
					x.dotted = map[int]bool{}
				}
				x.dotted[len(k.name)] = true
			}
		}
		x.parts, x.nets = map[localKey]PartID{}, map[localKey]NetID{}
		if len(d.Instances) == 0 {
			return
		}
		for i := range d.Nets {
			if n := &d.Nets[i]; n.Inst >= 0 {
				k := localKey{n.Inst, n.Local}
				if _, ok := x.nets[k]; !ok {
					x.nets[k] = NetID(i)
				}
			}
		}
		for i := range d.Parts {
			if p := &d.Parts[i]; p.Inst >= 0 {
				k := localKey{p.Inst, p.Local}
				if _, ok := x.parts[k]; !ok {
					x.parts[k] = PartID(i)
				}
			}
		}
	})
	return d.index
}

// maxSplits bounds the ways of reading a dotted name as a path that a
// lookup tries; names with quoted dots could otherwise be read in many.
const maxSplits = 4096

// splits calls f(inst, local) for each way of reading name as the path of
// an existing instance inst followed by a name local inside it, outermost
// instances first, then (inst -1) for the name read at the top level. It
// stops when f returns false.
func (d *Design) splits(name string, f func(inst int32, local string) bool) {
	if len(d.Instances) == 0 {
		f(-1, name)
		return
	}
	x := d.names()
	budget := maxSplits
	var walk func(inst int32, rest string) bool
	walk = func(inst int32, rest string) bool {
		first := strings.IndexByte(rest, '.')
		for k := first; k >= 0 && budget > 0; {
			budget--
			if k == first || x.dotted[k] {
				c, ok := x.children[localKey{inst, rest[:k]}]
				for ; ok && c >= 0 && budget > 0; c = x.same[c] {
					budget--
					if !walk(c, rest[k+1:]) {
						return false
					}
				}
			}
			if x.dotted == nil {
				break // no name has a dot: only the first can end one
			}
			j := strings.IndexByte(rest[k+1:], '.')
			if j < 0 {
				break
			}
			k += 1 + j
		}
		if inst < 0 {
			return true // the top level is tried last
		}
		return f(inst, rest)
	}
	if walk(-1, name) {
		f(-1, name)
	}
}

// InstanceOf returns the instance of the part or net named name (its
// instance path and own name), -1 for one at the top level or none: a
// part inside an instance first, then the net of that name.
func (d *Design) InstanceOf(name string) int32 {
	if len(d.Instances) == 0 || name == "" {
		return -1
	}
	x := d.names()
	best := PartID(-1)
	d.splits(name, func(inst int32, local string) bool {
		if inst >= 0 {
			if id, ok := x.parts[localKey{inst, local}]; ok && (best < 0 || id < best) {
				best = id
			}
		}
		return true
	})
	if best >= 0 {
		return d.Parts[best].Inst
	}
	if id := d.LookupNet(name); id != NoNet {
		return d.Nets[id].Inst
	}
	return -1
}

// NetNameOf returns net n's name with its instance path; n is one of d's
// nets.
func (d *Design) NetNameOf(n *Net) string { return d.Qualified(n.Inst, n.Local) }

// MaxShownPath is the longest instance path a related location spells out.
// A finding inside an instance lists every instance around it, so whole
// paths there would grow with the square of the depth; a longer path is
// shown by its end, after "…", from the first instance that fits.
const MaxShownPath = 1024

// ShownPath is InstancePath(i) for a related location: the whole path up
// to MaxShownPath bytes, else "…" and the end of it (whole instance names,
// or the end of the last name when that alone is too long).
func (d *Design) ShownPath(i int32) string {
	if d.PathLen(i) <= MaxShownPath {
		return d.InstancePath(i)
	}
	// The innermost names that fit, joined from the end.
	n, top := 0, int32(-1)
	for j := i; j >= 0; j = d.Instances[j].Parent {
		l := len(d.Instances[j].Local)
		if j != i {
			l++ // its dot
		}
		if n+l > MaxShownPath {
			break
		}
		n, top = n+l, j
	}
	if top < 0 {
		// One name longer than the limit: its last bytes, from a rune
		// boundary.
		l := d.Instances[i].Local
		k := len(l) - MaxShownPath
		for k < len(l) && !utf8.RuneStart(l[k]) {
			k++
		}
		return "…" + l[k:]
	}
	buf := make([]byte, n)
	at := n
	for j := i; ; j = d.Instances[j].Parent {
		l := d.Instances[j].Local
		at -= len(l)
		copy(buf[at:], l)
		if j == top {
			break
		}
		at--
		buf[at] = '.'
	}
	return "…" + string(buf)
}

// NameBytes returns the bytes of the names of every part and net with
// their instance paths: what a listing of them all holds (a report
// table, say), counted without building any name.
func (d *Design) NameBytes() int64 {
	path := make([]int64, len(d.Instances)) // each instance's path and a dot
	for i := range d.Instances {
		in := &d.Instances[i]
		path[i] = int64(len(in.Local)) + 1
		if in.Parent >= 0 && int(in.Parent) < i {
			path[i] += path[in.Parent]
		}
	}
	var n int64
	for i := range d.Parts {
		p := &d.Parts[i]
		n += int64(len(p.Local))
		if p.Inst >= 0 && int(p.Inst) < len(path) {
			n += path[p.Inst]
		}
	}
	for i := range d.Nets {
		net := &d.Nets[i]
		n += int64(len(net.Local))
		if net.Inst >= 0 && int(net.Inst) < len(path) {
			n += path[net.Inst]
		}
	}
	return n
}
