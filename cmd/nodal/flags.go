package main

// flags.go: the flags check and report share — the limits on a design and
// its files, the roots — and how a command's flags are parsed.

import (
	"errors"
	"fmt"
	"io"
	"strings"

	flag "github.com/spf13/pflag"

	"nodal/config"
)

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
