// amd.go: perm ← approximate minimum degree ordering of the pattern of A + Aᵀ

package sparse

import "math"

// AMD returns a fill-reducing symmetric ordering of the square matrix A,
// computed on the pattern of A + Aᵀ (the diagonal and the values are
// ignored). perm[k] is the original index of the unknown eliminated k-th, so
// the Cholesky factor of P·(A+Aᵀ)·Pᵀ with P = I(perm,:) has little fill.
//
// The method is the approximate minimum degree algorithm of Amestoy, Davis
// and Duff (SIAM J. Matrix Anal. Appl. 17(4), 1996), as presented in
// Davis, Direct Methods for Sparse Linear Systems (SIAM 2006), ch. 7. The
// elimination graph is kept implicitly as a quotient graph of variables and
// elements in one integer workspace, with
//   - element absorption: elements adjacent to the pivot merge into the new one;
//   - aggressive absorption: an element e with Le ⊆ Lk is absorbed too;
//   - mass elimination: a variable whose only neighbour is the new element is
//     eliminated with the pivot;
//   - supervariable detection: variables with identical quotient-graph lists
//     (found by hashing) are merged and eliminated together;
//   - the approximate external degree bound of the paper, computed from
//     |Le \ Lk| for every element touching Lk;
//   - rows with more than max(16, 10√n) off-diagonal entries are treated as
//     dense and ordered last.
//
// Unlike the reference presentation no postorder of the assembly tree is
// applied; each supervariable's members are emitted when it is eliminated.
// The cost is near-linear in nnz(A) on the matrices seen in circuit analysis.
func AMD(a *CSC) []int32 {
	a.mustSquare("AMD")
	n := a.N
	perm := make([]int32, n)
	if n == 0 {
		return perm
	}
	ptr, idx := symmetricPattern(a)
	s := newAMDState(n, ptr, idx)
	s.run(perm)
	return perm
}

// symmetricPattern returns the pattern of A + Aᵀ without the diagonal, as
// column pointers and row indices (each column duplicate-free).
func symmetricPattern(a *CSC) (ptr, idx []int32) {
	n := a.N
	at := a.T()
	mark := make([]int32, n)
	for i := range mark {
		mark[i] = -1
	}
	ptr = make([]int32, n+1)
	idx = make([]int32, 0, 2*a.Nnz())
	for j := 0; j < n; j++ {
		mark[j] = int32(j) // excludes the diagonal
		for _, m := range [2]*CSC{a, at} {
			for p := m.P[j]; p < m.P[j+1]; p++ {
				i := m.I[p]
				if mark[i] != int32(j) {
					mark[i] = int32(j)
					idx = append(idx, i)
				}
			}
		}
		ptr[j+1] = int32(len(idx))
	}
	return ptr, idx
}

const (
	amdVar     int8 = iota // principal variable, still to be eliminated
	amdElement             // live element (an eliminated pivot's clique)
	amdDead                // absorbed element, merged or eliminated variable, dense row
)

type amdState struct {
	n     int
	iw    []int32 // lists of all nodes; a variable's list is [elements..., variables...]
	pfree int     // first free slot of iw
	pe    []int32 // start of node's list in iw
	ln    []int32 // length of node's list
	elen  []int32 // number of elements at the front of a variable's list
	nv    []int32 // supervariable size (0 once merged away)
	deg   []int32 // approximate external degree (variables) or |Le| (elements)
	kind  []int8

	head, next, prev []int32 // doubly linked degree lists

	w    []int64 // marks: |Le \ Lk| + wflg for elements, list stamps in hashing
	wflg int64
	inLk []int32 // inLk[i] = k+1 when variable i belongs to the element of pivot k

	hhead, hnext, hval []int32 // hash buckets for supervariable detection

	mnext, mtail []int32 // member lists of supervariables
}

func newAMDState(n int, ptr, idx []int32) *amdState {
	nz := len(idx)
	s := &amdState{n: n}
	s.iw = make([]int32, nz+nz/5+2*n+1)
	copy(s.iw, idx)
	s.pfree = nz
	mk := func() []int32 { return make([]int32, n) }
	s.pe, s.ln, s.elen, s.nv, s.deg = mk(), mk(), mk(), mk(), mk()
	s.next, s.prev, s.inLk, s.hnext, s.hval, s.mnext, s.mtail = mk(), mk(), mk(), mk(), mk(), mk(), mk()
	s.hhead = mk()
	s.head = make([]int32, n+1)
	s.kind = make([]int8, n)
	s.w = make([]int64, n)
	s.wflg = 1
	for i := range s.head {
		s.head[i] = -1
	}
	for i := 0; i < n; i++ {
		s.pe[i] = ptr[i]
		s.ln[i] = ptr[i+1] - ptr[i]
		s.nv[i] = 1
		s.hhead[i] = -1
		s.mnext[i] = -1
		s.mtail[i] = int32(i)
	}
	return s
}

func (s *amdState) dlInsert(i, d int32) {
	s.next[i] = s.head[d]
	s.prev[i] = -1
	if h := s.head[d]; h >= 0 {
		s.prev[h] = i
	}
	s.head[d] = i
}

func (s *amdState) dlRemove(i int32) {
	if p := s.prev[i]; p >= 0 {
		s.next[p] = s.next[i]
	} else {
		s.head[s.deg[i]] = s.next[i]
	}
	if nx := s.next[i]; nx >= 0 {
		s.prev[nx] = s.prev[i]
	}
}

// absorbMembers appends the member list of j to that of i.
func (s *amdState) absorbMembers(i, j int32) {
	s.mnext[s.mtail[i]] = j
	s.mtail[i] = s.mtail[j]
}

func (s *amdState) live(j int) bool {
	return (s.kind[j] == amdVar && s.nv[j] > 0) || s.kind[j] == amdElement
}

// compact squeezes the lists of live nodes to the front of iw (garbage
// collection). The first entry of each list is replaced by a negative tag
// naming its owner, then iw is swept once from the front.
func (s *amdState) compact() {
	for j := 0; j < s.n; j++ {
		if !s.live(j) || s.ln[j] == 0 {
			continue
		}
		first := s.iw[s.pe[j]]
		s.iw[s.pe[j]] = int32(-(j + 1))
		s.pe[j] = first
	}
	dst := 0
	for p := 0; p < s.pfree; {
		if s.iw[p] >= 0 {
			p++
			continue
		}
		j := -s.iw[p] - 1
		l := int(s.ln[j])
		first := s.pe[j]
		s.pe[j] = int32(dst)
		copy(s.iw[dst+1:dst+l], s.iw[p+1:p+l])
		s.iw[dst] = first
		dst += l
		p += l
	}
	s.pfree = dst
}

// reserve makes room for need more entries at pfree, first by compaction and
// then, if still short, by growing iw.
func (s *amdState) reserve(need int) {
	if s.pfree+need <= len(s.iw) {
		return
	}
	s.compact()
	if s.pfree+need+s.n/4 <= len(s.iw) {
		return
	}
	grown := make([]int32, (s.pfree+need)*3/2+s.n)
	copy(grown, s.iw[:s.pfree])
	s.iw = grown
}

// grow enlarges iw without compaction (list positions stay valid).
func (s *amdState) grow(need int) {
	if s.pfree+need <= len(s.iw) {
		return
	}
	grown := make([]int32, (s.pfree+need)*3/2+s.n)
	copy(grown, s.iw[:s.pfree])
	s.iw = grown
}

func (s *amdState) run(perm []int32) {
	n := s.n
	dense := int(max(16, 10*math.Sqrt(float64(n))))
	if dense > n-2 {
		dense = n // no row is dense in a small matrix
	}
	var denseList []int32
	for i := 0; i < n; i++ {
		if int(s.ln[i]) > dense {
			s.kind[i] = amdDead
			s.nv[i] = 0
			denseList = append(denseList, int32(i))
		}
	}
	for i := 0; i < n; i++ {
		if s.kind[i] != amdVar {
			continue
		}
		d := int32(0)
		for p := s.pe[i]; p < s.pe[i]+s.ln[i]; p++ {
			if s.kind[s.iw[p]] == amdVar {
				d++
			}
		}
		s.deg[i] = d
		s.dlInsert(int32(i), d)
	}

	nel := len(denseList)
	pos := 0
	mindeg := int32(0)
	for nel < n {
		// 1. Pivot of least approximate degree.
		for s.head[mindeg] < 0 {
			mindeg++
		}
		k := s.head[mindeg]
		s.dlRemove(k)
		nel += int(s.nv[k])
		stamp := k + 1

		// 2. Room for the new element: at most the sum of list lengths.
		elenk := s.elen[k]
		need := int(s.ln[k] - elenk)
		for p := s.pe[k]; p < s.pe[k]+elenk; p++ {
			if e := s.iw[p]; s.kind[e] == amdElement {
				need += int(s.ln[e])
			}
		}
		s.reserve(need)

		// 3. Lk = (variables adjacent to k) ∪ (variables of elements adjacent
		// to k); those elements are absorbed into k.
		s.kind[k] = amdElement
		start := s.pfree
		degk := int32(0)
		add := func(i int32) {
			if s.kind[i] != amdVar || s.nv[i] <= 0 || s.inLk[i] == stamp {
				return
			}
			s.inLk[i] = stamp
			s.iw[s.pfree] = i
			s.pfree++
			degk += s.nv[i]
			s.dlRemove(i)
		}
		for p := s.pe[k]; p < s.pe[k]+elenk; p++ {
			e := s.iw[p]
			if s.kind[e] != amdElement {
				continue
			}
			for q := s.pe[e]; q < s.pe[e]+s.ln[e]; q++ {
				add(s.iw[q])
			}
			s.kind[e] = amdDead
		}
		for p := s.pe[k] + elenk; p < s.pe[k]+s.ln[k]; p++ {
			add(s.iw[p])
		}
		s.pe[k] = int32(start)
		s.ln[k] = int32(s.pfree - start)
		s.elen[k] = -1
		lkEnd := s.pfree

		// 4. w[e] − wflg = |Le \ Lk| for every element e touching Lk.
		wflg := s.wflg
		for t := start; t < lkEnd; t++ {
			i := s.iw[t]
			nvi := int64(s.nv[i])
			for p := s.pe[i]; p < s.pe[i]+s.elen[i]; p++ {
				e := s.iw[p]
				if s.kind[e] != amdElement {
					continue
				}
				if s.w[e] >= wflg {
					s.w[e] -= nvi
				} else {
					s.w[e] = int64(s.deg[e]) + wflg - nvi
				}
			}
		}

		// 5. Degree update, pruning, aggressive absorption, mass elimination
		// and hashing of each variable of Lk.
		for t := start; t < lkEnd; t++ {
			i := s.iw[t]
			p1 := int(s.pe[i])
			q := p1
			dsum := int64(0)
			h := uint64(0)
			for p := p1; p < p1+int(s.elen[i]); p++ {
				e := s.iw[p]
				if s.kind[e] != amdElement {
					continue
				}
				if dext := s.w[e] - wflg; dext > 0 {
					dsum += dext
					s.iw[q] = e
					q++
					h += uint64(e)
				} else {
					s.kind[e] = amdDead // aggressive absorption: Le ⊆ Lk
				}
			}
			ne := q - p1
			for p := p1 + int(s.elen[i]); p < p1+int(s.ln[i]); p++ {
				j := s.iw[p]
				if s.kind[j] != amdVar || s.nv[j] <= 0 || s.inLk[j] == stamp {
					continue
				}
				dsum += int64(s.nv[j])
				s.iw[q] = j
				q++
				h += uint64(j)
			}
			nvv := q - p1 - ne
			if dsum == 0 {
				// Mass elimination: i is adjacent to nothing but element k.
				nel += int(s.nv[i])
				degk -= s.nv[i]
				s.absorbMembers(k, i)
				s.nv[i] = 0
				s.kind[i] = amdDead
				continue
			}
			s.deg[i] = int32(min(int64(s.deg[i]), dsum))
			if ne+nvv+1 > int(s.ln[i]) {
				// Nothing was pruned (not expected); move the list to the end.
				s.grow(ne + nvv + 1)
				np := s.pfree
				copy(s.iw[np+1:], s.iw[p1:p1+ne+nvv])
				s.pfree += ne + nvv + 1
				p1 = np
				s.pe[i] = int32(np)
				s.iw[np] = k
			} else {
				// Put k at the front: first variable to the end, first element
				// to the first variable slot.
				if nvv > 0 {
					s.iw[p1+ne+nvv] = s.iw[p1+ne]
				}
				if ne > 0 {
					s.iw[p1+ne] = s.iw[p1]
				}
				s.iw[p1] = k
			}
			s.elen[i] = int32(ne + 1)
			s.ln[i] = int32(ne + nvv + 1)
			hv := int32(h % uint64(n))
			s.hval[i] = hv
			s.hnext[i] = s.hhead[hv]
			s.hhead[hv] = i
		}
		s.deg[k] = degk
		s.wflg = wflg + int64(n) + 1

		// 6. Supervariable detection within each hash bucket.
		for t := start; t < lkEnd; t++ {
			i := s.iw[t]
			if s.kind[i] != amdVar || s.nv[i] <= 0 {
				continue
			}
			b := s.hhead[s.hval[i]]
			if b < 0 {
				continue
			}
			s.hhead[s.hval[i]] = -1
			for ; b >= 0; b = s.hnext[b] {
				if s.nv[b] <= 0 || s.hnext[b] < 0 {
					continue
				}
				s.wflg++
				fl := s.wflg
				bp, bl := s.pe[b], s.ln[b]
				for p := bp; p < bp+bl; p++ {
					s.w[s.iw[p]] = fl
				}
				prevj := b
				for j := s.hnext[b]; j >= 0; {
					nj := s.hnext[j]
					same := s.ln[j] == bl && s.elen[j] == s.elen[b]
					for p := s.pe[j]; same && p < s.pe[j]+bl; p++ {
						same = s.w[s.iw[p]] == fl
					}
					if same {
						s.nv[b] += s.nv[j]
						s.nv[j] = 0
						s.kind[j] = amdDead
						s.absorbMembers(b, j)
						s.hnext[prevj] = nj
					} else {
						prevj = j
					}
					j = nj
				}
			}
		}
		s.wflg++

		// 7. Final degrees; Lk keeps only its principal variables.
		q := start
		for t := start; t < lkEnd; t++ {
			i := s.iw[t]
			if s.kind[i] != amdVar || s.nv[i] <= 0 {
				continue
			}
			nvi := s.nv[i]
			d := s.deg[i] + degk - nvi
			d = min(d, int32(n-nel)-nvi)
			s.deg[i] = d
			s.dlInsert(i, d)
			mindeg = min(mindeg, d)
			s.iw[q] = i
			q++
		}
		s.ln[k] = int32(q - start)
		if s.ln[k] == 0 {
			s.kind[k] = amdDead
		}
		if s.pfree == lkEnd {
			s.pfree = q
		}

		// 8. Emit k and everything eliminated with it.
		for m := k; m >= 0; m = s.mnext[m] {
			perm[pos] = m
			pos++
		}
	}
	for _, i := range denseList {
		perm[pos] = i
		pos++
	}
	if pos != n {
		panic("sparse: AMD internal error: ordering incomplete")
	}
}
