package rules

import (
	"testing"

	"nodal/circuit"
	"nodal/diag"
	"nodal/grammar"
)

// TestLastPass: the last pass gives every finding its rule's severity (as
// reported, else the default, else the configured one), drops what is
// off, never drops a finding no analyzer owns, and sorts once.
func TestLastPass(t *testing.T) {
	src := []byte("ground gnd\nsource V1 (a, gnd) 5 V\nresistor R1 (a, gnd) 1 kΩ\n")
	fset := diag.NewFileSet()
	file := fset.AddFile("t.nodal", src)
	b := circuit.BuildFile(fset, file, src, grammar.Parse("t.nodal", src), nil)
	r1 := &b.Design.Parts[1]
	probe := &Analyzer{Name: "probe-rule", Severity: diag.Warning, Doc: "test\n", Run: func(p *Pass) (any, error) {
		p.Report(diag.Diagnostic{Pos: r1.End, End: r1.End, Subject: b.Design.NameOf(r1), Message: "late"})
		p.Report(diag.Diagnostic{Pos: r1.Pos, End: r1.End, Severity: diag.Note, Message: "early, a note"})
		return nil, nil
	}}
	stray := &Analyzer{Name: "stray", Doc: "test\n", Run: func(p *Pass) (any, error) {
		p.report(diag.Diagnostic{Pos: r1.Pos, Rule: "no-such-rule", Message: "owned by nobody"})
		return nil, nil
	}}
	got, err := Run(fset, b, []*Analyzer{probe, stray}, nil)
	if err != nil {
		t.Fatal(err)
	}
	want := []struct {
		msg string
		sev diag.Severity
	}{{"owned by nobody", diag.Error}, {"early, a note", diag.Note}, {"late", diag.Warning}} // by position, then rule
	if len(got) != len(want) {
		t.Fatalf("got %d findings, want %d: %+v", len(got), len(want), got)
	}
	for i, w := range want {
		if got[i].Message != w.msg || got[i].Severity != w.sev {
			t.Errorf("finding %d: %q at %s, want %q at %s", i, got[i].Message, got[i].Severity, w.msg, w.sev)
		}
	}
	// A configured severity replaces both the default and the reported
	// one; off drops the rule's findings.
	got, _ = Run(fset, b, []*Analyzer{probe}, &Config{Severity: map[string]diag.Severity{"probe-rule": diag.Error}})
	for _, d := range got {
		if d.Severity != diag.Error {
			t.Errorf("%q at %s, want error", d.Message, d.Severity)
		}
	}
	got, _ = Run(fset, b, []*Analyzer{probe}, &Config{Severity: map[string]diag.Severity{"probe-rule": diag.Off}})
	if len(got) != 0 {
		t.Errorf("rule off, still %+v", got)
	}
}
