package main

// diff.go: "nodal diff", what a change does to the designs: its flags,
// thresholds and the revisions it compares (diffrun.go does the work).

import (
	"fmt"
	flag "github.com/spf13/pflag"
	"io"
	"path"
	"path/filepath"
	"runtime"
	"strconv"
	"strings"

	"nodal/diag"
	"nodal/output"
	"nodal/output/review"
	"nodal/units"
)

const diffUsage = `Usage: nodal diff [flags] [BASE [HEAD]] [-- PATH ...]

Compares two revisions of the designs in the current git repository, as
a reviewer of the change needs them compared. For every design that
changed — its file, a file it includes (directly or through others) or
the nodal.toml that governs it — it lists:

  - the parts whose use of a rating moved by more than --use-change
    percentage points, worst first, with the use before and after;
  - the nets whose voltage moved by more than --voltage-change;
  - its findings, each new, fixed, updated or unchanged. Findings are
    matched by rule and by the part or net they are about (or, for one
    about neither, by its file and message), not by line, so a statement
    moved to another line keeps its findings unchanged.

Designs added and removed are listed too, and a design moved to another
path with its content unchanged as renamed (its findings matched as if it
had not moved); designs whose files did not change are counted and not
checked again. PATHs after "--" (files or
folders, relative to the current folder) limit the comparison to the
designs they name or hold; the files those designs include are followed
wherever they are.

BASE is a commit (any name git accepts); by default the merge base of
HEAD with its upstream branch, or HEAD when there is no upstream. HEAD is
a commit too; by default the work tree, or git's index with --staged.
Both revisions are read from git's object store (or the work tree),
never checked out. Only regular files that git tracks (or, in the work
tree, would track) are read.

--format text (default), markdown (a pull-request comment: a short table
per design, worst change first, with the new findings, and the rest
collapsed), json, or sarif (a SARIF 2.1.0 log whose results carry
baselineState: new, unchanged, updated, or absent for fixed findings,
whose positions are in BASE).

Exit status: 0 when no changed or added design has a finding at the
--fail-on severity in HEAD, 1 when one has, 2 for usage, configuration,
git or I/O trouble.

nodal is a design aid, not a sign-off: a part whose use rose is running
hotter, and parts past their ratings can overheat and burn. Have designs
reviewed, and follow local codes and licensed practice.

Flags:
`

// diffFlags are the settings of one comparison.
type diffFlags struct {
	format    string
	staged    bool
	useChange float64
	volts     string
	failOn    string
	config    string
	jobs      int
	limits    limits
	scope     []string // repository paths the designs must lie at or below; nil: all
}

// inScope reports whether a design lies at or below one of the paths.
func (df *diffFlags) inScope(p string) bool {
	if len(df.scope) == 0 {
		return true
	}
	for _, s := range df.scope {
		if s == "." || p == s || strings.HasPrefix(p, s+"/") {
			return true
		}
	}
	return false
}

func cmdDiff(args []string, stdout, stderr io.Writer) int {
	var paths []string
	for i, a := range args {
		if a == "--" {
			args, paths = args[:i], args[i+1:]
			break
		}
	}
	fl := flag.NewFlagSet("diff", flag.ContinueOnError)
	fl.SetOutput(stderr)
	var df diffFlags
	fl.StringVar(&df.format, "format", "text", "output `form`: text, markdown, json or sarif")
	fl.BoolVar(&df.staged, "staged", false, "compare BASE with git's index instead of the work tree")
	fl.Float64Var(&df.useChange, "use-change", 10, "list parts whose use of a rating moved by more than these percentage `points`")
	fl.StringVar(&df.volts, "voltage-change", "5%", "list nets whose voltage moved by more than this: a `percentage` of the larger value, or a voltage such as 100mV")
	fl.StringVar(&df.failOn, "fail-on", "error", "lowest `severity` of a finding in HEAD that makes the exit status 1: error, warning or note")
	fl.StringVar(&df.config, "config", "", "use this nodal.toml `file` for every design in both revisions instead of each revision's own")
	fl.IntVar(&df.jobs, "jobs", runtime.GOMAXPROCS(0), "how many designs to check at once")
	df.limits.flags(fl)
	if status, done := parseFlags(fl, args, diffUsage, stdout, stderr); done {
		return status
	}
	switch df.format {
	case "text", "markdown", "json", "sarif":
	default:
		return usageErr(stderr, "--format %q: want text, markdown, json or sarif", df.format)
	}
	failOn, ok := diag.ParseSeverity(df.failOn)
	if !ok || failOn == diag.Off {
		return usageErr(stderr, "--fail-on %q: want error, warning or note", df.failOn)
	}
	th, err := thresholds(df.useChange, df.volts)
	if err != nil {
		return usageErr(stderr, "%v", err)
	}
	if df.limits.maxDepth < 0 || df.limits.maxParts < 0 || df.limits.fileMiB < 0 {
		return usageErr(stderr, "--max-depth, --max-parts and --max-file-mib must be at least 1")
	}
	if df.jobs < 1 {
		df.jobs = 1
	}
	revs := fl.Args()
	if len(revs) > 2 {
		return usageErr(stderr, "diff takes at most two revisions, BASE and HEAD; got %d", len(revs))
	}
	if df.staged && len(revs) == 2 {
		return usageErr(stderr, "--staged compares with the index; it cannot be combined with a HEAD revision")
	}

	root, prefix, err := gitRoot(".")
	if err != nil {
		return usageErr(stderr, "diff compares git revisions: %v", err)
	}
	var scope []string
	for _, p := range paths {
		rp := path.Clean(prefix + filepath.ToSlash(p))
		if rp == ".." || strings.HasPrefix(rp, "../") || filepath.IsAbs(p) {
			return usageErr(stderr, "%s: outside the repository", output.TextSafe(p))
		}
		scope = append(scope, rp)
	}
	df.scope = scope
	cat, err := openCatFile(root)
	if err != nil {
		return usageErr(stderr, "%v", err)
	}
	defer cat.Close()
	base, err := baseTree(root, revs, cat)
	if err != nil {
		return usageErr(stderr, "BASE: %v", err)
	}
	var head *gitTree
	switch {
	case len(revs) == 2:
		head, err = commitTreeOf(root, revs[1], cat)
	case df.staged:
		head, err = listIndex(root, cat)
	default:
		head, err = listWork(root)
	}
	if err != nil {
		return usageErr(stderr, "HEAD: %v", err)
	}

	cmp, status := compareTrees(base, head, df, th, stderr)
	if status == 2 && cmp == nil {
		return 2
	}
	switch df.format {
	case "text":
		err = cmp.WriteText(stdout)
	case "markdown":
		err = cmp.WriteMarkdown(stdout)
	case "json":
		err = cmp.WriteJSON(stdout)
	case "sarif":
		err = cmp.WriteSARIF(stdout, output.Options{Version: version, Root: root, Dir: root})
	}
	if err != nil {
		return usageErr(stderr, "%v", err)
	}
	if status == 0 {
		for i := range cmp.Designs {
			for _, fc := range cmp.Designs[i].Findings {
				if fc.State != review.Absent && fc.Finding.Severity >= failOn {
					status = 1
				}
			}
		}
	}
	return status
}

// thresholds reads --use-change and --voltage-change.
func thresholds(points float64, volts string) (review.Thresholds, error) {
	th := review.Thresholds{Use: points / 100}
	if points < 0 || points != points {
		return th, fmt.Errorf("--use-change %v: want a number of percentage points, 0 or more", points)
	}
	v := strings.TrimSpace(volts)
	if p, ok := strings.CutSuffix(v, "%"); ok {
		f, err := strconv.ParseFloat(strings.TrimSpace(p), 64)
		if err != nil || f < 0 {
			return th, fmt.Errorf("--voltage-change %q: want a percentage such as 5%% or a voltage such as 100mV", volts)
		}
		th.Relative = f / 100
		return th, nil
	}
	i := strings.IndexFunc(v, func(r rune) bool { return !strings.ContainsRune("0123456789.+-eE", r) })
	num, unit := v, ""
	if i >= 0 {
		num, unit = v[:i], strings.TrimSpace(v[i:])
	}
	q, err := units.Parse(num, unit)
	if err != nil || q.Dim != units.Voltage || q.Value <= 0 {
		return th, fmt.Errorf("--voltage-change %q: want a percentage such as 5%% or a voltage such as 100mV", volts)
	}
	th.Volts = q.Value
	return th, nil
}

// baseTree resolves BASE: the named commit, or the merge base of HEAD
// with its upstream, or HEAD, or nothing in a repository without commits.
func baseTree(root string, revs []string, cat *catFile) (*gitTree, error) {
	if len(revs) > 0 {
		return commitTreeOf(root, revs[0], cat)
	}
	if _, err := gitOutput(root, "rev-parse", "--verify", "--quiet", "HEAD^{commit}"); err != nil {
		return &gitTree{kind: emptyTree, label: "nothing (no commits yet)", root: root, ids: map[string]string{}}, nil
	}
	if up, err := gitOutput(root, "rev-parse", "--abbrev-ref", "--symbolic-full-name", "@{upstream}"); err == nil {
		upstream := strings.TrimSpace(string(up))
		if mb, err := gitOutput(root, "merge-base", "HEAD", "@{upstream}"); err == nil {
			id := strings.TrimSpace(string(mb))
			return listCommit(root, id, fmt.Sprintf("the merge base with %s (%s)", upstream, short(id)), cat)
		}
	}
	return commitTreeOf(root, "HEAD", cat)
}

// commitTreeOf lists the commit a name resolves to.
func commitTreeOf(root, rev string, cat *catFile) (*gitTree, error) {
	if strings.HasPrefix(rev, "-") {
		return nil, fmt.Errorf("%q is not a revision", rev)
	}
	out, err := gitOutput(root, "rev-parse", "--verify", "--quiet", "--end-of-options", rev+"^{commit}")
	if err != nil {
		return nil, fmt.Errorf("%q names no commit", rev)
	}
	id := strings.TrimSpace(string(out))
	label := rev
	if !strings.HasPrefix(id, rev) {
		label = fmt.Sprintf("%s (%s)", rev, short(id))
	} else {
		label = short(id)
	}
	return listCommit(root, id, label, cat)
}

func short(id string) string {
	if len(id) > 12 {
		return id[:12]
	}
	return id
}
