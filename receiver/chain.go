package receiver

import (
	"fmt"
	"math"

	"earshot/propagation"
)

// Defaults of a rig where the listener does not say.
const (
	// DefaultModulation is the AM modulation depth assumed for programme:
	// 30 %, the usual figure for average programme modulation (common
	// practice).
	DefaultModulation = 0.3
	// RequiredSNRDB is the audio signal-to-noise ratio for speech to be
	// just intelligible: 10 dB (methods.md §4.3, from memory; "good"
	// reception needs 26–30 dB).
	RequiredSNRDB = 10.0
	// UsableProtectionDB is the co-channel protection ratio for usable
	// reception: 26 dB, as used by the Region 2 (Rio de Janeiro 1981) plan
	// (Rec. ITU-R BS.560-4 Note 2; "excellent" quality needs 40 dB).
	UsableProtectionDB = 26.0
	// DefaultLoadingQ is the Q assumed for a loading coil (common practice:
	// single-layer coils on plastic or card forms reach 100–300 at MF).
	DefaultLoadingQ = 150.0
)

// Rig is everything between the air and the ear.
type Rig struct {
	Antenna Antenna
	// LoadingQ is the Q of the loading coil (DefaultLoadingQ if 0), used
	// when no loading-coil form is given.
	LoadingQ float64
	// LoadingFormMm and LoadingAWG, when set, design the loading coil at
	// each frequency (close-wound turns, and its Q from the wire).
	LoadingFormMm float64
	LoadingAWG    int
	// Tank is the tuned circuit; its taps are chosen by BestTaps at each
	// frequency when AutoTaps is true. When TankCoil is set, its Q at each
	// frequency replaces Tank.QUnloaded.
	Tank     TunedCircuit
	TankCoil *Coil
	AutoTaps bool
	// AutoDetectorTap chooses only the detector tap, matched to the tank
	// as the given antenna tap (or loose coupling) loads it.
	AutoDetectorTap bool
	// The tank's variable capacitor (pF), for the tuning-range check; all
	// zero means unchecked.
	CapMinPF, CapMaxPF, StrayPF float64
	Diode                       Diode
	Phones                      Phones
	Amp                         Amplifier
	Noise                       NoiseEnv
	// Modulation is the AM depth (DefaultModulation if 0).
	Modulation float64
}

// Validate checks every part of the rig, naming the part at fault.
func (r Rig) Validate() error {
	if err := r.Antenna.Validate(); err != nil {
		return err
	}
	if r.LoadingQ != 0 && (!finite(r.LoadingQ) || r.LoadingQ < 5 || r.LoadingQ > 2000) {
		return inputErr("loading coil Q", r.LoadingQ, "", "between 5 and 2000")
	}
	tc := r.Tank
	if r.AutoTaps {
		tc.AntennaTap, tc.DetectorTap = 1, 1
	}
	if r.AutoDetectorTap {
		tc.DetectorTap = 1
	}
	if r.TankCoil != nil {
		if err := r.TankCoil.Validate(); err != nil {
			return err
		}
		tc.QUnloaded = 100 // checked per frequency
	}
	if err := tc.Validate(); err != nil {
		return err
	}
	if err := r.Diode.Validate(); err != nil {
		return err
	}
	if err := r.Phones.Validate(); err != nil {
		return err
	}
	if err := r.Amp.Validate(); err != nil {
		return err
	}
	if m := r.Modulation; m != 0 && (!finite(m) || m <= 0 || m > 1) {
		return inputErr("modulation", m, "", "> 0 and <= 1")
	}
	return nil
}

func (r Rig) modulation() float64 {
	if r.Modulation == 0 {
		return DefaultModulation
	}
	return r.Modulation
}

func (r Rig) loadingQ() float64 {
	if r.LoadingQ == 0 {
		return DefaultLoadingQ
	}
	return r.LoadingQ
}

// audioLoadOhm is the detector's audio (DC) load: the amplifier's input
// or the phones.
func (r Rig) audioLoadOhm() float64 {
	if r.Amp.GainDB > 0 {
		return r.Amp.InputOhm
	}
	return r.Phones.LoadOhm
}

// Front is the linear part of the chain at one frequency: antenna,
// loading, tuned circuit, and the source the detector sees.
type Front struct {
	KHz             KHz
	HeffM           float64 // effective height, m
	RradOhm         float64 // radiation resistance
	RlossOhm        float64 // ground + wire + loading-coil loss
	XOhm            float64 // antenna reactance before loading
	LoadingUH       float64 // series inductance to resonate (< 0: inductive wire, needs a series capacitor)
	LoadingTurns    float64 // close-wound turns of the loading coil, when its form is given
	LoadingQ        float64 // the loading coil's Q
	SeriesPF        float64 // the series capacitor when LoadingUH < 0, else 0
	TankQ           float64 // the tank coil's unloaded Q at f
	Tunable         bool    // the tank's capacitor reaches f (always true when unchecked)
	SourceOhm       float64 // resonated antenna circuit resistance R_s
	AntennaQ        float64 // loaded Q of the antenna circuit
	Tank            Tank
	AntennaTap      float64
	DetectorTap     float64
	DetectorWeakOhm float64 // detector's RF input resistance at weak signals
}

// front computes the linear part of the chain at f.
func (r Rig) front(f KHz) (Front, error) {
	a := r.Antenna
	z := a.Impedance(f)
	fr := Front{KHz: f, HeffM: a.EffectiveHeightM(f), RradOhm: a.RadiationResistanceOhm(f), XOhm: imag(z)}
	fr.LoadingUH = a.LoadingUH(f)
	coilLoss := 0.0
	if fr.LoadingUH > 0 {
		fr.LoadingQ = r.loadingQ()
		if r.LoadingFormMm > 0 {
			c, err := CoilForInductance(r.LoadingFormMm, r.LoadingAWG, fr.LoadingUH)
			if err != nil {
				// Not a bad input of the listener's: this wire cannot be
				// brought into tune here (near half a wavelength its
				// reactance is beyond any practical coil).
				return Front{}, fmt.Errorf("receiver: at %g kHz this antenna would need a %.0f µH loading coil, more than a close-wound AWG %d coil on the %g mm loading form can give",
					float64(f), fr.LoadingUH, r.LoadingAWG, r.LoadingFormMm)
			}
			fr.LoadingTurns, fr.LoadingQ = c.Turns, c.Q(f)
		}
		coilLoss = omega(f) * fr.LoadingUH * 1e-6 / fr.LoadingQ
	} else {
		fr.SeriesPF = a.SeriesCapacitancePF(f)
	}
	fr.RlossOhm = real(z) - fr.RradOhm + coilLoss
	fr.SourceOhm = real(z) + coilLoss
	det, err := r.Diode.InputResistanceOhm(1e-5, r.audioLoadOhm())
	if err != nil {
		return Front{}, err
	}
	fr.DetectorWeakOhm = det
	tc := r.Tank
	if r.TankCoil != nil {
		tc.QUnloaded = r.TankCoil.Q(f)
		tc.InductanceUH = r.TankCoil.InductanceUH()
	}
	fr.TankQ = tc.QUnloaded
	fr.Tunable = true
	if r.CapMaxPF > 0 {
		tr, err := TuningRangeFor(tc.InductanceUH, r.CapMinPF, r.CapMaxPF, r.StrayPF)
		if err != nil {
			return Front{}, err
		}
		fr.Tunable = tr.Covers(f, f)
	}
	switch {
	case r.AutoTaps:
		tc.AntennaTap, tc.DetectorTap = BestTaps(f, tc.InductanceUH, tc.QUnloaded, fr.SourceOhm, det)
	case r.AutoDetectorTap:
		rp := tc.QUnloaded * omega(f) * tc.InductanceUH * 1e-6
		tc.DetectorTap = math.Min(1, math.Sqrt(det/par(rp, fr.SourceOhm/(tc.AntennaTap*tc.AntennaTap))))
	}
	fr.AntennaTap, fr.DetectorTap = tc.AntennaTap, tc.DetectorTap
	fr.Tank = tc.Solve(f, fr.SourceOhm, det)
	// The antenna circuit is a series-resonant loop: its reactance at
	// resonance is |X| on each side, loaded by its own resistance and by
	// the tank reflected through the antenna tap.
	reflected := tc.AntennaTap * tc.AntennaTap * par(fr.Tank.DynamicOhm, det/(tc.DetectorTap*tc.DetectorTap))
	fr.AntennaQ = math.Abs(fr.XOhm) / (fr.SourceOhm + reflected)
	return fr, nil
}

// SelectivityDB returns the rig's response (dB, ≤ 0) at f when tuned to
// fr.KHz: the loaded tank times the antenna circuit's own resonance
// (methods.md §9.1 for each).
func (fr Front) SelectivityDB(f KHz) float64 {
	return ResponseDB(fr.KHz, f, fr.Tank.LoadedQ) + ResponseDB(fr.KHz, f, fr.AntennaQ)
}

// Reception is the whole chain for one carrier.
type Reception struct {
	Front
	FieldDBuVm    float64 // carrier field at the antenna
	VocUV         float64 // open-circuit antenna voltage, µV rms
	AvailablePW   float64 // available power, pW
	DetectorMV    float64 // RF carrier at the detector, mV peak
	DetectorInOhm float64 // detector RF input resistance at that level
	DCV           float64 // rectified DC at the detector load, V
	AudioMV       float64 // audio at the phones (after any amplifier), mV rms
	SPL           float64 // sound pressure level of the modulation, dB SPL
	MarginDB      float64 // SPL − AudibleSPL
	NoiseDBuVm    float64 // man-made noise field in the set's noise bandwidth
	SNRDB         float64 // audio signal-to-noise ratio (external noise, amplifier noise)
	Audible       bool
	Limit         string // what stops reception when not audible: "tuning", "hearing", "noise"
}

// Receive follows a carrier of fieldDBuVm at f through the rig.
//
// Antenna: V_oc = E·h_e (methods.md §1.10, §6.1). Loading: the series
// inductance (or capacitance) that resonates the antenna, with the coil's
// loss. Tuned circuit: Tank.Solve with the detector's level-dependent RF
// input resistance, solved self-consistently by bisection on the detector
// voltage. Detector: Diode.AudioPeakV into the audio load. Phones: SPL from
// the voltage sensitivity; margin against AudibleSPL (threshold of hearing
// with earphones + listening allowance, methods.md §8.1). Noise: P.372
// man-made noise in the set's noise bandwidth (the tuned circuit's, at most
// the audio band on both sides of the carrier), audio S/N of an envelope
// detector above threshold, S/N = C/N + 20·log10(m) (m²·C/N; e.g.
// S. Haykin, Communication Systems, AM noise performance, from memory).
func (r Rig) Receive(f KHz, fieldDBuVm float64) (Reception, error) {
	if !finite(fieldDBuVm) || fieldDBuVm < -100 || fieldDBuVm > 200 {
		return Reception{}, inputErr("field", fieldDBuVm, "dB(µV/m)", "between -100 and 200")
	}
	if err := r.Antenna.validateAt(f); err != nil {
		return Reception{}, err
	}
	fr, err := r.front(f)
	if err != nil {
		return Reception{}, err
	}
	return r.receive(fr, fieldDBuVm)
}

func (r Rig) receive(fr Front, fieldDBuVm float64) (Reception, error) {
	rc := Reception{Front: fr, FieldDBuVm: fieldDBuVm}
	e := propagation.MicroVoltsPerMetre(fieldDBuVm) * 1e-6 // V/m rms
	voc := e * fr.HeffM                                    // V rms
	rc.VocUV = voc * 1e6
	rc.AvailablePW = voc * voc / (4 * fr.SourceOhm) * 1e12
	vth := math.Sqrt2 * voc * fr.Tank.TheveninV // peak
	rth := fr.Tank.TheveninOhm
	if vth > 100 {
		return Reception{}, fmt.Errorf("receiver: a field of %g dB(µV/m) drives the detector beyond the 100 V its model covers", fieldDBuVm)
	}
	load := r.audioLoadOhm()
	// Self-consistent detector voltage: v = vth·R_in(v)/(rth + R_in(v)).
	// The map is increasing in v (R_in rises with level), so iterating from
	// the weak-signal value climbs monotonically to the root; where that is
	// slow (strong signals) the root is bracketed between the last iterate
	// and vth and found by the Illinois variant of regula falsi (Dowell &
	// Jarratt 1971, BIT 11, 168–174: superlinear, never leaves the bracket).
	step := func(v float64) (float64, error) {
		rin, err := r.Diode.InputResistanceOhm(math.Max(v, 1e-9), load)
		if err != nil {
			return 0, err
		}
		return vth * rin / (rth + rin), nil
	}
	vdet := vth * fr.DetectorWeakOhm / (rth + fr.DetectorWeakOhm)
	converged := false
	for range 4 {
		next, err := step(vdet)
		if err != nil {
			return Reception{}, err
		}
		if math.Abs(next-vdet) <= 1e-7*vdet {
			vdet, converged = next, true
			break
		}
		vdet = next
	}
	if !converged {
		var err error
		if vdet, err = solveDetector(step, vdet, vth); err != nil {
			return Reception{}, err
		}
	}
	rc.DetectorMV = vdet * 1e3
	var err error
	if rc.DetectorInOhm, err = r.Diode.InputResistanceOhm(math.Max(vdet, 1e-9), load); err != nil {
		return Reception{}, err
	}
	if rc.DCV, err = r.Diode.RectifiedV(math.Max(vdet, 1e-9), load); err != nil {
		return Reception{}, err
	}
	va, err := r.Diode.AudioPeakV(math.Max(vdet, 1e-9), r.modulation(), load)
	if err != nil {
		return Reception{}, err
	}
	vrms := va / math.Sqrt2
	ampSNR := math.Inf(1)
	if r.Amp.GainDB > 0 {
		if r.Amp.NoiseUV > 0 {
			ampSNR = 20 * math.Log10(vrms/(r.Amp.NoiseUV*1e-6))
		}
		vrms *= math.Pow(10, r.Amp.GainDB/20)
	}
	rc.AudioMV = vrms * 1e3
	rc.SPL = r.Phones.SPL(vrms)
	rc.MarginDB = rc.SPL - AudibleSPL
	bw := math.Min(math.Pi/2*fr.Tank.BandwidthKHz*1e3, 2*AudioBandwidthHz)
	rc.NoiseDBuVm = r.Noise.NoiseFieldDBuVm(fr.KHz, bw)
	rc.SNRDB = math.Min(fieldDBuVm-rc.NoiseDBuVm+20*math.Log10(r.modulation()), ampSNR)
	switch {
	case !fr.Tunable:
		rc.Limit = "tuning"
	case rc.MarginDB < 0:
		rc.Limit = "hearing"
	case rc.SNRDB < RequiredSNRDB:
		rc.Limit = "noise"
	default:
		rc.Audible = true
	}
	if !finite(rc.MarginDB) && !math.IsInf(rc.MarginDB, -1) {
		return Reception{}, fmt.Errorf("receiver: chain result is not finite at %g kHz", float64(fr.KHz))
	}
	return rc, nil
}

// MinAudibleDBuVm returns the weakest carrier field (dB(µV/m)) at f that
// this rig makes audible — margin ≥ 0 and S/N ≥ RequiredSNRDB — found by
// bisection through the whole chain (audibility rises monotonically with
// the field). This is the rig's sensitivity at f.
func (r Rig) MinAudibleDBuVm(f KHz) (float64, error) {
	// From far below any audible signal to 100 dB(µV/m) (0.1 V/m: a few
	// km from a powerful transmitter).
	return r.MinAudibleWithin(f, -40, 100)
}

// MinAudibleWithin is MinAudibleDBuVm searched between loDBuVm and
// hiDBuVm: it errs when nothing is audible at hiDBuVm, and returns
// loDBuVm when that is already audible. A caller that knows a narrow
// bracket (a table of the chain) saves most of the work: each halving
// costs one pass through the chain, and strong fields are the slowest.
func (r Rig) MinAudibleWithin(f KHz, loDBuVm, hiDBuVm float64) (float64, error) {
	if err := r.Antenna.validateAt(f); err != nil {
		return 0, err
	}
	fr, err := r.front(f)
	if err != nil {
		return 0, err
	}
	lo, hi := loDBuVm, hiDBuVm
	rc, err := r.receive(fr, hi)
	if err != nil {
		return 0, err
	}
	if !rc.Audible {
		return 0, fmt.Errorf("receiver: nothing is audible at %g kHz even at %g dB(µV/m) (limited by %s)", float64(f), hi, rc.Limit)
	}
	for hi-lo > 0.01 {
		mid := (lo + hi) / 2
		rc, err := r.receive(fr, mid)
		if err != nil {
			return 0, err
		}
		if rc.Audible {
			hi = mid
		} else {
			lo = mid
		}
	}
	return hi, nil
}

// solveDetector finds v in [lo, hi] with step(v) = v, given step(lo) ≥ lo
// and step(hi) < hi, by the Illinois method to a relative 1e-9 (over the
// whole range [0, hi] should the bracket not hold).
func solveDetector(step func(float64) (float64, error), lo, hi float64) (float64, error) {
	g := func(v float64) (float64, error) {
		s, err := step(v)
		return s - v, err
	}
	glo, err := g(lo)
	if err != nil {
		return 0, err
	}
	ghi, err := g(hi)
	if err != nil {
		return 0, err
	}
	if glo < 0 || ghi > 0 { // not a bracket: fall back to the whole range
		lo = 1e-12 * hi
		if glo, err = g(lo); err != nil {
			return 0, err
		}
	}
	return illinoisRoot(g, lo, hi, glo, ghi, 1e-9*hi, 1e-12*hi)
}
