// Package review compares two revisions of the designs in a repository,
// as a reviewer of a change needs them compared: which findings are new,
// which were fixed and which are unchanged; which parts now use more (or
// less) of a rating; which nets moved; which designs were added and
// removed. It writes the comparison as text for a terminal, Markdown for a
// pull-request comment, JSON for scripts and SARIF with baselineState for
// code-scanning services.
//
// # Matching findings
//
// Findings are matched by what they are about, not by where they are: the
// rule, the design, and the instance path of the part or net (the
// finding's Subject), or, for a finding that names neither, its file and
// its message with the numbers masked (output.Finding.Key). Within one key,
// findings whose messages agree but for line references pair first, then
// those whose messages agree but for numbers, then the rest in line order.
// A pair whose severity and message (line references masked) agree is
// unchanged; any other pair is updated; a finding left over in the later
// revision is new, one left over in the earlier is absent (fixed). So a
// statement moved to another line keeps its findings unchanged, and so
// does a design moved to another path (CompareRenamed).
//
// # Stress
//
// A part's use of its ratings is its largest fraction of any rating, as
// nodal report computes it (output/report). A part is listed when that use
// moved by more than Thresholds.Use (a fraction: 0.10 is 10 percentage
// points); a part that is new or gone counts from zero. Parts are listed
// worst first: the largest rise first, falls last. Parts are compared only
// when both revisions have an operating point; otherwise the design says
// why not. Nets are matched by name and listed when their voltage moved by
// more than Thresholds.Volts, or by more than Thresholds.Relative of the
// larger magnitude (and at least a millivolt).
//
// # Worst case
//
// Where a revision was judged over its tolerances and ambient temperature
// (package worst), each part's worst-case use and each net's range come
// along (Side.WorstUse, Side.NetRange): a part is also listed when its
// worst-case use moved past the threshold, ranked by the larger of its two
// moves, and a net when either end of its range moved.
package review

import (
	"sort"

	"nodal/diag"
	"nodal/output"
	"nodal/output/report"
)

// State is a finding's state against the earlier revision, as SARIF 2.1.0
// §3.27.24 names the values of baselineState.
type State string

const (
	New       State = "new"
	Unchanged State = "unchanged"
	Updated   State = "updated"
	Absent    State = "absent" // fixed: in the earlier revision only
)

// Status is what happened to a design between the revisions.
type Status string

const (
	Added   Status = "added"
	Removed Status = "removed"
	Changed Status = "changed" // it, a file it includes or its nodal.toml changed
	Renamed Status = "renamed" // moved to another path with its content unchanged
)

// Thresholds decide which moves are worth listing.
type Thresholds struct {
	Use      float64 // a fraction of a rating: 0.10 is 10 percentage points
	Volts    float64 // an absolute move of a net, in volts; 0: use Relative
	Relative float64 // a move as a fraction of the larger magnitude
}

// DefaultThresholds lists parts whose use moved by more than 10 points and
// nets that moved by more than 5 %.
var DefaultThresholds = Thresholds{Use: 0.10, Relative: 0.05}

// minNetMove is the smallest net move a relative threshold lists: below a
// millivolt a relative change is noise around 0 V.
const minNetMove = 1e-3

// netMoved reports whether a net's move from a to b passes the threshold.
func (t Thresholds) netMoved(a, b float64) bool {
	d := b - a
	if d < 0 {
		d = -d
	}
	if t.Volts > 0 {
		return d > t.Volts
	}
	m := max(abs(a), abs(b))
	return d > minNetMove && d > t.Relative*m
}

func abs(x float64) float64 {
	if x < 0 {
		return -x
	}
	return x
}

// Side is one revision of one design, checked.
type Side struct {
	Findings []output.Finding // with Design set
	Table    *report.Table    // the operating point, or nil
	// WorstUse is each part's largest use of any rating over the box of
	// tolerances and ambient temperature, by instance path, and NetRange
	// each net's voltage range over it; nil when the design was not
	// judged at its worst case (no tolerance, no temperature range). A
	// part or net missing from them is at its nominal value throughout.
	WorstUse map[string]float64
	NetRange map[string][2]float64
	// NoOP says why Table is nil (the wiring rules reject the design, the
	// solver gave up, it is too large); "" when the design has no parts
	// to solve, as a library of blocks has not.
	NoOP string
	// Error says why the revision could not be checked at all (its
	// nodal.toml is broken, say); its findings are then unknown.
	Error string
}

// FindingChange is one finding and its state.
type FindingChange struct {
	State State
	// Finding is the later revision's finding, or the earlier one's when
	// it is absent.
	Finding output.Finding
	// Before is the earlier revision's finding of an unchanged or updated
	// pair.
	Before *output.Finding
}

// Use is a part's worst use of a rating: what is rated, the value, the
// rating and their ratio (Frac).
type Use = report.Rating

// PartChange is a part whose use of its ratings moved.
type PartChange struct {
	Name   string // instance path
	Kind   string
	Before *Use // nil: the part is new, or had no rating
	After  *Use // nil: the part is gone, or has no rating
	// WorstBefore and WorstAfter are the worst-case uses over tolerances
	// and temperature (the nominal use where nothing moves it); 0 on a
	// side whose Use is nil.
	WorstBefore, WorstAfter float64
}

// WorstDelta is the move of the part's worst-case use.
func (p *PartChange) WorstDelta() float64 { return p.WorstAfter - p.WorstBefore }

// HasWorst reports whether the worst case differs from the nominal use on
// either side, and so is worth showing.
func (p *PartChange) HasWorst() bool {
	return p.Before != nil && p.WorstBefore > p.Before.Frac*(1+1e-9) ||
		p.After != nil && p.WorstAfter > p.After.Frac*(1+1e-9)
}

// rank orders part changes: the larger of the nominal and worst-case
// moves.
func (p *PartChange) rank() float64 { return max(p.Delta(), p.WorstDelta()) }

// Delta is the move of the part's use, a fraction of its rating (0.55 is
// 55 percentage points); a missing side counts as zero.
func (p *PartChange) Delta() float64 {
	var a, b float64
	if p.Before != nil {
		a = p.Before.Frac
	}
	if p.After != nil {
		b = p.After.Frac
	}
	return b - a
}

// NetChange is a net whose voltage moved.
type NetChange struct {
	Name          string
	Before, After float64 // volts
	// BeforeRange and AfterRange are the voltage ranges over the box of
	// tolerances and temperature ([nominal, nominal] where nothing moves
	// the net).
	BeforeRange, AfterRange [2]float64
}

// HasRange reports whether either side's range is wider than a point.
func (n *NetChange) HasRange() bool {
	return n.BeforeRange[0] != n.BeforeRange[1] || n.AfterRange[0] != n.AfterRange[1]
}

// Design is one design's comparison.
type Design struct {
	Path     string // repository path of the design file
	Status   Status
	From     string          // the earlier path of a renamed design
	Findings []FindingChange // new, updated, absent, unchanged; worst first within each
	Parts    []PartChange    // worst first
	Nets     []NetChange     // largest move first
	// BaseNote and HeadNote say why the ratings were not compared, when
	// a revision has no operating point.
	BaseNote, HeadNote string
}

// Count returns how many findings have the state.
func (d *Design) Count(s State) int {
	n := 0
	for _, f := range d.Findings {
		if f.State == s {
			n++
		}
	}
	return n
}

// Quiet reports whether a changed design's change shows in nothing the
// comparison lists: no part or net moved past the thresholds, no finding
// is new, fixed or updated, and the ratings were compared (a layout-only
// edit, say).
func (d *Design) Quiet() bool {
	return (d.Status == Changed || d.Status == Renamed) && len(d.Parts) == 0 && len(d.Nets) == 0 && d.BaseNote == "" && d.HeadNote == "" &&
		d.Count(New) == 0 && d.Count(Absent) == 0 && d.Count(Updated) == 0
}

// newErrors counts the new findings at error level.
func (d *Design) newErrors() int {
	n := 0
	for _, f := range d.Findings {
		if f.State == New && f.Finding.Severity == diag.Error {
			n++
		}
	}
	return n
}

// worstRise is the largest rise of a part's use, or 0.
func (d *Design) worstRise() float64 {
	if len(d.Parts) == 0 {
		return 0
	}
	return max(d.Parts[0].rank(), 0)
}

// Comparison is the whole review of a change.
type Comparison struct {
	Base, Head string // how the revisions are named to the reader
	Thresholds Thresholds
	// Designs that changed, were added or were removed: those with new
	// errors first, then the largest rise in a part's use, then by path.
	Designs []Design
	// Unchanged counts the designs whose files and settings did not
	// change, and so were not checked again.
	Unchanged int
	// Sources and BaseSources return the text of a file in the later and
	// the earlier revision, for SARIF's code-point columns; either may be
	// nil.
	Sources, BaseSources func(file string) []byte
}

// Compare compares one design's two revisions; base is nil for a design
// added, head nil for one removed.
func Compare(path string, base, head *Side, th Thresholds) Design {
	d := Design{Path: path, Status: Changed}
	switch {
	case base == nil:
		d.Status, base = Added, &Side{}
	case head == nil:
		d.Status, head = Removed, &Side{}
	}
	if d.Status == Removed {
		// A removed design's findings went with it; they are not "fixed".
		return d
	}
	d.Findings = matchFindings(base.Findings, head.Findings)
	d.BaseNote, d.HeadNote = base.NoOP, head.NoOP
	if base.Error != "" {
		d.BaseNote = "it could not be checked: " + base.Error
	}
	switch {
	case base.Table != nil && head.Table != nil:
		d.Parts = compareParts(base, head, th)
		d.Nets = compareNets(base, head, th)
	case d.BaseNote == "" && d.HeadNote == "" && (base.Table != nil || head.Table != nil):
		// One side has no parts at all (an added design, a library that
		// became a design): its parts count from nothing.
		d.Parts = compareParts(base, head, th)
	}
	return d
}

// CompareRenamed compares a design moved from the path from to path: its
// earlier findings are taken as if they had been found at the new path,
// so that moving a file, like moving a line, makes no finding new.
func CompareRenamed(from, path string, base, head *Side, th Thresholds) Design {
	moved := *base
	moved.Findings = make([]output.Finding, len(base.Findings))
	for i, f := range base.Findings {
		if f.Design == from {
			f.Design = path
		}
		if f.File == from {
			f.File = path
		}
		moved.Findings[i] = f
	}
	d := Compare(path, &moved, head, th)
	// Absent findings keep the earlier revision's positions, in the file
	// they were found in.
	for i := range d.Findings {
		if fc := &d.Findings[i]; fc.State == Absent && fc.Finding.File == path {
			fc.Finding.File = from
		}
	}
	d.Status, d.From = Renamed, from
	return d
}

// Sort orders the designs: new errors first, then the largest rise in a
// part's use, then by path.
func (c *Comparison) Sort() {
	sort.SliceStable(c.Designs, func(i, j int) bool {
		a, b := &c.Designs[i], &c.Designs[j]
		if ea, eb := a.newErrors(), b.newErrors(); ea != eb {
			return ea > eb
		}
		if ra, rb := a.worstRise(), b.worstRise(); ra != rb {
			return ra > rb
		}
		return a.Path < b.Path
	})
}

// Totals counts designs by status and findings by state over the whole
// comparison.
func (c *Comparison) Totals() (designs map[Status]int, findings map[State]int) {
	designs, findings = map[Status]int{}, map[State]int{}
	for i := range c.Designs {
		d := &c.Designs[i]
		designs[d.Status]++
		for _, f := range d.Findings {
			findings[f.State]++
		}
	}
	return designs, findings
}
