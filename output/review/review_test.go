package review

import (
	"bytes"
	"encoding/json"
	"math"
	"strings"
	"testing"

	"nodal/check"
	"nodal/internal/sarifschema"
	"nodal/output"
	"nodal/output/report"
	"nodal/rules"

	"github.com/santhosh-tekuri/jsonschema/v6"
)

// side checks an in-memory design as path and returns it as one revision.
func side(t *testing.T, path, src string) *Side {
	t.Helper()
	res, err := check.Source(path, []byte(src), nil)
	if err != nil {
		t.Fatal(err)
	}
	s := &Side{Findings: output.FromDiags(res.Fset, res.Diags)}
	for i := range s.Findings {
		s.Findings[i].Design = path
	}
	if res.Solved != nil && res.Solved.OP != nil {
		s.Table = report.New(path, res.Build.Design, res.Solved.OP, rules.Derating{})
	} else {
		s.NoOP = "no operating point"
	}
	return s
}

// An invented bench supply: R1 dissipates V²/R (Joule's law) = (10 V)² /
// 1 kΩ = 100 mW, 40 % of its 250 mW rating. At 15.4 V it dissipates
// 237.16 mW, 94.9 %. R2 sits on its own 5 V source and does not move.
const (
	stressBefore = `ground gnd
source V1 (vin, gnd) 10 V
resistor R1 (vin, gnd) 1 kΩ rated 250 mW
source V2 (aux, gnd) 5 V
resistor R2 (aux, gnd) 1 kΩ rated 250 mW
`
	stressAfter = `ground gnd
source V1 (vin, gnd) 15.4 V
resistor R1 (vin, gnd) 1 kΩ rated 250 mW
source V2 (aux, gnd) 5 V
resistor R2 (aux, gnd) 1 kΩ rated 250 mW
`
)

func TestStressChange(t *testing.T) {
	d := Compare("psu.nodal", side(t, "psu.nodal", stressBefore), side(t, "psu.nodal", stressAfter), DefaultThresholds)
	if len(d.Parts) != 1 || d.Parts[0].Name != "R1" {
		t.Fatalf("parts moved: %+v; want R1 alone (R2 did not move)", d.Parts)
	}
	p := d.Parts[0]
	// Joule's law, P = V²/R: 100 mW and 237.16 mW of 250 mW.
	if math.Abs(p.Before.Frac-0.40) > 1e-6 || math.Abs(p.After.Frac-15.4*15.4/1000/0.25) > 1e-6 || p.After.What != "power" {
		t.Errorf("R1 moved %v → %v (%s); want 40 %% → 94.9 %% of its power rating", p.Before.Frac, p.After.Frac, p.After.What)
	}
	if len(d.Nets) != 1 || d.Nets[0].Name != "vin" || d.Nets[0].Before != 10 || math.Abs(d.Nets[0].After-15.4) > 1e-9 {
		t.Errorf("nets moved: %+v; want vin from 10 V to 15.4 V", d.Nets)
	}
	// The new near-rating warning (94.9 % is past the usual derating
	// limit) is new; nothing was fixed.
	if d.Count(New) != 1 || d.Count(Absent) != 0 || d.Findings[0].Finding.Rule != "near-rating" {
		t.Errorf("findings %+v; want one new near-rating", d.Findings)
	}
	// A higher threshold hides the move; so does a fall below it.
	if d := Compare("psu.nodal", side(t, "psu.nodal", stressBefore), side(t, "psu.nodal", stressAfter), Thresholds{Use: 0.60, Relative: 0.6}); len(d.Parts) != 0 || len(d.Nets) != 0 {
		t.Errorf("moves past a 60-point, 60 %% threshold: %+v %+v", d.Parts, d.Nets)
	}
	// The other way round it is a fall, listed with a negative change.
	back := Compare("psu.nodal", side(t, "psu.nodal", stressAfter), side(t, "psu.nodal", stressBefore), DefaultThresholds)
	if len(back.Parts) != 1 || back.Parts[0].Delta() > -0.5 || back.Count(Absent) != 1 {
		t.Errorf("reverse: parts %+v, %d fixed", back.Parts, back.Count(Absent))
	}
}

// A finding moved to another line, its statement unchanged, is unchanged;
// a finding whose cause is removed is absent (fixed); one whose numbers
// change is updated.
func TestFindingStates(t *testing.T) {
	before := `ground gnd
source V1 (vin, gnd) 5 V
resistor R1 (vin, lone) 1 kΩ
resistor R2 (vin, gone) 1 kΩ
resistor R3 (vin, gnd) 1 kΩ rated 36 mW
`
	after := `# a comment and a blank line push everything down

ground gnd
source V1 (vin, gnd) 5 V
resistor R1 (vin, lone) 1 kΩ
resistor R2 (vin, gnd) 1 kΩ
resistor R3 (vin, gnd) 1 kΩ rated 40 mW
`
	d := Compare("b.nodal", side(t, "b.nodal", before), side(t, "b.nodal", after), DefaultThresholds)
	states := map[string]State{}
	for _, fc := range d.Findings {
		states[fc.Finding.Subject+" "+fc.Finding.Rule] = fc.State
	}
	want := map[string]State{
		"lone floating-net": Unchanged, // moved from line 3 to line 5
		"gone floating-net": Absent,    // R2 now goes to gnd
		"R3 near-rating":    Updated,   // 69 % became 62 %
	}
	for k, s := range want {
		if states[k] != s {
			t.Errorf("%s: %q, want %q (all: %v)", k, states[k], s, states)
		}
	}
	for _, fc := range d.Findings {
		if fc.State == Unchanged && fc.Before.Line == fc.Finding.Line {
			t.Errorf("the unchanged finding did not move (line %d); the test needs it to", fc.Finding.Line)
		}
	}
}

// The SARIF form carries baselineState on every result and fingerprints
// that match a plain check's, and validates against the OASIS schema.
func TestSARIFBaselineState(t *testing.T) {
	before := "ground gnd\nsource V1 (vin, gnd) 5 V\nresistor R1 (vin, lone) 1 kΩ\nresistor R2 (vin, gone) 1 kΩ\n"
	after := "\nground gnd\nsource V1 (vin, gnd) 5 V\nresistor R1 (vin, lone) 1 kΩ\nresistor R2 (vin, gnd) 1 kΩ\nresistor R4 (vin, fresh) 1 kΩ\n"
	c := &Comparison{Base: "main", Head: "the work tree", Thresholds: DefaultThresholds}
	c.Designs = append(c.Designs, Compare("b.nodal", side(t, "b.nodal", before), side(t, "b.nodal", after), DefaultThresholds))
	c.Designs = append(c.Designs, Compare("new.nodal", nil, side(t, "new.nodal", after), DefaultThresholds))
	var buf bytes.Buffer
	opt := output.Options{Version: "0.0.0-test", Root: "/repo", Dir: "/repo"}
	if err := c.WriteSARIF(&buf, opt); err != nil {
		t.Fatal(err)
	}
	inst, err := jsonschema.UnmarshalJSON(bytes.NewReader(buf.Bytes()))
	if err != nil {
		t.Fatal(err)
	}
	if err := sarifschema.Compile(t).Validate(inst); err != nil {
		t.Fatalf("SARIF does not validate: %v\n%s", err, buf.String())
	}
	var log struct {
		Runs []struct {
			Results []struct {
				BaselineState       string            `json:"baselineState"`
				PartialFingerprints map[string]string `json:"partialFingerprints"`
				Message             struct{ Text string }
			} `json:"results"`
		} `json:"runs"`
	}
	if err := json.Unmarshal(buf.Bytes(), &log); err != nil {
		t.Fatal(err)
	}
	got := map[string]int{}
	prints := map[string]bool{}
	for _, r := range log.Runs[0].Results {
		got[r.BaselineState]++
		if r.PartialFingerprints[output.FingerprintName] == "" {
			t.Errorf("result %q has no fingerprint", r.Message.Text)
		}
		if r.BaselineState != "absent" {
			prints[r.PartialFingerprints[output.FingerprintName]] = true
		}
	}
	// b.nodal: lone unchanged, gone absent, fresh new; new.nodal: lone
	// and fresh new.
	if got["unchanged"] != 1 || got["absent"] != 1 || got["new"] != 3 {
		t.Errorf("baseline states %v; want 1 unchanged, 1 absent, 3 new", got)
	}
	// The later revision's fingerprints are the ones a plain check gives.
	s := side(t, "b.nodal", after)
	var plain bytes.Buffer
	if err := output.Write(&plain, "sarif", &output.Report{Files: 1, Findings: s.Findings}, opt); err != nil {
		t.Fatal(err)
	}
	if err := json.Unmarshal(plain.Bytes(), &log); err != nil {
		t.Fatal(err)
	}
	for _, r := range log.Runs[0].Results {
		if !prints[r.PartialFingerprints[output.FingerprintName]] {
			t.Errorf("check's fingerprint for %q is not in the comparison", r.Message.Text)
		}
	}
}

func TestTextIsOneLinePerFinding(t *testing.T) {
	before := "ground gnd\nsource V1 (vin, gnd) 5 V\n"
	after := "ground gnd\nsource V1 (vin, gnd) 5 V\nresistor R1 (vin, \"evil\x1b[31m\nname\") 1 kΩ\n"
	c := &Comparison{Base: "a", Head: "b", Thresholds: DefaultThresholds,
		Designs: []Design{Compare("x.nodal", side(t, "x.nodal", before), side(t, "x.nodal", after), DefaultThresholds)}}
	var buf bytes.Buffer
	if err := c.WriteText(&buf); err != nil {
		t.Fatal(err)
	}
	out := buf.String()
	if strings.ContainsAny(out, "\x1b\r") {
		t.Errorf("control characters reach the terminal:\n%q", out)
	}
	n := 0
	for _, line := range strings.Split(out, "\n") {
		if strings.HasSuffix(line, "(new)") {
			n++
		}
	}
	if n != c.Designs[0].Count(New) || n == 0 {
		t.Errorf("%d lines end in (new) for %d new findings:\n%s", n, c.Designs[0].Count(New), out)
	}
}

// A part whose nominal use holds still but whose worst case over
// tolerances moves past the threshold is listed, ranked by that move.
func TestWorstCaseMoveListsPart(t *testing.T) {
	base, head := side(t, "a.nodal", stressBefore), side(t, "a.nodal", stressBefore)
	base.WorstUse = map[string]float64{"R1": 0.45}
	head.WorstUse = map[string]float64{"R1": 0.70}
	head.NetRange = map[string][2]float64{"vin": {9, 11}}
	d := Compare("a.nodal", base, head, DefaultThresholds)
	if len(d.Parts) != 1 || d.Parts[0].Name != "R1" || !d.Parts[0].HasWorst() || math.Abs(d.Parts[0].WorstDelta()-0.25) > 1e-12 {
		t.Fatalf("parts %+v; want R1 with a worst case moved by 25 points", d.Parts)
	}
	if len(d.Nets) != 1 || d.Nets[0].AfterRange != [2]float64{9, 11} || d.Nets[0].BeforeRange != [2]float64{10, 10} {
		t.Errorf("nets %+v; want vin with its new range", d.Nets)
	}
	var buf bytes.Buffer
	c := &Comparison{Base: "a", Head: "b", Thresholds: DefaultThresholds, Designs: []Design{d}}
	if err := c.WriteText(&buf); err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(buf.String(), "worst case over tolerances 45 % → 70 % (+25 points)") || !strings.Contains(buf.String(), "over tolerances 10.0 V → 9.00 V … 11.0 V") {
		t.Errorf("text form:\n%s", buf.String())
	}
}

// A layout-only edit changes the file but nothing the comparison lists,
// and says so.
func TestLayoutOnlyChangeIsQuiet(t *testing.T) {
	moved := "# a comment above\n\n" + strings.ReplaceAll(stressBefore, " (", "  (")
	d := Compare("a.nodal", side(t, "a.nodal", stressBefore), side(t, "a.nodal", moved), DefaultThresholds)
	if !d.Quiet() {
		t.Fatalf("a layout-only edit is not quiet: %+v", d)
	}
	if d := Compare("a.nodal", side(t, "a.nodal", stressBefore), side(t, "a.nodal", stressAfter), DefaultThresholds); d.Quiet() {
		t.Error("a change that moves R1 is quiet")
	}
}
