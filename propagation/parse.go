package propagation

import (
	"fmt"
	"strconv"
	"strings"
	"time"
)

// ParseGround reads a ground given by a standard name (see GroundTypes) or
// as "SIGMA/EPSR" (S/m and relative permittivity, e.g. "0.01/15").
func ParseGround(s string) (Ground, error) {
	s = strings.TrimSpace(s)
	if a, b, ok := strings.Cut(s, "/"); ok {
		sigma, err1 := strconv.ParseFloat(strings.TrimSpace(a), 64)
		epsr, err2 := strconv.ParseFloat(strings.TrimSpace(b), 64)
		if err1 != nil || err2 != nil {
			return Ground{}, fmt.Errorf("propagation: ground %q: want NAME or SIGMA/EPSR, e.g. 0.01/15", s)
		}
		g := Ground{SigmaSPerM: sigma, EpsR: epsr}
		return g, g.Validate()
	}
	gt, err := GroundByName(s)
	if err != nil {
		return Ground{}, err
	}
	return gt.Ground, nil
}

// ParsePath reads a mixed path written as comma-separated KM:GROUND
// segments from the transmitter, e.g. "20:sea,35:land,5:0.01/15".
// Errors name the segment at fault.
func ParsePath(spec string) (Path, error) {
	if strings.TrimSpace(spec) == "" {
		return nil, fmt.Errorf("propagation: path is empty; want KM:GROUND,KM:GROUND,…")
	}
	var p Path
	for i, part := range strings.Split(spec, ",") {
		km, ground, ok := strings.Cut(part, ":")
		if !ok {
			return nil, fmt.Errorf("propagation: path segment %d %q: want KM:GROUND", i+1, part)
		}
		d, err := strconv.ParseFloat(strings.TrimSpace(km), 64)
		if err != nil {
			return nil, fmt.Errorf("propagation: path segment %d: length %q is not a number", i+1, km)
		}
		if !(d > 0) || d > MaxDistKm {
			return nil, &InputError{Field: fmt.Sprintf("path segment %d length", i+1), Value: d, Unit: "km",
				Want: fmt.Sprintf("> 0 and <= %g", MaxDistKm)}
		}
		g, err := ParseGround(ground)
		if err != nil {
			return nil, fmt.Errorf("path segment %d: %w", i+1, err)
		}
		p = append(p, Segment{LengthKm: d, Ground: g})
	}
	return p, nil
}

// ParseKmList reads a comma-separated list of distances in km, each > 0
// and ≤ MaxDistKm.
func ParseKmList(spec string) ([]float64, error) {
	var out []float64
	for i, part := range strings.Split(spec, ",") {
		d, err := strconv.ParseFloat(strings.TrimSpace(part), 64)
		if err != nil {
			return nil, fmt.Errorf("propagation: distance %d %q is not a number", i+1, part)
		}
		if _, err := ValidateDistanceKm(d); err != nil {
			return nil, err
		}
		out = append(out, d)
	}
	return out, nil
}

// ParsePlace reads "LAT,LON" in decimal degrees (north and east positive).
func ParsePlace(s string) (Place, error) {
	a, b, ok := strings.Cut(s, ",")
	if !ok {
		return Place{}, fmt.Errorf("propagation: place %q: want LAT,LON in degrees, e.g. 51.5,-0.12", s)
	}
	lat, err1 := strconv.ParseFloat(strings.TrimSpace(a), 64)
	lon, err2 := strconv.ParseFloat(strings.TrimSpace(b), 64)
	if err1 != nil || err2 != nil {
		return Place{}, fmt.Errorf("propagation: place %q: want LAT,LON in degrees, e.g. 51.5,-0.12", s)
	}
	return NewPlace(lat, lon)
}

// ParseTime reads an instant in RFC 3339 (2025-01-15T22:00:00Z) or a date
// (2025-01-15, taken as 00:00 UTC); dateOnly reports the second form.
func ParseTime(s string) (t time.Time, dateOnly bool, err error) {
	if t, err := time.Parse(time.RFC3339, s); err == nil {
		return t, false, nil
	}
	if t, err := time.Parse(time.DateOnly, s); err == nil {
		return t, true, nil
	}
	return time.Time{}, false, fmt.Errorf("propagation: time %q: want RFC 3339 (2025-01-15T22:00:00Z) or a date (2025-01-15)", s)
}
