// ddarith.go: double-double arithmetic, a value held as hi + lo (about 32 significant digits) from error-free transformations of float64 sums and products

package solve

import "math"

// twoSum returns s = fl(a + b) and e with s + e = a + b exactly (Knuth,
// The Art of Computer Programming, vol. 2, 3rd ed., 1997, §4.2.2, from
// memory).
func twoSum(a, b float64) (s, e float64) {
	s = a + b
	bb := s - a
	return s, (a - (s - bb)) + (b - bb)
}

// quickTwoSum is twoSum for |a| ≥ |b| (Dekker, "A floating-point
// technique for extending the available precision", Numer. Math. 18,
// 1971).
func quickTwoSum(a, b float64) (s, e float64) {
	s = a + b
	return s, b - (s - a)
}

// twoProd returns p = fl(a·b) and e with p + e = a·b exactly, by one fused
// multiply–add (Ogita, Rump & Oishi, "Accurate sum and dot product", SIAM
// J. Sci. Comput. 26(6), 2005).
func twoProd(a, b float64) (p, e float64) {
	p = a * b
	return p, math.FMA(a, b, -p)
}

// dd is the unevaluated sum hi + lo with |lo| ≤ ulp(hi)/2. The operations
// follow Hida, Li & Bailey's double-double algorithms ("Algorithms for
// quad-double precision floating point arithmetic", ARITH 15, 2001, from
// memory), with relative errors of a few units in 2⁻¹⁰⁶.
type dd struct{ hi, lo float64 }

func (x dd) add(y dd) dd {
	s, e := twoSum(x.hi, y.hi)
	t, f := twoSum(x.lo, y.lo)
	e += t
	s, e = quickTwoSum(s, e)
	e += f
	s, e = quickTwoSum(s, e)
	return dd{s, e}
}

func (x dd) neg() dd { return dd{-x.hi, -x.lo} }

func (x dd) sub(y dd) dd { return x.add(y.neg()) }

// mulF returns x·b for a float64 b.
func (x dd) mulF(b float64) dd {
	p, e := twoProd(x.hi, b)
	e += x.lo * b
	p, e = quickTwoSum(p, e)
	return dd{p, e}
}

func (x dd) mul(y dd) dd {
	p, e := twoProd(x.hi, y.hi)
	e += x.hi*y.lo + x.lo*y.hi
	p, e = quickTwoSum(p, e)
	return dd{p, e}
}

// div returns x/y by long division with three float64 quotient digits.
func (x dd) div(y dd) dd {
	q1 := x.hi / y.hi
	r := x.sub(y.mulF(q1))
	q2 := r.hi / y.hi
	r = r.sub(y.mulF(q2))
	q3 := r.hi / y.hi
	s, e := quickTwoSum(q1, q2)
	return dd{s, e}.add(dd{q3, 0})
}

func (x dd) abs() float64 { return math.Abs(x.hi + x.lo) }
