package check

import (
	"strings"
	"testing"

	"nodal/diag"
	"nodal/rules"
)

// ratedBlock is an invented panel: a block whose resistor is overloaded
// (5 V across 100 Ω is 250 mW, twice its 125 mW rating: P = V²/R), used by
// three instances alike and one on a lower supply.
const ratedBlock = `block lamp (s, k) {
  resistor R (s, k) 100 Ω rated 125 mW
}
ground gnd
source V (s, gnd) 5 V
lamp A (s, gnd)
lamp B (s, gnd)
lamp C (s, gnd)
lamp D (low, gnd)
source VL (low, gnd) 4 V
`

// TestRatingFindingsInsideBlocks: a rating finding about a part inside an
// instance carries the instance chain like every other finding, and the
// instances that repeat it alike collapse to one finding with a count.
func TestRatingFindingsInsideBlocks(t *testing.T) {
	r := checkMem(t, map[string]string{"t.nodal": ratedBlock}, "t.nodal", nil)
	fs := findings(r, "over-power")
	if len(fs) != 2 {
		t.Fatalf("want two over-power findings (A, B, C alike; D apart), got:\n%s", strings.Join(lines(r), "\n"))
	}
	a, d := fs[0], fs[1]
	if !strings.Contains(a.Message, "A.R dissipates 250 mW, 200 % of its 125 mW rating (and in 2 more instances)") {
		t.Errorf("merged finding: %q", a.Message)
	}
	if a.Subject != "A.R" {
		t.Errorf("merged finding's subject %q, want A.R", a.Subject)
	}
	wantRel := []string{"in A (block lamp)", "also in B (block lamp)", "also in C (block lamp)"}
	if len(a.Related) != len(wantRel) {
		t.Fatalf("related %+v, want %v", a.Related, wantRel)
	}
	for i, w := range wantRel {
		if a.Related[i].Message != w {
			t.Errorf("related[%d] = %q, want %q", i, a.Related[i].Message, w)
		}
		if line := r.Fset.Position(a.Related[i].Pos).Line; line != 6+i {
			t.Errorf("related[%d] on line %d, want %d", i, line, 6+i)
		}
	}
	// D's resistor dissipates (4 V)²/100 Ω = 160 mW: another number, its
	// own finding.
	if !strings.Contains(d.Message, "D.R dissipates 160 mW") || strings.Contains(d.Message, "more instance") || len(d.Related) != 1 {
		t.Errorf("D's finding: %q, related %+v", d.Message, d.Related)
	}
	if p := r.Fset.Position(a.Pos); p.Line != 2 {
		t.Errorf("finding at %s, want the statement in the block, line 2", p)
	}
}

// TestMergeIgnoresOrder: the merged finding names the instance whose path
// sorts first and lists the others in path order, whatever the order of
// the instance statements.
func TestMergeIgnoresOrder(t *testing.T) {
	swapped := strings.Replace(ratedBlock, "lamp A (s, gnd)\nlamp B (s, gnd)\nlamp C (s, gnd)\n", "lamp C (s, gnd)\nlamp A (s, gnd)\nlamp B (s, gnd)\n", 1)
	if swapped == ratedBlock {
		t.Fatal("the swap did not apply")
	}
	describe := func(src string) string {
		r := checkMem(t, map[string]string{"t.nodal": src}, "t.nodal", nil)
		var b strings.Builder
		for _, d := range r.Diags {
			b.WriteString(d.Message + " |")
			for _, rel := range d.Related {
				b.WriteString(" " + rel.Message)
			}
			b.WriteString("\n")
		}
		return b.String()
	}
	if a, b := describe(ratedBlock), describe(swapped); a != b {
		t.Errorf("findings depend on statement order:\n%s\nswapped:\n%s", a, b)
	}
}

// TestLastPassAlike: severity overrides and accept comments apply to a
// merged rating finding as to any other.
func TestLastPassAlike(t *testing.T) {
	cfg := &rules.Config{Severity: map[string]diag.Severity{"over-power": diag.Warning}}
	r := checkMem(t, map[string]string{"t.nodal": ratedBlock}, "t.nodal", &Options{Config: cfg})
	for _, d := range findings(r, "over-power") {
		if d.Severity != diag.Warning {
			t.Errorf("%q at %s, want warning", d.Message, d.Severity)
		}
	}
	cfg = &rules.Config{Severity: map[string]diag.Severity{"over-power": diag.Off, "bad-value": diag.Off}}
	r = checkMem(t, map[string]string{"t.nodal": ratedBlock + "resistor Z (s, gnd) 0 Ω\n"}, "t.nodal", &Options{Config: cfg})
	if n := len(findings(r, "over-power")) + len(findings(r, "bad-value")); n != 0 {
		t.Errorf("rules turned off still report:\n%s", strings.Join(lines(r), "\n"))
	}
}

// TestEveryRuleMergesAlike: whatever rule makes a finding about a part or
// net inside a block, three instances that repeat it make one finding
// that names the first instance, counts the others and lists them.
func TestEveryRuleMergesAlike(t *testing.T) {
	wiring := `block bad (s, k) {
  resistor Q (s, s) 1 kΩ
  capacitor C (s, spare) 1 nF
  capacitor C2 (k, iso) 1 nF
  capacitor C3 (iso, s) 1 nF
  resistor Z (s, k) 5 kF
  resistor r (s, k) 1 kΩ
  resistor R (s, k) 1 kΩ
}
ground gnd
source V (vin, gnd) 5 V
bad A (vin, gnd)
bad C (vin, gnd)
bad B (vin, gnd)
`
	// 5 V across 100 Ω is 250 mW (P = V²/R) against 125 mW; 5 V across
	// 1 Ω draws 5 A (I = V/R) through an inductor rated 1 A.
	ratings := `block bad (s, k) {
  resistor R (s, k) 100 Ω rated 125 mW
  inductor L (s, m) 1 mH rated 1 A
  resistor RM (m, k) 1 Ω rated 50 W
}
ground gnd
source V (vin, gnd) 5 V
bad A (vin, gnd)
bad C (vin, gnd)
bad B (vin, gnd)
`
	want := map[string]bool{}
	for _, src := range []string{wiring, ratings} {
		r := checkMem(t, map[string]string{"t.nodal": src}, "t.nodal", nil)
		for _, d := range r.Diags {
			want[d.Rule] = true
			if !strings.Contains(d.Message, "(and in 2 more instances)") || !strings.HasPrefix(d.Subject, "A.") {
				t.Errorf("[%s] %q about %q: not merged into A's", d.Rule, d.Message, d.Subject)
				continue
			}
			var rel []string
			for _, x := range d.Related {
				if strings.Contains(x.Message, "(block bad)") {
					rel = append(rel, x.Message)
				}
			}
			if strings.Join(rel, "; ") != "in A (block bad); also in B (block bad); also in C (block bad)" {
				t.Errorf("[%s] related %v", d.Rule, rel)
			}
		}
	}
	for _, rule := range []string{"shorted-part", "floating-net", "no-dc-path", "unit-mismatch", "case-clash", "over-power", "over-current"} {
		if !want[rule] {
			t.Errorf("no %s finding to check", rule)
		}
	}
}
