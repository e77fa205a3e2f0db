package propagation

import "math"

// KHz is a frequency in kilohertz.
type KHz float64

// Hz returns the frequency in hertz.
func (f KHz) Hz() float64 { return float64(f) * 1e3 }

// MHz returns the frequency in megahertz.
func (f KHz) MHz() float64 { return float64(f) * 1e-3 }

// WavelengthMetres returns the free-space wavelength c/f in metres.
func (f KHz) WavelengthMetres() float64 { return SpeedOfLight / f.Hz() }

// Physical constants.
const (
	// SpeedOfLight is c in m/s (exact, SI 2019).
	SpeedOfLight = 299792458.0

	// EarthRadiusKm is the mean radius of the Earth in km
	// (IUGG mean radius R1 = 6371.0088 km, rounded as in ITU-R P.368 work).
	EarthRadiusKm = 6371.0

	// EffectiveEarthFactor is the effective-earth-radius factor k for
	// standard refraction (median atmosphere, refractivity gradient about
	// −40 N/km). See EffectiveEarthRadiusKm.
	EffectiveEarthFactor = 4.0 / 3.0

	// EffectiveEarthRadiusKm is k·a = 8494.7 km, the radius of the earth used
	// for the ground-wave residue series. ITU-R P.368's curves assume an
	// exponential atmosphere (P.453, 315 N, scale height 7.35 km) whose
	// surface gradient corresponds to k ≈ 1.37; the 4/3 choice is the usual
	// standard-refraction value and differs from it mainly beyond ~1000 km.
	EffectiveEarthRadiusKm = EffectiveEarthFactor * EarthRadiusKm
)

// RefFieldDBuVm1km is the field of the P.368 reference source at 1 km over a
// perfectly conducting plane: a 300 V cymomotive force (1 kW from a short
// vertical monopole) gives 300 mV/m at 1 km, 20·log10(300e3) = 109.54 dB(µV/m).
//
// Reference: Rec. ITU-R P.368 Annex 1 §1; Rec. ITU-R P.525-5 §2.1 Note 2.
var RefFieldDBuVm1km = 20 * math.Log10(300e3)

// InverseDistanceDBuVm returns the unattenuated field of the reference source
// scaled to power powerKW (kW) and vertical gain gainDB (dB relative to a
// short monopole), at distKm:
//
//	E0 = 109.54 + 10·log10(P_kW) + G_V − 20·log10(d_km)   dB(µV/m)
//
// Reference: Rec. ITU-R P.368 (inverse-distance reference line); P.525-5 eq. (2).
func InverseDistanceDBuVm(distKm, powerKW, gainDB float64) float64 {
	return RefFieldDBuVm1km + 10*math.Log10(powerKW) + gainDB - 20*math.Log10(distKm)
}

// MicroVoltsPerMetre converts a field in dB(µV/m) to µV/m.
func MicroVoltsPerMetre(fieldDBuVm float64) float64 { return math.Pow(10, fieldDBuVm/20) }

// DBuVm converts a field in µV/m to dB(µV/m).
func DBuVm(fieldUVm float64) float64 { return 20 * math.Log10(fieldUVm) }
