package circuit

// ahead.go: the top level's plain part lines (grammar.ParsePlain) built
// ahead of the walk in file order, on every core.
//
// Most of what building a large design costs is per line and needs
// nothing but the line: its statement's nodes, its value, attributes and
// ratings read and checked, the hashes of its net names. That is done here
// by worker goroutines, in batches of lines, each line into a record of
// its own with the findings it makes. The walk in file order
// (builder.run) keeps what must be done in order: it interns the nets by
// the hashes made here (net ids are given in order of first use), counts
// their pins, appends the part and adds the line's findings to the
// collector, so that the design and the findings are the ones a walk that
// built each line itself would make.
//
// With workers, the walk does not copy a part into the design either: it
// takes the part's slot in the part table (reserved for the whole design
// by measure.go, so the table never moves) and hands the batch back to the
// workers, which write its parts into their slots with the nets the walk
// interned. The table is complete once finish returns.
//
// A line's record depends on nothing but the line: each worker has a
// builder of its own (its own table of quantities, nodes and findings),
// and binds the line's pins to stand-in nets 0 and 1, which the walk
// replaces by the nets it interns. So no result depends on how the lines
// are batched or on which goroutine built them (TestAheadAnySplit). A file
// with fewer than aheadMin plain lines has its batches built by the walk
// itself, with no goroutine.

import (
	"runtime"
	"sync"
	"sync/atomic"

	"nodal/diag"
	"nodal/grammar"
)

const (
	// aheadMin is the number of plain lines (some 1.5 MB of a mesh)
	// below which the walk builds every batch itself.
	aheadMin = 1 << 15
	// aheadLines is the lines of a batch built on a worker: enough that
	// handing batches over costs nothing next to building them, few
	// enough that the batches in flight stay in the cache.
	aheadLines = 1 << 10
	// aheadInline is the lines of a batch the walk builds itself.
	aheadInline = 64
	// aheadWorkers bounds the worker goroutines.
	aheadWorkers = 8
)

// aheadSplit returns how the plain lines of a top level of the given
// number of statements (plain of them plain lines) are split: the lines
// of a batch, and the worker goroutines that build batches (0: the walk
// builds them). Tests swap it to force other splits.
var aheadSplit = func(stmts, plain int) (lines, workers int) {
	if n := runtime.GOMAXPROCS(0); plain >= aheadMin && n > 1 {
		return aheadLines, min(n, aheadWorkers)
	}
	return aheadInline, 0
}

// aheadLine is one plain line of the top level, built ahead.
type aheadLine struct {
	// part is the line's part; the first entries of Pins hold 0 and 1,
	// standing for the line's nets as written.
	part     Part
	net      [2]string // the nets' names
	hash     [2]uint64 // their netHash
	netPos   [2]diag.Pos
	netEnd   [2]diag.Pos
	from, to int32 // the line's findings: the batch's finds[from:to]
	placed   bool  // else the walk only counts its nets (countOnly)
	invalid  bool  // a value the solver cannot use
	// nets are the nets the walk interned, and slot the index in the
	// part table it gave the part, for a worker to write it there; -1
	// when the walk wrote it, or there is none.
	nets [2]NetID
	slot int
}

// aheadBatch holds the records of a run of the top level's statements, in
// order (those that are no plain line left as they were), and the
// findings of their lines.
type aheadBatch struct {
	lines []aheadLine
	finds []Finding
}

// aheadWorker builds batches: a builder of its own, whose findings go to
// the batch being built, and the nodes it reads lines into.
type aheadWorker struct {
	b     *builder
	nodes grammar.PlainNodes
}

// ahead hands the walk the top level's plain lines, built, in order.
type ahead struct {
	body  []*bodyStmt // the top level's statements
	lines int         // statements a batch covers
	n     int         // batches

	// Without workers, the walk builds each batch into cur with self.
	self *aheadWorker

	// With workers: a batch number is taken from next after a buffer
	// from free (so that the batches being built are always the first
	// ones not yet taken by the walk, and a buffer is always on its way
	// to the walk), and sent on ready[i] once built.
	// The walk hands each batch back on place when parts has the
	// design's part table at its full capacity, and on free otherwise.
	ready []chan *aheadBatch
	free  chan *aheadBatch
	place chan *aheadBatch
	next  atomic.Int64
	wg    sync.WaitGroup
	parts []Part

	cur   *aheadBatch
	batch int // cur's batch number; -1 before the first
}

// startAhead starts building the top level's plain lines, b.top.body
// made (prepare may run while they are built); file is the checked file.
func (b *builder) startAhead(file *diag.File) *ahead {
	body := b.top.body
	plain := 0
	for _, st := range body {
		if st.plain > 0 {
			plain++
		}
	}
	lines, workers := aheadSplit(len(body), plain)
	a := &ahead{body: body, lines: max(lines, 1), batch: -1}
	a.n = (len(body) + a.lines - 1) / a.lines
	newWorker := func() *aheadWorker {
		return &aheadWorker{b: &builder{fset: b.fset, opt: b.opt, file: file, srcs: b.srcs, plain: b.plain,
			r: &Result{Design: NewDesign(b.r.Design.File)}, sc: &scope{blk: b.top, inst: -1}, subject: subject{inst: -1}}}
	}
	if plain == 0 {
		return a // take is never called
	}
	if workers <= 0 {
		a.self = newWorker()
		a.cur = &aheadBatch{lines: make([]aheadLine, min(a.lines, len(body)))}
		return a
	}
	a.ready = make([]chan *aheadBatch, a.n)
	for i := range a.ready {
		a.ready[i] = make(chan *aheadBatch, 1)
	}
	buffers := workers + 2
	a.free = make(chan *aheadBatch, buffers)
	a.place = make(chan *aheadBatch, buffers)
	for range buffers {
		a.free <- &aheadBatch{lines: make([]aheadLine, a.lines)}
	}
	for range workers {
		w := newWorker()
		a.wg.Go(func() { w.serve(a) })
	}
	return a
}

// walk readies a for the walk, once the part table is reserved: the
// workers are to write the parts into it when it has room for every part
// the top level can make. Until the walk hands a batch back, no worker
// reads what this sets.
func (a *ahead) walk(b *builder) {
	if d := b.r.Design; a.free != nil && len(d.Parts) == 0 && int64(cap(d.Parts)) >= b.top.parts && b.top.size <= b.opt.MaxParts {
		a.parts = d.Parts[:cap(d.Parts)]
	}
}

// serve builds batches until there are none left, and places the parts of
// the batches the walk hands back until the walk is done.
func (w *aheadWorker) serve(a *ahead) {
	free := a.free
	for {
		select {
		case bt, ok := <-a.place:
			if !ok {
				return
			}
			a.placeBatch(bt)
			a.free <- bt
		case bt := <-free:
			i := int(a.next.Add(1) - 1)
			if i >= a.n {
				a.free <- bt
				free = nil // no batch left to build
				continue
			}
			w.build(a, bt, i)
			a.ready[i] <- bt
		}
	}
}

// placeBatch writes the parts of bt that the walk gave a slot into the
// part table.
func (a *ahead) placeBatch(bt *aheadBatch) {
	for k := range bt.lines {
		l := &bt.lines[k]
		if l.slot < 0 {
			continue
		}
		p := &a.parts[l.slot]
		*p = l.part
		for j, n := range p.Nets() {
			p.Pins[j] = l.nets[n]
		}
	}
}

// build builds batch i into bt.
func (w *aheadWorker) build(a *ahead, bt *aheadBatch, i int) {
	lo, hi := i*a.lines, min(len(a.body), (i+1)*a.lines)
	bt.finds = bt.finds[:0]
	w.b.sink = &bt.finds
	bt.lines = bt.lines[:hi-lo]
	for k, st := range a.body[lo:hi] {
		bt.lines[k].slot = -1
		if st.plain > 0 {
			w.line(&bt.lines[k], st)
		}
	}
	w.b.sink = nil
}

// standIn binds a plain line's pins, as written, to nets 0 and 1.
var standIn = [2]NetID{0, 1}

// line builds plain statement st into l.
func (w *aheadWorker) line(l *aheadLine, st *bodyStmt) {
	b := w.b
	pt := b.plain.PlainStatement(int(st.plain-1), &w.nodes).Part
	for k, pin := range pt.Pins[:2] { // a plain line has two
		n := pin.Net
		l.net[k] = netName(n.Text)
		l.hash[k] = netHash(l.net[k])
		l.netPos[k], l.netEnd[k] = b.pos(n.Start()), b.nameEnd(n)
	}
	// A line whose name repeats an earlier one is built too: prepare,
	// which finds it, may still be running. The walk leaves out what it
	// made.
	from := len(*b.sink)
	b.subject.name = pt.Name.Text
	kind, _ := kindOf(pt.Kind.Text) // a built-in kind (collect.go)
	l.part = Part{Kind: kind, Local: pt.Name.Text, Pos: st.pos, End: st.end, Inst: -1}
	l.placed, l.invalid = b.fill(&l.part, pt, standIn[:])
	l.from, l.to = int32(from), int32(len(*b.sink))
}

// take returns the record of plain statement k of the top level (an index
// into its body) and the findings of its line, once built. k grows from
// one call to the next.
func (a *ahead) take(k int) (*aheadLine, []Finding) {
	for i := k / a.lines; a.batch < i; {
		a.advance()
	}
	l := &a.cur.lines[k-a.batch*a.lines]
	return l, a.cur.finds[l.from:l.to]
}

// advance moves cur to the next batch, once built.
func (a *ahead) advance() {
	a.batch++
	if a.self != nil {
		a.self.build(a, a.cur, a.batch)
		return
	}
	a.handBack()
	a.cur = <-a.ready[a.batch]
}

// handBack hands cur back to the workers: to place its parts, or to be
// built again.
func (a *ahead) handBack() {
	switch {
	case a.cur == nil:
	case a.parts != nil:
		a.place <- a.cur
	default:
		a.free <- a.cur
	}
	a.cur = nil
}

// finish waits for the workers to end, the batches the walk did not need
// taken and every part placed in the part table.
func (a *ahead) finish(d *Design) {
	if a.free == nil {
		return
	}
	for a.batch < a.n-1 {
		a.advance()
	}
	a.handBack()
	close(a.place)
	a.wg.Wait()
	if a.parts != nil && len(d.Parts) > 0 && &d.Parts[0] != &a.parts[0] {
		panic("circuit: the part table moved while plain lines were placed in it")
	}
}

// placePlain does, for plain statement k of the top level (an index into
// its body), built ahead, what stmt does for a statement in the walk's
// order: its nets interned, its findings added, its part placed (or given
// its slot, for a worker to write) or its nets counted.
func (b *builder) placePlain(a *ahead, k int) {
	l, finds := a.take(k)
	d := b.r.Design
	for j := range l.nets {
		l.nets[j] = d.hashedNet(l.net[j], l.hash[j], l.netPos[j], l.netEnd[j])
	}
	if !a.body[k].ok {
		b.countOnly(l.nets[:]) // prepare has reported it
		return
	}
	for i := range finds {
		b.found.Add(finds[i])
	}
	if l.invalid {
		b.r.Invalid = true
	}
	if !l.placed {
		b.countOnly(l.nets[:])
		return
	}
	if a.parts != nil {
		// A worker writes the part into its slot (placeBatch).
		l.slot = len(d.Parts)
		d.Parts = d.Parts[:l.slot+1]
		b.count++
		for _, n := range l.part.Nets() {
			d.Nets[l.nets[n]].Pins++
		}
		return
	}
	d.Parts = append(d.Parts, l.part)
	p := &d.Parts[len(d.Parts)-1]
	for k, n := range p.Nets() {
		p.Pins[k] = l.nets[n]
	}
	b.placed(p)
}
