// Package circuit is the circuit model: parts, pins and nets, with units
// resolved and every name bound, built from the syntax tree.
//
// # Model
//
// A Design keeps its parts and nets in flat slices indexed by PartID and
// NetID, so that the topology and solve stages work on integers and the
// model costs a fixed number of bytes per part. Net names are interned once,
// when the design is built.
//
// # Building
//
// Build turns a parsed file into a Design and the diagnostics of
// elaboration: unknown kinds, wrong pins, missing or ill-formed values,
// units that do not fit, duplicate names. A statement that cannot be
// elaborated is left out of the design (and said so); the rest is kept, so
// that one slip does not hide the findings elsewhere in the file. The
// steps of elaboration are listed in hier.go, one file each.
//
// # Findings
//
// Each finding of elaboration is filed under a Code (code.go), the id of
// the registered rule that reports it, and names the part or net it is
// about in its Subject. Every finding goes through the collector of
// findings.go, which merges the repeats that block instances make of one
// finding; package rules adds its own findings to the same collector and
// finishes them all alike.
//
// # Values
//
// All values are held in SI base units: Ω, F, H, V, A, W. A rating of zero
// means "no rating given".
package circuit

import "nodal/diag"

// NetID indexes Design.Nets.
type NetID int32

// PartID indexes Design.Parts.
type PartID int32

// NoNet marks a missing net.
const NoNet NetID = -1

// Net is a set of pins joined together.
type Net struct {
	// Local is the net's name as written: the whole name at the top
	// level, its name in the block inside an instance (see NetName).
	Local string
	Pos   diag.Pos // first use
	End   diag.Pos
	Port  bool
	Pins  int32 // how many pins touch the net
	// Inst is the instance the net is local to (an index into
	// Design.Instances), or -1 for a net of the top level, a block pin's
	// net or the ground.
	Inst int32
}

// MaxPins is the most pins a built-in kind has. A part's first
// len(Kind.Info().Pins) entries of Pins are its pins, in the order the
// kind lists them; the rest are unused (read them through Nets).
const MaxPins = 3

// Part is one built-in part; hierarchy is flattened before a Design is
// made.
//
// The fields are laid out so that the small ones share words: a large
// design holds millions of parts.
type Part struct {
	// Local is the part's name as written in its statement; inside an
	// instance Design.PartName (or NameOf) puts the instance path in
	// front.
	Local string
	Pins  [MaxPins]NetID
	// Inst is the instance this part was expanded from (an index into
	// Design.Instances), or -1 for a part written at the top level.
	Inst   int32
	Kind   Kind
	Closed bool // switches

	// Value is the part's main value in SI units: Ω, F, H, V or A; for a
	// fuse its rated current.
	Value float64

	Tol float64 // fraction; 0 when not given

	// Ratings; zero when not given.
	RatedPower   float64 // W
	RatedVoltage float64 // V
	RatedCurrent float64 // A

	// Diodes and LEDs.
	VF       float64 // forward voltage (V) ...
	VFAt     float64 // ... at this current (A)
	Ideality float64 // 0 = the kind's default
	Series   float64 // Ω
	// Breakdown is a diode's reverse breakdown voltage (V, positive) at
	// the reverse current BreakdownAt (A); 0 when not given.
	Breakdown, BreakdownAt float64

	DCR float64 // inductors and fuses: resistance at DC (Ω)

	// Heat holds the temperature attributes (tempco, derate, theta,
	// tjmax); nil when none is written.
	Heat *Thermal

	Capacity float64 // batteries: the charge they hold when full (C; 1 Ah = 3600 C)

	// Conv holds a regulator's or converter's attributes; nil for other
	// kinds (and for one written without them).
	Conv *Conv

	Pos diag.Pos // start of the statement
	End diag.Pos // end of the statement
}

// Conv is what a regulator or converter states besides its set output
// voltage (its Value); zero when not given.
type Conv struct {
	Dropout   float64 // V: the least input-to-output difference that holds the output (regulators)
	Quiescent float64 // A: drawn from the input and returned by the common pin
	Limit     float64 // A: the output current the output falls to hold (regulators); 0 for none
	// Efficiency is the fraction of its input power a converter delivers.
	Efficiency float64
	// InLow and InHigh are a converter's input range (V); both 0 when
	// none is given.
	InLow, InHigh float64
}

// conv returns p.Conv, making it first if need be.
func (p *Part) conv() *Conv {
	if p.Conv == nil {
		p.Conv = &Conv{}
	}
	return p.Conv
}

// Instance is one use of a block, for naming paths and related locations.
// Instances form a tree through Parent; InstancePath gives the dotted
// path.
type Instance struct {
	Local  string   // its own name, "CH2" in BOARD.CH2
	Block  string   // the block it instantiates
	Pos    diag.Pos // the instance statement
	End    diag.Pos
	Parent int32 // enclosing instance, -1 at the top
}

// Design is one checked file (with its includes flattened in). Parts and
// nets inside block instances keep their own names and their instance;
// they are named by their instance path (CH2.R, REF.tap, A.B.R) through
// PartName, NetName and Qualified (names.go).
type Design struct {
	File      string
	Name      string
	Title     string
	Nets      []Net
	Parts     []Part
	Ground    NetID // NoNet when the file names no ground
	GroundPos diag.Pos
	Instances []Instance
	// Ambient is the ambient temperature the design states; its Set is
	// false when it states none.
	Ambient Ambient
	// DriveRanges lists the ports' drives written as a range (port vin
	// 4.5 V to 5.5 V), in the order their parts were placed; each part's
	// Value is its range's midpoint.
	DriveRanges []DriveRange

	netIndex netIndex   // nets outside instances, by name (netindex.go)
	index    *nameIndex // the rest, built when first asked (names.go)
}

// NewDesign returns an empty design for the named file.
func NewDesign(file string) *Design {
	return &Design{File: file, Ground: NoNet, index: &nameIndex{}}
}

// Reserve makes room for about parts parts and nets nets, so that building
// a large design does not regrow its slices and name table.
func (d *Design) Reserve(parts, nets int) {
	if cap(d.Parts)-len(d.Parts) < parts {
		d.Parts = append(make([]Part, 0, len(d.Parts)+parts), d.Parts...)
	}
	if cap(d.Nets)-len(d.Nets) < nets {
		d.Nets = append(make([]Net, 0, len(d.Nets)+nets), d.Nets...)
	}
	d.netIndex.reserve(d.netIndex.n + nets)
}

// Net returns the id of the named net, adding it if new; pos is recorded as
// its first use.
func (d *Design) Net(name string, pos, end diag.Pos) NetID {
	return d.hashedNet(name, netHash(name), pos, end)
}

// hashedNet is Net for a name whose netHash h is known.
func (d *Design) hashedNet(name string, h uint64, pos, end diag.Pos) NetID {
	x := &d.netIndex
	if 2*(x.n+1) > len(x.slots) {
		x.reserve(2 * (x.n + 1))
	}
	slot, id := x.find(name, h, d.Nets)
	if id != NoNet {
		return id
	}
	id = NetID(len(d.Nets))
	d.Nets = append(d.Nets, Net{Local: name, Pos: pos, End: end, Inst: -1})
	x.add(slot, h, id)
	return id
}

// localNet adds a net local to instance inst, named name in its block. Its
// full name is the instance path and that name, so it cannot meet a
// top-level net unless a quoted top-level name spells the same path; then
// the two stay apart and only the first is found by name.
func (d *Design) localNet(name string, pos, end diag.Pos, inst int32) NetID {
	id := NetID(len(d.Nets))
	d.Nets = append(d.Nets, Net{Local: name, Pos: pos, End: end, Inst: inst})
	return id
}

// InstanceRelated returns the instance statements that enclose instance
// inst, innermost first, as related locations: "in CH2 (block led_channel)".
// It returns nil for -1, the top level.
func (d *Design) InstanceRelated(inst int32) []diag.Related {
	var out []diag.Related
	for inst >= 0 && int(inst) < len(d.Instances) {
		in := &d.Instances[inst]
		out = append(out, diag.Related{Pos: in.Pos, End: in.End, Message: "in " + d.ShownPath(inst) + " (block " + in.Block + ")"})
		inst = in.Parent
	}
	return out
}

// LookupNet returns the id of the net of that name (with its instance
// path), or NoNet. When a quoted top-level name spells the path of a net
// inside an instance, the one made first is found.
func (d *Design) LookupNet(name string) NetID {
	best := d.netIndex.lookup(name, d.Nets)
	if len(d.Instances) == 0 {
		return best
	}
	x := d.names()
	d.splits(name, func(inst int32, local string) bool {
		if inst >= 0 {
			if id, ok := x.nets[localKey{inst, local}]; ok && (best == NoNet || id < best) {
				best = id
			}
		}
		return true
	})
	return best
}

// AddPart appends p, counts its pins on their nets, and returns its id.
func (d *Design) AddPart(p Part) PartID {
	for _, n := range p.Nets() {
		d.Nets[n].Pins++
	}
	d.Parts = append(d.Parts, p)
	return PartID(len(d.Parts) - 1)
}

// HasParts reports whether the design has any part.
func (d *Design) HasParts() bool { return len(d.Parts) > 0 }
