package main

import (
	"errors"
	"fmt"
	flag "github.com/spf13/pflag"
	"io"
	"os"
	"path/filepath"
	"strings"
	"text/tabwriter"

	"nodal/config"
	"nodal/output"
	"nodal/rules"
)

const configUsage = `Usage: nodal config [--config FILE] [PATH]

Prints the configuration in effect for PATH (a .nodal file or a folder;
default: the current folder) and where each value came from: the line of
the nodal.toml that set it, or "default".

nodal.toml is looked for in the folder of the checked file, then in each
folder above it; the first found is used, whole (files are not merged).
Its keys:

  skip = ["vendor/**", "scratch/*.nodal"]   # globs, relative to nodal.toml
  roots = ["../parts-library"]   # folders includes may read besides the
                                 # repository (relative to nodal.toml)

  [rules]                 # severity of a rule: off, note, warning, error
  floating-net = "off"

  [derating]              # percent of a part's rating the rating rules
  resistor-power = 60     # accept before warning (all: common practice)

  [limits]                # block expansion and input size
  depth = 64              # deepest nesting of blocks
  parts = 10000000        # most parts a design may expand to
  file-mib = 512          # largest file (and standard input) read, in MiB

nodal.toml is looked for up to the repository's top level (outside a
repository, up to the file-system root). The limits apply to "nodal check"
and "nodal report"; their flags (--max-depth, --max-parts, --max-file-mib)
win over nodal.toml, and --root replaces the roots. docs/security.md says
what nodal reads and how to run it on untrusted changes.

  [thermal]               # temperatures in °C
  ambient = [0, 50]       # for designs with no ambient statement (25)
  resistor-knee = 70      # resistor power derating: full power up to
  resistor-zero = 155     # the knee, none at zero (common practice)

An unknown key, a bad value or an unknown rule id is an error naming the
file, line and key.

Flags:
`

func cmdConfig(args []string, stdout, stderr io.Writer) int {
	fl := flag.NewFlagSet("config", flag.ContinueOnError)
	fl.SetOutput(stderr)
	forced := fl.String("config", "", "use this nodal.toml `file` instead of searching")
	if status, done := parseFlags(fl, args, configUsage, stdout, stderr); done {
		return status
	}
	if fl.NArg() > 1 {
		fmt.Fprintln(stderr, "nodal: config takes at most one path")
		return 2
	}
	p := "."
	if fl.NArg() == 1 {
		p = fl.Arg(0)
	}
	where := p
	if info, err := os.Stat(p); err == nil && info.IsDir() {
		where = filepath.Join(p, "x.nodal") // a file in that folder
	} else if errors.Is(err, os.ErrNotExist) {
		fmt.Fprintf(stderr, "nodal: %s: no such file or folder\n", output.TextSafe(p))
		return 2
	} else if err != nil {
		fmt.Fprintln(stderr, fileError(p, err))
		return 2
	}
	loader := newConfigLoader(nil, *forced)
	c, err := loader.forFile(where)
	if err != nil {
		printConfigError(stderr, err)
		return 2
	}
	writeConfig(stdout, p, c)
	return 0
}

// writeConfig prints a configuration as TOML with the origin of each value
// in a comment.
func writeConfig(w io.Writer, p string, c *config.Config) {
	from := c.File
	if from == "" {
		from = "no nodal.toml found; every value is a default"
	}
	fmt.Fprintf(w, "# configuration for %s\n# from %s\n", output.TextSafe(p), output.TextSafe(from))
	tw := tabwriter.NewWriter(w, 0, 4, 2, ' ', 0)
	origin := func(key string) string {
		if o, ok := c.Origin[key]; ok {
			return o
		}
		return "default"
	}
	if c.Skipped(p) {
		fmt.Fprintf(w, "# %s is skipped by the skip globs\n", output.TextSafe(p))
	}
	skip := make([]string, len(c.Skip))
	for i, g := range c.Skip {
		skip[i] = fmt.Sprintf("%q", g)
	}
	fmt.Fprintf(tw, "\nskip = [%s]\t# %s\n", strings.Join(skip, ", "), origin("skip"))
	roots := make([]string, len(c.Roots))
	for i, r := range c.Roots {
		roots[i] = fmt.Sprintf("%q", r)
	}
	fmt.Fprintf(tw, "roots = [%s]\t# %s\n", strings.Join(roots, ", "), origin("roots"))
	fmt.Fprintf(tw, "\n[rules]\n")
	for _, a := range rules.All {
		sev := a.Severity
		if s, ok := c.Severity[a.Name]; ok {
			sev = s
		}
		fmt.Fprintf(tw, "%s = %q\t# %s\n", a.Name, sev.String(), origin("rules."+a.Name))
	}
	fmt.Fprintf(tw, "\n[derating]\n")
	keys, def := rules.DeratingDefaults()
	for _, k := range keys {
		f, set := c.Derating[k]
		if !set {
			f = def[k]
		}
		fmt.Fprintf(tw, "%s = %g\t# %s\n", k, f*100, origin("derating."+k))
	}
	fmt.Fprintf(tw, "\n[limits]\n")
	fmt.Fprintf(tw, "depth = %d\t# %s\n", c.Depth, origin("limits.depth"))
	fmt.Fprintf(tw, "parts = %d\t# %s\n", c.Parts, origin("limits.parts"))
	fmt.Fprintf(tw, "file-mib = %d\t# %s\n", c.FileMiB, origin("limits.file-mib"))
	fmt.Fprintf(tw, "\n[thermal]\n")
	fmt.Fprintf(tw, "ambient = %s\t# %s\n", c.Thermal.FormatAmbient(), origin("thermal.ambient"))
	fmt.Fprintf(tw, "resistor-knee = %g\t# %s\n", c.Thermal.Knee, origin("thermal.resistor-knee"))
	fmt.Fprintf(tw, "resistor-zero = %g\t# %s\n", c.Thermal.Zero, origin("thermal.resistor-zero"))
	tw.Flush()
}
