package main

import (
	"errors"
	"fmt"
	flag "github.com/spf13/pflag"
	"io"
	"os"
	"path/filepath"

	"nodal/check"
	"nodal/diag"
	"nodal/input"
	"nodal/output"
	"nodal/output/report"
	"nodal/solve"
)

const reportUsage = `Usage: nodal report [flags] FILE

Solves one design's DC operating point and prints it for a person: every
net's voltage, then every part's voltage, current and power with the rating
that limits it and how much of that rating it uses, as a percentage and a
bar of ten cells to 100 %, worst first. A bar that ends in ▶ is past its
rating. On a terminal the use column is red past a rating, yellow past its
derating limit ([derating] in nodal.toml) and green within it; --no-color
or a non-empty NO_COLOR environment variable turns colour off.

Sign convention: a part's voltage is V(first pin) − V(second pin), its pins
in the order its kind lists them (a, b; pos, neg; from, to; anode,
cathode). Its current flows from the first pin to the second through the
part. Its power is voltage times current: positive when the part absorbs
energy, negative when it delivers it (a supply driving a load).

--format json prints one document, in SI base units (V, A, W) as plain
numbers:

  {"file": "...", "nets": [{"name": "vin", "voltage": 12}, ...],
   "parts": [{"name": "R1", "kind": "resistor", "voltage": 9.9,
              "current": 0.0099, "power": 0.098, "ratings": {"power": 0.25},
              "use": 0.39, "limit": "power"}, ...]}

"use" is the largest fraction of any rating and "limit" names that rating;
both are null for a part with no rating. A battery with a capacity also has
"capacity" (in coulombs; 1 Ah = 3600 C) and, while it discharges,
"runtime" (in seconds): capacity ÷ discharge current, a simple estimate
that ignores the discharge rate, temperature, age and cut-off voltage.

After the parts comes the power tree ("rails" in JSON): each supply (a
kind that holds a rail's voltage: a voltage source, a battery, a port's
voltage drive, a regulator, a converter) with the rail it holds, what it
delivers into it and the share of its rating, where its power comes from
(its own, or the rail it draws from), what it loses and how efficiently,
and whether a regulator is in dropout or at its current limit ("region");
then, one branch each, the supplies whose input is on that rail and every
other part with a pin on it, with the current it takes there, worst use of
a rating first. Nets tied to a rail by ideal shorts (wires, closed
switches) are part of it. Past a part that takes current from a rail into
a net no supply drives (a fuse, a resistor), the tree lists what hangs on
that net under it ("net", "feeds", "loads"), up to 8 parts deep;
"off_rail" counts the parts the tree does not reach.

Values the circuit does not fix (a section with no DC path to ground, the
current around a loop of ideal shorts and voltage sources) are shown as
"undetermined" (in JSON, listed in a part's "undetermined" and read as 0),
and the ratings that need them are not judged; "nodal check" names them
(unrated-parts). Ideal shorts in parallel are listed with the current they
carry together ("groups" in JSON).

A design with no operating point (one the topology rules reject, one that
does not parse, or one the solver could not solve) gets its findings
instead, in the form "nodal check" prints them (on standard error with
--format json), and exit status 1. A design too large for this version's
solver is said so on standard error, also with exit status 1. "-" reads
the design from standard input.

nodal is a design aid, not a sign-off: the operating point is only as good
as the values and ratings written in the design. Parts past their ratings
can overheat and burn; mains voltage and battery energy can injure. Have
designs reviewed, and follow local codes and licensed practice.

Exit status: 0 the table was printed, 1 the design has no operating point,
2 usage, configuration or I/O trouble.

Flags:
`

func cmdReport(args []string, stdin io.Reader, stdout, stderr io.Writer) int {
	fl := flag.NewFlagSet("report", flag.ContinueOnError)
	fl.SetOutput(stderr)
	var (
		noColor   bool
		format    string
		cfgFile   string
		stdinName string
		lim       limits
	)
	fl.BoolVar(&noColor, "no-color", false, "never colour the output (also when NO_COLOR is set; colour is only used on a terminal)")
	fl.StringVar(&format, "format", "text", "output `form`: text or json")
	fl.StringVar(&cfgFile, "config", "", "use this nodal.toml `file` instead of searching")
	fl.StringVar(&stdinName, "stdin-filename", "", "with \"-\": name standard input this `path`, and find nodal.toml and resolve includes from it")
	lim.flags(fl)
	if status, done := parseFlags(fl, args, reportUsage, stdout, stderr); done {
		return status
	}
	if format != "text" && format != "json" {
		return usageErr(stderr, "--format %q: want text or json", format)
	}
	if !lim.valid() {
		return usageErr(stderr, "--max-depth, --max-parts and --max-file-mib must be at least 1")
	}
	paths := fl.Args()
	if stdinName != "" && len(paths) == 0 {
		paths = []string{"-"}
	}
	if len(paths) != 1 {
		return usageErr(stderr, "report takes one design file (or \"-\"), got %d; \"nodal report --help\" explains", len(paths))
	}
	path := paths[0]
	if stdinName != "" && path != "-" {
		return usageErr(stderr, "--stdin-filename needs \"-\" as the file")
	}

	name, where := path, path
	if path == "-" {
		name, where = "<stdin>", filepath.Join(".", "stdin")
		if stdinName != "" {
			name, where = stdinName, stdinName
		}
	} else if info, err := os.Stat(path); err == nil && info.IsDir() {
		return usageErr(stderr, "%s is a folder; report takes one design file (\"nodal check %s\" checks a folder)", output.TextSafe(path), output.TextSafe(path))
	}
	loader := newConfigLoader(nil, cfgFile)
	cfg, err := loader.forFile(where)
	if err != nil {
		printConfigError(stderr, err)
		return 2
	}
	lim = lim.forConfig(cfg)
	rd, err := newReaders(nil, lim.fileMiB<<20).forFile(where, cfg.Roots, int(lim.fileMiB))
	if err != nil {
		fmt.Fprintln(stderr, fileError(name, err))
		return 2
	}
	var src []byte
	if path == "-" {
		src, err = input.ReadAll(stdin, lim.fileMiB<<20)
		if err != nil {
			return usageErr(stderr, "reading standard input: %v", err)
		}
	} else if src, err = rd.ReadFile(path); err != nil {
		fmt.Fprintln(stderr, fileError(path, err))
		return 2
	}
	rc := withAmbient(loader.rulesConfig(cfg), lim.ambient)
	res, err := reportSource(name, src, &check.Options{Config: rc, ReadFile: rd.ReadFile, Identify: rd.Resolve, MaxDepth: lim.maxDepth, MaxParts: lim.maxParts})
	if err != nil {
		return usageErr(stderr, "%s: internal error: %v (please report it with the file that caused it)", output.TextSafe(name), err)
	}
	color := format == "text" && !noColor && os.Getenv("NO_COLOR") == "" && isTerminal(stdout)

	if res.Solved == nil || res.Solved.OP == nil {
		out := stdout
		if format == "json" {
			out = stderr // stdout stays empty rather than holding a different document
		}
		rep := &output.Report{Files: 1, Findings: output.FromDiags(res.Fset, res.Diags)}
		if err := output.Write(out, "text", rep, output.Options{Color: color && out == stdout}); err != nil {
			return usageErr(stderr, "%v", err)
		}
		fmt.Fprintf(stderr, "nodal: %s: %s\n", output.TextSafe(name), noReport(res))
		return 1
	}

	if n := res.Build.Design.NameBytes(); n > maxListedNames {
		fmt.Fprintf(stderr, "nodal: %s: %s; \"nodal check %s\" checks the design\n", output.TextSafe(name), tooManyNames(n), output.TextSafe(path))
		return 2
	}
	t := report.NewAt(name, res.Build.Design, res.Solved.OP, rc.Derating, res.Solved.Ambient)
	if res.Worst != nil {
		t.AddWorst(res.Build.Design, res.Worst.R, rc.Derating)
	}
	if format == "json" {
		err = t.WriteJSON(stdout)
	} else {
		err = t.WriteText(stdout, report.TextOptions{Color: color})
	}
	if err != nil {
		return usageErr(stderr, "%v", err)
	}
	if e, w := count(res.Diags); e+w > 0 {
		fmt.Fprintf(stderr, "nodal: %s: %s, %s; \"nodal check %s\" lists them\n", output.TextSafe(name), output.Plural(e, "error"), output.Plural(w, "warning"), output.TextSafe(path))
	}
	return 0
}

// reportSource checks a design; a panic anywhere in the pipeline becomes
// an internal error rather than a stack trace.
func reportSource(name string, src []byte, opt *check.Options) (res *check.Result, err error) {
	defer func() {
		if r := recover(); r != nil {
			res, err = nil, fmt.Errorf("%v", r)
		}
	}()
	res, err = checkSource(name, src, opt)
	if err == nil && res == nil {
		err = errors.New("no result")
	}
	return res, err
}

// noReport says why a checked design has no operating point.
func noReport(res *check.Result) string {
	var se *solve.Error
	switch s := res.Solved; {
	case s != nil && errors.As(s.Skipped, &se):
		return "no operating point, so no report: the design is too large for this version's solver: " + se.Msg
	case s != nil && s.Err != nil:
		return "no operating point, so no report: the solver could not find one (see the findings above)"
	case s == nil:
		return "no operating point, so no report: the solve did not run"
	}
	if res.Build == nil || res.Build.Design == nil || !res.Build.Design.HasParts() {
		return "no operating point, so no report: the design has no parts"
	}
	if why := res.Solved.NotRun; why != "" {
		// The reason "nodal check" gives in its unrated-parts finding.
		return "no operating point, so no report: " + why
	}
	return "no operating point, so no report: fix the findings above first"
}

func count(l diag.List) (errs, warns int) {
	for _, d := range l {
		switch d.Severity {
		case diag.Error:
			errs++
		case diag.Warning:
			warns++
		}
	}
	return
}

// maxListedNames bounds the names a report table lists (every part and
// net, instance paths included), for nodal report and nodal diff: deep
// blocks with long names make paths of up to depth × name length bytes,
// which the check itself never builds all at once.
const maxListedNames = 256 << 20

// tooManyNames says why a design's table is not made.
func tooManyNames(n int64) string {
	return fmt.Sprintf("its table would list %.1f MiB of part and net names, instance paths included, over the limit of %d MiB (nest fewer levels or use shorter names)", float64(n)/(1<<20), maxListedNames>>20)
}
