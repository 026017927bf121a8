package main

import (
	"context"
	"fmt"
	flag "github.com/spf13/pflag"
	"io"

	"nodal/lsp"
)

const lspUsage = `Usage: nodal lsp

Runs the language server: the Language Server Protocol (3.17) over
standard input and output, for an editor to start. It reports the
findings of "nodal check" as you type, shows parts' operating points and
ratings on hover, finds definitions, references and symbols, completes
kinds, attributes, units, blocks and nets, offers fixes, and formats as
"nodal fmt" does. docs/editors.md shows how to set editors up.

Flags:
`

func cmdLSP(args []string, stdin io.Reader, stdout, stderr io.Writer) int {
	fl := flag.NewFlagSet("lsp", flag.ContinueOnError)
	fl.SetOutput(stderr)
	fl.Bool("stdio", true, "talk over standard input and output (the only transport)")
	if status, done := parseFlags(fl, args, lspUsage, stdout, stderr); done {
		return status
	}
	if fl.NArg() > 0 {
		return usageErr(stderr, "lsp takes no arguments")
	}
	if err := lsp.Serve(context.Background(), stdin, stdout, lsp.Options{}); err != nil {
		fmt.Fprintf(stderr, "nodal: lsp: %v\n", err)
		return 2
	}
	return 0
}
