package sparse

import (
	"math"
	"testing"
)

// Counting every column gives nnz(Pᵀ·A·P) of the product itself, and a
// sample of one column in 16 comes within 10 % of it, on a grid (smoothed
// aggregation's home ground) and on a random graph, whose product fills in.
func TestGalerkinNnzEstimate(t *testing.T) {
	for _, a := range []*CSC{gridLaplacian(80, 1), randomLaplacian(6000, 6, 2, 3)} {
		diag := make([]float64, a.N)
		for j := 0; j < a.M; j++ {
			diag[j] = a.At(j, j)
		}
		agg, nagg := aggregate(a, diag, 0.08, nil)
		p := smoothedProlongator(a, diag, agg, nagg)
		pt := p.T()
		want := mulCSC(pt, mulCSC(a, p)).Nnz()
		if got := galerkinNnzEstimate(a, p, pt, 1); got != want {
			t.Fatalf("exact count %d, product %d", got, want)
		}
		if got := galerkinNnzEstimate(a, p, pt, 16); math.Abs(float64(got-want)) > 0.1*float64(want) {
			t.Fatalf("sampled estimate %d, product %d", got, want)
		}
	}
}
