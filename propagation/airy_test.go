package propagation

import (
	"bufio"
	"fmt"
	"math"
	"math/cmplx"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"gonum.org/v1/gonum/mathext"
)

// airyEnvelope returns scales for judging errors in Ai and Ai′ that do not
// vanish at the zeros on the negative real axis:
//
//	S  = √(|Ai|² + |Ai′|²/ρ),  S′ = √ρ·S,  ρ = max(|z|, 1).
//
// On the negative axis Ai ≈ π^{−1/2}|z|^{−1/4} sin(·) and
// Ai′ ≈ −π^{−1/2}|z|^{1/4} cos(·), so S is the modulus π^{−1/2}|z|^{−1/4}
// (DLMF 9.8.20); elsewhere S is within a factor ~√2 of |Ai| and the error
// measure is an ordinary relative error.
func airyEnvelope(z, ai, aip complex128) (s, sp float64) {
	rho := math.Max(cmplx.Abs(z), 1)
	s = math.Hypot(cmplx.Abs(ai), cmplx.Abs(aip)/math.Sqrt(rho))
	return s, s * math.Sqrt(rho)
}

func TestAiryPublishedValues(t *testing.T) {
	// Ai(0) = 3^{−2/3}/Γ(2/3), Ai′(0) = −3^{−1/3}/Γ(1/3):
	// Abramowitz and Stegun (1964) 10.4.4–10.4.5, to the 18 digits printed.
	ai, aip := airy(0)
	for _, c := range []struct {
		name      string
		got, want complex128
	}{
		{"Ai(0)", ai, 0.355028053887817239},
		{"Ai'(0)", aip, -0.258819403792806798},
	} {
		if d := cmplx.Abs(c.got - c.want); d > 1e-16 {
			t.Errorf("%s = %v, want %v (|diff| %.2g > 1e-16)", c.name, c.got, c.want, d)
		}
	}

	// Zeros a_s of Ai and a′_s of Ai′, s = 1…5: Abramowitz and Stegun (1964)
	// Table 10.13 (8 decimals).
	zeros := []struct {
		name  string
		deriv bool // zero of Ai′ rather than Ai
		a     float64
	}{
		{"a_1", false, -2.33810741},
		{"a_2", false, -4.08794944},
		{"a_3", false, -5.52055983},
		{"a_4", false, -6.78670809},
		{"a_5", false, -7.94413359},
		{"a'_1", true, -1.01879297},
		{"a'_2", true, -3.24819758},
		{"a'_3", true, -4.82009921},
		{"a'_4", true, -6.16330736},
		{"a'_5", true, -7.37217726},
	}
	for _, c := range zeros {
		t.Run(c.name, func(t *testing.T) {
			// At the tabulated zero the function is at most its slope (Ai′,
			// or Ai″ = z·Ai) times the table's rounding, 5e−9; allow 1e−8.
			ai, aip := airy(complex(c.a, 0))
			res, slope := cmplx.Abs(ai), cmplx.Abs(aip)
			if c.deriv {
				res, slope = cmplx.Abs(aip), math.Abs(c.a)*cmplx.Abs(ai)
			}
			if res > 1e-8*slope {
				t.Errorf("airy(%v): |residual| = %.3g, want < 1e-8 × slope %.3g", c.a, res, slope)
			}
			// Newton's method: z ← z − Ai/Ai′, or z ← z − Ai′/(z·Ai) for Ai′.
			z := c.a
			for range 5 {
				ai, aip := airy(complex(z, 0))
				if c.deriv {
					z -= real(aip) / (z * real(ai))
				} else {
					z -= real(ai) / real(aip)
				}
			}
			if d := math.Abs(z - c.a); d > 1e-8 {
				t.Errorf("Newton-refined zero from airy = %.12f, want %.8f (|diff| %.2g > 1e-8)", z, c.a, d)
			}
		})
	}
}

// TestAiryZerosLarge checks zeros far out on the negative axis (|a_s| up to
// 177), where the mode roots of the residue series lie, against the
// asymptotic expansions of the zeros (NIST DLMF 9.9.6, 9.9.18–9.9.19):
//
//	a_s  = −T(3π/8·(4s−1)),  a′_s = −U(3π/8·(4s−3))
//	T(t) ~ t^{2/3}(1 + 5/48 t^{−2} − 5/36 t^{−4} + 77125/82944 t^{−6}
//	       − 108056875/6967296 t^{−8} + …)
//	U(t) ~ t^{2/3}(1 − 7/48 t^{−2} + 35/288 t^{−4} − 181223/207360 t^{−6}
//	       + 18683371/1244160 t^{−8} − …)
//
// For s ≥ 30 (t > 140) the first omitted terms are below 1e−17 relative.
func TestAiryZerosLarge(t *testing.T) {
	T := func(t float64) float64 {
		u := 1 / (t * t)
		return math.Pow(t, 2.0/3) * (1 + u*(5.0/48+u*(-5.0/36+u*(77125.0/82944+u*(-108056875.0/6967296)))))
	}
	U := func(t float64) float64 {
		u := 1 / (t * t)
		return math.Pow(t, 2.0/3) * (1 + u*(-7.0/48+u*(35.0/288+u*(-181223.0/207360+u*(18683371.0/1244160)))))
	}
	for _, s := range []int{30, 100, 300, 500} {
		fs := float64(s)
		for _, deriv := range []bool{false, true} {
			a := -T(3 * math.Pi / 8 * (4*fs - 1))
			name := fmt.Sprintf("a_%d", s)
			if deriv {
				a = -U(3 * math.Pi / 8 * (4*fs - 3))
				name = fmt.Sprintf("a'_%d", s)
			}
			t.Run(name, func(t *testing.T) {
				z := a
				for range 4 {
					ai, aip := airy(complex(z, 0))
					if deriv {
						z -= real(aip) / (z * real(ai))
					} else {
						z -= real(ai) / real(aip)
					}
				}
				// The zero is ill-conditioned only through z: allow a few
				// ulps of |a| times the phase conditioning |ζ| ≈ |a|^{3/2}.
				tol := 1e-15 * math.Abs(a) * (1 + math.Pow(math.Abs(a), 1.5)/16)
				if d := math.Abs(z - a); d > tol {
					t.Errorf("Newton-refined zero from airy = %.15g, want %.15g (|diff| %.2g > %.2g)", z, a, d, tol)
				}
			})
		}
	}
}

// airyRef is one row of testdata/airy/airy_mpmath.csv.
type airyRef struct {
	z, ai, aip complex128
}

// readAiryRef reads the mpmath reference table written by
// testdata/airy/gen_airy.py (mpmath 1.3.0, see the README there).
func readAiryRef(t testing.TB) []airyRef {
	t.Helper()
	f, err := os.Open(filepath.Join("..", "testdata", "airy", "airy_mpmath.csv"))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	var refs []airyRef
	sc := bufio.NewScanner(f)
	header := false
	for line := 1; sc.Scan(); line++ {
		text := strings.TrimSpace(sc.Text())
		if text == "" || strings.HasPrefix(text, "#") {
			continue
		}
		if !header {
			header = true // column names
			continue
		}
		fields := strings.Split(text, ",")
		if len(fields) != 6 {
			t.Fatalf("airy_mpmath.csv:%d: %d fields, want 6", line, len(fields))
		}
		var v [6]float64
		for i, s := range fields {
			if v[i], err = strconv.ParseFloat(s, 64); err != nil {
				t.Fatalf("airy_mpmath.csv:%d: %v", line, err)
			}
		}
		refs = append(refs, airyRef{complex(v[0], v[1]), complex(v[2], v[3]), complex(v[4], v[5])})
	}
	if err := sc.Err(); err != nil {
		t.Fatal(err)
	}
	if len(refs) < 300 {
		t.Fatalf("airy_mpmath.csv: %d rows, want at least 300", len(refs))
	}
	return refs
}

// TestAiryMpmath compares airy with the mpmath table. Each z in the table is
// exactly representable, so the only error is airy's own. The error is
// measured against airyEnvelope (a plain relative error away from the zeros
// of Ai and Ai′ on the negative axis, where a relative error is undefined).
//
// Tolerance: 2e−12 + 2e−15·|ζ|, ζ = (2/3)z^{3/2}. Evaluating e^{−ζ} in
// float64 carries an absolute phase and log-magnitude error of a few ulps of
// |ζ| (|ζ| = 1886 at |z| = 200, i.e. ~4e−13 relative), and the Maclaurin
// series may lose up to e^{6.5} ≈ 700 ulps to cancellation. The tolerance
// is about ten times the observed worst case (reported by the test: 5e−13
// at |z| = 200, 1e−13 for |z| < 10), leaving room for other rounding (e.g.
// fused multiply–add on other architectures), and stays 20–50 times below
// the 1e−10 the ground-wave mode equation needs.
func TestAiryMpmath(t *testing.T) {
	refs := readAiryRef(t)
	var worstEnv, worstRel float64
	var worstEnvZ, worstRelZ complex128
	for _, r := range refs {
		ai, aip := airy(r.z)
		s, sp := airyEnvelope(r.z, r.ai, r.aip)
		zeta := 2.0 / 3 * math.Pow(cmplx.Abs(r.z), 1.5)
		tol := 2e-12 + 2e-15*zeta
		for _, c := range []struct {
			name      string
			got, want complex128
			scale     float64
		}{
			{"Ai", ai, r.ai, s},
			{"Ai'", aip, r.aip, sp},
		} {
			d := cmplx.Abs(c.got - c.want)
			env := d / c.scale
			if env > worstEnv {
				worstEnv, worstEnvZ = env, r.z
			}
			if rel := d / cmplx.Abs(c.want); rel > worstRel {
				worstRel, worstRelZ = rel, r.z
			}
			if env > tol || math.IsNaN(env) {
				t.Errorf("%s(%v): airy got %v, mpmath %v: error %.3g of envelope %.3g > %.3g",
					c.name, r.z, c.got, c.want, env, c.scale, tol)
			}
		}
	}
	t.Logf("%d points: worst error/envelope %.3g at z = %v (|z| = %.4g, arg = %.6f)",
		len(refs), worstEnv, worstEnvZ, cmplx.Abs(worstEnvZ), cmplx.Phase(worstEnvZ))
	t.Logf("worst plain relative error %.3g at z = %v (|z| = %.4g, arg = %.6f)",
		worstRel, worstRelZ, cmplx.Abs(worstRelZ), cmplx.Phase(worstRelZ))
}

// TestAiryDifferentialEquation checks Ai″ = z·Ai with a five-point central
// difference of Ai′ (error O(h⁴)) in every region of the method.
func TestAiryDifferentialEquation(t *testing.T) {
	for _, c := range []struct {
		name string
		z    complex128
	}{
		{"series", complex(1.5, 0.7)},
		{"series-negative-axis", complex(-4, 0.2)},
		{"taylor-positive-axis", complex(5, 0.5)},
		{"taylor-connection", complex(-6.5, 0.3)},
		{"asymptotic-stokes", 12 * cmplx.Exp(complex(0, 2*math.Pi/3-0.01))},
		{"asymptotic-positive", complex(15, -4)},
		{"connection-negative-axis", complex(-50, -0.5)},
		{"connection-far", complex(-190, 3)},
	} {
		t.Run(c.name, func(t *testing.T) {
			// h = 0.004 local wavelengths |z|^{−1/2}: truncation error
			// ~(0.004)⁴/30 ≈ 1e−11, rounding ~1e−13/0.004 ≈ 3e−11.
			h := 0.004 / math.Sqrt(math.Max(1, cmplx.Abs(c.z)))
			d := func(k float64) complex128 {
				_, aip := airy(c.z + complex(k*h, 0))
				return aip
			}
			fd := (d(-2) - 8*d(-1) + 8*d(1) - d(2)) / complex(12*h, 0)
			ai, aip := airy(c.z)
			want := c.z * ai
			_, sp := airyEnvelope(c.z, ai, aip)
			scale := sp * math.Sqrt(math.Max(1, cmplx.Abs(c.z))) // scale of z·Ai
			const tol = 1e-9
			if e := cmplx.Abs(fd-want) / scale; e > tol {
				t.Errorf("finite difference of airy(%v) Ai′ = %v, z·Ai = %v: error %.3g of scale %.3g > %g",
					c.z, fd, want, e, scale, tol)
			}
		})
	}
}

// TestAiryWronskian checks, at seeded random points, the Wronskian
//
//	W{Ai(z), Ai(z·e^{∓2πi/3})} = e^{±πi/6}/(2π)
//
// (NIST DLMF 9.2.8), i.e. Ai(z)·e^{∓2πi/3}Ai′(ze^{∓2πi/3}) −
// Ai′(z)·Ai(ze^{∓2πi/3}). It ties values on rays 120° apart computed by
// different branches of airy, and is not used by the implementation.
func TestAiryWronskian(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	for i := range 400 {
		r := 200 * math.Pow(rng.Float64(), 2) // denser at small |z|
		z := cmplx.Rect(r, math.Pi*(2*rng.Float64()-1))
		for _, sign := range []float64{-1, 1} {
			rot := cmplx.Rect(1, -sign*2*math.Pi/3)
			// |Ai(z)| ≲ e^{|Re ζ|}: skip where the products would overflow.
			if airyTestReZeta(z)+airyTestReZeta(z*rot) > 650 {
				continue
			}
			want := cmplx.Rect(1/(2*math.Pi), sign*math.Pi/6)
			a, ap := airy(z)
			b, bp := airy(z * rot)
			w := a*rot*bp - ap*b
			// Relative to the size of the products that cancel.
			scale := cmplx.Abs(a)*cmplx.Abs(bp) + cmplx.Abs(ap)*cmplx.Abs(b)
			tol := (2e-12 + 2e-15*2.0/3*math.Pow(r, 1.5)) * math.Max(scale, cmplx.Abs(want))
			if d := cmplx.Abs(w - want); d > tol || math.IsNaN(d) {
				t.Errorf("point %d: W{Ai(z), Ai(z·%.3v)} at z = %v from airy = %v, want %v (|diff| %.3g > %.3g)",
					i, rot, z, w, want, d, tol)
			}
		}
	}
}

// airyTestReZeta returns |Re ζ|, ζ = (2/3)·z^{3/2}: |Ai(z)| ≲ e^{|Re ζ|}.
func airyTestReZeta(z complex128) float64 {
	return math.Abs(real(complex(2.0/3, 0) * z * cmplx.Sqrt(z)))
}

// TestAiryGonum compares airy at seeded random points, |z| ≤ 200, with a
// second independent implementation: gonum's mathext.AiryAi and
// AiryAiDeriv, a port of D. E. Amos's TOMS 644 algorithm (via modified
// Bessel functions K_{1/3}, K_{2/3}). Error measure and tolerance as in
// TestAiryMpmath; Amos's own error is of the same size.
func TestAiryGonum(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 4))
	var worst float64
	var worstZ complex128
	for range 3000 {
		r := 200 * rng.Float64()
		theta := math.Pi * (2*rng.Float64() - 1)
		if rng.IntN(2) == 0 { // half near the negative real axis
			theta = math.Copysign(math.Pi-0.3*rng.Float64(), theta)
		}
		z := cmplx.Rect(r, theta)
		if airyTestReZeta(z) > 650 {
			continue // outside float64 range
		}
		want, wantp := mathext.AiryAi(z), mathext.AiryAiDeriv(z)
		if cmplx.Abs(want) < 1e-280 {
			continue // underflowed
		}
		ai, aip := airy(z)
		s, sp := airyEnvelope(z, want, wantp)
		tol := 2e-12 + 2e-15*2.0/3*math.Pow(r, 1.5)
		e := math.Max(cmplx.Abs(ai-want)/s, cmplx.Abs(aip-wantp)/sp)
		if e > worst {
			worst, worstZ = e, z
		}
		if !(e <= tol) {
			t.Errorf("airy(%v) = %v, %v; gonum mathext %v, %v: error %.3g of envelope > %.3g",
				z, ai, aip, want, wantp, e, tol)
		}
	}
	t.Logf("worst error/envelope vs gonum %.3g at z = %v (|z| = %.4g, arg = %.6f)",
		worst, worstZ, cmplx.Abs(worstZ), cmplx.Phase(worstZ))
}

// TestAirySwitchContinuity shows that the methods agree where airy switches
// between them:
//
//   - at |z| = 9 the asymptotic expansion against the Maclaurin series
//     (rays where the series is used up to 9) or the inward Taylor steps
//     started from a point further out, |z| = 10;
//   - on the cancellation boundary |ζ|(1 + cos(3θ/2)) = 6.5 the Maclaurin
//     series against the inward Taylor steps;
//   - airy itself on both sides of every boundary (|z| = 9, the
//     cancellation boundary, and arg z = ±2π/3 where the connection
//     formula takes over), the outer value predicted from the inner one by
//     a second-order Taylor step w(z+Δ) ≈ w + Δw′ + Δ²zw/2.
func TestAirySwitchContinuity(t *testing.T) {
	const tol = 1e-12
	var worst float64
	check := func(t *testing.T, what string, z complex128, a1, ap1, a2, ap2 complex128) {
		t.Helper()
		s, sp := airyEnvelope(z, a1, ap1)
		if e := cmplx.Abs(a1-a2) / s; e > tol || math.IsNaN(e) {
			t.Errorf("%s at z = %v: Ai %v vs %v, error %.3g of %.3g > %g", what, z, a1, a2, e, s, tol)
		} else {
			worst = math.Max(worst, e)
		}
		if e := cmplx.Abs(ap1-ap2) / sp; e > tol || math.IsNaN(e) {
			t.Errorf("%s at z = %v: Ai′ %v vs %v, error %.3g of %.3g > %g", what, z, ap1, ap2, e, sp, tol)
		} else {
			worst = math.Max(worst, e)
		}
	}
	defer func() { t.Logf("largest disagreement %.3g (tolerance %g)", worst, tol) }()
	// rays within |arg| ≤ 2π/3, 5° apart
	var rays []float64
	for k := -24; k <= 24; k++ {
		rays = append(rays, 2*math.Pi/3*float64(k)/24)
	}
	// lossRadius returns the radius of the cancellation boundary on the
	// ray θ, or 0 if it lies beyond |z| = 9.
	lossRadius := func(theta float64) float64 {
		c := 1 + math.Cos(1.5*theta)
		r := math.Pow(1.5*airyMaxLoss/c, 2.0/3)
		if c == 0 || r >= airyAsymRadius {
			return 0
		}
		return r
	}

	t.Run("methods at radius 9", func(t *testing.T) {
		for _, theta := range rays {
			z := cmplx.Rect(airyAsymRadius, theta)
			m, mp, e := airyAsymptotic(z)
			a1, ap1 := m*cmplx.Exp(e), mp*cmplx.Exp(e)
			if airySeriesLoss(airyAsymRadius, math.Abs(theta)) <= airyMaxLoss {
				a2, ap2 := airyMaclaurin(z)
				check(t, "asymptotic vs Maclaurin", z, a1, ap1, a2, ap2)
				continue
			}
			// Taylor steps from |z| = 10, as airyInward does from 9.
			z0 := z * complex(10/airyAsymRadius, 0)
			m0, mp0, e0 := airyAsymptotic(z0)
			a2, ap2 := m0*cmplx.Exp(e0), mp0*cmplx.Exp(e0)
			h := (z - z0) / 2
			a2, ap2 = airyTaylor(z0, a2, ap2, h)
			a2, ap2 = airyTaylor(z0+h, a2, ap2, h)
			check(t, "asymptotic vs Taylor steps from |z| = 10", z, a1, ap1, a2, ap2)
		}
	})
	t.Run("methods at cancellation boundary", func(t *testing.T) {
		for _, theta := range rays {
			r := lossRadius(theta)
			if r == 0 {
				continue
			}
			z := cmplx.Rect(r, theta)
			a1, ap1 := airyMaclaurin(z)
			a2, ap2 := airyInward(z)
			check(t, "Maclaurin vs inward Taylor steps", z, a1, ap1, a2, ap2)
		}
	})
	t.Run("airy across boundaries", func(t *testing.T) {
		const eps = 1e-9
		type pair struct{ in, out complex128 }
		var pairs []pair
		for k := -36; k <= 36; k++ { // all rays, 5° apart
			theta := math.Pi * float64(k) / 36
			r := airyAsymRadius
			pairs = append(pairs, pair{cmplx.Rect(r*(1-eps), theta), cmplx.Rect(r*(1+eps), theta)})
			if r := lossRadius(theta); r > 0 {
				pairs = append(pairs, pair{cmplx.Rect(r*(1-eps), theta), cmplx.Rect(r*(1+eps), theta)})
			}
		}
		for _, r := range []float64{9.5, 20, 50, 100} {
			for _, s := range []float64{-1, 1} {
				theta := s * 2 * math.Pi / 3
				pairs = append(pairs, pair{cmplx.Rect(r, theta*(1-eps)), cmplx.Rect(r, theta*(1+eps))})
			}
		}
		for _, p := range pairs {
			ai, aip := airy(p.in)
			d := p.out - p.in
			predA := ai + d*aip + d*d*p.in*ai/2
			predAp := aip + d*p.in*ai + d*d*(ai+p.in*aip)/2
			gotA, gotAp := airy(p.out)
			check(t, fmt.Sprintf("airy(%v) predicted from airy(%v)", p.out, p.in), p.out, predA, predAp, gotA, gotAp)
		}
	})
}

// TestAiryFinite scans a dense polar grid out to |z| = 200 (401 radii × 721
// args): no result may be NaN, and none may be infinite where |Ai| and |Ai′|
// fit in float64, i.e. where |Re ζ| < 700 (|Ai| ≲ e^{|Re ζ|} for
// |arg z| ≤ π), nor within 0.25 rad of the negative real axis. Elsewhere
// (|z| > 104 around arg z = ±2π/3, where |Ai| reaches e^{1886} at
// |z| = 200) float64 cannot hold Ai and components are ±Inf or 0.
func TestAiryFinite(t *testing.T) {
	var nInf int
	for i := 0; i <= 400; i++ {
		r := 200 * float64(i) / 400
		for j := -360; j <= 360; j++ {
			theta := math.Pi * float64(j) / 360
			z := cmplx.Rect(r, theta)
			ai, aip := airy(z)
			if cmplx.IsNaN(ai) || cmplx.IsNaN(aip) {
				t.Fatalf("airy(%v) = %v, %v: NaN", z, ai, aip)
			}
			zeta := complex(2.0/3, 0) * z * cmplx.Sqrt(z)
			if cmplx.IsInf(ai) || cmplx.IsInf(aip) {
				nInf++
				if math.Pi-math.Abs(theta) < 0.25 {
					t.Fatalf("airy(%v) = %v, %v: infinite within 0.25 of the negative real axis", z, ai, aip)
				}
				if math.Abs(real(zeta)) < 700 {
					t.Fatalf("airy(%v) = %v, %v: infinite where |Re ζ| = %.4g < 700", z, ai, aip, math.Abs(real(zeta)))
				}
			}
		}
	}
	t.Logf("%d of %d grid points overflow (|Re ζ| ≥ 700)", nInf, 401*721)
	// Huge arguments, up to |z| = 1e200 (beyond, ζ overflows): no NaN.
	for _, z := range []complex128{1e6, -1e6, complex(0, 1e6), cmplx.Rect(1e4, 2*math.Pi/3), complex(-1e199, 1), cmplx.Rect(1e199, 1)} {
		if ai, aip := airy(z); cmplx.IsNaN(ai) || cmplx.IsNaN(aip) {
			t.Errorf("airy(%v) = %v, %v: NaN", z, ai, aip)
		}
	}
}

func BenchmarkAiry(b *testing.B) {
	for _, c := range []struct {
		name string
		z    complex128
	}{
		{"series", complex(1.5, 1)},
		{"taylor", complex(-6, 0.5)},
		{"asymptotic", complex(30, 10)},
		{"negative-axis-r20", complex(-20, 0.1)},
		{"negative-axis-r150", complex(-150, -0.3)},
	} {
		b.Run(c.name, func(b *testing.B) {
			b.ReportAllocs()
			var sink complex128
			for b.Loop() {
				ai, aip := airy(c.z)
				sink += ai + aip
			}
			_ = sink
		})
	}
}
