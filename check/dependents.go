package check

// dependents.go: the reverse include graph. A library of blocks is checked
// through the designs that include it; when it changes, they change.

import "sort"

// Dependents returns the files among others that include one of targets,
// directly or through other files, sorted. includes returns a file's
// includes as Includes resolves them; it is called once for each file of
// others. Files of targets are not followed: whatever they include, they
// are themselves among the targets. Include cycles are harmless.
func Dependents(targets, others []string, includes func(string) []string) []string {
	isTarget := make(map[string]bool, len(targets))
	for _, t := range targets {
		isTarget[t] = true
	}
	// includedBy[f] lists the files of others that include f.
	includedBy := map[string][]string{}
	for _, o := range others {
		if isTarget[o] {
			continue
		}
		for _, inc := range includes(o) {
			includedBy[inc] = append(includedBy[inc], o)
		}
	}
	seen := map[string]bool{}
	queue := append([]string(nil), targets...)
	var out []string
	for len(queue) > 0 {
		f := queue[0]
		queue = queue[1:]
		for _, by := range includedBy[f] {
			if seen[by] || isTarget[by] {
				continue
			}
			seen[by] = true
			out = append(out, by)
			queue = append(queue, by)
		}
	}
	sort.Strings(out)
	return out
}
