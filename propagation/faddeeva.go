package propagation

import (
	"math"
	"math/cmplx"
	"sync"
)

// Faddeeva returns the Faddeeva function (the scaled complex complementary
// error function) at z,
//
//	w(z) = exp(−z²) erfc(−i z) = exp(−z²) (1 + (2i/√π) ∫_0^z exp(t²) dt)
//	     = (1/√π) ∫_0^∞ exp(−t²/4 + i z t) dt.
//
// In the closed upper half-plane, Im z ≥ 0, where 0 < |w(z)| ≤ 1, the
// relative error |Δw|/|w| is below 2e-15 for all finite z (measured against
// 60-digit reference values for 1e-6 ≤ |z| ≤ 1.6e4, and by construction
// beyond). On the real axis the real part is computed as exp(−x²) directly,
// so it too has full relative accuracy however small it is, and on the
// imaginary axis the result is real. For finite z in the upper half-plane
// the result is never NaN or infinite; as |z| → ∞ it tends to i/(√π z).
// (Expressions such as 1 + i√π z w(z), which tends to −1/(2z²), lose about
// 2·log10|z| digits to cancellation when formed from w.)
//
// In the lower half-plane Faddeeva uses w(z) = 2 exp(−z²) − w(−z), with −z²
// formed in double-double arithmetic; the absolute error is then about
// 2e-15·(|exp(−z²)| + |w(−z)|), which is also a relative error except near
// the zeros of w. If exp(−z²) overflows (Im z < 0 and (Im z)² − (Re z)²
// greater than about 709) the result is infinite: each component is ±Inf
// with the sign of the corresponding component of exp(−z²), or 0 where that
// component is exactly 0. If the phase −2·Re z·Im z of exp(−z²) overflows
// (only for |z| > 1e154) while exp(−z²) does not underflow, the result is
// complex(+Inf, +Inf). Faddeeva never returns NaN unless z has a NaN
// component; for an infinite z in the closed upper half-plane it returns 0.
//
// For |z| < 8 in the upper half-plane Faddeeva uses Weideman's rational
// expansion with N = 40 terms, whose coefficients are computed once, on
// first use; for |z| ≥ 8 it uses the Laplace continued fraction
//
//	w(z) = (i/√π) / (z − (1/2)/(z − 1/(z − (3/2)/(z − 2/(z − …)))))
//
// truncated after between 12 (|z| < 16) and 2 (|z| ≥ 2048) levels, which
// is converged to rounding error there.
//
// Reference: J. A. C. Weideman, "Computation of the complex error
// function", SIAM Journal on Numerical Analysis 31(5) (1994) 1497–1518;
// W. Gautschi, "Efficient computation of the complex error function",
// SIAM Journal on Numerical Analysis 7 (1970) 187–198.
func Faddeeva(z complex128) complex128 {
	x, y := real(z), imag(z)
	if math.IsNaN(x) || math.IsNaN(y) {
		return cmplx.NaN()
	}
	if y >= 0 {
		if math.IsInf(x, 0) || math.IsInf(y, 0) {
			return 0
		}
		w := faddeevaUpper(z)
		switch {
		case y == 0:
			// w(x) = exp(−x²) + i·(2/√π)·Dawson(x): the real part can be
			// far below ε·|w|, so compute it directly.
			return complex(faddeevaExpNegSquare(x), imag(w))
		case x == 0:
			// w(iy) = exp(y²) erfc(y) is real.
			return complex(real(w), 0)
		}
		return w
	}
	// Lower half-plane: w(z) = 2 exp(−z²) − w(−z), with Im(−z) > 0.
	wm := faddeevaUpper(-z)
	if math.IsInf(x, 0) || math.IsInf(y, 0) {
		wm = 0 // the limit of w in the upper half-plane
	}
	e := faddeevaCexpNegSquare(z)
	// Componentwise, so that an infinite e never meets a 0·Inf.
	w := complex(2*real(e)-real(wm), 2*imag(e)-imag(wm))
	if x == 0 {
		return complex(real(w), 0)
	}
	return w
}

// Erfc returns the complementary error function of the complex argument z,
//
//	erfc(z) = 1 − erf(z) = (2/√π) ∫_z^∞ exp(−t²) dt,
//
// computed from the Faddeeva function as erfc(z) = exp(−z²) w(iz) for
// Re z ≥ 0 and as erfc(z) = 2 − erfc(−z) for Re z < 0. For Re z ≥ 0 the
// relative error is about 2e-15 (−z² is formed in double-double
// arithmetic); for Re z < 0 the absolute error is about
// 2e-15·max(2, |erfc(−z)|), a relative error except near the zeros of
// erfc. For real z it agrees with math.Erfc, and on the imaginary axis the
// real part is exactly 1. Where erfc(z) overflows (roughly where
// (Im z)² − (Re z)² > 709) the result is infinite with the signs of the
// true components, as for Faddeeva. For infinite z, Erfc returns 0 if
// Re z = +Inf, 2 if Re z = −Inf, and complex(+Inf, +Inf) if only Im z is
// infinite. Erfc never returns NaN unless z has a NaN component.
//
// Reference: M. Abramowitz and I. A. Stegun, Handbook of Mathematical
// Functions, National Bureau of Standards (1964), eq. 7.1.3, with the
// Faddeeva function evaluated as in Faddeeva.
func Erfc(z complex128) complex128 {
	if math.IsNaN(real(z)) || math.IsNaN(imag(z)) {
		return cmplx.NaN()
	}
	switch {
	case math.IsInf(real(z), 1):
		return 0
	case math.IsInf(real(z), -1):
		return 2
	case math.IsInf(imag(z), 0):
		return cmplx.Inf()
	case real(z) < 0:
		return 2 - faddeevaErfcRightHalf(-z)
	case real(z) == 0:
		// erf(iy) is purely imaginary.
		return complex(1, imag(faddeevaErfcRightHalf(z)))
	}
	return faddeevaErfcRightHalf(z)
}

// faddeevaErfcRightHalf returns erfc(z) = exp(−z²) w(iz) for finite z,
// Re z ≥ 0.
func faddeevaErfcRightHalf(z complex128) complex128 {
	// Im(iz) = Re z ≥ 0, so w(iz) is evaluated directly, is bounded by 1
	// and is non-zero (or underflows to zero for enormous |z|).
	w := Faddeeva(complex(-imag(z), real(z)))
	x, y := real(z), imag(z)
	reHi, reLo, ph, phLo := faddeevaNegSquare(x, y)
	if reHi <= 700 {
		e := faddeevaCexp(reHi, reLo, ph, phLo)
		if imag(z) == 0 {
			return complex(real(e)*real(w), 0)
		}
		return e * w
	}
	// exp(−z²) overflows or nearly so: combine the logarithms.
	if w == 0 {
		return 0
	}
	return faddeevaCexp(reHi+math.Log(cmplx.Abs(w)), reLo, ph+cmplx.Phase(w), phLo)
}

// faddeevaN is the number of terms of Weideman's rational expansion; with
// N = 40 its relative error is below 2e-15 in |z| < 12, Im z ≥ 0 (checked
// against 60-digit reference values). It must be even (see
// faddeevaWeideman).
const faddeevaN = 40

// faddeevaR is the radius beyond which the continued fraction is used.
const faddeevaR = 8

// faddeevaCoef holds L and the coefficients a_1…a_N of Weideman's
// expansion (index 0 is unused).
type faddeevaCoef struct {
	l float64
	a [faddeevaN + 1]float64
}

// faddeevaCoefs computes, once, the coefficients of Weideman (1994):
// with M = 2N, L = √(N/√2) and t_k = L tan(kπ/(2M)),
//
//	a_n = (1/(2M)) Σ_{k=−M+1}^{M−1} exp(−t_k²)(L² + t_k²) cos(kπn/M),
//
// the cosine transform of the mapped, weighted Gaussian.
var faddeevaCoefs = sync.OnceValue(func() *faddeevaCoef {
	const n = faddeevaN
	const m = 2 * n
	c := &faddeevaCoef{l: math.Sqrt(n / math.Sqrt2)}
	l2 := c.l * c.l
	var f [m]float64 // f[k] for k = 0…M−1; f is even in k
	for k := range m {
		t := c.l * math.Tan(float64(k)*math.Pi/(2*m))
		f[k] = math.Exp(-t*t) * (l2 + t*t)
	}
	for j := 1; j <= n; j++ {
		s := f[0]
		for k := 1; k < m; k++ {
			// cos(kπj/M) with the argument reduced exactly mod 2M.
			s += 2 * f[k] * math.Cos(math.Pi*float64((k*j)%(2*m))/m)
		}
		c.a[j] = s / (2 * m)
	}
	return c
})

// faddeevaUpper returns w(z) for Im z ≥ 0 and finite z.
func faddeevaUpper(z complex128) complex128 {
	x, y := real(z), imag(z)
	r2 := x*x + y*y // may overflow to +Inf, which selects the last case
	if r2 < faddeevaR*faddeevaR {
		return faddeevaWeideman(z)
	}
	var n int
	switch {
	case r2 < 16*16:
		n = 12
	case r2 < 32*32:
		n = 7
	case r2 < 64*64:
		n = 5
	case r2 < 128*128:
		n = 4
	case r2 < 2048*2048:
		n = 3
	default:
		n = 2
	}
	return faddeevaContinuedFraction(z, n)
}

// faddeevaWeideman evaluates Weideman's (1994) rational expansion
//
//	w(z) ≈ 2 p(Z)/(L − iz)² + 1/(√π (L − iz)),  Z = (L + iz)/(L − iz),
//	p(Z) = Σ_{n=1}^{N} a_n Z^{n−1},
//
// valid for Im z ≥ 0, where Re(L − iz) ≥ L > 0 and |Z| ≤ 1.
func faddeevaWeideman(z complex128) complex128 {
	c := faddeevaCoefs()
	iz := complex(-imag(z), real(z))
	lc := complex(c.l, 0)
	inv := 1 / (lc - iz)
	zz := (lc + iz) * inv
	// p(Z) = E(Z²) + Z·O(Z²) with E holding a_1, a_3, …, a_{N−1} and O
	// holding a_2, a_4, …, a_N: two independent Horner chains in real
	// arithmetic, which halves the dependency chain.
	zr, zi := real(zz), imag(zz)
	wr, wi := zr*zr-zi*zi, 2*zr*zi
	er, ei := c.a[faddeevaN-1], 0.0
	or, oi := c.a[faddeevaN], 0.0
	for j := faddeevaN - 3; j >= 1; j -= 2 {
		er, ei = er*wr-ei*wi+c.a[j], er*wi+ei*wr
		or, oi = or*wr-oi*wi+c.a[j+1], or*wi+oi*wr
	}
	p := complex(er+or*zr-oi*zi, ei+or*zi+oi*zr)
	return (2*p*inv + 1/math.SqrtPi) * inv
}

// faddeevaContinuedFraction evaluates the Laplace continued fraction with
// n levels below the leading z, from the bottom up; Im z ≥ 0, |z| ≥ 8.
func faddeevaContinuedFraction(z complex128, n int) complex128 {
	x, y := real(z), imag(z)
	if math.Abs(x) > 1e150 || y > 1e150 {
		// Keep clear of overflow in |t|²: use Go's scaled division.
		t := z
		for k := n; k >= 1; k-- {
			t = z - complex(float64(k)/2, 0)/t
		}
		return complex(0, 1/math.SqrtPi) / t
	}
	// t_k = z − (k/2)/t_{k+1}; with n/2 ≤ |z|²/4 every t has |t| ≥ |z|/2,
	// so |t|² neither overflows nor underflows.
	tr, ti := x, y
	for k := n; k >= 1; k-- {
		d := float64(k) / 2 / (tr*tr + ti*ti)
		tr, ti = x-tr*d, y+ti*d
	}
	// (i/√π)/t = (i/√π)·conj(t)/|t|².
	d := 1 / (math.SqrtPi * (tr*tr + ti*ti))
	return complex(ti*d, tr*d)
}

// faddeevaExpNegSquare returns exp(−x²) for real x, correcting for the
// rounding error of x² so that the result is accurate to a few ulp.
func faddeevaExpNegSquare(x float64) float64 {
	x2 := x * x
	if x2 > 746 {
		return 0
	}
	lo := math.FMA(x, x, -x2)
	return math.Exp(-x2) * (1 - lo)
}

// faddeevaNegSquare returns −z² = −(x + iy)² as an unevaluated sum: real
// part reHi + reLo and imaginary part (phase) ph + phLo, where reLo and
// phLo carry the rounding errors of the products. reHi never is NaN for
// non-NaN input.
func faddeevaNegSquare(x, y float64) (reHi, reLo, ph, phLo float64) {
	ax, ay := math.Abs(x), math.Abs(y)
	if ax == ay {
		reHi = 0
	} else if ax > 1e150 || ay > 1e150 {
		reHi = (ay - ax) * (ay + ax) // may be ±Inf, never NaN
	} else {
		x2, y2 := x*x, y*y
		ex, ey := math.FMA(x, x, -x2), math.FMA(y, y, -y2)
		reHi = y2 - x2
		// Error of the subtraction (Knuth TwoSum) plus the product errors.
		bb := reHi - y2
		reLo = (y2 - (reHi - bb)) + (-x2 - bb) + (ey - ex)
	}
	p := x * y
	ph = -2 * p
	if !math.IsInf(p, 0) {
		phLo = -2 * math.FMA(x, y, -p)
	}
	return reHi, reLo, ph, phLo
}

// faddeevaCexp returns exp((reHi + reLo) + i(ph + phLo)) for |reLo| ≤
// ulp(reHi) and |phLo| ≤ ulp(ph), without NaN: see Faddeeva for the
// overflow convention.
func faddeevaCexp(reHi, reLo, ph, phLo float64) complex128 {
	if reHi < -746 {
		return 0
	}
	if math.IsInf(ph, 0) || math.IsNaN(ph) {
		return complex(math.Inf(1), math.Inf(1))
	}
	s, c := math.Sincos(ph)
	// Rotate by phLo and scale by exp(reLo); both are usually so small that
	// the first-order terms are exact to rounding.
	if phLo != 0 {
		ds, dc := phLo, 1.0
		if math.Abs(phLo) > 1e-8 {
			ds, dc = math.Sincos(phLo)
		}
		c, s = c*dc-s*ds, s*dc+c*ds
	}
	if reLo != 0 {
		g := 1 + reLo
		if math.Abs(reLo) > 1e-8 {
			g = math.Exp(reLo)
		}
		c, s = c*g, s*g
	}
	h := math.Exp(reHi / 2) // exp(reHi) = h·h without premature overflow
	var re, im float64
	if c != 0 {
		re = h * c * h
	}
	if s != 0 {
		im = h * s * h
	}
	return complex(re, im)
}

// faddeevaCexpNegSquare returns exp(−z²) with the conventions of faddeevaCexp.
func faddeevaCexpNegSquare(z complex128) complex128 {
	return faddeevaCexp(faddeevaNegSquare(real(z), imag(z)))
}
