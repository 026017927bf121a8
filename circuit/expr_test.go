package circuit

import (
	"math"
	"strings"
	"testing"

	"nodal/grammar"
	"nodal/units"
)

func parseExpr(t *testing.T, text string) *grammar.Expr {
	t.Helper()
	f := grammar.Parse("t", []byte("resistor R (a, b) ("+text+")"))
	if len(f.Errors) > 0 || len(f.Stmts) != 1 || f.Stmts[0].Part.Value.Expr == nil {
		t.Fatalf("%s does not parse: %v", text, f.Errors)
	}
	return f.Stmts[0].Part.Value.Expr
}

func TestEval(t *testing.T) {
	params := map[string]units.Quantity{
		"vdrop": {Value: 2, Dim: units.Voltage},
		"i":     {Value: 0.01, Dim: units.Current},
		"r":     {Value: 10e3, Dim: units.Resistance},
		"t":     {Value: 0.05, Percent: true},
	}
	look := func(n string) (units.Quantity, bool) { q, ok := params[n]; return q, ok }
	cases := []struct {
		expr    string
		value   float64
		dim     units.Dim
		percent bool
		code    Code // expected error code, NoCode for none
		msg     string
	}{
		// Ohm's law, V = I·R (Ohm, Die galvanische Kette, mathematisch
		// bearbeitet, 1827), and P = V·I = I²·R (Joule, On the Heat evolved
		// by Metallic Conductors of Electricity, 1841).
		{expr: "12 V / 10 mA", value: 1200, dim: units.Resistance},
		{expr: "(12 V - vdrop) / i", value: 1000, dim: units.Resistance},
		{expr: "12 V * 10 mA", value: 0.12, dim: units.Power},
		{expr: "i * i * r", value: 1, dim: units.Power},
		// τ = R·C is a time.
		{expr: "10 kΩ * 100 nF", value: 1e-3, dim: units.Time},
		{expr: "1 V / r", value: 1e-4, dim: units.Current},
		{expr: "1 / r", value: 1e-4, dim: units.Conductance},
		{expr: "2 * 4.7 kΩ", value: 9400, dim: units.Resistance},
		{expr: "2 * 3 + 4", value: 10, dim: units.None},
		{expr: "2 * (3 + 4)", value: 14, dim: units.None},
		{expr: "12 / 4 / 3", value: 1, dim: units.None},
		{expr: "-(3 V) + 5 V", value: 2, dim: units.Voltage},
		{expr: "- -vdrop", value: 2, dim: units.Voltage},
		{expr: "4k7 + 300 Ω", value: 5000, dim: units.Resistance},
		{expr: "t * 2", value: 0.1, percent: true},
		{expr: "t + 1%", value: 0.06, percent: true},
		{expr: "t / t", value: 1, dim: units.None},
		// A resistance divided by a current is no electrical quantity the
		// language names, but is a valid intermediate.
		{expr: "r / i", value: 1e6, dim: units.Dim{V: 1, A: -2}},
		{expr: "1 V + 1 A", code: CodeParamUnit, msg: "cannot add a voltage (1.00 V) and a current (1.00 A)"},
		{expr: "r - vdrop", code: CodeParamUnit, msg: "cannot subtract a resistance"},
		{expr: "t + 1", code: CodeParamUnit, msg: "percentage"},
		{expr: "t * 1 V", code: CodeParamUnit, msg: "a percentage combines only with plain numbers"},
		{expr: "t * t", code: CodeParamUnit, msg: "cannot multiply two percentages"},
		{expr: "1 V / 0 A", code: CodeBadValue, msg: "division by zero"},
		{expr: "vdrop / (i - 10 mA)", code: CodeBadValue, msg: "division by zero"},
		{expr: "1e300 V * 1e300", code: CodeBadValue, msg: "too large"},
		{expr: "2 * 1e-400 Ω", code: CodeBadValue, msg: "1e-400 Ω underflows"},
		{expr: "1e999 V", code: CodeBadValue, msg: "too large"},
		{expr: "rr * 2", code: CodeUnknownParam, msg: "no parameter named rr"},
		{expr: "1 kΩ / 1 Ω", value: 1000, dim: units.None},
		// Resistor codes of IEC 60062: R47 is 0.47 Ω, 4k7 is 4.7 kΩ.
		{expr: "2 * R47", value: 0.94, dim: units.Resistance},
		{expr: "4k7 / R47", value: 1e4, dim: units.None},
	}
	for _, c := range cases {
		t.Run(c.expr, func(t *testing.T) {
			q, err := Eval(parseExpr(t, c.expr), look)
			if c.code != NoCode {
				ee, ok := err.(*ExprError)
				if !ok {
					t.Fatalf("want a %s error, got %v (%v)", c.code, err, q)
				}
				if ee.Code != c.code || !strings.Contains(ee.Msg, c.msg) {
					t.Errorf("got [%s] %q, want [%s] containing %q", ee.Code, ee.Msg, c.code, c.msg)
				}
				return
			}
			if err != nil {
				t.Fatal(err)
			}
			if math.Abs(q.Value-c.value) > 1e-12*math.Abs(c.value) || q.Dim != c.dim || q.Percent != c.percent {
				t.Errorf("= %g %v percent %v, want %g %v percent %v", q.Value, q.Dim, q.Percent, c.value, c.dim, c.percent)
			}
		})
	}
}

// A value that is a lone parameter name evaluates to the parameter; at a
// place with no parameters it is an unknown-param error naming it.
func TestEvalValueLoneParameter(t *testing.T) {
	f := grammar.Parse("t", []byte("resistor R (a, b) rtop tol 1%\n"))
	if len(f.Errors) > 0 || len(f.Stmts) != 1 {
		t.Fatalf("does not parse: %v", f.Errors)
	}
	v := f.Stmts[0].Part.Value
	if v.Param == nil || v.Param.Text != "rtop" || len(f.Stmts[0].Part.Attrs) != 1 {
		t.Fatalf("rtop is not read as a lone parameter before tol: %+v", f.Stmts[0].Part)
	}
	want := units.Quantity{Value: 10e3, Dim: units.Resistance}
	q, err := EvalValue(v, func(n string) (units.Quantity, bool) { return want, n == "rtop" })
	if err != nil || q != want {
		t.Errorf("EvalValue = %v, %v; want %v", q, err, want)
	}
	_, err = EvalValue(v, nil)
	if ee, ok := err.(*ExprError); !ok || ee.Code != CodeUnknownParam || ee.Name != "rtop" {
		t.Errorf("without parameters: %v, want an unknown-param error naming rtop", err)
	}
}
