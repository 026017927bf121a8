package solve

import (
	"errors"
	"fmt"
	"math"

	"nodal/circuit"
)

// ErrorKind says why a solve gave no operating point.
type ErrorKind uint8

const (
	// Singular: the equations have no unique solution although the
	// topology checks passed.
	Singular ErrorKind = iota
	// NoConvergence: the nonlinear parts did not settle.
	NoConvergence
	// SelfCheck: the solution fails Kirchhoff's current law or Tellegen's
	// theorem.
	SelfCheck
	// BadPart: a part cannot be modelled (a shorted voltage source, a
	// diode whose series resistance drops more than its vf).
	BadPart
	// TooLarge: the design is too large for the linear solvers available.
	TooLarge
	// Starved: a constant-power load demands more power than the circuit
	// feeding it can deliver; no operating point exists.
	Starved
)

// Error is a solve that gave no usable operating point. Nets and Parts name
// what is involved.
type Error struct {
	Kind  ErrorKind
	Nets  []circuit.NetID
	Parts []circuit.PartID
	Msg   string
}

func (e *Error) Error() string { return e.Msg }

// Options change a solve. The zero value is the default.
type Options struct {
	// Temperature of the junctions in kelvin; 0 means 25 °C. A vf point
	// is taken as measured at 25 °C and moved to this temperature by
	// SaturationCurrentAt.
	Temperature float64
	// Dense forces gonum's dense LU whatever the size (up to MaxDense
	// unknowns); it is Solver: DenseLU.
	Dense bool
	// Solver forces a linear solver; the zero value chooses automatically.
	// SparseCholesky and PCGAMG need the eliminated formulation: where the
	// branch-current formulation is used they are replaced by SparseLU.
	Solver LinearSolver
	// MNA forces the general branch-current formulation (one unknown per
	// voltage source) instead of eliminating the voltage sources.
	MNA bool

	// label names a part in the solver's messages when it stands for a
	// piece of a part with more pins (standin.go); nil for none.
	label func(circuit.PartID) (string, bool)
}

// Result is a DC operating point. Slices are indexed by NetID and PartID;
// see the package doc for the sign convention.
type Result struct {
	NetV []float64 // volts; 0 for nets no pin touches
	V    []float64 // part voltage V(pin 1) − V(pin 2)
	I    []float64 // part current from pin 1 to pin 2 through the part
	P    []float64 // absorbed power V·I
	// Junction is the junction voltage of each diode and LED (the part
	// voltage less the drop in its series resistance); 0 for other parts.
	Junction []float64

	Unknowns   int
	Iterations int    // Newton iterations in all
	Method     string // "linear", "newton", "gmin stepping" or "source stepping"
	// Linear is the linear solver that produced the final solution, and
	// MNA whether the branch-current formulation was used.
	Linear LinearSolver
	MNA    bool
	// PCGIterations counts the conjugate-gradient iterations in all (0 for
	// the direct solvers).
	PCGIterations int
	// Cond estimates the 1-norm condition number of the final system after
	// symmetric diagonal equilibration (see the package doc). It is 0 when
	// no estimate was made (CondEstimated false): the iterative solver
	// makes none.
	Cond          float64
	CondEstimated bool
	// Uncertified marks, per part, values whose accuracy the solve could
	// not certify: the refinement of a factorised solve (see refineDD)
	// did not bring the error of the part's voltage, and of a resistive
	// part's current, within 1e-10 of the value (or 1e-15 of the largest
	// in the design). Nil when every part is certified, and on the
	// iterative path, whose acceptance test bounds the error by 1e-11 of
	// the largest voltage instead (pcgSolver.settled).
	Uncertified []bool
	// RefineSteps counts the refinement steps of all linear solves.
	RefineSteps int

	// Undetermined says, per part, which of its values the circuit does
	// not determine (see Unknown); those read 0 in V, I and P. Nil when
	// every value is determined.
	Undetermined []Unknown
	// Floating marks the nets with no DC path to ground, whose voltages
	// are not determined (they read 0); nil when there are none.
	Floating []bool
	// Groups are the groups of ideal shorts in parallel, with the current
	// each group carries in all.
	Groups []ShortGroup
	// Multi holds the operating point of every part with more than two
	// pins, in part order (read it with MultiAt); nil when there is none.
	// Such a part's V and I are across its kind's Ends, and its P is the
	// power it absorbs in all, the sum over its pins of the pin's voltage
	// times the current into it there.
	Multi []MultiPoint

	// Self-checks: the largest KCL residual at any net and the largest part
	// current; the sum of the absorbed powers and the sum of their
	// magnitudes.
	KCL, KCLScale        float64
	PowerSum, PowerScale float64
}

// Tolerances of the self-checks (relative).
const (
	KCLTol      = 1e-9
	TellegenTol = 1e-9
)

// MaxDense is the largest system solved with the dense LU when it is forced
// (Options.Dense); its n² storage is 128 MB there.
const MaxDense = 4000

// maxStamps bounds the stamps of one system: sparse indices are int32.
const maxStamps = math.MaxInt32

// Newton iteration caps.
const (
	maxNewton  = 100 // per attempt
	maxTotal   = 3000
	vTolRel    = 1e-9
	vTolAbs    = 1e-12
	gminStart  = 1e-2
	gminFactor = 10
	gminEnd    = 1e-12
	nodeFloor  = 1e-3
	// looseStep: a Newton step larger than this fraction of the largest
	// voltage lets the next iterative solve stop loosely (at its forcing
	// term, or looseTol with the Jacobi preconditioner).
	looseStep = 1e-4
)

// model is one design turned into equations.
type model struct {
	d   *circuit.Design
	mna bool // branch currents for voltage sources; otherwise they are eliminated
	// node gives per net its unknown, or -1 for the ground group, and off
	// its potential above that unknown with every source at full value:
	// V(net) = x[node] + λ·off (x = 0 for the ground group).
	node   []int32
	off    []float64
	tree   []bool  // per part: a short or eliminated source that joins two groups
	branch []int32 // per part: voltage source current unknown, or diode internal node; -1 otherwise
	nNodes int     // net and internal-node unknowns
	n      int
	junc   []junction
	loads  []powerLoad
	sys    *system
	// linear is the system after its fixed stamps (see assemble).
	linear linearStamps
	lin    linearSolver
	lambda float64
	x, dx  []float64
	// xlo holds what x, the solution of the last linear solve, lacks of
	// its double-double value (see refineDD).
	xlo   []float64
	iters int
	// uncertified marks the parts whose values the last linear solve
	// could not certify (nil when it certified all); refineSteps counts
	// refinement steps in all.
	uncertified []bool
	// sourceI is the largest current of a current source in the design
	// (A, at full source strength), set by assemble: one of the design's
	// currents for the certification floor, though no conductance
	// carries it.
	sourceI float64
	// offMax is the largest |offset| of a net above its group's unknown
	// (V, at full source strength): the scale of the rounding in a
	// difference of offsets.
	offMax      float64
	refineSteps int
	// closing marks the parts that close a loop of ideal shorts and
	// voltage sources, and floating the nets with no DC path to ground
	// (nil when none; see determinacy.go).
	closing  []bool
	floating []bool
	// ddFactor is the double-double factorisation of the last system
	// when its float64 one failed, nil otherwise.
	ddFactor *ddLU
	// label is Options.label.
	label func(circuit.PartID) (string, bool)
}

// Solve finds the DC operating point of d. It expects a design the
// topology checks accept (topology.Result.WellPosed); a design they would
// reject may come back as an *Error of kind Singular.
func Solve(d *circuit.Design, opt *Options) (*Result, error) {
	if opt == nil {
		opt = &Options{}
	}
	if hasMulti(d) {
		return solveMulti(d, opt)
	}
	return solveTwoPin(d, opt)
}

// solveTwoPin solves a design whose parts all have two pins.
func solveTwoPin(d *circuit.Design, opt *Options) (*Result, error) {
	t := opt.Temperature
	if t == 0 {
		t = RoomTemperature
	}
	vt := ThermalVoltage(t)
	m, err := build(d, vt, opt.MNA)
	if err != nil {
		return nil, err
	}
	m.label = opt.label
	kind := opt.Solver
	if opt.Dense {
		kind = DenseLU
	}
	if kind == AutoSolver {
		switch {
		case m.n <= AutoDenseMax:
			kind = DenseLU
		case m.mna:
			kind = SparseLU
		case m.n <= AutoCholeskyMax:
			kind = SparseCholesky
		default:
			kind = PCGAMG
		}
	}
	if m.mna && (kind == SparseCholesky || kind == PCGAMG || kind == PCGJacobi || kind == PCGPlainAMG) {
		kind = SparseLU
	}
	if kind == DenseLU && m.n > MaxDense {
		return nil, &Error{Kind: TooLarge, Msg: fmt.Sprintf("%d unknowns is too many for the dense solver (%d)", m.n, MaxDense)}
	}
	var pcg *pcgSolver
	newPCG := func(jacobi, plain bool) {
		pcg = &pcgSolver{tol: PCGTol, private: m.nonlinear(), jacobi: jacobi, plain: plain}
		m.lin = pcg
	}
	switch kind {
	case DenseLU:
		m.lin = &denseSolver{}
	case SparseCholesky:
		c := &cholSolver{}
		m.lin = c
		if opt.Solver == AutoSolver {
			// Chosen by size alone: analyse the pattern first and, if the
			// factor would pass fillBudget (a network without small
			// separators), take the iterative path instead.
			m.assemble(1, 0)
			if err := c.probe(m.sys); err != nil {
				if se := (*Error)(nil); !errors.As(err, &se) || se.Kind != TooLarge {
					return nil, m.singular(err)
				}
				newPCG(false, false)
			}
		}
	case PCGAMG:
		newPCG(false, false)
	case PCGJacobi:
		newPCG(true, false)
	case PCGPlainAMG:
		newPCG(false, true)
	default:
		m.lin = &luSolver{}
	}
	method, err := m.run()
	if err != nil {
		return nil, err
	}
	r := m.result()
	r.Method = method
	err = r.selfCheck(d)
	// An iterative solve stopped on its residual, not on the self-check:
	// if it missed, tighten and solve again from where it stopped.
	for tries := 0; pcg != nil && pcg.fallback == nil && isSelfCheck(err) && tries < 2; tries++ {
		pcg.tol /= 1000
		if method, err = m.run(); err != nil {
			return nil, err
		}
		r = m.result()
		r.Method = method
		err = r.selfCheck(d)
	}
	if pcg != nil {
		r.PCGIterations = pcg.iters
	}
	if err != nil {
		return r, err
	}
	m.markUndetermined(r)
	return r, nil
}

func isSelfCheck(err error) bool {
	var se *Error
	return errors.As(err, &se) && se.Kind == SelfCheck
}
