package propagation

import (
	"fmt"
	"math"
)

// Constants of the sky-wave method.
const (
	// ReflectionHeightKm is the height of the equivalent reflecting layer
	// behind the slant distance p = √(d² + 40 000) (P.1147 §2.5; the same in
	// 47 CFR §73.190 eq. (2)).
	ReflectionHeightKm = 100.0

	// SkyWaveConstMF is the constant A of P.1147 eq. (1) for MF (106.6 at LF).
	// From memory (methods.md §2.2 [M]); corroborated by 47 CFR §73.190:
	// 97.5 dB for a 100 V c.m.f. + 9.54 dB = 107.0 for 300 V.
	SkyWaveConstMF = 107.0
	// SkyWaveConstLF is A below 500 kHz... see skyWaveConst.
	SkyWaveConstLF = 106.6

	// Validated sky-wave ranges (P.1147 §1).
	MinSkyValidKm  = 50.0
	MaxSkyValidKm  = 12000.0
	MinSkyValidKHz = 150.0
	MaxSkyValidKHz = 1700.0

	// FadingZoneDB is the ground/sky difference below which the two modes
	// interfere audibly (selective fading and distortion): the "fading zone"
	// of broadcast practice, taken as 6 dB (common practice).
	FadingZoneDB = 6.0
)

// SlantDistanceKm returns the slant propagation distance
//
//	p = √(d² + (2·100)²)   km
//
// Reference: Rec. ITU-R P.1147 §2.5; 47 CFR §73.190(b) eq. (2).
func SlantDistanceKm(distKm float64) float64 {
	return math.Hypot(distKm, 2*ReflectionHeightKm)
}

// TakeoffAngleDeg returns the elevation angle (degrees) of a single hop
// reflected at ReflectionHeightKm over a sphere of radius EarthRadiusKm:
//
//	θ = arctan[(cos ψ − R/(R+h)) / sin ψ],  ψ = d/(2R)
//
// It is also the arrival angle at the receiver. At d → 0 it tends to 90°.
// The result is clamped at 0° beyond the geometric horizon of the layer
// (about 2250 km), where the ray grazes the ground.
//
// Reference: shared/reference/methods.md §2.3 [D] (plane geometry of the
// reflection triangle).
func TakeoffAngleDeg(distKm float64) float64 {
	if distKm <= 0 {
		return 90
	}
	r := EarthRadiusKm
	psi := distKm / (2 * r)
	th := math.Atan((math.Cos(psi) - r/(r+ReflectionHeightKm)) / math.Sin(psi))
	return math.Max(0, th*180/math.Pi)
}

// BasicLossFactor returns the loss factor k_R (dB per 1000 km of slant
// distance) of P.1147 for a path midpoint at geomagnetic latitude phiDeg:
//
//	k_R = 3.2 + 0.19 · f_kHz^0.4 · tan²(|Φ| + 3°),  |Φ| capped at 60°
//
// Reference: Rec. ITU-R P.1147-4 §2.6 (from memory, methods.md §2.2 [M]).
// The sign convention for southern paths is taken as |Φ|.
func BasicLossFactor(f KHz, phiDeg float64) float64 {
	phi := math.Min(math.Abs(phiDeg), 60)
	t := math.Tan((phi + 3) * math.Pi / 180)
	return 3.2 + 0.19*math.Pow(float64(f), 0.4)*t*t
}

// DecileSpreadDB returns the difference between the field exceeded on
// 10 % of nights and the annual median, for a path midpoint at geomagnetic
// latitude phiDeg:
//
//	Δ = 6 dB (|Φ| < 40°),  0.2|Φ| − 2 dB (40° ≤ |Φ| ≤ 60°),  10 dB (|Φ| > 60°)
//
// Reference: 47 CFR §73.190(c) Formula 2; the same rule in Rec. ITU-R
// P.1147 §3 (methods.md §2.4; the P.1147 identity is from memory).
func DecileSpreadDB(phiDeg float64) float64 {
	phi := math.Abs(phiDeg)
	switch {
	case phi < 40:
		return 6
	case phi <= 60:
		return 0.2*phi - 2
	}
	return 10
}

// PolarisationLossDB returns the excess polarisation-coupling loss of one
// terminal at low magnetic dip:
//
//	L_p = 180·(36 + θ² + I²)^{−1/2} − 2 dB  (|I| ≤ 45°, else 0; never < 0)
//
// with θ the path azimuth measured from magnetic east–west (0–90°) and I
// the magnetic dip (degrees).
//
// Reference: Rec. ITU-R P.1147-4 §2.4 (from memory, methods.md §2.2 [M]).
func PolarisationLossDB(azFromEWDeg, dipDeg float64) float64 {
	if math.Abs(dipDeg) > 45 {
		return 0
	}
	l := 180/math.Sqrt(36+azFromEWDeg*azFromEWDeg+dipDeg*dipDeg) - 2
	return math.Max(0, l)
}

// solarActivityFactor returns b of the solar-activity loss L_r = b·(R/100)·(p/1000)
// for a path midpoint: 4 for North America, 1 for Europe and Australia, 0
// elsewhere (P.1147 §2.8, from memory, methods.md §2.2 [M]). The regions
// are boxes drawn here: North America 15–75° N, 170–50° W; Europe
// 35–72° N, 25° W–45° E; Australia 10–45° S, 110–155° E.
func solarActivityFactor(mid Place) float64 {
	lat, lon := mid.LatDeg(), mid.LonDeg()
	switch {
	case lat >= 15 && lat <= 75 && lon >= -170 && lon <= -50:
		return 4
	case lat >= 35 && lat <= 72 && lon >= -25 && lon <= 45:
		return 1
	case lat >= -45 && lat <= -10 && lon >= 110 && lon <= 155:
		return 1
	}
	return 0
}

// seaGainDB returns the sea-gain correction G_S for a path with nCoastal
// terminals (0, 1 or 2) at the coast with the path leaving over the sea.
//
// P.1147 §2.3 gives G_S from a figure and corrections for terminals
// inland; neither could be retrieved (methods.md §2.2 [M]: "positive, up to
// about 10 dB at MF for long all-sea paths"). This documented stand-in
// gives each coastal terminal a gain rising linearly in log-distance from
// 0 dB at 100 km to 4 dB from 1000 km on (both terminals: up to 8 dB),
// and is meant to be replaced by the Recommendation's curve.
func seaGainDB(distKm float64, nCoastal int) float64 {
	if nCoastal <= 0 || distKm <= 100 {
		return 0
	}
	g := 4 * math.Min(1, math.Log10(distKm/100))
	return float64(nCoastal) * g
}

// SkyPath describes a sky-wave path and its transmitter.
type SkyPath struct {
	Tx, Rx    Place
	Freq      KHz
	PowerKW   float64
	HeightDeg float64 // electrical height of the transmitting monopole; 0 = short monopole
	// Sunspots is the 12-month smoothed sunspot number R (0 = solar minimum).
	Sunspots float64
	// CoastalTerminals counts the terminals (0–2) on the coast with the
	// path leaving over the sea, for the sea gain.
	CoastalTerminals int
}

// SkyWave is the annual median night-time sky wave of a path at the
// reference time (six hours after sunset at the path midpoint), with the
// terms of P.1147 eq. (1).
type SkyWave struct {
	DistKm        float64 // great-circle distance d
	SlantKm       float64 // p
	GeomagLatDeg  float64 // Φ at the path midpoint
	TakeoffDeg    float64 // elevation of the single-hop ray
	GainDB        float64 // G_V of the transmitting antenna at the take-off angle
	KR            float64 // basic loss factor, dB per 1000 km of p
	PolLossDB     float64 // L_p, both terminals
	SeaGainDB     float64 // G_S
	SolarLossDB   float64 // L_r
	MedianDBuVm   float64 // E at the reference time, 50 % of nights
	DecileSpread  float64 // Δ, dB
	DecileDBuVm   float64 // field exceeded on 10 % of nights
	ReceiveCorrDB float64 // vertical-wire receiving correction 20·log10(cos θ) (≤ 0)
	Warnings      []Warning
}

// Validate checks a sky-wave path.
func (sp SkyPath) Validate() ([]Warning, error) {
	return sp.validate(DistanceKm(sp.Tx, sp.Rx))
}

// validate is Validate with the path length already known.
func (sp SkyPath) validate(d float64) ([]Warning, error) {
	var warn []Warning
	if err := checkFinite("frequency", float64(sp.Freq), "kHz"); err != nil {
		return nil, err
	}
	if sp.Freq < 10 || sp.Freq > 30000 {
		return nil, &InputError{Field: "frequency", Value: float64(sp.Freq), Unit: "kHz", Want: "between 10 and 30000"}
	}
	if sp.Freq < MinSkyValidKHz || sp.Freq > MaxSkyValidKHz {
		warn = append(warn, Warning{"frequency", fmt.Sprintf("%g kHz is outside the %g–%g kHz range of the sky-wave method",
			float64(sp.Freq), MinSkyValidKHz, MaxSkyValidKHz)})
	}
	if err := ValidatePowerKW(sp.PowerKW); err != nil {
		return nil, err
	}
	if sp.HeightDeg != 0 {
		if _, err := MonopoleGainDB(sp.HeightDeg, 0); err != nil {
			return nil, err
		}
	}
	if err := checkFinite("sunspot number", sp.Sunspots, ""); err != nil {
		return nil, err
	}
	if sp.Sunspots < 0 || sp.Sunspots > 400 {
		return nil, &InputError{Field: "sunspot number", Value: sp.Sunspots, Want: "between 0 and 400"}
	}
	if sp.CoastalTerminals < 0 || sp.CoastalTerminals > 2 {
		return nil, &InputError{Field: "coastal terminals", Value: float64(sp.CoastalTerminals), Want: "0, 1 or 2"}
	}
	if d < 1e-3 {
		return nil, &InputError{Field: "distance", Value: d, Unit: "km", Want: ">= 0.001 (transmitter and receiver apart)"}
	}
	if d < MinSkyValidKm || d > MaxSkyValidKm {
		warn = append(warn, Warning{"distance", fmt.Sprintf("%.4g km is outside the %g–%g km range of the sky-wave method",
			d, MinSkyValidKm, MaxSkyValidKm)})
	}
	return warn, nil
}

// NightSkyWave returns the annual median night-time sky-wave field at the
// reference time (six hours after sunset at the path midpoint, L_t = 0):
//
//	E = V + G_S − L_p + A − 20·log10 p − k_R·(p/1000) − L_r     dB(µV/m)
//	V = 10·log10(P_kW) + G_V(θ)
//
// with the slant distance p, the loss factor k_R at the geomagnetic
// latitude of the midpoint, G_V the monopole's vertical-pattern gain at the
// take-off angle θ, the polarisation-coupling loss L_p at each terminal
// (centred-dipole dip and magnetic east–west), the solar-activity loss L_r
// and the sea gain G_S. The field is that of P.1147: a loop (magnetic
// field) equivalent at ground level; ReceiveCorrDB gives the correction for
// a vertical wire.
//
// Paths shorter than 50 km (outside P.1147) keep the same formula: the
// slant distance tends to 200 km, the take-off angle to 90°, and the
// monopole's pattern falls as cos θ, so the sky wave near the transmitter
// is weak but present (at night it can still be heard against a weak
// ground wave at 10–50 km). A warning says that this is an extrapolation.
//
// Reference: Rec. ITU-R P.1147-4 eq. (1) and §§2.2–2.8 (structure verified,
// sub-formulas from memory: methods.md §2.2).
func NightSkyWave(sp SkyPath) (SkyWave, error) {
	d := DistanceKm(sp.Tx, sp.Rx)
	warn, err := sp.validate(d)
	if err != nil {
		return SkyWave{}, err
	}
	var s SkyWave
	s.Warnings = warn
	s.DistKm = d
	s.SlantKm = SlantDistanceKm(s.DistKm)
	mid := Midpoint(sp.Tx, sp.Rx)
	s.GeomagLatDeg = GeomagneticLatitudeDeg(mid)
	s.TakeoffDeg = TakeoffAngleDeg(s.DistKm)
	s.GainDB = 0
	elev := math.Min(s.TakeoffDeg, 89.999)
	if sp.HeightDeg != 0 {
		if s.GainDB, err = MonopoleGainDB(sp.HeightDeg, elev); err != nil {
			return SkyWave{}, err
		}
	} else {
		// Short monopole: pattern cos θ.
		s.GainDB = 20 * math.Log10(math.Cos(elev*math.Pi/180))
	}
	if math.IsInf(s.GainDB, -1) {
		s.GainDB = -200 // in a pattern null: no sky wave to speak of
	}
	s.KR = BasicLossFactor(sp.Freq, s.GeomagLatDeg)
	s.PolLossDB = polarisationLossPath(sp.Tx, sp.Rx)
	s.SeaGainDB = seaGainDB(s.DistKm, sp.CoastalTerminals)
	if sp.Freq >= 500 { // L_r applies at MF only
		s.SolarLossDB = solarActivityFactor(mid) * sp.Sunspots / 100 * s.SlantKm / 1000
	}
	a := SkyWaveConstMF
	if sp.Freq < 500 {
		a = SkyWaveConstLF
	}
	v := 10*math.Log10(sp.PowerKW) + s.GainDB
	s.MedianDBuVm = v + s.SeaGainDB - s.PolLossDB + a - 20*math.Log10(s.SlantKm) - s.KR*s.SlantKm/1000 - s.SolarLossDB
	s.DecileSpread = DecileSpreadDB(s.GeomagLatDeg)
	s.DecileDBuVm = s.MedianDBuVm + s.DecileSpread
	s.ReceiveCorrDB = verticalWireCorrection(s.TakeoffDeg)
	return s, nil
}

// VerticalWireCorrectionDB returns the correction (dB, ≤ 0) from the
// P.1147 field (a loop, i.e. magnetic-field, equivalent at ground level) to
// the vertical electric field seen by a vertical wire, for a sky wave
// arriving at the single-hop elevation θ of a path of distKm: over good
// ground the surface H is 2·H_inc at any angle, the vertical E is
// 2·E_inc·cos θ, so
//
//	C = 20·log10(cos θ)
//
// (−6.9 dB at 100 km, −1.5 dB at 300 km, −0.1 dB at 1000 km). It is
// floored at −60 dB for near-vertical arrival.
//
// Reference: shared/reference/methods.md §2.3 [D].
func VerticalWireCorrectionDB(distKm float64) float64 {
	return verticalWireCorrection(TakeoffAngleDeg(distKm))
}

// verticalWireCorrection is VerticalWireCorrectionDB for an arrival angle.
func verticalWireCorrection(thetaDeg float64) float64 {
	return math.Max(-60, 20*math.Log10(math.Cos(thetaDeg*math.Pi/180)))
}

// geomagneticPolePlace is the centred-dipole pole as a Place.
var geomagneticPolePlace = Place{latDeg: GeomagneticPoleLatDeg, lonDeg: GeomagneticPoleLonDeg}

// polarisationLossPath sums PolarisationLossDB over both terminals, with
// the centred-dipole dip and the magnetic east–west direction taken
// perpendicular to the great-circle bearing towards the geomagnetic pole
// (methods.md §2.2 [D]).
func polarisationLossPath(tx, rx Place) float64 {
	var total float64
	for _, end := range [2][2]Place{{tx, rx}, {rx, tx}} {
		p, other := end[0], end[1]
		dip := MagneticDipDeg(p)
		if math.Abs(dip) > 45 {
			continue
		}
		toPole := InitialBearingDeg(p, geomagneticPolePlace)
		path := InitialBearingDeg(p, other)
		// Angle between the path and the magnetic meridian, folded to 0–90°;
		// its complement is the azimuth from magnetic east–west.
		a := math.Mod(math.Abs(path-toPole), 180)
		if a > 90 {
			a = 180 - a
		}
		total += PolarisationLossDB(90-a, dip)
	}
	return total
}
