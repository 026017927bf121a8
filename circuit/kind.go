package circuit

// kind.go: the table of built-in kinds. Each kind is declared once, here:
// how it is written (keyword, pins, value, attributes), what "rated" takes
// on it and how each rating is judged, and how it behaves at DC, which is
// all the topology rules and the solver read. The builder, topology, solve,
// the rating function in package rules, "nodal report" and the language
// reference's tests read this table rather than naming kinds.

import (
	"slices"
	"strings"

	"nodal/units"
)

// Kind is a built-in part kind. Most have two pins; a kind may have up to
// MaxPins, its DC behaviour acting across two of them (Ends).
type Kind uint8

const (
	Resistor Kind = iota
	Capacitor
	Inductor
	VoltageSource
	CurrentSource
	Diode
	LED
	Fuse
	Switch
	Wire
	Battery
	CurrentLoad
	PowerLoad
	VoltageDrive
	CurrentDrive
	Regulator
	Converter
	numKinds
)

// KindInfo describes one kind.
type KindInfo struct {
	Word string // the keyword
	// Name is how messages and the report name the kind: the keyword,
	// unless two kinds share it ("voltage source", "current source").
	Name string
	// Pins names the pins in positional order, and Roles says what each
	// is for, in the words of the language reference.
	Pins  []string
	Roles []string
	// Ends are the two pins DC acts across, first pin first, for a kind
	// with more than two pins; a two-pin kind's are its pins 0 and 1. The
	// topology rules and the rating function read a part's voltage and
	// current across these two pins.
	Ends [2]uint8
	// Value is the unit of the part's value; None when the kind takes no
	// quantity. Kinds that share a keyword are told apart by it.
	Value units.Dim
	// States lists the words the kind takes instead of a quantity
	// ("open", "closed"); nil for most.
	States []string
	// ValueHint says what the value is, for a statement without one; ""
	// takes the unit of Value.
	ValueHint string
	// NoValue completes "KIND NAME takes …" for a value given to a kind
	// that takes none.
	NoValue string
	// Needs lists the attributes the kind cannot do without, each with
	// the message that asks for it.
	Needs []Need
	// Attrs lists the attributes the kind takes besides "rated".
	Attrs []string
	// ValueNotAtDC says the value plays no part at DC (a capacitor's
	// capacitance, an inductor's inductance), so the worst case does not
	// vary it by its "tol"; see Kind.Toleranced.
	ValueNotAtDC bool
	// Ratings lists what "rated" takes on the kind and how each rating is
	// judged, in the order they are judged; a rating read from the value
	// (a fuse's current) is listed too, with FromValue.
	Ratings []Rating
	// Converts says how a kind with an input rail (Supply.In) turns what
	// it draws there into what it delivers at its output; see Conversion.
	Converts Conversion
	// Ideality is the default ideality factor of a Junction kind (common
	// practice).
	Ideality float64
	// DC says how a part of the kind behaves at DC.
	DC func(p *Part) DC
	// OnPort says the kind is written on a port statement, as the drive
	// of the port's net (port vin 5 V series 50 Ω), never as a part
	// statement: its Word is no part kind's keyword.
	OnPort bool
	// Supply says which pins of a supply-like kind carry its rails; nil
	// for a kind that drives no rail. The power tree of "nodal report"
	// is drawn from it.
	Supply *Supply
}

// Supply says which pins of a supply-like part carry its rails. A rail is
// a net whose voltage the part holds against a reference net: its output.
// A part that takes its power from another rail of the design (a
// regulator) names that rail's pins as its input; one whose energy comes
// from inside itself or from outside the design (a voltage source, a
// battery, a port's voltage drive) has none. Pins are indices into the
// kind's Pins.
type Supply struct {
	// Out is the pin that drives the output rail, OutRef the pin it is
	// held against (ground, usually).
	Out, OutRef int
	// In is the pin that draws from the input rail and InRef its
	// reference; both are NoPin for a part with no input rail.
	In, InRef int
}

// NoPin marks a Supply with no input rail.
const NoPin = -1

// HasInput reports whether the part draws from another rail of the design.
func (s *Supply) HasInput() bool { return s.In != NoPin }

// ownSupply is the Supply of a two-pin part that drives its first pin
// against its second and draws from no rail: a voltage source, a battery,
// a port's voltage drive. A current source or current drive is not one: it
// holds a current, not a rail's voltage.
var ownSupply = &Supply{Out: 0, OutRef: 1, In: NoPin, InRef: NoPin}

// Need is an attribute a kind cannot do without, and how to ask for it.
type Need struct{ Attr, Hint string }

// Measure says which magnitude of an operating-point value a rating limits.
type Measure uint8

const (
	Magnitude Measure = iota // |x|
	Forward                  // max(x, 0): a junction's forward current
	Reverse                  // max(−x, 0): a junction's reverse voltage
)

// Rating is one rated quantity of a kind.
type Rating struct {
	// Dim is the unit "rated" takes for it (W, V or A), and says which of
	// the part's power, voltage or current it limits.
	Dim     units.Dim
	What    string // "power", "current", "voltage", "reverse voltage"
	Measure Measure
	// FromValue says the part's value is this rating (a fuse's current);
	// "rated" does not take it.
	FromValue bool
	// Rule is the rule that reports a use past the rating; "" takes
	// the usual one for the unit (see RuleName).
	Rule string
	// Says is how a finding states the use, a format for the value
	// ("carries %s"), and Of what the rating is called ("compliance
	// voltage"); empty for the wording of What.
	Says, Of string
	// Derating is the nodal.toml [derating] key of the limit near-rating
	// applies, "" for none, and Default that limit's default, a fraction
	// of the rating (common practice, not a standard).
	Derating string
	Default  float64
}

// RuleName returns the rule that reports a use of r past the rating:
// over-power, over-current, reverse-voltage for a Reverse voltage, and
// over-voltage, unless the table names another.
func (r *Rating) RuleName() string {
	switch {
	case r.Rule != "":
		return r.Rule
	case r.Dim == units.Power:
		return "over-power"
	case r.Dim == units.Current:
		return "over-current"
	case r.Measure == Reverse:
		return "reverse-voltage"
	}
	return "over-voltage"
}

// Model is how a part stamps into the DC equations.
type Model uint8

const (
	Open          Model = iota // carries no current at DC
	Short                      // an ideal short: its pins are one node
	Conductance                // a linear resistance DC.R, in series with an EMF DC.E
	VoltageDrop                // a fixed voltage, the part's value, from first pin to second
	CurrentFlow                // a fixed current, the part's value, from first pin to second
	Junction                   // a Shockley junction (vf at, ideality) behind DC.R
	ConstantPower              // draws the power of its value, P = V·I, from first pin to second
)

// Conversion is how a supply-like kind with an input rail turns its input
// into its output; package solve models each (solve/standin.go).
type Conversion uint8

const (
	NoConversion Conversion = iota
	// Linear passes its output current through from its input, adding
	// its quiescent current, which leaves by its common pin: the output
	// is held at the value while the input is at least the dropout above
	// it, else it tracks the input less the dropout; past its limit the
	// output falls to hold the limit current (a linear regulator).
	Linear
	// Switched draws its output power divided by its efficiency, plus
	// its input voltage times its quiescent current, from its input rail:
	// a constant-power load upstream (a switching converter).
	Switched
)

// DC is how one part behaves at DC.
type DC struct {
	Model Model
	// R is the resistance of a Conductance, or the series resistance of
	// a Junction (0 for none).
	R float64
	// E is the EMF in series with a Conductance, first pin positive: the
	// part carries (V − E)/R from its first pin to its second. 0 for a
	// plain resistance.
	E float64
}

// Branch says how a part's branch counts for the topology rules.
type Branch uint8

const (
	Resistive       Branch = iota // conducts, its voltage set by the rest of the circuit
	VoltageDefining               // fixes the voltage across its pins: a voltage source or an ideal short
	CurrentDefining               // fixes the current through it: a current source
	OpenAtDC                      // carries no current at DC
)

// Branch returns how a part with this behaviour counts for the topology
// rules.
func (dc DC) Branch() Branch {
	switch dc.Model {
	case Short, VoltageDrop:
		return VoltageDefining
	case CurrentFlow:
		return CurrentDefining
	case Open, ConstantPower:
		// A constant-power load sets no voltage and no current of its
		// own: like an open, it gives its nets no DC path.
		return OpenAtDC
	}
	return Resistive
}

// quantityAttr is an attribute that takes one quantity into a field of
// Part.
type quantityAttr struct {
	Dim  units.Dim
	Zero bool // 0 is allowed
	// Field is where the value goes.
	Field func(p *Part) *float64
}

// quantityAttrs declares the attributes that take one quantity; the kinds
// that take each list it in Attrs.
var quantityAttrs = map[string]quantityAttr{
	"dcr":       {Dim: units.Resistance, Zero: true, Field: func(p *Part) *float64 { return &p.DCR }},
	"series":    {Dim: units.Resistance, Zero: true, Field: func(p *Part) *float64 { return &p.Series }},
	"capacity":  {Dim: units.Charge, Field: func(p *Part) *float64 { return &p.Capacity }},
	"dropout":   {Dim: units.Voltage, Zero: true, Field: func(p *Part) *float64 { return &p.conv().Dropout }},
	"quiescent": {Dim: units.Current, Zero: true, Field: func(p *Part) *float64 { return &p.conv().Quiescent }},
	"limit":     {Dim: units.Current, Field: func(p *Part) *float64 { return &p.conv().Limit }},
}

// The common rating declarations.
var (
	ratedPower   = Rating{Dim: units.Power, What: "power"}
	ratedVoltage = Rating{Dim: units.Voltage, What: "voltage"}
	ratedCurrent = Rating{Dim: units.Current, What: "current"}
)

// derated returns r with a near-rating limit.
func derated(r Rating, key string, def float64) Rating {
	r.Derating, r.Default = key, def
	return r
}

var (
	loadPins      = []string{"pos", "neg"}
	loadRoles     = []string{"the load draws its current in here", "and returns it here"}
	loadHint      = ": a current in A (constant current) or a power in W (constant power)"
	junctionPins  = []string{"anode", "cathode"}
	junctionRoles = []string{"current enters here when forward-biased", "current leaves here"}
	plainPins     = []string{"a", "b"}
	plainRoles    = []string{"first end", "second end"}
	// A junction's rated current is its forward current, its rated
	// voltage its reverse voltage.
	junctionRatings = func(key string) []Rating {
		return []Rating{
			derated(Rating{Dim: units.Current, What: "current", Measure: Forward}, key, 0.80),
			{Dim: units.Voltage, What: "reverse voltage", Measure: Reverse, Says: "is reverse-biased by %s", Of: "reverse rating"},
			ratedPower,
		}
	}
	junctionDC      = func(p *Part) DC { return DC{Model: Junction, R: p.Series} }
	junctionNoValue = "no plain value; give its forward voltage as \"vf 0.7 V at 10 mA\""
	junctionNeeds   = "needs its forward voltage: vf 0.7 V at 10 mA"
	// An LED's forward voltage is higher than a silicon diode's: about
	// 2 V for a red one (from memory; its datasheet gives its own).
	ledNoValue = "no plain value; give its forward voltage from its datasheet, e.g. \"vf 2.0 V at 10 mA\""
	ledNeeds   = "needs its forward voltage from its datasheet, e.g. vf 2.0 V at 10 mA"
	// emfBehindSeries is a voltage (the value) behind its series
	// resistance, first pin positive, or an ideal voltage without one:
	// a battery, and the drive a port states.
	emfBehindSeries = func(p *Part) DC {
		if p.Series > 0 {
			return DC{Model: Conductance, R: p.Series, E: p.Value}
		}
		return DC{Model: VoltageDrop}
	}
	drivePins = []string{"port", "ground"}
	driveHint = ": a voltage in V (with series for its source resistance) or a current in A"
	// shortUnlessDCR is an inductor's or fuse's behaviour: its dcr, or
	// an ideal short without one.
	shortUnlessDCR = func(p *Part) DC {
		if p.DCR > 0 {
			return DC{Model: Conductance, R: p.DCR}
		}
		return DC{Model: Short}
	}
)

var (
	supplyPins  = []string{"in", "out", "common"}
	supplyRoles = []string{"draws from its input rail here", "the value's volts above common", "the reference of both; the quiescent current leaves here"}
	// throughSupply: out held against common, drawing from in against
	// common.
	throughSupply = &Supply{Out: 1, OutRef: 2, In: 0, InRef: 2}
	// A supply's output current is what flows out of its out pin,
	// against the pin-to-pin convention.
	outputCurrent = Rating{Dim: units.Current, What: "output current", Measure: Reverse, Says: "delivers %s", Of: "output rating"}
	// outputHeld: at DC a regulator or converter holds its output at its
	// value above common, for the topology rules; package solve models
	// the rest of it (Converts).
	outputHeld = func(*Part) DC { return DC{Model: VoltageDrop} }
)

var kinds = [numKinds]KindInfo{
	Resistor: {Word: "resistor", Pins: plainPins, Roles: plainRoles, Value: units.Resistance,
		Attrs:   []string{"tol", "tempco", "derate"},
		Ratings: []Rating{derated(ratedPower, "resistor-power", 0.60), ratedVoltage},
		DC:      func(p *Part) DC { return DC{Model: Conductance, R: p.Value} }},
	Capacitor: {Word: "capacitor", Pins: plainPins, Roles: plainRoles, Value: units.Capacitance,
		Attrs: []string{"tol"}, ValueNotAtDC: true,
		Ratings: []Rating{derated(ratedVoltage, "capacitor-voltage", 0.80)},
		DC:      func(*Part) DC { return DC{Model: Open} }},
	Inductor: {Word: "inductor", Pins: plainPins, Roles: plainRoles, Value: units.Inductance,
		Attrs: []string{"tol", "dcr"}, ValueNotAtDC: true,
		Ratings: []Rating{derated(ratedCurrent, "inductor-current", 0.80)},
		DC:      shortUnlessDCR},
	VoltageSource: {Word: "source", Name: "voltage source", Pins: []string{"pos", "neg"},
		Roles: []string{"the value's volts above neg", "the reference end"}, Value: units.Voltage,
		ValueHint: ": a voltage in V (a voltage source) or a current in A (a current source)",
		Attrs:     []string{"tol"},
		Ratings:   []Rating{derated(Rating{Dim: units.Current, What: "current", Says: "is asked for %s"}, "supply-current", 0.90)},
		DC:        func(*Part) DC { return DC{Model: VoltageDrop} }, Supply: ownSupply},
	CurrentSource: {Word: "source", Name: "current source", Pins: []string{"from", "to"},
		Roles: []string{"the current enters the source here", "and leaves here"}, Value: units.Current,
		Attrs:   []string{"tol"},
		Ratings: []Rating{{Dim: units.Voltage, What: "voltage", Says: "must develop %s", Of: "compliance voltage"}},
		DC:      func(*Part) DC { return DC{Model: CurrentFlow} }},
	Diode: {Word: "diode", Pins: junctionPins, Roles: junctionRoles, NoValue: junctionNoValue,
		Attrs: []string{"vf", "ideality", "series", "theta", "tjmax", "breakdown"}, Needs: []Need{{"vf", junctionNeeds}},
		Ratings: junctionRatings("diode-current"), DC: junctionDC, Ideality: 1},
	LED: {Word: "led", Pins: junctionPins, Roles: junctionRoles, NoValue: ledNoValue,
		Attrs: []string{"vf", "ideality", "series", "theta", "tjmax"}, Needs: []Need{{"vf", ledNeeds}},
		Ratings: junctionRatings("led-current"), DC: junctionDC, Ideality: 2},
	Fuse: {Word: "fuse", Pins: plainPins, Roles: plainRoles, Value: units.Current, ValueHint: ": its rated current in A",
		Attrs: []string{"dcr"},
		Ratings: []Rating{
			derated(Rating{Dim: units.Current, What: "current", FromValue: true}, "fuse-current", 0.75),
			ratedVoltage,
		},
		DC: shortUnlessDCR},
	Switch: {Word: "switch", Pins: plainPins, Roles: plainRoles, States: []string{"open", "closed"},
		Ratings: []Rating{ratedCurrent, ratedVoltage},
		DC: func(p *Part) DC {
			if p.Closed {
				return DC{Model: Short}
			}
			return DC{Model: Open}
		}},
	Wire: {Word: "wire", Pins: plainPins, Roles: plainRoles,
		NoValue: "no value; a wire is a zero-ohm link (use a resistor for a resistance)",
		Ratings: []Rating{ratedCurrent},
		DC:      func(*Part) DC { return DC{Model: Short} }},
	Battery: {Word: "battery", Pins: []string{"pos", "neg"},
		Roles: []string{"the positive terminal", "the negative terminal"}, Value: units.Voltage,
		ValueHint: ": its open-circuit voltage in V",
		Attrs:     []string{"tol", "series", "capacity"},
		// Its rated current is the discharge current: what flows out of
		// pos, against the first-pin-to-second convention.
		Ratings: []Rating{derated(Rating{Dim: units.Current, What: "discharge current", Measure: Reverse,
			Says: "delivers %s", Of: "discharge rating"}, "supply-current", 0.90)},
		// Its internal resistance is written as series; without one it is
		// an ideal voltage.
		DC: emfBehindSeries, Supply: ownSupply},
	CurrentLoad: {Word: "load", Name: "constant-current load", Pins: loadPins, Roles: loadRoles, Value: units.Current,
		ValueHint: loadHint, Attrs: []string{"tol"}, Ratings: []Rating{ratedVoltage},
		DC: func(*Part) DC { return DC{Model: CurrentFlow} }},
	PowerLoad: {Word: "load", Name: "constant-power load", Pins: loadPins, Roles: loadRoles, Value: units.Power,
		ValueHint: loadHint, Attrs: []string{"tol"}, Ratings: []Rating{ratedVoltage},
		DC: func(*Part) DC { return DC{Model: ConstantPower} }},
	// What the outside world connects at a port, written on the port
	// statement (port vin 5 V series 50 Ω, port sense 2 mA) and placed
	// between the port's net and ground. It takes no rating: the port
	// stands for a supply the design does not contain.
	VoltageDrive: {Word: "port", Name: "voltage drive", Pins: drivePins,
		Roles: []string{"the value's volts above ground, behind series", "the design's ground"}, Value: units.Voltage,
		ValueHint: driveHint, Attrs: []string{"series"}, DC: emfBehindSeries, OnPort: true, Supply: ownSupply},
	// A linear regulator: its output held at its value above common, its
	// input a load on its rail (common practice, from the energy
	// balance). Its output current is the current out of its out pin,
	// and its power what it dissipates, (Vin − Vout)·Iout + Vin·Iq.
	Regulator: {Word: "regulator", Pins: supplyPins, Roles: supplyRoles, Ends: [2]uint8{1, 2},
		Value: units.Voltage, ValueHint: ": its set output voltage in V",
		Attrs: []string{"tol", "dropout", "quiescent", "limit"},
		Needs: []Need{{"dropout", "needs its dropout voltage from its datasheet, e.g. dropout 300 mV"}},
		Ratings: []Rating{
			derated(outputCurrent, "regulator-current", 0.80),
			derated(Rating{Dim: units.Power, What: "power", Says: "dissipates %s"}, "regulator-power", 0.60),
		},
		DC: outputHeld, Supply: throughSupply, Converts: Linear},
	// A switching converter: its output held at its value above common,
	// its input a constant-power load, P = Vout·Iout/efficiency + Vin·Iq
	// (the energy balance).
	Converter: {Word: "converter", Pins: supplyPins, Roles: supplyRoles, Ends: [2]uint8{1, 2},
		Value: units.Voltage, ValueHint: ": its set output voltage in V",
		Attrs: []string{"tol", "efficiency", "input", "quiescent"},
		// Without its input range whether it regulates could not be
		// judged: the range is asked for, not assumed.
		Needs: []Need{
			{"efficiency", "needs its efficiency at the load from its datasheet, e.g. efficiency 90%"},
			{"input", "needs its input range from its datasheet, e.g. input 6 V to 28 V"},
		},
		Ratings: []Rating{
			derated(outputCurrent, "converter-current", 0.80),
			{Dim: units.Power, What: "power", Says: "dissipates %s"},
		},
		DC: outputHeld, Supply: throughSupply, Converts: Switched},
	// A current drive's pins are the other way round: its current flows
	// out of ground through the drive and into the port's net.
	CurrentDrive: {Word: "port", Name: "current drive", Pins: []string{"ground", "port"},
		Roles: []string{"the design's ground", "the current flows into the design here"}, Value: units.Current,
		ValueHint: driveHint, DC: func(*Part) DC { return DC{Model: CurrentFlow} }, OnPort: true},
}

func init() {
	for k := range kinds {
		ki := &kinds[k]
		switch {
		case len(ki.Pins) == 2:
			ki.Ends = [2]uint8{0, 1}
		case len(ki.Pins) > MaxPins || len(ki.Pins) < 2 || len(ki.Roles) != len(ki.Pins) ||
			ki.Ends[0] == ki.Ends[1] || int(ki.Ends[0]) >= len(ki.Pins) || int(ki.Ends[1]) >= len(ki.Pins):
			panic("circuit: kind " + ki.Word + " declares its pins wrongly")
		}
	}
}

// Kinds lists every built-in kind, in a fixed order.
func Kinds() []Kind {
	out := make([]Kind, numKinds)
	for k := range out {
		out[k] = Kind(k)
	}
	return out
}

// Info returns k's declaration.
func (k Kind) Info() *KindInfo { return &kinds[k] }

// Toleranced reports whether the worst case varies a part of kind k by
// its tolerance: the kind takes "tol" and its value acts at DC (a
// resistance, a source's value, a regulator's set output voltage).
func (k Kind) Toleranced() bool { return toleranced[k] }

// toleranced holds Kind.Toleranced for every kind, from the table.
var toleranced = func() (t [numKinds]bool) {
	for k := range kinds {
		t[k] = !kinds[k].ValueNotAtDC && slices.Contains(kinds[k].Attrs, "tol")
	}
	return t
}()

// String returns how messages name the kind: its keyword, or for kinds
// that share one, their Name ("voltage source").
func (k Kind) String() string {
	if k < numKinds {
		if n := kinds[k].Name; n != "" {
			return n
		}
		return kinds[k].Word
	}
	return "unknown kind"
}

// RatedDims lists the units "rated" takes on the kind.
func (ki *KindInfo) RatedDims() []units.Dim {
	var out []units.Dim
	for _, r := range ki.Ratings {
		if !r.FromValue {
			out = append(out, r.Dim)
		}
	}
	return out
}

// KindWords lists the keywords of part statements, each once, for "did
// you mean" and help; a port's drive is written on the port statement.
var KindWords = kindWords()

func kindWords() []string {
	var out []string
	seen := map[string]bool{}
	for k := range kinds {
		if w := kinds[k].Word; !seen[w] && !kinds[k].OnPort {
			seen[w] = true
			out = append(out, w)
		}
	}
	return out
}

// kindOf returns the first part kind written word.
func kindOf(word string) (Kind, bool) {
	for k := Kind(0); k < numKinds; k++ {
		if kinds[k].Word == word && !kinds[k].OnPort {
			return k, true
		}
	}
	return 0, false
}

// sibling returns the kind written like k whose value is in dim: a source
// in A is a current source. ok is false when no kind sharing k's keyword
// takes dim.
func sibling(k Kind, dim units.Dim) (Kind, bool) {
	for j := Kind(0); j < numKinds; j++ {
		if kinds[j].Word == kinds[k].Word && kinds[j].Value == dim {
			return j, true
		}
	}
	return k, false
}

// shared reports whether another kind is written with k's keyword.
func (k Kind) shared() bool { return sharedWord[k] }

// sharedWord holds shared for each kind, found once: it is asked once a
// part.
var sharedWord = func() (t [numKinds]bool) {
	for k := range numKinds {
		for j := range numKinds {
			t[k] = t[k] || j != k && kinds[j].Word == kinds[k].Word
		}
	}
	return t
}()

// siblings joins f(unit symbol, name) for every kind written with k's
// keyword with " or ".
func (k Kind) siblings(f func(sym, name string) string) string {
	var out []string
	for j := Kind(0); j < numKinds; j++ {
		if kinds[j].Word == kinds[k].Word {
			out = append(out, f(kinds[j].Value.Symbol(), j.String()))
		}
	}
	return strings.Join(out, " or ")
}

// Nets returns the nets of p's pins, in the order its kind lists them.
func (p *Part) Nets() []NetID { return p.Pins[:len(kinds[p.Kind].Pins)] }

// Ends returns the nets of the two pins p's DC behaviour acts across:
// pins 0 and 1 of a two-pin part.
func (p *Part) Ends() (a, b NetID) {
	e := &kinds[p.Kind].Ends
	return p.Pins[e[0]], p.Pins[e[1]]
}

// ShortedAcross reports whether both of p's ends are on one net.
func (p *Part) ShortedAcross() bool {
	a, b := p.Ends()
	return a == b
}

// Multi reports whether p has more than two pins.
func (p *Part) Multi() bool { return len(kinds[p.Kind].Pins) > 2 }

// DC returns how p behaves at DC.
func (p *Part) DC() DC { return kinds[p.Kind].DC(p) }

// Rated returns p's rating of r: its value for a rating read from the
// value, else what "rated" gave in r's unit; 0 when none was given.
func (p *Part) Rated(r *Rating) float64 {
	switch {
	case r.FromValue:
		return p.Value
	case r.Dim == units.Power:
		return p.RatedPower
	case r.Dim == units.Voltage:
		return p.RatedVoltage
	case r.Dim == units.Current:
		return p.RatedCurrent
	}
	return 0
}

// DC behaviour of a part, which is all the topology rules need.

// IsShort reports whether p is an ideal short at DC: a wire, a closed
// switch, an inductor or fuse with no dcr. A voltage source is not a short
// but also fixes the voltage across it; see IsVoltageDefining.
func (p *Part) IsShort() bool { return p.DC().Model == Short }

// IsVoltageDefining reports whether p forces the voltage across its pins at
// DC: a voltage source or an ideal short.
func (p *Part) IsVoltageDefining() bool { return p.DC().Branch() == VoltageDefining }

// ConductsDC reports whether current can flow through p at DC with the
// voltage across it set by the rest of the circuit or by itself: everything
// but capacitors, open switches and current sources.
func (p *Part) ConductsDC() bool {
	b := p.DC().Branch()
	return b == Resistive || b == VoltageDefining
}
