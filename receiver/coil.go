package receiver

import (
	"fmt"
	"math"
	"math/cmplx"

	"gonum.org/v1/gonum/mathext"

	"earshot/propagation"
)

// Limits accepted for wire and coil inputs.
const (
	coilMinAWG     = 0
	coilMaxAWG     = 40
	coilMinFormMm  = 1.0
	coilMaxFormMm  = 500.0
	coilMinTurns   = 1.0
	coilMaxTurns   = 2000.0
	coilMaxPitchMm = 100.0
	// coilMaxUH and coilMaxPF bound the tuning helpers (0.1 H, 0.1 µF).
	coilMaxUH = 1e5
	coilMaxPF = 1e5
)

// copperResistivityOhmM is the resistivity of annealed copper at 20 °C,
// 1/σ = 1/(5.8×10⁷ S/m) = 1.7241×10⁻⁸ Ω·m.
//
// Reference: IEC 60028 (International Annealed Copper Standard),
// 1/58 Ω·mm²/m.
const copperResistivityOhmM = 1 / CopperConductivity

// AWGDiameterMm returns the bare diameter in mm of solid copper wire of
// American Wire Gauge n, for n = 0 … 40:
//
//	d = 0.127 mm × 92^((36 − n)/39)
//
// The gauges 1/0 … 4/0 (n = −1 … −3 in the formula) are not accepted.
// A gauge outside 0 … 40 returns an InputError for field "AWG".
//
// Reference: ASTM B258 (standard nominal diameters of solid round wires),
// as given in methods.md §6.5.
func AWGDiameterMm(gauge int) (float64, error) {
	if gauge < coilMinAWG || gauge > coilMaxAWG {
		return 0, inputErr("AWG", float64(gauge), "",
			fmt.Sprintf("a whole gauge from %d to %d", coilMinAWG, coilMaxAWG))
	}
	return 0.127 * math.Pow(92, float64(36-gauge)/39), nil
}

// singleBuildMils holds the minimum increase in diameter, in mils
// (0.001 in), of single-build (grade 1) film-insulated round copper magnet
// wire for AWG 14 … 40, index 0 = AWG 14.
//
// Reference: NEMA MW 1000, round film-insulated copper, single build,
// minimum increase. Secondary: the single-film column of a magnet-wire
// maker's reproduction of the NEMA table (Centelsa, "Magnet wire"
// catalogue, p. 10); the column holds 27 values and is assigned to
// AWG 14 … 40 by count. From memory in part; cross-checked against
// Essex's nominal build-1 diameters in coil_test.go.
var singleBuildMils = [...]float64{
	1.6, 1.5, 1.4, 1.4, 1.3, 1.2, 1.2, 1.1, 1.1, 1.0, // AWG 14–23
	1.0, 0.9, 0.9, 0.8, 0.8, 0.7, 0.7, 0.6, 0.6, 0.5, // AWG 24–33
	0.5, 0.4, 0.4, 0.3, 0.3, 0.2, 0.2, // AWG 34–40
}

// EnamelledDiameterMm returns the overall diameter in mm of single-build
// (grade 1) enamelled copper magnet wire of gauge n = 0 … 40: the bare
// diameter of AWGDiameterMm plus the minimum build (increase in diameter)
// of NEMA MW 1000 single-build wire:
//
//	D_enam = d_bare(n) + Δ(n)
//	Δ(n)   = 1.6 … 0.2 mil (0.041 … 0.005 mm) for AWG 14 … 40 (table)
//	Δ(n)   = Δ(14) = 1.6 mil for AWG 0 … 13
//
// The table at hand lists single build only from AWG 14; the AWG 14 build
// is used for the heavier gauges (it is under 2.3 % of their diameters).
// The minimum build is the figure the standard fixes; nominal builds are
// about 0.2 mil larger (Essex data), about 1 % in pitch. The value sets
// the close-wound pitch. A gauge outside 0 … 40 returns an InputError for
// field "AWG".
//
// Reference: NEMA MW 1000 single-build minimum increase (see
// singleBuildMils for the provenance); ASTM B258 for the bare diameter.
func EnamelledDiameterMm(gauge int) (float64, error) {
	d, err := AWGDiameterMm(gauge)
	if err != nil {
		return 0, err
	}
	i := max(gauge-14, 0)
	return d + singleBuildMils[i]*0.0254, nil
}

// Coil is a single-layer solenoid of enamelled copper wire on a round
// form. PitchMm 0 means close-wound (pitch = EnamelledDiameterMm). The
// current-sheet diameter used by the formulas is FormDiameterMm plus the
// bare wire diameter (to the wire centres), and the winding length is
// Turns × pitch.
type Coil struct {
	FormDiameterMm float64 // diameter of the coil form, mm
	AWG            int     // wire gauge, 0 … 40
	Turns          float64 // number of turns, 1 … 2000 (fractions allowed)
	PitchMm        float64 // turn-to-turn spacing, mm; 0 = close-wound
}

// Validate returns an InputError naming the field at fault: "AWG" outside
// 0 … 40, "form diameter" outside 1 … 500 mm, "turns" outside 1 … 2000,
// "pitch" neither 0 nor between the enamelled wire diameter and 100 mm.
// NaN and infinities are rejected.
func (c Coil) Validate() error {
	dEnam, err := EnamelledDiameterMm(c.AWG)
	if err != nil {
		return err
	}
	if !finite(c.FormDiameterMm) || c.FormDiameterMm < coilMinFormMm || c.FormDiameterMm > coilMaxFormMm {
		return inputErr("form diameter", c.FormDiameterMm, "mm",
			fmt.Sprintf("between %g and %g", coilMinFormMm, coilMaxFormMm))
	}
	if !finite(c.Turns) || c.Turns < coilMinTurns || c.Turns > coilMaxTurns {
		return inputErr("turns", c.Turns, "",
			fmt.Sprintf("between %g and %g", coilMinTurns, coilMaxTurns))
	}
	if !finite(c.PitchMm) || (c.PitchMm != 0 && (c.PitchMm < dEnam || c.PitchMm > coilMaxPitchMm)) {
		return inputErr("pitch", c.PitchMm, "mm",
			fmt.Sprintf("0 (close-wound) or between %.4g (enamelled wire diameter) and %g", dEnam, coilMaxPitchMm))
	}
	return nil
}

// coilDims holds the dimensions of a valid coil, in metres.
type coilDims struct {
	wireM  float64 // bare wire diameter d
	pitchM float64 // pitch p
	radM   float64 // current-sheet radius a (form radius + d/2)
	turns  float64 // N
}

// dims returns the coil's dimensions; ok is false if the coil is invalid.
func (c Coil) dims() (coilDims, bool) {
	if c.Validate() != nil {
		return coilDims{}, false
	}
	d, _ := AWGDiameterMm(c.AWG)
	p := c.PitchMm
	if p == 0 {
		p, _ = EnamelledDiameterMm(c.AWG)
	}
	return coilDims{
		wireM:  d * 1e-3,
		pitchM: p * 1e-3,
		radM:   (c.FormDiameterMm + d) / 2 * 1e-3,
		turns:  c.Turns,
	}, true
}

// LengthMm returns the winding length in mm, Turns × pitch (pitch =
// enamelled diameter when close-wound). An invalid coil returns 0.
func (c Coil) LengthMm() float64 {
	g, ok := c.dims()
	if !ok {
		return 0
	}
	return g.turns * g.pitchM * 1e3
}

// nagaokaKN returns Nagaoka's coefficient K_N of a uniform cylindrical
// current sheet of radius r and length ℓ (any one unit), the ratio of its
// inductance to that of the same sheet with the end effect ignored:
//
//	k² = 4r²/(4r² + ℓ²),  k' = ℓ/√(4r² + ℓ²)
//	K_N = 4/(3π k') · [ (k'²/k²)(K(k) − E(k)) + E(k) − k ]
//
// K and E are the complete elliptic integrals of the first and second
// kind; gonum's mathext.CompleteK and CompleteE take the parameter m = k².
// K_N → 1 − 4k/(3π) for long sheets and → 0 for short ones. Both
// arguments must be positive and finite (else NaN; callers check).
//
// Reference: H. Nagaoka, J. Coll. Sci. Imp. Univ. Tokyo 27 (1909) art. 6;
// methods.md §6.4.
func nagaokaKN(r, l float64) float64 {
	den := 4*r*r + l*l
	m := 4 * r * r / den
	k := math.Sqrt(m)
	kp := l / math.Sqrt(den)
	bigK, bigE := mathext.CompleteK(m), mathext.CompleteE(m)
	return 4 / (3 * math.Pi * kp) * (kp*kp/m*(bigK-bigE) + bigE - k)
}

// rosaA returns Rosa's self-inductance correction A for round wire of
// diameter d wound at pitch p (p ≥ d): the difference, in units of μ₀a, of
// the self-inductance of a strip of width p of the current sheet and of a
// ring of round wire, from their geometric mean distances (p·e^{−3/2} and
// (d/2)·e^{−1/4}):
//
//	A = 5/4 − ln(2p/d)        (= 0.5569 for p = d)
//
// Reference: E. B. Rosa, Bull. Bur. Stand. 2 (1906) 161–187; F. W. Grover,
// Inductance Calculations (1946), ch. 16 (A tabulated there; from memory).
func rosaA(d, p float64) float64 { return 1.25 - math.Log(2*p/d) }

// rosaB returns Rosa's mutual-inductance correction B for N turns: the
// mean over turns of the difference between the mutual inductances of
// strips of the current sheet and of round wires k pitches apart,
//
//	B(N) = (2/N) Σ_{k=1}^{N−1} (N − k) ε_k,
//	ε_k  = ln(k) − ln g_k,  g_k the geometric mean distance of two
//	       collinear strips of width 1 with centres k apart,
//
// evaluated with the asymptotic series (valid for fractional N ≥ 1;
// agrees with the exact sum to 2×10⁻⁸, see coil_test.go):
//
//	B(N) = ln 2π − 3/2 − ln N/(6N) − 0.33084236/N − 1/(120N³)
//	       + 1/(504N⁵) − 0.0011925/N⁷ + c₉/N⁹,
//	c₉ = −ln 2π + 3/2 + 0.33084236 + 1/120 − 1/504 + 0.0011925 (B(1) = 0).
//
// Reference: E. B. Rosa, Bull. Bur. Stand. 2 (1906) 161–187 (definition);
// series from D. W. Knight, "Solenoid inductance calculation" (2016) and
// D. W. Knight & R. Rosenbaum, notes on Grover's Inductance Calculations
// (2012) — secondary, verified here against the exact sum.
func rosaB(n float64) float64 {
	const (
		c1 = 0.33084236
		c7 = 0.0011925
	)
	lead := math.Log(2*math.Pi) - 1.5
	c9 := -lead + c1 + 1.0/120 - 1.0/504 + c7
	n2 := n * n
	n3 := n2 * n
	n5 := n3 * n2
	n7 := n5 * n2
	n9 := n7 * n2
	return lead - math.Log(n)/(6*n) - c1/n - 1/(120*n3) + 1/(504*n5) - c7/n7 + c9/n9
}

// inductanceH returns the low-frequency inductance in henries of a coil
// with valid dimensions (see InductanceUH).
func (g coilDims) inductanceH() float64 {
	l := g.turns * g.pitchM
	a := g.radM
	n := g.turns
	sheet := Mu0 * math.Pi * a * a * n * n / l * nagaokaKN(a, l)
	return sheet - Mu0*a*n*(rosaA(g.wireM, g.pitchM)+rosaB(n))
}

// InductanceUH returns the low-frequency inductance of the coil in µH:
// Nagaoka's current-sheet inductance with Rosa's round-wire corrections,
//
//	L_s = K_N · μ₀ π a² N² / ℓ,   ℓ = N p,  a = (D_form + d)/2
//	L   = L_s − μ₀ a N (A + B)
//
// with K_N from nagaokaKN (complete elliptic integrals), A = 5/4 − ln(2p/d)
// for the self-inductance of a round-wire turn versus a strip of the sheet
// and B(N) for the mutual inductances (rosaB). The corrections assume a
// uniform current over the wire section (low frequency) and p ≪ a (they
// treat neighbouring turns as straight): against a model of separate
// round-wire rings the result agrees to 0.01 % at p/a = 0.04 and 0.2 % at
// p/a = 0.36. For close-wound crystal-set coils they amount to about
// −0.8 … −1.5 % (−1.24 % for 200 turns of AWG 24 on a 25 mm form); for
// spaced windings (p > 1.75 d) A turns negative and the correction may
// add. Self-capacitance is not included: it belongs with the tuning
// capacitance (stray). An invalid coil (see Validate) returns 0.
//
// Reference: H. Nagaoka (1909), methods.md §6.4; E. B. Rosa, Bull. Bur.
// Stand. 2 (1906) 161–187; F. W. Grover, Inductance Calculations (1946).
func (c Coil) InductanceUH() float64 {
	g, ok := c.dims()
	if !ok {
		return 0
	}
	return g.inductanceH() * 1e6
}

// copperSkinDepthM returns the skin depth in copper in metres:
//
//	δ = √(2/(ω μ₀ σ))      (66.1 µm at 1 MHz)
//
// Reference: methods.md §6.6.
func copperSkinDepthM(f KHz) float64 {
	return math.Sqrt(2 / (omega(f) * Mu0 * CopperConductivity))
}

// roundWireLoss returns, for a round wire of radius a at q = a/δ, the
// skin-effect resistance ratio F = R_ac/R_dc of the isolated straight wire
// and the development w of the proximity (transverse-field eddy) loss
// relative to the skin loss, normalised so that w → 1 when a ≫ δ:
//
//	u    = (1 − j) q,   ρ = J₁(u)/J₀(u)
//	F    = Re[ u / (2ρ) ]                      (internal impedance/R_dc)
//	P    = 2 Re[ j ρ (1 − ρ/u)* / (1 − j) ]    (eddy loss in a uniform
//	       transverse field H₀, in units of π a ω μ₀ δ H₀²)
//	w    = P / (2F/q)
//
// Limits: F = 1 + q⁴/48 + … and P = q³/4 + … for q ≪ 1 (so w ≈ q⁴/8);
// F = q/2 + 1/4 + 3/(32q) + … and P → 1 for q ≫ 1. ρ is found by backward
// recurrence ρ_n = 1/(2n/u − ρ_{n+1}) from n = |u| + 30.
//
// Reference: internal impedance of a round wire, S. Ramo, J. R. Whinnery,
// T. Van Duzer, Fields and Waves in Communication Electronics, 3rd ed.
// (1994) §5.6 (from memory); transverse-field loss derived here from the
// Poynting vector of the standard solution (cf. S. Butterworth, Phil.
// Trans. R. Soc. A 222 (1922) 57, from memory).
func roundWireLoss(q float64) (f, w float64) {
	u := complex(q, -q)
	n := int(cmplx.Abs(u)) + 30
	var rho complex128
	for k := n; k >= 1; k-- {
		rho = 1 / (complex(2*float64(k), 0)/u - rho)
	}
	f = real(u / (2 * rho))
	p := 2 * real(1i*rho*cmplx.Conj(1-rho/u)/complex(1, -1))
	return f, p / (2 * f / q)
}

// medhurstLD and medhurstDS are the axes of medhurstPhi: coil length over
// diameter ℓ/D (the last row is ℓ/D = ∞) and wire diameter over pitch d/p.
var (
	medhurstLD = [...]float64{0, 0.2, 0.4, 0.6, 0.8, 1, 2, 4, 6, 8, 10}
	medhurstDS = [...]float64{1, 0.9, 0.8, 0.7, 0.6, 0.5, 0.4, 0.3, 0.2, 0.1, 0}
)

// medhurstPhi holds Medhurst's measured ratio Φ of the high-frequency
// (d ≫ δ) resistance of a single-layer coil to that of the same wire
// straight, rows ℓ/D = 0 … 10 and ∞, columns d/p = 1 … 0.1 (and 0, Φ = 1).
//
// Reference: R. G. Medhurst, "H.F. resistance and self-capacitance of
// single-layer solenoids", Wireless Engineer 24 (1947) 35–43 and 80–92,
// table of Φ. From memory, cross-checked against a secondary transcription
// of the table. The entry 2.27 at ℓ/D = 10, d/p = 0.7 breaks the trend of
// its column (2.34 at 8, 2.51 at ∞) and may be a transcription slip; it is
// used as given.
var medhurstPhi = [12][11]float64{
	{5.31, 3.73, 2.74, 2.12, 1.74, 1.44, 1.20, 1.16, 1.07, 1.02, 1},   // ℓ/D = 0
	{5.45, 3.84, 2.83, 2.20, 1.77, 1.48, 1.29, 1.19, 1.08, 1.02, 1},   // 0.2
	{5.65, 3.99, 2.97, 2.28, 1.83, 1.54, 1.33, 1.21, 1.08, 1.03, 1},   // 0.4
	{5.80, 4.11, 3.10, 2.38, 1.89, 1.60, 1.38, 1.22, 1.10, 1.03, 1},   // 0.6
	{5.80, 4.17, 3.20, 2.44, 1.92, 1.64, 1.42, 1.23, 1.10, 1.03, 1},   // 0.8
	{5.55, 4.10, 3.17, 2.47, 1.94, 1.67, 1.45, 1.24, 1.10, 1.03, 1},   // 1
	{4.10, 3.36, 2.74, 2.32, 1.98, 1.74, 1.50, 1.28, 1.13, 1.04, 1},   // 2
	{3.54, 3.05, 2.60, 2.27, 2.01, 1.78, 1.54, 1.32, 1.15, 1.04, 1},   // 4
	{3.31, 2.92, 2.60, 2.29, 2.03, 1.80, 1.56, 1.34, 1.16, 1.04, 1},   // 6
	{3.20, 2.90, 2.62, 2.34, 2.08, 1.81, 1.57, 1.34, 1.165, 1.04, 1},  // 8
	{3.23, 2.93, 2.65, 2.27, 2.10, 1.83, 1.58, 1.35, 1.17, 1.04, 1},   // 10
	{3.41, 3.11, 2.815, 2.51, 2.22, 1.93, 1.65, 1.395, 1.19, 1.05, 1}, // ∞
}

// medhurstFactor interpolates medhurstPhi bilinearly: linearly in d/p
// (0 … 1) and in ℓ/D up to 10, then linearly in D/ℓ between ℓ/D = 10 and
// ∞.
//
// Reference: Medhurst (1947), see medhurstPhi.
func medhurstFactor(lOverD, dOverP float64) float64 {
	// Column: d/p decreasing along the axis, step 0.1.
	x := (1 - math.Min(math.Max(dOverP, 0), 1)) * 10
	j := min(int(x), len(medhurstDS)-2)
	tj := x - float64(j)
	row := func(i int) float64 {
		return medhurstPhi[i][j]*(1-tj) + medhurstPhi[i][j+1]*tj
	}
	last := len(medhurstLD) - 1
	if lOverD >= medhurstLD[last] {
		t := medhurstLD[last] / lOverD // 1 at ℓ/D = 10, 0 at ∞
		return row(last)*t + row(last+1)*(1-t)
	}
	i := 0
	for lOverD >= medhurstLD[i+1] {
		i++
	}
	ti := (lOverD - medhurstLD[i]) / (medhurstLD[i+1] - medhurstLD[i])
	return row(i)*(1-ti) + row(i+1)*ti
}

// ResistanceOhm returns the series resistance of the coil's wire in Ω at
// frequency f, from DC resistance, skin effect and proximity effect:
//
//	ℓ_w  = N √((π D)² + p²)            (helix length, D = 2a)
//	R_dc = ℓ_w / (σ π d²/4)             (σ = 5.8×10⁷ S/m, IEC 60028)
//	q    = d/(2δ),  (F, w) = roundWireLoss(q)
//	R    = R_dc · F · [1 + (Φ(ℓ/D, d/p) − 1) · w · (N − 1)/N]
//
// F is the exact skin-effect ratio of a straight round wire (Bessel
// functions), valid from DC to d ≫ δ. Φ is Medhurst's measured ratio of
// coil to straight-wire resistance when d ≫ δ (medhurstPhi), about
// 2.9 … 5.8 for close-wound coils (d/p = 0.9 … 1); w scales the excess Φ − 1 by the exact ratio of
// transverse-field eddy loss to skin loss of a round wire, so it vanishes
// at DC (as f²) and tends to Φ − 1 when d ≫ δ. The factor (N − 1)/N, an
// assumption of this package, removes the proximity excess for a single
// turn (Medhurst's coils had many turns). Dielectric loss of the form and
// enamel and radiation are neglected. An invalid coil, or f not in
// (0, 100000] kHz, returns 0.
//
// Reference: methods.md §6.6 (δ, R_ac); Medhurst, Wireless Engineer 24
// (1947) 35–43, 80–92 (Φ); see roundWireLoss.
func (c Coil) ResistanceOhm(f KHz) float64 {
	g, ok := c.dims()
	if !ok || !finite(float64(f)) || f <= 0 || f > propagation.MaxKHz {
		return 0
	}
	dia := 2 * g.radM
	wireLen := g.turns * math.Hypot(math.Pi*dia, g.pitchM)
	rdc := wireLen * copperResistivityOhmM / (math.Pi * g.wireM * g.wireM / 4)
	q := g.wireM / 2 / copperSkinDepthM(f)
	skin, w := roundWireLoss(q)
	phi := medhurstFactor(g.turns*g.pitchM/dia, g.wireM/g.pitchM)
	return rdc * skin * (1 + (phi-1)*w*(g.turns-1)/g.turns)
}

// Q returns the unloaded quality factor of the coil at frequency f:
//
//	Q = ω L / R
//
// with L = InductanceUH and R = ResistanceOhm. Self-capacitance is
// neglected (it joins the tuning capacitance; near the coil's
// self-resonance the apparent Q is lower). An invalid coil, or f not in
// (0, 100000] kHz, returns 0.
//
// Reference: methods.md §9.1.
func (c Coil) Q(f KHz) float64 {
	r := c.ResistanceOhm(f)
	if r <= 0 {
		return 0
	}
	return omega(f) * c.InductanceUH() * 1e-6 / r
}

// CoilForInductance returns the close-wound coil on a form of the given
// diameter and wire gauge whose InductanceUH is uH, with the turns found
// by root-finding (Illinois regula falsi on √L, nearly linear in N)
// and rounded to 0.01 turn:
//
//	find N in [1, 2000] with L(N) = L_wanted
//
// Errors: an invalid form diameter or gauge (fields "form diameter",
// "AWG"); uH not finite, or outside the inductances of 1 … 2000 turns on
// this form (field "inductance", with the reachable range).
//
// Reference: InductanceUH.
func CoilForInductance(formDiameterMm float64, awg int, uH float64) (Coil, error) {
	c := Coil{FormDiameterMm: formDiameterMm, AWG: awg, Turns: coilMinTurns}
	g, ok := c.dims()
	if !ok {
		return Coil{}, c.Validate()
	}
	at := func(n float64) float64 {
		g.turns = n
		return g.inductanceH() * 1e6
	}
	lo, hi := coilMinTurns, coilMaxTurns
	lLo, lHi := at(lo), at(hi)
	if !finite(uH) || uH < lLo || uH > lHi {
		return Coil{}, inputErr("inductance", uH, "µH",
			fmt.Sprintf("between %.4g and %.4g for a close-wound AWG %d coil on a %g mm form", lLo, lHi, awg, formDiameterMm))
	}
	// Illinois (modified regula falsi) on √L − √L_wanted, bracketed.
	want := math.Sqrt(uH)
	n, _ := illinoisRoot(func(n float64) (float64, error) { return math.Sqrt(at(n)) - want, nil },
		lo, hi, math.Sqrt(lLo)-want, math.Sqrt(lHi)-want, 1e-6, 1e-12*want)
	n = math.Round(n*100) / 100
	n = math.Min(math.Max(n, coilMinTurns), coilMaxTurns)
	return Coil{FormDiameterMm: formDiameterMm, AWG: awg, Turns: n}, nil
}

// ResonantKHz returns the resonant frequency in kHz of inductance uH (µH)
// with capacitance pF (pF):
//
//	f₀ = 1 / (2π √(L C))
//
// Both must be positive and finite; otherwise it returns 0 (use
// TuningRangeFor for a checked result).
//
// Reference: methods.md §9.1.
func ResonantKHz(uH, pF float64) float64 {
	if !finite(uH) || !finite(pF) || uH <= 0 || pF <= 0 {
		return 0
	}
	return 1 / (2 * math.Pi * math.Sqrt(uH*1e-6*pF*1e-12)) / 1e3
}

// CapacitancePF returns the capacitance in pF that tunes inductance uH
// (µH) to frequency f:
//
//	C = 1 / ((2π f)² L)
//
// Both must be positive and finite; otherwise it returns 0.
//
// Reference: methods.md §9.1.
func CapacitancePF(uH float64, f KHz) float64 {
	if !finite(uH) || !finite(float64(f)) || uH <= 0 || f <= 0 {
		return 0
	}
	w := omega(f)
	return 1 / (w * w * uH * 1e-6) * 1e12
}

// TuningRange is the band a tuned circuit covers, from MinKHz (capacitor
// fully meshed) to MaxKHz (capacitor open).
type TuningRange struct {
	MinKHz, MaxKHz KHz
}

// TuningRangeFor returns the band covered by inductance uH (µH) with a
// variable capacitor of capMinPF … capMaxPF (pF) and a fixed stray
// capacitance strayPF (pF: wiring, coil self-capacitance, antenna
// coupling) in parallel:
//
//	f_min = f₀(L, C_max + C_stray),  f_max = f₀(L, C_min + C_stray)
//	f₀(L, C) = 1 / (2π √(L C))
//
// Errors name the field: "inductance" (0 < L ≤ 100000 µH), "minimum
// capacitance" (0 … 100000 pF, and > 0 when the stray capacitance is 0),
// "maximum capacitance" (above the minimum, ≤ 100000 pF), "stray
// capacitance" (0 … 100000 pF).
//
// Reference: methods.md §9.1.
func TuningRangeFor(uH, capMinPF, capMaxPF, strayPF float64) (TuningRange, error) {
	if !finite(uH) || uH <= 0 || uH > coilMaxUH {
		return TuningRange{}, inputErr("inductance", uH, "µH", fmt.Sprintf("> 0 and <= %g", float64(coilMaxUH)))
	}
	if !finite(strayPF) || strayPF < 0 || strayPF > coilMaxPF {
		return TuningRange{}, inputErr("stray capacitance", strayPF, "pF", fmt.Sprintf("between 0 and %g", float64(coilMaxPF)))
	}
	if !finite(capMinPF) || capMinPF < 0 || capMinPF > coilMaxPF || capMinPF+strayPF <= 0 {
		want := fmt.Sprintf("between 0 and %g", float64(coilMaxPF))
		if strayPF == 0 {
			want = fmt.Sprintf("> 0 and <= %g when the stray capacitance is 0", float64(coilMaxPF))
		}
		return TuningRange{}, inputErr("minimum capacitance", capMinPF, "pF", want)
	}
	if !finite(capMaxPF) || capMaxPF <= capMinPF || capMaxPF > coilMaxPF {
		return TuningRange{}, inputErr("maximum capacitance", capMaxPF, "pF",
			fmt.Sprintf("> %g (the minimum) and <= %g", capMinPF, float64(coilMaxPF)))
	}
	return TuningRange{
		MinKHz: KHz(ResonantKHz(uH, capMaxPF+strayPF)),
		MaxKHz: KHz(ResonantKHz(uH, capMinPF+strayPF)),
	}, nil
}

// Covers reports whether the range includes the whole band from lo to hi
// (in either order), ends included.
func (r TuningRange) Covers(lo, hi KHz) bool {
	if lo > hi {
		lo, hi = hi, lo
	}
	return r.MinKHz <= lo && hi <= r.MaxKHz
}
