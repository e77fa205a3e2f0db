package propagation

import (
	"fmt"
	"math"
	"math/cmplx"
	"testing"

	"gonum.org/v1/gonum/integrate/quad"
)

// faddeevaRelErr returns |got − want|/|want|, or |got| when want is 0.
func faddeevaRelErr(got, want complex128) float64 {
	if want == 0 {
		return cmplx.Abs(got)
	}
	return cmplx.Abs(got-want) / cmplx.Abs(want)
}

// faddeevaAsymptoticSeries returns the asymptotic expansion
//
//	√π z exp(z²) erfc(z) ~ 1 + Σ_{m≥1} (−1)^m (1·3·…·(2m−1)) / (2z²)^m
//
// of Abramowitz & Stegun eq. 7.1.23, summed until a term falls below 1e-18
// (or starts to grow); it is used for |z| ≥ 20, where that happens long
// before the series' optimal truncation point.
func faddeevaAsymptoticSeries(z complex128) complex128 {
	sum, term := complex(1, 0), complex(1, 0)
	inv := 1 / (2 * z * z)
	prev := math.Inf(1)
	for m := 1; m < 200; m++ {
		term *= -complex(float64(2*m-1), 0) * inv
		a := cmplx.Abs(term)
		if a > prev {
			break
		}
		sum += term
		if a < 1e-18 {
			break
		}
		prev = a
	}
	return sum
}

// TestFaddeevaImaginaryAxis checks w(iy) = exp(y²) erfc(y), which is real.
func TestFaddeevaImaginaryAxis(t *testing.T) {
	const tol = 1e-13
	// Reference: the closed form w(iy) = exp(y²) erfc(y) (A&S 7.1.3 with
	// z = iy), evaluated with Go's standard library math.Erfc and math.Exp.
	// exp(y²) is taken as exp(hi)·(1 + lo), where hi + lo = y² exactly
	// (lo from math.FMA), so the reference is not spoilt by the rounding of
	// y², whose error would be amplified by y².
	for _, y := range []float64{0, 1e-300, 1e-6, 0.1, 0.5, 1, 2, 3.5, 5, 7.999, 8, 8.001, 10, 12.5, 15, 17.3, 20} {
		t.Run(fmt.Sprintf("y=%g", y), func(t *testing.T) {
			hi := y * y
			lo := math.FMA(y, y, -hi)
			want := math.Exp(hi) * (1 + lo) * math.Erfc(y)
			got := Faddeeva(complex(0, y))
			if e := math.Abs(real(got)-want) / want; e > tol || imag(got) != 0 {
				t.Errorf("Faddeeva(%vi) = %v, want %v (real), rel err %.3g, tol %g", y, got, want, e, tol)
			}
		})
	}
	// Reference: for y ≥ 20 exp(y²) erfc(y) under- or overflows in float64,
	// so compare with the asymptotic series of A&S eq. 7.1.23,
	// w(iy) ~ (1/(√π y)) Σ (−1)^m (2m−1)!!/(2y²)^m.
	for _, y := range []float64{20, 25, 30, 50, 100, 1e3, 1e4, 1e6, 1e100} {
		t.Run(fmt.Sprintf("asymptotic/y=%g", y), func(t *testing.T) {
			want := real(faddeevaAsymptoticSeries(complex(y, 0))) / (math.SqrtPi * y)
			got := Faddeeva(complex(0, y))
			if e := math.Abs(real(got)-want) / want; e > tol || imag(got) != 0 {
				t.Errorf("Faddeeva(%gi) = %v, want %v (real), rel err %.3g, tol %g", y, got, want, e, tol)
			}
		})
	}
}

// TestFaddeevaRealAxis checks Re w(x) = exp(−x²) for real x, to full relative
// accuracy even where exp(−x²) ≪ |w(x)|.
func TestFaddeevaRealAxis(t *testing.T) {
	const tol = 4e-16
	// Reference: the closed form Re w(x) = exp(−x²) (A&S 7.1.3 for real z),
	// evaluated with Go's math.Exp. The x are chosen with short mantissas so
	// that x*x is exact and math.Exp(-x*x) is a correctly-rounded-to-1-ulp
	// reference; 27.25 gives a subnormal and 28 an underflow to 0.
	for _, x := range []float64{0, 0.5, -0.5, 1, 1.5, -2.25, 3, 4.75, -6.5, 7.75, 8, 10.125, -15, 20.5, 26.5, -27.25, 28} {
		t.Run(fmt.Sprintf("x=%g", x), func(t *testing.T) {
			want := math.Exp(-x * x)
			got := real(Faddeeva(complex(x, 0)))
			e := math.Abs(got - want)
			if want != 0 {
				e /= want
			}
			if e > tol {
				t.Errorf("real(Faddeeva(%g)) = %v, want %v, rel err %.3g, tol %g", x, got, want, e, tol)
			}
		})
	}
}

// faddeevaQuad evaluates
//
//	w(z) = (1/√π) ∫_0^∞ exp(−t²/4 + i z t) dt,
//
// valid for every complex z, with gonum's fixed Gauss–Legendre rule on
// unit panels of [0, T], T = 2·max(0, −Im z) + 40 (beyond T the integrand
// is below exp(−400) of its peak).
func faddeevaQuad(z complex128) complex128 {
	x, y := real(z), imag(z)
	tMax := 2*math.Max(0, -y) + 40
	re := func(t float64) float64 { return math.Exp(-t*t/4-y*t) * math.Cos(x*t) }
	im := func(t float64) float64 { return math.Exp(-t*t/4-y*t) * math.Sin(x*t) }
	var sr, si float64
	for a := 0.0; a < tMax; a++ {
		b := math.Min(a+1, tMax)
		sr += quad.Fixed(re, a, b, 40, quad.Legendre{}, 0)
		si += quad.Fixed(im, a, b, 40, quad.Legendre{}, 0)
	}
	return complex(sr, si) / math.SqrtPi
}

// TestFaddeevaQuadrature compares with an independent numerical evaluation
// of the integral representation on a grid of the upper half-plane and at a
// few points of the lower half-plane.
func TestFaddeevaQuadrature(t *testing.T) {
	// In the lower half-plane the integrand peaks at exp(y²) (at t = −2y)
	// and the quadrature loses about ε·exp(y²)/|w| to cancellation, so the
	// tolerance there is scaled by that factor.
	const tol = 1e-13
	var zs []complex128
	for _, x := range []float64{-10, -7.5, -5, -2.5, -1, 0, 0.5, 1, 2.5, 5, 7.5, 10} {
		for _, y := range []float64{0, 0.1, 0.5, 1, 2, 5, 10} {
			zs = append(zs, complex(x, y))
		}
	}
	zs = append(zs, -0.5i, 1-1i, -2-0.5i, 0.5-2i, -4-1i, 2-2i)
	worst := 0.0
	for _, z := range zs {
		t.Run(fmt.Sprintf("z=%v", z), func(t *testing.T) {
			// Reference: numerical quadrature of (1/√π)∫_0^∞ exp(−t²/4+izt) dt
			// with gonum.org/v1/gonum/integrate/quad (see faddeevaQuad).
			want := faddeevaQuad(z)
			got := Faddeeva(z)
			tolZ := tol
			if y := imag(z); y < 0 {
				tolZ *= math.Max(1, math.Exp(y*y)/cmplx.Abs(want))
			} else {
				worst = math.Max(worst, faddeevaRelErr(got, want))
			}
			if e := faddeevaRelErr(got, want); e > tolZ {
				t.Errorf("Faddeeva(%v) = %v, want %v, rel err %.3g, tol %.3g", z, got, want, e, tolZ)
			}
		})
	}
	t.Logf("largest relative difference from quadrature, upper half-plane grid: %.3g", worst)
}

// TestFaddeevaKnownValues checks tabulated values.
func TestFaddeevaKnownValues(t *testing.T) {
	const tol = 3e-15
	type knownValue struct {
		name    string
		z, want complex128
	}
	cases := []knownValue{
		// Reference: from memory (cross-checked while writing this test
		// against mpmath 1.3.0 at 30 digits: exp(−z²) erfc(−iz) =
		// 0.304744205256912592457 + 0.208218938202831627287i).
		{"w(1+i)", 1 + 1i, 0.30474420525691259 + 0.20821893820283162i},
		// Reference: w(0) = 1 exactly (definition).
		{"w(0)", 0, 1},
		// Reference: Dawson's integral F(1) = 0.5380795069127684, from
		// memory (A&S Table 7.5 tabulates Dawson's integral), with
		// Im w(x) = (2/√π) F(x) for real x (A&S 7.1.3 and 7.1.16), and
		// Re w(1) = exp(−1) (math.Exp).
		{"w(1) via Dawson F(1)", 1, complex(math.Exp(-1), 2/math.SqrtPi*0.5380795069127684)},
		// Reference: w(−x) = conj(w(x)) for real x applied to the row above.
		{"w(-1) via Dawson F(1)", -1, complex(math.Exp(-1), -2/math.SqrtPi*0.5380795069127684)},
	}
	// Reference: computed for this test with mpmath 1.3.0 (Python) in
	// 60-digit arithmetic as exp(−z²)·erfc(−iz), rounded to 20 digits.
	// They cover the lower half-plane (where the phase of exp(−z²) must be
	// formed accurately), the region just above the real axis, both sides
	// of the |z| = 8 switch, and large |z|.
	mp := []struct {
		z, want complex128
	}{
		{-5.3 - 4.1i, complex(-5.2352036121188861203e-2, -6.6184388469434384266e-2)},
		{10.3 - 10.1i, complex(-1.914511792378483652e-3, 5.0026566546898044736e-2)},
		{0.7 - 0.2i, complex(6.7585300563920423661e-1, 7.8486658479626116462e-1)},
		{3.7 + 0.01i, complex(4.7006535500767020219e-4, 1.5881914011155012723e-1)},
		{-6.1 + 1e-7i, complex(1.5819010246960545752e-9, -9.3786735791048972429e-2)},
		{7.99 + 0.5i, complex(4.5081992655695058098e-3, 7.0889416638291534845e-2)},
		{-8.01 + 2i, complex(1.6901440749847002716e-2, -6.6677995599468759107e-2)},
		{20.5 + 0.3i, complex(4.041117237407067427e-4, 2.7548369693802317223e-2)},
		{-1234.5 + 0.25i, complex(9.255146411189457157e-8, -4.5701882990101522908e-4)},
		{1e-6 + 1e-6i, complex(9.9999887162083290599e-1, 1.1283771670970170284e-6)},
		{2.5 + 3.5i, complex(1.0748312840717246998e-1, 7.2887243226424371519e-2)},
	}
	for _, c := range mp {
		cases = append(cases, knownValue{fmt.Sprintf("mpmath w(%v)", c.z), c.z, c.want})
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			got := Faddeeva(c.z)
			if e := faddeevaRelErr(got, c.want); e > tol {
				t.Errorf("Faddeeva(%v) = %v, want %v, rel err %.3g, tol %g", c.z, got, c.want, e, tol)
			}
		})
	}
}

// TestFaddeevaSymmetry checks w(−z̄) = conj(w(z)) and w(z) + w(−z) = 2exp(−z²).
func TestFaddeevaSymmetry(t *testing.T) {
	const tol = 1e-15
	for _, r := range []float64{1e-6, 0.3, 1, 2.7, 7.9, 8.1, 20, 300, 1e4} {
		for _, th := range []float64{0, 0.1, 0.7, 1.2, math.Pi / 2, 2.5, 3.1} {
			z := cmplx.Rect(r, th)
			name := fmt.Sprintf("r=%g/theta=%g", r, th)
			t.Run("reflection/"+name, func(t *testing.T) {
				// Reference: reflection symmetry w(−z̄) = conj(w(z)) (A&S 7.1.12).
				got, want := Faddeeva(-cmplx.Conj(z)), cmplx.Conj(Faddeeva(z))
				if e := faddeevaRelErr(got, want); e > tol {
					t.Errorf("Faddeeva(%v) = %v, want conj(Faddeeva(%v)) = %v, rel err %.3g, tol %g",
						-cmplx.Conj(z), got, z, want, e, tol)
				}
			})
			if r > 20 {
				continue // exp(−z²) over/underflows
			}
			t.Run("sum/"+name, func(t *testing.T) {
				// Reference: w(z) + w(−z) = 2 exp(−z²) (A&S 7.1.11), with
				// exp from Go's math/cmplx; the tolerance allows for the
				// rounding of z² (relative error ~|z|²·ε in exp).
				got := Faddeeva(z) + Faddeeva(-z)
				want := 2 * cmplx.Exp(-z*z)
				tolSum := 4e-15 * (1 + r*r) * (1 + 1/cmplx.Abs(want))
				if e := faddeevaRelErr(got, want); e > tolSum {
					t.Errorf("Faddeeva(%v) + Faddeeva(%v) = %v, want 2exp(-z²) = %v, rel err %.3g, tol %.3g",
						z, -z, got, want, e, tolSum)
				}
			})
		}
	}
}

// TestFaddeevaAsymptote checks w(z) ~ i/(√π z)·(1 + 1/(2z²) + 3/(4z⁴)) for
// |z| > 1e3 in the closed upper half-plane, where the omitted term is below
// 15/(8|z|⁶) ≈ 2e-18.
func TestFaddeevaAsymptote(t *testing.T) {
	const tol = 1e-15
	for _, r := range []float64{1000.5, 5e3, 1e4, 1e5, 1e6, 1e150} {
		for _, th := range []float64{0, 1e-9, 1e-3, math.Pi / 6, math.Pi / 4, math.Pi / 2, 2, 3, math.Pi - 1e-9, math.Pi} {
			z := cmplx.Rect(r, th)
			if th == math.Pi {
				z = complex(-r, 0)
			}
			t.Run(fmt.Sprintf("r=%g/theta=%g", r, th), func(t *testing.T) {
				// Reference: asymptotic expansion of A&S 7.1.23 written for
				// w(z) = exp(−z²) erfc(−iz) (three terms).
				z2 := z * z
				want := 1i / (math.SqrtPi * z) * (1 + 1/(2*z2) + 3/(4*z2*z2))
				got := Faddeeva(z)
				if e := faddeevaRelErr(got, want); e > tol {
					t.Errorf("Faddeeva(%v) = %v, want %v, rel err %.3g, tol %g", z, got, want, e, tol)
				}
			})
		}
	}
}

// TestFaddeevaSwitchContinuity checks the continued fraction, with the
// number of levels Faddeeva chooses, against a more accurate reference on
// circles at and beyond the |z| = 8 switch.
func TestFaddeevaSwitchContinuity(t *testing.T) {
	const tol = 2e-15
	for _, r := range []float64{faddeevaR, 8.5, 10, 12, 15.99, 16, 31.99, 32, 63.99, 64, 127.9, 128, 2047, 2048} {
		for k := range 64 {
			z := cmplx.Rect(r, math.Pi*float64(k)/63)
			if k == 63 {
				z = complex(-r, 0)
			}
			var want complex128
			if r <= 12 {
				// Reference: Weideman's expansion (faddeevaWeideman), an
				// algorithm independent of the continued fraction, accurate
				// to 1e-15 for |z| ≤ 12.
				want = faddeevaWeideman(z)
			} else {
				// Reference: the continued fraction with 40 levels, fully
				// converged for |z| ≥ 12.
				want = faddeevaContinuedFraction(z, 40)
			}
			got := faddeevaUpper(z)
			if e := faddeevaRelErr(got, want); e > tol {
				t.Errorf("faddeevaUpper(%v) = %v, want %v, rel diff %.3g, tol %g", z, got, want, e, tol)
			}
		}
	}
}

// TestFaddeevaFinite checks that w is finite, non-NaN and bounded by 1 in
// modulus (|w(z)| ≤ 1 for Im z ≥ 0, A&S 7.1.3 integral with |exp(izt)| ≤ 1)
// over a dense grid of the closed upper half-plane, and that w (lower
// half-plane) and erfc (whole plane) are never NaN.
func TestFaddeevaFinite(t *testing.T) {
	radii := []float64{0, 5e-324, 1e-300, 1e-100, 1e200, 1e300, math.MaxFloat64}
	for e := -12.0; e <= 6; e += 0.05 {
		radii = append(radii, math.Pow(10, e))
	}
	bad := 0
	for _, r := range radii {
		for k := 0; k <= 180; k++ {
			th := math.Pi * float64(k) / 180
			z := complex(r*math.Cos(th), r*math.Sin(th))
			if k == 0 || k == 180 {
				z = complex(r*math.Cos(th), 0)
			}
			w := Faddeeva(z)
			if cmplx.IsNaN(w) || cmplx.IsInf(w) || cmplx.Abs(w) > 1+1e-15 {
				if bad++; bad <= 10 {
					t.Errorf("Faddeeva(%v) = %v, want finite with |w| <= 1", z, w)
				}
			}
			if wl := Faddeeva(cmplx.Conj(z)); cmplx.IsNaN(wl) {
				if bad++; bad <= 10 {
					t.Errorf("Faddeeva(%v) = %v, want no NaN", cmplx.Conj(z), wl)
				}
			}
			for _, ze := range []complex128{z, cmplx.Conj(z)} {
				if e := Erfc(ze); cmplx.IsNaN(e) {
					if bad++; bad <= 10 {
						t.Errorf("Erfc(%v) = %v, want no NaN", ze, e)
					}
				}
			}
		}
	}
}

// TestFaddeevaOverflow checks the documented result where exp(−z²) overflows.
func TestFaddeevaOverflow(t *testing.T) {
	for _, z := range []complex128{-30i, 1 - 30i, -30 - 50i, 0.25 - 40i, 1e3 - 2e3i, 1e100 - 1e101i} {
		t.Run(fmt.Sprintf("z=%v", z), func(t *testing.T) {
			// Reference: the documented convention: each component is ±Inf
			// with the sign of the corresponding component of
			// exp(−z²) = exp(y² − x²)·(cos(2xy) − i sin(2xy)), or 0 where
			// that component is 0; signs from Go's math.Cos and math.Sin.
			x, y := real(z), imag(z)
			sign := func(v float64) float64 {
				if v == 0 {
					return 0
				}
				return math.Copysign(math.Inf(1), v)
			}
			want := complex(sign(math.Cos(2*x*y)), sign(-math.Sin(2*x*y)))
			if got := Faddeeva(z); got != want {
				t.Errorf("Faddeeva(%v) = %v, want %v", z, got, want)
			}
		})
	}
	t.Run("near overflow", func(t *testing.T) {
		// Reference: w(z) = 2exp(−z²) − w(−z) (A&S 7.1.11) with exp from
		// Go's math/cmplx, where exp(−z²) = exp(700)·… is still finite;
		// z² is exact for these z.
		z := -5 - 25i
		want := 2*cmplx.Exp(-z*z) - Faddeeva(-z)
		if got := Faddeeva(z); faddeevaRelErr(got, want) > 1e-14 || cmplx.IsInf(got) {
			t.Errorf("Faddeeva(%v) = %v, want %v, rel err %.3g, tol 1e-14", z, got, want, faddeevaRelErr(got, want))
		}
	})
	t.Run("non-finite input", func(t *testing.T) {
		// Reference: documented behaviour for infinite and NaN input.
		if got := Faddeeva(complex(math.Inf(1), 3)); got != 0 {
			t.Errorf("Faddeeva(+Inf+3i) = %v, want 0", got)
		}
		if got := Faddeeva(complex(0, math.Inf(1))); got != 0 {
			t.Errorf("Faddeeva(+Inf i) = %v, want 0", got)
		}
		if got := Faddeeva(complex(math.NaN(), 0)); !cmplx.IsNaN(got) {
			t.Errorf("Faddeeva(NaN) = %v, want NaN", got)
		}
	})
}

// TestErfc checks the complex complementary error function.
func TestErfc(t *testing.T) {
	t.Run("real", func(t *testing.T) {
		const tol = 1e-14
		// Reference: Go's standard library math.Erfc on the real axis.
		for _, x := range []float64{-5, -3, -1, -0.25, 0, 1e-8, 0.5, 1, 2, 5, 5.3, 10, 10.7, 19.9, 20, 23.1, 25.3, 26, 26.4} {
			want := math.Erfc(x)
			got := Erfc(complex(x, 0))
			if e := math.Abs(real(got)-want) / want; e > tol || imag(got) != 0 {
				t.Errorf("Erfc(%g) = %v, want %v (real), rel err %.3g, tol %g", x, got, want, e, tol)
			}
		}
	})
	t.Run("quadrature", func(t *testing.T) {
		const tol = 1e-13
		for _, z := range []complex128{0.5 + 0.5i, 1 + 2i, -1.5 + 0.3i, 2 - 1i, 0.2 - 3i, -2.5 - 2.5i} {
			// Reference: erf(z) = (2z/√π) ∫_0^1 exp(−z²s²) ds (A&S 7.1.1 with
			// t = zs), by gonum quad.Fixed with 80-point Gauss–Legendre.
			z2 := z * z
			re := func(s float64) float64 { return real(cmplx.Exp(-z2 * complex(s*s, 0))) }
			im := func(s float64) float64 { return imag(cmplx.Exp(-z2 * complex(s*s, 0))) }
			integral := complex(quad.Fixed(re, 0, 1, 80, quad.Legendre{}, 0), quad.Fixed(im, 0, 1, 80, quad.Legendre{}, 0))
			want := 2 * z / math.SqrtPi * integral
			got := 1 - Erfc(z)
			if e := faddeevaRelErr(got, want); e > tol {
				t.Errorf("1-Erfc(%v) = %v, want erf = %v, rel err %.3g, tol %g", z, got, want, e, tol)
			}
		}
	})
	t.Run("properties", func(t *testing.T) {
		// Reference: erfc(z) + erfc(−z) = 2 and erfc(z̄) = conj(erfc(z))
		// (A&S 7.1.9, 7.1.10 via erfc = 1 − erf).
		for _, z := range []complex128{0.3 + 0.1i, 2 + 3i, -4 + 1i, 5 - 0.5i} {
			if got := Erfc(z) + Erfc(-z); cmplx.Abs(got-2) > 1e-14*cmplx.Abs(Erfc(z)+2) {
				t.Errorf("Erfc(%v) + Erfc(%v) = %v, want 2", z, -z, got)
			}
			if got, want := Erfc(cmplx.Conj(z)), cmplx.Conj(Erfc(z)); faddeevaRelErr(got, want) > 1e-15 {
				t.Errorf("Erfc(%v) = %v, want conj(Erfc(%v)) = %v", cmplx.Conj(z), got, z, want)
			}
		}
	})
	t.Run("overflow", func(t *testing.T) {
		// Reference: documented convention; erfc(iy) = 1 − i·erfi(y) with
		// erfi(40) > 0 astronomically large, so erfc(40i) = 1 − i·Inf.
		for _, z := range []complex128{40i, 3 + 40i, -3 - 40i, 1e300i} {
			got := Erfc(z)
			if cmplx.IsNaN(got) || !cmplx.IsInf(got) {
				t.Errorf("Erfc(%v) = %v, want an infinite value", z, got)
			}
		}
		if got := Erfc(40i); got != complex(1, math.Inf(-1)) {
			t.Errorf("Erfc(40i) = %v, want (1-Inf i)", got)
		}
	})
	t.Run("non-finite input", func(t *testing.T) {
		// Reference: documented behaviour for infinite and NaN input.
		for _, c := range []struct{ z, want complex128 }{
			{complex(math.Inf(1), 5), 0},
			{complex(math.Inf(-1), math.Inf(1)), 2},
			{complex(3, math.Inf(-1)), cmplx.Inf()},
		} {
			if got := Erfc(c.z); got != c.want {
				t.Errorf("Erfc(%v) = %v, want %v", c.z, got, c.want)
			}
		}
		if got := Erfc(complex(math.NaN(), 1)); !cmplx.IsNaN(got) {
			t.Errorf("Erfc(NaN+1i) = %v, want NaN", got)
		}
	})
}

var faddeevaSink complex128

func BenchmarkFaddeeva(b *testing.B) {
	for _, c := range []struct {
		name string
		z    complex128
	}{
		{"small", 0.3 + 0.2i},       // Weideman expansion
		{"medium", -4 + 2i},         // Weideman expansion
		{"large", -700 + 300i},      // continued fraction, 3 levels
		{"switch", -9 + 1e-3i},      // continued fraction, 12 levels
		{"lower", 1.5 - 0.7i},       // reflection, exp(−z²)
		{"erfc", complex(2.5, 1.0)}, // Erfc
	} {
		b.Run(c.name, func(b *testing.B) {
			b.ReportAllocs()
			f := Faddeeva
			if c.name == "erfc" {
				f = Erfc
			}
			var s complex128
			for b.Loop() {
				s += f(c.z)
			}
			faddeevaSink = s
		})
	}
}
