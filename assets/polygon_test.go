package assets

import (
	"strings"
	"testing"
)

// The expected answers below are geometry read off the shapes by hand
// (each case says why); no scenario data is involved.
func TestPolygonContains(t *testing.T) {
	square := [][2]float64{{0, 0}, {0, 10}, {10, 10}, {10, 0}}
	// A "U" open to the north: arms lon 0–3 and 7–10, base lat 0–3.
	concave := [][2]float64{{0, 0}, {0, 10}, {10, 10}, {10, 7}, {3, 7}, {3, 3}, {10, 3}, {10, 0}}
	// A 10° square with a 4° square hole, as one ring: the outer ring, a
	// bridge from (0, 0) to (3, 3), the inner ring the other way round, and
	// back along the same bridge (the closing edge).
	holed := [][2]float64{{0, 0}, {0, 10}, {10, 10}, {10, 0}, {0, 0}, {3, 3}, {7, 3}, {7, 7}, {3, 7}, {3, 3}}
	// A 2° × 2° square across the 180° meridian, written with both signs.
	dateline := [][2]float64{{-10, 179}, {-10, -179}, {-12, -179}, {-12, 179}}
	// The same square written with a vertex exactly on the meridian.
	datelineOn := [][2]float64{{-10, 179}, {-10, 180}, {-10, -179}, {-12, -179}, {-12, -180}, {-12, 179}}
	cases := []struct {
		name     string
		poly     [][2]float64
		lat, lon float64
		want     bool
	}{
		{"square centre", square, 5, 5, true},
		{"square near corner", square, 0.01, 9.99, true},
		{"square north of it", square, 10.01, 5, false},
		{"square west of it", square, 5, -0.01, false},
		{"square east, beyond the ray's edges", square, 5, 20, false},
		{"U left arm", concave, 6, 1.5, true},
		{"U right arm", concave, 6, 8.5, true},
		{"U base", concave, 1.5, 5, true},
		{"U notch (concave part)", concave, 6, 5, false},
		{"U notch on the ray through a reflex vertex's latitude", concave, 3.0001, 5, false},
		{"U beyond the notch", concave, 11, 5, false},
		{"hole centre", holed, 5, 5, false},
		{"hole, near its edge inside", holed, 6.9, 6.9, false},
		{"ring west of the hole", holed, 5, 1, true},
		{"ring east of the hole", holed, 5, 8.5, true},
		{"ring north of the hole", holed, 8.5, 5, true},
		{"ring south of the hole", holed, 1.5, 5, true},
		{"outside the ring", holed, 5, 11, false},
		{"dateline, east side", dateline, -11, 179.5, true},
		{"dateline, west side", dateline, -11, -179.5, true},
		{"dateline, on +180", dateline, -11, 180, true},
		{"dateline, on -180", dateline, -11, -180, true},
		{"dateline, 1° further east", dateline, -11, -178, false},
		{"dateline, 1° further west", dateline, -11, 178, false},
		{"dateline, far side of the Earth", dateline, -11, 0, false},
		{"dateline, north of it", dateline, -9.5, 179.5, false},
		{"dateline vertex on 180, east side", datelineOn, -11, -179.5, true},
		{"dateline vertex on 180, west side", datelineOn, -11, 179.5, true},
		{"dateline vertex on 180, outside", datelineOn, -11, 177, false},
	}
	for _, c := range cases {
		got, err := PolygonContains(c.poly, c.lat, c.lon)
		if err != nil || got != c.want {
			t.Errorf("%s: PolygonContains(%v, %g, %g) = %v, %v; want %v", c.name, c.poly, c.lat, c.lon, got, err, c.want)
		}
	}
}

func TestPolygonContainsErrors(t *testing.T) {
	cases := []struct {
		name string
		poly [][2]float64
		want string
	}{
		{"two vertices", [][2]float64{{0, 0}, {1, 1}}, "polygon: must have at least 3 vertices, got 2"},
		{"lat out of range", [][2]float64{{0, 0}, {1, 1}, {-91, 0}}, "polygon[2][0]: latitude must be between -90 and 90 degrees, got -91"},
		{"180° edge", [][2]float64{{0, 10}, {0, -170}, {5, 0}}, "polygon[0]: the edge to the next vertex spans 180 degrees"},
		{"180° closing edge", [][2]float64{{0, 10}, {5, 50}, {0, -170}}, "polygon[2]: the edge back to the first vertex spans 180 degrees"},
		// Four edges of 90° each wind once round the south pole.
		{"round a pole", [][2]float64{{-80, 0}, {-80, 90}, {-80, 180}, {-80, -90}}, "polygon: must not go round a pole"},
	}
	for _, c := range cases {
		_, err := PolygonContains(c.poly, 0, 0)
		if err == nil || !strings.HasPrefix(err.Error(), c.want) {
			t.Errorf("%s: PolygonContains(%v) error = %v, want %q…", c.name, c.poly, err, c.want)
		}
	}
}

func BenchmarkGroundMap(b *testing.B) {
	s, err := Demo()
	if err != nil {
		b.Fatal(err)
	}
	gm := s.GroundMap(nil)
	b.ReportAllocs()
	i := 0
	for b.Loop() {
		gm(-47+float64(i%100)*0.01, -126+float64(i%37)*0.05)
		i++
	}
}
