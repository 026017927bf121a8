package review

// findings.go: pairing the findings of two revisions of a design.

import (
	"sort"

	"nodal/output"
)

// matchFindings pairs the findings of the earlier and the later revision
// (see the package documentation) and returns them new, updated, absent,
// unchanged, worst first and then in line order within each state.
func matchFindings(base, head []output.Finding) []FindingChange {
	base, head = sorted(base), sorted(head)
	byKey := map[string][]int{}
	var keys []string
	for i := range base {
		k := base[i].Key()
		if _, ok := byKey[k]; !ok {
			keys = append(keys, k)
		}
		byKey[k] = append(byKey[k], i)
	}
	usedBase := make([]bool, len(base))
	pairOf := make([]int, len(head)) // index into base, or -1
	for i := range pairOf {
		pairOf[i] = -1
	}
	headByKey := map[string][]int{}
	for i := range head {
		k := head[i].Key()
		headByKey[k] = append(headByKey[k], i)
	}
	// Three passes: messages equal but for line references, equal but
	// for numbers, then any finding of the same key, each in line order.
	same := []func(a, b *output.Finding) bool{
		func(a, b *output.Finding) bool { return output.Lineless(a.Message) == output.Lineless(b.Message) },
		func(a, b *output.Finding) bool { return output.Shape(a.Message) == output.Shape(b.Message) },
		func(a, b *output.Finding) bool { return true },
	}
	for _, eq := range same {
		for k, hs := range headByKey {
			for _, h := range hs {
				if pairOf[h] >= 0 {
					continue
				}
				for _, b := range byKey[k] {
					if !usedBase[b] && eq(&base[b], &head[h]) {
						usedBase[b], pairOf[h] = true, b
						break
					}
				}
			}
		}
	}
	var out []FindingChange
	for h := range head {
		fc := FindingChange{State: New, Finding: head[h]}
		if b := pairOf[h]; b >= 0 {
			before := base[b]
			fc.Before = &before
			fc.State = Updated
			if before.Severity == head[h].Severity && output.Lineless(before.Message) == output.Lineless(head[h].Message) {
				fc.State = Unchanged
			}
		}
		fc.Finding.Baseline = string(fc.State)
		out = append(out, fc)
	}
	for b := range base {
		if !usedBase[b] {
			f := base[b]
			f.Baseline = string(Absent)
			out = append(out, FindingChange{State: Absent, Finding: f})
		}
	}
	rank := map[State]int{New: 0, Updated: 1, Absent: 2, Unchanged: 3}
	sort.SliceStable(out, func(i, j int) bool {
		a, b := &out[i], &out[j]
		if rank[a.State] != rank[b.State] {
			return rank[a.State] < rank[b.State]
		}
		return a.Finding.Severity > b.Finding.Severity
	})
	return out
}

// sorted returns a copy of fs in line order.
func sorted(fs []output.Finding) []output.Finding {
	out := append([]output.Finding(nil), fs...)
	output.Sort(out)
	return out
}
