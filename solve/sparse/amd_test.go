package sparse

import (
	"testing"

	"pgregory.net/rapid"
)

func identityPerm(n int) []int32 {
	p := make([]int32, n)
	for i := range p {
		p[i] = int32(i)
	}
	return p
}

// AMD must return a permutation for any square pattern, including
// unsymmetric ones, empty columns and duplicate-heavy triplets.
func TestAMDIsPermutation(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		n := rapid.IntRange(0, 300).Draw(t, "n")
		if n == 0 {
			if p := AMD(NewCSC(0, 0, 0)); len(p) != 0 {
				t.Fatalf("non-empty ordering for empty matrix")
			}
			return
		}
		tr := NewTriplet(n, n, 0)
		nz := rapid.IntRange(0, 6*n).Draw(t, "nz")
		for s := 0; s < nz; s++ {
			tr.Add(rapid.IntRange(0, n-1).Draw(t, "i"), rapid.IntRange(0, n-1).Draw(t, "j"), 1)
		}
		if dense := rapid.IntRange(-1, n-1).Draw(t, "dense"); dense >= 0 {
			for i := 0; i < n; i++ {
				tr.Add(i, dense, 1)
			}
		}
		if p := AMD(tr.Compress()); !isPermutation(p, n) {
			t.Fatalf("AMD result is not a permutation of 0..%d", n-1)
		}
	})
}

// On the k×k 5-point grid the natural (row-by-row) order is a band of
// half-width k with nnz(L) ≈ n·k (George & Liu, Computer Solution of Large
// Sparse Positive Definite Systems, 1981, ch. 4, from memory); a minimum
// degree order must do far better (common practice: at least 3× less fill
// already at k = 60).
func TestAMDReducesGridFill(t *testing.T) {
	for _, k := range []int{10, 30, 60} {
		a := gridLaplacian(k, 1)
		var nat, amd Cholesky
		nat.AnalyzePerm(a, identityPerm(a.N))
		amd.Analyze(a)
		t.Logf("k=%d natural nnz(L)=%d AMD nnz(L)=%d", k, nat.NnzL(), amd.NnzL())
		if amd.NnzL() >= nat.NnzL() {
			t.Fatalf("k=%d: AMD fill %d not below natural %d", k, amd.NnzL(), nat.NnzL())
		}
		if k == 60 && 3*amd.NnzL() > nat.NnzL() {
			t.Fatalf("k=60: AMD fill %d is not 3× below natural %d", amd.NnzL(), nat.NnzL())
		}
	}
}

// An arrow matrix (diagonal plus one full row and column) has no fill when
// the full row is eliminated last and complete fill when it is first
// (George & Liu 1981, ch. 2, from memory). AMD's dense-row rule and its
// degree choice must both put it last, giving nnz(L) = 2n − 1.
func TestAMDArrow(t *testing.T) {
	for _, n := range []int{20, 400} {
		tr := NewTriplet(n, n, 3*n)
		hub := n / 3
		for i := 0; i < n; i++ {
			tr.Add(i, i, float64(n))
			if i != hub {
				tr.Add(i, hub, 1)
				tr.Add(hub, i, 1)
			}
		}
		a := tr.Compress()
		var ch Cholesky
		ch.Analyze(a)
		if ch.NnzL() != 2*n-1 {
			t.Fatalf("n=%d: nnz(L) = %d, want %d", n, ch.NnzL(), 2*n-1)
		}
	}
}
