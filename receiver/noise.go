package receiver

import (
	"math"
)

// NoiseEnv is a man-made noise environment of Rec. ITU-R P.372: the median
// external noise figure F_am = c − d·log10(f_MHz) dB above kT₀b.
type NoiseEnv struct {
	Name        string
	C, D        float64 // constants of F_am
	UpperDecile float64 // D_u, dB above the median
}

// noiseEnvs are the man-made noise categories of P.372 (Table 2 of
// P.372-10 as carried in ITU-R SG3's reference code; methods.md §3.2,
// verified). At MF galactic noise is screened by the ionosphere and is not
// included. Atmospheric noise (lightning, strong on summer nights and in
// the tropics) needs P.372's world maps, which are not carried here.
var noiseEnvs = []NoiseEnv{
	{"city", 76.8, 27.7, 11.0},
	{"residential", 72.5, 27.7, 10.6},
	{"rural", 67.2, 27.7, 9.2},
	{"quiet-rural", 53.6, 28.6, 9.2},
}

// NoiseEnvs returns the man-made noise environments.
func NoiseEnvs() []NoiseEnv { return append([]NoiseEnv(nil), noiseEnvs...) }

// NoiseEnvByName returns the environment with that name.
func NoiseEnvByName(name string) (NoiseEnv, error) {
	return byName("noise environment", name, noiseEnvs, func(n NoiseEnv) string { return n.Name })
}

// NoiseFigureDB returns the median external noise figure F_am (dB above
// kT₀b) at f:
//
//	F_am = c − d·log10(f_MHz)
//
// Reference: Rec. ITU-R P.372 (Table 2 of -10); methods.md §3.2. P.372
// states the man-made curves from 0.3 MHz; below that they are
// extrapolated.
func (n NoiseEnv) NoiseFigureDB(f KHz) float64 { return n.C - n.D*math.Log10(f.MHz()) }

// NoiseFieldDBuVm returns the r.m.s. noise field (vertical component, for
// a short monopole over perfect ground) in a bandwidth bandwidthHz:
//
//	E_n = F_a + 20·log10(f_MHz) + 10·log10(b) − 95.5   dB(µV/m)
//
// Reference: Rec. ITU-R P.372 §2 (from memory; re-derived in methods.md
// §3.1: −95.52).
func (n NoiseEnv) NoiseFieldDBuVm(f KHz, bandwidthHz float64) float64 {
	return n.NoiseFigureDB(f) + 20*math.Log10(f.MHz()) + 10*math.Log10(bandwidthHz) - 95.5
}

// AudioBandwidthHz is the audio band that headphones reproduce and the
// listener hears noise in (about 3 kHz for telephone-quality phones;
// common practice). An AM receiver's detector turns RF noise within
// ±AudioBandwidthHz of the carrier into audible noise, so the noise
// bandwidth at RF is at most 2·AudioBandwidthHz.
const AudioBandwidthHz = 3000.0
