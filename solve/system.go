// system.go: the stamped linear system A·x = b that assembly fills and the linear solvers read.

package solve

// system is a square linear system A·x = b held as a fixed list of stamps:
// entry k adds val[k] to A[row[k]][col[k]]. The list is recorded on the
// first assembly and refilled in the same order afterwards, so the pattern
// never changes between Newton iterations and a factorisation can keep its
// symbolic analysis. Diagonal stamps are summed as they come and stored as
// the last n entries (one per unknown), which keeps the list — and the
// work of compressing and refilling it — near half of one entry per stamp.
type system struct {
	n        int
	row, col []int32
	val      []float64
	rhs      []float64
	diag     []float64

	recording bool
	k         int // next stamp when refilling
}

// newSystem returns a system of n unknowns with room for about stamps
// off-diagonal stamps, so that recording the first assembly does not
// regrow the lists.
func newSystem(n, stamps int) *system {
	c := stamps + n
	return &system{n: n, rhs: make([]float64, n), diag: make([]float64, n), recording: true,
		row: make([]int32, 0, c), col: make([]int32, 0, c), val: make([]float64, 0, c)}
}

// begin starts a new assembly with the same stamps in the same order.
func (s *system) begin() {
	s.k = 0
	clear(s.rhs)
	clear(s.diag)
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
		s.diag[i] += v
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
		s.rhs[a] += i
	}
}
