package propagation

import (
	"errors"
	"fmt"
	"math"
	"math/cmplx"
	"slices"
	"sort"
	"sync"
)

// e2pi3 is e^{−j2π/3}, the rotation between Fock's variable t and the Airy
// argument z = t·e^{−j2π/3}.
var e2pi3 = cmplx.Exp(complex(0, -2*math.Pi/3))

// epi3 is e^{−jπ/3}: the q = 0 and q = ∞ roots lie on this ray.
var epi3 = cmplx.Exp(complex(0, -math.Pi/3))

// airyZeroTable holds the first zeros of Ai and Ai′ as starting points for
// Newton's method (the asymptotic forms are poor for s = 1).
//
// Reference: M. Abramowitz and I. A. Stegun, Handbook of Mathematical
// Functions (1964), Table 10.13.
var airyZeroTable = struct{ ai, aip [5]float64 }{
	ai:  [5]float64{2.33810741, 4.08794944, 5.52055983, 6.78670809, 7.94413359},
	aip: [5]float64{1.01879297, 3.24819758, 4.82009921, 6.16330736, 7.37217726},
}

// airyZeros returns α_s = −a_s and α′_s = −a′_s, s = 1…n, the magnitudes of
// the zeros of Ai and Ai′ on the negative real axis, from the asymptotic
// forms
//
//	α_s  ≈ T^{2/3}(1 + 5/(48T²) − 5/(36T⁴)),   T = 3π(4s−1)/8
//	α′_s ≈ U^{2/3}(1 − 7/(48U²) + 35/(288U⁴)), U = 3π(4s−3)/8
//
// (or the table for s ≤ 5) polished by Newton's method on Ai and Ai′.
//
// Reference: Abramowitz and Stegun (1964) 10.4.94–10.4.95 and Table 10.13.
func airyZeros(n int) (alpha, alphaP []float64) {
	airyZeroMemo.Lock()
	defer airyZeroMemo.Unlock()
	if len(airyZeroMemo.alpha) < n {
		airyZeroMemo.alpha, airyZeroMemo.alphaP = computeAiryZeros(n)
	}
	return slices.Clone(airyZeroMemo.alpha[:n]), slices.Clone(airyZeroMemo.alphaP[:n])
}

// airyZeroMemo keeps the zeros once computed: they are constants, and
// polishing them took half the time of building a ground-wave curve.
var airyZeroMemo struct {
	sync.Mutex
	alpha, alphaP []float64
}

func computeAiryZeros(n int) (alpha, alphaP []float64) {
	alpha = make([]float64, n)
	alphaP = make([]float64, n)
	for i := range n {
		s := float64(i + 1)
		var a, ap float64
		if i < len(airyZeroTable.ai) {
			a, ap = airyZeroTable.ai[i], airyZeroTable.aip[i]
		} else {
			T := 3 * math.Pi * (4*s - 1) / 8
			U := 3 * math.Pi * (4*s - 3) / 8
			a = math.Pow(T, 2.0/3) * (1 + 5/(48*T*T) - 5/(36*T*T*T*T))
			ap = math.Pow(U, 2.0/3) * (1 - 7/(48*U*U) + 35/(288*U*U*U*U))
		}
		for range 4 {
			ai, aip := airy(complex(-a, 0))
			a += real(ai) / real(aip) // z ← z − Ai/Ai′ with z = −a
			ai, aip = airy(complex(-ap, 0))
			ap -= real(aip) / (ap * real(ai)) // z ← z − Ai′/(z Ai), z = −ap
		}
		alpha[i], alphaP[i] = a, ap
	}
	return alpha, alphaP
}

// modeEquation returns f(t) = w′(t) − q·w(t) and f′(t) = t·w(t) − q·w′(t),
// with w(t) = Ai(t·e^{−j2π/3}) (Fock's w₁ up to a constant; w″ = t·w), and a
// scale |w′| + (1+|q|)·|w| for judging the residual (neither w nor w′
// vanishes there, whatever q).
func modeEquation(t, q complex128) (f, df complex128, scale float64) {
	ai, aip := airy(t * e2pi3)
	w, wp := ai, e2pi3*aip
	return wp - q*w, t*w - q*wp, cmplx.Abs(wp) + (1+cmplx.Abs(q))*cmplx.Abs(w)
}

// errRootTracking is returned when the mode roots cannot be found reliably.
var errRootTracking = errors.New("mode roots of the residue series could not be tracked")

// modeRoots returns the first n roots t_s of Fock's mode equation
//
//	w′(t) − q·w(t) = 0 ,  w(t) = Ai(t·e^{−j2π/3})
//
// Each root is tracked continuously from a known limit by integrating the
// Riccati equation it obeys, then polished by Newton's method and checked
// by substitution:
//
//	from q = 0 (t = α′_s e^{−jπ/3}):  dt/dq = 1/(t − q²)
//	from q = ∞ (t = α_s e^{−jπ/3}):   dt/dp = 1/(1 − p²t),  p = 1/q
//
// A mode whose |t| at its limit exceeds |q|² starts from q = 0, otherwise
// from q = ∞. If two modes land on the same root (a skipped root), both are
// tracked again from the other limit; if that fails too, an error is
// returned.
//
// Reference: V. A. Fock, Electromagnetic Diffraction and Propagation Problems
// (1965) ch. 10; the Riccati continuation follows from differentiating the
// mode equation (shared/reference/methods.md §1.7).
func modeRoots(q complex128, n int) ([]complex128, error) {
	alpha, alphaP := airyZeros(n)
	roots := make([]complex128, n)
	fromZero := make([]bool, n)
	q2 := cmplx.Abs(q) * cmplx.Abs(q)
	for s := range n {
		fromZero[s] = alphaP[s] > q2
		t, err := trackRoot(q, alpha[s], alphaP[s], fromZero[s])
		if err != nil {
			fromZero[s] = !fromZero[s]
			t, err = trackRoot(q, alpha[s], alphaP[s], fromZero[s])
			if err != nil {
				return nil, fmt.Errorf("%w (mode %d, q = %v)", errRootTracking, s+1, q)
			}
		}
		roots[s] = t
	}
	// Verify that no root was found twice.
	for retry := 0; ; retry++ {
		i, j := duplicateRoots(roots)
		if i < 0 {
			return roots, nil
		}
		if retry > 4 {
			return nil, fmt.Errorf("%w (modes %d and %d coincide, q = %v)", errRootTracking, i+1, j+1, q)
		}
		for _, s := range []int{i, j} {
			fromZero[s] = !fromZero[s]
			t, err := trackRoot(q, alpha[s], alphaP[s], fromZero[s])
			if err != nil {
				return nil, fmt.Errorf("%w (mode %d, q = %v)", errRootTracking, s+1, q)
			}
			roots[s] = t
		}
	}
}

// duplicateRoots returns the indices of two roots closer than a relative
// 1e-6, or −1, −1. Roots are compared in order of their real parts, so the
// check costs O(n log n).
func duplicateRoots(roots []complex128) (int, int) {
	idx := make([]int, len(roots))
	for i := range idx {
		idx[i] = i
	}
	sort.Slice(idx, func(a, b int) bool { return real(roots[idx[a]]) < real(roots[idx[b]]) })
	for a, i := range idx {
		tol := 1e-6 * (1 + cmplx.Abs(roots[i]))
		for _, j := range idx[a+1:] {
			if real(roots[j])-real(roots[i]) > tol {
				break
			}
			if cmplx.Abs(roots[i]-roots[j]) < tol {
				return min(i, j), max(i, j)
			}
		}
	}
	return -1, -1
}

// trackRoot follows one mode from its q = 0 or q = ∞ limit to q.
func trackRoot(q complex128, alpha, alphaP float64, fromZero bool) (complex128, error) {
	var t complex128
	if q == 0 {
		t = complex(alphaP, 0) * epi3
	} else if fromZero {
		// dt/dτ = q / (t − τ² q²), τ: 0 → 1.
		t0 := complex(alphaP, 0) * epi3
		q2 := q * q
		rhs := func(tau float64, t complex128) complex128 {
			return q / (t - complex(tau*tau, 0)*q2)
		}
		var ok bool
		t, ok = integrateRK4(rhs, t0)
		if !ok {
			return 0, errRootTracking
		}
	} else {
		// dt/dτ = p / (1 − τ² p² t), p = 1/q, τ: 0 → 1.
		t0 := complex(alpha, 0) * epi3
		p := 1 / q
		p2 := p * p
		rhs := func(tau float64, t complex128) complex128 {
			return p / (1 - complex(tau*tau, 0)*p2*t)
		}
		var ok bool
		t, ok = integrateRK4(rhs, t0)
		if !ok {
			return 0, errRootTracking
		}
	}
	// Newton polish and check by substitution.
	for range 30 {
		f, df, _ := modeEquation(t, q)
		if df == 0 {
			return 0, errRootTracking
		}
		step := f / df
		t -= step
		if cmplx.Abs(step) < 1e-13*(1+cmplx.Abs(t)) {
			break
		}
	}
	f, _, scale := modeEquation(t, q)
	if !(cmplx.Abs(f) <= 1e-9*scale) || cmplx.IsNaN(t) {
		return 0, errRootTracking
	}
	return t, nil
}

// integrateRK4 integrates dt/dτ = rhs(τ, t) from τ = 0 to 1 with the
// classical fourth-order Runge–Kutta method and step doubling for error
// control. It reports false if the step size collapses (a near-singular
// path) or the result is not finite.
func integrateRK4(rhs func(float64, complex128) complex128, t0 complex128) (complex128, bool) {
	const tol = 1e-7
	step := func(tau, h float64, t complex128) complex128 {
		k1 := rhs(tau, t)
		k2 := rhs(tau+h/2, t+complex(h/2, 0)*k1)
		k3 := rhs(tau+h/2, t+complex(h/2, 0)*k2)
		k4 := rhs(tau+h, t+complex(h, 0)*k3)
		return t + complex(h/6, 0)*(k1+2*k2+2*k3+k4)
	}
	t, tau, h := t0, 0.0, 0.125
	for iter := 0; tau < 1; iter++ {
		if iter > 20000 || h < 1e-9 {
			return 0, false
		}
		if tau+h > 1 {
			h = 1 - tau
		}
		full := step(tau, h, t)
		half := step(tau+h/2, h/2, step(tau, h/2, t))
		errEst := cmplx.Abs(full - half)
		if errEst > tol*(1+cmplx.Abs(t)) || cmplx.IsNaN(half) || cmplx.IsInf(half) {
			h /= 2
			continue
		}
		t, tau = half, tau+h
		if errEst < tol/32*(1+cmplx.Abs(t)) {
			h *= 2
		}
	}
	return t, true
}
