package main

// diffrun.go: the work of "nodal diff" once the revisions are known —
// which designs differ (a design's signature: the blob ids of every file
// its check reads), checking each in both revisions on every core, and
// handing the results to package output/review to compare.

import (
	"errors"
	"fmt"
	"io"
	"path"
	"path/filepath"
	"sort"
	"strings"
	"sync"

	"nodal/check"
	"nodal/circuit"
	"nodal/output"
	"nodal/output/report"
	"nodal/output/review"
	"nodal/solve"
)

// isDesignPath reports whether a repository path is a .nodal file.
func isDesignPath(p string) bool { return strings.HasSuffix(p, ".nodal") }

// signature lists every file a design's check reads in a revision — the
// design, the files it includes directly or through others, and every
// nodal.toml that may govern it — with their blob ids; two revisions of a
// design with equal signatures check alike.
func signature(t *gitTree, p string, forcedConfig bool) string {
	var b strings.Builder
	seen := map[string]bool{}
	queue := []string{p}
	for len(queue) > 0 {
		f := queue[0]
		queue = queue[1:]
		if seen[f] {
			continue
		}
		seen[f] = true
		id := t.id(f)
		fmt.Fprintf(&b, "%s %s\n", f, id)
		if id == "" {
			continue
		}
		src, err := t.ReadFile(f)
		if err != nil {
			continue
		}
		for _, inc := range check.Includes(f, src) {
			if c := clean(inc); c != "" {
				queue = append(queue, c)
			} else {
				fmt.Fprintf(&b, "%s outside\n", filepath.ToSlash(inc))
			}
		}
	}
	if !forcedConfig {
		for dir := path.Dir(p); ; dir = path.Dir(dir) {
			c := path.Join(dir, "nodal.toml")
			fmt.Fprintf(&b, "%s %s\n", c, t.id(c))
			if dir == "." || dir == "/" {
				break
			}
		}
	}
	return b.String()
}

// compareTrees checks every design that differs between the revisions
// and compares the results. The status is 2 when a design could not be
// checked (said on stderr), else 0.
func compareTrees(base, head *gitTree, df diffFlags, th review.Thresholds, stderr io.Writer) (*review.Comparison, int) {
	cmp := &review.Comparison{Base: base.label, Head: head.label, Thresholds: th}
	inBase, inHead := map[string]bool{}, map[string]bool{}
	for _, p := range base.paths(isDesignPath) {
		inBase[p] = true
	}
	for _, p := range head.paths(isDesignPath) {
		if head.kind != workTree || head.id(p) != "" {
			inHead[p] = true
		}
	}
	var all []string
	for p := range inBase {
		if df.inScope(p) {
			all = append(all, p)
		}
	}
	for p := range inHead {
		if !inBase[p] && df.inScope(p) {
			all = append(all, p)
		}
	}
	sort.Strings(all)
	for _, sc := range df.scope {
		found := false
		for _, p := range all {
			if sc == "." || p == sc || strings.HasPrefix(p, sc+"/") {
				found = true
				break
			}
		}
		if !found {
			fmt.Fprintf(stderr, "nodal: %s: no .nodal file there in either revision\n", output.TextSafe(sc))
			return nil, 2
		}
	}

	type job struct {
		path       string
		from       string // the earlier path of a renamed design
		base, head bool
	}
	// A design removed from one path and added at another with the same
	// content was renamed.
	removedByID := map[string][]string{}
	for _, p := range all {
		if inBase[p] && !inHead[p] {
			id := base.id(p)
			removedByID[id] = append(removedByID[id], p)
		}
	}
	renamedFrom := map[string]string{}
	movedAway := map[string]bool{}
	for _, p := range all {
		if !inBase[p] && inHead[p] {
			if rs := removedByID[head.id(p)]; len(rs) > 0 && head.id(p) != "" {
				renamedFrom[p], movedAway[rs[0]] = rs[0], true
				removedByID[head.id(p)] = rs[1:]
			}
		}
	}
	var jobs []job
	for _, p := range all {
		switch {
		case movedAway[p]:
			continue // compared at its new path
		case renamedFrom[p] != "":
			jobs = append(jobs, job{path: p, from: renamedFrom[p], base: true, head: true})
			continue
		case inBase[p] && inHead[p] && signature(base, p, df.config != "") == signature(head, p, df.config != ""):
			cmp.Unchanged++
			continue
		}
		jobs = append(jobs, job{path: p, base: inBase[p], head: inHead[p]})
	}

	baseLoader := newRevisionConfigLoader(base, df.config)
	headLoader := newRevisionConfigLoader(head, df.config)
	type result struct {
		design   review.Design
		skipped  bool
		problems []string
		notes    []string
	}
	results := make([]result, len(jobs))
	var wg sync.WaitGroup
	next := make(chan int)
	for w := 0; w < min(df.jobs, max(len(jobs), 1)); w++ {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for i := range next {
				j := jobs[i]
				var sides [2]*review.Side
				r := &results[i]
				for k, on := range []bool{j.base, j.head} {
					if !on {
						continue
					}
					t, l := base, baseLoader
					if k == 1 {
						t, l = head, headLoader
					}
					p := j.path
					if k == 0 && j.from != "" {
						p = j.from
					}
					side, skipped, err := checkInTree(t, l, p, df.limits)
					switch {
					case err != nil && k == 0:
						// BASE is history: what cannot be checked there is
						// said on the design, and HEAD is compared with
						// nothing.
						sides[k] = &review.Side{Error: output.TextSafe(err.Error())}
						r.notes = append(r.notes, fmt.Sprintf("nodal: %s in %s: note: not checked: %s", output.TextSafe(p), output.TextSafe(t.label), output.TextSafe(err.Error())))
					case err != nil:
						r.problems = append(r.problems, fmt.Sprintf("nodal: %s in %s: %s", output.TextSafe(p), output.TextSafe(t.label), output.TextSafe(err.Error())))
					case skipped:
						r.skipped = true
					default:
						sides[k] = side
					}
				}
				switch {
				case len(r.problems) > 0 || r.skipped:
				case j.from != "" && sides[0] != nil:
					r.design = review.CompareRenamed(j.from, j.path, sides[0], sides[1], th)
				default:
					r.design = review.Compare(j.path, sides[0], sides[1], th)
				}
			}
		}()
	}
	for i := range jobs {
		next <- i
	}
	close(next)
	wg.Wait()

	status := 0
	for _, r := range results {
		for _, n := range r.notes {
			fmt.Fprintln(stderr, n)
		}
		for _, p := range r.problems {
			fmt.Fprintln(stderr, p)
			status = 2
		}
		if len(r.problems) == 0 && !r.skipped {
			cmp.Designs = append(cmp.Designs, r.design)
		}
	}
	cmp.Sort()
	cmp.Sources = sourceOf(head)
	cmp.BaseSources = sourceOf(base)
	return cmp, status
}

// sourceOf returns a revision's file texts for SARIF's columns.
func sourceOf(t *gitTree) func(string) []byte {
	return func(name string) []byte {
		b, err := t.ReadFile(name)
		if err != nil {
			return nil
		}
		return b
	}
}

// checkInTree checks one design as a revision holds it. skipped is true
// when its nodal.toml skips it.
func checkInTree(t *gitTree, loader *configLoader, p string, lim limits) (side *review.Side, skipped bool, err error) {
	defer func() {
		if r := recover(); r != nil {
			side, err = nil, fmt.Errorf("internal error: %v (please report it with the file that caused it)", r)
		}
	}()
	cfg, err := loader.forFile(p)
	if err != nil {
		var errs []string
		for _, line := range strings.Split(strings.TrimSpace(configErrorText(err)), "\n") {
			errs = append(errs, line)
		}
		return nil, false, errors.New(strings.Join(errs, "; "))
	}
	if cfg.Skipped(p) {
		return nil, true, nil
	}
	lim = lim.forConfig(cfg)
	read := t.reader(lim.fileMiB << 20)
	src, err := read(p)
	if err != nil {
		return nil, false, err
	}
	rc := withAmbient(loader.rulesConfig(cfg), lim.ambient)
	res, err := checkSource(p, src, &check.Options{Config: rc, ReadFile: read, Identify: cleanIdentity, MaxDepth: lim.maxDepth, MaxParts: lim.maxParts})
	if err != nil {
		return nil, false, fmt.Errorf("internal error: %v", err)
	}
	side = &review.Side{Findings: output.FromDiags(res.Fset, res.Diags)}
	for i := range side.Findings {
		side.Findings[i].Design = p
	}
	if s := res.Solved; s != nil && s.OP != nil && res.Build != nil && res.Build.Design != nil && res.Build.Design.NameBytes() > maxListedNames {
		side.NoOP = tooManyNames(res.Build.Design.NameBytes())
	} else if s != nil && s.OP != nil && res.Build != nil && res.Build.Design != nil {
		side.Table = report.NewAt(p, res.Build.Design, s.OP, rc.Derating, s.Ambient)
		side.WorstUse, side.NetRange = worstOf(res)
	} else {
		side.NoOP = noOperatingPoint(res)
	}
	return side, false, nil
}

// noOperatingPoint says briefly why a checked design has no operating
// point.
func noOperatingPoint(res *check.Result) string {
	var se *solve.Error
	switch s := res.Solved; {
	case s != nil && errors.As(s.Skipped, &se):
		return "too large for this version's solver"
	case s != nil && s.Err != nil:
		return "the solver found no operating point"
	case s == nil:
		return "not solved"
	}
	if e, w := count(res.Diags); e+w > 0 {
		return "not solved: the wiring rules reject it"
	}
	if res.Build == nil || res.Build.Design == nil || !res.Build.Design.HasParts() {
		return "" // no parts, as in a library of blocks: nothing to rate
	}
	return "no operating point"
}

// configErrorText is printConfigError as a string.
func configErrorText(err error) string {
	var b strings.Builder
	printConfigError(&b, err)
	return b.String()
}

// worstOf reads the worst case over tolerances and temperature of a
// checked design, by part and net name; nil maps when it was not judged.
func worstOf(res *check.Result) (uses map[string]float64, ranges map[string][2]float64) {
	if res.Worst == nil || res.Worst.R == nil || res.Build == nil || res.Build.Design == nil {
		return nil, nil
	}
	d, r := res.Build.Design, res.Worst.R
	uses = map[string]float64{}
	for i, cases := range r.Worst {
		if i >= len(d.Parts) {
			break
		}
		name := ""
		for _, c := range cases {
			if name == "" {
				name = d.PartName(circuit.PartID(i))
			}
			if c.Frac > uses[name] {
				uses[name] = c.Frac
			}
		}
	}
	ranges = map[string][2]float64{}
	for i := range d.Nets {
		if i < len(r.NetLow) && i < len(r.NetHigh) && d.Nets[i].Pins > 0 {
			ranges[d.NetName(circuit.NetID(i))] = [2]float64{r.NetLow[i], r.NetHigh[i]}
		}
	}
	return uses, ranges
}
