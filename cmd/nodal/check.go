package main

import (
	"errors"
	"flag"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"sort"
	"strings"

	"github.com/fatih/color"
	"github.com/mattn/go-isatty"

	"nodal/check"
	"nodal/diag"
)

const checkUsage = `Usage: nodal check [flags] [PATH ...]

Checks each named .nodal file, and every *.nodal file below each named
folder (default: the current folder). "-" reads a design from standard
input. Files are checked independently: one broken file does not stop the
others.

Each finding is one line in the form editors parse:

  path:line:col: severity: message [rule-id]

sorted by path, line and column. Columns count bytes from 1. Severities are
error, warning and note. A summary line goes to standard error.

Exit status: 0 when no finding is an error, 1 when one is, 2 for usage or
I/O trouble (such as a path that does not exist).

Flags:
`

type checkFlags struct {
	noColor bool
}

func cmdCheck(args []string, stdin io.Reader, stdout, stderr io.Writer) int {
	fl := flag.NewFlagSet("check", flag.ContinueOnError)
	fl.SetOutput(stderr)
	var cf checkFlags
	fl.BoolVar(&cf.noColor, "no-color", false, "never colour the output (also when NO_COLOR is set)")
	fl.Usage = func() {
		fmt.Fprint(stderr, checkUsage)
		fl.PrintDefaults()
	}
	if err := fl.Parse(args); err != nil {
		if errors.Is(err, flag.ErrHelp) {
			fl.SetOutput(stdout)
			fmt.Fprint(stdout, checkUsage)
			fl.PrintDefaults()
			return 0
		}
		return 2
	}
	paths := fl.Args()
	if len(paths) == 0 {
		paths = []string{"."}
	}
	files, status := collect(paths, stderr)
	useColor := !cf.noColor && os.Getenv("NO_COLOR") == "" && isTerminal(stdout)
	var errs, warns, notes, checked int
	for _, f := range files {
		var src []byte
		var err error
		if f == "-" {
			src, err = io.ReadAll(stdin)
		} else {
			src, err = os.ReadFile(f)
		}
		if err != nil {
			fmt.Fprintf(stderr, "nodal: %v\n", err)
			status = 2
			continue
		}
		name := f
		if f == "-" {
			name = "<stdin>"
		}
		res, err := check.Source(name, src, nil)
		if err != nil {
			fmt.Fprintf(stderr, "nodal: %s: internal error: %v\n", name, err)
			status = 2
		}
		checked++
		for _, d := range res.Diags {
			writeLine(stdout, res.Fset, d, useColor)
		}
		e, w, n := res.Diags.Count()
		errs, warns, notes = errs+e, warns+w, notes+n
	}
	fmt.Fprintf(stderr, "%s, %s, %s in %s\n", plural(errs, "error"), plural(warns, "warning"), plural(notes, "note"), plural(checked, "file"))
	if status == 0 && errs > 0 {
		status = 1
	}
	return status
}

func plural(n int, word string) string {
	if n == 1 {
		return "1 " + word
	}
	return fmt.Sprintf("%d %ss", n, word)
}

func isTerminal(w io.Writer) bool {
	f, ok := w.(*os.File)
	return ok && (isatty.IsTerminal(f.Fd()) || isatty.IsCygwinTerminal(f.Fd()))
}

func writeLine(w io.Writer, fset *diag.FileSet, d diag.Diagnostic, useColor bool) {
	line := diag.Format(fset, d)
	if !useColor {
		fmt.Fprintln(w, line)
		return
	}
	c := color.New(color.FgCyan)
	switch d.Severity {
	case diag.Error:
		c = color.New(color.FgRed, color.Bold)
	case diag.Warning:
		c = color.New(color.FgYellow)
	}
	c.EnableColor()
	pos := fset.Position(d.Pos).String()
	fmt.Fprintf(w, "%s: %s: %s [%s]\n", pos, c.Sprint(d.Severity), d.Message, d.Rule)
}

// collect expands folders into their .nodal files, sorted, each once.
func collect(paths []string, stderr io.Writer) ([]string, int) {
	status := 0
	seen := map[string]bool{}
	var out []string
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
		if err != nil {
			fmt.Fprintf(stderr, "nodal: %v\n", err)
			status = 2
			continue
		}
		if !info.IsDir() {
			add(filepath.Clean(p))
			continue
		}
		var found []string
		err = filepath.WalkDir(p, func(q string, e fs.DirEntry, err error) error {
			if err != nil {
				return err
			}
			if e.IsDir() && q != p && strings.HasPrefix(e.Name(), ".") {
				return filepath.SkipDir
			}
			if !e.IsDir() && strings.HasSuffix(e.Name(), ".nodal") {
				found = append(found, q)
			}
			return nil
		})
		if err != nil {
			fmt.Fprintf(stderr, "nodal: %v\n", err)
			status = 2
		}
		sort.Strings(found)
		for _, q := range found {
			add(q)
		}
	}
	return out, status
}
