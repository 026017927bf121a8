// Package check runs the whole pipeline on one design: parse, build the
// circuit model (with the files it includes), run the rules and their last
// pass (package rules: merging, suppression, severities, sorting). It adds
// no step of its own; it is what the command line, the tests and the
// benchmarks call, and all the I/O it does goes through Options.ReadFile,
// confined by default to the checked file's repository (see package
// input).
package check

import (
	"path/filepath"
	"runtime"

	"nodal/circuit"
	"nodal/diag"
	"nodal/grammar"
	"nodal/input"
	"nodal/rules"
)

// Result is one checked design.
type Result struct {
	Fset  *diag.FileSet // the checked file first, then each included file
	Build *circuit.Result
	Diags diag.List // sorted, without duplicates
	// Solved is the result of the Solve pass: the DC operating point, or
	// why there is none. Nil when the rules run did not include it.
	Solved *rules.SolveResult
	// Worst is the result of the WorstCase pass: every rating's worst case
	// over tolerances and temperature, and every net's range. Nil when the
	// rules run did not include it.
	Worst *rules.WorstResult
}

// collectAfterBuild is the source size (8 MB, some 200 000 part lines)
// from which Source runs a garbage collection once the syntax tree is
// dropped. Below it the tree is small and a forced cycle costs more than it
// returns.
const collectAfterBuild = 8 << 20

// Options change a check.
type Options struct {
	Rules  []*rules.Analyzer // nil: rules.All
	Config *rules.Config
	// NoSuppress ignores accept comments (rules.Suppress) and reports
	// every finding.
	NoSuppress bool
	// ReadFile reads the checked file (for File) and every included file,
	// by a path joined onto the including file's folder; Identify names
	// a file before it is read, the same for every path that reaches it
	// (see circuit.Options). Nil ReadFile: an input.Reader confined to the
	// repository holding the checked file (or its folder outside one),
	// which also provides Identify. A caller that checks what git has
	// staged reads from the index here.
	ReadFile func(path string) ([]byte, error)
	Identify func(path string) (string, error)
	// MaxDepth bounds the nesting of block instances (0: 64).
	MaxDepth int
	// MaxParts bounds the parts and instances a design expands to (0: 10
	// million).
	MaxParts int64
	// MaxNameBytes bounds the bytes of the names a design's instances
	// make, each counted once as written (0: 256 MiB; see circuit.Options).
	MaxNameBytes int64
	// Expanding is told the number of parts the design expands to before
	// they are made (see circuit.Options).
	Expanding func(parts int64)
}

// files returns the reading functions for a check of the file name.
func (o *Options) files(name string) (read func(string) ([]byte, error), identify func(string) (string, error)) {
	if o.ReadFile != nil {
		return o.ReadFile, o.Identify
	}
	r, err := DefaultReader(name)
	if err != nil {
		fail := func(string) ([]byte, error) { return nil, err }
		return fail, nil
	}
	return r.ReadFile, r.Resolve
}

// DefaultReader returns the reader a check of the file name uses unless
// told otherwise: confined to the top level of the repository that holds
// it, or to its folder outside a repository, with the default size cap.
func DefaultReader(name string) (*input.Reader, error) {
	root, err := input.TreeRoot(filepath.Dir(name))
	if err != nil {
		return nil, err
	}
	return input.New([]string{root}, 0)
}

// File reads the file at path through opt.ReadFile and checks it.
func File(path string, opt *Options) (*Result, error) {
	if opt == nil {
		opt = &Options{}
	}
	read, _ := opt.files(path)
	src, err := read(path)
	if err != nil {
		return nil, err
	}
	return Source(path, src, opt)
}

// Source checks the source text of one file, named name in messages.
// Includes are resolved against the folder of name. The result's names
// share src's memory (see grammar.ParseShared): src must not change while
// the result is in use.
func Source(name string, src []byte, opt *Options) (*Result, error) {
	if opt == nil {
		opt = &Options{}
	}
	fset := diag.NewFileSet()
	file := fset.AddFile(name, src)
	ast := grammar.ParsePlain(name, src)
	read, identify := opt.files(name)
	b := circuit.BuildFile(fset, file, src, ast, &circuit.Options{
		ReadFile: read, Identify: identify, MaxDepth: opt.MaxDepth, MaxParts: opt.MaxParts, MaxNameBytes: opt.MaxNameBytes,
		Expanding: opt.Expanding,
	})
	// The rules need only the comments (kept in b.Files); the tree itself,
	// most of the memory a large design takes, is dropped here.
	ast = nil
	if len(src) >= collectAfterBuild {
		// The tree is now garbage, but the collector paced itself on it:
		// its next cycle would let the heap grow to twice the tree before
		// anything is reclaimed, while the rules and the solve allocate.
		// One cycle now returns that memory to them.
		runtime.GC()
	}
	as := opt.Rules
	if as == nil {
		as = rules.All
	}
	cfg := rules.Config{}
	if opt.Config != nil {
		cfg = *opt.Config
	}
	cfg.NoSuppress = cfg.NoSuppress || opt.NoSuppress
	diags, results, err := rules.RunResults(fset, b, as, &cfg)
	solved, _ := results[rules.Solve].(*rules.SolveResult)
	worst, _ := results[rules.WorstCase].(*rules.WorstResult)
	return &Result{Fset: fset, Build: b, Diags: diags, Solved: solved, Worst: worst}, err
}
