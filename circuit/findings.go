package circuit

// findings.go: the collector every finding goes through, whatever made it.
//
// A block's statement is elaborated once per instance, and a rule that
// looks at parts and nets sees each instance's copy, so a slip in a block
// used a hundred times would otherwise be reported a hundred times. The
// collector merges findings that differ only in the instance they are in:
// same position, rule and severity, and the same message once the
// instance's path is taken out of it. What is left names one instance (the
// one whose path sorts first, so that the choice does not depend on
// statement order) and says in how many more the finding repeats. Finish
// then gives each finding about a part or net inside an instance the
// chain of instance statements as related locations.
//
// The builder adds its findings as it makes them, so that a design of a
// million instances never holds a million copies; package rules adds the
// rules' findings to a collector seeded with the builder's, and finishes
// it in its last pass.

import (
	"fmt"
	"strings"

	"nodal/diag"
)

// Unresolved is the Finding.Inst of a finding whose instance is still to
// be found from its Subject (the rules' findings).
const Unresolved int32 = -2

// Finding is a diagnostic on its way to the runner's last pass.
type Finding struct {
	diag.Diagnostic
	// Code is the rule of a finding made while building; NoCode for a
	// finding of a rule.
	Code Code
	// Inst is the instance (an index into Design.Instances) the finding's
	// subject is in, -1 at the top level or when there is none, or
	// Unresolved.
	Inst int32
	// Path is the path of the instance the message names its subject
	// under ("ROW2", "BOARD.CH1"); findings that differ only in it are
	// merged. Empty at the top level.
	Path string
	// More counts the other instances a merged finding was made in.
	More int
	// Also lists some of those instances, those whose paths sort first.
	Also []int32
}

// maxAlso bounds Finding.Also.
const maxAlso = 8

// Findings collects findings, merging repeats across instances.
type Findings struct {
	list []Finding
	// index finds, by place, rule and severity, the first finding that
	// could take a repeat; next chains the others of the same key, -1
	// ending the chain.
	index map[mergeKey]int32
	next  []int32
	// design is the design the findings are about; nil until Use names
	// it.
	design *Design
	// text counts the bytes of the findings kept (message, subject,
	// related messages); past maxFindingText a finding is not kept, and
	// the one at limit (-1: none yet) says how many were not.
	text    int64
	limit   int32
	dropped int
}

// maxFindingText bounds the text of the findings of one design: 256 MiB
// (a variable only so that tests can lower it). Names inside instances
// carry their instance path, so a design whose every part has a finding
// of its own, deep in long-named blocks, could otherwise hold parts ×
// depth × name length bytes of messages; past the bound the findings left
// are counted in one expansion-limit error instead.
var maxFindingText int64 = 256 << 20

// Use names the design whose instances the findings' Inst fields index,
// so that the other instances of a merged finding can be listed and a
// finding added Unresolved is resolved as it comes.
func (fs *Findings) Use(d *Design) { fs.design = d }

type mergeKey struct {
	pos  diag.Pos
	rule string
	sev  diag.Severity
}

// Len returns how many findings the collector holds.
func (fs *Findings) Len() int { return len(fs.list) }

// All returns the findings collected so far, merged but not finished. The
// slice belongs to the collector.
func (fs *Findings) All() []Finding {
	fs.sealLimit()
	return fs.list
}

// Add adds a finding, merging it with an earlier one made at the same
// place in another instance.
func (fs *Findings) Add(f Finding) {
	if f.Inst == Unresolved && fs.design != nil {
		fs.design.resolve(&f)
	}
	if f.Path == "" || f.Inst == Unresolved {
		fs.push(f, -1)
		return
	}
	key := mergeKey{f.Pos, f.Rule, f.Severity}
	if fs.index == nil {
		fs.index = map[mergeKey]int32{}
	}
	head, ok := fs.index[key]
	i := head
	for ok && i >= 0 && !sameBut(fs.list[i].Message, fs.list[i].Path, f.Message, f.Path) {
		i = fs.next[i]
	}
	if !ok || i < 0 {
		if !ok {
			head = -1
		}
		fs.index[key] = int32(len(fs.list))
		fs.push(f, head)
		return
	}
	kept := &fs.list[i]
	prev := *kept
	loser := f
	if f.Subject < prev.Subject || f.Subject == prev.Subject && f.Path < prev.Path {
		*kept, loser = f, prev
	}
	// The others: those already listed, the one not kept, and those
	// that came merged with f.
	kept.Also = prev.Also
	kept.addAlso(loser.Inst, fs.design)
	for _, in := range f.Also {
		kept.addAlso(in, fs.design)
	}
	kept.More = prev.More + f.More + 1
}

// push appends f, chained before next.
func (fs *Findings) push(f Finding, next int32) {
	n := int64(len(f.Message) + len(f.Subject) + len(f.Path))
	for _, r := range f.Related {
		n += int64(len(r.Message))
	}
	if fs.text+n > maxFindingText && f.Code != CodeExpansionLimit {
		fs.drop(f)
		return
	}
	fs.text += n
	fs.list = append(fs.list, f)
	fs.next = append(fs.next, next)
}

// drop counts a finding not kept for maxFindingText; the first makes the
// expansion-limit finding that reports them, at its place.
func (fs *Findings) drop(f Finding) {
	if fs.dropped == 0 {
		fs.limit = int32(len(fs.list))
		fs.list = append(fs.list, Finding{Diagnostic: diag.Diagnostic{Pos: f.Pos, End: f.End,
			Rule: CodeExpansionLimit.String(), Severity: diag.Error}, Code: CodeExpansionLimit, Inst: -1})
		fs.next = append(fs.next, -1)
	}
	fs.dropped++
}

// sealLimit writes the count of findings not kept into the finding that
// reports them.
func (fs *Findings) sealLimit() {
	if fs.dropped == 0 {
		return
	}
	what := "findings were"
	if fs.dropped == 1 {
		what = "finding was"
	}
	fs.list[fs.limit].Message = fmt.Sprintf("the findings of this design pass the limit of %s of text (their names carry the instance paths they are in): %d more %s not kept, this one first; nest fewer levels or use shorter names", byteCount(maxFindingText), fs.dropped, what)
}

// sameBut reports whether messages a and b are the same once the instance
// paths pa and pb (each followed by a dot) are taken out of them, without
// building either.
func sameBut(a, pa, b, pb string) bool {
	i, j := 0, 0
	for {
		i = skipPath(a, i, pa)
		j = skipPath(b, j, pb)
		if i == len(a) || j == len(b) {
			return i == len(a) && j == len(b)
		}
		if a[i] != b[j] {
			return false
		}
		i++
		j++
	}
}

// skipPath moves i past every "path." that starts at it.
func skipPath(s string, i int, path string) int {
	for len(path) > 0 && strings.HasPrefix(s[i:], path) && i+len(path) < len(s) && s[i+len(path)] == '.' {
		i += len(path) + 1
	}
	return i
}

// addAlso records instance in among the other instances of a merged
// finding, keeping the maxAlso whose paths sort first (compared without
// building them).
func (f *Finding) addAlso(in int32, d *Design) {
	if in < 0 || d == nil {
		return
	}
	i := 0
	for i < len(f.Also) && d.ComparePaths(f.Also[i], in) < 0 {
		i++
	}
	if i == maxAlso {
		return
	}
	if len(f.Also) < maxAlso {
		f.Also = append(f.Also, 0)
	}
	copy(f.Also[i+1:], f.Also[i:])
	f.Also[i] = in
}

// Finish resolves the instance of each finding added Unresolved from its
// Subject (the part or net of that name in d), merges them like the rest,
// and returns every finding with the count of merged instances in its
// message and the chain of instance statements, innermost first, in its
// related locations.
func (fs *Findings) Finish(d *Design) diag.List {
	fs.sealLimit()
	var late []int
	for i := range fs.list {
		if fs.list[i].Inst == Unresolved {
			late = append(late, i)
		}
	}
	fs.Use(d)
	if len(late) > 0 {
		all := fs.list
		fs.list, fs.next, fs.index = make([]Finding, 0, len(all)), nil, nil
		fs.text, fs.dropped = 0, 0
		for _, f := range all {
			fs.Add(f) // resolved on the way in
		}
		fs.sealLimit()
	}
	out := make(diag.List, len(fs.list))
	for i := range fs.list {
		f := &fs.list[i]
		dg := f.Diagnostic
		if f.More > 0 {
			what := "instance"
			if f.More > 1 {
				what = "instances"
			}
			dg.Message += fmt.Sprintf(" (and in %d more %s)", f.More, what)
		}
		if f.Inst >= 0 {
			dg.Related = append(dg.Related[:len(dg.Related):len(dg.Related)], d.InstanceRelated(f.Inst)...)
			for _, in := range f.Also {
				i := &d.Instances[in]
				dg.Related = append(dg.Related, diag.Related{Pos: i.Pos, End: i.End, Message: "also in " + d.ShownPath(in) + " (block " + i.Block + ")"})
			}
		}
		out[i] = dg
	}
	return out
}

// resolve finds the instance of a finding added Unresolved from its
// Subject (the part or net of that name), without building any name but
// the instance's path.
func (d *Design) resolve(f *Finding) {
	f.Inst = -1
	if in := d.InstanceOf(f.Subject); in >= 0 {
		f.Inst, f.Path = in, d.InstancePath(in)
	}
}
