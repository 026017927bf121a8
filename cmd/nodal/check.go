package main

import (
	"bytes"
	"fmt"
	"io"
	"os"
	"runtime"

	flag "github.com/spf13/pflag"

	"github.com/mattn/go-isatty"

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
	var search *includerSearch
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
		// The designs that include the named files are looked for while
		// the named files are checked; they are checked once found.
		search = startSearch(names, paths)
	}
	// What setting the named files up says on standard error waits for
	// what the search says, which comes first.
	var early bytes.Buffer
	msgs := io.Writer(stderr)
	if search != nil {
		msgs = &early
	}
	searched := func() []string {
		if search == nil {
			return nil
		}
		deps, said := search.wait()
		stderr.Write(said)
		stderr.Write(early.Bytes())
		search = nil
		return deps
	}

	// Each file's configuration: --config, or the nearest nodal.toml.
	b := &unitBuilder{cf: &cf, loader: newConfigLoader(idx, cf.config), readers: newReaders(cf.roots, cf.limits.fileMiB<<20), idx: idx, walked: walked}
	units, st, err := b.build(names, msgs)
	if err != nil {
		searched()
		printConfigError(stderr, err)
		return 2
	}
	status = max(status, st)
	var stdinSrc []byte
	for _, u := range units {
		if u.stdin {
			src, err := input.ReadAll(stdin, u.limits.fileMiB<<20)
			if err != nil {
				searched()
				return usageErr(stderr, "reading standard input: %v", err)
			}
			stdinSrc = src
			break
		}
	}

	pool := newCheckPool(cf.jobs, max(cf.limits.fileMiB<<20, config.DefaultFileMiB<<20), stdinSrc, b.loader, idx != nil)
	for _, u := range units {
		pool.add(u)
	}
	if search != nil {
		more, st, err := b.build(searched(), stderr)
		if err != nil {
			pool.wait()
			printConfigError(stderr, err)
			return 2
		}
		status = max(status, st)
		for _, u := range more {
			pool.add(u)
		}
	}
	results := pool.wait()

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
