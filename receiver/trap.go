package receiver

import (
	"fmt"
	"math"
	"strconv"
	"strings"

	"earshot/propagation"
)

// TrapKind says how a wave trap is wired into the antenna lead.
type TrapKind int

const (
	// SeriesShuntTrap is a series LC from the antenna lead to ground (a
	// "suck-out" trap): at its resonance it is a low resistance that
	// shunts the unwanted signal away from the set.
	SeriesShuntTrap TrapKind = iota
	// ParallelSeriesTrap is a parallel LC in series with the antenna lead
	// (a rejector): at its resonance it is a high impedance that blocks
	// the unwanted signal.
	ParallelSeriesTrap
)

// String returns "series-shunt" or "parallel-series".
func (k TrapKind) String() string {
	switch k {
	case SeriesShuntTrap:
		return "series-shunt"
	case ParallelSeriesTrap:
		return "parallel-series"
	}
	return "TrapKind(" + strconv.Itoa(int(k)) + ")"
}

// ParseTrapKind parses the names returned by String, ignoring case and
// surrounding space; the trade names "suck-out" and "rejector" are also
// accepted.
func ParseTrapKind(s string) (TrapKind, error) {
	switch strings.ToLower(strings.TrimSpace(s)) {
	case "series-shunt", "suck-out":
		return SeriesShuntTrap, nil
	case "parallel-series", "rejector":
		return ParallelSeriesTrap, nil
	}
	return 0, fmt.Errorf("receiver: trap kind %q: want series-shunt (suck-out) or parallel-series (rejector)", s)
}

// Accepted ranges of the trap's parts. They span what a listener can
// build or buy for the LF/MF broadcast bands with room to spare; the
// Q range covers lossy miniature chokes (5) to large litz-wound
// coils (1000).
const (
	trapMinUH = 0.1
	trapMaxUH = 10000.0
	trapMinPF = 1.0
	trapMaxPF = 10000.0
	trapMinQ  = 5.0
	trapMaxQ  = 1000.0
	// trapMaxPortOhm bounds the magnitude of the source and load
	// resistance and reactance (1 GΩ), far above any antenna or set, so
	// that products of impedances stay finite.
	trapMaxPortOhm = 1e9
)

// trapMaxWantedLossDB is the most a trap may take off the wanted station
// for AdviseTrap to call it a fix: 3 dB, the half-power point. It is a
// choice made here (the wanted signal keeps half its power and a crystal
// set's audio drops by about 6 dB through the square-law detector), not a
// published limit.
const trapMaxWantedLossDB = 3.0

// Trap is a wave trap: a coil of InductanceUH (µH) with unloaded Q
// QUnloaded, and a capacitor of CapacitancePF (pF), wired as Kind says.
// The coil's loss is a series resistance r = X₀/Q_u, held at its value at
// resonance over the whole frequency range (a real coil's r grows roughly
// as √f, which matters only far from the notch, where the trap does
// little). The capacitor is taken as lossless.
type Trap struct {
	Kind          TrapKind
	InductanceUH  float64
	CapacitancePF float64
	QUnloaded     float64
}

// trapInRange reports whether v lies in [lo, hi]; NaN is outside.
func trapInRange(v, lo, hi float64) bool { return v >= lo && v <= hi }

// Validate checks the kind and the parts: L 0.1–10000 µH, C 1–10000 pF,
// Q 5–1000. The error names the field ("trap kind", "trap inductance",
// "trap capacitance", "trap Q").
func (t Trap) Validate() error {
	if t.Kind != SeriesShuntTrap && t.Kind != ParallelSeriesTrap {
		return inputErr("trap kind", float64(t.Kind), "", "0 (series-shunt) or 1 (parallel-series)")
	}
	if !trapInRange(t.InductanceUH, trapMinUH, trapMaxUH) {
		return inputErr("trap inductance", t.InductanceUH, "µH", "between 0.1 and 10000")
	}
	if !trapInRange(t.CapacitancePF, trapMinPF, trapMaxPF) {
		return inputErr("trap capacitance", t.CapacitancePF, "pF", "between 1 and 10000")
	}
	if !trapInRange(t.QUnloaded, trapMinQ, trapMaxQ) {
		return inputErr("trap Q", t.QUnloaded, "", "between 5 and 1000")
	}
	return nil
}

// ResonantKHz returns the trap's resonant frequency in kHz:
//
//	f₀ = 1 / (2π √(LC))
//
// For the parallel trap with the coil loss in series with L this is the
// frequency at which the two reactances are equal; the tank's impedance
// peaks within a fraction of about 1/(2Q_u²) of it.
//
// Reference: methods.md §9.1 [D] (standard circuit theory; F. E. Terman,
// Radio Engineers' Handbook, 1943, §3).
func (t Trap) ResonantKHz() KHz {
	return KHz(1e-3 / (2 * math.Pi * math.Sqrt(t.InductanceUH*1e-6*t.CapacitancePF*1e-12)))
}

// reactanceOhm returns X₀ = √(L/C), the reactance of either part at
// resonance, in ohms.
func (t Trap) reactanceOhm() float64 {
	return math.Sqrt(t.InductanceUH * 1e-6 / (t.CapacitancePF * 1e-12))
}

// trapFromReactance returns the trap of the given kind and Q whose parts
// have reactance x0Ohm at f.
func trapFromReactance(kind TrapKind, f KHz, x0Ohm, q float64) Trap {
	w := omega(f)
	return Trap{Kind: kind, InductanceUH: x0Ohm / w * 1e6, CapacitancePF: 1e12 / (w * x0Ohm), QUnloaded: q}
}

// DesignTrap returns the trap of the given kind and unloaded Q that
// resonates at notch. Give exactly one of inductanceUH (µH) and
// capacitancePF (pF), the part to hand, and 0 for the other, which is
// computed from
//
//	L = 1 / (ω₀² C),  C = 1 / (ω₀² L),  ω₀ = 2π f_notch
//
// An error names the field at fault: "notch frequency" (1–100000 kHz),
// "trap Q" (5–1000), the part given if it is out of range, "trap
// inductance" if neither part is given, "trap capacitance" if both are,
// and the computed part if it falls outside its range (L 0.1–10000 µH,
// C 1–10000 pF).
//
// Reference: methods.md §9.1 [D] (f₀ = 1/(2π√(LC))).
func DesignTrap(kind TrapKind, notch KHz, inductanceUH, capacitancePF, qUnloaded float64) (Trap, error) {
	if kind != SeriesShuntTrap && kind != ParallelSeriesTrap {
		return Trap{}, inputErr("trap kind", float64(kind), "", "0 (series-shunt) or 1 (parallel-series)")
	}
	if err := trapCheckKHz("notch frequency", notch); err != nil {
		return Trap{}, err
	}
	if !trapInRange(qUnloaded, trapMinQ, trapMaxQ) {
		return Trap{}, inputErr("trap Q", qUnloaded, "", "between 5 and 1000")
	}
	w2 := omega(notch) * omega(notch)
	t := Trap{Kind: kind, InductanceUH: inductanceUH, CapacitancePF: capacitancePF, QUnloaded: qUnloaded}
	switch {
	case inductanceUH == 0 && capacitancePF == 0:
		return Trap{}, inputErr("trap inductance", 0, "",
			"between 0.1 and 10000 µH (or give the trap capacitance instead)")
	case inductanceUH != 0 && capacitancePF != 0:
		return Trap{}, inputErr("trap capacitance", capacitancePF, "",
			"0 when the trap inductance is given (give one part; the other is computed)")
	case inductanceUH != 0:
		if !trapInRange(inductanceUH, trapMinUH, trapMaxUH) {
			return Trap{}, inputErr("trap inductance", inductanceUH, "µH", "between 0.1 and 10000")
		}
		t.CapacitancePF = 1e18 / (w2 * inductanceUH) // C = 1/(ω₀²L), in pF with L in µH
		if !trapInRange(t.CapacitancePF, trapMinPF, trapMaxPF) {
			return Trap{}, inputErr("trap capacitance", t.CapacitancePF, "", fmt.Sprintf(
				"between 1 and 10000 pF (computed to tune %g µH to %g kHz; choose another coil)",
				inductanceUH, float64(notch)))
		}
	default:
		if !trapInRange(capacitancePF, trapMinPF, trapMaxPF) {
			return Trap{}, inputErr("trap capacitance", capacitancePF, "pF", "between 1 and 10000")
		}
		t.InductanceUH = 1e18 / (w2 * capacitancePF) // L = 1/(ω₀²C), in µH with C in pF
		if !trapInRange(t.InductanceUH, trapMinUH, trapMaxUH) {
			return Trap{}, inputErr("trap inductance", t.InductanceUH, "", fmt.Sprintf(
				"between 0.1 and 10000 µH (computed to tune %g pF to %g kHz; choose another capacitor)",
				capacitancePF, float64(notch)))
		}
	}
	return t, nil
}

// trapCheckKHz checks a frequency against the range package propagation
// accepts (1–100000 kHz).
func trapCheckKHz(field string, f KHz) error {
	if !trapInRange(float64(f), propagation.MinKHz, propagation.MaxKHz) {
		return inputErr(field, float64(f), "kHz",
			fmt.Sprintf("between %g and %g", propagation.MinKHz, propagation.MaxKHz))
	}
	return nil
}

// trapCheckPorts checks a source and a load impedance: each resistance
// 0–1e9 Ω, each reactance ±1e9 Ω, and a positive total resistance.
func trapCheckPorts(source, load complex128) error {
	for _, p := range []struct {
		name string
		z    complex128
	}{{"source", source}, {"load", load}} {
		if !trapInRange(real(p.z), 0, trapMaxPortOhm) {
			return inputErr(p.name+" resistance", real(p.z), "Ω", "between 0 and 1e+09")
		}
		if !trapInRange(imag(p.z), -trapMaxPortOhm, trapMaxPortOhm) {
			return inputErr(p.name+" reactance", imag(p.z), "Ω", "between -1e+09 and 1e+09")
		}
	}
	if real(source)+real(load) <= 0 {
		return inputErr("source + load resistance", real(source)+real(load), "Ω", "> 0")
	}
	return nil
}

// mustEval panics, with a "receiver: " message naming the field, if the
// trap, the frequency or the ports are invalid. It guards the evaluating
// methods, whose callers are expected to have validated their input.
func (t Trap) mustEval(method string, f KHz, source, load complex128, ports bool) {
	err := t.Validate()
	if err == nil && !(float64(f) > 0 && float64(f) <= math.MaxFloat64) {
		err = inputErr("frequency", float64(f), "kHz", "> 0 and finite")
	}
	if err == nil && ports {
		err = trapCheckPorts(source, load)
	}
	if err != nil {
		panic("receiver: Trap." + method + ": " + err.Error())
	}
}

// Impedance returns the trap's impedance in ohms at f (e^{+jωt}
// convention), with r = X₀/Q_u the coil's series loss resistance:
//
//	series-shunt:     Z = r + j(ωL − 1/(ωC))
//	parallel-series:  Z = (r + jωL)·(1/(jωC)) / (r + j(ωL − 1/(ωC)))
//
// The parallel form is exact (not the near-resonance R_D/(1 + jQ_u δ)):
// at f₀ it is Q_u X₀ − jX₀. Precondition: t is valid (Validate) and
// f > 0; otherwise Impedance panics with a "receiver: " message.
//
// Reference: methods.md §9.1, §9.3–9.4 [D] (standard circuit theory;
// F. E. Terman, Radio Engineers' Handbook, 1943, §3).
func (t Trap) Impedance(f KHz) complex128 {
	t.mustEval("Impedance", f, 0, 0, false)
	return t.impedance(f)
}

func (t Trap) impedance(f KHz) complex128 {
	w := omega(f)
	zl := complex(t.reactanceOhm()/t.QUnloaded, w*t.InductanceUH*1e-6)
	zc := complex(0, -1/(w*t.CapacitancePF*1e-12))
	if t.Kind == SeriesShuntTrap {
		return zl + zc
	}
	return zl * zc / (zl + zc) // zl + zc has real part r > 0, never 0
}

// InsertionLossDB returns the loss in dB (voltage at the load without the
// trap over voltage with it) of the trap inserted between a source of
// impedance source and a load of impedance load (ohms, complex, so the
// antenna's reactance may be included). From the voltage divider:
//
//	series-shunt (trap Z_T across the load):
//	    V₀/V = 1 + Z_par/Z_T,            Z_par = Z_S Z_L / (Z_S + Z_L)
//	parallel-series (trap Z_T in series):
//	    V₀/V = 1 + Z_T/(Z_S + Z_L)
//	IL = 20 log₁₀ |V₀/V|
//
// (Shunt: V₀ = V_S Z_L/(Z_S+Z_L) and V = V_S Z'/(Z_S+Z') with
// Z' = Z_L‖Z_T; the ratio simplifies to the form above.) For resistive
// source and load the loss is ≥ 0 dB; with a reactive source or load it
// can be negative at some frequencies (the trap resonating with, say, the
// antenna's capacitance raises the signal), and it is always finite for
// passive ports. Precondition: t is valid, f > 0,
// source and load have resistance 0–1e9 Ω and reactance within ±1e9 Ω,
// and their total resistance is > 0; otherwise InsertionLossDB panics
// with a "receiver: " message.
//
// Reference: methods.md §9.3–9.4 [D] (standard circuit theory), complex
// forms derived here.
func (t Trap) InsertionLossDB(f KHz, source, load complex128) float64 {
	t.mustEval("InsertionLossDB", f, source, load, true)
	return t.lossDB(f, source, load)
}

// lossDB evaluates InsertionLossDB without checks. It clears the
// fractions of the doc comment's forms so that no complex division is
// needed (the denominators are never 0: Re Z_T > 0 and Re(Z_S + Z_L) > 0):
//
//	shunt:  |V₀/V|² = |Z_T(Z_S + Z_L) + Z_S Z_L|² / (|Z_T|² |Z_S + Z_L|²)
//	series: |V₀/V|² = |(Z_S + Z_L)(Z_l + Z_c) + Z_l Z_c|² / (|Z_S + Z_L|² |Z_l + Z_c|²)
//
// with Z_l = r + jωL and Z_c = 1/(jωC) (so Z_T = Z_l Z_c/(Z_l + Z_c)).
func (t Trap) lossDB(f KHz, source, load complex128) float64 {
	w := omega(f)
	zl := complex(t.reactanceOhm()/t.QUnloaded, w*t.InductanceUH*1e-6)
	zc := complex(0, -1/(w*t.CapacitancePF*1e-12))
	sum := source + load
	var num, den float64
	if t.Kind == SeriesShuntTrap {
		zt := zl + zc
		num = trapNorm(zt*sum + source*load)
		den = trapNorm(zt) * trapNorm(sum)
	} else {
		s := zl + zc
		num = trapNorm(sum*s + zl*zc)
		den = trapNorm(sum) * trapNorm(s)
	}
	return 10 * math.Log10(num/den)
}

// trapNorm returns |z|².
func trapNorm(z complex128) float64 { return real(z)*real(z) + imag(z)*imag(z) }

// NotchDepthDB returns the insertion loss in dB at the trap's resonant
// frequency f₀ (ResonantKHz). For resistive source and load:
//
//	series-shunt:     IL₀ = 20 log₁₀(1 + Q_u R_par / X₀)        (exact)
//	parallel-series:  IL₀ = 20 log₁₀ |1 + (Q_u − j) X₀/(R_S + R_L)|
//	                      ≈ 20 log₁₀(1 + Q_u X₀/(R_S + R_L))  (within 4.4/Q_u² dB)
//
// Preconditions as for InsertionLossDB.
//
// Reference: methods.md §9.3–9.4 [D].
func (t Trap) NotchDepthDB(source, load complex128) float64 {
	f0 := t.ResonantKHz()
	t.mustEval("NotchDepthDB", f0, source, load, true)
	return t.lossDB(f0, source, load)
}

// NotchWidthKHz returns the width in kHz of the band around the trap's
// resonance f₀ in which the insertion loss exceeds depthDB: the distance
// between the nearest frequencies below and above f₀ at which the loss
// equals depthDB, each found by stepping out from f₀ in steps growing by
// 50 % from a relative 0.1/Q_u and then bisecting (to 1 part in 1e13). It
// is 0 if the loss at f₀ does not exceed depthDB; if the loss stays
// above depthDB down to 1e-9 f₀ the lower edge is taken as 0 kHz. For a
// series-shunt trap between resistances the edges are where
// |X_T| = X₀|f/f₀ − f₀/f| satisfies
//
//	X_T² = (k (r + R_par)² − r²) / (1 − k),  k = 10^(−depthDB/10)
//	width = f₀ |X_T| / X₀
//
// so that at depthDB = 10 log₁₀ 2 (3 dB) the width is
// f₀ √((r + R_par)² − 2r²)/X₀ ≈ f₀/Q_T with Q_T = X₀/(r + R_par). That
// width falls as Q_u rises only while the notch is deeper than
// 20 log₁₀ 2 dB (r < R_par); the width at a level near the notch depth
// grows with Q_u.
// Preconditions as for InsertionLossDB, and depthDB > 0 and finite;
// otherwise NotchWidthKHz panics with a "receiver: " message.
//
// Reference: methods.md §9.3 (width ∝ f₀/Q_T) [D]; closed form derived
// here from the §9.3 loss.
func (t Trap) NotchWidthKHz(source, load complex128, depthDB float64) float64 {
	f0 := t.ResonantKHz()
	t.mustEval("NotchWidthKHz", f0, source, load, true)
	if !(depthDB > 0 && depthDB <= math.MaxFloat64) {
		panic("receiver: Trap.NotchWidthKHz: " +
			inputErr("notch depth", depthDB, "dB", "> 0 and finite").Error())
	}
	if t.lossDB(f0, source, load) <= depthDB {
		return 0
	}
	// g(s) > 0 inside the band; s is the relative offset, f = f₀(1+s)
	// above and f₀/(1+s) below.
	edge := func(up bool) float64 {
		at := func(s float64) KHz {
			if up {
				return f0 * KHz(1+s)
			}
			return f0 / KHz(1+s)
		}
		g := func(s float64) float64 { return t.lossDB(at(s), source, load) - depthDB }
		in, out := 0.0, 0.1/t.QUnloaded
		for g(out) > 0 {
			in = out
			out *= 1.5
			if out > 1e9 {
				if up {
					// Not reached: the loss tends to 0 dB as f → ∞ for both kinds.
					return float64(at(out))
				}
				return 0
			}
		}
		s := trapBisect(g, in, out)
		return float64(at(s))
	}
	return edge(true) - edge(false)
}

// trapBisect returns the root of g between a and b (g(a) > 0 ≥ g(b)),
// to a relative 1e-13 of b − a's scale.
func trapBisect(g func(float64) float64, a, b float64) float64 {
	for i := 0; i < 200 && b-a > 1e-13*math.Max(math.Abs(a), math.Abs(b)); i++ {
		m := 0.5 * (a + b)
		if g(m) > 0 {
			a = m
		} else {
			b = m
		}
	}
	return 0.5 * (a + b)
}

// TrapAdvice is AdviseTrap's answer.
type TrapAdvice struct {
	Trap         Trap    // the trap built from the part to hand, tuned to the unwanted station
	NotchDB      float64 // its insertion loss at the unwanted frequency, dB
	WantedLossDB float64 // its insertion loss at the wanted frequency, dB
	Fixes        bool    // NotchDB ≥ the need and WantedLossDB ≤ 3 dB
	Reason       string  // one plain sentence
}

// AdviseTrap designs a trap of the given kind at the unwanted frequency
// from the part to hand (exactly one of inductanceUH, capacitancePF; see
// DesignTrap) and says whether it rids the set of the unwanted station
// without losing the wanted one, between a source of impedance source and
// a load of impedance load (ohms):
//
//	NotchDB      = IL(f_unwanted)
//	WantedLossDB = IL(f_wanted)
//	Fixes        = NotchDB ≥ needDB  and  WantedLossDB ≤ 3 dB
//
// with IL as in InsertionLossDB. The 3 dB limit on the wanted station's
// loss is a choice made here (half its power), not a published limit.
// When the trap does not fix the problem, AdviseTrap searches traps of
// the same kind and Q with realizable parts (L 0.1–10000 µH,
// C 1–10000 pF at the unwanted frequency; 121 steps of X₀ on a log scale,
// refined by bisection) and the Reason says whether a different L and C
// would do (and which), whether the trap is too close in frequency (any
// trap deep enough also takes more than 3 dB off the wanted station), or
// whether no trap of that Q is deep enough. For a single resonator
// between resistances the loss at the wanted frequency of a trap of
// notch depth A (as a voltage ratio) is
//
//	IL_w = 10 log₁₀((A² + (Q_u δ)²) / (1 + (Q_u δ)²)),  δ = f_w/f₀ − f₀/f_w
//
// whatever L, C and the resistances (exact for the series-shunt trap,
// near resonance for the parallel one), so a trap that must take A off
// f₀ keeps the wanted loss within 3 dB only if |δ| ≳ √(A² − 2)/Q_u: about
// 2Δf/f₀ ≥ 10/Q_u for 20 dB.
//
// Errors name the field: "unwanted frequency", "wanted frequency"
// (1–100000 kHz, different from each other), "needed attenuation"
// (> 0 and ≤ 100 dB), "source resistance", "load resistance" (0–1e9 Ω),
// "source reactance", "load reactance" (±1e9 Ω), "source + load
// resistance" (> 0), and those of DesignTrap.
//
// Reference: methods.md §9.3–9.4 [D]; the closed form for IL_w is
// derived here from them.
func AdviseTrap(kind TrapKind, unwanted, wanted KHz, needDB float64, source, load complex128,
	inductanceUH, capacitancePF, qUnloaded float64) (TrapAdvice, error) {
	if err := trapCheckKHz("unwanted frequency", unwanted); err != nil {
		return TrapAdvice{}, err
	}
	if err := trapCheckKHz("wanted frequency", wanted); err != nil {
		return TrapAdvice{}, err
	}
	if wanted == unwanted {
		return TrapAdvice{}, inputErr("wanted frequency", float64(wanted), "",
			fmt.Sprintf("different from the unwanted frequency (%g kHz)", float64(unwanted)))
	}
	if !(needDB > 0 && needDB <= 100) {
		return TrapAdvice{}, inputErr("needed attenuation", needDB, "dB", "> 0 and <= 100")
	}
	if err := trapCheckPorts(source, load); err != nil {
		return TrapAdvice{}, err
	}
	t, err := DesignTrap(kind, unwanted, inductanceUH, capacitancePF, qUnloaded)
	if err != nil {
		return TrapAdvice{}, err
	}
	a := TrapAdvice{
		Trap:         t,
		NotchDB:      t.lossDB(unwanted, source, load),
		WantedLossDB: t.lossDB(wanted, source, load),
	}
	a.Fixes = a.NotchDB >= needDB && a.WantedLossDB <= trapMaxWantedLossDB
	fu, fw := float64(unwanted), float64(wanted)
	if a.Fixes {
		a.Reason = fmt.Sprintf("fixes it: the trap takes %s dB off %g kHz and only %s dB off %g kHz",
			trapFmtDB(a.NotchDB), fu, trapFmtDB(a.WantedLossDB), fw)
		return a, nil
	}
	s := trapSearch(kind, unwanted, wanted, needDB, source, load, qUnloaded)
	switch {
	case !s.deepEnough:
		a.Reason = fmt.Sprintf("not deep enough: even the best %v trap with a Q of %g takes only %s dB off %g kHz, where %s dB is needed",
			kind, qUnloaded, trapFmtDB(s.maxDepthDB), fu, trapFmtDB(needDB))
	case !s.feasible:
		a.Reason = fmt.Sprintf("too close in frequency: a trap deep enough at %g kHz also takes %s dB off %g kHz",
			fu, trapFmtDB(s.leastWantedLossDB), fw)
	case a.NotchDB < needDB:
		a.Reason = fmt.Sprintf("not deep enough: this trap takes only %s dB off %g kHz, where %s dB is needed; %s would take %s dB and cost %g kHz only %s dB",
			trapFmtDB(a.NotchDB), fu, trapFmtDB(needDB), trapFmtParts(s.better), trapFmtDB(s.betterNotchDB), fw, trapFmtDB(s.betterWantedDB))
	default:
		a.Reason = fmt.Sprintf("too wide: this trap also takes %s dB off %g kHz; %s would take %s dB off %g kHz and only %s dB off %g kHz",
			trapFmtDB(a.WantedLossDB), fw, trapFmtParts(s.better), trapFmtDB(s.betterNotchDB), fu, trapFmtDB(s.betterWantedDB), fw)
	}
	return a, nil
}

// trapSearchResult describes the realizable traps of one kind and Q.
type trapSearchResult struct {
	maxDepthDB float64 // deepest notch at f_unwanted of any realizable trap
	// deepEnough: some trap reaches the need; leastWantedLossDB is the
	// least loss at f_wanted among those that do.
	deepEnough        bool
	leastWantedLossDB float64
	// feasible: some trap reaches the need and keeps the wanted loss
	// ≤ 3 dB; better is the one in the (log) middle of that range.
	feasible                      bool
	better                        Trap
	betterNotchDB, betterWantedDB float64
}

// trapSearchSteps is the number of grid points over the realizable range
// of X₀ (about 3.6 decades at 1 MHz, so about 0.03 decade a step).
const trapSearchSteps = 121

// trapSearch scans traps of one kind and Q tuned to unwanted over the
// realizable range of X₀ = ωL = 1/(ωC).
func trapSearch(kind TrapKind, unwanted, wanted KHz, needDB float64, source, load complex128, q float64) trapSearchResult {
	w := omega(unwanted)
	lo := math.Max(w*trapMinUH*1e-6, 1/(w*trapMaxPF*1e-12)) * (1 + 1e-9)
	hi := math.Min(w*trapMaxUH*1e-6, 1/(w*trapMinPF*1e-12)) * (1 - 1e-9)
	at := func(lnX float64) Trap { return trapFromReactance(kind, unwanted, math.Exp(lnX), q) }
	depth := func(lnX float64) float64 { return at(lnX).lossDB(unwanted, source, load) }
	wantedLoss := func(lnX float64) float64 { return at(lnX).lossDB(wanted, source, load) }
	ok := func(lnX float64) bool { return depth(lnX) >= needDB && wantedLoss(lnX) <= trapMaxWantedLossDB }

	var r trapSearchResult
	r.maxDepthDB = math.Inf(-1)
	lnLo, lnHi := math.Log(lo), math.Log(hi)
	n := trapSearchSteps
	if hi <= lo { // cannot happen for a frequency DesignTrap accepted
		n = 1
	}
	var x, d, wl [trapSearchSteps]float64
	var good [trapSearchSteps]bool
	for i := range n {
		x[i] = lnLo
		if n > 1 {
			x[i] = lnLo + (lnHi-lnLo)*float64(i)/float64(n-1)
		}
		d[i], wl[i] = depth(x[i]), wantedLoss(x[i])
		r.maxDepthDB = math.Max(r.maxDepthDB, d[i])
		good[i] = d[i] >= needDB && wl[i] <= trapMaxWantedLossDB
	}
	// The least wanted loss among traps deep enough: at a grid point, or
	// where the depth just reaches the need between two grid points.
	r.leastWantedLossDB = math.Inf(1)
	consider := func(wantedDB float64) {
		r.deepEnough = true
		r.leastWantedLossDB = math.Min(r.leastWantedLossDB, wantedDB)
	}
	for i := range n {
		if d[i] >= needDB {
			consider(wl[i])
		}
		if i > 0 && (d[i-1] >= needDB) != (d[i] >= needDB) {
			in, out := x[i-1], x[i]
			if d[i] >= needDB {
				in, out = out, in
			}
			consider(wantedLoss(trapBisectX(func(lnX float64) bool { return depth(lnX) >= needDB }, in, out)))
		}
	}
	// The longest run of grid points that fix it, its edges refined.
	bestStart, bestLen := -1, 0
	for i := 0; i < n; {
		if !good[i] {
			i++
			continue
		}
		j := i
		for j < n && good[j] {
			j++
		}
		if j-i > bestLen {
			bestStart, bestLen = i, j-i
		}
		i = j
	}
	if bestLen == 0 {
		return r
	}
	a, b := x[bestStart], x[bestStart+bestLen-1]
	if bestStart > 0 {
		a = trapBisectX(ok, a, x[bestStart-1])
	}
	if end := bestStart + bestLen; end < n {
		b = trapBisectX(ok, b, x[end])
	}
	r.feasible = true
	mid := 0.5 * (a + b)
	r.better = at(mid)
	r.betterNotchDB = depth(mid)
	r.betterWantedDB = wantedLoss(mid)
	return r
}

// trapBisectX returns the point where pred changes from true (at in) to
// false (at out), to a relative 1e-6 in ln X₀, the last point where it
// holds.
func trapBisectX(pred func(float64) bool, in, out float64) float64 {
	for i := 0; i < 60 && math.Abs(out-in) > 1e-6; i++ {
		m := 0.5 * (in + out)
		if pred(m) {
			in = m
		} else {
			out = m
		}
	}
	return in
}

// trapFmtDB formats a loss in dB: one decimal below 10 dB, none above.
func trapFmtDB(db float64) string {
	if math.Abs(db) < 9.95 {
		return strconv.FormatFloat(db, 'f', 1, 64)
	}
	return strconv.FormatFloat(db, 'f', 0, 64)
}

// trapFmtParts names a trap's parts to two significant figures, e.g.
// "a 48 µH coil with 530 pF".
func trapFmtParts(t Trap) string {
	return "a " + trapFmt2(t.InductanceUH) + " µH coil with " + trapFmt2(t.CapacitancePF) + " pF"
}

// trapFmt2 formats a positive value to two significant figures without
// an exponent.
func trapFmt2(v float64) string {
	e := int(math.Floor(math.Log10(v)))
	p := math.Pow(10, float64(e-1))
	v = math.Round(v/p) * p
	if math.Floor(math.Log10(v)) > float64(e) { // rounding carried, e.g. 99.6 → 100
		e++
	}
	return strconv.FormatFloat(v, 'f', max(0, 1-e), 64)
}
