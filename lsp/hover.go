package lsp

import (
	"context"
	"fmt"
	"strings"

	"go.lsp.dev/protocol"

	"nodal/circuit"
	"nodal/rules"
	"nodal/solve"
	"nodal/units"
	"nodal/worst"
)

// Hover says, on a part, its kind, its statement, its operating point and
// the use of each rating; on a net, its voltage; on an instance, its
// block's header; on a kind, what the kind takes.
func (s *Server) Hover(ctx context.Context, p *protocol.HoverParams) (_ *protocol.Hover, err error) {
	defer guard(&err)
	files := s.files(p.TextDocument.URI)
	if files == nil {
		return nil, nil
	}
	doc := files[0]
	s.mu.Lock()
	var last *snapshot
	if d := s.docs[p.TextDocument.URI]; d != nil && d.last != nil && d.last.gen == d.gen {
		last = d.last // the model matches the text on screen
	}
	s.mu.Unlock()
	off := doc.t.offset(p.Position)
	a := doc.ix.at(off)
	var b strings.Builder
	var sp span
	switch {
	case a.part != nil && a.part.instance, a.kind != nil && a.kind.instance:
		ref := a.part
		sp = span{}
		if ref == nil {
			ref = a.kind
			sp = ref.kindAt
		} else {
			sp = ref.at
		}
		fmt.Fprintf(&b, "**%s**, an instance of block **%s**\n\n", md(ref.name), md(ref.kind))
		if f, def := findBlock(files, ref.kind); def != nil {
			b.WriteString(fence(string(f.t.src[def.header.from:def.header.to])))
		} else {
			b.WriteString("No block of that name is defined in this file or its includes.\n")
		}
	case a.part != nil:
		sp = a.part.at
		s.hoverPart(&b, doc, a.part, last)
	case a.kind != nil:
		sp = a.kind.kindAt
		hoverKind(&b, a.kind.kind)
	case a.net != nil:
		sp = a.net.at
		s.hoverNet(&b, doc, a.net, last)
	case a.block != nil:
		sp = a.block.at
		b.WriteString(fence(string(doc.t.src[a.block.header.from:a.block.header.to])))
	default:
		return nil, nil
	}
	r := doc.t.rangeOf(sp.from, sp.to)
	return &protocol.Hover{Contents: &protocol.MarkupContent{Kind: protocol.MarkupKindMarkdown, Value: valid(b.String())}, Range: &r}, nil
}

type worstCase = worst.Case

// maxHoverCopies bounds the copies of a block's part a hover lists.
const maxHoverCopies = 8

func (s *Server) hoverPart(b *strings.Builder, doc indexed, ref *partRef, last *snapshot) {
	fmt.Fprintf(b, "**%s**, %s\n\n", md(ref.name), md(ref.kind))
	b.WriteString(fence(string(doc.t.src[ref.stmt.from:ref.stmt.to])))
	if last == nil || last.res == nil {
		b.WriteString("\nNot checked yet in this version of the file.\n")
		return
	}
	d := last.res.Build.Design
	var copies []circuit.PartID
	for i := range d.Parts {
		pp := last.res.Fset.Position(d.Parts[i].Pos)
		if pp.Filename == last.name && pp.Offset == ref.stmt.from {
			copies = append(copies, circuit.PartID(i))
		}
	}
	if len(copies) == 0 {
		b.WriteString("\nNot in the checked design (see the findings on this line).\n")
		return
	}
	var pt *rules.Point
	if sv := last.res.Solved; sv != nil && sv.OP != nil {
		pt = rules.NewPoint(sv.OP)
	}
	der := rules.DefaultDerating()
	if last.cfg != nil {
		der = last.cfg.Derating
	}
	over := false
	for k, id := range copies {
		if k == maxHoverCopies {
			fmt.Fprintf(b, "\n… and %d more copies.\n", len(copies)-k)
			break
		}
		part := &d.Parts[id]
		b.WriteString("\n")
		if len(copies) > 1 || part.Inst >= 0 {
			fmt.Fprintf(b, "**%s**: ", md(d.NameOf(part)))
		}
		if dim := part.Kind.Info().Value; dim != units.None {
			fmt.Fprintf(b, "%s %s", md(part.Kind.String()), md(units.Format(part.Value, dim)))
		} else {
			b.WriteString(md(part.Kind.String()))
		}
		if pt == nil {
			b.WriteString("; no operating point (the design was not solved; see the findings)\n")
			continue
		}
		q := pt.Part(id)
		fmt.Fprintf(b, "; at the operating point %s, %s, %s\n", md(units.Format(q.V, units.Voltage)),
			md(units.Format(q.I, units.Current)), md(units.Format(q.P, units.Power)))
		if f, ok := pt.SupplyFlow(part, id); ok && f.HasInput && part.Multi() {
			// A regulator or converter: what it delivers, draws and loses.
			fmt.Fprintf(b, "- delivers %s at %s; draws %s at %s (%s); dissipates %s", md(units.Format(f.IOut, units.Current)), md(units.Format(f.VOut, units.Voltage)),
				md(units.Format(f.IIn, units.Current)), md(units.Format(f.VIn, units.Voltage)), md(units.Format(f.PIn, units.Power)), md(units.Format(f.Loss, units.Power)))
			if mp := last.res.Solved.OP.MultiAt(id); mp != nil && mp.Region != solve.Regulating {
				fmt.Fprintf(b, "; in %s", md(mp.Region.String()))
			}
			b.WriteString("\n")
		}
		var worst [][]worstCase
		if wr := last.res.Worst; wr != nil && wr.R != nil {
			worst = wr.R.Worst
		}
		for j, u := range rules.Judge(part, q, der) {
			mark := ""
			switch {
			case u.Over():
				mark, over = " (past the rating)", true
			case u.Derated():
				mark = " (past the derating limit)"
			}
			fmt.Fprintf(b, "- %s%s\n", md(rules.Describe(d, part, u)), mark)
			if int(id) < len(worst) && j < len(worst[id]) {
				c := worst[id][j]
				how := "first-order estimate"
				if c.Confirmed {
					how = "solved at that corner"
				}
				fmt.Fprintf(b, "  - worst case over the tolerances: %s (%s)\n", md(rules.FormatUse(c.Frac, u.Limit)), how)
				over = over || c.Frac > 1
			}
		}
	}
	if over {
		b.WriteString("\nA part past its rating can overheat, burn or fail. nodal is a design aid, not a sign-off: follow the datasheet, local codes and licensed practice.\n")
	}
}

func (s *Server) hoverNet(b *strings.Builder, doc indexed, n *netRef, last *snapshot) {
	fmt.Fprintf(b, "net **%s**", md(n.name))
	if n.block >= 0 {
		fmt.Fprintf(b, " of block **%s**: each instance has its own.\n", md(doc.ix.blocks[n.block].name))
		return
	}
	b.WriteString("\n\n")
	if last == nil || last.res == nil {
		b.WriteString("Not checked yet in this version of the file.\n")
		return
	}
	d := last.res.Build.Design
	id := d.LookupNet(n.name)
	if id == circuit.NoNet {
		b.WriteString("Not in the checked design.\n")
		return
	}
	net := &d.Nets[id]
	fmt.Fprintf(b, "%d pin(s)", net.Pins)
	if id == d.Ground {
		b.WriteString(", the ground (0 V)")
	}
	if net.Port {
		b.WriteString(", a port")
		hoverDrive(b, d, id)
	}
	if sv := last.res.Solved; sv != nil && sv.OP != nil && int(id) < len(sv.OP.NetV) {
		fmt.Fprintf(b, "; %s at the operating point", md(units.Format(rules.NewPoint(sv.OP).Net(id), units.Voltage)))
		if wr := last.res.Worst; wr != nil && wr.R != nil && int(id) < len(wr.R.NetLow) && int(id) < len(wr.R.NetHigh) {
			over := "the tolerances"
			if len(d.DriveRanges) > 0 {
				over = "the tolerances and drive ranges"
			}
			fmt.Fprintf(b, ", from %s to %s over %s", md(units.Format(wr.R.NetLow[id], units.Voltage)), md(units.Format(wr.R.NetHigh[id], units.Voltage)), over)
		}
		b.WriteString("\n")
	} else {
		b.WriteString("; no operating point (the design was not solved; see the findings)\n")
	}
}

// hoverDrive says what drives port net id, if its port states a drive:
// its value or range, and its source resistance.
func hoverDrive(b *strings.Builder, d *circuit.Design, id circuit.NetID) {
	for i := range d.Parts {
		p := &d.Parts[i]
		info := p.Kind.Info()
		if !info.OnPort || p.Inst >= 0 || p.Pins[0] != id && p.Pins[1] != id {
			continue
		}
		if r, ok := d.RangeOf(circuit.PartID(i)); ok {
			fmt.Fprintf(b, ", driven by a %s of %s to %s (solved at its middle, %s)", md(p.Kind.String()),
				md(units.Format(r.Low, info.Value)), md(units.Format(r.High, info.Value)), md(units.Format(p.Value, info.Value)))
		} else {
			fmt.Fprintf(b, ", driven by a %s of %s", md(p.Kind.String()), md(units.Format(p.Value, info.Value)))
		}
		if p.Series > 0 {
			fmt.Fprintf(b, " behind %s", md(units.Format(p.Series, units.Resistance)))
		}
		return
	}
}

func hoverKind(b *strings.Builder, word string) {
	for _, k := range circuit.Kinds() {
		info := k.Info()
		if info.Word != word {
			continue
		}
		fmt.Fprintf(b, "**%s**: pins %s", md(info.Name), md(strings.Join(info.Pins, ", ")))
		if info.Value != units.None {
			fmt.Fprintf(b, "; value in %s", md(info.Value.Symbol()))
		}
		if len(info.States) > 0 {
			fmt.Fprintf(b, "; value %s", md(strings.Join(info.States, " or ")))
		}
		attrs := append([]string{}, info.Attrs...)
		var rated []string
		for _, r := range info.Ratings {
			if !r.FromValue {
				rated = append(rated, r.What+" ("+r.Dim.Symbol()+")")
			}
		}
		if len(rated) > 0 {
			attrs = append(attrs, "rated "+strings.Join(rated, ", "))
		}
		if len(attrs) > 0 {
			fmt.Fprintf(b, "; attributes %s", md(strings.Join(attrs, "; ")))
		}
		b.WriteString("\n\n")
	}
}

// md escapes text for Markdown: every ASCII punctuation character gets a
// backslash (CommonMark lets any of them be escaped), so names and values
// from a file are shown as they are and never read as markup or HTML.
func md(s string) string {
	var b strings.Builder
	for _, r := range s {
		if r < 0x80 && strings.ContainsRune("\\`*_{}[]()#+-.!|<>&~\"'=:;,/?@$%^", r) {
			b.WriteByte('\\')
		}
		if r == '\n' || r == '\r' {
			r = ' '
		}
		b.WriteRune(r)
	}
	return b.String()
}

// fence puts source text in a fenced code block longer than any run of
// backquotes in it, so the text cannot close it.
func fence(src string) string {
	longest, run := 0, 0
	for _, c := range src {
		if c == '`' {
			run++
			longest = max(longest, run)
		} else {
			run = 0
		}
	}
	f := strings.Repeat("`", max(3, longest+1))
	return f + "nodal\n" + strings.TrimRight(src, "\r\n") + "\n" + f + "\n"
}
