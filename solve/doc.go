// Package solve finds the DC operating point of a design: every net's
// voltage and every part's voltage, current and power.
//
// # Equations
//
// At DC a capacitor is open, an open switch is open, and an inductor or fuse
// is its dcr (a resistor) or, with no dcr, an ideal short like a wire or a
// closed switch.
//
// Ideal shorts and voltage sources get no unknown of their own. A weighted
// union–find over them (each net carries its potential above its parent)
// turns every group of nets they tie together into one unknown plus known
// offsets — the group holding ground into known voltages — before the
// equations are built. A part that would close a loop of them is left out
// (see Determinacy), so they form a forest. The remaining equations, from resistors, dcr,
// series resistance, the Newton companion conductances of the junctions
// (always positive) and current sources, form a weighted graph Laplacian
// with grounding: symmetric positive definite. The currents of shorts and
// sources are recovered afterwards from Kirchhoff's current law over their
// forest.
//
// The general path, used when Options.MNA asks for it, is Modified Nodal Analysis (Ho, Ruehli & Brennan, "The modified nodal
// approach to network analysis", IEEE Trans. Circuits and Systems 22(6),
// 1975): one unknown per group of shorted nets except ground's, plus one
// branch current per voltage source; its equations are symmetric but
// indefinite.
//
// # Linear solvers
//
// The automatic choice (Options.Solver) takes gonum's dense LU for systems
// of at most AutoDenseMax unknowns; the sparse supernodal Cholesky
// factorisation for the eliminated equations up to AutoCholeskyMax; beyond
// that conjugate gradients preconditioned by smoothed-aggregation AMG; and
// the sparse LU for the indefinite MNA equations. The crossovers were
// measured (see BenchmarkSolverCrossover).
//
// Networks without small separators (random ones rather than laid-out
// ones) defeat both the direct solver and the smoothed coarsening, and are
// caught early: Cholesky's symbolic analysis stops as soon as its column
// counts pass fillBudget, before the factor is allocated, and the AMG
// hierarchy stops at the first level that passes maxComplexity, before the
// product that fills in is held. An automatically chosen Cholesky past its
// budget hands over to PCG; a smoothed hierarchy past its bound gives way
// to plain (unsmoothed) aggregation, PCGPlainAMG, whose coarse matrices
// cannot fill in; past plainMaxComplexity, to the Jacobi preconditioner,
// PCGJacobi. A PCG that does not converge falls back to Cholesky within
// its budget, and only then is the design TooLarge. Result.Linear names the
// solver that produced the solution. In a Newton loop every factorisation keeps its
// symbolic analysis and refactors numerically; PCG keeps its multigrid
// hierarchy while it stays effective (a plain-aggregation one keeps its
// aggregates and has its coarse matrices recomputed for each new matrix)
// and starts from the previous solution. Each Newton step's iterative
// solve stops at an Eisenstat–Walker forcing term, loose while the
// iterates move far (at its loosest while junction limiting cuts the
// steps) and tighter as the nonlinear residual falls; the step that ends
// the Newton run is solved tightly.
// A PCG solution is accepted when, beyond its residual norm, every unknown
// is settled against its own equation (see pcgSolver.settled), and Solve
// tightens the tolerance and solves again if the result misses the KCL
// self-check.
//
// # Accuracy
//
// Every solve with a factorisation (dense LU, sparse Cholesky, sparse LU)
// is refined: the residual b − A·x is evaluated in double-double
// arithmetic from the stamps as recorded (the diagonal and the right side
// summed in double-double, so that a teraohm's conductance beside a
// milliohm's is not rounded away), the solution is kept in double-double,
// and steps continue until every part's voltage, and a resistive part's
// current, is certified to 1e-10 of itself (or 1e-15 of the largest in the
// design) by a step that is also at most half the one before it
// (extra-precise iterative refinement: Higham, Accuracy and Stability of
// Numerical Algorithms, 2nd ed., 2002, ch. 12; Demmel et al., ACM Trans.
// Math. Softw. 32(2), 2006). Part voltages are the double-double
// differences of the net voltages, so a picovolt across a milliohm between
// nets at volts keeps its digits. Where the float64 factors cannot carry
// the refinement (they lose a pivot, or the steps stop shrinking), a
// system of at most 300 unknowns is factorised again in double-double;
// a larger one that still does not converge has every part marked in
// Result.Uncertified, and the rating rules say so on their findings. The
// iterative path is not refined this way: its acceptance test bounds the
// error by 1e-11 of the largest voltage (see pcgSolver.settled).
//
// # Condition
//
// Result.Cond estimates κ₁ of the system after the symmetric scaling
// D·A·D, D = diag(1/√(max_j |a_ij|)) (Jacobi scaling for the Laplacian;
// van der Sluis, Numer. Math. 14, 1969), by the Hager–Higham estimator. A
// net tied to the rest only by a junction's leakage then raises no alarm,
// while a milliohm link between nets held by teraohms still does. PCG makes
// no estimate: Cond is 0 and CondEstimated false.
//
// # Determinacy
//
// What the circuit does not determine is not guessed. A loop of ideal
// shorts and voltage sources whose voltages sum to zero (two equal
// supplies tied together, two wires in parallel) fixes the node voltages
// but not the current circulating around it: the parts that close such
// loops (found by a weighted union–find in statement order) are left out
// of the equations, the node voltages are solved, and every short or source
// on such a loop — every part of their graph that is not a bridge — has its
// current marked in Result.Undetermined and reported as 0, whichever order
// the statements come in. Shorts in parallel between the same two nets
// form a ShortGroup whose total current is determined and reported. A loop
// whose voltages do not sum to zero (to 1e-9 of its largest voltage, as
// the topology rules judge it) has no solution: a Singular error naming
// the part that closes it. Nets with no DC path to ground get no unknown
// (Result.Floating, read as 0 V), the parts on them are marked, and the
// rest is solved; Kirchhoff's current law is not checked at those nets.
//
// # Sign convention
//
// A part's voltage is V(pin 1) − V(pin 2), its pins in the order the kind
// lists them (a, b; pos, neg; from, to; anode, cathode). Its current is
// positive when it flows from pin 1 to pin 2 through the part. Its power is
// voltage times current: positive when the part absorbs energy, negative
// when it delivers it (a battery driving a load has negative power). With
// this convention the powers of all parts sum to zero (Tellegen's theorem).
//
// A current source's value is the current it drives from its "from" pin
// through itself to its "to" pin.
//
// # Diodes and LEDs
//
// A junction follows the Shockley equation I = Is·(exp(V/(n·Vt)) − 1), in
// series with the part's series resistance. Is is fixed by the part's
// "vf V at A": the junction carries A at V − A·series. The ideality n
// defaults to 1 for a diode and 2 for an LED (common practice). Vt = kT/q
// uses the exact SI values of k and q (CODATA 2018) at 25 °C. A leakage
// conductance of 1 pS (Leakage) sits across every junction so that a
// reverse-biased junction never leaves a net without a path; its current
// is included in the part's current.
//
// Newton–Raphson solves the nonlinear equations from every junction off
// (0 V), with junction-voltage step limiting past the vf point. If it does
// not converge, two published continuation methods are
// tried in turn: gmin stepping (a conductance from every net to ground,
// reduced step by step to zero) and source stepping (every source ramped
// from zero to its value); see Najm, Circuit Simulation, Wiley 2010, ch. 3
// (from memory), and Allgower & Georg, Numerical Continuation Methods,
// Springer 1990. Every loop has an iteration cap.
//
// # Self-checks
//
// After every solve Kirchhoff's current law is checked at every net (the
// residual must not exceed 1e-9 of the largest part current, or of the
// largest current a resistive part would carry with one end at 0 V, which
// is the precision node voltages allow) and Tellegen's
// theorem on the branch powers (their sum must not exceed 1e-9 of the sum of
// their magnitudes). A failed check is returned as an *Error of kind
// SelfCheck naming the nets.
package solve
