package propagation

import (
	"fmt"
	"math"

	"github.com/golang/geo/r3"
	"github.com/golang/geo/s1"
	"github.com/golang/geo/s2"
)

// Geometry on a spherical Earth of radius EarthRadiusKm.
//
// Positions are geographic latitude and longitude in degrees, north and east
// positive (the sign convention of 47 CFR §73.190 Note 2). The ellipsoid is
// ignored: over medium-wave path lengths the spherical distance differs from
// the geodesic on the WGS 84 ellipsoid by up to about 0.5 % (from memory),
// well inside the uncertainty of the ground constants.

// Geomagnetic pole of the centred-dipole model used for sky-wave prediction.
//
// Reference: 47 CFR §73.190(b) Formula 1, eq. (3); Rec. ITU-R P.1147 uses the
// same pole (see methods.md §2.2).
const (
	GeomagneticPoleLatDeg = 78.5  // 78.5° N
	GeomagneticPoleLonDeg = -69.0 // 69° W
)

// MaxPathSamples is the largest number of samples SamplePath takes along one
// path (both ends included). It bounds the work and memory of one call: a
// 20 000 km path can still be sampled every 0.31 km.
const MaxPathSamples = 1 << 16

// coincidentRad is the angular separation below which two places are
// treated as the same place by InitialBearingDeg and SamplePath:
// 1e-13 rad is 0.64 µm on the Earth's surface.
const coincidentRad = 1e-13

// Place is a position on the Earth's surface. The zero value is 0° N, 0° E.
// Build one with NewPlace, which validates the coordinates; a Place cannot
// hold an out-of-range or non-finite coordinate.
type Place struct {
	latDeg, lonDeg float64
}

// NewPlace returns the place at geographic latitude latDeg and longitude
// lonDeg, both in degrees, north and east positive. It returns an
// *InputError naming "latitude" unless latDeg is in [−90, 90], or naming
// "longitude" unless lonDeg is in [−180, 180]; NaN and ±Inf are rejected.
// Longitudes −180 and 180 are the same meridian and both accepted.
func NewPlace(latDeg, lonDeg float64) (Place, error) {
	if err := checkFinite("latitude", latDeg, "degrees"); err != nil {
		return Place{}, err
	}
	if latDeg < -90 || latDeg > 90 {
		return Place{}, &InputError{Field: "latitude", Value: latDeg, Unit: "degrees", Want: "between -90 and 90"}
	}
	if err := checkFinite("longitude", lonDeg, "degrees"); err != nil {
		return Place{}, err
	}
	if lonDeg < -180 || lonDeg > 180 {
		return Place{}, &InputError{Field: "longitude", Value: lonDeg, Unit: "degrees", Want: "between -180 and 180"}
	}
	return Place{latDeg: latDeg, lonDeg: lonDeg}, nil
}

// LatDeg returns the geographic latitude in degrees, north positive.
func (p Place) LatDeg() float64 { return p.latDeg }

// LonDeg returns the geographic longitude in degrees, east positive.
func (p Place) LonDeg() float64 { return p.lonDeg }

// LatLng returns the place as an s2.LatLng.
func (p Place) LatLng() s2.LatLng { return s2.LatLngFromDegrees(p.latDeg, p.lonDeg) }

// point returns the place as a unit vector.
func (p Place) point() s2.Point { return s2.PointFromLatLng(p.LatLng()) }

func (p Place) String() string { return fmt.Sprintf("%.4f°, %.4f°", p.latDeg, p.lonDeg) }

// placeFromPoint converts a unit vector back to degrees. The bounds only
// absorb rounding in atan2·180/π (a result can exceed 90° or 180° by an ulp);
// every input here is a unit vector, so no real value is altered.
func placeFromPoint(pt s2.Point) Place {
	ll := s2.LatLngFromPoint(pt)
	lat := math.Max(-90, math.Min(90, ll.Lat.Degrees()))
	lon := math.Max(-180, math.Min(180, ll.Lng.Degrees()))
	return Place{latDeg: lat, lonDeg: lon}
}

// centralAngle returns the angle at the Earth's centre between a and b,
// in [0, π] radians:
//
//	σ = atan2(|a × b|, a · b)        (a, b unit vectors)
//
// This form is accurate at all separations, including nearly coincident and
// nearly antipodal points, where the law of cosines and the haversine
// respectively lose precision.
func centralAngle(a, b s2.Point) s1.Angle { return a.Distance(b) }

// DistanceKm returns the great-circle (shortest) distance in km between a
// and b on a sphere of radius EarthRadiusKm:
//
//	d = R·σ,  σ = atan2(|a × b|, a · b)
//
// σ is the central angle of 47 CFR §73.190 eq. (5) (there written with the
// law of cosines); the result lies in [0, π·R] = [0, 20 015.1] km. It is 0
// for identical places and π·R for antipodal ones.
//
// Reference: 47 CFR §73.190(b) eq. (5); E. Williams, Aviation Formulary
// V1.47, "Distance between points".
func DistanceKm(a, b Place) float64 {
	return centralAngle(a.point(), b.point()).Radians() * EarthRadiusKm
}

// pathNormal returns a vector normal to the plane of the great circle from a
// to b, oriented so that travel from a towards b is anticlockwise about it.
// It is never zero: for identical or antipodal points (where the great
// circle is undefined) s2.Point.PointCross returns a fixed, arbitrary
// perpendicular to a, so every function below makes one consistent choice.
func pathNormal(a, b s2.Point) r3.Vector { return a.PointCross(b).Vector }

// InitialBearingDeg returns the initial great-circle bearing (true course)
// from a towards b in degrees, in [0, 360), clockwise from true north:
//
//	θ = atan2(t · ê, t · n̂),  t = (a × b) × a
//
// with ê and n̂ the local east and north unit vectors at a. This equals the
// usual atan2(sin Δλ cos φ₂, cos φ₁ sin φ₂ − sin φ₁ cos φ₂ cos Δλ).
//
// Special cases, none of which returns NaN:
//   - identical places (closer than 0.64 µm): 0;
//   - a at the north pole (latitude exactly 90°): 180, every direction is
//     south; at the south pole: 0, every direction is north;
//   - antipodal places: every bearing is a shortest route; the one returned
//     is the direction PointAt and SamplePath follow.
//
// Reference: E. Williams, Aviation Formulary V1.47, "Course between points"
// (poles handled the same way there).
func InitialBearingDeg(a, b Place) float64 {
	pa, pb := a.point(), b.point()
	if centralAngle(pa, pb) < coincidentRad {
		return 0
	}
	switch a.latDeg {
	case 90:
		return 180
	case -90:
		return 0
	}
	t := pathNormal(pa, pb).Cross(pa.Vector)
	ll := a.LatLng()
	phi, lam := ll.Lat.Radians(), ll.Lng.Radians()
	sinPhi, cosPhi := math.Sincos(phi)
	sinLam, cosLam := math.Sincos(lam)
	east := r3.Vector{X: -sinLam, Y: cosLam}
	north := r3.Vector{X: -sinPhi * cosLam, Y: -sinPhi * sinLam, Z: cosPhi}
	deg := math.Atan2(t.Dot(east), t.Dot(north)) * 180 / math.Pi
	if deg < 0 {
		deg += 360
	}
	if deg >= 360 { // −tiny + 360 rounds to 360
		deg = 0
	}
	return deg
}

// pointAt returns the point a fraction frac of the way from a to b along
// the great circle, by rotating a towards b by frac·σ in the plane of
// pathNormal (the method of s2.InterpolateAtDistance).
func pointAt(pa, pb s2.Point, frac float64) s2.Point {
	return s2.InterpolateAtDistance(s1.Angle(frac)*centralAngle(pa, pb), pa, pb)
}

// PointAt returns the place a fraction frac of the way from a to b along the
// short great circle: frac = 0 gives a, frac = 1 gives b, and the result is
// frac·DistanceKm(a, b) from a. For antipodal places it follows the route of
// InitialBearingDeg; for identical places it returns a.
//
// It returns an *InputError naming "fraction" unless frac is in [0, 1].
//
// Reference: E. Williams, Aviation Formulary V1.47, "Intermediate points on
// a great circle" (computed here by rotation, as s2.Interpolate does).
func PointAt(a, b Place, frac float64) (Place, error) {
	if err := checkFinite("fraction", frac, ""); err != nil {
		return Place{}, err
	}
	if frac < 0 || frac > 1 {
		return Place{}, &InputError{Field: "fraction", Value: frac, Want: "between 0 and 1"}
	}
	switch frac {
	case 0:
		return a, nil
	case 1:
		return b, nil
	}
	return placeFromPoint(pointAt(a.point(), b.point(), frac)), nil
}

// Midpoint returns the point halfway between a and b along the short great
// circle, equidistant from both. For identical places it returns a; for
// antipodal places, the point a quarter of the circumference along the route
// of InitialBearingDeg.
//
// This is the path midpoint of 47 CFR §73.190(b) eqs (6)–(7), whose
// geomagnetic latitude enters the sky-wave formula (those two equations are
// images in the text copies consulted and were not seen; the exact spherical
// midpoint is used here).
//
// Reference: E. Williams, Aviation Formulary V1.47, "Intermediate points on
// a great circle" with f = 1/2.
func Midpoint(a, b Place) Place {
	return placeFromPoint(pointAt(a.point(), b.point(), 0.5))
}

// GroundMap gives the ground constants at a position (latitude and
// longitude in degrees, north and east positive). SamplePath calls it once
// per sample and rejects a path on which it returns an invalid Ground.
type GroundMap func(latDeg, lonDeg float64) Ground

// SamplePath returns the mixed path from tx to rx along the short great
// circle, as read from ground.
//
// The path is sampled at n = ⌈d/stepKm⌉ + 1 equally spaced points, both
// ends included, so the actual spacing is h = d/(n−1) ≤ stepKm. Consecutive
// samples with the same Ground (compared exactly) are merged into one
// segment, and a boundary between differing samples is placed halfway
// between them. The segment lengths add up to exactly DistanceKm(tx, rx) in
// floating point, whatever the order of summation (boundaries are rounded
// to multiples of the unit in the last place of the distance).
//
// Resolution: a single boundary crossed by the path is placed within h/2
// of its true position; a stretch of ground narrower than h can be missed
// altogether or, if one sample falls in it, reported as h long. The first
// and last segments carry the ground sampled exactly at tx and rx, so
// path[0].Ground and path[len(path)-1].Ground are the terminal grounds (a
// terminal on the coast shows as a sea segment starting or ending there).
// For antipodal places the route is the one InitialBearingDeg reports.
// Paths longer than MaxDistKm (up to π·R = 20 015 km) are sampled; it is
// Path.Validate that rejects them.
//
// Errors: an *InputError naming "sampling step" unless stepKm is finite,
// > 0 and ≥ d/(MaxPathSamples−1); one naming "distance" if tx and rx are the
// same place (no path); a wrapped error naming the sample if ground returns
// an invalid Ground; an error if ground is nil.
func SamplePath(ground GroundMap, tx, rx Place, stepKm float64) (Path, error) {
	return AppendSamplePath(nil, ground, tx, rx, stepKm)
}

// AppendSamplePath is SamplePath appending the segments to dst (which it
// may reuse), so that a caller sampling many paths allocates nothing.
func AppendSamplePath(dst Path, ground GroundMap, tx, rx Place, stepKm float64) (Path, error) {
	if ground == nil {
		return nil, fmt.Errorf("propagation: ground map must not be nil")
	}
	if err := checkFinite("sampling step", stepKm, "km"); err != nil {
		return nil, err
	}
	if stepKm <= 0 {
		return nil, &InputError{Field: "sampling step", Value: stepKm, Unit: "km", Want: "> 0"}
	}
	pa, pb := tx.point(), rx.point()
	sigma := centralAngle(pa, pb)
	distKm := sigma.Radians() * EarthRadiusKm
	if sigma < coincidentRad {
		return nil, &InputError{Field: "distance", Value: distKm, Unit: "km", Want: "> 0"}
	}
	intervals := math.Ceil(distKm / stepKm)
	if intervals > MaxPathSamples-1 { // at most MaxPathSamples samples over distKm
		minStep := distKm / (MaxPathSamples - 1)
		return nil, &InputError{Field: "sampling step", Value: stepKm, Unit: "km",
			Want: fmt.Sprintf(">= %.4g", minStep)}
	}
	k := int(intervals) // number of intervals, ≥ 1

	// Tangent at tx towards rx, scaled to unit length: sample i is
	// cos(θᵢ)·a + sin(θᵢ)·t̂ with θᵢ = σ·i/k (as s2.InterpolateAtDistance),
	// stepped by the angle-addition recurrence (two multiply-adds a sample
	// instead of a Sincos; rounding grows like i·ε, negligible here).
	tangent := pathNormal(pa, pb).Cross(pa.Vector)
	tangent = tangent.Mul(1 / tangent.Norm())
	stepSin, stepCos := math.Sincos(sigma.Radians() / float64(k))
	curSin, curCos := 0.0, 1.0

	// Boundary positions are rounded to multiples of q = ulp(d). Every
	// length is then a multiple of q no larger than d, so every partial sum
	// is exact and the lengths add up to d exactly in any order. The
	// rounding moves a boundary by at most q/2 (≈ 3e-14 km at 500 km).
	q := math.Nextafter(distKm, math.Inf(1)) - distKm
	path := dst[:0]
	var prevKm float64 // position of the previous boundary, a multiple of q
	var cur Ground
	for i := 0; i <= k; i++ {
		var lat, lon float64
		switch i {
		case 0:
			lat, lon = tx.latDeg, tx.lonDeg
		case k:
			lat, lon = rx.latDeg, rx.lonDeg
		default:
			curSin, curCos = curSin*stepCos+curCos*stepSin, curCos*stepCos-curSin*stepSin
			x := pa.X*curCos + tangent.X*curSin
			y := pa.Y*curCos + tangent.Y*curSin
			z := pa.Z*curCos + tangent.Z*curSin
			lat = math.Atan2(z, math.Sqrt(x*x+y*y)) * 180 / math.Pi
			lon = math.Atan2(y, x) * 180 / math.Pi
		}
		g := ground(lat, lon)
		if i > 0 && g == cur {
			continue
		}
		if err := g.Validate(); err != nil {
			pl := Place{latDeg: lat, lonDeg: lon}
			return nil, fmt.Errorf("propagation: ground map at sample %d of %d (%v, %.6g km from the transmitter): %w",
				i+1, k+1, pl, distKm*float64(i)/float64(k), err)
		}
		if i > 0 {
			// halfway between samples i−1 and i
			boundaryKm := math.Round(distKm*(float64(2*i-1)/float64(2*k))/q) * q
			path = append(path, Segment{LengthKm: boundaryKm - prevKm, Ground: cur})
			prevKm = boundaryKm
		}
		cur = g
	}
	path = append(path, Segment{LengthKm: distKm - prevKm, Ground: cur})
	return path, nil
}

// geomagneticPole is the dipole axis as a unit vector.
var geomagneticPole = s2.PointFromLatLng(s2.LatLngFromDegrees(GeomagneticPoleLatDeg, GeomagneticPoleLonDeg))

// GeomagneticLatitudeDeg returns the geomagnetic latitude Φ of p in degrees,
// in [−90, 90], for the centred dipole with its north pole at 78.5° N, 69° W:
//
//	Φ = arcsin[ sin β · sin 78.5° + cos β · cos 78.5° · cos(69° + λ) ]   eq. (3)
//
// with β, λ the geographic latitude and longitude of p (north and east
// positive). The bracket is the scalar product of the unit vectors of p and
// of the pole, so Φ = 90° − (angle between them); it is evaluated in that
// form (atan2 of cross and dot products), which is accurate near the poles
// and cannot leave the domain of arcsin. Valid for every place.
//
// Reference: 47 CFR §73.190(b) Formula 1, eq. (3) (geomagnetic latitude of
// the path midpoint); Rec. ITU-R P.1147 §2 (same pole).
func GeomagneticLatitudeDeg(p Place) float64 {
	return 90 - centralAngle(p.point(), geomagneticPole).Degrees() // eq. (3)
}

// MagneticDipDeg returns the magnetic dip (inclination) I at p in degrees,
// in [−90, 90], positive downwards (northern geomagnetic hemisphere), in the
// centred-dipole approximation:
//
//	tan I = 2 · tan Φ        (Φ = GeomagneticLatitudeDeg(p))
//
// evaluated as I = atan2(2 sin Φ, cos Φ), which gives ±90° at the
// geomagnetic poles without overflow. The real field departs from the dipole
// by up to some tens of degrees of dip in places (e.g. the South Atlantic);
// Rec. ITU-R P.1147 reads I from a map, so this is an approximation for use
// where no map is available.
//
// Reference: centred-dipole field, vertical component 2B₀ sin Φ and
// horizontal component B₀ cos Φ, so tan I = 2 tan Φ (derived; methods.md
// §2.2 [D]).
func MagneticDipDeg(p Place) float64 {
	return dipFromGeomagneticDeg(GeomagneticLatitudeDeg(p))
}

// dipFromGeomagneticDeg returns atan2(2 sin Φ, cos Φ) in degrees.
func dipFromGeomagneticDeg(phiDeg float64) float64 {
	s, c := math.Sincos(phiDeg * math.Pi / 180)
	return math.Atan2(2*s, c) * 180 / math.Pi
}
