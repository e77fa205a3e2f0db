package propagation

import (
	"math"
	"math/cmplx"
)

// Constants of the Airy-function evaluation.
const (
	// airyC1 = Ai(0) = 3^{−2/3}/Γ(2/3) and airyC2 = −Ai′(0) =
	// 3^{−1/3}/Γ(1/3).
	//
	// Reference: Abramowitz and Stegun (1964) 10.4.4–10.4.5.
	airyC1 = 0.355028053887817239
	airyC2 = 0.258819403792806798

	// airyAsymRadius is the radius |z| from which the asymptotic
	// expansions are used. At |z| = 9, |ζ| = 18 and the smallest term of
	// the expansion is 1.5e−17 (k = 36), so the series is summed to
	// machine precision before it starts to diverge, and the Stokes
	// contribution neglected at |arg z| = 2π/3 (≈ e^{−2|ζ|} = 2e−16) is
	// below it too.
	airyAsymRadius = 9.0

	// airyMaxLoss is the largest natural log of the cancellation allowed
	// in the Maclaurin series. The terms of c1·f − c2·g sum in magnitude
	// to about e^{|ζ|} while |Ai(z)| ≈ e^{−Re ζ}, so about
	//
	//	|ζ|·(1 + cos(3/2·arg z))
	//
	// nepers are lost. e^{6.5}·2^{−53} ≈ 7e−14.
	airyMaxLoss = 6.5

	// airyAsymTerms bounds the number of terms of the asymptotic
	// expansions; at |z| ≥ airyAsymRadius at most 37 are used (at |z| = 9
	// the sum stops at its smallest term, k = 36).
	airyAsymTerms = 48

	// airyTaylorStep is the longest Taylor step. A step of length δ loses
	// about e^{δ·|z|^{1/2}} ulps (Ai may grow that much across the disc
	// of convergence used); with δ = 1 and |z| < 9 that is ~20 ulps per
	// step, at most 7 steps.
	airyTaylorStep = 1.0

	// airyMaxArg is the largest |z| accepted: beyond it ζ overflows.
	airyMaxArg = 1e200

	// airyTaylorTerms bounds the number of terms of a Taylor step.
	airyTaylorTerms = 200
)

// airyOmega is ω = e^{2πi/3}; airyOmega2 = ω² = e^{−2πi/3} is written as the
// conjugate of ω so that ω·z and ω²·z are exact conjugates for real z.
var (
	airyOmega  = complex(-0.5, math.Sqrt(3)/2)
	airyOmega2 = complex(-0.5, -math.Sqrt(3)/2)
)

// airyU and airyV hold the coefficients u_k and v_k of the asymptotic
// expansions of Ai and Ai′:
//
//	u_0 = v_0 = 1
//	u_k = (2k+1)(2k+3)···(6k−1) / (216^k k!)
//	    = u_{k−1}·(6k−5)(6k−3)(6k−1) / ((2k−1)·216·k)
//	v_k = −(6k+1)/(6k−1)·u_k
//
// (c_k and d_k in the notation of Abramowitz and Stegun).
//
// Reference: Abramowitz and Stegun (1964) 10.4.58; DLMF 9.7.2.
var airyU, airyV = airyAsymCoeffs()

func airyAsymCoeffs() (u, v [airyAsymTerms]float64) {
	u[0], v[0] = 1, 1
	for k := 1; k < airyAsymTerms; k++ {
		fk := float64(k)
		u[k] = u[k-1] * (6*fk - 5) * (6*fk - 3) * (6*fk - 1) / ((2*fk - 1) * 216 * fk)
		v[k] = -(6*fk + 1) / (6*fk - 1) * u[k]
	}
	return u, v
}

// airy returns the Airy function Ai(z) and its derivative Ai′(z) for complex
// z. Ai is the solution of
//
//	w″(z) = z·w(z)
//
// that decays as z → +∞ along the real axis.
//
// The method depends on where z lies (θ = arg z, ζ = (2/3)·z^{3/2}):
//
//   - |z| < 9 and |ζ|·(1 + cos(3θ/2)) ≤ 6.5 (little cancellation): the
//     Maclaurin series, see airyMaclaurin.
//
//   - |θ| ≤ 2π/3, |z| ≥ 9: the asymptotic expansions, see airyAsymptotic.
//
//   - |θ| ≤ 2π/3, |z| < 9, otherwise (2.9 < |z| < 9 within about 85° of
//     the positive real axis, which includes the images of points near the
//     negative axis below): Taylor steps of at most 1 along the ray,
//     inward from 9·e^{iθ} where the asymptotic values start them, see
//     airyInward. Where the series cancels, Ai grows or oscillates inward,
//     or decays only slowly, so errors are amplified by at most ~e^{5.7}.
//
//   - 2π/3 < |θ| ≤ π (around the negative real axis): the connection
//     formulas
//
//     Ai(z)  = −ω·Ai(ωz) − ω²·Ai(ω²z)
//     Ai′(z) = −ω²·Ai′(ωz) − ω·Ai′(ω²z),   ω = e^{2πi/3},
//
//     which map z (θ > 0) onto the rays at θ − 4π/3 and θ − 2π/3, both
//     within |arg| ≤ 2π/3 where the previous cases apply. For z near the
//     negative axis the two images lie near arg = ∓π/3, where the
//     asymptotic error is bounded by the first neglected term and the two
//     terms are of equal size (Ai oscillates). The exponentials e^{−ζ} of
//     the two terms are combined without overflow.
//
// Values in the lower half plane follow from Ai(z̄) = conj(Ai(z)), and Ai
// and Ai′ are returned real for real z.
//
// Accuracy: compared with mpmath (the table in testdata/airy and 4,000
// further random points), the error is below 1e−13 for |z| < 10 and below
// 3·|ζ|·2^{−53} beyond (5e−13 at |z| = 200), relative to |Ai| and |Ai′| —
// near the zeros on the negative axis, relative to the envelope
// √(|Ai|² + |Ai′|²/|z|). The |ζ| term is the rounding of the phase and size
// of e^{−ζ}; Ai itself has condition number |z·Ai′/Ai| ≈ |z|^{3/2} with
// respect to z.
//
// Range: Ai underflows to 0 where Re ζ ≳ 745 (e.g. z > 107 on the positive
// axis) and has ±Inf components where −Re ζ ≳ 709 (e.g. |z| > 104 near
// arg z = ±2π/3); neither happens near the negative real axis for
// |z| ≤ 200 within |π − |θ|| < 0.25. The result is NaN only for NaN z or
// |z| > 1e200, where ζ overflows.
//
// References: M. Abramowitz and I. A. Stegun, Handbook of Mathematical
// Functions (1964) 10.4.2–10.4.5, 10.4.58–10.4.61; NIST Digital Library of
// Mathematical Functions (DLMF) 9.2.12 (connection formula), 9.7.2,
// 9.7.5–9.7.6 and §9.7 error bounds.
func airy(z complex128) (ai, aip complex128) {
	if cmplx.IsNaN(z) || cmplx.Abs(z) > airyMaxArg {
		return cmplx.NaN(), cmplx.NaN()
	}
	if imag(z) == 0 {
		z = complex(real(z), 0) // arg(−x − 0i) = −π: use +π
	}
	if imag(z) < 0 {
		ai, aip = airy(cmplx.Conj(z))
		return cmplx.Conj(ai), cmplx.Conj(aip)
	}
	r := cmplx.Abs(z)
	theta := cmplx.Phase(z) // in [0, π]
	var m, mp, e complex128
	if r < airyAsymRadius && airySeriesLoss(r, theta) <= airyMaxLoss {
		m, mp = airyMaclaurin(z)
	} else if theta <= 2*math.Pi/3 {
		m, mp, e = airyCore(z)
	} else {
		// Connection formula, DLMF 9.2.12 and its derivative.
		m1, mp1, e1 := airyCore(airyOmega * z)
		m2, mp2, e2 := airyCore(airyOmega2 * z)
		// Factor out the larger exponential so that neither term
		// overflows.
		e = e1
		if real(e2) > real(e1) {
			e = e2
		}
		s1, s2 := cmplx.Exp(e1-e), cmplx.Exp(e2-e)
		m = -airyOmega*m1*s1 - airyOmega2*m2*s2
		mp = -airyOmega2*mp1*s1 - airyOmega*mp2*s2
	}
	ai, aip = airyExpScale(m, e), airyExpScale(mp, e)
	if imag(z) == 0 {
		ai, aip = complex(real(ai), 0), complex(real(aip), 0)
	}
	return ai, aip
}

// airySeriesLoss returns the estimated cancellation, in nepers, of the
// Maclaurin series at |z| = r, arg z = θ:
//
//	|ζ|·(1 + cos(3θ/2)),  |ζ| = (2/3)·r^{3/2}
//
// (the terms sum in magnitude to about e^{|ζ|}, while |Ai| ≳ e^{−Re ζ}).
func airySeriesLoss(r, theta float64) float64 {
	return 2.0 / 3 * r * math.Sqrt(r) * (1 + math.Cos(1.5*theta))
}

// airyCore returns Ai(z) = m·e^{e} and Ai′(z) = mp·e^{e} for |arg z| ≤ 2π/3,
// choosing among the Maclaurin series, the asymptotic expansions and a
// Taylor step from the asymptotic radius as described for airy.
func airyCore(z complex128) (m, mp, e complex128) {
	r := cmplx.Abs(z)
	switch {
	case r >= airyAsymRadius:
		return airyAsymptotic(z)
	case airySeriesLoss(r, math.Abs(cmplx.Phase(z))) <= airyMaxLoss:
		m, mp = airyMaclaurin(z)
		return m, mp, 0
	default:
		m, mp = airyInward(z)
		return m, mp, 0
	}
}

// airyInward returns Ai(z) and Ai′(z) for 0 < |z| < 9 by Taylor steps of
// length at most airyTaylorStep along the ray from z0 = 9·z/|z| to z,
// started with the asymptotic values at z0 (airyAsymptotic, airyTaylor).
func airyInward(z complex128) (ai, aip complex128) {
	r := cmplx.Abs(z)
	z0 := z * complex(airyAsymRadius/r, 0)
	m, mp, e := airyAsymptotic(z0)
	s := cmplx.Exp(e) // |Re e| ≤ |ζ| = 18 at |z0| = 9: no overflow
	ai, aip = m*s, mp*s
	n := int(math.Ceil((airyAsymRadius - r) / airyTaylorStep))
	h := (z - z0) / complex(float64(n), 0)
	for i := range n {
		ai, aip = airyTaylor(z0+complex(float64(i), 0)*h, ai, aip, h)
	}
	return ai, aip
}

// airyMaclaurin returns Ai(z) and Ai′(z) from the Maclaurin series
//
//	Ai(z)  = c1·f(z) − c2·g(z)
//	Ai′(z) = c1·f′(z) − c2·g′(z)
//	f(z) = Σ_{k≥0} 3^k (1/3)_k z^{3k}/(3k)!   = 1 + z³/3! + 1·4·z⁶/6! + …
//	g(z) = Σ_{k≥0} 3^k (2/3)_k z^{3k+1}/(3k+1)! = z + 2·z⁴/4! + 2·5·z⁷/7! + …
//
// with c1 = Ai(0) and c2 = −Ai′(0). The series converge for all z but
// cancel where Ai is small compared with e^{|ζ|}; airy uses them only where
// airySeriesLoss is small.
//
// Reference: Abramowitz and Stegun (1964) 10.4.2–10.4.5.
func airyMaclaurin(z complex128) (ai, aip complex128) {
	z3 := z * z * z
	// Terms of f, g, f′, g′; f′ starts at k = 1 with z²/2.
	tf, tg, tfp, tgp := complex(1, 0), z, z*z/2, complex(1, 0)
	f, g, fp, gp := tf, tg, tfp, tgp
	// sum of term magnitudes, for the stopping test
	scale := 1 + airyAbs1(z)
	z3abs := airyAbs1(z3)
	for k := 1; k < 100; k++ {
		fk := float64(k)
		tf = airyScale(tf*z3, 1/((3*fk-1)*(3*fk)))
		tg = airyScale(tg*z3, 1/((3*fk)*(3*fk+1)))
		tgp = airyScale(tgp*z3, 1/((3*fk-2)*(3*fk)))
		if k > 1 {
			tfp = airyScale(tfp*z3, 1/((3*fk-3)*(3*fk-1)))
			fp += tfp
		}
		f += tf
		g += tg
		gp += tgp
		mag := airyAbs1(tf) + airyAbs1(tg) + airyAbs1(tfp) + airyAbs1(tgp)
		scale += mag
		if mag <= 0x1p-60*scale && 9*fk*fk > z3abs {
			break
		}
	}
	return complex(airyC1, 0)*f - complex(airyC2, 0)*g,
		complex(airyC1, 0)*fp - complex(airyC2, 0)*gp
}

// airyAsymptotic returns Ai(z) = m·e^{e} and Ai′(z) = mp·e^{e}, e = −ζ, from
// the asymptotic expansions
//
//	Ai(z)  ~ e^{−ζ}/(2√π·z^{1/4}) · Σ_{k≥0} (−1)^k u_k ζ^{−k}
//	Ai′(z) ~ −z^{1/4}·e^{−ζ}/(2√π) · Σ_{k≥0} (−1)^k v_k ζ^{−k}
//	ζ = (2/3)·z^{3/2}
//
// (principal branches; u_k, v_k as airyU, airyV), each sum truncated at its
// first term below 2^{−60} of the sum or before its terms grow. The
// expansions hold for |arg z| < π; airy uses them for |arg z| ≤ 2π/3 and
// |z| ≥ 9, where the remainder is below ~1e−16 relative (a small multiple
// of the first neglected term, DLMF §9.7; at |z| = 9 the smallest term is
// 1.5e−17).
//
// Reference: Abramowitz and Stegun (1964) 10.4.59, 10.4.61; DLMF 9.7.5–9.7.6.
func airyAsymptotic(z complex128) (m, mp, e complex128) {
	sz := cmplx.Sqrt(z)
	qz := cmplx.Sqrt(sz) // z^{1/4}
	zeta := complex(2.0/3, 0) * z * sz
	x := -1 / zeta // (−1)^k ζ^{−k} = x^k
	su, sv := airyAsymSum(&airyU, x), airyAsymSum(&airyV, x)
	const c = 0.28209479177387814347 // 1/(2√π)
	return complex(c, 0) * su / qz, complex(-c, 0) * qz * sv, -zeta
}

// airyAsymSum returns Σ coef_k x^k truncated at the first term below 2^{−60}
// of the partial sum, or before the terms start to grow.
func airyAsymSum(coef *[airyAsymTerms]float64, x complex128) complex128 {
	sum := complex(1, 0)
	xk := complex(1, 0)
	prev := math.Inf(1)
	for k := 1; k < airyAsymTerms; k++ {
		xk *= x
		t := airyScale(xk, coef[k])
		at := airyAbs1(t)
		if at > prev {
			break
		}
		sum += t
		if at <= 0x1p-60*airyAbs1(sum) {
			break
		}
		prev = at
	}
	return sum
}

// airyTaylor returns w(z0+h) and w′(z0+h) for the solution of w″ = z·w with
// w(z0) = w0, w′(z0) = wp0, from its Taylor series about z0:
//
//	w(z0+h) = Σ_{n≥0} a_n h^n,  a_0 = w0, a_1 = wp0, a_2 = z0·w0/2,
//	(n+2)(n+1)·a_{n+2} = z0·a_n + a_{n−1}   (n ≥ 1).
//
// The scaled terms b_n = a_n h^n are summed until two consecutive ones fall
// below 2^{−60} of the sum of magnitudes.
//
// Reference: the recurrence follows from substituting the series into
// w″ = z·w (DLMF 9.2.1).
func airyTaylor(z0, w0, wp0, h complex128) (w, wp complex128) {
	h2 := h * h
	c1, c2 := z0*h2, h2*h // b_{n+2} = (c1·b_n + c2·b_{n−1})/((n+2)(n+1))
	bm1, b0, b1 := complex(0, 0), w0, wp0*h
	w = b0 + b1
	wp = b1 // h·w′ accumulated as Σ n b_n
	scale := airyAbs1(b0) + airyAbs1(b1)
	for n := 0; n < airyTaylorTerms; n++ {
		fn := float64(n)
		b2 := airyScale(c1*b0+c2*bm1, 1/((fn+2)*(fn+1)))
		w += b2
		wp += airyScale(b2, fn+2)
		a2 := airyAbs1(b2)
		scale += a2
		if a2+airyAbs1(b1) <= 0x1p-60*scale && fn > 2 {
			break
		}
		bm1, b0, b1 = b0, b1, b2
	}
	return w, wp / h
}

// airyExpScale returns m·e^{e} without intermediate overflow and without
// NaN: a component whose magnitude exceeds the float64 range becomes ±Inf,
// and a zero component stays zero.
func airyExpScale(m, e complex128) complex128 {
	if e == 0 {
		return m
	}
	if real(e) < 700 {
		return m * cmplx.Exp(e)
	}
	s, c := math.Sincos(imag(e))
	p := m * complex(c, s) // |p| = |m|: finite
	half := math.Exp(real(e) / 2)
	mul := func(x float64) float64 {
		if x == 0 {
			return 0
		}
		return x * half * half
	}
	return complex(mul(real(p)), mul(imag(p)))
}

// airyScale returns c·x for real x (one real multiply per component, where
// c·complex(x, 0) would cost a full complex product).
func airyScale(c complex128, x float64) complex128 {
	return complex(real(c)*x, imag(c)*x)
}

// airyAbs1 returns |Re c| + |Im c|, between |c| and √2·|c|: a cheap size
// for stopping tests.
func airyAbs1(c complex128) float64 {
	return math.Abs(real(c)) + math.Abs(imag(c))
}
