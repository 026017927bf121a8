package rules

// schedule.go: running the analyzers, on more than one core when the
// design is large enough to pay for it, with the outcome of running them
// one after another.
//
// The serial order is the one a depth-first walk of the Requires graph
// gives: each analyzer after the ones it requires, the analyzers in the
// order they were asked for. On a large design the analyzers whose
// requirements are met run at the same time, at most GOMAXPROCS at once,
// those with the most analyzers waiting on them first (the solve before
// the wiring rules beside it). Nothing an analyzer makes depends on that:
//
//   - each pass reads the results of the analyzers it requires, directly
//     or through them, and no other (its Pass.ResultOf holds just those);
//   - findings reach the collector in the serial order: the first pass of
//     that order not yet ended adds its own as it makes them, the later
//     ones keep theirs until every pass before them has ended;
//   - an error (or a panic) in a pass ends the run as the serial one
//     would: every pass before it in the serial order still runs, none
//     after it counts, and the first that failed in that order is the
//     one returned (or panicked again).

import (
	"fmt"
	"runtime"
	"slices"
	"sync"

	"nodal/circuit"
	"nodal/diag"
)

// concurrentFrom is the number of parts from which the analyzers run
// concurrently; below it the goroutines cost more than they save (a
// variable so that tests can lower it).
var concurrentFrom = 20_000

// plan is the serial order of a run.
type plan struct {
	order []*Analyzer       // the serial order: each after what it requires
	pre   []int             // the order in which the walk first reached each
	needs [][]int           // each one's requirements, direct and indirect
	next  [][]int           // the analyzers that require each one directly
	depth []int             // how many analyzers wait on each, directly or not
	runs  []bool            // whether each one's Run is called
	cfg   *Config           // for the severities that switch an analyzer off
	found *circuit.Findings // where findings go
	fset  *diag.FileSet
	build *circuit.Result
}

// newPlan walks the Requires graph from analyzers.
func newPlan(fset *diag.FileSet, b *circuit.Result, analyzers []*Analyzer, cfg *Config, found *circuit.Findings) *plan {
	p := &plan{cfg: cfg, found: found, fset: fset, build: b}
	at := map[*Analyzer]int{}
	entered := map[*Analyzer]int{}
	var walk func(a *Analyzer)
	walk = func(a *Analyzer) {
		if _, ok := entered[a]; ok {
			if _, done := at[a]; !done {
				panic("rules: analyzer " + a.Name + " requires itself") // a programmer's slip
			}
			return
		}
		entered[a] = len(entered)
		for _, r := range a.Requires {
			walk(r)
		}
		at[a] = len(p.order)
		p.order = append(p.order, a)
		p.pre = append(p.pre, entered[a])
	}
	for _, a := range analyzers {
		walk(a)
	}
	n := len(p.order)
	p.needs, p.next, p.depth, p.runs = make([][]int, n), make([][]int, n), make([]int, n), make([]bool, n)
	for i, a := range p.order {
		for _, r := range a.Requires {
			j := at[r]
			p.next[j] = append(p.next[j], i)
			p.needs[i] = append(p.needs[i], j)
			p.needs[i] = append(p.needs[i], p.needs[j]...)
		}
		slices.Sort(p.needs[i])
		p.needs[i] = slices.Compact(p.needs[i])
		for _, j := range p.needs[i] {
			p.depth[j]++
		}
		// An analyzer switched off is not run: its findings would all be
		// dropped.
		s, has := cfg.severity(a)
		p.runs[i] = a.Run != nil && !(has && s == diag.Off && a.Severity != diag.Off)
	}
	return p
}

// outcome is what one pass gave.
type outcome struct {
	i     int
	res   any
	err   error
	panic any // a panic's value, caught on another goroutine
	fail  bool
}

// run runs every analyzer of the plan, on at most workers goroutines (one:
// in this goroutine, in the serial order). It returns the results of the
// passes that count and the analyzers the serial walk reached (see
// RunResults), and the first error in the serial order.
func (p *plan) run(workers int) (map[*Analyzer]any, map[*Analyzer]bool, error) {
	n := len(p.order)
	s := &sink{found: p.found, held: make([][]circuit.Finding, n), ended: make([]bool, n), stop: n}
	outs := make([]outcome, n)
	if workers <= 1 {
		for i := 0; i < n && i <= s.stop; i++ {
			outs[i] = p.pass(i, p.resultsFor(i, outs), s, false)
			s.end(i, outs[i].fail)
		}
	} else {
		p.concurrently(workers, s, outs)
	}
	results := map[*Analyzer]any{}
	ran := map[*Analyzer]bool{}
	var err error
	for i, a := range p.order {
		switch {
		case i < s.stop && p.runs[i]:
			results[a] = outs[i].res
		case i == s.stop:
			if outs[i].panic != nil {
				panic(outs[i].panic)
			}
			err = outs[i].err
		}
		// The serial walk reached every analyzer it entered before the
		// one that failed, those on the way to it included.
		if s.stop == n || p.pre[i] <= p.pre[s.stop] {
			ran[a] = true
		}
	}
	return results, ran, err
}

// resultsFor returns the results pass i may read: those of its
// requirements.
func (p *plan) resultsFor(i int, outs []outcome) map[*Analyzer]any {
	if len(p.needs[i]) == 0 {
		return nil // reads as empty
	}
	of := make(map[*Analyzer]any, len(p.needs[i]))
	for _, j := range p.needs[i] {
		if p.runs[j] {
			of[p.order[j]] = outs[j].res
		}
	}
	return of
}

// concurrently runs the passes on up to workers goroutines, each as soon
// as what it requires has ended, and none after the first in the serial
// order that failed.
func (p *plan) concurrently(workers int, s *sink, outs []outcome) {
	n := len(p.order)
	waiting := make([]int, n) // requirements not yet ended
	var ready []int
	for i, a := range p.order {
		waiting[i] = len(a.Requires)
		if waiting[i] == 0 {
			ready = append(ready, i)
		}
	}
	ended := make(chan outcome)
	end := func(o outcome) {
		outs[o.i] = o
		s.end(o.i, o.fail)
		for _, k := range p.next[o.i] {
			if waiting[k]--; waiting[k] == 0 {
				ready = append(ready, k)
			}
		}
	}
	running := 0
	for {
		for len(ready) > 0 && running < workers {
			// The one most others wait on, then the serial order.
			best := 0
			for k, i := range ready {
				if b := ready[best]; p.depth[i] > p.depth[b] || p.depth[i] == p.depth[b] && i < b {
					best = k
				}
			}
			i := ready[best]
			ready = slices.Delete(ready, best, best+1)
			switch {
			case i > s.failed():
				// After a failure in the serial order: it would not
				// have run, nor would what requires it.
			case !p.runs[i]:
				end(outcome{i: i})
			default:
				of := p.resultsFor(i, outs)
				running++
				go func() { ended <- p.pass(i, of, s, true) }()
			}
		}
		if running == 0 {
			return
		}
		end(<-ended)
		running--
	}
}

// pass runs analyzer i with the results of its requirements. With catch
// set, a panic is caught and returned.
func (p *plan) pass(i int, resultOf map[*Analyzer]any, s *sink, catch bool) (o outcome) {
	o.i = i
	a := p.order[i]
	if !p.runs[i] {
		return o
	}
	if catch {
		defer func() {
			if r := recover(); r != nil {
				o.panic, o.fail = r, true
			}
		}()
	}
	pass := &Pass{Analyzer: a, Fset: p.fset, Build: p.build, Design: p.build.Design, ResultOf: resultOf, Config: p.cfg}
	pass.report = func(d diag.Diagnostic) {
		s.report(i, circuit.Finding{Diagnostic: d, Inst: circuit.Unresolved})
	}
	res, err := a.Run(pass)
	if err != nil {
		o.err, o.fail = fmt.Errorf("%s: %w", a.Name, err), true
		return o
	}
	o.res = res
	return o
}

// sink takes the passes' findings and adds them to the collector in the
// serial order.
type sink struct {
	mu    sync.Mutex
	found *circuit.Findings
	head  int                 // the first pass in the serial order not yet ended
	held  [][]circuit.Finding // the findings of passes after head, kept
	ended []bool
	stop  int // the first pass in the serial order that failed; len(ended) if none
}

func (s *sink) report(i int, f circuit.Finding) {
	s.mu.Lock()
	defer s.mu.Unlock()
	if i == s.head {
		s.found.Add(f)
		return
	}
	s.held[i] = append(s.held[i], f)
}

// end records that pass i ended, failed or not, and hands on the findings
// of the passes now first in line.
func (s *sink) end(i int, failed bool) {
	s.mu.Lock()
	defer s.mu.Unlock()
	s.ended[i] = true
	if failed && i < s.stop {
		s.stop = i
	}
	for s.head < s.stop && s.ended[s.head] {
		s.head++
		if s.head < len(s.held) {
			for _, f := range s.held[s.head] {
				s.found.Add(f)
			}
			s.held[s.head] = nil
		}
	}
}

func (s *sink) failed() int {
	s.mu.Lock()
	defer s.mu.Unlock()
	return s.stop
}

// workersFor returns how many passes run at once on design d.
func workersFor(d *circuit.Design) int {
	if d == nil || len(d.Parts) < concurrentFrom {
		return 1
	}
	return runtime.GOMAXPROCS(0)
}
