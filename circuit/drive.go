package circuit

// drive.go: what a port statement says drives its net from outside
// (port vin 5 V series 50 Ω, port sense 2 mA, port vin 4.5 V to 5.5 V),
// made into a part of the kind VoltageDrive or CurrentDrive between the
// net and ground. Drives are placed after every top-level statement is
// read, so that the ground they stand on may be declared anywhere in the
// file.

import (
	"nodal/diag"
	"nodal/grammar"
	"nodal/units"
)

// pendingDrive is a port statement that states a drive.
type pendingDrive struct {
	port     *grammar.Port
	pos, end diag.Pos
}

// drives places the drives of the port statements; ports lists every
// top-level port statement in the order written, with positions.
func (b *builder) drives(ports []pendingDrive) {
	d := b.r.Design
	// Where each net is named by a port statement, to refuse a drive on
	// a net that two statements name.
	named := map[string][]diag.Pos{}
	for _, pd := range ports {
		for _, n := range pd.port.Nets {
			name := netName(n.Text)
			named[name] = append(named[name], pd.pos)
		}
	}
	for _, pd := range ports {
		pt := pd.port
		if pt.Drive == nil && len(pt.Attrs) == 0 {
			continue
		}
		// A drive that cannot be placed leaves the design unmodelled, as
		// a refused part does: judging it undriven would be judging
		// another circuit.
		first := pt.Nets[0]
		name := netName(first.Text)
		switch {
		case pt.Drive == nil:
			a := pt.Attrs[0]
			b.report(CodeMissingValue, b.pos(a.Start()), pd.end, "port %s gives %s but no drive; write the voltage or current first, as in \"port %s 5 V series 50 Ω\"", name, a.Key.Text, name)
			b.r.Invalid = true
			continue
		case len(pt.Nets) > 1:
			b.report(CodeSyntax, b.pos(pt.Nets[1].Start()), pd.end, "a drive belongs to one net, and this port statement names %d; give each driven port a line of its own", len(pt.Nets))
			b.r.Invalid = true
			continue
		}
		if others := named[name]; len(others) > 1 {
			other := others[0]
			if other == pd.pos {
				other = others[1]
			}
			b.report(CodeDuplicateName, b.pos(first.Start()), b.nameEnd(first), "port %s is also named on line %d; name a driven port once, on the line that gives its drive", name, b.file.Position(other).Line)
			b.r.Invalid = true
			continue
		}
		if at, clash := partNamed(d, name); clash {
			b.report(CodeDuplicateName, b.pos(first.Start()), b.nameEnd(first), "port %s's drive is named after its net, and the part on line %d is named %s too; rename the part", name, b.file.Position(at).Line, name)
			b.r.Invalid = true
			continue
		}
		if d.Ground == NoNet {
			b.report(CodeNoGround, pd.pos, pd.end, "port %s's drive stands between its net and ground, but the design has no ground net; add a line such as \"ground gnd\"", name)
			b.r.Invalid = true
			continue
		}
		gname := d.Nets[d.Ground].Local
		if name == gname {
			b.report(CodeBadValue, b.pos(first.Start()), b.nameEnd(first), "port %s is the ground net: a drive between ground and itself drives nothing; name the net the outside world connects to", name)
			b.r.Invalid = true
			continue
		}
		// A range is read first: its ends in one unit, the bottom first.
		// The part is then placed at its bottom, whose unit says which
		// drive it is, and moved to the midpoint.
		var low, high units.Quantity
		if pt.DriveHigh != nil {
			var ok bool
			if low, high, ok = b.quantityRange(pt.Drive, pt.DriveHigh, "port "+name); !ok {
				b.r.Invalid = true
				continue
			}
		}
		// The drive as the part statement it stands for, its pins named
		// so that either kind binds them in its own order.
		stmt := &grammar.Part{
			Pos: pt.Drive.Pos, EndPos: pt.Drive.Pos,
			Kind: &grammar.Name{Pos: first.Pos, Text: "port"},
			Name: &grammar.Name{Pos: first.Pos, Text: name},
			Pins: []*grammar.Pin{
				{Pos: first.Pos, Label: &grammar.Name{Pos: first.Pos, Text: "port"}, Net: first},
				{Pos: first.Pos, Label: &grammar.Name{Pos: first.Pos, Text: "ground"}, Net: &grammar.Name{Pos: first.Pos, Text: gname}},
			},
			Value: pt.Drive,
			Attrs: pt.Attrs,
		}
		id := d.Net(name, b.pos(first.Start()), b.nameEnd(first))
		placed := len(d.Parts)
		st := treeStmt(stmt, pd.pos, pd.end)
		st.kind = VoltageDrive
		b.part(&scope{blk: b.top, inst: -1}, st, []NetID{id, d.Ground})
		if pt.DriveHigh != nil && len(d.Parts) > placed {
			b.driveRange(low, high)
		}
	}
}

// partNamed returns where the top-level part called name is, if any.
func partNamed(d *Design, name string) (diag.Pos, bool) {
	for i := range d.Parts {
		if p := &d.Parts[i]; p.Inst < 0 && p.Local == name {
			return p.Pos, true
		}
	}
	return 0, false
}
