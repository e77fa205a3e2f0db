package receiver

import (
	"math"
)

// Phones describe the listener's earphones as an audio load with a
// voltage sensitivity, optionally behind a step-down audio transformer.
type Phones struct {
	Name, Description string
	// LoadOhm is the audio load the detector (or amplifier) sees: the
	// phones' impedance at 1 kHz, transformed by the matching transformer
	// if there is one, or the DC return resistor across a piezo earpiece.
	LoadOhm float64
	// SensitivityDBPerV is the SPL (dB re 20 µPa) for 1 V rms at 1 kHz
	// across the load LoadOhm (transformer and its loss included).
	SensitivityDBPerV float64
	// TransformerRatio is the turns ratio of the matching transformer
	// (primary:secondary, > 1 steps down), 0 when there is none.
	TransformerRatio float64
	Source           string
}

// VoltageSensitivity converts a power sensitivity S_mW (dB SPL for 1 mW)
// of a transducer of resistive impedance zOhm into a voltage sensitivity
// (dB SPL for 1 V rms):
//
//	S_V = S_mW + 10·log10(1000 / |Z|)
//
// Reference: shared/reference/methods.md §8.2 [D], verified there on a
// published worked example (104 dB/V at 474 Ω ↔ 100.76 dB/mW).
func VoltageSensitivity(sensDBPerMW, zOhm float64) float64 {
	return sensDBPerMW + 10*math.Log10(1000/zOhm)
}

// throughTransformer returns the phones seen through an ideal step-down
// transformer of turns ratio n (primary:secondary) with a loss lossDB: the
// load is n²·Z and the voltage sensitivity falls by 20·log10(n) + loss.
func throughTransformer(p Phones, n, lossDB float64) Phones {
	p.LoadOhm *= n * n
	p.SensitivityDBPerV -= 20*math.Log10(n) + lossDB
	p.TransformerRatio = n
	return p
}

// phonePresets are typical transducers for passive receivers. None of the
// figures comes from a standard: they are hobbyist and trade data
// (methods.md §8.3, common practice) and are marked as such.
var phonePresets = func() []Phones {
	modern := Phones{Name: "modern-32", Description: "modern 32 Ω dynamic phones (100 dB SPL/mW) through a 10 kΩ:32 Ω audio transformer",
		LoadOhm: 32, SensitivityDBPerV: VoltageSensitivity(100, 32),
		Source: "common practice: 90–110 dB SPL/mW for modern dynamic phones (methods.md §8.3); transformer loss 1 dB assumed"}
	modern = throughTransformer(modern, math.Sqrt(10000/32.0), 1)
	return []Phones{
		{Name: "magnetic-2000", Description: "vintage high-impedance magnetic phones, about 2000 Ω at 1 kHz, 100 dB SPL/mW",
			LoadOhm: 2000, SensitivityDBPerV: VoltageSensitivity(100, 2000),
			Source: "common practice: roughly 100–115 dB SPL/mW for vintage magnetic phones (methods.md §8.3, from memory); the low end taken"},
		{Name: "sound-powered", Description: "balanced-armature sound-powered element, about 600 Ω, 110 dB SPL/mW",
			LoadOhm: 600, SensitivityDBPerV: VoltageSensitivity(110, 600),
			Source: "common practice: hobbyist measurements put the 1 kHz threshold of such elements near 50 fW, i.e. about 110 dB SPL/mW (methods.md §8.3)"},
		{Name: "piezo", Description: "crystal (piezo) earpiece, about 5 nF, with a 47 kΩ DC return resistor across it",
			LoadOhm: 47000, SensitivityDBPerV: 90,
			Source: "common practice / from memory: voltage-driven, roughly 90 dB SPL per volt at 1 kHz, strongly frequency dependent; the 47–100 kΩ DC return is standard (methods.md §8.3)"},
		modern,
	}
}()

// PhonesPresets returns the named earphone presets.
func PhonesPresets() []Phones { return append([]Phones(nil), phonePresets...) }

// PhonesByName returns the preset with that name.
func PhonesByName(name string) (Phones, error) {
	return byName("phones", name, phonePresets, func(p Phones) string { return p.Name })
}

// Validate checks the phones.
func (p Phones) Validate() error {
	if !finite(p.LoadOhm) || p.LoadOhm < 1 || p.LoadOhm > 10e6 {
		return inputErr("phones load", p.LoadOhm, "Ω", "between 1 and 10000000")
	}
	if !finite(p.SensitivityDBPerV) || p.SensitivityDBPerV < 40 || p.SensitivityDBPerV > 160 {
		return inputErr("phones sensitivity", p.SensitivityDBPerV, "dB SPL/V", "between 40 and 160")
	}
	return nil
}

// SPL returns the sound pressure level (dB re 20 µPa) for an audio voltage
// of vRMS volts rms across the phones' load: SPL = S_V + 20·log10(V).
// Reference: methods.md §8.2.
func (p Phones) SPL(vRMS float64) float64 {
	if vRMS <= 0 {
		return math.Inf(-1)
	}
	return p.SensitivityDBPerV + 20*math.Log10(vRMS)
}

// Amplifier is an optional audio amplifier between detector and phones.
type Amplifier struct {
	GainDB   float64 // voltage gain from its input to the phones, dB
	InputOhm float64 // input resistance, the detector's audio load
	// NoiseUV is the equivalent input noise voltage, µV rms, over the
	// audio band.
	NoiseUV float64
}

// Validate checks the amplifier (a zero Amplifier means none).
func (a Amplifier) Validate() error {
	if !finite(a.GainDB) || a.GainDB < 0 || a.GainDB > 80 {
		return inputErr("amplifier gain", a.GainDB, "dB", "between 0 and 80")
	}
	if a.GainDB == 0 {
		return nil
	}
	if !finite(a.InputOhm) || a.InputOhm < 100 || a.InputOhm > 100e6 {
		return inputErr("amplifier input resistance", a.InputOhm, "Ω", "between 100 and 100000000")
	}
	if !finite(a.NoiseUV) || a.NoiseUV < 0 || a.NoiseUV > 1e4 {
		return inputErr("amplifier noise", a.NoiseUV, "µV", "between 0 and 10000")
	}
	return nil
}

// Hearing thresholds.
const (
	// EarphoneThresholdDBSPL is the threshold of hearing at 1 kHz for
	// earphone listening (monaural, supra-aural): ISO 389-1 / ANSI S3.6
	// reference equivalent threshold SPL ≈ 7 dB re 20 µPa (methods.md §8.1:
	// 7.5 dB V2, 7.0 from memory).
	EarphoneThresholdDBSPL = 7.0
	// ListeningAllowanceDB is added to the pure-tone threshold for programme
	// (speech or music) to be recognisably heard rather than just detected:
	// 10 dB, the low end of the 10–20 dB usually quoted (methods.md §8.1,
	// common practice).
	ListeningAllowanceDB = 10.0
	// AudibleSPL is the SPL of the modulation a listener needs: 17 dB SPL.
	AudibleSPL = EarphoneThresholdDBSPL + ListeningAllowanceDB
)
