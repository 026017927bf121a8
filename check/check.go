// Package check runs the whole pipeline on one design: parse, build the
// circuit model, run the rules. It is what the command line, the tests and
// the benchmarks call; it does no I/O beyond what it is handed.
package check

import (
	"nodal/circuit"
	"nodal/diag"
	"nodal/grammar"
	"nodal/rules"
)

// Result is one checked design.
type Result struct {
	Fset   *diag.FileSet
	Build  *circuit.Result
	Diags  diag.List // sorted, without duplicates
	Parsed *grammar.File
}

// Options change a check.
type Options struct {
	Rules  []*rules.Analyzer // nil: rules.All
	Config *rules.Config
	// NoSuppress ignores allow comments (rules.Suppress) and reports
	// every finding.
	NoSuppress bool
}

// Source checks the source text of one file, named name in messages.
func Source(name string, src []byte, opt *Options) (*Result, error) {
	if opt == nil {
		opt = &Options{}
	}
	fset := diag.NewFileSet()
	file := fset.AddFile(name, src)
	ast := grammar.Parse(name, src)
	b := circuit.Build(file, ast)
	as := opt.Rules
	if as == nil {
		as = rules.All
	}
	diags, err := rules.Run(fset, b, as, opt.Config)
	diags.Sort(fset)
	diags = diags.Dedup()
	if !opt.NoSuppress {
		diags = rules.Suppress(fset, []rules.Source{{File: file, Src: src, Comments: ast.Comments}}, diags, opt.Config, nil)
	}
	return &Result{Fset: fset, Build: b, Diags: diags, Parsed: ast}, err
}
