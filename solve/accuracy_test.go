package solve

import (
	"fmt"
	"math"
	"math/big"
	"testing"

	"pgregory.net/rapid"
)

// seriesExact returns the exact net voltages of a source v driving
// resistors rs in series to ground, as rationals: the current is
// v / Σr (Ohm's law), and each net sits that current times the
// resistance below it above ground.
func seriesExact(v float64, rs []float64) []*big.Rat {
	sum := new(big.Rat)
	for _, r := range rs {
		sum.Add(sum, new(big.Rat).SetFloat64(r))
	}
	i := new(big.Rat).Quo(new(big.Rat).SetFloat64(v), sum)
	out := make([]*big.Rat, len(rs))
	below := new(big.Rat)
	for k := len(rs) - 1; k >= 0; k-- {
		below.Add(below, new(big.Rat).SetFloat64(rs[k]))
		out[k] = new(big.Rat).Mul(i, below)
	}
	return out
}

// relErr returns |got − want| / |want| computed exactly.
func relErr(got float64, want *big.Rat) float64 {
	d := new(big.Rat).Sub(new(big.Rat).SetFloat64(got), want)
	if want.Sign() == 0 {
		f, _ := d.Float64()
		return f
	}
	f, _ := d.Quo(d.Abs(d), new(big.Rat).Abs(want)).Float64()
	return f
}

// Resistances spread over sixteen decades in series: 10 V across 2 TΩ,
// 0.5 mΩ and 3 TΩ. The exact answers are rationals (Ohm's law in
// math/big): 6 V − 1e-15 V below the milliohm, 2 pA through every part.
// Every linear solver and both formulations must give each net voltage,
// the milliohm's voltage and every current to 1e-9 relative, and certify
// them.
func TestExtremeRangeSeriesExact(t *testing.T) {
	rs := []float64{2e12, 0.5e-3, 3e12}
	cases := []Options{{}, {Dense: true}, {Solver: SparseCholesky}, {Solver: SparseLU}, {MNA: true}, {MNA: true, Dense: true}}
	for _, opt := range cases {
		b := newBuilder()
		b.v("n0", "gnd", 10)
		var parts []int
		nets := []string{"n0", "n1", "n2", "gnd"}
		for k, r := range rs {
			parts = append(parts, int(b.r(nets[k], nets[k+1], r)))
		}
		res := b.solve(t, &opt)
		want := seriesExact(10, rs)
		for k := range rs {
			if e := relErr(b.volts(res, nets[k]), want[k]); !(e <= 1e-9) {
				t.Errorf("%+v: V(%s) = %.12g, relative error %.2g", opt, nets[k], b.volts(res, nets[k]), e)
			}
		}
		// The milliohm's voltage and each current, exactly.
		i := new(big.Rat).Quo(big.NewRat(10, 1), new(big.Rat).Add(new(big.Rat).SetFloat64(rs[0]), new(big.Rat).Add(new(big.Rat).SetFloat64(rs[1]), new(big.Rat).SetFloat64(rs[2]))))
		vmid := new(big.Rat).Mul(i, new(big.Rat).SetFloat64(rs[1]))
		if e := relErr(res.V[parts[1]], vmid); !(e <= 1e-9) {
			t.Errorf("%+v: V across the milliohm %.6g, relative error %.2g", opt, res.V[parts[1]], e)
		}
		for _, p := range parts {
			if e := relErr(res.I[p], i); !(e <= 1e-9) {
				t.Errorf("%+v: I(%s) = %.6g, relative error %.2g", opt, b.d.Parts[p].Local, res.I[p], e)
			}
		}
		if res.Uncertified != nil {
			t.Errorf("%+v: uncertified parts %v", opt, res.Uncertified)
		}
	}
}

// Random series chains with resistances over seventeen decades, on every
// solver: every part the solve certifies carries the exact current of
// Ohm's law (math/big) to 1e-9, and every net voltage is exact to 1e-9.
// Chains longer than ddDenseMax keep the float64 factors only; there a
// part may instead be marked Uncertified.
func TestSeriesChainsExactOrUncertified(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		n := rapid.IntRange(1, 8).Draw(t, "n")
		if rapid.IntRange(0, 9).Draw(t, "long") == 0 {
			n = ddDenseMax + rapid.IntRange(1, 40).Draw(t, "extra")
		}
		rs := make([]float64, n)
		for k := range rs {
			rs[k] = math.Pow(10, rapid.Float64Range(-4, 13).Draw(t, "log10 R"))
		}
		v := rapid.Float64Range(0.1, 1000).Draw(t, "V")
		opt := []Options{{}, {Dense: true}, {Solver: SparseCholesky}, {Solver: SparseLU}, {MNA: true}}[rapid.IntRange(0, 4).Draw(t, "solver")]
		b := newBuilder()
		b.v("n0", "gnd", v)
		nets := []string{"n0"}
		var parts []int
		for k := range rs {
			next := fmt.Sprintf("n%d", k+1)
			if k == n-1 {
				next = "gnd"
			}
			parts = append(parts, int(b.r(nets[k], next, rs[k])))
			nets = append(nets, next)
		}
		res, err := Solve(b.d, &opt)
		if err != nil {
			// Past ddDenseMax a float64 factorisation that loses its
			// pivot is an error the rules report (solve-failed), never
			// a wrong number.
			if n <= ddDenseMax {
				t.Fatalf("%+v: %v", opt, err)
			}
			return
		}
		want := seriesExact(v, rs)
		sum := new(big.Rat)
		for _, r := range rs {
			sum.Add(sum, new(big.Rat).SetFloat64(r))
		}
		i := new(big.Rat).Quo(new(big.Rat).SetFloat64(v), sum)
		for k, p := range parts {
			if res.Uncertified != nil && res.Uncertified[p] {
				if n <= ddDenseMax {
					t.Fatalf("%s uncertified in a chain of %d", b.d.Parts[p].Local, n)
				}
				continue
			}
			if e := relErr(res.I[p], i); !(e <= 1e-9) {
				t.Fatalf("%+v: I(%s) = %.6g, relative error %.2g", opt, b.d.Parts[p].Local, res.I[p], e)
			}
			if e := relErr(b.volts(res, nets[k]), want[k]); !(e <= 1e-9) {
				t.Fatalf("%+v: V(%s) = %.12g, relative error %.2g", opt, nets[k], b.volts(res, nets[k]), e)
			}
		}
	})
}
