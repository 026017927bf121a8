package report

import (
	"bufio"
	"io"
	"math"
	"strconv"
	"strings"
	"unicode/utf8"

	"github.com/fatih/color"

	"nodal/output"
	"nodal/rules"
	"nodal/units"
)

// BarCells is the width of a full bar: 100 % of a rating.
const BarCells = 10

// eighths are the block characters for 1/8 … 8/8 of a cell.
var eighths = []rune("▏▎▍▌▋▊▉█")

// Bar draws a use of a rating: one cell per tenth, in eighths of a cell,
// and an arrow past the end for a use above 100 %.
func Bar(use float64) string {
	if !(use > 0) {
		return ""
	}
	over := rules.Use{Frac: use}.Over()
	if use > 1 {
		use = 1
	}
	n := int(math.Round(use * BarCells * 8)) // eighths
	var b strings.Builder
	for ; n >= 8; n -= 8 {
		b.WriteRune(eighths[7])
	}
	if n > 0 {
		b.WriteRune(eighths[n-1])
	}
	if over {
		b.WriteRune('▶')
	}
	return b.String()
}

// TextOptions change the text form.
type TextOptions struct {
	Color bool // colour the use column by how close it is to the rating
}

// WriteText writes the table for a person: the nets and their voltages,
// then every part, worst use of a rating first.
func (t *Table) WriteText(w io.Writer, opt TextOptions) error {
	bw := bufio.NewWriter(w)
	// Names and the title come from the design: shown with control
	// characters escaped, and no line may begin with "::" (see
	// output.TextSafe).
	head := output.PathSafe(t.File)
	switch {
	case t.Design != "" && t.Title != "":
		head += ": " + output.TextSafe(t.Design) + ", " + output.TextSafe(t.Title)
	case t.Design != "":
		head += ": " + output.TextSafe(t.Design)
	}
	bw.WriteString(head + "\n")
	switch a := t.Ambient; {
	case a.From == "" || a.From == "the default":
		bw.WriteString("DC operating point, junctions at " + units.Format(t.Temperature-273.15, units.None) + " °C\n")
	case a.Range():
		bw.WriteString("DC operating point at " + units.FormatCelsius(a.Nominal) + " ambient, in a range of " +
			units.FormatCelsius(a.Low) + " … " + units.FormatCelsius(a.High) + " (from " + a.From + ")\n")
	default:
		bw.WriteString("DC operating point at " + units.FormatCelsius(a.Nominal) + " ambient (from " + a.From + ")\n")
	}
	if t.Undriven {
		bw.WriteString("No source in the design drives it (its supply would come in through its\n" +
			"ports), so every voltage and current is 0.\n")
	}
	bw.WriteString("\n")

	bw.WriteString("Nets\n")
	nets := [][]string{{"net", "voltage"}}
	if t.HasRanges {
		nets[0] = append(nets[0], "range over "+t.box())
	}
	unknown := false
	for _, n := range t.Nets {
		v := units.Format(n.Voltage, units.Voltage)
		if n.Undetermined {
			v, unknown = undetermined, true
		}
		row := []string{output.LineSafe(n.Name), v}
		if t.HasRanges {
			rg := ""
			if n.HasRange {
				rg = units.Format(n.Low, units.Voltage) + " … " + units.Format(n.High, units.Voltage)
			}
			row = append(row, rg)
		}
		nets = append(nets, row)
	}
	writeColumns(bw, nets, []bool{false, true, false}[:len(nets[0])], nil)
	if t.HasRanges {
		if t.RangeCorners {
			bw.WriteString("Ranges are the extremes over every corner of the " + t.box() + ".\n")
		} else {
			bw.WriteString("Ranges are first-order estimates from the sensitivities at the nominal point.\n")
		}
	}

	bw.WriteString("\nParts, worst use of a rating first\n")
	rows := [][]string{{"part", "kind", "voltage", "current", "power", "rating", "use", ""}}
	paint := []func(string) string{nil}
	over := false
	for i := range t.Parts {
		p := &t.Parts[i]
		rating, use, bar := "—", "—", ""
		if u, ok := p.Use(); ok {
			r := p.Ratings[p.Worst]
			rating = units.Format(r.Rating, r.Dim)
			if r.What == "reverse voltage" {
				rating += " reverse"
			}
			use, bar = rules.FormatUse(u, r.Limit), Bar(u)
		}
		lv := p.Level()
		over = over || lv == Over
		v, c, pw := units.Format(p.Voltage, units.Voltage), units.Format(p.Current, units.Current), units.Format(p.Power, units.Power)
		if p.VoltageUnknown {
			v = undetermined
		}
		if p.CurrentUnknown {
			c = undetermined
		}
		if p.VoltageUnknown || p.CurrentUnknown {
			pw, unknown = undetermined, true
		}
		rows = append(rows, []string{output.LineSafe(p.Name), p.Kind.String(), v, c, pw, rating, use, bar})
		paint = append(paint, painter(lv, opt.Color))
	}
	writeColumns(bw, rows, []bool{false, false, true, true, true, true, true, false}, paint)
	writeWorst(bw, t)
	t.writeRails(bw)
	t.writeBatteries(bw)

	bw.WriteString("\nVoltage is V(first pin) − V(second pin); current flows from the first pin\n" +
		"to the second through the part; power is positive when absorbed.\n")
	for _, p := range t.Parts {
		if ki := p.Kind.Info(); len(ki.Pins) > 2 {
			a, b := ki.Pins[ki.Ends[0]], ki.Pins[ki.Ends[1]]
			bw.WriteString("A part with more pins (a regulator, a converter) shows V(" + a + ") − V(" + b + "),\n" +
				"the current into " + a + " (minus what it delivers), and the power it dissipates.\n")
			break
		}
	}
	if unknown {
		bw.WriteString("Values shown as " + undetermined + " are not fixed by the circuit (a section with no\n" +
			"DC path to ground, or a loop of ideal shorts and voltage sources), so the\n" +
			"ratings that need them are not judged; \"nodal check\" names them.\n")
	}
	for _, g := range t.Groups {
		names := make([]string, len(g.Parts))
		for i, n := range g.Parts {
			names[i] = output.LineSafe(n)
		}
		bw.WriteString(strings.Join(names, ", ") + " in parallel carry " + units.Format(math.Abs(g.Current), units.Current) +
			" together; how it divides between them is not determined.\n")
	}
	if over {
		bw.WriteString("Parts past a rating (▶) can overheat, burn or fail. nodal is a design aid,\n" +
			"not a sign-off: have the design reviewed, and follow local codes and\n" +
			"licensed practice for mains and battery energy.\n")
	}
	return bw.Flush()
}

// writeBatteries lists every part with a capacity and how long it lasts at
// the operating point.
func (t *Table) writeBatteries(bw *bufio.Writer) {
	rows := [][]string{{"part", "capacity", "discharge", "runtime"}}
	for i := range t.Parts {
		p := &t.Parts[i]
		if p.Capacity <= 0 {
			continue
		}
		run, out := "— (not discharging)", "0 A"
		if p.Runtime > 0 {
			run, out = "about "+Duration(p.Runtime), units.Format(-p.Current, units.Current)
		}
		rows = append(rows, []string{output.LineSafe(p.Name), FormatCapacity(p.Capacity), out, run})
	}
	if len(rows) == 1 {
		return
	}
	bw.WriteString("\nBatteries, runtime at this operating point\n")
	writeColumns(bw, rows, []bool{false, true, true, false}, nil)
	bw.WriteString("Runtime is capacity ÷ discharge current: a simple estimate that ignores\n" +
		"the discharge rate, temperature and age, and the cut-off voltage. A battery\n" +
		"holds enough energy to start a fire: follow its maker's limits, local codes\n" +
		"and licensed practice for charging, protection and enclosure.\n")
}

// FormatCapacity prints a charge in ampere-hours: 9000 C → "2.50 Ah".
func FormatCapacity(c float64) string { return units.Format(c/3600, units.Current) + "h" }

// Duration prints a time in seconds in the unit that reads best: "45 min",
// "2.1 h", "3.5 days".
func Duration(s float64) string {
	switch {
	case s < 3600:
		return strconv.FormatFloat(s/60, 'f', 0, 64) + " min"
	case s < 48*3600:
		return strconv.FormatFloat(s/3600, 'f', 1, 64) + " h"
	}
	return strconv.FormatFloat(s/86400, 'f', 1, 64) + " days"
}

// undetermined stands in the table for a value the circuit does not fix.
const undetermined = "undetermined"

// painter returns what colours the use column of a row, or nil.
func painter(lv Level, on bool) func(string) string {
	if !on {
		return nil
	}
	var c *color.Color
	switch lv {
	case Over:
		c = color.New(color.FgRed, color.Bold)
	case Derated:
		c = color.New(color.FgYellow)
	case Within:
		c = color.New(color.FgGreen)
	default:
		return nil
	}
	c.EnableColor()
	return func(s string) string { return c.Sprint(s) }
}

// writeColumns writes rows as columns two spaces apart, indented by two,
// right-aligning the columns marked so. paint, when given, colours the last
// two columns of each row (after padding, so colour codes do not upset the
// widths).
func writeColumns(w *bufio.Writer, rows [][]string, right []bool, paint []func(string) string) {
	width := make([]int, len(right))
	for _, r := range rows {
		for i, c := range r {
			width[i] = max(width[i], utf8.RuneCountInString(c))
		}
	}
	for k, r := range rows {
		var line strings.Builder
		line.WriteString("  ")
		for i, c := range r {
			pad := strings.Repeat(" ", width[i]-utf8.RuneCountInString(c))
			last := i == len(r)-1
			if i >= len(r)-2 && paint != nil && paint[k] != nil && c != "" {
				c = paint[k](c)
			}
			switch {
			case right[i]:
				line.WriteString(pad + c)
			case last:
				line.WriteString(c)
			default:
				line.WriteString(c + pad)
			}
			if !last {
				line.WriteString("  ")
			}
		}
		w.WriteString(strings.TrimRight(line.String(), " ") + "\n")
	}
}
