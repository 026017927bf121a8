package main

import (
	"errors"
	"fmt"
	flag "github.com/spf13/pflag"
	"io"
	"io/fs"
	"os"
	"path"
	"path/filepath"
	"runtime"
	"sort"
	"strings"
	"sync"

	"github.com/mattn/go-isatty"

	"nodal/check"
	"nodal/config"
	"nodal/diag"
	"nodal/input"
	"nodal/output"
)

const checkUsage = `Usage: nodal check [flags] [PATH ...]

Checks each named .nodal file, and every *.nodal file in each named folder
and its subfolders (default: the current folder; folders whose names start
with "." are skipped). "-" reads a design from standard input, named
<stdin> in the output. Files are checked independently, on every core, and one broken file
does not stop the others.

Flags may come before or after the paths; after "--" every argument is a
path. A named file that a skip glob of nodal.toml matches is not checked,
and a line on standard error says so; files found by walking a folder are
skipped by the globs quietly.

Reads stay below the repository's top level (or the named file's folder
outside a repository); --root replaces that with the folders given, and
nodal.toml's roots add library folders. A link that leads outside is
refused when named and skipped with a note when found by a walk. Only
regular files are read, each up to --max-file-mib (docs/security.md).

Named files that do not end in .nodal are skipped quietly, so the file list
a pre-commit hook passes can be handed over as it is. A named path that
does not exist is skipped quietly when git knows it (it is tracked in HEAD
or the index, so the change deletes it); otherwise it is a typo and an
error (exit 2).

A change reaches the designs that include the changed file: every design
that includes a named (or, with --staged, staged) file, directly or
through other files, is checked too, and so is every design below the
folder of a named or staged nodal.toml. A deleted library brings in its
includers the same way, whether it is named or not. The include graph is
read from git's index with --staged and from the work tree otherwise,
over the files git tracks or would track; outside a git repository only
the named files are checked.

The text form is one finding per line, the form editors parse:

  path:line:col: severity: message [rule-id]

sorted by path, line and column. Lines and columns count from 1; columns
count bytes. Severities are error, warning and note; "nodal rules" lists
the rules. The severity is coloured only when standard output is a
terminal; --no-color or a non-empty NO_COLOR environment variable turns
colour off. A closing summary line (counts by severity, files checked) goes
to standard error. --format json, sarif and markdown write a JSON document, a
SARIF 2.1.0 log and a pull-request summary instead.

Settings come from the nodal.toml in each file's folder or the nearest one
above it (see "nodal config"). A comment
  # nodal: accept RULE because reason
at the end of a statement's line, or alone on the line above it, accepts
that rule's findings on the statement (several rule ids: RULE, RULE).

A design too large for this version's solver is not solved; a note on
standard error says so, as its rating rules did not run. "nodal report
FILE" prints one design's operating point as a table.

Exit status: 0 when no finding reaches the --fail-on severity, 1 when one
does, 2 for usage, configuration or I/O trouble.

Flags:
`

type checkFlags struct {
	noColor   bool
	format    string
	config    string
	failOn    string
	staged    bool
	stdinName string
	jobs      int
	limits    limits
	roots     rootList
}

// limits bound the expansion of block instances and the size of a file.
// Zero: the value from the file's nodal.toml.
type limits struct {
	maxDepth int
	maxParts int64
	fileMiB  int64
	ambient  ambientFlag
}

// flags registers --max-depth, --max-parts and --max-file-mib, shared by
// check and report.
func (l *limits) flags(fl *flag.FlagSet) {
	fl.IntVar(&l.maxDepth, "max-depth", 0, "refuse designs whose block instances nest deeper than this (default: nodal.toml's limits.depth, else 64)")
	fl.Int64Var(&l.maxParts, "max-parts", 0, "refuse designs that expand to more parts and instances than this (default: nodal.toml's limits.parts, else 10000000)")
	fl.Int64Var(&l.fileMiB, "max-file-mib", 0, "refuse any input file, and standard input, larger than this many MiB (default: nodal.toml's limits.file-mib, else 512)")
	fl.Var(&l.ambient, "ambient", "judge every design at this ambient `temperature` in °C, or over a range (\"0 °C to 50 °C\"), instead of its own")
}

// valid reports whether the limits given are usable.
func (l *limits) valid() bool { return l.maxDepth >= 0 && l.maxParts >= 0 && l.fileMiB >= 0 }

// forConfig returns the limits in effect for a file: a flag wins over
// nodal.toml, which wins over the default.
func (l limits) forConfig(c *config.Config) limits {
	if l.maxDepth == 0 {
		l.maxDepth = c.Depth
	}
	if l.maxParts == 0 {
		l.maxParts = int64(c.Parts)
	}
	if l.fileMiB == 0 {
		l.fileMiB = int64(c.FileMiB)
	}
	return l
}

// rootList is the repeatable --root flag.
type rootList []string

func (r *rootList) String() string     { return strings.Join(*r, ",") }
func (r *rootList) Set(v string) error { *r = append(*r, v); return nil }
func (r *rootList) Type() string       { return "folder" }

// parseFlags parses args and handles --help (usage to stdout, status 0)
// and bad flags (usage to stderr, status 2). done reports that the command
// should return status now.
func parseFlags(fl *flag.FlagSet, args []string, usage string, stdout, stderr io.Writer) (status int, done bool) {
	fl.Usage = func() {} // printed here: to stdout for --help, else stderr
	err := fl.Parse(args)
	if err == nil {
		return 0, false
	}
	out, status := stderr, 2
	if errors.Is(err, flag.ErrHelp) {
		out, status = stdout, 0
	}
	fl.SetOutput(out)
	fmt.Fprint(out, usage)
	fl.PrintDefaults()
	return status, true
}

// usageErr reports a usage mistake and returns exit status 2.
func usageErr(stderr io.Writer, format string, a ...any) int {
	fmt.Fprintf(stderr, "nodal: "+format+"\n", a...)
	return 2
}

// unit is one file to check.
type unit struct {
	name     string // as messages name it
	stdin    bool
	cfg      *config.Config
	limits   limits // in effect for this file
	read     func(name string) ([]byte, error)
	identify func(name string) (string, error)
}

func cmdCheck(args []string, stdin io.Reader, stdout, stderr io.Writer) int {
	fl := flag.NewFlagSet("check", flag.ContinueOnError)
	fl.SetOutput(stderr)
	var cf checkFlags
	fl.BoolVar(&cf.noColor, "no-color", false, "never colour the output (also when NO_COLOR is set; colour is only used on a terminal)")
	fl.StringVar(&cf.format, "format", "text", "output `form`: text, json, sarif or markdown")
	fl.StringVar(&cf.config, "config", "", "use this nodal.toml `file` for every checked file instead of searching")
	fl.StringVar(&cf.failOn, "fail-on", "error", "lowest `severity` that makes the exit status 1: error, warning or note")
	fl.BoolVar(&cf.staged, "staged", false, "check the content staged in git's index: the named files, or every staged .nodal file")
	fl.StringVar(&cf.stdinName, "stdin-filename", "", "with \"-\": report, find nodal.toml and resolve includes as if standard input were this `path`")
	fl.IntVar(&cf.jobs, "jobs", runtime.GOMAXPROCS(0), "how many files to check at once")
	fl.Var(&cf.roots, "root", "read designs and includes only below this `folder` (repeatable); replaces the default, the repository's top level, and nodal.toml's roots")
	cf.limits.flags(fl)
	if status, done := parseFlags(fl, args, checkUsage, stdout, stderr); done {
		return status
	}
	if !contains(output.Formats, cf.format) {
		return usageErr(stderr, "--format %q: want text, json, sarif or markdown", cf.format)
	}
	failOn, ok := diag.ParseSeverity(cf.failOn)
	if !ok || failOn == diag.Off {
		return usageErr(stderr, "--fail-on %q: want error, warning or note", cf.failOn)
	}
	if cf.jobs < 1 {
		cf.jobs = 1
	}
	paths := fl.Args()
	if cf.stdinName != "" && len(paths) == 0 {
		paths = []string{"-"}
	}
	if !cf.limits.valid() {
		return usageErr(stderr, "--max-depth, --max-parts and --max-file-mib must be at least 1")
	}
	if cf.stdinName != "" && !contains(paths, "-") {
		return usageErr(stderr, "--stdin-filename needs \"-\" among the paths")
	}
	if cf.staged && contains(paths, "-") {
		return usageErr(stderr, "--staged reads git's index; it cannot be combined with \"-\"")
	}

	status := 0
	cwd, _ := os.Getwd()
	var names []string
	var walked map[string]bool
	root := ""
	var idx *index
	if cf.staged {
		r, prefix, err := gitRoot(".")
		if err != nil {
			return usageErr(stderr, "--staged: %v", err)
		}
		root = r
		if idx, err = openIndex(root); err != nil {
			return usageErr(stderr, "--staged: %v", err)
		}
		defer idx.Close()
		names, status = stagedNames(root, prefix, paths, stderr)
		if names, err = stagedDependents(root, prefix, names, paths, stderr); err != nil {
			return usageErr(stderr, "--staged: %v", err)
		}
	} else {
		if len(paths) == 0 {
			paths = []string{"."}
		}
		names, walked, status = collect(paths, stderr)
		names = worktreeDependents(names, paths, stderr)
	}

	// Each file's configuration: --config, or the nearest nodal.toml.
	loader := newConfigLoader(idx, cf.config)
	rds := newReaders(cf.roots, cf.limits.fileMiB<<20)
	var units []unit
	for _, n := range names {
		u := unit{name: n}
		where := n
		if n == "-" {
			u.stdin = true
			u.name = "<stdin>"
			where = filepath.Join(".", "stdin")
			if cf.stdinName != "" {
				u.name = cf.stdinName
				where = cf.stdinName
			}
		}
		cfg, err := loader.forFile(where)
		if err != nil {
			printConfigError(stderr, err)
			return 2
		}
		if g := cfg.SkippedBy(where); g != "" {
			if !walked[n] {
				fmt.Fprintf(stderr, "nodal: %s: skipped: it matches the skip glob %q of %s\n", output.TextSafe(u.name), g, output.TextSafe(cfg.File))
			}
			continue
		}
		u.cfg = cfg
		u.limits = cf.limits.forConfig(cfg)
		if idx != nil {
			u.read, u.identify = idx.reader(u.limits.fileMiB<<20), cleanIdentity
		} else {
			r, err := rds.forFile(where, cfg.Roots, int(u.limits.fileMiB))
			if err != nil {
				fmt.Fprintln(stderr, fileError(u.name, err))
				status = 2
				continue
			}
			u.read, u.identify = r.ReadFile, r.Resolve
			if !u.stdin {
				if _, err := r.Resolve(n); errors.Is(err, input.ErrOutside) && walked[n] {
					fmt.Fprintf(stderr, "nodal: %s: note: skipped: a link that leads outside the folders nodal reads\n", output.TextSafe(n))
					continue
				}
			}
		}
		units = append(units, u)
	}

	var stdinSrc []byte
	for _, u := range units {
		if u.stdin {
			b, err := input.ReadAll(stdin, u.limits.fileMiB<<20)
			if err != nil {
				return usageErr(stderr, "reading standard input: %v", err)
			}
			stdinSrc = b
			break
		}
	}

	// Files are admitted by size: the bytes being checked at once stay
	// within one file's cap, so several large designs do not each take
	// a worker's share of memory at the same time.
	adm := newAdmission(max(cf.limits.fileMiB<<20, config.DefaultFileMiB<<20))
	results := make([]fileResult, len(units))
	var wg sync.WaitGroup
	next := make(chan int)
	for w := 0; w < min(cf.jobs, max(len(units), 1)); w++ {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for i := range next {
				n := int64(len(stdinSrc))
				if !units[i].stdin && idx == nil {
					n = sizeOf(units[i].name)
				}
				adm.acquire(n)
				results[i] = checkOne(units[i], stdinSrc, loader)
				adm.release(n)
			}
		}()
	}
	for i := range units {
		next <- i
	}
	close(next)
	wg.Wait()

	rep := &output.Report{}
	sources := map[string][]byte{}
	for _, r := range results {
		if r.err != "" {
			fmt.Fprintln(stderr, r.err)
			status = 2
		}
		if r.note != "" {
			fmt.Fprintln(stderr, r.note)
		}
		if r.checked {
			rep.Files++
		}
		rep.Findings = append(rep.Findings, r.findings...)
		for k, v := range r.sources {
			sources[k] = v
		}
	}
	rep.Source = func(name string) []byte { return sources[name] }
	opt := output.Options{Version: version, Dir: cwd, Root: root}
	if cf.format == "text" {
		opt.Color = !cf.noColor && os.Getenv("NO_COLOR") == "" && isTerminal(stdout)
	}
	if cf.format == "sarif" {
		if root != "" {
			opt.Dir = root // staged names are repository paths
		} else if r, _, err := worktreeRoot(); err == nil {
			opt.Root = r
		} else {
			opt.Root = cwd
		}
	}
	if err := output.Write(stdout, cf.format, rep, opt); err != nil {
		return usageErr(stderr, "%v", err)
	}
	fmt.Fprintln(stderr, rep.Summary())
	if status == 0 {
		for _, f := range rep.Findings {
			if f.Severity >= failOn {
				status = 1
				break
			}
		}
	}
	return status
}

type fileResult struct {
	checked  bool
	findings []output.Finding
	sources  map[string][]byte
	err      string
	note     string // said on standard error, without changing the exit status
}

// checkOne checks one file. A panic anywhere in the pipeline becomes an
// internal error for that file (exit 2), so that one file that trips a bug
// neither takes the others down nor prints a stack trace.
func checkOne(u unit, stdinSrc []byte, loader *configLoader) (out fileResult) {
	defer func() {
		if r := recover(); r != nil {
			out = fileResult{checked: true, err: fmt.Sprintf("nodal: %s: internal error: %v (please report it with the file that caused it)", output.TextSafe(u.name), r)}
		}
	}()
	var src []byte
	var err error
	if u.stdin {
		src = stdinSrc
	} else {
		src, err = u.read(u.name)
	}
	if err != nil {
		return fileResult{err: fileError(u.name, err)}
	}
	// Includes are read the same way as the file: from disk below the
	// roots, or from git's index with --staged.
	lim := u.limits
	opts := &check.Options{Config: withAmbient(loader.rulesConfig(u.cfg), lim.ambient), ReadFile: u.read, Identify: u.identify, MaxDepth: lim.maxDepth, MaxParts: lim.maxParts}
	res, err := checkSource(u.name, src, opts)
	out = fileResult{checked: true, sources: map[string][]byte{u.name: src}}
	if res != nil {
		for _, f := range res.Build.Files {
			out.sources[f.File.Name()] = f.Src
		}
	}
	if err != nil {
		out.err = fmt.Sprintf("nodal: %s: internal error: %v", output.TextSafe(u.name), err)
	}
	if res != nil {
		out.findings = output.FromDiags(res.Fset, res.Diags)
		for i := range out.findings {
			out.findings[i].Design = u.name
		}
		if s := res.Solved; s != nil && s.Skipped != nil {
			out.note = fmt.Sprintf("nodal: %s: note: the DC operating point was not solved, so the rating rules did not run: %v", output.TextSafe(u.name), s.Skipped)
		}
	}
	return out
}

// checkSource is check.Source; tests replace it to reach the recovery path.
var checkSource = check.Source

func sortedKeys(m map[string]bool) []string {
	out := make([]string, 0, len(m))
	for k := range m {
		out = append(out, k)
	}
	sort.Strings(out)
	return out
}

func contains(list []string, s string) bool {
	for _, x := range list {
		if x == s {
			return true
		}
	}
	return false
}

func isTerminal(w io.Writer) bool {
	f, ok := w.(*os.File)
	return ok && (isatty.IsTerminal(f.Fd()) || isatty.IsCygwinTerminal(f.Fd()))
}

// collect expands folders into their .nodal files, sorted, each once.
// Named files that are not .nodal files are skipped; named paths that do
// not exist are skipped when git knows them (deleted by the change being
// checked) and reported otherwise. A named link to a folder is walked like
// the folder. walked holds the files found by walking rather than named.
func collect(paths []string, stderr io.Writer) (out []string, walked map[string]bool, status int) {
	seen := map[string]bool{}
	walked = map[string]bool{}
	var missing []string
	add := func(p string) {
		if !seen[p] {
			seen[p] = true
			out = append(out, p)
		}
	}
	for _, p := range paths {
		if p == "-" {
			add(p)
			continue
		}
		info, err := os.Stat(p)
		if errors.Is(err, fs.ErrNotExist) {
			missing = append(missing, p)
			continue
		}
		if err != nil {
			fmt.Fprintln(stderr, fileError(p, err))
			status = 2
			continue
		}
		if !info.IsDir() {
			if strings.HasSuffix(p, ".nodal") {
				add(filepath.Clean(p))
			}
			continue
		}
		// A link to a folder is walked as the folder it names; the walk
		// itself does not follow links to folders.
		start := p
		if l, err := os.Lstat(p); err == nil && l.Mode()&fs.ModeSymlink != 0 {
			start = filepath.Clean(p) + string(filepath.Separator)
		}
		var found []string
		err = filepath.WalkDir(start, func(q string, e fs.DirEntry, err error) error {
			if err != nil {
				return err
			}
			if e.IsDir() && q != start && strings.HasPrefix(e.Name(), ".") {
				return filepath.SkipDir
			}
			if !e.IsDir() && strings.HasSuffix(e.Name(), ".nodal") {
				found = append(found, q)
			}
			return nil
		})
		if err != nil {
			fmt.Fprintln(stderr, fileError(p, err))
			status = 2
		}
		sort.Strings(found)
		for _, q := range found {
			// Behind a named link to a folder, files count as named: a
			// link that leads outside the root is refused, not skipped.
			walked[q] = start == p && (!seen[q] || walked[q])
			add(q)
		}
	}
	if reportUnknown(missing, "no such file or folder", stderr) {
		status = 2
	}
	return out, walked, status
}

// reportUnknown says which of the missing paths git does not know: those
// are typos, while a missing path git knows is a deletion a hook passes on,
// skipped quietly. It reports whether any was a typo.
func reportUnknown(missing []string, what string, stderr io.Writer) bool {
	if len(missing) == 0 {
		return false
	}
	typo := false
	known := gitKnown(".", missing)
	for _, p := range missing {
		if !known[p] {
			fmt.Fprintf(stderr, "nodal: %s: %s\n", output.TextSafe(p), what)
			typo = true
		}
	}
	return typo
}

// stagedNames turns the named paths (relative to the current folder) into
// repository paths of staged .nodal files, or lists every staged one.
// Unmerged files (a merge stopped on a conflict) are errors: the index
// holds no one version of them to check.
func stagedNames(root, prefix string, paths []string, stderr io.Writer) ([]string, int) {
	unmerged, err := gitUnmerged(root)
	if err != nil {
		fmt.Fprintf(stderr, "nodal: --staged: %s\n", output.TextSafe(err.Error()))
		return nil, 2
	}
	conflict := func(rp string) {
		fmt.Fprintf(stderr, "nodal: %s: unmerged in git's index (a conflict); resolve the merge first, then stage the file\n", output.TextSafe(rp))
	}
	if len(paths) == 0 {
		ps, err := gitStaged(root)
		if err != nil {
			fmt.Fprintf(stderr, "nodal: --staged: %s\n", output.TextSafe(err.Error()))
			return nil, 2
		}
		status := 0
		for _, p := range sortedKeys(unmerged) {
			if strings.HasSuffix(p, ".nodal") {
				conflict(p)
				status = 2
			}
		}
		return ps, status
	}
	var named, rps []string
	seen := map[string]bool{}
	for _, p := range paths {
		if !strings.HasSuffix(p, ".nodal") {
			continue
		}
		rp := path.Clean(prefix + filepath.ToSlash(p))
		if seen[rp] {
			continue
		}
		seen[rp] = true
		named, rps = append(named, p), append(rps, rp)
	}
	// One ls-files call says which are staged; their content is read once,
	// later, when they are checked.
	in, err := gitInIndex(root, rps)
	if err != nil {
		fmt.Fprintf(stderr, "nodal: --staged: %v\n", err)
		return nil, 2
	}
	var out, missing []string
	status := 0
	for i, rp := range rps {
		if unmerged[rp] {
			conflict(rp)
			status = 2
			continue
		}
		if in[rp] {
			out = append(out, rp)
		} else {
			missing = append(missing, named[i])
		}
	}
	if reportUnknown(missing, "not in git's index", stderr) {
		status = 2
	}
	return out, status
}
