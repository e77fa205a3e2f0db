package receiver

import (
	"math"
)

// TunedCircuit is the crystal set's tuned transformer: a parallel tank
// (coil of inductance InductanceUH and unloaded Q, tuned by a variable
// capacitor) with the antenna circuit coupled into it and the detector on
// a tap. AntennaTap is the effective voltage ratio n_a from the antenna
// circuit into the tank: the tap fraction of an autotransformer (tight
// coupling), or k·√(L₁/L₂) for a separate primary of inductance L₁ loosely
// coupled (coefficient k) to the tank coil L₂ — the two are the same
// transformation for the resonant primary of a two-circuit set.
// DetectorTap is the tap fraction n_d for the detector.
type TunedCircuit struct {
	InductanceUH float64
	QUnloaded    float64
	AntennaTap   float64
	DetectorTap  float64
}

// LooseCouplingTap returns the effective AntennaTap of a primary of
// inductance primaryUH coupled with coefficient k to a tank coil of
// tankUH: n = k·√(L₁/L₂).
//
// Reference: coupled-circuit theory, e.g. F. E. Terman, Radio Engineers'
// Handbook (1943) §3 (reflected impedance (ωM)²/Z₁ with M = k√(L₁L₂)); the
// equivalence is derived in the doc comment of TunedCircuit.
func LooseCouplingTap(k, primaryUH, tankUH float64) float64 {
	return k * math.Sqrt(primaryUH/tankUH)
}

// Validate checks the tuned circuit.
func (tc TunedCircuit) Validate() error {
	if !finite(tc.InductanceUH) || tc.InductanceUH < 1 || tc.InductanceUH > 10000 {
		return inputErr("tank inductance", tc.InductanceUH, "µH", "between 1 and 10000")
	}
	if !finite(tc.QUnloaded) || tc.QUnloaded < 5 || tc.QUnloaded > 2000 {
		return inputErr("tank Q", tc.QUnloaded, "", "between 5 and 2000")
	}
	if !finite(tc.AntennaTap) || tc.AntennaTap <= 0 || tc.AntennaTap > 1 {
		return inputErr("antenna tap", tc.AntennaTap, "", "> 0 and <= 1")
	}
	if !finite(tc.DetectorTap) || tc.DetectorTap <= 0 || tc.DetectorTap > 1 {
		return inputErr("detector tap", tc.DetectorTap, "", "> 0 and <= 1")
	}
	return nil
}

// Tank is the tuned circuit's state at one frequency for given source and
// detector loads.
type Tank struct {
	ReactanceOhm float64 // X₀ = ωL = 1/(ωC)
	TuningPF     float64 // capacitance that tunes the coil to f
	DynamicOhm   float64 // R_p = Q_u·X₀, the unloaded tank's resistance
	LoadedOhm    float64 // R_tot = R_p ‖ R_s/n_a² ‖ R_det/n_d²
	LoadedQ      float64 // Q_L = R_tot / X₀
	BandwidthKHz float64 // −3 dB bandwidth f₀/Q_L
	// TheveninV and TheveninOhm describe the source seen by the detector at
	// its tap, per volt of antenna-circuit e.m.f.: V_det = V_oc·TheveninV·R_det/(TheveninOhm + R_det).
	TheveninV, TheveninOhm float64
}

// Solve returns the tank at frequency f fed from an antenna circuit of
// series resistance srcOhm (resonated, so purely resistive) and loaded by
// a detector of RF input resistance detOhm:
//
//	R_p = Q_u X₀,  R_tot = 1 / (1/R_p + n_a²/R_s + n_d²/R_det)
//	Q_L = R_tot / X₀,  B = f₀ / Q_L
//	V_th = n_d/n_a · R_p / (R_p + R_s/n_a²),  R_th = n_d² · R_p‖(R_s/n_a²)
//
// Reference: methods.md §9.1–9.2 [D] (standard circuit theory; Terman,
// Radio Engineers' Handbook).
func (tc TunedCircuit) Solve(f KHz, srcOhm, detOhm float64) Tank {
	x0 := omega(f) * tc.InductanceUH * 1e-6
	rp := tc.QUnloaded * x0
	na, nd := tc.AntennaTap, tc.DetectorTap
	rsT := srcOhm / (na * na) // source resistance referred to the whole tank
	rpS := par(rp, rsT)
	rtot := par(rpS, detOhm/(nd*nd))
	q := rtot / x0
	return Tank{
		ReactanceOhm: x0,
		TuningPF:     1e12 / (omega(f) * x0),
		DynamicOhm:   rp,
		LoadedOhm:    rtot,
		LoadedQ:      q,
		BandwidthKHz: float64(f) / q,
		TheveninV:    nd / na * rp / (rp + rsT), // = n_d/n_a · R_p‖R_s' / R_s'
		TheveninOhm:  nd * nd * rpS,
	}
}

// par is the parallel combination of two resistances.
func par(a, b float64) float64 {
	if math.IsInf(a, 1) {
		return b
	}
	if math.IsInf(b, 1) {
		return a
	}
	return a * b / (a + b)
}

// ResponseDB returns the relative response (dB, ≤ 0) of a single tuned
// circuit of loaded Q tuned to f0, at f:
//
//	|H| = 1 / √(1 + Q²(f/f₀ − f₀/f)²)
//
// Reference: methods.md §9.1 [D].
func ResponseDB(f0, f KHz, q float64) float64 {
	y := q * (float64(f)/float64(f0) - float64(f0)/float64(f))
	return -10 * math.Log10(1+y*y)
}

// BestTaps returns the taps for weak signals. The detector tap matches
// the detector (weak-signal resistance detOhm: its zero-bias resistance
// as loaded by its audio load) to the tank as the antenna loads it,
// R_det/n_d² = R_p ‖ R_s/n_a², which delivers the most power for a given
// antenna tap. The antenna tap is a compromise: a tighter antenna tap
// always gives the detector more power (less is lost in the coil) but
// loads the tank and broadens it; the classic choice, made here, matches
// the antenna circuit's resistance to the tank's dynamic resistance,
// R_s/n_a² = R_p, which loses 3 dB to the coil and leaves a loaded Q of
// Q_u/4. Taps are capped at 1 (a whole winding).
//
// Reference: methods.md §9.2 (maximum power when the detector matches the
// parallel combination) and §7.3 (the weak-signal rule: match the diode's
// small-signal resistance to the source resistance of the loaded tuned
// circuit).
func BestTaps(f KHz, inductanceUH, qUnloaded, srcOhm, detOhm float64) (antennaTap, detectorTap float64) {
	rp := qUnloaded * omega(f) * inductanceUH * 1e-6
	antennaTap = math.Min(1, math.Sqrt(srcOhm/rp))
	rs := par(rp, srcOhm/(antennaTap*antennaTap))
	detectorTap = math.Min(1, math.Sqrt(detOhm/rs))
	return antennaTap, detectorTap
}
