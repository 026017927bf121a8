package circuit

import (
	"testing"

	"nodal/diag"
)

func TestSameBut(t *testing.T) {
	cases := []struct {
		a, pa, b, pb string
		want         bool
	}{
		{"resistor A.R is 0 Ω", "A", "resistor B.R is 0 Ω", "B", true},
		{"A.R feeds A.x", "A", "B.R feeds B.x", "B", true},
		{"A.R feeds A.x", "A", "B.R feeds A.x", "B", false}, // names another instance's net
		{"A.R dissipates 250 mW", "A", "B.R dissipates 160 mW", "B", false},
		{"X.Y.R", "X.Y", "X.Z.R", "X.Z", true},
		{"A.R", "A", "B.R and more", "B", false},
		{"", "A", "", "B", true},
	}
	for _, c := range cases {
		if got := sameBut(c.a, c.pa, c.b, c.pb); got != c.want {
			t.Errorf("sameBut(%q, %q, %q, %q) = %v, want %v", c.a, c.pa, c.b, c.pb, got, c.want)
		}
	}
}

// TestFindingsMerge: repeats across instances merge whatever the order
// they come in; the kept finding is the one whose subject sorts first.
func TestFindingsMerge(t *testing.T) {
	d := NewDesign("t.nodal")
	for _, p := range []string{"A", "B", "C"} {
		d.Instances = append(d.Instances, Instance{Local: p, Block: "lamp", Parent: -1})
	}
	mk := func(in int32) Finding {
		p := d.InstancePath(in)
		return Finding{Diagnostic: diag.Diagnostic{Pos: 7, Rule: "bad-value", Severity: diag.Error,
			Message: "resistor " + p + ".R is 0 Ω", Subject: p + ".R"}, Code: CodeBadValue, Inst: in, Path: p}
	}
	for _, order := range [][]int32{{0, 1, 2}, {2, 0, 1}, {1, 2, 0}} {
		var fs Findings
		fs.Use(d)
		for _, in := range order {
			fs.Add(mk(in))
		}
		fs.Add(Finding{Diagnostic: diag.Diagnostic{Pos: 7, Rule: "bad-value", Severity: diag.Error, Message: "at the top"}, Inst: -1})
		out := fs.Finish(d)
		if len(out) != 2 {
			t.Fatalf("order %v: %d findings, want 2", order, len(out))
		}
		got := out[0]
		if got.Message != "resistor A.R is 0 Ω (and in 2 more instances)" || got.Subject != "A.R" {
			t.Errorf("order %v: %q about %q", order, got.Message, got.Subject)
		}
		if len(got.Related) != 3 || got.Related[1].Message != "also in B (block lamp)" || got.Related[2].Message != "also in C (block lamp)" {
			t.Errorf("order %v: related %+v", order, got.Related)
		}
	}
}
