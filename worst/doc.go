// Package worst finds, for every rated quantity of every part, its largest
// use of its rating over the box of all toleranced parameters: the values
// of parts written with tol (resistors and sources; a capacitor's or
// inductor's own value does nothing at DC) and the ambient temperature over
// its range.
//
// # The box
//
// A part with tol t has the value v·(1 + s·t) for s in [−1, 1]; a
// resistor's tempco then moves it with the ambient temperature. The ambient
// temperature runs over the design's range; judged quantities depend on it
// through resistor values, junction saturation currents, the derating of
// power ratings and junction temperatures, and their worst is taken at an
// end of the range.
//
// # Sensitivities
//
// The DC equations are linearised at the nominal operating point: the
// Jacobian of Kirchhoff's current law with a branch current for every
// voltage source and ideal short (modified nodal analysis; Ho, Ruehli &
// Brennan, IEEE Trans. Circuits and Systems 22(6), 1975) is factored once
// by sparse LU, and one direct solve per toleranced parameter gives the
// first-order change of every net and part: dx/dp = −J⁻¹·∂F/∂p (the
// implicit function theorem). A judged quantity's gradient follows by the
// chain rule, and its first-order worst corner puts each parameter at the
// end that raises it. Direct solves rather than adjoint ones are used
// because every net's range needs all of them anyway.
//
// # Confirmation and interior maxima
//
// A corner chosen from first-order gradients is confirmed by a full
// nonlinear solve at that corner for every quantity whose first-order
// worst case comes near a limit (Options.ConfirmAbove). A resistor's power
// is not monotone in its own value: fed from a Thévenin source it peaks
// where its value equals the source resistance (the maximum power transfer
// theorem). Where the linearised Thévenin resistance a resistor sees lies
// within twice its tolerance band, its own value is searched by golden
// section over the band, with every other parameter at its chosen corner.
//
// # Every corner
//
// With at most Options.MaxCorners parameters (12) and a small design,
// every corner of the box is solved as well, and the largest use seen at
// any of them counts. Tests use that enumeration as the reference for the
// sensitivity method.
//
// # Limits
//
// Work is bounded: designs past MaxUnknowns (checked before anything is
// factored) or whose direct solves would pass MaxWork (counted from the
// factors' fill) are not judged, and the *Skipped error says why; confirmation
// solves stop after MaxConfirm, and the quantities left keep their
// first-order estimate, which Result.Unconfirmed counts.
package worst
