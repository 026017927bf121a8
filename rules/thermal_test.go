package rules

import (
	"math"
	"strings"
	"testing"

	"nodal/circuit"
)

// TestDeratingCurve checks DeratingFactor against the shape of IEC
// 60115-1's derating curve (from memory) with the common-practice knee of
// 70 °C and zero at 155 °C for thick-film chips; the intermediate figures
// are the reference sheet's re-computed ones.
func TestDeratingCurve(t *testing.T) {
	for _, c := range []struct{ t, f float64 }{
		{-55, 1}, {25, 1}, {70, 1}, // full power up to the knee
		{85, 0.8235}, {100, 0.6471}, {125, 0.3529},
		{155, 0}, {200, 0}, // nothing at and beyond the zero point
	} {
		if got := DeratingFactor(DefaultKnee, DefaultZero, c.t); math.Abs(got-c.f) > 0.5e-4 {
			t.Errorf("factor at %v °C = %.4f, want %.4f", c.t, got, c.f)
		}
	}
	// Linear between the end points: the midpoint keeps half.
	if got := DeratingFactor(70, 155, 112.5); math.Abs(got-0.5) > 1e-12 {
		t.Errorf("factor at the midpoint = %v, want 0.5", got)
	}
}

// TestJunctionTemperature checks Tj = Ta + θJA·P (JEDEC JESD51-2's
// junction-to-ambient thermal resistance, from memory) through Judge.
func TestJunctionTemperature(t *testing.T) {
	p := &circuit.Part{Kind: circuit.Diode, Local: "D1", Heat: &circuit.Thermal{Theta: 60, TjMax: 125, HasTjMax: true}}
	q := Quantities{V: 0.9, I: 1.5, P: 1.35, Ambient: 40, HasAmbient: true}
	var u Use
	for _, x := range Judge(p, q, Derating{}) {
		if x.What == "junction temperature" {
			u = x
		}
	}
	want := 40 + 60*1.35 // 121 °C
	if math.Abs(u.Value-want) > 1e-9 {
		t.Fatalf("Tj = %v °C, want %v °C", u.Value, want)
	}
	if math.Abs(u.Frac-(want-40)/(125-40)) > 1e-12 || u.Over() {
		t.Errorf("use %v of the headroom, over %v", u.Frac, u.Over())
	}
	q.Ambient = 50 // 131 °C: past tjmax
	for _, x := range Judge(p, q, Derating{}) {
		if x.What == "junction temperature" && (!x.Over() || !strings.Contains(Describe(nil, p, x), "past its 125 °C maximum")) {
			t.Errorf("at 50 °C: %s", Describe(nil, p, x))
		}
	}
}

// TestDeratedPowerRating checks that a resistor's power is judged against
// its rating derated for the ambient temperature, with its own knee or the
// configured one.
func TestDeratedPowerRating(t *testing.T) {
	r := &circuit.Part{Kind: circuit.Resistor, Local: "R1", Value: 100, RatedPower: 0.25}
	q := Quantities{P: 0.2, Ambient: 112.5, HasAmbient: true} // halfway down the default curve
	u := Judge(r, q, Derating{})[0]
	if math.Abs(u.Rating-0.125) > 1e-12 || !u.Over() || u.Nameplate != 0.25 {
		t.Fatalf("derated rating %v (nameplate %v), over %v", u.Rating, u.Nameplate, u.Over())
	}
	if s := Describe(nil, r, u); !strings.Contains(s, "250 mW rating derated to 125 mW at 112 °C") {
		t.Errorf("message %q", s)
	}
	// At 25 °C nothing is derated and the message says nothing of it.
	q.Ambient = 25
	if u := Judge(r, q, Derating{})[0]; u.Rating != 0.25 || u.Nameplate != 0 || u.Over() {
		t.Errorf("at 25 °C: %+v", u)
	}
	// A design-wide knee of 40 °C and zero of 140 °C derates at 90 °C to half.
	q.Ambient = 90
	if u := Judge(r, q, Derating{ResistorKnee: 40, ResistorZero: 140})[0]; math.Abs(u.Rating-0.125) > 1e-12 {
		t.Errorf("configured knee: rating %v", u.Rating)
	}
	// The part's own derate wins over the configuration.
	r.Heat = &circuit.Thermal{Knee: 90, Zero: 190, HasDerate: true}
	if u := Judge(r, q, Derating{ResistorKnee: 40, ResistorZero: 140})[0]; u.Rating != 0.25 {
		t.Errorf("own derate: rating %v", u.Rating)
	}
}

func TestAmbientPrecedence(t *testing.T) {
	d := circuit.NewDesign("x")
	cfg := &Config{Ambient: circuit.Ambient{Low: 30, High: 60, Set: true}}
	if a := AmbientOf(d, cfg); a.From != "nodal.toml" || a.Nominal != 30 || !a.Range() {
		t.Errorf("nodal.toml: %+v", a)
	}
	d.Ambient = circuit.Ambient{Low: -20, High: 50, Set: true}
	if a := AmbientOf(d, cfg); a.From != "the design" || a.Nominal != 25 {
		t.Errorf("design: %+v", a)
	}
	cfg.ForceAmbient = circuit.Ambient{Low: 85, High: 85, Set: true}
	if a := AmbientOf(d, cfg); a.From != "--ambient" || a.Nominal != 85 || a.Range() {
		t.Errorf("--ambient: %+v", a)
	}
	if a := AmbientOf(circuit.NewDesign("y"), nil); a.Nominal != 25 || a.From != "the default" {
		t.Errorf("default: %+v", a)
	}
}
