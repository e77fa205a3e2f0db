package propagation

import (
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"testing"

	"github.com/golang/geo/s2"
)

// geoMustPlace is a test helper: NewPlace that fails the test on error.
func geoMustPlace(t testing.TB, latDeg, lonDeg float64) Place {
	t.Helper()
	p, err := NewPlace(latDeg, lonDeg)
	if err != nil {
		t.Fatalf("NewPlace(%g, %g): %v", latDeg, lonDeg, err)
	}
	return p
}

// geoDM converts degrees and minutes to decimal degrees.
func geoDM(deg, min float64) float64 { return deg + min/60 }

// geoHaversineRad is the haversine central angle, written out as in
// E. Williams, Aviation Formulary V1.47, "Distance between points" (second
// form), independent of the code under test.
func geoHaversineRad(lat1, lon1, lat2, lon2 float64) float64 {
	r := math.Pi / 180
	lat1, lon1, lat2, lon2 = lat1*r, lon1*r, lat2*r, lon2*r
	s1 := math.Sin((lat1 - lat2) / 2)
	s2 := math.Sin((lon1 - lon2) / 2)
	return 2 * math.Asin(math.Sqrt(s1*s1+math.Cos(lat1)*math.Cos(lat2)*s2*s2))
}

// geoClassicBearingDeg is the initial course written out in the usual
// atan2 form (E. Williams, Aviation Formulary V1.47, "Course between
// points", alternative formula, converted to east-positive longitudes).
func geoClassicBearingDeg(lat1, lon1, lat2, lon2 float64) float64 {
	r := math.Pi / 180
	lat1, lon1, lat2, lon2 = lat1*r, lon1*r, lat2*r, lon2*r
	y := math.Sin(lon2-lon1) * math.Cos(lat2)
	x := math.Cos(lat1)*math.Sin(lat2) - math.Sin(lat1)*math.Cos(lat2)*math.Cos(lon2-lon1)
	return math.Mod(math.Atan2(y, x)*180/math.Pi+360, 360)
}

// geoAngleDiffDeg returns the difference of two bearings folded into
// [−180, 180].
func geoAngleDiffDeg(a, b float64) float64 { return math.Remainder(a-b, 360) }

func TestNewPlace(t *testing.T) {
	nan := math.NaN()
	cases := []struct {
		name      string
		lat, lon  float64
		wantField string // "" for success
	}{
		{"origin", 0, 0, ""},
		{"north pole", 90, 0, ""},
		{"south pole", -90, 180, ""},
		{"antimeridian west", 10, -180, ""},
		{"antimeridian east", 10, 180, ""},
		{"lat above 90", 90.000001, 0, "latitude"},
		{"lat below -90", -91, 0, "latitude"},
		{"lat NaN", nan, 0, "latitude"},
		{"lat +Inf", math.Inf(1), 0, "latitude"},
		{"lon above 180", 0, 180.5, "longitude"},
		{"lon below -180", 0, -360, "longitude"},
		{"lon NaN", 0, nan, "longitude"},
		{"lon -Inf", 0, math.Inf(-1), "longitude"},
		{"both bad names latitude first", 100, 200, "latitude"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			p, err := NewPlace(c.lat, c.lon)
			if c.wantField == "" {
				if err != nil {
					t.Fatalf("NewPlace(%g, %g): unexpected error %v", c.lat, c.lon, err)
				}
				if p.LatDeg() != c.lat || p.LonDeg() != c.lon {
					t.Errorf("NewPlace(%g, %g) = %v, want the same coordinates", c.lat, c.lon, p)
				}
				return
			}
			var ie *InputError
			if !errors.As(err, &ie) {
				t.Fatalf("NewPlace(%g, %g): got error %v, want *InputError for %q", c.lat, c.lon, err, c.wantField)
			}
			if ie.Field != c.wantField {
				t.Errorf("NewPlace(%g, %g): error field %q, want %q (%v)", c.lat, c.lon, ie.Field, c.wantField, err)
			}
		})
	}
}

// geoPairs is a set of paths covering short, medium, long, polar,
// antimeridian and near-antipodal cases.
var geoPairs = []struct {
	name                   string
	lat1, lon1, lat2, lon2 float64
}{
	{"London-Paris", 51.5074, -0.1278, 48.8566, 2.3522},
	{"LAX-JFK", geoDM(33, 57), -geoDM(118, 24), geoDM(40, 38), -geoDM(73, 47)},
	{"Sydney-Tokyo", -33.9, 151.2, 35.7, 139.7},
	{"across antimeridian", 60, 170, 55, -165},
	{"over the pole", 80, 0, 80, 180},
	{"equator quarter", 0, 0, 0, 90},
	{"short 100 m", 45, 7, 45.0009, 7},
	{"near antipodal", 10, 20, -10.001, -160},
	{"southern ocean", -50, -60, -45, 30},
}

// TestGreatCircleDistanceS2: DistanceKm against golang/geo's own
// s2.LatLng.Distance (haversine, as C++ S2LatLng::GetDistance) on the same
// sphere, and against the haversine formula written out.
// Tolerance: 1e-9 relative + 1e-9 km, double-precision rounding of two
// equivalent formulas; the near-antipodal case, where the haversine loses
// precision (d(asin x)/dx → ∞), gets 1e-6 km.
func TestGreatCircleDistanceS2(t *testing.T) {
	for _, c := range geoPairs {
		t.Run(c.name, func(t *testing.T) {
			a, b := geoMustPlace(t, c.lat1, c.lon1), geoMustPlace(t, c.lat2, c.lon2)
			got := DistanceKm(a, b)
			tol := 1e-9*got + 1e-9
			if c.name == "near antipodal" {
				tol = 1e-6
			}
			// golang/geo v0.0.0-20260818125358-b200a1149890, s2.LatLng.Distance.
			wantS2 := s2.LatLngFromDegrees(c.lat1, c.lon1).Distance(s2.LatLngFromDegrees(c.lat2, c.lon2)).Radians() * EarthRadiusKm
			if math.Abs(got-wantS2) > tol {
				t.Errorf("DistanceKm(%v, %v) = %.12g km, s2.LatLng.Distance gives %.12g km, tolerance %g", a, b, got, wantS2, tol)
			}
			// Haversine written out (Aviation Formulary V1.47).
			wantHav := geoHaversineRad(c.lat1, c.lon1, c.lat2, c.lon2) * EarthRadiusKm
			if math.Abs(got-wantHav) > tol {
				t.Errorf("DistanceKm(%v, %v) = %.12g km, haversine gives %.12g km, tolerance %g", a, b, got, wantHav, tol)
			}
		})
	}
}

// TestGreatCircleAviationFormulary reproduces the worked example of
// E. Williams, Aviation Formulary V1.47, "Worked Examples" (LAX 33°57′N
// 118°24′W to JFK 40°38′N 73°47′W), looked up in the copy at
// github.com/wohenbushuang/Ed-Williams-Aviation-page, en-us/avform.md.
// The formulary quotes radians to 6 decimals (tolerance 5e-7 rad, half a
// unit in the last place), nautical miles and degrees to integers (0.5), and
// the 40 % point to 0.001′ of arc computed from 6-decimal intermediates
// (tolerance 0.001′). Its nautical mile is one minute of arc, so the example
// is radius-independent in radians.
func TestGreatCircleAviationFormulary(t *testing.T) {
	lax := geoMustPlace(t, geoDM(33, 57), -geoDM(118, 24))
	jfk := geoMustPlace(t, geoDM(40, 38), -geoDM(73, 47))

	dRad := DistanceKm(lax, jfk) / EarthRadiusKm
	if want, tol := 0.623585, 5e-7; math.Abs(dRad-want) > tol {
		t.Errorf("DistanceKm(LAX, JFK)/R = %.7f rad, want %.6f ± %g (formulary)", dRad, want, tol)
	}
	if nm, want, tol := dRad*180*60/math.Pi, 2144.0, 0.5; math.Abs(nm-want) > tol {
		t.Errorf("DistanceKm(LAX, JFK) = %.2f nm, want %g ± %g (formulary)", nm, want, tol)
	}

	tcDeg := InitialBearingDeg(lax, jfk)
	if want, tol := 1.150035, 5e-7; math.Abs(tcDeg*math.Pi/180-want) > tol {
		t.Errorf("InitialBearingDeg(LAX, JFK) = %.7f rad, want %.6f ± %g (formulary)", tcDeg*math.Pi/180, want, tol)
	}
	if want, tol := 66.0, 0.5; math.Abs(tcDeg-want) > tol {
		t.Errorf("InitialBearingDeg(LAX, JFK) = %.3f°, want %g ± %g (formulary)", tcDeg, want, tol)
	}

	// "The point 40% of the way from LAX to JFK": 38°40.167′N 101°37.570′W.
	p, err := PointAt(lax, jfk, 0.4)
	if err != nil {
		t.Fatalf("PointAt(LAX, JFK, 0.4): %v", err)
	}
	const tolMin = 0.001
	if latMin, want := (p.LatDeg()-38)*60, 40.167; math.Abs(latMin-want) > tolMin {
		t.Errorf("PointAt(LAX, JFK, 0.4) latitude = 38°%.4f′, want 38°%.3f′ ± %g′ (formulary)", latMin, want, tolMin)
	}
	if lonMin, want := (-p.LonDeg()-101)*60, 37.570; math.Abs(lonMin-want) > tolMin {
		t.Errorf("PointAt(LAX, JFK, 0.4) longitude = 101°%.4f′W, want 101°%.3f′W ± %g′ (formulary)", lonMin, want, tolMin)
	}

	// "An enroute waypoint 100nm from LAX ... along the GC to JFK":
	// 34°37′N 116°33′W, quoted to the minute (tolerance 0.5′).
	frac := (100 * math.Pi / (180 * 60)) / dRad
	w, err := PointAt(lax, jfk, frac)
	if err != nil {
		t.Fatalf("PointAt(LAX, JFK, %g): %v", frac, err)
	}
	if latMin, want := (w.LatDeg()-34)*60, 37.0; math.Abs(latMin-want) > 0.5 {
		t.Errorf("PointAt(LAX, JFK, 100 nm) latitude = 34°%.2f′, want 34°%g′ ± 0.5′ (formulary)", latMin, want)
	}
	if lonMin, want := (-w.LonDeg()-116)*60, 33.0; math.Abs(lonMin-want) > 0.5 {
		t.Errorf("PointAt(LAX, JFK, 100 nm) longitude = 116°%.2f′W, want 116°%g′W ± 0.5′ (formulary)", lonMin, want)
	}
}

// TestGreatCircle47CFR checks the distance against 47 CFR §73.190(b)
// eq. (5) written out (law of cosines, d° in degrees) and the conversion
// d = 111.18·d° km of eq. (4), quoted in methods.md §2.2 (eq. (4) itself is
// an image in the text copies read, so the constant 111.18 was not seen).
// With R = 6371 km one degree is 2π·6371/360 = 111.1949 km; 111.18 implies
// R = 6370.14 km. The two agree to 0.013 %, not to the 5 significant digits
// of 111.18; the tolerance 0.02 % covers that difference of radius.
func TestGreatCircle47CFR(t *testing.T) {
	const cfrKmPerDeg = 111.18 // 47 CFR §73.190 eq. (4), via methods.md §2.2
	const relTol = 2e-4        // R = 6371 vs the 6370.14 km implied by 111.18
	for _, c := range geoPairs {
		if c.name == "short 100 m" || c.name == "near antipodal" {
			continue // the law of cosines is ill-conditioned there
		}
		t.Run(c.name, func(t *testing.T) {
			a, b := geoMustPlace(t, c.lat1, c.lon1), geoMustPlace(t, c.lat2, c.lon2)
			r := math.Pi / 180
			// eq. (5): d° = arccos[sin aT sin aR + cos aT cos aR cos(bR − bT)]
			cosD := math.Sin(c.lat1*r)*math.Sin(c.lat2*r) + math.Cos(c.lat1*r)*math.Cos(c.lat2*r)*math.Cos((c.lon2-c.lon1)*r)
			dDeg := math.Acos(cosD) / r
			got := DistanceKm(a, b)
			if want := dDeg * 2 * math.Pi * EarthRadiusKm / 360; math.Abs(got-want) > 1e-6*want {
				t.Errorf("DistanceKm(%v, %v) = %.9g km, eq. (5)·2πR/360 = %.9g km, tolerance 1e-6 relative", a, b, got, want)
			}
			if want := cfrKmPerDeg * dDeg; math.Abs(got-want) > relTol*want {
				t.Errorf("DistanceKm(%v, %v) = %.6g km, 111.18·d° = %.6g km, tolerance %g relative", a, b, got, want, relTol)
			}
		})
	}
	// One degree of meridian with R = 6371 km: 111.19 km to the 2 decimals
	// quoted by the CFR (closed form 2π·6371/360 = 111.19493).
	one := DistanceKm(geoMustPlace(t, 0, 0), geoMustPlace(t, 1, 0))
	if want := 2 * math.Pi * 6371 / 360; math.Abs(one-want) > 1e-9 {
		t.Errorf("DistanceKm(0°,0°; 1°,0°) = %.9f km, want 2π·6371/360 = %.9f km ± 1e-9", one, want)
	}
	if rounded := math.Round(one*100) / 100; rounded == cfrKmPerDeg {
		t.Errorf("km per degree %.5f rounds to %.2f: expected 111.19, which differs from the CFR's 111.18", one, rounded)
	}
}

// TestInitialBearing: bearings against the atan2 formula written out
// (Aviation Formulary V1.47, "Course between points"), cardinal directions
// by construction, and the documented special cases. Tolerance 1e-9°,
// double-precision rounding of equivalent formulas; 1e-8° for the
// near-antipodal pair, where both lose digits to cancellation (|a + b| ≈
// 2e-5 for unit vectors a, b).
func TestInitialBearing(t *testing.T) {
	for _, c := range geoPairs {
		t.Run(c.name, func(t *testing.T) {
			tol := 1e-9
			if c.name == "near antipodal" {
				tol = 1e-8
			}
			a, b := geoMustPlace(t, c.lat1, c.lon1), geoMustPlace(t, c.lat2, c.lon2)
			got := InitialBearingDeg(a, b)
			want := geoClassicBearingDeg(c.lat1, c.lon1, c.lat2, c.lon2)
			if math.Abs(geoAngleDiffDeg(got, want)) > tol {
				t.Errorf("InitialBearingDeg(%v, %v) = %.12f°, atan2 formula %.12f°, tolerance %g°", a, b, got, want, tol)
			}
		})
	}
	special := []struct {
		name                   string
		lat1, lon1, lat2, lon2 float64
		want                   float64
	}{
		{"due north", 10, 20, 30, 20, 0},
		{"due south", 10, 20, -30, 20, 180},
		{"due east on equator", 0, 0, 0, 10, 90},
		{"due west on equator", 0, 0, 0, -10, 270},
		{"east across antimeridian", 0, 175, 0, -175, 90},
		{"identical", 12, 34, 12, 34, 0},
		{"same point via ±180", 0, 180, 0, -180, 0},
		{"from north pole", 90, 0, 10, 50, 180},
		{"from north pole, other meridian given", 90, 123, 10, 50, 180},
		{"from south pole", -90, 0, 10, 50, 0},
		{"pole to itself", 90, 0, 90, 77, 0},
		{"over the pole", 80, 0, 80, 180, 0},
	}
	for _, c := range special {
		t.Run(c.name, func(t *testing.T) {
			a, b := geoMustPlace(t, c.lat1, c.lon1), geoMustPlace(t, c.lat2, c.lon2)
			got := InitialBearingDeg(a, b)
			if math.Abs(geoAngleDiffDeg(got, c.want)) > 1e-9 || got < 0 || got >= 360 {
				t.Errorf("InitialBearingDeg(%v, %v) = %.12f°, want %g° ± 1e-9 in [0, 360)", a, b, got, c.want)
			}
		})
	}
}

// TestMidpointAndPointAt: properties that follow from the definition of the
// great circle (no external value needed): PointAt(0) = a, PointAt(1) = b,
// the point at fraction f is f·d from a and (1−f)·d from b, the midpoint is
// equidistant, and distance is symmetric. Tolerance 1e-9 km (≈ 1e-16·R
// rounding, amplified by a few operations).
func TestMidpointAndPointAt(t *testing.T) {
	const tolKm = 1e-9
	for _, c := range geoPairs {
		t.Run(c.name, func(t *testing.T) {
			a, b := geoMustPlace(t, c.lat1, c.lon1), geoMustPlace(t, c.lat2, c.lon2)
			d := DistanceKm(a, b)
			if back := DistanceKm(b, a); back != d {
				t.Errorf("DistanceKm(b, a) = %.15g, DistanceKm(a, b) = %.15g, want exactly equal", back, d)
			}
			m := Midpoint(a, b)
			da, db := DistanceKm(a, m), DistanceKm(m, b)
			if math.Abs(da-d/2) > tolKm || math.Abs(db-d/2) > tolKm {
				t.Errorf("Midpoint(%v, %v) = %v: %.12g km from a, %.12g km from b, want both %.12g ± %g", a, b, m, da, db, d/2, tolKm)
			}
			for _, f := range []float64{0, 0.1, 0.25, 0.5, 0.9, 1} {
				p, err := PointAt(a, b, f)
				if err != nil {
					t.Fatalf("PointAt(%v, %v, %g): %v", a, b, f, err)
				}
				if f == 0 && p != a || f == 1 && p != b {
					t.Errorf("PointAt(%v, %v, %g) = %v, want the end point exactly", a, b, f, p)
				}
				if got, want := DistanceKm(a, p), f*d; math.Abs(got-want) > tolKm {
					t.Errorf("PointAt(%v, %v, %g): %.12g km from a, want %.12g ± %g", a, b, f, got, want, tolKm)
				}
				if got, want := DistanceKm(p, b), (1-f)*d; math.Abs(got-want) > tolKm {
					t.Errorf("PointAt(%v, %v, %g): %.12g km from b, want %.12g ± %g", a, b, f, got, want, tolKm)
				}
			}
		})
	}
}

// TestGreatCircleDegenerate: identical and antipodal places return the
// documented values. Closed forms: antipodal distance π·R; the midpoint of
// antipodes is a quarter circumference π·R/2 from both; the bearing agrees
// with the direction PointAt moves in.
func TestGreatCircleDegenerate(t *testing.T) {
	antipodes := []struct {
		name                   string
		lat1, lon1, lat2, lon2 float64
	}{
		{"equator", 0, 0, 0, 180},
		{"poles", 90, 0, -90, 0},
		{"mid-latitude", 51.5, 0, -51.5, 180},
		{"mid-latitude west", 30, -100, -30, 80},
	}
	for _, c := range antipodes {
		t.Run("antipodal "+c.name, func(t *testing.T) {
			a, b := geoMustPlace(t, c.lat1, c.lon1), geoMustPlace(t, c.lat2, c.lon2)
			if got, want := DistanceKm(a, b), math.Pi*EarthRadiusKm; math.Abs(got-want) > 1e-6 {
				t.Errorf("DistanceKm(%v, %v) = %.9f km, want π·R = %.9f ± 1e-6", a, b, got, want)
			}
			m := Midpoint(a, b)
			if da, db, want := DistanceKm(a, m), DistanceKm(m, b), math.Pi*EarthRadiusKm/2; math.Abs(da-want) > 1e-6 || math.Abs(db-want) > 1e-6 {
				t.Errorf("Midpoint(%v, %v) = %v: %.9f and %.9f km from the ends, want π·R/2 = %.9f ± 1e-6", a, b, m, da, db, want)
			}
			brg := InitialBearingDeg(a, b)
			if a.LatDeg() == 90 {
				return // from the pole every direction is south (180°)
			}
			step, _ := PointAt(a, b, 1e-4)
			if want := geoClassicBearingDeg(a.LatDeg(), a.LonDeg(), step.LatDeg(), step.LonDeg()); math.Abs(geoAngleDiffDeg(brg, want)) > 1e-6 {
				t.Errorf("InitialBearingDeg(%v, %v) = %.9f°, PointAt moves along %.9f°, tolerance 1e-6°", a, b, brg, want)
			}
		})
	}
	a := geoMustPlace(t, 12, 34)
	if d := DistanceKm(a, a); d != 0 {
		t.Errorf("DistanceKm(a, a) = %g, want 0", d)
	}
	if m := Midpoint(a, a); DistanceKm(m, a) > 1e-9 {
		t.Errorf("Midpoint(a, a) = %v, want a = %v", m, a)
	}
	if p, _ := PointAt(a, a, 0.3); DistanceKm(p, a) > 1e-9 {
		t.Errorf("PointAt(a, a, 0.3) = %v, want a = %v", p, a)
	}
}

func TestPointAtRejectsBadFraction(t *testing.T) {
	a, b := geoMustPlace(t, 0, 0), geoMustPlace(t, 10, 10)
	for _, f := range []float64{-0.1, 1.0000001, math.NaN(), math.Inf(1)} {
		t.Run(fmt.Sprint(f), func(t *testing.T) {
			_, err := PointAt(a, b, f)
			var ie *InputError
			if !errors.As(err, &ie) || ie.Field != "fraction" {
				t.Errorf("PointAt(a, b, %g): error %v, want *InputError for \"fraction\"", f, err)
			}
		})
	}
}

// geoSea and geoLand are the grounds of the synthetic maps (values of
// Rec. ITU-R P.368's sea and land classes, as used elsewhere in the package;
// only their being different matters here).
var (
	geoSea  = Ground{SigmaSPerM: 5, EpsR: 70}
	geoLand = Ground{SigmaSPerM: 0.01, EpsR: 30}
)

// geoWestSeaMap is sea west of the meridian lon0, land east of it.
func geoWestSeaMap(lon0 float64) GroundMap {
	return func(_, lonDeg float64) Ground {
		if lonDeg < lon0 {
			return geoSea
		}
		return geoLand
	}
}

// geoMeridianCrossingLat returns the latitude at which the great circle
// through the two points crosses the meridian lon, by the formula written
// out in Aviation Formulary V1.47, "Latitude of point on GC" (invariant
// under the sign convention of longitude).
func geoMeridianCrossingLat(lat1, lon1, lat2, lon2, lon float64) float64 {
	r := math.Pi / 180
	lat1, lon1, lat2, lon2, lon = lat1*r, lon1*r, lat2*r, lon2*r, lon*r
	num := math.Sin(lat1)*math.Cos(lat2)*math.Sin(lon-lon2) - math.Sin(lat2)*math.Cos(lat1)*math.Sin(lon-lon1)
	den := math.Cos(lat1) * math.Cos(lat2) * math.Sin(lon1-lon2)
	return math.Atan(num/den) / r
}

// geoSumInOrder adds the segment lengths from the transmitter end.
func geoSumInOrder(p Path) float64 {
	var s float64
	for _, seg := range p {
		s += seg.LengthKm
	}
	return s
}

// TestSamplePathCoast: a path from sea (west of 0°) to land gives exactly
// two segments, the boundary lies within half the actual spacing h of the
// true crossing (from the formulary's meridian-crossing formula), and the
// lengths add up exactly to the great-circle distance. Paths are drawn from
// a seeded generator.
func TestSamplePathCoast(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	for i := range 200 {
		lat1, lon1 := -60+120*rng.Float64(), -5+4.9*rng.Float64() // west of 0°
		lat2, lon2 := lat1-3+6*rng.Float64(), 0.1+5*rng.Float64() // east of 0°
		step := []float64{0.5, 2, 7, 25, 100}[i%5]
		tx, rx := geoMustPlace(t, lat1, lon1), geoMustPlace(t, lat2, lon2)
		name := fmt.Sprintf("%v to %v every %g km", tx, rx, step)
		p, err := SamplePath(geoWestSeaMap(0), tx, rx, step)
		if err != nil {
			t.Fatalf("SamplePath(%s): %v", name, err)
		}
		d := DistanceKm(tx, rx)
		h := d / math.Ceil(d/step)
		if sum := geoSumInOrder(p); sum != d {
			t.Errorf("SamplePath(%s): lengths add up to %.17g km, want DistanceKm = %.17g exactly", name, sum, d)
		}
		if len(p) != 2 || p[0].Ground != geoSea || p[1].Ground != geoLand {
			t.Errorf("SamplePath(%s) = %v, want [sea, land]", name, p)
			continue
		}
		crossing := geoMustPlace(t, geoMeridianCrossingLat(lat1, lon1, lat2, lon2, 0), 0)
		trueKm := DistanceKm(tx, crossing)
		if got := p[0].LengthKm; math.Abs(got-trueKm) > h/2+1e-9 {
			t.Errorf("SamplePath(%s): boundary at %.6f km, true crossing at %.6f km, want within h/2 = %.6f km", name, got, trueKm, h/2)
		}
	}
}

// TestSamplePathStrip: a land strip between two meridians gives three
// segments with both boundaries within h/2 of the true crossings; a strip
// narrower than h that a sample hits is reported as exactly h long; a
// uniform map gives one segment of the whole length.
func TestSamplePathStrip(t *testing.T) {
	strip := func(lonA, lonB float64) GroundMap {
		return func(_, lon float64) Ground {
			if lon >= lonA && lon < lonB {
				return geoLand
			}
			return geoSea
		}
	}
	tx, rx := geoMustPlace(t, 50, -4), geoMustPlace(t, 51, 6)
	d := DistanceKm(tx, rx)

	p, err := SamplePath(strip(0, 2), tx, rx, 3)
	if err != nil {
		t.Fatalf("SamplePath(strip 0–2°E, every 3 km): %v", err)
	}
	h := d / math.Ceil(d/3)
	if len(p) != 3 || p[0].Ground != geoSea || p[1].Ground != geoLand || p[2].Ground != geoSea {
		t.Fatalf("SamplePath(strip 0–2°E, every 3 km) = %v, want [sea, land, sea]", p)
	}
	for j, lon := range []float64{0, 2} {
		x := geoMustPlace(t, geoMeridianCrossingLat(50, -4, 51, 6, lon), lon)
		trueKm := DistanceKm(tx, x)
		got := geoSumInOrder(p[:j+1])
		if math.Abs(got-trueKm) > h/2+1e-9 {
			t.Errorf("SamplePath(strip): boundary %d at %.6f km, true crossing at %.6f km, want within h/2 = %.6f km", j+1, got, trueKm, h/2)
		}
	}

	// A narrow strip (0.01° ≈ 0.7 km wide) sampled every 50 km: either
	// missed or one sample long.
	q, err := SamplePath(strip(1, 1.01), tx, rx, 50)
	if err != nil {
		t.Fatalf("SamplePath(narrow strip): %v", err)
	}
	hq := d / math.Ceil(d/50)
	switch len(q) {
	case 1:
	case 3:
		if math.Abs(q[1].LengthKm-hq) > 1e-9 {
			t.Errorf("SamplePath(narrow strip) middle segment %.9f km, want one spacing h = %.9f km", q[1].LengthKm, hq)
		}
	default:
		t.Errorf("SamplePath(narrow strip) = %v, want 1 or 3 segments", q)
	}

	u, err := SamplePath(func(_, _ float64) Ground { return geoLand }, tx, rx, 10)
	if err != nil {
		t.Fatalf("SamplePath(uniform): %v", err)
	}
	if len(u) != 1 || u[0].LengthKm != d || u[0].Ground != geoLand {
		t.Errorf("SamplePath(uniform) = %v, want one land segment of %.17g km", u, d)
	}
}

// TestSamplePathSampleCount: the map is called at n = ⌈d/step⌉ + 1 points,
// the first and last exactly at the terminals, successive samples h apart.
func TestSamplePathSampleCount(t *testing.T) {
	tx, rx := geoMustPlace(t, 48.8566, 2.3522), geoMustPlace(t, 41.9028, 12.4964)
	d := DistanceKm(tx, rx)
	for _, step := range []float64{1, 20, d / 49 * (1 + 1e-12), d, 2 * d} {
		var got []Place
		rec := func(lat, lon float64) Ground {
			got = append(got, geoMustPlace(t, lat, lon))
			return geoLand
		}
		if _, err := SamplePath(rec, tx, rx, step); err != nil {
			t.Fatalf("SamplePath(step %g): %v", step, err)
		}
		wantN := int(math.Ceil(d/step)) + 1
		if len(got) != wantN {
			t.Errorf("SamplePath(step %g km over %g km): %d samples, want ⌈d/step⌉+1 = %d", step, d, len(got), wantN)
			continue
		}
		if got[0] != tx || got[len(got)-1] != rx {
			t.Errorf("SamplePath(step %g): end samples %v, %v, want %v, %v exactly", step, got[0], got[len(got)-1], tx, rx)
		}
		h := d / float64(wantN-1)
		for i := 1; i < len(got); i++ {
			if s := DistanceKm(got[i-1], got[i]); math.Abs(s-h) > 1e-9 {
				t.Errorf("SamplePath(step %g): samples %d and %d are %.12g km apart, want h = %.12g ± 1e-9", step, i, i+1, s, h)
				break
			}
		}
	}
}

// TestSamplePathExactSum: over many seeded random paths and steps, with a
// map that changes ground often, the lengths summed from either end equal
// DistanceKm exactly, every length is > 0, neighbours differ in ground, and
// Path.LengthKm agrees to 1e-12 relative.
func TestSamplePathExactSum(t *testing.T) {
	checker := func(lat, lon float64) Ground {
		if int(math.Floor(lat/0.7)+math.Floor(lon/1.3))%2 == 0 {
			return geoSea
		}
		return geoLand
	}
	rng := rand.New(rand.NewPCG(3, 4))
	for range 500 {
		tx := geoMustPlace(t, -90+180*rng.Float64(), -180+360*rng.Float64())
		rx := geoMustPlace(t, -90+180*rng.Float64(), -180+360*rng.Float64())
		step := math.Exp(math.Log(0.5) + rng.Float64()*math.Log(4000))
		p, err := SamplePath(checker, tx, rx, step)
		if err != nil {
			t.Fatalf("SamplePath(%v, %v, %g): %v", tx, rx, step, err)
		}
		d := DistanceKm(tx, rx)
		if sum := geoSumInOrder(p); sum != d {
			t.Errorf("SamplePath(%v, %v, %g): lengths sum to %.17g, want %.17g exactly", tx, rx, step, sum, d)
		}
		if sum := geoSumInOrder(p.Reversed()); sum != d {
			t.Errorf("SamplePath(%v, %v, %g): lengths summed from the receiver give %.17g, want %.17g exactly", tx, rx, step, sum, d)
		}
		if l := p.LengthKm(); math.Abs(l-d) > 1e-12*d {
			t.Errorf("SamplePath(%v, %v, %g).LengthKm() = %.17g, want %.17g ± 1e-12 relative", tx, rx, step, l, d)
		}
		for i, s := range p {
			if !(s.LengthKm > 0) || i > 0 && s.Ground == p[i-1].Ground {
				t.Errorf("SamplePath(%v, %v, %g): segment %d = %+v (previous %+v), want length > 0 and a change of ground", tx, rx, step, i+1, s, p[max(i-1, 0)])
				break
			}
		}
	}
}

func TestSamplePathErrors(t *testing.T) {
	tx, rx := geoMustPlace(t, 50, 0), geoMustPlace(t, 52, 1)
	land := func(_, _ float64) Ground { return geoLand }
	cases := []struct {
		name      string
		m         GroundMap
		tx, rx    Place
		step      float64
		wantField string // "" for a non-InputError error
	}{
		{"zero step", land, tx, rx, 0, "sampling step"},
		{"negative step", land, tx, rx, -1, "sampling step"},
		{"NaN step", land, tx, rx, math.NaN(), "sampling step"},
		{"infinite step", land, tx, rx, math.Inf(1), "sampling step"},
		{"too many samples", land, tx, rx, 1e-4, "sampling step"},
		{"same place", land, tx, tx, 1, "distance"},
		{"invalid ground", func(_, _ float64) Ground { return Ground{} }, tx, rx, 1, "sigma"},
		{"nil map", nil, tx, rx, 1, ""},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			p, err := SamplePath(c.m, c.tx, c.rx, c.step)
			if err == nil {
				t.Fatalf("SamplePath(%s) = %v, want an error", c.name, p)
			}
			var ie *InputError
			if c.wantField == "" {
				return
			}
			if !errors.As(err, &ie) || ie.Field != c.wantField {
				t.Errorf("SamplePath(%s): error %v, want *InputError for %q", c.name, err, c.wantField)
			}
		})
	}
}

// TestGeomagneticLatitude: methods.md §2.8 check values, [C] regression
// values of the verified formula (47 CFR §73.190 eq. (3)) computed by the
// sheet's author with mpmath and quoted to 0.01° (tolerance 0.005°), and
// closed forms of eq. (3): the pole itself (90°), its antipode (−90°), the
// pole's meridian at the equator (90° − 78.5° = 11.5°), and the point
// 11.5° S on that meridian (sin(−11.5°)sin 78.5° + cos 11.5° cos 78.5° =
// cos 90° = 0).
func TestGeomagneticLatitude(t *testing.T) {
	cases := []struct {
		name     string
		lat, lon float64
		want     float64
		tol      float64
	}{
		{"[C] 51.5N 0", 51.5, 0, 54.23, 0.005},
		{"[C] 40N 100W", 40, -100, 49.53, 0.005},
		{"[C] 0 0", 0, 0, 4.10, 0.005},
		{"[C] 33.9S 151.2E", -33.9, 151.2, -42.29, 0.005},
		{"[C] 35.7N 139.7E", 35.7, 139.7, 25.46, 0.005},
		{"closed form: dipole pole", 78.5, -69, 90, 1e-9},
		{"closed form: antipode of pole", -78.5, 111, -90, 1e-9},
		{"closed form: equator under pole", 0, -69, 11.5, 1e-9},
		{"closed form: equator opposite pole", 0, 111, -11.5, 1e-9},
		{"closed form: geomagnetic equator", -11.5, -69, 0, 1e-9},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			p := geoMustPlace(t, c.lat, c.lon)
			if got := GeomagneticLatitudeDeg(p); math.Abs(got-c.want) > c.tol {
				t.Errorf("GeomagneticLatitudeDeg(%v) = %.6f°, want %g ± %g", p, got, c.want, c.tol)
			}
		})
	}
}

// TestGeomagneticLatitudeEq3: over a grid, the vector form used by the code
// agrees with 47 CFR §73.190 eq. (3) written out (arcsin form), away from
// the poles of the dipole where arcsin is ill-conditioned. Tolerance 1e-9°.
func TestGeomagneticLatitudeEq3(t *testing.T) {
	r := math.Pi / 180
	for lat := -90.0; lat <= 90; lat += 7.5 {
		for lon := -180.0; lon <= 180; lon += 15 {
			p := geoMustPlace(t, lat, lon)
			x := math.Sin(lat*r)*math.Sin(78.5*r) + math.Cos(lat*r)*math.Cos(78.5*r)*math.Cos((69+lon)*r)
			want := math.Asin(x) / r
			if math.Abs(want) > 85 {
				continue
			}
			if got := GeomagneticLatitudeDeg(p); math.Abs(got-want) > 1e-9 {
				t.Errorf("GeomagneticLatitudeDeg(%v) = %.12f°, eq. (3) gives %.12f°, tolerance 1e-9°", p, got, want)
			}
		}
	}
}

// TestMagneticDip: the dipole relation tan I = 2 tan Φ (closed form):
// I(0) = 0, I(45°) = atan 2 = 63.434948822922°, I(±90°) = ±90°, odd in Φ;
// and MagneticDipDeg obeys it over a grid. Tolerance 1e-9°.
func TestMagneticDip(t *testing.T) {
	cases := []struct{ phi, want float64 }{
		{0, 0},
		{45, math.Atan(2) * 180 / math.Pi},
		{-45, -math.Atan(2) * 180 / math.Pi},
		{90, 90},
		{-90, -90},
		{11.5, math.Atan(2*math.Tan(11.5*math.Pi/180)) * 180 / math.Pi},
	}
	for _, c := range cases {
		if got := dipFromGeomagneticDeg(c.phi); math.Abs(got-c.want) > 1e-9 {
			t.Errorf("dipFromGeomagneticDeg(%g) = %.12f°, want %.12f° ± 1e-9", c.phi, got, c.want)
		}
	}
	for lat := -80.0; lat <= 80; lat += 10 {
		for lon := -180.0; lon <= 180; lon += 30 {
			p := geoMustPlace(t, lat, lon)
			phi := GeomagneticLatitudeDeg(p)
			want := math.Atan(2*math.Tan(phi*math.Pi/180)) * 180 / math.Pi
			if got := MagneticDipDeg(p); math.Abs(got-want) > 1e-9 {
				t.Errorf("MagneticDipDeg(%v) = %.12f°, atan(2 tan %.6f°) = %.12f°, tolerance 1e-9", p, got, phi, want)
			}
		}
	}
	if got := MagneticDipDeg(geoMustPlace(t, 78.5, -69)); math.Abs(got-90) > 1e-6 {
		t.Errorf("MagneticDipDeg(dipole pole) = %.9f°, want 90 ± 1e-6", got)
	}
}

// TestGeoNoNaNDenseGrid: every function returns finite, in-range values over
// a grid that includes both poles, the antimeridian (±180) and exact
// antipodes.
func TestGeoNoNaNDenseGrid(t *testing.T) {
	var places []Place
	for lat := -90.0; lat <= 90; lat += 15 {
		for lon := -180.0; lon <= 180; lon += 30 {
			places = append(places, geoMustPlace(t, lat, lon))
		}
	}
	places = append(places, geoMustPlace(t, 89.9999999, 45), geoMustPlace(t, -89.9999999, -135), geoMustPlace(t, 78.5, -69), geoMustPlace(t, -78.5, 111))
	bad := func(v float64) bool { return math.IsNaN(v) || math.IsInf(v, 0) }
	land := func(_, _ float64) Ground { return geoLand }
	for _, a := range places {
		if g, i := GeomagneticLatitudeDeg(a), MagneticDipDeg(a); bad(g) || bad(i) || math.Abs(g) > 90 || math.Abs(i) > 90 {
			t.Fatalf("GeomagneticLatitudeDeg(%v) = %g, MagneticDipDeg = %g, want finite in [−90, 90]", a, g, i)
		}
		for _, b := range places {
			d := DistanceKm(a, b)
			brg := InitialBearingDeg(a, b)
			m := Midpoint(a, b)
			p, err := PointAt(a, b, 0.3)
			if err != nil || bad(d) || d < 0 || d > math.Pi*EarthRadiusKm || bad(brg) || brg < 0 || brg >= 360 ||
				bad(m.LatDeg()) || bad(m.LonDeg()) || bad(p.LatDeg()) || bad(p.LonDeg()) {
				t.Fatalf("(%v, %v): distance %g, bearing %g, midpoint %v, PointAt(0.3) %v, %v: want finite, in range", a, b, d, brg, m, p, err)
			}
			if _, err := NewPlace(m.LatDeg(), m.LonDeg()); err != nil {
				t.Fatalf("Midpoint(%v, %v) = %v is not a valid place: %v", a, b, m, err)
			}
			if d > 1 {
				path, err := SamplePath(land, a, b, 1000)
				if err != nil || len(path) != 1 || path[0].LengthKm != d {
					t.Fatalf("SamplePath(%v, %v, 1000) = %v, %v; want one segment of %g km", a, b, path, err, d)
				}
			}
		}
	}
}

// ExampleDistanceKm: Los Angeles (LAX) to New York (JFK), the worked example
// of the Aviation Formulary, on the 6371 km sphere.
func ExampleDistanceKm() {
	lax, _ := NewPlace(33+57.0/60, -(118 + 24.0/60))
	jfk, _ := NewPlace(40+38.0/60, -(73 + 47.0/60))
	fmt.Printf("%.1f km, initial bearing %.1f°\n", DistanceKm(lax, jfk), InitialBearingDeg(lax, jfk))
	// Output: 3972.9 km, initial bearing 65.9°
}

// ExampleSamplePath: sea west of the Greenwich meridian, land east of it.
func ExampleSamplePath() {
	seaWest := func(_, lonDeg float64) Ground {
		if lonDeg < 0 {
			return Ground{SigmaSPerM: 5, EpsR: 70}
		}
		return Ground{SigmaSPerM: 0.01, EpsR: 30}
	}
	tx, _ := NewPlace(50, -2)
	rx, _ := NewPlace(51, 3)
	path, err := SamplePath(seaWest, tx, rx, 5)
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, s := range path {
		fmt.Printf("%.0f km of %v\n", s.LengthKm, s.Ground)
	}
	// Output:
	// 151 km of σ=5 S/m εr=70
	// 220 km of σ=0.01 S/m εr=30
}

// ExampleGeomagneticLatitudeDeg: London's geomagnetic latitude and dipole
// dip.
func ExampleGeomagneticLatitudeDeg() {
	london, _ := NewPlace(51.5, 0)
	fmt.Printf("Φ = %.2f°, I = %.1f°\n", GeomagneticLatitudeDeg(london), MagneticDipDeg(london))
	// Output: Φ = 54.23°, I = 70.2°
}

// geoBenchPlaces are varied inputs for the benchmarks.
var geoBenchPlaces = [][2]float64{
	{51.5, -0.13}, {48.86, 2.35}, {40.71, -74.0}, {-33.87, 151.21},
	{35.68, 139.69}, {55.75, 37.62}, {-23.55, -46.63}, {1.35, 103.82},
	{64.15, -21.94}, {19.43, -99.13}, {-1.29, 36.82}, {60.17, 24.94},
	{37.77, -122.42}, {-41.29, 174.78}, {30.04, 31.24}, {45.5, -73.57},
}

func BenchmarkDistance(b *testing.B) {
	ps := make([]Place, len(geoBenchPlaces))
	for i, c := range geoBenchPlaces {
		ps[i] = geoMustPlace(b, c[0], c[1])
	}
	b.ReportAllocs()
	var sink float64
	i := 0
	for b.Loop() {
		sink += DistanceKm(ps[i%len(ps)], ps[(i+5)%len(ps)])
		i++
	}
	geoBenchSink = sink
}

var geoBenchSink float64

// BenchmarkSamplePath: 50 samples per path (step d/49), on a uniform map
// and on a map with one coast, over varied paths.
func BenchmarkSamplePath(b *testing.B) {
	type job struct {
		tx, rx Place
		step   float64
	}
	var jobs []job
	for i := range 8 {
		tx := geoMustPlace(b, geoBenchPlaces[i][0], geoBenchPlaces[i][1])
		rx := geoMustPlace(b, geoBenchPlaces[i][0]+3, geoBenchPlaces[i][1]+4)
		jobs = append(jobs, job{tx, rx, DistanceKm(tx, rx) / 49 * (1 + 1e-9)})
	}
	maps := []struct {
		name string
		m    GroundMap
	}{
		{"uniform", func(_, _ float64) Ground { return geoLand }},
		{"coast", func(_, lon float64) Ground {
			if math.Mod(lon+360, 4) < 2 {
				return geoSea
			}
			return geoLand
		}},
	}
	for _, mp := range maps {
		b.Run(mp.name, func(b *testing.B) {
			b.ReportAllocs()
			i := 0
			for b.Loop() {
				j := jobs[i%len(jobs)]
				p, err := SamplePath(mp.m, j.tx, j.rx, j.step)
				if err != nil {
					b.Fatal(err)
				}
				geoBenchSink += p[0].LengthKm
				i++
			}
		})
	}
}
