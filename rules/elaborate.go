package rules

// elaborate.go: the rules whose findings are made while the syntax tree is
// turned into the circuit model. The builder records them with a typed
// code (circuit.Code); each analyzer here claims its code, and the runner
// hands the findings on, so that every rule, whatever stage finds it, is
// one Analyzer that configuration and `nodal rules` know.

import (
	"nodal/circuit"
	"nodal/diag"
)

// fromBuild makes the analyzer of a code of elaboration: its name is the
// code's rule id.
func fromBuild(code circuit.Code, sev diag.Severity, doc string) *Analyzer {
	return &Analyzer{Name: code.String(), Doc: doc, Severity: sev, Codes: []circuit.Code{code}}
}

var (
	Syntax = fromBuild(circuit.CodeSyntax, diag.Error, `a line that does not parse
The parser reads one statement per line and reports what it expected where
the line went wrong. The other lines of the file are still checked.`)

	UnknownKind = fromBuild(circuit.CodeUnknownKind, diag.Error, `a part kind the language does not know
Kinds are resistor, capacitor, inductor, source, diode, led, fuse, switch and
wire. A near miss gets a "did you mean".`)

	PinCount = fromBuild(circuit.CodePinCount, diag.Error, `wrong number or names of pins
Every built-in part has two pins, given in order or by name (anode=…,
cathode=…).`)

	MissingValue = fromBuild(circuit.CodeMissingValue, diag.Error, `a part or attribute without its value
Resistors, capacitors, inductors, sources and fuses need a value; diodes and
LEDs need "vf V at A"; switches need open or closed.`)

	UnitMismatch = fromBuild(circuit.CodeUnitMismatch, diag.Error, `a value in the wrong unit, or with none
A capacitor in Ω, a tolerance without %, a plain number where a unit is
needed: the unit decides what a value means, so it must be written and
must fit.`)

	BadValue = fromBuild(circuit.CodeBadValue, diag.Error, `a value that cannot be right
Zero or negative resistance (use a wire for a zero-ohm link), non-positive
capacitance or inductance, a tolerance over 100 %, a number too large to
represent.`)

	BadAttribute = fromBuild(circuit.CodeBadAttribute, diag.Error, `an attribute the kind does not take
Each kind takes only some attributes: tol, rated, vf … at, ideality, series,
dcr. The message names the kinds that do take it.`)

	DuplicateName = fromBuild(circuit.CodeDuplicateName, diag.Error, `two parts with one name
Part names identify parts in every message and report, so each must be used
once.`)

	ExtraGround = fromBuild(circuit.CodeExtraGround, diag.Error, `more than one ground statement
A design has exactly one 0 V reference net.`)

	NoGround = fromBuild(circuit.CodeNoGround, diag.Error, `a design with parts but no ground
Without a 0 V reference no net voltage is defined. Add "ground NAME".`)
)

// Hierarchy: blocks, instances, parameters and includes.
var (
	UnknownBlock = fromBuild(circuit.CodeUnknownBlock, diag.Error, `an instance of a block that is not defined
The first word of a statement is a built-in kind or the name of a block
defined in the file or in a file it includes. A near miss gets a "did you
mean".`)

	BlockPin = fromBuild(circuit.CodeBlockPin, diag.Error, `an instance that binds the wrong pins of its block
An instance gives one net for each pin in the block's header, in order or
by name (top=vin, tap=vref), never mixing the two. A block's header lists
each pin once.`)

	UnusedBlock = fromBuild(circuit.CodeUnusedBlock, diag.Note, `a block that no instance uses
Reported in files that define blocks and also have parts of their own; a
file of blocks alone is a library and its blocks are meant for others.`)

	RecursiveBlock = fromBuild(circuit.CodeRecursiveBlock, diag.Error, `a block that instantiates itself
A block that contains an instance of itself, directly or through other
blocks, would expand without end; the instance that closes the cycle is
reported and not expanded.`)

	UnknownParam = fromBuild(circuit.CodeUnknownParam, diag.Error, `a parameter the block does not have
An instance can set only the parameters in its block's header, and an
expression can name only the parameters of the block it is written in.`)

	MissingParam = fromBuild(circuit.CodeMissingParam, diag.Error, `a block parameter without a value
A parameter with no default in the block's header must be given at every
instance: [name = value].`)

	ParamUnit = fromBuild(circuit.CodeParamUnit, diag.Error, `units that do not fit in a parameter or expression
A parameter is given in the unit of its default; a sum adds like to like; an
expression's result must be in the unit of the place it is used. A
resistance divided by a current is no part's value; a voltage divided by a
current is a resistance.`)

	ExpansionLimit = fromBuild(circuit.CodeExpansionLimit, diag.Error, `a design that expands past the limits
Blocks that nest deeper than the depth limit (default 64), or a design that
would expand to more parts and instances than the size limit (default 10
million), are refused at the instance that crosses the limit, before any
memory is spent on it. Raise the limits with --max-depth and --max-parts.`)

	BadInclude = fromBuild(circuit.CodeBadInclude, diag.Error, `an include that cannot be followed
The included file must exist (its path is relative to the including file)
and must not include, directly or not, the file that includes it.`)
)
