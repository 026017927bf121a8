// Command nodal checks circuit descriptions written in the nodal language:
// wiring that breaks Kirchhoff's laws, parts left doing nothing, values in
// the wrong units. Run "nodal --help" for the commands.
package main

import (
	"fmt"
	"io"
	"os"

	"nodal/docs"
)

const version = "0.1.0"

const usage = `nodal checks circuits written as plain text (.nodal files) for wiring that
breaks Kirchhoff's laws, parts left doing nothing and values in the wrong
units.

Usage:
  nodal check [flags] [PATH ...]   check files and folders (default: .)
  nodal report [flags] FILE        table of one design's DC operating point
  nodal diff [flags] [BASE [HEAD]] what a change does to the designs
  nodal fmt [-w | --check] [PATH ...]  lay out files in the canonical form
  nodal lsp                        language server for editors (stdio)
  nodal rules [RULE]               list the rules, or explain one
  nodal config [PATH]              show the settings in effect for a path
  nodal version                    print the version
  nodal help [COMMAND]             show help

nodal check reads every *.nodal file in the folders it is given (and their
subfolders), or standard input for "-". It prints one line per finding,
"path:line:col: severity: message [rule-id]", sorted by path, line and
column, coloured only on a terminal (--no-color or NO_COLOR turns colour
off), and a summary line on standard error.

Exit status: 0 no errors, 1 findings at error level, 2 usage or I/O
trouble. Run "nodal check --help" for the details.

nodal report solves one design and prints every net's voltage and every
part's voltage, current, power and use of its ratings, worst first (or
JSON with --format json). Run "nodal report --help" for the sign
convention.

Links to rule pages in JSON, SARIF and Markdown output point at
NODAL_DOCS_URL (an absolute address where the repository's docs/ folder
can be read, e.g. on your code host); unset, no links are written. A SARIF
log carries every rule's page in itself either way.

nodal is a design aid, not a sign-off: it does not replace review by a
qualified person. Mains voltage and battery energy can injure; follow local
codes and licensed practice.
`

func main() {
	os.Exit(run(os.Args[1:], os.Stdin, os.Stdout, os.Stderr))
}

// run is main without the process: it returns the exit status.
// 0: no findings at error level; 1: findings at error level; 2: usage or
// I/O trouble.
func run(args []string, stdin io.Reader, stdout, stderr io.Writer) int {
	docs.BaseURL = ""
	if u := os.Getenv("NODAL_DOCS_URL"); u != "" {
		if err := docs.SetBaseURL(u); err != nil {
			fmt.Fprintf(stderr, "nodal: NODAL_DOCS_URL: %v\n", err)
			return 2
		}
	}
	if len(args) == 0 {
		fmt.Fprint(stderr, usage)
		return 2
	}
	switch args[0] {
	case "check":
		return cmdCheck(args[1:], stdin, stdout, stderr)
	case "report":
		return cmdReport(args[1:], stdin, stdout, stderr)
	case "diff":
		return cmdDiff(args[1:], stdout, stderr)
	case "lsp":
		return cmdLSP(args[1:], stdin, stdout, stderr)
	case "fmt":
		return cmdFmt(args[1:], stdin, stdout, stderr)
	case "config":
		return cmdConfig(args[1:], stdout, stderr)
	case "rules":
		return cmdRules(args[1:], stdout, stderr)
	case "version", "--version":
		fmt.Fprintln(stdout, "nodal", version)
		return 0
	case "help", "-h", "-help", "--help":
		if len(args) > 1 {
			return run([]string{args[1], "--help"}, stdin, stdout, stderr)
		}
		fmt.Fprint(stdout, usage)
		return 0
	}
	fmt.Fprintf(stderr, "nodal: unknown command %q\n\n%s", args[0], usage)
	return 2
}
