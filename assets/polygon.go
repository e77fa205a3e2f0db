package assets

import (
	"fmt"
	"math"
)

// ring is a polygon prepared for point-in-polygon tests: its longitudes
// unwrapped so that each edge goes the short way round, and its bounding
// box in the unwrapped coordinates.
type ring struct {
	lat, lon                       []float64
	minLat, maxLat, minLon, maxLon float64
}

// wrap180 returns d reduced to (−180, 180].
func wrap180(d float64) float64 {
	d = math.Mod(d, 360)
	switch {
	case d > 180:
		d -= 360
	case d <= -180:
		d += 360
	}
	return d
}

// newRing checks a polygon and prepares it; errors have a Path starting
// with "polygon".
func newRing(poly [][2]float64) (ring, *Error) {
	if len(poly) < 3 {
		return ring{}, &Error{Path: "polygon", Msg: fmt.Sprintf("must have at least 3 vertices, got %d", len(poly))}
	}
	r := ring{lat: make([]float64, len(poly)), lon: make([]float64, len(poly))}
	for i, v := range poly {
		if !inRange(v[0], -90, 90) {
			return ring{}, &Error{Path: fmt.Sprintf("polygon[%d][0]", i), Msg: fmt.Sprintf("latitude must be between -90 and 90 degrees, got %g", v[0])}
		}
		if !inRange(v[1], -180, 180) {
			return ring{}, &Error{Path: fmt.Sprintf("polygon[%d][1]", i), Msg: fmt.Sprintf("longitude must be between -180 and 180 degrees, got %g", v[1])}
		}
	}
	r.minLat, r.maxLat = math.Inf(1), math.Inf(-1)
	r.minLon, r.maxLon = math.Inf(1), math.Inf(-1)
	for i, v := range poly {
		r.lat[i] = v[0]
		if i == 0 {
			r.lon[0] = v[1]
		} else {
			d := wrap180(v[1] - poly[i-1][1])
			if d == 180 || d == -180 {
				return ring{}, &Error{Path: fmt.Sprintf("polygon[%d]", i-1), Msg: "the edge to the next vertex spans 180 degrees of longitude, so its way round is ambiguous; add a vertex between"}
			}
			r.lon[i] = r.lon[i-1] + d
		}
		r.minLat, r.maxLat = math.Min(r.minLat, r.lat[i]), math.Max(r.maxLat, r.lat[i])
		r.minLon, r.maxLon = math.Min(r.minLon, r.lon[i]), math.Max(r.maxLon, r.lon[i])
	}
	last := len(poly) - 1
	d := wrap180(poly[0][1] - poly[last][1])
	if d == 180 || d == -180 {
		return ring{}, &Error{Path: fmt.Sprintf("polygon[%d]", last), Msg: "the edge back to the first vertex spans 180 degrees of longitude, so its way round is ambiguous; add a vertex between"}
	}
	if turn := r.lon[last] + d - r.lon[0]; math.Abs(turn) > 180 {
		return ring{}, &Error{Path: "polygon", Msg: "must not go round a pole (its edges wind once round the Earth in longitude); split it or trace a boundary in latitude instead"}
	}
	if r.maxLon-r.minLon >= 360 {
		return ring{}, &Error{Path: "polygon", Msg: fmt.Sprintf("must span less than 360 degrees of longitude, spans %g", r.maxLon-r.minLon)}
	}
	return r, nil
}

// contains reports whether (lat, lon) lies inside the ring by the even-odd
// rule, trying the longitude shifted by ±360° to meet the unwrapped ring.
func (r ring) contains(lat, lon float64) bool {
	if !(lat >= r.minLat && lat <= r.maxLat) {
		return false
	}
	for _, x := range [3]float64{lon, lon + 360, lon - 360} {
		if x >= r.minLon && x <= r.maxLon {
			return r.evenOdd(lat, x) // the span is < 360°: one shift at most fits
		}
	}
	return false
}

// evenOdd casts a ray from (y, x) towards +x (east) and counts the edges
// it crosses, each edge taken as half-open in y so that a vertex on the ray
// counts once.
func (r ring) evenOdd(y, x float64) bool {
	in := false
	n := len(r.lat)
	for i, j := 0, n-1; i < n; j, i = i, i+1 {
		yi, yj := r.lat[i], r.lat[j]
		if (yi > y) == (yj > y) {
			continue
		}
		xi, xj := r.lon[i], r.lon[j]
		if x < xi+(y-yi)*(xj-xi)/(yj-yi) {
			in = !in
		}
	}
	return in
}

// PolygonContains reports whether the point (lat, lon), in degrees, lies
// inside polygon, a ring of [lat, lon] vertices whose last vertex joins
// the first, as ground regions use it:
//
//   - Each edge is the straight line between its ends in latitude and
//     longitude (a line of a plate carrée map), going the short way round
//     in longitude, so an edge may cross the 180° meridian: [-10, 179] to
//     [-10, -179] spans 2°, not 358°.
//   - Inside is decided by the even-odd rule: a ray from the point crosses
//     the ring an odd number of times. A ring that runs round an inner
//     ring and back along the same bridge therefore has a hole.
//   - A point exactly on an edge may fall either side.
//
// The error (an *Error with Path "polygon…") reports fewer than 3
// vertices, a coordinate out of range, an edge spanning exactly 180° of
// longitude, or a ring that goes round a pole (or spans 360° of longitude):
// such polygons cannot be drawn as plate carrée rings and must be split.
func PolygonContains(polygon [][2]float64, lat, lon float64) (bool, error) {
	r, e := newRing(polygon)
	if e != nil {
		return false, e
	}
	return r.contains(lat, lon), nil
}
