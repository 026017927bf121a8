// Package units gives quantities a dimension, so that a capacitor written in
// ohms, or a resistance divided by a current, is caught before it reaches the
// solver.
//
// # Dimensions
//
// A Dim holds the exponents of three base units: the volt, the ampere and
// the second. Every unit the language knows is a product of powers of these:
// Ω = V/A, W = V·A, F = A·s/V, H = V·s/A. Choosing electrical base units
// rather than the SI base units (kg, m, s, A) keeps the exponents small and
// the messages readable, and the two systems describe the same derived units.
//
// # Writing quantities
//
// Parse reads the text of a quantity as it appears in a design: a decimal
// number, an optional SI prefix (p n u µ μ m k M G T) and a unit symbol (Ω,
// Ω, ohm, F, H, V, A, W, Ah (the ampere-hour, held as 3600 C), %), with
// or without a space between number and suffix. It also reads the resistor letter-and-digit code of IEC 60062
// (4k7 = 4.7 kΩ, 2R2 = 2.2 Ω, 1M0 = 1 MΩ). Errors carry a hint for the usual
// slips: "meg" for mega, a missing unit, a prefix with no unit.
//
// Format prints a value with an engineering prefix and three significant
// digits, the way an engineer writes it: 312 mW, 4.70 kΩ, 12.0 V.
package units

import (
	"fmt"
	"math"
	"sort"
	"strconv"
	"strings"
)

// Dim is a dimension: the exponents of volt, ampere, second and kelvin.
type Dim struct{ V, A, S, K int8 }

// Common dimensions.
var (
	None        = Dim{}
	Voltage     = Dim{V: 1}
	Current     = Dim{A: 1}
	Resistance  = Dim{V: 1, A: -1}
	Conductance = Dim{V: -1, A: 1}
	Power       = Dim{V: 1, A: 1}
	Capacitance = Dim{V: -1, A: 1, S: 1}
	Inductance  = Dim{V: 1, A: -1, S: 1}
	Time        = Dim{S: 1}
	// Temperature is an absolute temperature. Its quantities are held in
	// °C, the one unit of the language with an offset (see Temperatures).
	Temperature = Dim{K: 1}
	// ThermalResistance is K/W (equally °C/W): the rise of a junction
	// above ambient per watt it dissipates.
	ThermalResistance = Dim{K: 1, V: -1, A: -1}
	// TempCoefficient is a relative change per kelvin (ppm/K).
	TempCoefficient = Dim{K: -1}
	Charge          = Dim{A: 1, S: 1}
)

// Mul returns the dimension of a product.
func (d Dim) Mul(e Dim) Dim { return Dim{d.V + e.V, d.A + e.A, d.S + e.S, d.K + e.K} }

// Div returns the dimension of a quotient.
func (d Dim) Div(e Dim) Dim { return Dim{d.V - e.V, d.A - e.A, d.S - e.S, d.K - e.K} }

var named = []struct {
	d      Dim
	symbol string
	noun   string
}{
	{None, "", "plain number"},
	{Voltage, "V", "voltage"},
	{Current, "A", "current"},
	{Resistance, "Ω", "resistance"},
	{Conductance, "S", "conductance"},
	{Power, "W", "power"},
	{Capacitance, "F", "capacitance"},
	{Inductance, "H", "inductance"},
	{Time, "s", "time"},
	{Temperature, "°C", "temperature"},
	{ThermalResistance, "K/W", "thermal resistance"},
	{TempCoefficient, "ppm/K", "temperature coefficient"},
	{Charge, "C", "charge"},
}

// Symbol returns the unit symbol of d (Ω, V, A ...) or a product of powers
// such as "V²/A" when d has no name of its own.
func (d Dim) Symbol() string {
	for _, n := range named {
		if n.d == d {
			return n.symbol
		}
	}
	var num, den []string
	for _, p := range []struct {
		e int8
		s string
	}{{d.V, "V"}, {d.A, "A"}, {d.S, "s"}, {d.K, "K"}} {
		switch {
		case p.e > 0:
			num = append(num, p.s+power(p.e))
		case p.e < 0:
			den = append(den, p.s+power(-p.e))
		}
	}
	s := strings.Join(num, "·")
	if s == "" {
		s = "1"
	}
	if len(den) > 0 {
		s += "/" + strings.Join(den, "·")
	}
	return s
}

func power(e int8) string {
	switch e {
	case 1:
		return ""
	case 2:
		return "²"
	case 3:
		return "³"
	}
	return "^" + strconv.Itoa(int(e))
}

// Noun returns what a quantity of dimension d is called: "resistance",
// "voltage", or "quantity in V²/A".
func (d Dim) Noun() string {
	for _, n := range named {
		if n.d == d {
			return n.noun
		}
	}
	return "quantity in " + d.Symbol()
}

// Quantity is a value in SI base units with its dimension. Percent records
// that it was written with %; its Value is then the fraction (5% = 0.05).
type Quantity struct {
	Value   float64
	Dim     Dim
	Percent bool
}

// String formats q with an engineering prefix.
func (q Quantity) String() string {
	if q.Percent {
		return FormatPercent(q.Value)
	}
	if q.Dim == Temperature {
		return FormatCelsius(q.Value)
	}
	return Format(q.Value, q.Dim)
}

var prefixes = map[string]float64{
	"p": 1e-12, "n": 1e-9, "u": 1e-6, "\u00b5": 1e-6, "\u03bc": 1e-6,
	"m": 1e-3, "k": 1e3, "M": 1e6, "G": 1e9, "T": 1e12,
}

var symbols = map[string]Dim{
	"\u03a9": Resistance, "\u2126": Resistance, "ohm": Resistance,
	"F": Capacitance, "H": Inductance, "V": Voltage, "A": Current, "W": Power,
	"Ah": Charge,
}

// scales holds the units that are not SI base units: an ampere-hour is
// 3600 C. A quantity in one is held in the base unit.
var scales = map[string]float64{"Ah": 3600}

func unitScale(sym string) float64 {
	if f, ok := scales[sym]; ok {
		return f
	}
	return 1
}

// Error is a quantity that cannot be read, with a hint for the fix.
type Error struct {
	Text string // what was written
	Msg  string
	Hint string
	// Number and Prefix are set when a prefix was written with no unit
	// after it ("10k"), so that a caller who knows the unit expected can
	// say what to write.
	Number, Prefix string
	// Range is set when the text reads but its value is out of the range
	// a float64 holds (too large, or so small it would read as 0): the
	// value is wrong, not its unit.
	Range bool
}

func (e *Error) Error() string {
	if e.Hint != "" {
		return e.Msg + "; " + e.Hint
	}
	return e.Msg
}

// IsUnit reports whether s is a unit suffix with an optional prefix
// ("kΩ", "mA", "V", "%"). The lexer uses it to tell a unit word from a name.
func IsUnit(s string) bool {
	_, _, ok := splitUnit(s)
	return ok
}

// CaseFix says how to write a unit word that is a unit but for the case
// of its letters ("KΩ", "Kohm", "mw"), or returns "". Prefixes and symbols
// are case-sensitive: M is mega and m milli, and K is nothing.
func CaseFix(word string) string {
	if word == "" || IsUnit(word) {
		return ""
	}
	if strings.HasPrefix(word, "K") && IsUnit("k"+word[1:]) {
		return "write k" + word[1:] + " (k is kilo, in lower case)"
	}
	var found []string
	for p := range prefixes {
		for sym := range symbols {
			if strings.EqualFold(p+sym, word) {
				found = append(found, p+sym)
			}
		}
	}
	for sym := range symbols {
		if strings.EqualFold(sym, word) {
			found = append(found, sym)
		}
	}
	if len(found) == 0 {
		return ""
	}
	sort.Strings(found)
	return "write " + strings.Join(found, " or ") + " (unit symbols and prefixes are case-sensitive)"
}

func splitUnit(s string) (scale float64, d Dim, ok bool) {
	if s == "%" {
		return 0.01, None, true
	}
	if u, ok := thermalUnits[s]; ok {
		return u.scale, u.d, true
	}
	if d, ok := symbols[s]; ok {
		return unitScale(s), d, true
	}
	for p, f := range prefixes {
		if strings.HasPrefix(s, p) {
			if d, ok := symbols[s[len(p):]]; ok {
				return f * unitScale(s[len(p):]), d, true
			}
		}
	}
	return 0, None, false
}

// Parse reads a quantity from the text of a number with any suffix glued to
// it (num, e.g. "4.7k", "4k7", "100n") and a separate unit word (unit, e.g.
// "Ω", "kΩ", or "" when none was written). It returns an *Error for text it
// cannot read. A quantity with no unit at all comes back with Dim None and no
// error: whether a plain number is allowed is the caller's to decide.
func Parse(num, unit string) (Quantity, error) {
	digits, suffix := splitNumber(num)
	v, err := strconv.ParseFloat(digits, 64)
	if err != nil || math.IsInf(v, 0) || math.IsNaN(v) {
		if ne, ok := err.(*strconv.NumError); ok && ne.Err == strconv.ErrRange {
			return Quantity{}, &Error{Text: num, Msg: fmt.Sprintf("%s is too large to represent", num), Hint: "values must be finite", Range: true}
		}
		return Quantity{}, &Error{Text: num, Msg: fmt.Sprintf("%q is not a number", num)}
	}
	if v == 0 && nonZero(digits) {
		return Quantity{}, underflow(num, unit)
	}
	// IEC 60062 resistor code: the letter stands for the decimal point.
	if unit == "" && isCode(suffix) {
		return parseCode(digits, suffix)
	}
	scale := 1.0
	dim := None
	percent := false
	rest := suffix + unit
	if suffix != "" && unit != "" {
		// "4.7k Ω": the glued part must be a bare prefix.
		f, ok := prefixes[suffix]
		if !ok {
			return Quantity{}, badSuffix(num + " " + unit)
		}
		s, d, ok := splitUnit(unit)
		if !ok || s != unitScale(unit) || unit == "%" {
			return Quantity{}, badSuffix(num + " " + unit)
		}
		if _, thermal := thermalUnits[unit]; thermal {
			return Quantity{}, &Error{Text: num + " " + unit, Msg: fmt.Sprintf("%s %s: %s takes no prefix", num, unit, unit), Hint: "write the number in full, e.g. " + digits + " " + unit}
		}
		scale, dim = f*s, d
	} else if rest != "" {
		s, d, ok := splitUnit(rest)
		if !ok {
			if f, isPrefix := prefixes[rest]; isPrefix {
				_ = f
				return Quantity{}, &Error{Text: num + unit, Msg: fmt.Sprintf("%s%s has a prefix but no unit", num, unit), Hint: "write the unit after the prefix, e.g. " + digits + " " + rest + "Ω or " + digits + " " + rest + "F",
					Number: digits, Prefix: rest}
			}
			return Quantity{}, badSuffix(strings.TrimSpace(num + " " + unit))
		}
		scale, dim, percent = s, d, rest == "%"
	}
	w := v * scale
	if math.IsInf(w, 0) {
		return Quantity{}, &Error{Text: num, Msg: fmt.Sprintf("%s%s is too large to represent", num, unit), Hint: "values must be finite", Range: true}
	}
	if w == 0 && v != 0 {
		return Quantity{}, underflow(num, unit)
	}
	return Quantity{Value: w, Dim: dim, Percent: percent}, nil
}

// nonZero reports whether the mantissa of a decimal number has a digit
// other than 0: then the number is not zero, whatever it reads as.
func nonZero(digits string) bool {
	for i := 0; i < len(digits); i++ {
		switch c := digits[i]; {
		case c == 'e' || c == 'E':
			return false
		case c >= '1' && c <= '9':
			return true
		}
	}
	return false
}

// underflow is the error for a value too small for a float64: it would be
// read as zero, which is not what was written.
func underflow(num, unit string) *Error {
	text := strings.TrimSpace(num + " " + unit)
	return &Error{Text: text, Msg: fmt.Sprintf("%s underflows: it is too small to represent and would read as 0", text),
		Hint: "check the exponent", Range: true}
}

func badSuffix(text string) *Error {
	lower := strings.ToLower(text)
	if strings.Contains(lower, "meg") {
		return &Error{Text: text, Msg: fmt.Sprintf("%q: \"meg\" is not a prefix", text), Hint: "write M for mega (1 MΩ) and m for milli (1 mA)"}
	}
	if i := strings.IndexFunc(text, func(r rune) bool { return !(r >= '0' && r <= '9' || r == '.' || r == ' ' || r == '-' || r == '+') }); i >= 0 {
		if fix := CaseFix(text[i:]); fix != "" {
			return &Error{Text: text, Msg: fmt.Sprintf("%q is not a unit", text), Hint: fix}
		}
	}
	return &Error{Text: text, Msg: fmt.Sprintf("%q is not a unit", text), Hint: "units are Ω (or ohm), F, H, V, A, W, Ah and %, with an optional prefix p n u µ m k M G T, and °C (or degC), K/W and ppm/K"}
}

// splitNumber separates the numeric part of s from any letters glued to it.
func splitNumber(s string) (digits, suffix string) {
	i := 0
	if i < len(s) && (s[i] == '+' || s[i] == '-') {
		i++
	}
	for i < len(s) && (s[i] >= '0' && s[i] <= '9' || s[i] == '.') {
		i++
	}
	// exponent: e or E followed by an optional sign and at least one digit
	if i < len(s) && (s[i] == 'e' || s[i] == 'E') {
		j := i + 1
		if j < len(s) && (s[j] == '+' || s[j] == '-') {
			j++
		}
		if j < len(s) && s[j] >= '0' && s[j] <= '9' {
			for j < len(s) && s[j] >= '0' && s[j] <= '9' {
				j++
			}
			i = j
		}
	}
	return s[:i], s[i:]
}

// isCode reports whether suffix continues an IEC 60062 code: one of R k K M G
// followed by digits only.
func isCode(suffix string) bool {
	if len(suffix) < 2 {
		return false
	}
	switch suffix[0] {
	case 'R', 'k', 'K', 'M', 'G':
	default:
		return false
	}
	for _, c := range suffix[1:] {
		if c < '0' || c > '9' {
			return false
		}
	}
	return true
}

func parseCode(digits, suffix string) (Quantity, error) {
	if strings.ContainsAny(digits, ".eE") {
		return Quantity{}, &Error{Text: digits + suffix, Msg: fmt.Sprintf("%s%s mixes a decimal point with a resistor code", digits, suffix), Hint: "write 4k7 or 4.7 kΩ"}
	}
	mult := map[byte]float64{'R': 1, 'k': 1e3, 'K': 1e3, 'M': 1e6, 'G': 1e9}[suffix[0]]
	v, err := strconv.ParseFloat(digits+"."+suffix[1:], 64)
	if err != nil {
		return Quantity{}, &Error{Text: digits + suffix, Msg: fmt.Sprintf("%q is not a resistor code", digits+suffix)}
	}
	return Quantity{Value: v * mult, Dim: Resistance}, nil
}

// ParseCode reads a code that starts with R ("R47" = 0.47 Ω).
func ParseCode(s string) (Quantity, bool) {
	if len(s) < 2 || s[0] != 'R' || !isCode(s) {
		return Quantity{}, false
	}
	v, err := strconv.ParseFloat("0."+s[1:], 64)
	if err != nil {
		return Quantity{}, false
	}
	return Quantity{Value: v, Dim: Resistance}, true
}

// Format prints v in unit d with an engineering prefix and three significant
// figures: 0.3125 W → "313 mW".
func Format(v float64, d Dim) string {
	if d == Temperature {
		return FormatCelsius(v)
	}
	sym := d.Symbol()
	if d == None {
		sym = ""
	}
	if v == 0 || math.IsNaN(v) || math.IsInf(v, 0) {
		return strings.TrimSpace(fmt.Sprintf("%g %s", v, sym))
	}
	exp := int(math.Floor(math.Log10(math.Abs(v))/3)) * 3
	if exp < -12 {
		exp = -12
	}
	if exp > 12 {
		exp = 12
	}
	m := v / math.Pow(10, float64(exp))
	// rounding to 3 figures can carry into the next prefix (999.7 → 1000)
	if r := roundSig(m, 3); math.Abs(r) >= 1000 && exp < 12 {
		exp += 3
		m = v / math.Pow(10, float64(exp))
	}
	p := map[int]string{-12: "p", -9: "n", -6: "µ", -3: "m", 0: "", 3: "k", 6: "M", 9: "G", 12: "T"}[exp]
	return strings.TrimSpace(trimNum(m) + " " + p + sym)
}

func roundSig(m float64, n int) float64 {
	s := strconv.FormatFloat(m, 'g', n, 64)
	r, _ := strconv.ParseFloat(s, 64)
	return r
}

// trimNum prints three significant figures without an exponent, rounding
// halves away from zero (312.5 → 313).
func trimNum(m float64) string {
	a := math.Abs(roundSig(m, 3))
	d := 2
	switch {
	case a >= 100:
		d = 0
	case a >= 10:
		d = 1
	}
	p := math.Pow(10, float64(d))
	return strconv.FormatFloat(math.Round(m*p)/p, 'f', d, 64)
}

// FormatPercent prints a fraction as a percentage: 1.25 → "125 %".
func FormatPercent(f float64) string {
	p := f * 100
	switch a := math.Abs(p); {
	case a >= 10 || a == 0:
		return strconv.FormatFloat(p, 'f', 0, 64) + " %"
	default:
		return strconv.FormatFloat(p, 'f', 1, 64) + " %"
	}
}
