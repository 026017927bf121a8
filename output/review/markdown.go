package review

// markdown.go: the comparison as a pull-request comment.

import (
	"bufio"
	"fmt"
	"io"

	"nodal/output"
	"nodal/units"
)

// MaxRows caps each table of the Markdown form; the rest goes in the
// collapsed section.
const MaxRows = 20

// MaxDesigns caps the designs shown in full in the Markdown form, so that
// a change to a much-used library still fits in one comment; the rest are
// listed one line each in a collapsed section.
const MaxDesigns = 25

// WriteMarkdown writes the comparison as a pull-request comment: a summary
// line, then per design a short table of the parts whose use of a rating
// moved, worst change first, and the new findings; fixed, updated and
// unchanged findings and moved nets go in a collapsed section. Every piece
// of text that comes from a design (names, paths, messages) is a code
// span, so no HTML, link, image or @mention in it takes effect.
func (c *Comparison) WriteMarkdown(w io.Writer) error {
	bw := bufio.NewWriter(w)
	fmt.Fprintf(bw, "### nodal: what this change does to the designs\n\n")
	fmt.Fprintf(bw, "Comparing %s with %s: %s.\n", code(c.Base), code(c.Head), c.summary())
	if len(c.Designs) == 0 {
		fmt.Fprintf(bw, "\nNo design changed.\n")
		return bw.Flush()
	}
	for i := range c.Designs {
		d := &c.Designs[i]
		if i == MaxDesigns {
			restTable(bw, c.Designs[i:])
			break
		}
		if d.Status == Renamed {
			fmt.Fprintf(bw, "\n#### %s (renamed from %s)\n\n", code(d.Path), code(d.From))
		} else {
			fmt.Fprintf(bw, "\n#### %s (%s)\n\n", code(d.Path), d.Status)
		}
		if d.Status == Removed {
			fmt.Fprintf(bw, "The design was removed.\n")
			continue
		}
		if d.BaseNote != "" || d.HeadNote != "" {
			fmt.Fprintf(bw, "Ratings not compared: %s\n\n", code(noteText(d)))
		}
		if len(d.Parts) > 0 {
			fmt.Fprintf(bw, "Use of a rating moved by more than %s, worst first:\n\n", points(c.Thresholds.Use))
			partTable(bw, d.Parts[:min(len(d.Parts), MaxRows)])
			bw.WriteByte('\n')
		}
		var fresh []FindingChange
		for _, f := range d.Findings {
			if f.State == New {
				fresh = append(fresh, f)
			}
		}
		if len(fresh) > 0 {
			fmt.Fprintf(bw, "New findings:\n\n")
			findingTable(bw, fresh[:min(len(fresh), MaxRows)], false)
			bw.WriteByte('\n')
		} else if d.Quiet() {
			fmt.Fprintf(bw, "No use of a rating or net voltage moved past the thresholds, and no finding changed.\n\n")
		} else {
			fmt.Fprintf(bw, "No new findings.\n\n")
		}
		rest := len(d.Findings) - len(fresh)
		moreParts := max(len(d.Parts)-MaxRows, 0)
		moreNew := max(len(fresh)-MaxRows, 0)
		if rest == 0 && len(d.Nets) == 0 && moreParts == 0 && moreNew == 0 {
			continue
		}
		fmt.Fprintf(bw, "<details><summary>%d fixed, %d updated, %d unchanged findings; %s moved</summary>\n\n",
			d.Count(Absent), d.Count(Updated), d.Count(Unchanged), pluralNet(len(d.Nets)))
		if moreParts > 0 {
			fmt.Fprintf(bw, "More parts whose use moved:\n\n")
			partTable(bw, d.Parts[MaxRows:])
			bw.WriteByte('\n')
		}
		if moreNew > 0 {
			fmt.Fprintf(bw, "More new findings:\n\n")
			findingTable(bw, fresh[MaxRows:], false)
			bw.WriteByte('\n')
		}
		if len(d.Nets) > 0 {
			fmt.Fprintf(bw, "Nets moved by more than %s:\n\n| net | before | after | range before | range after |\n|---|--:|--:|--:|--:|\n", c.Thresholds.netText())
			for _, n := range d.Nets {
				fmt.Fprintf(bw, "| %s | %s | %s | %s | %s |\n", code(n.Name), units.Format(n.Before, units.Voltage), units.Format(n.After, units.Voltage),
					rangeText(n.BeforeRange), rangeText(n.AfterRange))
			}
			bw.WriteByte('\n')
		}
		for _, s := range []State{Absent, Updated, Unchanged} {
			var list []FindingChange
			for _, f := range d.Findings {
				if f.State == s {
					list = append(list, f)
				}
			}
			if len(list) == 0 {
				continue
			}
			title := map[State]string{Absent: "Fixed (positions before the change)", Updated: "Updated", Unchanged: "Unchanged"}[s]
			fmt.Fprintf(bw, "%s:\n\n", title)
			findingTable(bw, list, s == Updated)
			bw.WriteByte('\n')
		}
		fmt.Fprintf(bw, "</details>\n")
	}
	return bw.Flush()
}

func pluralNet(n int) string {
	if n == 1 {
		return "1 net"
	}
	return fmt.Sprintf("%d nets", n)
}

func partTable(bw *bufio.Writer, parts []PartChange) {
	worst := false
	for i := range parts {
		worst = worst || parts[i].HasWorst()
	}
	if worst {
		fmt.Fprintf(bw, "| part | kind | rating | before | after | change | worst case over tolerances |\n|---|---|---|--:|--:|--:|--:|\n")
	} else {
		fmt.Fprintf(bw, "| part | kind | rating | before | after | change |\n|---|---|---|--:|--:|--:|\n")
	}
	for i := range parts {
		p := &parts[i]
		fmt.Fprintf(bw, "| %s | %s | %s | %s | %s | %s |", code(p.Name), p.Kind, partWhat(p),
			useText(p.Before), useText(p.After), signedPoints(p.Delta()))
		if worst {
			fmt.Fprintf(bw, " %s |", worstText(p))
		}
		bw.WriteByte('\n')
	}
}

func findingTable(bw *bufio.Writer, list []FindingChange, was bool) {
	head := "| location | severity | rule | message |\n|---|---|---|---|\n"
	if was {
		head = "| location | severity | rule | message | before |\n|---|---|---|---|---|\n"
	}
	bw.WriteString(head)
	for _, fc := range list {
		f := &fc.Finding
		fmt.Fprintf(bw, "| %s | %s | %s | %s |", code(position(f)), f.Severity, output.MarkdownRule(f.Rule), code(f.Message))
		if was {
			before := ""
			if fc.Before != nil {
				before = fc.Before.Severity.String() + ": " + fc.Before.Message
			}
			fmt.Fprintf(bw, " %s |", code(before))
		}
		bw.WriteByte('\n')
	}
}

// restTable lists designs past MaxDesigns, one line each, collapsed.
func restTable(bw *bufio.Writer, ds []Design) {
	fmt.Fprintf(bw, "\n<details><summary>%d more designs</summary>\n\n", len(ds))
	fmt.Fprintf(bw, "| design | status | new | fixed | updated | largest move |\n|---|---|--:|--:|--:|--:|\n")
	for i := range ds {
		d := &ds[i]
		move := ""
		if len(d.Parts) > 0 {
			move = code(d.Parts[0].Name) + " " + signedPoints(d.Parts[0].Delta())
		}
		fmt.Fprintf(bw, "| %s | %s | %d | %d | %d | %s |\n", code(d.Path), d.Status, d.Count(New), d.Count(Absent), d.Count(Updated), move)
	}
	fmt.Fprintf(bw, "\n</details>\n")
}
