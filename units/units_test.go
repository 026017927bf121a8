package units

import (
	"math"
	"strings"
	"testing"
)

// SI prefixes are those of the SI Brochure (BIPM, 9th edition, 2019);
// the resistor code is IEC 60062 (letter in place of the decimal point).
func TestParse(t *testing.T) {
	cases := []struct {
		num, unit string
		want      float64
		dim       Dim
	}{
		{"4.7kΩ", "", 4700, Resistance},
		{"4.7", "kΩ", 4700, Resistance},
		{"4.7k", "Ω", 4700, Resistance},
		{"4.7", "k\u2126", 4700, Resistance}, // ohm sign U+2126
		{"4.7", "k\u03a9", 4700, Resistance}, // Greek capital omega U+03A9
		{"10", "ohm", 10, Resistance},
		{"10", "kohm", 10e3, Resistance},
		{"22", "\u00b5H", 22e-6, Inductance}, // micro sign U+00B5
		{"22", "\u03bcH", 22e-6, Inductance}, // Greek mu U+03BC
		{"22", "uH", 22e-6, Inductance},
		{"22u", "H", 22e-6, Inductance},
		{"100", "nF", 100e-9, Capacitance},
		{"100nF", "", 100e-9, Capacitance},
		{"3.3", "pF", 3.3e-12, Capacitance},
		{"12", "V", 12, Voltage},
		{"35", "mA", 35e-3, Current},
		{"250", "mW", 0.25, Power},
		{"2", "MΩ", 2e6, Resistance},  // M is mega ...
		{"2", "mΩ", 2e-3, Resistance}, // ... and m milli
		{"1.5", "GΩ", 1.5e9, Resistance},
		{"2", "TΩ", 2e12, Resistance},
		{"1e3", "Ω", 1000, Resistance},
		{"2.5E-3", "A", 2.5e-3, Current},
		{".5", "V", 0.5, Voltage},
		{"4k7", "", 4700, Resistance}, // IEC 60062
		{"2R2", "", 2.2, Resistance},
		{"1M0", "", 1e6, Resistance},
		{"10K7", "", 10.7e3, Resistance},
		{"1G5", "", 1.5e9, Resistance},
		{"1.5", "", 1.5, None},
	}
	for _, c := range cases {
		q, err := Parse(c.num, c.unit)
		if err != nil {
			t.Errorf("Parse(%q, %q): %v", c.num, c.unit, err)
			continue
		}
		if q.Dim != c.dim || math.Abs(q.Value-c.want) > 1e-12*math.Abs(c.want) {
			t.Errorf("Parse(%q, %q) = %v %v; want %v %v", c.num, c.unit, q.Value, q.Dim.Symbol(), c.want, c.dim.Symbol())
		}
	}
}

func TestParsePercent(t *testing.T) {
	q, err := Parse("5%", "")
	if err != nil || !q.Percent || math.Abs(q.Value-0.05) > 1e-15 {
		t.Errorf("Parse(5%%) = %+v, %v", q, err)
	}
	q, err = Parse("0.1", "%")
	if err != nil || !q.Percent || math.Abs(q.Value-0.001) > 1e-15 {
		t.Errorf("Parse(0.1 %%) = %+v, %v", q, err)
	}
}

func TestParseCode(t *testing.T) {
	for s, want := range map[string]float64{"R47": 0.47, "R1": 0.1, "R05": 0.05} {
		q, ok := ParseCode(s)
		if !ok || q.Dim != Resistance || math.Abs(q.Value-want) > 1e-15 {
			t.Errorf("ParseCode(%q) = %v, %v; want %v Ω", s, q.Value, ok, want)
		}
	}
	for _, s := range []string{"R", "Rx", "R4a", "r47", "V1"} {
		if _, ok := ParseCode(s); ok {
			t.Errorf("ParseCode(%q) accepted", s)
		}
	}
}

func TestParseErrors(t *testing.T) {
	cases := []struct {
		num, unit string
		inMsg     string // a word the message or hint must contain
	}{
		{"1", "meg", "M for mega"},
		{"1", "MEG", "M for mega"},
		{"1meg", "", "M for mega"},
		{"1megohm", "", "M for mega"},
		{"10k", "", "prefix but no unit"},
		{"10", "kk", "not a unit"},
		{"10", "Ohm", "not a unit"}, // unit symbols are case-sensitive
		{"10", "v", "not a unit"},
		{"1e999", "V", "too large"},
		{"1e308", "kV", "too large"},
		{"4.7k7", "", "decimal point"},
		{"1.2.3", "V", "not a number"},
		{"5k", "%", "not a unit"},
		{"10K", "", "not a unit"}, // a code needs its digit after the letter
	}
	for _, c := range cases {
		_, err := Parse(c.num, c.unit)
		if err == nil {
			t.Errorf("Parse(%q, %q) accepted", c.num, c.unit)
			continue
		}
		if !strings.Contains(err.Error(), c.inMsg) {
			t.Errorf("Parse(%q, %q) = %q; want it to mention %q", c.num, c.unit, err, c.inMsg)
		}
	}
}

func TestIsUnit(t *testing.T) {
	for _, s := range []string{"Ω", "kΩ", "ohm", "mA", "V", "%", "µF", "μF", "uF", "pF", "W"} {
		if !IsUnit(s) {
			t.Errorf("IsUnit(%q) = false", s)
		}
	}
	for _, s := range []string{"gnd", "meg", "k", "Vin", "ohms", "mm"} {
		if IsUnit(s) {
			t.Errorf("IsUnit(%q) = true", s)
		}
	}
}

// Format: three significant figures with an engineering prefix (common
// practice; the prefixes are the SI Brochure's).
func TestFormat(t *testing.T) {
	cases := []struct {
		v    float64
		d    Dim
		want string
	}{
		{0.3125, Power, "313 mW"},
		{4700, Resistance, "4.70 kΩ"},
		{12, Voltage, "12.0 V"},
		{100e-9, Capacitance, "100 nF"},
		{22e-6, Inductance, "22.0 µH"},
		{-5000, Resistance, "-5.00 kΩ"},
		{0, Voltage, "0 V"},
		{999.7, Voltage, "1.00 kV"},     // rounding carries into the next prefix
		{0.0099996, Current, "10.0 mA"}, // and below 1
		{1.5e-15, Capacitance, "0.00 pF"},
		{3e15, Resistance, "3000 TΩ"},
		{2.5, None, "2.50"},
		{math.Inf(1), Voltage, "+Inf V"},
	}
	for _, c := range cases {
		if got := Format(c.v, c.d); got != c.want {
			t.Errorf("Format(%g, %s) = %q; want %q", c.v, c.d.Symbol(), got, c.want)
		}
	}
}

func TestFormatRoundTrip(t *testing.T) {
	// What Format prints, Parse reads back to within its three figures.
	for _, v := range []float64{1, 4.7e3, 0.047, 3.3e-12, 1.2e6, 815e-3, 999, 1e12} {
		s := Format(v, Resistance)
		i := strings.IndexByte(s, ' ')
		q, err := Parse(s[:i], s[i+1:])
		if err != nil {
			t.Errorf("Parse(Format(%g)) = %v", v, err)
			continue
		}
		if math.Abs(q.Value-v) > 5e-3*v {
			t.Errorf("Parse(%q) = %g; want %g within 0.5 %%", s, q.Value, v)
		}
	}
}

func TestFormatPercent(t *testing.T) {
	for f, want := range map[float64]string{0.05: "5.0 %", 0.25: "25 %", 1.25: "125 %", 0: "0 %", 0.001: "0.1 %"} {
		if got := FormatPercent(f); got != want {
			t.Errorf("FormatPercent(%g) = %q; want %q", f, got, want)
		}
	}
}

func TestDimAlgebra(t *testing.T) {
	// Ω = V/A, W = V·A, F = A·s/V, H = V·s/A (SI Brochure, derived units).
	if Voltage.Div(Current) != Resistance {
		t.Error("V/A is not Ω")
	}
	if Voltage.Mul(Current) != Power {
		t.Error("V·A is not W")
	}
	if Current.Mul(Time).Div(Voltage) != Capacitance {
		t.Error("A·s/V is not F")
	}
	if Resistance.Mul(Time) != Inductance {
		t.Error("Ω·s is not H")
	}
	if s := Resistance.Mul(Resistance).Symbol(); s != "V²/A²" {
		t.Errorf("Ω² symbol = %q", s)
	}
	if n := Capacitance.Noun(); n != "capacitance" {
		t.Errorf("F noun = %q", n)
	}
}

// TestAmpereHour: an ampere-hour is 3600 C (SI Brochure, 9th ed., 2019,
// table 8: the hour is 3600 s), with prefixes as for any unit.
func TestAmpereHour(t *testing.T) {
	for _, c := range []struct {
		num, unit string
		want      float64
	}{{"2.5", "Ah", 9000}, {"2500", "mAh", 9000}, {"2500m", "Ah", 9000}, {"2500mAh", "", 9000}} {
		q, err := Parse(c.num, c.unit)
		if err != nil || q.Dim != Charge || math.Abs(q.Value-c.want) > 1e-9*c.want {
			t.Errorf("Parse(%q, %q) = %v, %v; want %v C", c.num, c.unit, q, err, c.want)
		}
	}
	if _, err := Parse("2.5m", "mAh"); err == nil {
		t.Error("two prefixes accepted")
	}
}

// Prefix and unit symbols are case-sensitive (SI Brochure, 9th edition,
// 2019, section 3): a word that is a unit but for its case gets the
// spelling it was meant to have, and a unit or an unrelated word gets none.
func TestCaseFix(t *testing.T) {
	for _, c := range []struct{ word, want string }{
		{"KΩ", "write kΩ (k is kilo, in lower case)"},
		{"KV", "write kV (k is kilo, in lower case)"},
		{"v", "write V (unit symbols and prefixes are case-sensitive)"},
		{"OHM", "write ohm (unit symbols and prefixes are case-sensitive)"},
		{"kΩ", ""},
		{"mA", ""},
		{"gnd", ""},
		{"", ""},
	} {
		if got := CaseFix(c.word); got != c.want {
			t.Errorf("CaseFix(%q) = %q, want %q", c.word, got, c.want)
		}
	}
}
