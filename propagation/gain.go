package propagation

import (
	"fmt"
	"math"
	"sync"
	"sync/atomic"

	"gonum.org/v1/gonum/integrate/quad"
)

// Limits on a transmitting monopole's electrical height G, in degrees.
const (
	MinHeightDeg = 0.0   // exclusive
	MaxHeightDeg = 270.0 // inclusive; beyond it the horizontal lobe collapses
)

// monopolePattern returns the unnormalised vertical pattern of a thin
// monopole of electrical height G (radians) over perfect ground, at
// elevation θ (radians), written without cancellation for small G:
//
//	f(θ) = [cos(G·sin θ) − cos G] / cos θ
//	     = 2·sin(G(1+sin θ)/2)·sin(G(1−sin θ)/2) / cos θ
//
// Reference: J. D. Kraus, Antennas (2nd ed., 1988) §5-6 (sinusoidal current
// distribution); shared/reference/methods.md §2.3.
func monopolePattern(g, theta float64) float64 {
	s, c := math.Sincos(theta)
	if c < 1e-300 {
		return 0
	}
	return 2 * math.Sin(g*(1+s)/2) * math.Sin(g*(1-s)/2) / c
}

// monopoleResistance returns the radiation resistance R_m (Ω) of a thin
// monopole of electrical height G (radians) over perfect ground, referred
// to the current maximum, by integrating the radiated power over the upper
// half space with gonum's fixed Gauss–Legendre rule:
//
//	R_m = 60 · ∫_0^{π/2} f(θ)² cos θ dθ      (f as monopolePattern)
//
// (f(θ)²/cos²θ·cos θ = f²·cos θ with f including the 1/cos θ factor.)
// It equals the closed form 30·{γ + ln 2G − Ci 2G + …} of the reference.
//
// Reference: J. D. Kraus, Antennas (1988) eq. (5-6-11) halved for the
// monopole image; shared/reference/methods.md §2.3.
func monopoleResistance(g float64) float64 {
	if r, ok := resistanceMemo.Load(g); ok {
		return r.(float64)
	}
	r := monopoleResistanceQuad(g)
	if resistanceMemoLen.Add(1) > 4096 { // a slider can ask for many heights
		resistanceMemo.Clear()
		resistanceMemoLen.Store(0)
	}
	resistanceMemo.Store(g, r)
	return r
}

// resistanceMemo remembers R_m by electrical height: the quadrature costs
// about 20 µs and a station's mast does not change.
var (
	resistanceMemo    sync.Map
	resistanceMemoLen atomic.Int64
)

// monopoleResistanceQuad computes R_m by quadrature (see monopoleResistance).
func monopoleResistanceQuad(g float64) float64 {
	integrand := func(theta float64) float64 {
		f := monopolePattern(g, theta)
		return f * f * math.Cos(theta)
	}
	return 60 * quad.Fixed(integrand, 0, math.Pi/2, 96, quad.Legendre{}, 0)
}

// MonopoleGainDB returns the vertical-pattern gain G_V (dB) of a thin
// vertical monopole of electrical height heightDeg (degrees, G = 360·h/λ)
// over perfect ground, at elevation elevDeg (degrees), relative to a short
// monopole radiating the same power:
//
//	G_V(θ) = 20·log10{ f(θ) · √(40 / R_m(G)) }
//
// G_V → 0 dB as G → 0; at the horizon G_V = 0.39 dB for G = 90°, 2.06 dB for
// G = 180°. heightDeg must lie in (0, 270] and elevDeg in [0, 90); the
// result is −Inf in a pattern null, which callers should treat as no field.
//
// Reference: Rec. ITU-R P.1147 Fig. 1 (the same quantity, read from a
// figure); shared/reference/methods.md §2.3 (derivation).
func MonopoleGainDB(heightDeg, elevDeg float64) (float64, error) {
	if err := checkFinite("antenna height", heightDeg, "degrees"); err != nil {
		return 0, err
	}
	if err := checkFinite("elevation", elevDeg, "degrees"); err != nil {
		return 0, err
	}
	if heightDeg <= MinHeightDeg || heightDeg > MaxHeightDeg {
		return 0, &InputError{Field: "antenna height", Value: heightDeg, Unit: "degrees",
			Want: fmt.Sprintf("> %g and <= %g", MinHeightDeg, MaxHeightDeg)}
	}
	if elevDeg < 0 || elevDeg >= 90 {
		return 0, &InputError{Field: "elevation", Value: elevDeg, Unit: "degrees", Want: ">= 0 and < 90"}
	}
	g := heightDeg * math.Pi / 180
	if g < 1e-3 {
		// Short-monopole limit: the pattern is cos θ and the normalisation
		// is exact to O(G²) (the quadrature would lose all its digits).
		return 20 * math.Log10(math.Cos(elevDeg*math.Pi/180)), nil
	}
	f := monopolePattern(g, elevDeg*math.Pi/180)
	return 20 * math.Log10(math.Abs(f)*math.Sqrt(40/monopoleResistance(g))), nil
}
