package propagation

import (
	"fmt"
	"math"
)

// Segment is one stretch of a ground-wave path: its length along the
// ground and its ground constants.
type Segment struct {
	LengthKm float64
	Ground   Ground
}

// Path is an ordered list of segments starting at the transmitter.
type Path []Segment

// LengthKm returns the total length of the path.
func (p Path) LengthKm() float64 {
	var d float64
	for _, s := range p {
		d += s.LengthKm
	}
	return d
}

// Reversed returns the path seen from the receiver.
func (p Path) Reversed() Path {
	r := make(Path, len(p))
	for i, s := range p {
		r[len(p)-1-i] = s
	}
	return r
}

// Validate checks every segment and returns an error naming the first bad
// one, and warnings when the total length lies outside the validated range.
func (p Path) Validate() ([]Warning, error) {
	if len(p) == 0 {
		return nil, fmt.Errorf("propagation: path must have at least one segment")
	}
	for i, s := range p {
		if !(s.LengthKm > 0 && s.LengthKm <= MaxDistKm) {
			field := fmt.Sprintf("segment %d length", i+1)
			if err := checkFinite(field, s.LengthKm, "km"); err != nil {
				return nil, err
			}
			return nil, &InputError{Field: field, Value: s.LengthKm, Unit: "km", Want: fmt.Sprintf("> 0 and <= %g", MaxDistKm)}
		}
		if err := s.Ground.Validate(); err != nil {
			return nil, fmt.Errorf("segment %d: %w", i+1, err)
		}
	}
	return ValidateDistanceKm(p.LengthKm())
}

// FieldCurve gives the homogeneous-path field in dB(µV/m) against distance
// for one ground. Both *Curve and *Homogeneous implement it.
type FieldCurve interface {
	FieldDBuVm(distKm float64) float64
}

// MillingtonDBuVm returns the field at the end of a mixed path by
// Millington's method, given the homogeneous curve of each segment's ground
// (curves[i] for p[i], same frequency and source):
//
//	forward:  E_R = E₁(d₁) − E₂(d₁) + E₂(d₁+d₂) − … + E_n(D)
//	reverse:  E_T = E_n(d_n) − E_{n−1}(d_n) + … + E₁(D)
//	E = (E_R + E_T) / 2
//
// (D the total length; all terms in dB(µV/m)). It is exact for a
// homogeneous path and reciprocal. It panics if len(curves) != len(p).
//
// Reference: Rec. ITU-R P.368 Annex 2; G. Millington, "Ground-wave
// propagation over an inhomogeneous smooth earth", Proc. IEE 96 part III
// (1949) 53–64.
func MillingtonDBuVm(p Path, curves []FieldCurve) float64 {
	if len(p) != len(curves) {
		panic("propagation: MillingtonDBuVm: len(curves) != len(path)")
	}
	n := len(p)
	if n == 1 {
		return curves[0].FieldDBuVm(p[0].LengthKm) // both passes are this
	}
	// Forward pass, from the transmitter.
	var fwd, d float64
	for i := 0; i < n-1; i++ {
		d += p[i].LengthKm
		fwd += curves[i].FieldDBuVm(d) - curves[i+1].FieldDBuVm(d)
	}
	total := d + p[n-1].LengthKm
	fwd += curves[n-1].FieldDBuVm(total)
	// Reverse pass, from the receiver.
	var rev float64
	d = 0
	for i := n - 1; i > 0; i-- {
		d += p[i].LengthKm
		rev += curves[i].FieldDBuVm(d) - curves[i-1].FieldDBuVm(d)
	}
	rev += curves[0].FieldDBuVm(total)
	return (fwd + rev) / 2
}

// Transmitter is what the ground-wave field needs of a transmitter.
type Transmitter struct {
	Freq    KHz
	PowerKW float64 // carrier power, kW
	GainDB  float64 // vertical gain at the horizon relative to a short monopole, dB
}

// Validate checks the transmitter.
func (t Transmitter) Validate() ([]Warning, error) {
	warn, err := ValidateKHz(t.Freq)
	if err != nil {
		return nil, err
	}
	if err := ValidatePowerKW(t.PowerKW); err != nil {
		return nil, err
	}
	if err := checkFinite("gain", t.GainDB, "dB"); err != nil {
		return nil, err
	}
	if t.GainDB < -30 || t.GainDB > 20 {
		return nil, &InputError{Field: "gain", Value: t.GainDB, Unit: "dB", Want: "between -30 and 20"}
	}
	return warn, nil
}

// sourceDB is the source term 10·log10(P_kW) + G_V.
func (t Transmitter) sourceDB() float64 { return 10*math.Log10(t.PowerKW) + t.GainDB }

// PathFieldDBuVm returns the ground-wave field (dB(µV/m)) at the end of
// path from transmitter tx, with homogeneous curves from the cache and
// Millington's method for mixed paths, plus warnings for inputs outside the
// validated range.
func (cc *CurveCache) PathFieldDBuVm(tx Transmitter, p Path) (float64, []Warning, error) {
	return pathField(tx, p, func(g Ground) (FieldCurve, error) { return cc.Curve(tx.Freq, g) })
}

// DirectPathFieldDBuVm is PathFieldDBuVm without the cache: it computes the
// residue-series modes of every ground afresh. It is the reference the
// cache is tested against, and costs milliseconds.
func DirectPathFieldDBuVm(tx Transmitter, p Path) (float64, []Warning, error) {
	models := make(map[Ground]*Homogeneous)
	return pathField(tx, p, func(g Ground) (FieldCurve, error) {
		if h, ok := models[g]; ok {
			return h, nil
		}
		h, _, err := NewHomogeneous(tx.Freq, g)
		if err != nil {
			return nil, err
		}
		models[g] = h
		return h, nil
	})
}

// pathField validates tx and p, gets each segment's curve from curveFor
// and applies Millington's method and the source term.
func pathField(tx Transmitter, p Path, curveFor func(Ground) (FieldCurve, error)) (float64, []Warning, error) {
	warn, err := tx.Validate()
	if err != nil {
		return 0, nil, err
	}
	pw, err := p.Validate()
	if err != nil {
		return 0, nil, err
	}
	warn = append(warn, pw...)
	if lambdaKm := tx.Freq.WavelengthMetres() / 1e3; p.LengthKm() < lambdaKm {
		warn = append(warn, Warning{"distance", fmt.Sprintf(
			"%.3g km is within one wavelength (%.3g km) of the transmitter, where the induction field (not modelled) adds to the radiated ground wave",
			p.LengthKm(), lambdaKm)})
	}
	var buf [8]FieldCurve // most paths have few segments: no allocation
	curves := buf[:0]
	for _, s := range p {
		c, err := curveFor(s.Ground)
		if err != nil {
			return 0, nil, err
		}
		curves = append(curves, c)
	}
	e := MillingtonDBuVm(p, curves) + tx.sourceDB()
	if math.IsNaN(e) || math.IsInf(e, 0) {
		return 0, nil, fmt.Errorf("propagation: ground-wave field is not finite for %g kHz over a %g km path", float64(tx.Freq), p.LengthKm())
	}
	return e, warn, nil
}

// Truncate returns the first distKm of the path (the whole path if it is
// shorter). It is how a field is read at points along a path.
func (p Path) Truncate(distKm float64) Path {
	var out Path
	var d float64
	for _, s := range p {
		if d+s.LengthKm >= distKm {
			out = append(out, Segment{LengthKm: distKm - d, Ground: s.Ground})
			return out
		}
		out = append(out, s)
		d += s.LengthKm
	}
	return out
}
