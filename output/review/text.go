package review

// text.go: the comparison for a terminal.

import (
	"bufio"
	"fmt"
	"io"
	"strings"

	"nodal/output"
	"nodal/units"
)

// WriteText writes the comparison for a person at a terminal: a summary,
// then each design with its moved parts and nets and its findings, one per
// line in the GNU form with the state after it. Absent (fixed) findings
// give their position in the earlier revision.
func (c *Comparison) WriteText(w io.Writer) error {
	bw := bufio.NewWriter(w)
	fmt.Fprintf(bw, "nodal diff: BASE %s → HEAD %s\n", oneLine(c.Base), oneLine(c.Head))
	fmt.Fprintf(bw, "%s\n", c.summary())
	for i := range c.Designs {
		d := &c.Designs[i]
		if d.Status == Renamed {
			fmt.Fprintf(bw, "\n%s: renamed from %s\n", pathSafe(d.Path), oneLine(d.From))
		} else {
			fmt.Fprintf(bw, "\n%s: %s\n", pathSafe(d.Path), d.Status)
		}
		if d.Status == Removed {
			continue
		}
		if d.BaseNote != "" || d.HeadNote != "" {
			fmt.Fprintf(bw, "  ratings not compared: %s\n", oneLine(noteText(d)))
		}
		if len(d.Parts) > 0 {
			fmt.Fprintf(bw, "  use of a rating moved by more than %s, worst first:\n", points(c.Thresholds.Use))
			for _, p := range d.Parts {
				fmt.Fprintf(bw, "    %s (%s) %s: %s → %s (%s)", oneLine(p.Name), p.Kind, partWhat(&p), useText(p.Before), useText(p.After), signedPoints(p.Delta()))
				if p.HasWorst() {
					fmt.Fprintf(bw, "; worst case over tolerances %s", worstText(&p))
				}
				bw.WriteByte('\n')
			}
		}
		if len(d.Nets) > 0 {
			fmt.Fprintf(bw, "  nets moved by more than %s:\n", c.Thresholds.netText())
			for _, n := range d.Nets {
				fmt.Fprintf(bw, "    %s: %s → %s", oneLine(n.Name), units.Format(n.Before, units.Voltage), units.Format(n.After, units.Voltage))
				if n.HasRange() {
					fmt.Fprintf(bw, "; over tolerances %s → %s", rangeText(n.BeforeRange), rangeText(n.AfterRange))
				}
				bw.WriteByte('\n')
			}
		}
		if d.Quiet() {
			fmt.Fprintf(bw, "  no use of a rating or net voltage moved past the thresholds, and no finding changed\n")
		}
		if len(d.Findings) == 0 {
			fmt.Fprintf(bw, "  findings: none in either revision\n")
		} else {
			fmt.Fprintf(bw, "  findings: %d new, %d fixed, %d updated, %d unchanged\n", d.Count(New), d.Count(Absent), d.Count(Updated), d.Count(Unchanged))
		}
		for _, fc := range d.Findings {
			f := &fc.Finding
			state := string(fc.State)
			if fc.State == Absent {
				state = "fixed; its position is in BASE"
			}
			fmt.Fprintf(bw, "    %s: %s: %s", position(f), f.Severity, oneLine(f.Message))
			if f.Rule != "" {
				fmt.Fprintf(bw, " [%s]", oneLine(f.Rule))
			}
			fmt.Fprintf(bw, " (%s)", state)
			if fc.State == Updated && fc.Before != nil {
				fmt.Fprintf(bw, " was %s: %s", fc.Before.Severity, oneLine(fc.Before.Message))
			}
			bw.WriteByte('\n')
		}
	}
	return bw.Flush()
}

// summary is one line of totals.
func (c *Comparison) summary() string {
	ds, fs := c.Totals()
	renamed := ""
	if ds[Renamed] > 0 {
		renamed = fmt.Sprintf(", %d renamed", ds[Renamed])
	}
	return fmt.Sprintf("%s changed, %d added, %d removed%s, %d unchanged; findings: %d new, %d fixed, %d updated, %d unchanged",
		output.Plural(ds[Changed], "design"), ds[Added], ds[Removed], renamed, c.Unchanged, fs[New], fs[Absent], fs[Updated], fs[Unchanged])
}

func noteText(d *Design) string {
	var parts []string
	if d.BaseNote != "" {
		parts = append(parts, "before: "+d.BaseNote)
	}
	if d.HeadNote != "" {
		parts = append(parts, "after: "+d.HeadNote)
	}
	return strings.Join(parts, "; ")
}

func position(f *output.Finding) string {
	s := pathSafe(f.File)
	if f.Line > 0 {
		s += fmt.Sprintf(":%d:%d", f.Line, f.Column)
	}
	return s
}

// partWhat names the rating a part change is about.
func partWhat(p *PartChange) string {
	switch {
	case p.After != nil:
		return p.After.What
	case p.Before != nil:
		return p.Before.What
	}
	return "rating"
}

// useText prints a use as "40 % (100 mW of 250 mW)", or "none".
func useText(u *Use) string {
	if u == nil {
		return "none"
	}
	return fmt.Sprintf("%s (%s of %s)", units.FormatPercent(u.Frac), units.Format(u.Value, u.Dim), units.Format(u.Rating, u.Dim))
}

// points prints a fraction of a rating as percentage points.
func points(f float64) string {
	return fmt.Sprintf("%.0f points", f*100)
}

func signedPoints(f float64) string {
	return fmt.Sprintf("%+.0f points", f*100)
}

// netText describes the net threshold.
func (t Thresholds) netText() string {
	if t.Volts > 0 {
		return units.Format(t.Volts, units.Voltage)
	}
	return units.FormatPercent(t.Relative)
}

// worstText prints a part's worst-case uses: "46 % → 109 % (+63 points)".
func worstText(p *PartChange) string {
	side := func(u *Use, w float64) string {
		if u == nil {
			return "none"
		}
		return units.FormatPercent(w)
	}
	return fmt.Sprintf("%s → %s (%s)", side(p.Before, p.WorstBefore), side(p.After, p.WorstAfter), signedPoints(p.WorstDelta()))
}

// rangeText prints a voltage range: "9.50 V … 10.5 V".
func rangeText(r [2]float64) string {
	if r[0] == r[1] {
		return units.Format(r[0], units.Voltage)
	}
	return units.Format(r[0], units.Voltage) + " … " + units.Format(r[1], units.Voltage)
}
