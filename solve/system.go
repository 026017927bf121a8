// system.go: the stamped linear system A·x = b that assembly fills and the linear solvers read.

package solve

// system is a square linear system A·x = b held as a fixed list of stamps:
// entry k adds val[k] to A[row[k]][col[k]]. The list is recorded on the
// first assembly and refilled in the same order afterwards, so the pattern
// never changes between Newton iterations and a factorisation can keep its
// symbolic analysis. Diagonal stamps are summed as they come and stored as
// the last n entries (one per unknown), which keeps the list — and the
// work of compressing and refilling it — near half of one entry per stamp.
//
// The diagonal and the right side are also summed in double-double
// (diagLo, rhsLo hold what the float64 sums rounded away), so that the
// refinement's residual sees the system as stamped: a teraohm's
// conductance added to a milliohm's survives there though the float64
// diagonal loses it.
type system struct {
	n            int
	row, col     []int32
	val          []float64
	rhs, rhsLo   []float64
	diag, diagLo []float64

	recording bool
	k         int // next stamp when refilling
	// fixed counts the first stamps, which every assembly writes with the
	// same values (see linearStamps); 0 when that is not known.
	fixed int
}

// newSystem returns a system of n unknowns with room for about stamps
// off-diagonal stamps, so that recording the first assembly does not
// regrow the lists.
func newSystem(n, stamps int) *system {
	c := stamps + n
	return &system{n: n, rhs: make([]float64, n), diag: make([]float64, n),
		rhsLo: make([]float64, n), diagLo: make([]float64, n), recording: true,
		row: make([]int32, 0, c), col: make([]int32, 0, c), val: make([]float64, 0, c)}
}

// begin starts a new assembly with the same stamps in the same order.
func (s *system) begin() {
	s.k = 0
	clear(s.rhs)
	clear(s.diag)
	clear(s.rhsLo)
	clear(s.diagLo)
}

// end finishes an assembly, appending or refilling the diagonal.
func (s *system) end() {
	if s.recording {
		for i, v := range s.diag {
			s.row = append(s.row, int32(i))
			s.col = append(s.col, int32(i))
			s.val = append(s.val, v)
		}
		s.recording = false
		return
	}
	copy(s.val[s.k:], s.diag)
}

// add stamps A[i][j] += v; a negative index (ground) drops the stamp.
func (s *system) add(i, j int32, v float64) {
	if i < 0 || j < 0 {
		return
	}
	if i == j {
		var e float64
		s.diag[i], e = twoSum(s.diag[i], v)
		s.diagLo[i] += e
		return
	}
	if s.recording {
		s.row = append(s.row, i)
		s.col = append(s.col, j)
		s.val = append(s.val, v)
		return
	}
	s.val[s.k] = v
	s.k++
}

// conductance stamps g between unknowns a and b (either may be ground).
func (s *system) conductance(a, b int32, g float64) {
	s.add(a, a, g)
	s.add(b, b, g)
	s.add(a, b, -g)
	s.add(b, a, -g)
}

// inject adds current i flowing into unknown a from outside.
func (s *system) inject(a int32, i float64) {
	if a >= 0 {
		var e float64
		s.rhs[a], e = twoSum(s.rhs[a], i)
		s.rhsLo[a] += e
	}
}

// injectProd adds the current g·v into unknown a, the product kept
// exactly (twoProd).
func (s *system) injectProd(a int32, g, v float64) {
	if a >= 0 {
		p, e := twoProd(g, v)
		s.inject(a, p)
		s.rhsLo[a] += e
	}
}

// residual sets r to b − A·(x + xlo), evaluated in double-double from the
// stamps as recorded and rounded to float64 at the end.
func (s *system) residual(r, x, xlo []float64) {
	acc := make([]dd, s.n)
	for i := range acc {
		acc[i] = dd{s.rhs[i], s.rhsLo[i]}
	}
	off := len(s.val) - s.n
	for k, v := range s.val[:off] {
		i, j := s.row[k], s.col[k]
		acc[i] = acc[i].sub(dd{x[j], xlo[j]}.mulF(v))
	}
	for i := range acc {
		acc[i] = acc[i].sub(dd{x[i], xlo[i]}.mul(dd{s.diag[i], s.diagLo[i]}))
		r[i] = acc[i].hi + acc[i].lo
	}
}

// linearStamps holds a system as it stood after the stamps that do not
// change between Newton steps (model.stampLinear), for one lambda: the
// diagonal and the right side with what their double-double sums carry
// below them, and how many off-diagonal stamps had been written. Those
// stamps come first in every assembly, so restoring this state and
// stamping the rest gives, bit for bit, the system a full assembly gives.
// The off-diagonal values they wrote (conductances, and the ±1 of a
// branch current) depend on no lambda and stay in place between
// assemblies; system.fixed counts them.
type linearStamps struct {
	ok           bool
	lambda       float64
	k            int
	diag, diagLo []float64
	rhs, rhsLo   []float64
}

// save records s after the fixed stamps for lambda.
func (c *linearStamps) save(s *system, lambda float64) {
	c.ok, c.lambda = true, lambda
	c.k = s.k
	if s.recording {
		c.k = len(s.val)
	}
	s.fixed = c.k
	c.diag = append(c.diag[:0], s.diag...)
	c.diagLo = append(c.diagLo[:0], s.diagLo...)
	c.rhs = append(c.rhs[:0], s.rhs...)
	c.rhsLo = append(c.rhsLo[:0], s.rhsLo...)
}

// restore begins an assembly of s from the state saved for lambda and
// reports whether there was one; a system still recording its first
// assembly is never restored.
func (c *linearStamps) restore(s *system, lambda float64) bool {
	if !c.ok || c.lambda != lambda || s.recording {
		return false
	}
	s.k, s.fixed = c.k, c.k
	copy(s.diag, c.diag)
	copy(s.diagLo, c.diagLo)
	copy(s.rhs, c.rhs)
	copy(s.rhsLo, c.rhsLo)
	return true
}
