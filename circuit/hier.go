package circuit

// hier.go: blocks, instances, parameters and includes: the types the
// steps of elaboration share. Elaboration runs in four steps, one file
// each, each linear in what it walks:
//
//  1. collect (collect.go): split each file into its top-level statements and its block
//     definitions, following includes (each file is read and parsed once).
//  2. prepare (prepare.go): resolve every statement of every block once: its kind or
//     block, its nets (a block pin, the ground, or a net local to the
//     block), its pin and parameter bindings. Findings about a block's text
//     are made here, once, whatever the number of instances.
//  3. measure (measure.go): the expanded size and depth of each block, bottom-up, with
//     recursion found on the way. Limits are checked against these numbers
//     before anything is expanded.
//  4. expand (expand.go): top-level statements in order, each instance walking its
//     block's prepared statements with its pin nets and parameter values.
//     Per instance this allocates its pin, local-net and parameter
//     slices, and the parts themselves: nothing is re-parsed, and no name
//     is built at all. Parts, nets and instances keep their own names
//     and their instance; the dotted paths are built only for messages
//     (names.go). Values are read by part.go,
//     value.go and attrs.go; expressions in a scope by scopeeval.go.
//
// Then probe.go elaborates, into a scratch design, the blocks no statement
// uses, so that a library checked alone still has its values checked.

import (
	"nodal/diag"
	"nodal/grammar"
	"nodal/units"
)

// Default limits on expansion.
const (
	DefaultMaxDepth = 64
	DefaultMaxParts = 10_000_000
	// DefaultMaxNameBytes bounds the names that instances make, each
	// counted once at the length written: 256 MiB, some 25 bytes a name
	// at the part limit.
	DefaultMaxNameBytes = 256 << 20
)

// Options change elaboration.
type Options struct {
	// ReadFile reads an included file. Nil refuses includes.
	ReadFile func(path string) ([]byte, error)
	// Identify returns the identity of a file before it is read: paths
	// that reach the same file (through symbolic links, say) must give the
	// same identity, so that each file is read and parsed once. An error
	// wrapping input.ErrOutside refuses the include without reading it.
	// Nil: the cleaned path is the identity.
	Identify func(path string) (string, error)
	// MaxDepth bounds the nesting of instances; 0 means DefaultMaxDepth.
	MaxDepth int
	// MaxParts bounds the parts and instances the design expands to; 0
	// means DefaultMaxParts.
	MaxParts int64
	// Expanding, when set, is told the number of built-in parts the
	// design will expand to, once, after the blocks are measured and
	// before any instance is expanded (not when the design is past the
	// size limit), so that a caller can wait for the memory they need.
	Expanding func(parts int64)
	// MaxNameBytes bounds the bytes of the names (parts, local nets,
	// instances) that instances make, each counted once as written, since
	// each is kept once; 0 means DefaultMaxNameBytes.
	MaxNameBytes int64
}

// blockDef is a block definition, or (isTop) the top level of the checked
// file seen as a block without pins or parameters.
type blockDef struct {
	name     string
	file     *diag.File
	pos, end diag.Pos // the header line
	nameEnd  diag.Pos
	header   *grammar.Block
	isTop    bool
	lib      bool // defined in an included file
	closed   bool

	pins     []string
	pinPos   []diag.Pos
	pinIndex map[string]int
	params   []paramDef
	parIndex map[string]int
	body     []*bodyStmt
	locals   []string // nets local to the block, by first use

	state     uint8 // measure: 0 new, 1 on the stack, 2 done
	recursive bool
	size      int64 // parts and instances one instance makes, itself included
	text      int64 // bytes of the names one instance makes below it (parts, instances, local nets), each as written
	parts     int64 // built-in parts one instance makes
	depth     int   // 1 for a block that instantiates no block
	used      bool  // named by some instance statement
	expanded  bool
}

type paramDef struct {
	name     string
	def      *grammar.Value // nil when the parameter has no default
	pos, end diag.Pos
	dim      units.Dim // the default's unit, when known
	percent  bool
	dimKnown bool
}

// Net references in a prepared statement.
const (
	refNamed  = iota // a top-level net, by name
	refPin           // a pin of the enclosing block
	refGround        // the design's ground
	refLocal         // a net local to the block
)

type netRef struct {
	kind uint8
	idx  int32
	name string
}

// bodyStmt is one prepared part or instance statement. A plain line of the
// checked file's top level (plain > 0) holds no more than these few words
// (its nodes are made when it is built, ahead.go); a statement of the tree
// holds its stmtTree besides.
type bodyStmt struct {
	pos, end diag.Pos
	plain    int32 // 1 + the checked file's plain line it is, or 0
	kind     Kind  // a built-in part's kind; a plain line's is read when it is built
	ok       bool  // false: the statement cannot be placed
	*stmtTree
}

// stmtTree is what a statement of the tree holds: its part node and what
// prepare resolves of it.
type stmtTree struct {
	pt       *grammar.Part
	blk      *blockDef // set for an instance
	nets     []netRef  // one per written pin
	pinNets  [2]netRef // nets of a two-pin statement, without an allocation
	bind     []int     // instance: for each pin of blk, the index in nets
	assign   []int     // instance: for each parameter of blk, the index in pt.Params, or -1
	valueErr bool      // instance: carries a value or attributes it cannot take
}

// treeStmt returns the statement of part node pt, at pos … end, in one
// allocation.
func treeStmt(pt *grammar.Part, pos, end diag.Pos) *bodyStmt {
	s := &struct {
		bodyStmt
		stmtTree
	}{bodyStmt: bodyStmt{pos: pos, end: end}, stmtTree: stmtTree{pt: pt}}
	s.bodyStmt.stmtTree = &s.stmtTree
	return &s.bodyStmt
}

// block is the block st instantiates, or nil.
func (st *bodyStmt) block() *blockDef {
	if st.stmtTree == nil {
		return nil
	}
	return st.blk
}

// scope is one block instance being expanded (or the top level).
type scope struct {
	blk   *blockDef
	pins  []NetID
	local []NetID
	env   []binding
	inst  int32 // the instance, -1 at the top (and for a block probed alone)
	depth int
}

type binding struct {
	q   units.Quantity
	set bool
}
