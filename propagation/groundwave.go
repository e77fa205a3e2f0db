package propagation

import (
	"fmt"
	"math"
	"math/cmplx"
	"sort"
)

// SwitchX is the normalised distance x = m·d/a_e at which the ground-wave
// computation changes from the flat-earth Sommerfeld–Norton function to the
// spherical-earth residue series. Below it, earth curvature changes the
// field by about 0.1 dB (for a perfectly conducting sphere |W(0.1)| = 0.990,
// −0.09 dB; up to 0.16 dB for the poorest P.368 grounds, where |q| is
// large: the step between the two methods at the switch, checked in
// TestFlatMeetsSpherical); above it, the residue series needs no more than
// a few hundred modes. In distance, x = 0.1 is about 19 km at 1 MHz,
// 24 km at 500 kHz, 16 km at 1.6 MHz and 88 km at 10 kHz.
//
// Reference: shared/reference/methods.md §1.7 (switch point), from the
// perfectly-conducting-sphere values of Fock's attenuation function.
const SwitchX = 0.1

// seriesRelTol is the relative size of the last residue-series term kept.
const seriesRelTol = 1e-9

// Homogeneous evaluates the ground wave over a smooth homogeneous spherical
// earth directly (without a cache) for one frequency and one ground.
// Construct it with NewHomogeneous; it is safe for concurrent use.
type Homogeneous struct {
	f     KHz
	g     Ground
	k     float64    // free-space wavenumber, rad/m
	delta complex128 // normalised surface impedance Δ
	m     float64    // (k a_e / 2)^{1/3}
	residue
}

// residue holds the mode roots of the spherical-earth residue series for
// one normalised surface impedance q.
type residue struct {
	q     complex128 // −j m Δ
	q2    complex128 // q²
	roots []complex128
	// refIm is the largest Im(t_s), used to keep the series in range.
	refIm float64
}

// newResidue finds n mode roots for q, ordered from the least attenuated.
func newResidue(q complex128, n int) (residue, error) {
	roots, err := modeRoots(q, n)
	if err != nil {
		return residue{}, err
	}
	sort.Slice(roots, func(i, j int) bool { return imag(roots[i]) > imag(roots[j]) })
	return residue{q: q, q2: q * q, roots: roots, refIm: imag(roots[0])}, nil
}

// modesFor returns the number of modes that resolves the residue series
// down to x = xMin: the first neglected term is below 1e-7 of the first,
// with |Im t_s| ≈ 0.866·α_s and α_s ≈ (3π(4s−1)/8)^{2/3}. (Near xMin the
// neglected tail, whose terms hardly change phase, sums to about ten times
// its first term: 1e-6, or 1e-5 dB.)
func modesFor(xMin float64) int {
	alphaMax := math.Log(1e7) / (math.Sin(math.Pi/3) * xMin)
	return int(math.Pow(alphaMax, 1.5)/(1.5*math.Pi)) + 8
}

// NewHomogeneous prepares the ground-wave model at frequency f over ground g:
// it finds the mode roots of the residue series (see modeRoots). It returns
// an error if f or g is invalid, and warnings when f lies outside the
// validated range.
func NewHomogeneous(f KHz, g Ground) (*Homogeneous, []Warning, error) {
	warn, err := ValidateKHz(f)
	if err != nil {
		return nil, nil, err
	}
	if err := g.Validate(); err != nil {
		return nil, nil, err
	}
	h := &Homogeneous{f: f, g: g}
	lambda := f.WavelengthMetres()
	h.k = 2 * math.Pi / lambda
	h.delta = g.SurfaceImpedance(f)
	aeM := EffectiveEarthRadiusKm * 1e3
	h.m = math.Cbrt(h.k * aeM / 2)
	q := complex(0, -h.m) * h.delta
	h.residue, err = newResidue(q, modesFor(SwitchX))
	if err != nil {
		return nil, nil, fmt.Errorf("propagation: ground wave at %g kHz over %v: %w", float64(f), g, err)
	}
	return h, warn, nil
}

// Frequency returns the frequency of the model.
func (h *Homogeneous) Frequency() KHz { return h.f }

// Ground returns the ground of the model.
func (h *Homogeneous) Ground() Ground { return h.g }

// NormalisedDistance returns Fock's normalised distance x = m·d/a_e for a
// path of distKm.
func (h *Homogeneous) NormalisedDistance(distKm float64) float64 {
	return h.m * distKm / EffectiveEarthRadiusKm
}

// AttenuationDB returns the ground-wave attenuation relative to the
// inverse-distance field, 20·log10|A| dB (≤ 0 in practice), at distKm,
// where A is the flat-earth F(w) for x < SwitchX and the residue series
// W(x, q) beyond. distKm must be > 0 (not checked here; see FieldDBuVm).
func (h *Homogeneous) AttenuationDB(distKm float64) float64 {
	x := h.NormalisedDistance(distKm)
	if x < SwitchX {
		return 20 * math.Log10(cmplx.Abs(h.flat(distKm)))
	}
	return h.residueDB(x)
}

// FieldDBuVm returns the ground-wave field in dB(µV/m) at distKm for the
// reference source (1 kW from a short vertical monopole, c.m.f. 300 V):
//
//	E = 109.54 − 20·log10(d_km) + 20·log10|A|
//
// Reference: Rec. ITU-R P.368 Annex 1.
func (h *Homogeneous) FieldDBuVm(distKm float64) float64 {
	return RefFieldDBuVm1km - 20*math.Log10(distKm) + h.AttenuationDB(distKm)
}

// FlatEarthDB returns 20·log10|F(w)| of the flat-earth function at distKm,
// whatever the distance (for comparisons with the spherical series).
func (h *Homogeneous) FlatEarthDB(distKm float64) float64 {
	return 20 * math.Log10(cmplx.Abs(h.flat(distKm)))
}

// SphericalDB returns 20·log10|W(x,q)| of the residue series at distKm,
// and false if x is below the range the kept modes resolve (x < SwitchX).
func (h *Homogeneous) SphericalDB(distKm float64) (float64, bool) {
	x := h.NormalisedDistance(distKm)
	if x < SwitchX*(1-1e-12) {
		return 0, false
	}
	return h.residueDB(x), true
}

// NumericalDistance returns Sommerfeld's complex numerical distance
//
//	w = −j · (k d / 2) · Δ²
//
// Reference: K. A. Norton, Proc. IRE 24 (1936) 1367 and 25 (1937) 1203;
// J. R. Wait, Electromagnetic Waves in Stratified Media (1962) ch. 2.
func (h *Homogeneous) NumericalDistance(distKm float64) complex128 {
	return complex(0, -h.k*distKm*1e3/2) * h.delta * h.delta
}

// flat returns the Sommerfeld–Norton flat-earth attenuation function
//
//	F(w) = 1 − j·√(π w) · e^{−w} · erfc(j √w)
//	     = 1 − j·√(π w) · Faddeeva(−√w)
//
// for the numerical distance w of NumericalDistance. For |w| → 0, F → 1;
// for |w| ≫ 1, F ≈ −1/(2w).
//
// Reference: A. Sommerfeld, Ann. Phys. 28 (1909) 665; K. A. Norton,
// Proc. IRE 25 (1937) 1203; J. R. Wait, Electromagnetic Waves in Stratified
// Media (1962) eq. (2.52).
func (h *Homogeneous) flat(distKm float64) complex128 {
	return sommerfeldF(h.NumericalDistance(distKm))
}

// sommerfeldF is the flat-earth attenuation function F(w) of Homogeneous.flat.
func sommerfeldF(w complex128) complex128 {
	sw := cmplx.Sqrt(w)
	return 1 - complex(0, 1)*cmplx.Sqrt(complex(math.Pi, 0)*w)*Faddeeva(-sw)
}

// residueDB returns 20·log10|W(x,q)| of the spherical-earth residue series
//
//	W(x,q) = e^{−jπ/4} · √(π x) · Σ_s e^{−j x t_s} / (t_s − q²)
//
// summed from the least attenuated mode until a term falls below
// seriesRelTol of the sum. The factor e^{x·Im t_1} is taken out in the
// logarithm so that the field never underflows at long range.
//
// Reference: V. A. Fock, Electromagnetic Diffraction and Propagation Problems
// (1965) ch. 10–11; J. R. Wait, Electromagnetic Waves in Stratified Media
// (1962) ch. 3; H. Bremmer, Terrestrial Radio Waves (1949).
func (h *residue) residueDB(x float64) float64 {
	var sum complex128
	for _, t := range h.roots {
		// e^{−jx t} / e^{x·refIm}: magnitude e^{x(Im t − refIm)} ≤ 1.
		d := t - complex(0, h.refIm)
		term := cmplx.Exp(complex(0, -x)*d) / (t - h.q2)
		sum += term
		if cmplx.Abs(term) < seriesRelTol*cmplx.Abs(sum) {
			break
		}
	}
	return 10*math.Log10(math.Pi*x) + 20*(x*h.refIm)/math.Ln10 + 20*math.Log10(cmplx.Abs(sum))
}
