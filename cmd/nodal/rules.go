package main

import (
	"fmt"
	"io"
	"text/tabwriter"

	"nodal/diag"
	"nodal/docs"
	"nodal/rules"
)

func cmdRules(args []string, stdout, stderr io.Writer) int {
	if len(args) > 0 && (args[0] == "-h" || args[0] == "--help" || args[0] == "-help") {
		fmt.Fprintln(stdout, "Usage: nodal rules [RULE]\n\nLists every rule with its default severity and a one-line description,\nor with a rule id prints the rule's page: what nodal looks for, what\ncan go wrong, an example, how to put it right and how to accept a finding.")
		return 0
	}
	if len(args) > 0 {
		a := rules.Lookup(args[0])
		if a == nil {
			if s := diag.Suggest(args[0], rules.Names()); s != "" {
				fmt.Fprintf(stderr, "nodal: no rule %q; did you mean %s?\n", args[0], s)
			} else {
				fmt.Fprintf(stderr, "nodal: no rule %q; \"nodal rules\" lists them\n", args[0])
			}
			return 2
		}
		if page, ok := docs.Rule(a.Name); ok {
			fmt.Fprint(stdout, page)
			fmt.Fprintf(stdout, "\nDefault severity: %s.", a.Severity)
			if u := docs.RuleURL(a.Name); u != "" {
				fmt.Fprintf(stdout, " Online: %s", u)
			}
			fmt.Fprintln(stdout)
			return 0
		}
		fmt.Fprintf(stdout, "%s (default %s)\n\n%s\n", a.Name, a.Severity, a.Doc)
		return 0
	}
	tw := tabwriter.NewWriter(stdout, 0, 4, 2, ' ', 0)
	fmt.Fprintln(tw, "RULE\tSEVERITY\tCHECKS FOR")
	for _, a := range rules.All {
		fmt.Fprintf(tw, "%s\t%s\t%s\n", a.Name, a.Severity, a.Title())
	}
	tw.Flush()
	return 0
}
