package main

import (
	"math"
	"strings"
	"testing"

	"earshot/assets/internal/maskfile"
)

// sq is a clockwise (exterior) rectangle lon [w, e] × lat [s, n], or an
// anticlockwise one (a hole) when hole is set; longitudes may run past 180°
// and are folded back into [-180°, 180°] as they would be stored.
func sq(w, s, e, n float64, hole bool) ring {
	fold := func(x float64) float64 {
		if x > 180 {
			return x - 360
		}
		return x
	}
	pts := []point{{fold(w), s}, {fold(w), n}, {fold(e), n}, {fold(e), s}, {fold(w), s}}
	if hole {
		pts = []point{{fold(w), s}, {fold(e), s}, {fold(e), n}, {fold(w), n}, {fold(w), s}}
	}
	return ring{pts: pts, hole: hole, name: "test"}
}

// band is a polar ring along latitude lat, going east or west, stored as
// world-atlas stores Antarctica: starting at -180° and closing at -180°.
func band(lat float64, east, hole bool) ring {
	var pts []point
	for lon := -180.0; lon < 180; lon += 30 {
		pts = append(pts, point{lon, lat})
	}
	pts = append(pts, point{-180, lat})
	if !east {
		for i, j := 0, len(pts)-1; i < j; i, j = i+1, j-1 {
			pts[i], pts[j] = pts[j], pts[i]
		}
	}
	return ring{pts: pts, hole: hole, name: "band"}
}

func count(g *maskfile.Grid) int {
	n := 0
	for r := range g.Rows {
		n += g.CountRow(r)
	}
	return n
}

// cell returns the grid value at the cell containing (lat, lon).
func cell(g *maskfile.Grid, lat, lon float64) bool {
	r := int((lat + 90) * float64(g.CellsPerDeg))
	c := int((lon + 180) * float64(g.CellsPerDeg))
	return g.Get(r, c)
}

// TestRasterCounts: cell counts of shapes whose cell-centre content is an
// exact closed form (rectangles with corners on cell edges hold
// width·height·cpd² cell centres).
func TestRasterCounts(t *testing.T) {
	cases := []struct {
		name  string
		cpd   int
		rings []ring
		want  int
		land  [][2]float64 // (lat, lon) that must be land
		sea   [][2]float64 // and sea
	}{
		{"square 10° at 2/deg", 2, []ring{sq(10, 10, 20, 20, false)}, 10 * 10 * 4,
			[][2]float64{{15, 15}, {10.1, 10.1}, {19.9, 19.9}}, [][2]float64{{9.9, 15}, {20.1, 15}, {15, 20.1}}},
		{"square with a 2° hole", 2, []ring{sq(10, 10, 20, 20, false), sq(12, 12, 14, 14, true)}, 400 - 16,
			[][2]float64{{11, 11}, {15, 15}}, [][2]float64{{13, 13}}},
		{"across the antimeridian", 1, []ring{sq(170, -5, 190, 5, false)}, 20 * 10,
			[][2]float64{{0, 175}, {0, -175}, {0, 179.5}, {0, -179.5}}, [][2]float64{{0, 0}, {0, 165}, {0, -165}}},
		{"touching the antimeridian from both sides", 1, []ring{sq(175, 0, 180, 3, false), sq(-180, 0, -175, 3, false)}, 30,
			[][2]float64{{1, 179.5}, {1, -179.5}}, [][2]float64{{1, 174.5}, {1, -174.5}}},
		{"degenerate sliver", 4, []ring{{pts: []point{{0, 0}, {0, 1}, {0, 0}, {0, 0}}, name: "sliver"}}, 0, nil, nil},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			g, _, err := rasterize(tc.rings, tc.cpd)
			if err != nil {
				t.Fatalf("rasterize: %v", err)
			}
			if n := count(g); n != tc.want {
				t.Errorf("land cells = %d, want %d", n, tc.want)
			}
			for _, p := range tc.land {
				if !cell(g, p[0], p[1]) {
					t.Errorf("cell at (%g, %g) is sea, want land", p[0], p[1])
				}
			}
			for _, p := range tc.sea {
				if cell(g, p[0], p[1]) {
					t.Errorf("cell at (%g, %g) is land, want sea", p[0], p[1])
				}
			}
		})
	}
}

// TestPolarRings: a ring round the pole encloses the cap on its inside as set
// by the winding convention, and the area-weighted land fraction matches the
// closed form for a spherical cap or zone:
//
//	area(cap poleward of latitude φ) / area(sphere) = (1 − sin|φ|) / 2
//	area(zone between φ₁ and φ₂)   / area(sphere) = |sin φ₂ − sin φ₁| / 2
//	area(lon span Δλ of that zone) / area(sphere) = Δλ/360° · |sin φ₂ − sin φ₁| / 2
//
// Tolerance 1e-4: landFraction weights each row by the cosine at its centre
// (midpoint rule), whose error for 1° rows is of order (π/180)²/24 ≈ 1e-5 of
// the total; the edges of the shapes lie on row edges.
func TestPolarRings(t *testing.T) {
	sin := func(deg float64) float64 { return math.Sin(deg * math.Pi / 180) }
	cases := []struct {
		name      string
		rings     []ring
		want      float64
		land, sea float64 // a latitude that must be all land, all sea
	}{
		{"exterior going east: south cap", []ring{band(-60, true, false)}, (1 - sin(60)) / 2, -75, 0},
		{"exterior going west: north cap", []ring{band(60, false, false)}, (1 - sin(60)) / 2, 75, 0},
		{"hole going west inside it: zone", []ring{band(-60, true, false), band(-80, false, true)}, (sin(80) - sin(60)) / 2, -70, -85},
		{"with an island", []ring{band(-60, true, false), sq(0, 0, 10, 10, false)}, (1-sin(60))/2 + 10.0/360*(sin(10)-sin(0))/2, -75, 20},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			g, st, err := rasterize(tc.rings, 1)
			if err != nil {
				t.Fatalf("rasterize: %v", err)
			}
			want := tc.want
			if math.Abs(st.landFraction-want) > 1e-4 {
				t.Errorf("land fraction = %.6f, want %.6f ± 1e-4", st.landFraction, want)
			}
			for c := range g.Cols {
				lon := -180 + float64(c) + 0.5
				if !cell(g, tc.land, lon) {
					t.Fatalf("cell (%g, %g) is sea, want land", tc.land, lon)
				}
				if cell(g, tc.sea, lon) {
					t.Fatalf("cell (%g, %g) is land, want sea", tc.sea, lon)
				}
			}
		})
	}
}

// TestRasterErrors: data that break the assumptions are refused.
func TestRasterErrors(t *testing.T) {
	anticlockwise := sq(10, 10, 20, 20, true)
	anticlockwise.hole = false
	twice := band(-60, true, false)
	twice.pts = append(twice.pts[:len(twice.pts)-1], twice.pts...)
	cases := []struct {
		name string
		r    ring
		cpd  int
		want string
	}{
		{"exterior wound anticlockwise", anticlockwise, 1, "wound against"},
		{"ring round the pole twice", twice, 1, "times round the pole"},
		{"cells per degree 0", sq(0, 0, 1, 1, false), 0, "cellsPerDeg"},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			_, _, err := rasterize([]ring{tc.r}, tc.cpd)
			if err == nil || !strings.Contains(err.Error(), tc.want) {
				t.Fatalf("rasterize error = %v, want one mentioning %q", err, tc.want)
			}
		})
	}
}
