package receiver

import (
	"fmt"
	"math"
	"math/cmplx"
	"strings"

	"earshot/propagation"
)

// This file models the crystal set's antenna: a wire fed against a ground
// connection at its foot. Everything rests on one picture, the wire as a
// single-wire transmission line over ground (methods.md §6.2) carrying a
// standing wave (methods.md §6.1), with the losses (wire, radiation)
// spread along it so that the line stays finite at a half-wave resonance.
//
// Symbols used in the doc comments:
//
//	k = 2π/λ            free-space wavenumber, rad/m
//	D                   down-lead length (DownleadM), m
//	v = min(D, H)       the down-lead's vertical extent, m
//	ℓ                   length of one arm of the top: T for an inverted-L,
//	                    T/2 for a T, 0 for a vertical, m
//	n                   number of top arms: 1, 2 or 0
//	a                   wire radius, m
//	γ = α + jk          propagation constant of the (low-loss) line, 1/m

// AntennaKind is the shape of the receiving wire.
type AntennaKind int

const (
	// InvertedL is the classic long-wire crystal-set antenna: a horizontal
	// top of length TopM at height HeightM with the down-lead to the set
	// at one end.
	InvertedL AntennaKind = iota
	// TAntenna has the down-lead taken from the middle of the top, which
	// then forms two arms of TopM/2 in parallel.
	TAntenna
	// Vertical is a single vertical wire of length DownleadM with no top
	// (TopM must be 0).
	Vertical
)

var antennaKindNames = [...]string{InvertedL: "inverted-l", TAntenna: "t", Vertical: "vertical"}

// String returns the kind's name as accepted by ParseAntennaKind.
func (k AntennaKind) String() string {
	if k >= 0 && int(k) < len(antennaKindNames) {
		return antennaKindNames[k]
	}
	return fmt.Sprintf("AntennaKind(%d)", int(k))
}

// ParseAntennaKind reads an antenna kind by name: "inverted-l", "t" or
// "vertical" (case-insensitive, surrounding space ignored).
func ParseAntennaKind(s string) (AntennaKind, error) {
	t := strings.TrimSpace(s)
	for k, name := range antennaKindNames {
		if strings.EqualFold(t, name) {
			return AntennaKind(k), nil
		}
	}
	return 0, fmt.Errorf("receiver: unknown antenna kind %q (known: %s)", s,
		strings.Join(antennaKindNames[:], ", "))
}

// GroundSystem is a class of ground (earth) connection, described by the
// resistance it puts in series with the antenna at radio frequency.
type GroundSystem struct {
	Name        string
	Description string
	LossOhm     float64 // series loss resistance referred to the base current, Ω
	Source      string  // where the value comes from
}

// Rod used for the "rod-*" ground classes: one 1.5 m rod of 16 mm diameter
// (a = 8 mm radius, the 5/8-inch rod usual for earthing; common practice).
const (
	groundRodLengthM    = 1.5
	groundRodDiameterMm = 16.0
)

// groundSystems are listed from the lowest loss to the highest.
var groundSystems = []GroundSystem{
	{"radials-many", "60 or more buried radial wires", 2,
		"methods.md §6.3: ≥ 60–120 quarter-wave radials ≈ 1–2 Ω (Brown, Lewis & Epstein, Proc. IRE 25 (1937) 753, from memory); common practice"},
	{"water-pipe", "metallic cold-water pipe network", 10,
		"methods.md §6.3: metallic water-pipe network 5–20 Ω; common practice"},
	{"radials-few", "4–8 shallow radial wires", 20,
		"methods.md §6.3: a few (4–8) shallow radials 10–30 Ω; common practice"},
	rodGround("rod-wet", "one 1.5 m rod in wet soil (σ 0.01 S/m)", 0.01),
	rodGround("rod-average", "one 1.5 m rod in average soil (σ 0.003 S/m)", 0.003),
	rodGround("rod-dry", "one 1.5 m rod in dry soil (σ 0.001 S/m)", 0.001),
}

func rodGround(name, desc string, sigmaSPerM float64) GroundSystem {
	return GroundSystem{name, desc, rodOhm(sigmaSPerM, groundRodLengthM, groundRodDiameterMm/2000),
		fmt.Sprintf("Dwight (1936), AIEE Trans., via methods.md §6.3: R = ρ/(2πL)(ln(4L/a) − 1), "+
			"L = %g m, a = %g mm, σ = %g S/m (soil classes as ITU-R P.368 wet/land/medium-dry; common practice)",
			groundRodLengthM, groundRodDiameterMm/2, sigmaSPerM)}
}

// GroundSystems returns the named ground classes, lowest loss first.
func GroundSystems() []GroundSystem {
	return append([]GroundSystem(nil), groundSystems...)
}

// GroundSystemByName returns the ground class with the given name
// (case-insensitive).
func GroundSystemByName(name string) (GroundSystem, error) {
	t := strings.TrimSpace(name)
	names := make([]string, len(groundSystems))
	for i, g := range groundSystems {
		if strings.EqualFold(g.Name, t) {
			return g, nil
		}
		names[i] = g.Name
	}
	return GroundSystem{}, fmt.Errorf("receiver: unknown ground system %q (known: %s)", name,
		strings.Join(names, ", "))
}

// RodGroundOhm returns the low-frequency resistance in Ω of a single
// driven rod of length rodLengthM (m) and diameter rodDiameterMm (mm) in
// soil of conductivity soilSigmaSPerM (S/m):
//
//	R = ρ/(2πL) · [ln(4L/a) − 1],   ρ = 1/σ,  a = rod radius
//
// Accepted: σ 1e-5–10 S/m, L 0.1–30 m, diameter 1–100 mm (so that L ≫ a).
// The formula is the DC value; at MF it is used as the rod's share of the
// ground loss.
//
// Reference: H. B. Dwight, "Calculation of resistances to ground", AIEE
// Trans. 55 (1936), as reproduced in methods.md §6.3.
func RodGroundOhm(soilSigmaSPerM, rodLengthM, rodDiameterMm float64) (float64, error) {
	if !finite(soilSigmaSPerM) || soilSigmaSPerM < 1e-5 || soilSigmaSPerM > 10 {
		return 0, inputErr("soil conductivity", soilSigmaSPerM, "S/m", "between 1e-05 and 10")
	}
	if !finite(rodLengthM) || rodLengthM < 0.1 || rodLengthM > 30 {
		return 0, inputErr("rod length", rodLengthM, "m", "between 0.1 and 30")
	}
	if !finite(rodDiameterMm) || rodDiameterMm < 1 || rodDiameterMm > 100 {
		return 0, inputErr("rod diameter", rodDiameterMm, "mm", "between 1 and 100")
	}
	return rodOhm(soilSigmaSPerM, rodLengthM, rodDiameterMm/2000), nil
}

// rodOhm is Dwight's formula with the radius in metres.
func rodOhm(sigmaSPerM, lengthM, radiusM float64) float64 {
	return 1 / sigmaSPerM / (2 * math.Pi * lengthM) * (math.Log(4*lengthM/radiusM) - 1)
}

// Antenna is a receiving wire and its ground connection. The set stands at
// ground level at the foot of the down-lead.
type Antenna struct {
	Kind AntennaKind
	// TopM is the length of the horizontal top, m (0 for a Vertical).
	TopM float64
	// HeightM is the height of the top above ground, m (for a Vertical,
	// the height of its upper end, normally equal to DownleadM).
	HeightM float64
	// DownleadM is the length of the lead from the top down to the set, m;
	// normally ≈ HeightM. Longer than HeightM it slopes (its vertical
	// extent is HeightM); shorter, the set stands raised (an upper floor)
	// and the lead is vertical. For a Vertical it is the wire's length.
	DownleadM float64
	// WireDiameterMm is the diameter of the (copper) wire, mm.
	WireDiameterMm float64
	// Ground is the ground connection at the foot of the down-lead.
	Ground GroundSystem
}

// Accepted ranges of the antenna's dimensions.
const (
	antMaxLengthM    = 1000.0
	antMinHeightM    = 0.5
	antMaxHeightM    = 300.0
	antMinDownleadM  = 0.5
	antMinDiameterMm = 0.1
	antMaxDiameterMm = 10.0
	antMaxGroundOhm  = 10000.0
)

// Validate returns an *InputError naming the field at fault: "antenna
// kind"; "wire length" (TopM, 0–1000 m, and 0 for a Vertical); "height"
// (0.5–300 m); "down-lead" (0.5–1000 m and at most 2 × height, a lead
// sloping no flatter than 30°); "wire diameter" (0.1–10 mm); "ground loss"
// (0–10000 Ω).
func (a Antenna) Validate() error {
	if a.Kind < InvertedL || a.Kind > Vertical {
		return inputErr("antenna kind", float64(a.Kind), "", "0 (inverted-l), 1 (t) or 2 (vertical)")
	}
	if !finite(a.TopM) || a.TopM < 0 || a.TopM > antMaxLengthM {
		return inputErr("wire length", a.TopM, "m", fmt.Sprintf("between 0 and %g", antMaxLengthM))
	}
	if a.Kind == Vertical && a.TopM != 0 {
		return inputErr("wire length", a.TopM, "m", "0 for a vertical antenna (its length is the down-lead)")
	}
	if !finite(a.HeightM) || a.HeightM < antMinHeightM || a.HeightM > antMaxHeightM {
		return inputErr("height", a.HeightM, "m", fmt.Sprintf("between %g and %g", antMinHeightM, antMaxHeightM))
	}
	maxDown := math.Min(antMaxLengthM, 2*a.HeightM)
	if !finite(a.DownleadM) || a.DownleadM < antMinDownleadM || a.DownleadM > maxDown {
		return inputErr("down-lead", a.DownleadM, "m",
			fmt.Sprintf("between %g and %g (at most 2 × height)", antMinDownleadM, maxDown))
	}
	if !finite(a.WireDiameterMm) || a.WireDiameterMm < antMinDiameterMm || a.WireDiameterMm > antMaxDiameterMm {
		return inputErr("wire diameter", a.WireDiameterMm, "mm",
			fmt.Sprintf("between %g and %g", antMinDiameterMm, antMaxDiameterMm))
	}
	if !finite(a.Ground.LossOhm) || a.Ground.LossOhm < 0 || a.Ground.LossOhm > antMaxGroundOhm {
		return inputErr("ground loss", a.Ground.LossOhm, "Ω", fmt.Sprintf("between 0 and %g", antMaxGroundOhm))
	}
	return nil
}

// validateAt checks the antenna and a frequency together. The methods
// below return plain numbers; they assume a valid antenna and a frequency
// accepted by propagation.ValidateKHz (1 kHz–100 MHz). Callers in this
// package (the planner) check with validateAt first.
func (a Antenna) validateAt(f KHz) error {
	if err := a.Validate(); err != nil {
		return err
	}
	_, err := propagation.ValidateKHz(f)
	return err
}

// wireRadiusM returns the wire radius in metres.
func (a Antenna) wireRadiusM() float64 { return a.WireDiameterMm / 2000 }

// arms returns the number of top arms n and the length ℓ of each.
func (a Antenna) arms() (n int, armM float64) {
	switch a.Kind {
	case TAntenna:
		return 2, a.TopM / 2
	case Vertical:
		return 0, 0
	}
	return 1, a.TopM
}

// wireZ0 returns the characteristic impedance of one wire of the line:
// the top (and, in this model, the down-lead) for an inverted-L or a T,
// the vertical wire for a Vertical.
func (a Antenna) wireZ0() float64 {
	r := a.wireRadiusM()
	if a.Kind == Vertical {
		return 60 * (math.Log(2*a.DownleadM/r) - 1)
	}
	return 60 * math.Acosh(a.HeightM/r)
}

// CharacteristicOhm returns the characteristic impedance in Ω of the
// antenna's top as a single wire over ground, wire radius a at height h:
//
//	Z₀ = 60 · arccosh(h/a)  ≈ 60 · ln(2h/a)
//
// For a TAntenna the two arms meet in parallel at the down-lead and the
// top presents Z₀/2. A Vertical has no top; it returns Schelkunoff's
// average characteristic impedance of a monopole of length D:
//
//	Z₀ = 60 · [ln(2D/a) − 1]
//
// The handbook's 60 Ω rounds μ₀c/2π = 59.96 Ω (0.07 %).
//
// Reference: methods.md §6.2 (ITT/IEEE Reference Data for Radio Engineers);
// S. A. Schelkunoff & H. T. Friis, Antennas: Theory and Practice (1952),
// average characteristic impedance (from memory).
func (a Antenna) CharacteristicOhm() float64 {
	if a.Kind == TAntenna {
		return a.wireZ0() / 2
	}
	return a.wireZ0()
}

// antModel is the line model of an antenna at one frequency.
type antModel struct {
	lambdaM float64 // free-space wavelength, m
	omega   float64 // angular frequency, rad/s
	z0      float64 // characteristic impedance of one wire, Ω
	alpha   float64 // attenuation of the line, Np/m
	heM     float64 // |h_e| referred to the base current, m
	xOhm    float64 // input reactance, Ω
	wireOhm float64 // wire loss referred to the base current, Ω
}

// model evaluates the lossy stepped line of the antenna at f.
//
// The down-lead (length D, coordinate x from the top junction, x = D at
// the set) carries I(x) ∝ sinh γx + σ cosh γx, where σ = n·tanh(γℓ) is the
// top's admittance in units of 1/Z₀ (n open-ended arms of length ℓ in
// parallel; σ = 0 for a Vertical). Each arm carries I_J/n ·
// sinh(γt)/sinh(γℓ) = sinh(γt)/cosh(γℓ), t from its open end. With no
// loss this is the standing wave I(s) ∝ sin k(L − s) of methods.md §6.1
// (inverted-L, L = D + T) and its two-arm analogue for the T.
//
// The attenuation α = R′/(2Z₀) spreads the wire resistance R′ and the
// radiation resistance over the line: R′ = R′_wire + R_rad,loop/S, where
// R_rad,loop = 160π²(h_loop/λ)² and S = ∫|I/I_m|² ds are the lossless
// radiation resistance and current-squared integral referred to the
// down-lead's standing-wave amplitude I_m (finite at every length). The
// ground loss is lumped at the base and is left out of α.
func (a Antenna) model(f KHz) antModel {
	lam := f.WavelengthMetres()
	k := 2 * math.Pi / lam
	z0 := a.wireZ0()
	n, arm := a.arms()
	nf := float64(n)
	d := a.DownleadM
	vf := math.Min(d, a.HeightM) / d // vertical fraction of the down-lead
	rw := antWireOhmPerM(a.WireDiameterMm, f)

	// Lossless current referred to the down-lead amplitude:
	// I(x) = sin(kx + φ) on the down-lead, sin(kt)/M on each arm, with
	// M = √(cos²kℓ + n² sin²kℓ), tan φ = n·tan kℓ.
	kl := k * arm
	sl, cl := math.Sincos(kl)
	m2 := cl*cl + nf*nf*sl*sl
	phi := math.Atan2(nf*sl, cl)
	kd := k * d
	s := d/2 - (math.Sin(2*(kd+phi))-math.Sin(2*phi))/(4*k) + nf/m2*(arm/2-math.Sin(2*kl)/(4*k))
	hLoop := vf * (math.Cos(phi) - math.Cos(kd+phi)) / k
	rRadLoop := antRadiationOhm(hLoop, lam)
	alpha := (rw + rRadLoop/s) / (2 * z0)

	g := complex(alpha, k)
	sigma := complex(nf, 0) * cmplx.Tanh(g*complex(arm, 0))
	sd, cd := cmplx.Sinh(g*complex(d, 0)), cmplx.Cosh(g*complex(d, 0))
	ib := sd + sigma*cd // base current
	sh := cmplx.Sinh(g * complex(d/2, 0))
	integral := (2*sh*sh + sigma*sd) / g // ∫₀ᴰ I dx, using cosh γD − 1 = 2 sinh²(γD/2)
	zin := complex(z0, 0) * (cd + sigma*sd) / ib

	// ∫₀ᴰ |I|² dx with I = A e^{γx} + B e^{−γx}.
	aa, bb := (1+sigma)/2, (sigma-1)/2
	s2d := math.Sin(kd)
	osc := complex(math.Sin(2*kd)/(2*k), s2d*s2d/k) // ∫₀ᴰ e^{j2kx} dx
	down := antSq(cmplx.Abs(aa))*math.Expm1(2*alpha*d)/(2*alpha) -
		antSq(cmplx.Abs(bb))*math.Expm1(-2*alpha*d)/(2*alpha) +
		2*real(aa*cmplx.Conj(bb)*osc)
	top := 0.0
	if n > 0 && arm > 0 {
		// n · ∫₀ˡ |sinh γt|² dt / |cosh γℓ|², |sinh γt|² = sinh²αt + sin²kt.
		top = nf * (math.Sinh(2*alpha*arm)/(4*alpha) - math.Sin(2*kl)/(4*k)) /
			antSq(cmplx.Abs(cmplx.Cosh(g*complex(arm, 0))))
	}
	ib2 := antSq(cmplx.Abs(ib))
	return antModel{
		lambdaM: lam,
		omega:   omega(f),
		z0:      z0,
		alpha:   alpha,
		heM:     vf * cmplx.Abs(integral) / cmplx.Abs(ib),
		xOhm:    imag(zin),
		wireOhm: rw * (down + top) / ib2,
	}
}

// antSq returns x².
func antSq(x float64) float64 { return x * x }

// EffectiveHeightM returns the effective height in m of the antenna at f,
// referred to the current at its base (the set):
//
//	h_e = (v/D) · |∫₀ᴰ I(x) dx| / |I(D)|
//	    = (v/D) · |cosh γD − 1 + σ sinh γD| / |γ (sinh γD + σ cosh γD)|
//
// with the current of the lossy line described at model (σ = n·tanh γℓ).
// For an inverted-L with no loss (γ = jk, L = D + T) this is the
// sinusoidal form of methods.md §6.1,
//
//	h_e = [cos k(L − D) − cos kL] / (k sin kL),
//
// which tends to the linear-taper value D(1 − D/(2L)) for kL → 0 and to
// D/2 for a short Vertical. Only the vertical part counts: the top, low
// over ground, is cancelled by its image.
//
// Validity: the standing-wave picture holds up to a total length L of
// about λ/2. Towards L = λ/2 the base current falls and h_e rises to a
// peak set by the line loss (finite, never Inf); just beyond, a current
// node lies in the down-lead and h_e dips towards zero, after which the
// pattern repeats every λ/2. The pick-up of a long horizontal top is not
// modelled.
//
// Reference: methods.md §6.1 (J. D. Kraus, Antennas; F. E. Terman, Radio
// Engineers' Handbook) and §6.2 for the line model.
func (a Antenna) EffectiveHeightM(f KHz) float64 { return a.model(f).heM }

// antRadiationOhm returns 160π²(h_e/λ)² in Ω.
func antRadiationOhm(heM, lambdaM float64) float64 {
	r := heM / lambdaM
	return 160 * math.Pi * math.Pi * r * r
}

// RadiationResistanceOhm returns the radiation resistance in Ω referred to
// the base current:
//
//	R_r = 160 π² (h_e/λ)²
//
// with h_e from EffectiveHeightM. For a short Vertical (h_e = h/2) this
// is 40π²(h/λ)²; for a λ/4 vertical it gives 40 Ω against the exact
// 36.5 Ω (the formula assumes a short vertical part).
//
// Reference: methods.md §6.1.
func (a Antenna) RadiationResistanceOhm(f KHz) float64 {
	m := a.model(f)
	return antRadiationOhm(m.heM, m.lambdaM)
}

// antWireOhmPerM returns the RF resistance per metre, Ω/m, of a round
// copper wire of diameter diameterMm at f, for any ratio of radius r to
// skin depth δ = √(2/(ωμ₀σ_c)):
//
//	R′ = R′_dc · Re[(ka/2) J₀(ka)/J₁(ka)],  ka = (1 − j) r/δ,  R′_dc = 1/(σ_c π r²)
//	   ≈ R′_dc · (x/2 + 1/4 + 3/(32x)),     x = r/δ > 8
//
// The exact form is summed as a power series for x ≤ 8 (where the
// asymptotic form errs by 3.5e-5 at x = 8); for x ≫ 1 both approach
// methods.md §6.6's R′ = 1/(π d δ σ_c).
//
// Reference: S. Ramo, J. R. Whinnery & T. Van Duzer, Fields and Waves in
// Communication Electronics (3rd ed., 1994), internal impedance of a round
// wire (from memory); methods.md §6.6.
func antWireOhmPerM(diameterMm float64, f KHz) float64 {
	r := diameterMm / 2000
	delta := math.Sqrt(2 / (omega(f) * Mu0 * CopperConductivity))
	return antSkinRatio(r/delta) / (CopperConductivity * math.Pi * r * r)
}

// antSkinRatio returns R_ac/R_dc of a round wire for x = radius/skin depth.
// With u = −(ka/2)² = j x²/2, (ka/2)J₀/J₁ = Σ uᵐ/(m!)² / Σ uᵐ/(m!(m+1)!).
func antSkinRatio(x float64) float64 {
	if x > 8 {
		return x/2 + 0.25 + 3/(32*x)
	}
	u := complex(0, x*x/2)
	t0, t1 := complex(1, 0), complex(1, 0)
	s0, s1 := t0, t1
	for m := 1; m < 200; m++ {
		fm := float64(m)
		t0 *= u / complex(fm*fm, 0)
		t1 *= u / complex(fm*(fm+1), 0)
		s0 += t0
		s1 += t1
		if cmplx.Abs(t0) < 1e-17*cmplx.Abs(s0) && cmplx.Abs(t1) < 1e-17*cmplx.Abs(s1) {
			break
		}
	}
	return real(s0 / s1)
}

// WireLossOhm returns the skin-effect loss of the copper wire in Ω,
// referred to the base current:
//
//	R_w = ∫ R′ |I(s)/I(0)|² ds   over the down-lead and every arm of the top
//
// with R′ from the round-wire skin-effect formula (see methods.md §6.6)
// and the current of the lossy line described at EffectiveHeightM, in
// closed form. For the lossless inverted-L this is
// R′·[L/2 − sin(2kL)/(4k)]/sin²kL; for a short wire it tends to R′L/3.
// The wire's internal reactance (≈ R′ per metre) is neglected in the
// reactance. Near a half-wave resonance the result is large but finite.
//
// Reference: methods.md §6.6; the power a standing wave dissipates in a
// line's series resistance (standard line theory, e.g. F. E. Terman, Radio
// Engineers' Handbook, 1943; from memory).
func (a Antenna) WireLossOhm(f KHz) float64 { return a.model(f).wireOhm }

// Impedance returns the antenna's impedance at its base in Ω:
//
//	Z = R_A + jX,  R_A = R_r + R_ground + R_w
//	X = Im Z_in,   Z_in = Z₀ (cosh γD + σ sinh γD) / (sinh γD + σ cosh γD)
//
// For an inverted-L Z_in = Z₀ coth(γL); with no loss X = −Z₀ cot kL, the
// capacitive reactance of a short wire (X ≈ −1/(ωC′L) + ωL′L/3 for
// kL ≪ 1) which turns inductive beyond a quarter wave. The loss in γ
// (see model) only matters near a half-wave resonance, where the lossless
// formula would be infinite: there X passes smoothly through zero while
// R_A peaks. Z₀ is the single wire's value (the T's arms use it in
// parallel). R_r and R_w are referred to the base current.
//
// Reference: methods.md §6.1–6.2 (lossless line model, losses in series);
// input impedance Z₀ coth(γl) of an open lossy line (standard line theory,
// e.g. F. E. Terman, Radio Engineers' Handbook, 1943; from memory).
func (a Antenna) Impedance(f KHz) complex128 {
	m := a.model(f)
	r := antRadiationOhm(m.heM, m.lambdaM) + a.Ground.LossOhm + m.wireOhm
	return complex(r, m.xOhm)
}

// LoadingUH returns the series inductance in µH that tunes out the
// antenna's reactance at f:
//
//	L = −X/ω
//
// Positive when the wire is capacitive (shorter than about λ/4), the
// usual case in the medium-wave band. Negative when the wire is already
// inductive: it then needs a series capacitor instead, of the value
// SeriesCapacitancePF returns.
//
// Reference: series resonance, methods.md §9.1.
func (a Antenna) LoadingUH(f KHz) float64 {
	m := a.model(f)
	return -m.xOhm / m.omega * 1e6
}

// SeriesCapacitancePF returns the series capacitance in pF that tunes out
// an inductive antenna reactance X > 0 at f:
//
//	C = 1/(ω X)
//
// It returns 0 when X ≤ 0 (no series capacitor can tune a capacitive
// wire; see LoadingUH).
//
// Reference: series resonance, methods.md §9.1.
func (a Antenna) SeriesCapacitancePF(f KHz) float64 {
	m := a.model(f)
	if m.xOhm <= 0 {
		return 0
	}
	return 1e12 / (m.omega * m.xOhm)
}

// OpenCircuitUV returns the open-circuit voltage in µV rms at the base of
// the antenna in a vertical field of fieldDBuVm dB(µV/m):
//
//	V_oc = E · h_e
//
// Reference: methods.md §1.10 and §6.1.
func (a Antenna) OpenCircuitUV(fieldDBuVm float64, f KHz) float64 {
	return propagation.MicroVoltsPerMetre(fieldDBuVm) * a.EffectiveHeightM(f)
}

// antAvailablePowerW returns V²/(4R) in W for vocUV in µV rms and R in Ω.
func antAvailablePowerW(vocUV, rOhm float64) float64 {
	v := vocUV * 1e-6
	return v * v / (4 * rOhm)
}

// AvailablePowerW returns the power in W the antenna delivers into a
// conjugate-matched load in a field of fieldDBuVm dB(µV/m):
//
//	P_av = V_oc² / (4 R_A)
//
// Reference: methods.md §6.1.
func (a Antenna) AvailablePowerW(fieldDBuVm float64, f KHz) float64 {
	m := a.model(f)
	voc := propagation.MicroVoltsPerMetre(fieldDBuVm) * m.heM
	r := antRadiationOhm(m.heM, m.lambdaM) + a.Ground.LossOhm + m.wireOhm
	return antAvailablePowerW(voc, r)
}
