// supernodal.go: P·A·Pᵀ = L·Lᵀ by left-looking supernodal Cholesky with dense block updates

package sparse

import (
	"math"

	"gonum.org/v1/gonum/blas"
	"gonum.org/v1/gonum/blas/gonum"
)

// panelBlock is the column block size of the dense panel factorisation.
const panelBlock = 48

// supernodes describes L as a sequence of supernodes: sets of consecutive
// columns f..l−1 where column j+1 is the etree parent of column j and has
// exactly one fewer nonzero, so that all columns share the row structure of
// column f (below their diagonals). Each supernode's part of L is stored as
// a dense column-major block of nrows × ncols values, rows listed in rows.
type supernodes struct {
	super    []int32 // supernode s spans columns super[s] .. super[s+1]-1
	colSuper []int32 // supernode of each column
	rowP     []int32 // rows of supernode s: rows[rowP[s]:rowP[s+1]], ascending
	rows     []int32
	valP     []int // block of supernode s: vals[valP[s]:valP[s+1]]
	vals     []float64
	nnzL     int
}

// buildSupernodes partitions the columns into supernodes from the
// elimination tree and the column counts, then lists the row structure of
// each supernode's first column by a second row-subtree traversal.
func buildSupernodes(c *CSC, parent, counts, stack, mark []int32) supernodes {
	n := c.M
	var sn supernodes
	sn.colSuper = make([]int32, n)
	sn.super = append(sn.super, 0)
	for j := 1; j <= n; j++ {
		if j == n || parent[j-1] != int32(j) || counts[j] != counts[j-1]-1 {
			sn.super = append(sn.super, int32(j))
		}
	}
	ns := len(sn.super) - 1
	sn.rowP = make([]int32, ns+1)
	sn.valP = make([]int, ns+1)
	for s := 0; s < ns; s++ {
		f, l := sn.super[s], sn.super[s+1]
		for j := f; j < l; j++ {
			sn.colSuper[j] = int32(s)
			sn.nnzL += int(counts[j])
		}
		nr := int(counts[f])
		sn.rowP[s+1] = sn.rowP[s] + int32(nr)
		sn.valP[s+1] = sn.valP[s] + nr*int(l-f)
	}
	sn.rows = make([]int32, sn.rowP[ns])
	sn.vals = make([]float64, sn.valP[ns])
	fill := append([]int32(nil), sn.rowP[:ns]...)
	for s := 0; s < ns; s++ {
		sn.rows[fill[s]] = sn.super[s] // the diagonal row comes first
		fill[s]++
	}
	for j := range mark {
		mark[j] = -1
	}
	for k := 0; k < n; k++ {
		top := ereach(c, k, parent, stack, mark)
		for _, j := range stack[top:] {
			if s := sn.colSuper[j]; sn.super[s] == j {
				sn.rows[fill[s]] = int32(k)
				fill[s]++
			}
		}
	}
	return sn
}

// factorSupernodal computes the values of L for the lower triangle cl of
// P·A·Pᵀ. It is the left-looking supernodal method (E. G. Ng and
// B. W. Peyton, "Block sparse Cholesky algorithms on advanced uniprocessor
// computers", SIAM J. Sci. Comput. 14(5), 1993): for each supernode J, the
// columns of A are scattered into J's dense block, every earlier supernode K
// with rows in J's column range subtracts L_K(R,:)·L_K(R₁,:)ᵀ (R the rows of K
// from J's first column on, R₁ those inside J's range), and the block is
// then factorised densely. Supernodes waiting to update J are kept in linked
// lists keyed by the supernode of their next row. tol is the relative pivot
// tolerance; the returned column is in the permuted numbering, or -1.
func (ch *Cholesky) factorSupernodal(cl *CSC, tol float64) int {
	sn := &ch.sn
	ns := len(sn.super) - 1
	relpos, link, next, kpos := ch.relpos, ch.link, ch.nextSN, ch.kpos
	for s := range link {
		link[s] = -1
	}
	var impl gonum.Implementation
	for J := 0; J < ns; J++ {
		f, l := sn.super[J], sn.super[J+1]
		nc := int(l - f)
		rows := sn.rows[sn.rowP[J]:sn.rowP[J+1]]
		nr := len(rows)
		blk := sn.vals[sn.valP[J]:sn.valP[J+1]]
		clear(blk)
		for a, r := range rows {
			relpos[r] = int32(a)
		}
		for j := f; j < l; j++ {
			col := blk[int(j-f)*nr : int(j-f+1)*nr]
			for p := cl.P[j]; p < cl.P[j+1]; p++ {
				col[relpos[cl.I[p]]] += cl.X[p]
			}
			ch.dorig[j] = col[j-f]
		}
		// Updates from descendants.
		K := link[J]
		link[J] = -1
		for K != -1 {
			nextK := next[K]
			krows := sn.rows[sn.rowP[K]:sn.rowP[K+1]]
			knr := len(krows)
			kc := int(sn.super[K+1] - sn.super[K])
			kv := sn.vals[sn.valP[K]:sn.valP[K+1]]
			p0 := int(kpos[K])
			p1 := p0
			for p1 < knr && krows[p1] < l {
				p1++
			}
			m1, m := p1-p0, knr-p0
			if cap(ch.wbuf) < m*m1 {
				ch.wbuf = make([]float64, m*m1)
			}
			w := ch.wbuf[:m*m1]
			// w[b·m + a] = Σ_c L_K(R[a], c)·L_K(R₁[b], c) for a ≥ b.
			if m*m1*kc >= 16384 {
				// Row-major view: M[c][r] = kv[c·knr + r]; w = M(:,R₁)ᵀ·M(:,R).
				impl.Dgemm(blas.Trans, blas.NoTrans, m1, m, kc, 1, kv[p0:], knr, kv[p0:], knr, 0, w, m)
			} else {
				for b := 0; b < m1; b++ {
					wb := w[b*m : (b+1)*m]
					clear(wb[b:])
					for c := 0; c < kc; c++ {
						colc := kv[c*knr+p0 : (c+1)*knr]
						s := colc[b]
						if s == 0 {
							continue
						}
						colc = colc[b:m]
						wbb := wb[b:m]
						for a, v := range colc {
							wbb[a] += s * v
						}
					}
				}
			}
			for b := 0; b < m1; b++ {
				col := blk[int(krows[p0+b]-f)*nr : int(krows[p0+b]-f+1)*nr]
				wb := w[b*m : (b+1)*m]
				for a := b; a < m; a++ {
					col[relpos[krows[p0+a]]] -= wb[a]
				}
			}
			kpos[K] = int32(p1)
			if p1 < knr {
				t := sn.colSuper[krows[p1]]
				next[K] = link[t]
				link[t] = K
			}
			K = nextK
		}
		// Dense factorisation of the nr × nc panel, left-looking by blocks
		// of panelBlock columns: a block is first updated by all columns to
		// its left with one Dgemm, then factorised column by column.
		for c0 := 0; c0 < nc; c0 += panelBlock {
			c1 := min(c0+panelBlock, nc)
			if c0 > 0 {
				// Row-major view B[c][r] = L(r,c):
				// B[c0:c1, c0:nr] −= B[0:c0, c0:c1]ᵀ · B[0:c0, c0:nr].
				impl.Dgemm(blas.Trans, blas.NoTrans, c1-c0, nr-c0, c0, -1, blk[c0:], nr, blk[c0:], nr, 1, blk[c0*nr+c0:], nr)
			}
			for c := c0; c < c1; c++ {
				col := blk[c*nr+c : (c+1)*nr]
				for c2 := c0; c2 < c; c2++ {
					col2 := blk[c2*nr+c : (c2+1)*nr]
					s := col2[0]
					if s == 0 {
						continue
					}
					col2 = col2[:len(col)]
					for a, v := range col2 {
						col[a] -= s * v
					}
				}
				d := col[0]
				if !(d > tol*ch.dorig[int(f)+c]) || !(d > 0) || math.IsInf(d, 0) {
					return int(f) + c
				}
				d = math.Sqrt(d)
				col[0] = d
				inv := 1 / d
				for a := 1; a < len(col); a++ {
					col[a] *= inv
				}
			}
		}
		if nc < nr {
			kpos[J] = int32(nc)
			t := sn.colSuper[rows[nc]]
			next[J] = link[t]
			link[t] = int32(J)
		}
	}
	return -1
}

// solveSupernodal overwrites x with (L·Lᵀ)⁻¹x.
func (sn *supernodes) solve(x []float64) {
	ns := len(sn.super) - 1
	for s := 0; s < ns; s++ {
		f, nc := int(sn.super[s]), int(sn.super[s+1]-sn.super[s])
		rows := sn.rows[sn.rowP[s]:sn.rowP[s+1]]
		nr := len(rows)
		blk := sn.vals[sn.valP[s]:sn.valP[s+1]]
		for c := 0; c < nc; c++ {
			col := blk[c*nr : (c+1)*nr]
			xj := x[f+c] / col[c]
			x[f+c] = xj
			if xj == 0 {
				continue
			}
			for a := c + 1; a < nr; a++ {
				x[rows[a]] -= col[a] * xj
			}
		}
	}
	for s := ns - 1; s >= 0; s-- {
		f, nc := int(sn.super[s]), int(sn.super[s+1]-sn.super[s])
		rows := sn.rows[sn.rowP[s]:sn.rowP[s+1]]
		nr := len(rows)
		blk := sn.vals[sn.valP[s]:sn.valP[s+1]]
		for c := nc - 1; c >= 0; c-- {
			col := blk[c*nr : (c+1)*nr]
			v := x[f+c]
			for a := c + 1; a < nr; a++ {
				v -= col[a] * x[rows[a]]
			}
			x[f+c] = v / col[c]
		}
	}
}

// toCSC returns L in CSC form (diagonal first in each column).
func (sn *supernodes) toCSC(n int) *CSC {
	l := &CSC{N: n, M: n, P: make([]int32, n+1), I: make([]int32, 0, sn.nnzL), X: make([]float64, 0, sn.nnzL)}
	for s := 0; s+1 < len(sn.super); s++ {
		f, nc := int(sn.super[s]), int(sn.super[s+1]-sn.super[s])
		rows := sn.rows[sn.rowP[s]:sn.rowP[s+1]]
		nr := len(rows)
		blk := sn.vals[sn.valP[s]:sn.valP[s+1]]
		for c := 0; c < nc; c++ {
			l.I = append(l.I, rows[c:]...)
			l.X = append(l.X, blk[c*nr+c:(c+1)*nr]...)
			l.P[f+c+1] = int32(len(l.I))
		}
	}
	return l
}
