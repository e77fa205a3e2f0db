package receiver

import (
	"fmt"
	"math"
)

// RigSpec is a rig described in the listener's own terms, as the command
// line and the app take it. Build turns it into a Rig, checking each
// field.
type RigSpec struct {
	Kind         string  // "inverted-l", "t" or "vertical"
	WireM        float64 // horizontal top, m (0 for a vertical)
	HeightM      float64 // height of the top, m
	DownleadM    float64 // down-lead, m (0: equal to the height)
	WireMm       float64 // wire diameter, mm (0: from WireAWG)
	WireAWG      int     // wire gauge when WireMm is 0
	GroundSystem string  // name of a ground system class
	GroundOhm    float64 // a measured ground loss instead, Ω (0: use the class)

	LoadingFormMm float64 // loading-coil form diameter, mm
	LoadingAWG    int     // loading-coil wire gauge

	TankUH     float64 // tuned-circuit inductance, µH
	TankFormMm float64 // its form diameter, mm
	TankAWG    int     // its wire gauge
	CapMinPF   float64 // variable capacitor, minimum, pF
	CapMaxPF   float64 // variable capacitor, maximum, pF
	StrayPF    float64 // stray capacitance across the tank, pF

	Diode      string  // diode preset name
	Phones     string  // phones preset name
	AmpDB      float64 // amplifier voltage gain, dB (0: none)
	AmpOhm     float64 // amplifier input resistance, Ω
	AmpNoiseUV float64 // amplifier equivalent input noise, µV rms
	Noise      string  // man-made noise environment name
	// AntennaTap and DetectorTap fix the taps (fractions of the tank
	// winding); 0 chooses them for weak signals (BestTaps).
	AntennaTap, DetectorTap float64
	// CouplingK and PrimaryUH describe a loosely coupled antenna coil
	// (coefficient k, primary inductance) instead of an antenna tap.
	CouplingK, PrimaryUH float64
	Modulation           float64 // AM depth, 0–1 (0: DefaultModulation)
}

// DefaultRigSpec is a typical outdoor crystal set: 40 m of 1.6 mm wire
// 10 m up with a 10 m down-lead, a ground rod in average soil, a
// germanium diode and high-impedance magnetic phones, in a rural
// location (common practice for the hobby).
func DefaultRigSpec() RigSpec {
	return RigSpec{
		Kind: "inverted-l", WireM: 40, HeightM: 10, DownleadM: 10, WireMm: 1.6,
		GroundSystem:  "rod-average",
		LoadingFormMm: 25, LoadingAWG: 24,
		TankUH: 240, TankFormMm: 60, TankAWG: 24, CapMinPF: 10, CapMaxPF: 365, StrayPF: 20,
		Diode: "germanium", Phones: "magnetic-2000",
		AmpOhm: 10000, AmpNoiseUV: 1,
		Noise: "rural",
	}
}

// Build checks the spec and returns the rig.
func (s RigSpec) Build() (Rig, error) {
	kind, err := ParseAntennaKind(s.Kind)
	if err != nil {
		return Rig{}, err
	}
	wireMm := s.WireMm
	if wireMm == 0 {
		if wireMm, err = AWGDiameterMm(s.WireAWG); err != nil {
			return Rig{}, err
		}
	}
	gs, err := GroundSystemByName(s.GroundSystem)
	if err != nil {
		return Rig{}, err
	}
	if s.GroundOhm != 0 {
		gs = GroundSystem{Name: "measured", Description: "measured ground loss", LossOhm: s.GroundOhm, Source: "the listener's measurement"}
	}
	down := s.DownleadM
	if down == 0 {
		down = s.HeightM
	}
	ant := Antenna{Kind: kind, TopM: s.WireM, HeightM: s.HeightM, DownleadM: down, WireDiameterMm: wireMm, Ground: gs}
	if err := ant.Validate(); err != nil {
		return Rig{}, err
	}
	tank, err := CoilForInductance(s.TankFormMm, s.TankAWG, s.TankUH)
	if err != nil {
		return Rig{}, fmt.Errorf("tank coil: %w", err)
	}
	if _, err := TuningRangeFor(s.TankUH, s.CapMinPF, s.CapMaxPF, s.StrayPF); err != nil {
		return Rig{}, err
	}
	if _, err := CoilForInductance(s.LoadingFormMm, s.LoadingAWG, 10); err != nil {
		return Rig{}, fmt.Errorf("loading coil: %w", err)
	}
	d, err := DiodeByName(s.Diode)
	if err != nil {
		return Rig{}, err
	}
	ph, err := PhonesByName(s.Phones)
	if err != nil {
		return Rig{}, err
	}
	nz, err := NoiseEnvByName(s.Noise)
	if err != nil {
		return Rig{}, err
	}
	amp := Amplifier{GainDB: s.AmpDB}
	if s.AmpDB != 0 {
		amp.InputOhm, amp.NoiseUV = s.AmpOhm, s.AmpNoiseUV
	}
	na, nd := s.AntennaTap, s.DetectorTap
	if s.CouplingK != 0 {
		if s.AntennaTap != 0 {
			return Rig{}, fmt.Errorf("receiver: give an antenna tap or a loose coupling, not both")
		}
		if !finite(s.CouplingK) || s.CouplingK <= 0 || s.CouplingK > 1 {
			return Rig{}, inputErr("coupling coefficient", s.CouplingK, "", "> 0 and <= 1")
		}
		if !finite(s.PrimaryUH) || s.PrimaryUH < 1 || s.PrimaryUH > 10000 {
			return Rig{}, inputErr("primary inductance", s.PrimaryUH, "µH", "between 1 and 10000")
		}
		na = math.Min(1, LooseCouplingTap(s.CouplingK, s.PrimaryUH, s.TankUH))
	}
	auto := na == 0 && nd == 0
	autoDet := !auto && nd == 0
	if auto {
		na, nd = 1, 1
	}
	if autoDet {
		nd = 1
	}
	if na == 0 {
		return Rig{}, inputErr("antenna tap", 0, "", "> 0 and <= 1 when the detector tap is given")
	}
	r := Rig{
		Antenna: ant, Tank: TunedCircuit{InductanceUH: s.TankUH, QUnloaded: 100, AntennaTap: na, DetectorTap: nd},
		TankCoil: &tank, AutoTaps: auto, AutoDetectorTap: autoDet, LoadingFormMm: s.LoadingFormMm, LoadingAWG: s.LoadingAWG,
		CapMinPF: s.CapMinPF, CapMaxPF: s.CapMaxPF, StrayPF: s.StrayPF,
		Diode: d, Phones: ph, Amp: amp, Noise: nz, Modulation: s.Modulation,
	}
	return r, r.Validate()
}
