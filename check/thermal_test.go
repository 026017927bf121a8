package check_test

import (
	"math"
	"strings"
	"testing"

	"nodal/check"
	"nodal/rules"
)

// Temperature in the language: the ambient statement, the thermal
// attributes and units, and how they change verdicts. Written from
// docs/language.md.

func TestAmbientStatement(t *testing.T) {
	for _, c := range []struct {
		src     string
		lo, hi  float64
		wantErr string
	}{
		{src: "ambient 40 °C", lo: 40, hi: 40},
		{src: "ambient 40°C", lo: 40, hi: 40},
		{src: "ambient 40 degC", lo: 40, hi: 40},
		{src: "ambient -20 °C to 50 °C", lo: -20, hi: 50},
		{src: "ambient -40 degC to -5 degC", lo: -40, hi: -5},
		{src: "ambient 5 V", wantErr: "must be a temperature"},
		{src: "ambient 50 °C to 0 °C", wantErr: "from low to high"},
		{src: "ambient 400 °C", wantErr: "outside"},
		{src: "ambient 25m°C", wantErr: "not a unit"},
		{src: "ambient 25k °C", wantErr: "takes no prefix"},
		{src: "ambient 25 k°C", wantErr: "not valid here"},
		{src: "ambient 20 °C\nambient 30 °C", wantErr: "second ambient"},
	} {
		res := run(t, "ground gnd\n"+c.src+"\nsource V1 (a, gnd) 1 V\nresistor R1 (a, gnd) 1 kΩ\n")
		got := strings.Join(lines(res), "\n")
		if c.wantErr != "" {
			if !strings.Contains(got, c.wantErr) {
				t.Errorf("%q: findings %q, want one containing %q", c.src, got, c.wantErr)
			}
			continue
		}
		a := res.Build.Design.Ambient
		if got != "" || !a.Set || a.Low != c.lo || a.High != c.hi {
			t.Errorf("%q: ambient %+v, findings %q", c.src, a, got)
		}
	}
}

func TestThermalAttributes(t *testing.T) {
	res := run(t, `ground gnd
source V1 (a, gnd) 5 V
resistor R1 (a, b) 1 kΩ tempco 250 ppm/K derate 85 °C to 175 °C rated 250 mW
resistor R2 (b, gnd) 1 kΩ tempco -50ppm/°C
diode D1 (a, d) vf 0.7 V at 10 mA theta 250 K/W tjmax 150 °C series 1 Ω
resistor R4 (d, gnd) 1 kΩ
led D2 (a, c) vf 2 V at 20 mA theta 62.5 °C/W tjmax 125 degC
resistor R3 (c, gnd) 1 kΩ
`)
	if l := lines(res); len(l) != 0 {
		t.Fatalf("findings: %q", l)
	}
	d := res.Build.Design
	r1, r2, d1, d2 := part(t, d, "R1").Heat, part(t, d, "R2").Heat, part(t, d, "D1").Heat, part(t, d, "D2").Heat
	if r1.Tempco != 250e-6 || r1.Knee != 85 || r1.Zero != 175 || !r1.HasDerate || math.Abs(r2.Tempco+50e-6) > 1e-18 {
		t.Errorf("resistors: %+v %+v", r1, r2)
	}
	if d1.Theta != 250 || d1.TjMax != 150 || !d1.HasTjMax || d2.Theta != 62.5 || d2.TjMax != 125 {
		t.Errorf("junctions: %+v %+v", d1, d2)
	}
	for _, c := range []struct{ line, want string }{
		{"capacitor C1 (a, gnd) 1 µF tempco 100 ppm/K", "takes no tempco"},
		{"resistor R9 (a, gnd) 1 kΩ tempco 5000 ppm/K", "outside ±2000 ppm/K"},
		{"resistor R9 (a, gnd) 1 kΩ tempco 100 ppm", "must be a temperature coefficient"},
		{"resistor R9 (a, gnd) 1 kΩ derate 70 °C", "derate needs"},
		{"resistor R9 (a, gnd) 1 kΩ derate 155 °C to 70 °C", "must end below"},
		{"resistor R9 (a, gnd) 1 kΩ derate 70 V to 155 V", "both must be temperatures"},
		{"resistor R9 (a, gnd) 1 kΩ rated 1 W to 2 W", "only derate takes"},
		{"diode D9 (a, gnd) vf 0.7 V at 10 mA theta 250 K", "must be a thermal resistance"},
		{"diode D9 (a, gnd) vf 0.7 V at 10 mA theta 250 °C", "must be a thermal resistance"},
		{"diode D9 (a, gnd) vf 0.7 V at 10 mA tjmax 150 K/W", "must be a temperature"},
	} {
		got := strings.Join(lines(run(t, "ground gnd\nsource V1 (a, gnd) 1 V\n"+c.line+"\n")), "\n")
		if !strings.Contains(got, c.want) {
			t.Errorf("%q: findings %q, want one containing %q", c.line, got, c.want)
		}
	}
}

// TestTemperatureChangesVerdicts: a resistor within its power rating at
// 25 °C is past it at 125 °C, where the IEC 60115-1 derating shape (from
// memory; knee 70 °C, zero 155 °C, common practice) leaves 35.29 % of the
// rating; and a resistor's tempco moves its value (and so a divider) by
// α·ΔT.
func TestTemperatureChangesVerdicts(t *testing.T) {
	const design = "ground gnd\nsource V1 (a, gnd) 10 V\nresistor R1 (a, gnd) 500 Ω rated 250 mW\n"
	if l := lines(run(t, design)); len(l) != 1 || !strings.Contains(l[0], "near-rating") {
		t.Errorf("at 25 °C: %q, want only near-rating (200 mW of 250 mW)", l)
	}
	l := lines(run(t, strings.Replace(design, "ground gnd", "ground gnd\nambient 125 °C", 1)))
	if len(l) != 1 || !strings.Contains(l[0], "R1 dissipates 200 mW, 227 % of its 250 mW rating derated to 88.2 mW at 125 °C [over-power]") {
		t.Errorf("at 125 °C: %q", l)
	}
	// --ambient overrides the design's statement.
	cfg := &rules.Config{}
	cfg.ForceAmbient.Low, cfg.ForceAmbient.High, cfg.ForceAmbient.Set = 25, 25, true
	res, err := check.Source("t.nodal", []byte(strings.Replace(design, "ground gnd", "ground gnd\nambient 125 °C", 1)), &check.Options{Config: cfg})
	if err != nil {
		t.Fatal(err)
	}
	if l := lines(res); len(l) != 1 || !strings.Contains(l[0], "near-rating") {
		t.Errorf("--ambient 25: %q", l)
	}
	// A divider of two 1 kΩ resistors, the top one +1000 ppm/K: at 75 °C
	// the top is 1.05 kΩ and the tap sits at 10 V · 1/2.05.
	res = run(t, "ground gnd\nambient 75 °C\nsource V1 (a, gnd) 10 V\nresistor R1 (a, b) 1 kΩ tempco 1000 ppm/K\nresistor R2 (b, gnd) 1 kΩ\n")
	if l := lines(res); len(l) != 0 {
		t.Fatalf("divider: %q", l)
	}
	d := res.Build.Design
	if v := res.Solved.OP.NetV[d.LookupNet("b")]; math.Abs(v-10/2.05) > 1e-9 {
		t.Errorf("tap at 75 °C: %.9f V, want %.9f V", v, 10/2.05)
	}
}
