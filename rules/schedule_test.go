package rules

import (
	"errors"
	"fmt"
	"reflect"
	"slices"
	"testing"

	"nodal/circuit"
	"nodal/diag"
	"nodal/grammar"
)

// probes returns analyzers for the scheduler's tests on the design b:
// first, top (which requires failing) and last, so that the serial order
// is first, failing, top, last, each reporting a finding named after it.
// When gated, first reports its
// second finding only once failing has failed and last has ended, and
// failing fails only once last has ended, so that on three goroutines the
// passes end in the order opposite to the serial one. fail is what failing
// does: return an error or panic.
func probes(b *circuit.Result, gated bool, fail string) []*Analyzer {
	lastEnded, failed := make(chan struct{}), make(chan struct{})
	wait := func(c chan struct{}) {
		if gated {
			<-c
		}
	}
	report := func(p *Pass, what string) {
		r := &b.Design.Parts[0]
		p.Report(diag.Diagnostic{Pos: r.Pos, End: r.End, Message: what})
	}
	first := &Analyzer{Name: "first", Severity: diag.Warning, Doc: "test\n", Run: func(p *Pass) (any, error) {
		report(p, "first, before")
		wait(failed)
		report(p, "first, after")
		return "first's result", nil
	}}
	failing := &Analyzer{Name: "failing", Severity: diag.Warning, Doc: "test\n", Run: func(p *Pass) (any, error) {
		report(p, "failing, before it fails")
		wait(lastEnded)
		if gated {
			defer close(failed)
		}
		if fail == "panic" {
			panic("failing panics")
		}
		return nil, errors.New("failing fails")
	}}
	last := &Analyzer{Name: "last", Severity: diag.Warning, Doc: "test\n", Run: func(p *Pass) (any, error) {
		report(p, "last")
		if gated {
			close(lastEnded)
		}
		return "last's result", nil
	}}
	top := &Analyzer{Name: "top", Severity: diag.Warning, Doc: "test\n", Requires: []*Analyzer{failing}, Run: func(p *Pass) (any, error) {
		report(p, "top")
		return "top's result", nil
	}}
	return []*Analyzer{first, top, last}
}

// TestScheduleFailureAsSerial: when a pass fails while passes after it in
// the serial order have already run, the concurrent run gives what the
// serial run gives: the findings of the passes before it and its own
// (those it made before failing), its error, the results of the passes
// before it, the analyzers the serial walk had reached (top, which waits
// on it, among them), and a panic passed on as the serial run would panic.
func TestScheduleFailureAsSerial(t *testing.T) {
	src := []byte("ground gnd\nresistor R1 (a, gnd) 1 kΩ\n")
	fset := diag.NewFileSet()
	file := fset.AddFile("t.nodal", src)
	b := circuit.BuildFile(fset, file, src, grammar.Parse("t.nodal", src), nil)
	type outcome struct {
		msgs    []string
		results []string
		ran     []string
		err     string
		panic   any
	}
	run := func(workers int, fail string) (o outcome) {
		defer func() { o.panic = recover() }()
		var found circuit.Findings
		found.Use(b.Design)
		results, ran, err := newPlan(fset, b, probes(b, workers > 1, fail), &Config{}, &found).run(workers)
		for _, f := range found.All() {
			o.msgs = append(o.msgs, f.Message)
		}
		for a, r := range results {
			o.results = append(o.results, fmt.Sprint(a.Name, ": ", r))
		}
		for a := range ran {
			o.ran = append(o.ran, a.Name)
		}
		slices.Sort(o.results)
		slices.Sort(o.ran)
		o.err = fmt.Sprint(err)
		return o
	}
	want := outcome{
		msgs:    []string{"first, before", "first, after", "failing, before it fails"},
		results: []string{"first: first's result"},
		ran:     []string{"failing", "first", "top"},
		err:     "failing: failing fails",
	}
	if got := run(1, "error"); !reflect.DeepEqual(got, want) {
		t.Errorf("one after another: %+v\nwant %+v", got, want)
	}
	if got := run(3, "error"); !reflect.DeepEqual(got, want) {
		t.Errorf("concurrently: %+v\nwant %+v", got, want)
	}
	if got := run(1, "panic"); got.panic != "failing panics" {
		t.Errorf("one after another, a panic: %+v", got)
	}
	if got := run(3, "panic"); got.panic != "failing panics" {
		t.Errorf("concurrently, a panic: %+v", got)
	}
}

// TestSinkSerialOrder: findings reach the collector in the serial order of
// the passes that made them, whatever order the passes report and end in.
func TestSinkSerialOrder(t *testing.T) {
	var found circuit.Findings
	s := &sink{found: &found, held: make([][]circuit.Finding, 4), ended: make([]bool, 4), stop: 4}
	add := func(i int, m string) {
		s.report(i, circuit.Finding{Diagnostic: diag.Diagnostic{Rule: fmt.Sprint("r", i), Message: m}, Inst: -1})
	}
	add(2, "2a")
	add(0, "0a")
	add(3, "3a")
	s.end(2, false)
	add(1, "1a")
	add(0, "0b")
	s.end(0, false) // 1 is now first in line: its own go straight in
	add(1, "1b")
	add(3, "3b")
	s.end(3, false)
	add(1, "1c")
	s.end(1, false)
	var got []string
	for _, f := range found.All() {
		got = append(got, f.Message)
	}
	want := []string{"0a", "0b", "1a", "1b", "1c", "2a", "3a", "3b"}
	if !slices.Equal(got, want) {
		t.Errorf("collected %v, want %v", got, want)
	}
}

// TestRequiresCycle: an analyzer that requires itself, directly or through
// another, is a slip in nodal that the run refuses at once, rather than
// one a concurrent run would wait on for ever.
func TestRequiresCycle(t *testing.T) {
	a := &Analyzer{Name: "a", Doc: "test\n", Run: func(*Pass) (any, error) { return nil, nil }}
	b := &Analyzer{Name: "b", Doc: "test\n", Requires: []*Analyzer{a}, Run: a.Run}
	a.Requires = []*Analyzer{b}
	defer func() {
		if r := recover(); r == nil {
			t.Error("a cycle a → b → a was accepted")
		}
	}()
	newPlan(nil, &circuit.Result{}, []*Analyzer{a}, &Config{}, &circuit.Findings{})
}
