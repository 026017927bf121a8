// Package solve finds the DC operating point of a design: every net's
// voltage and every part's voltage, current and power.
//
// # Equations
//
// The equations are those of Modified Nodal Analysis (Ho, Ruehli & Brennan,
// "The modified nodal approach to network analysis", IEEE Trans. Circuits
// and Systems 22(6), 1975): one unknown per net except ground, plus one
// branch current per voltage source. At DC a capacitor is open, an open
// switch is open, and an inductor or fuse is its dcr (a resistor) or, with
// no dcr, an ideal short like a wire or a closed switch.
//
// Ideal shorts get no unknown of their own: the nets they join are merged
// (union–find) before the equations are built, and their currents are
// recovered afterwards from Kirchhoff's current law over the tree of shorts.
// Where shorts alone form a loop (two wires in parallel, say) the split of
// current between them is not determined by the circuit; nodal then gives
// the whole current to the short written first and reports 0 A in each short
// that closes such a loop.
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
// Newton–Raphson solves the nonlinear equations with junction-voltage step
// limiting. If it does not converge, two published continuation methods are
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
