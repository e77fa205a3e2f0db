package screen

import (
	"math"
	"testing"
)

// TestViewportRoundTrip: ToMap inverts ToScreen, and zooming keeps the
// point under the cursor in place (the definition of zoom-about-a-point).
func TestViewportRoundTrip(t *testing.T) {
	v := Viewport{Area: Rect{0, 30, 800, 600}, CentreLat: -47, CentreLon: -126, PxPerDeg: 100}
	for _, p := range [][2]float64{{-47, -126}, {-45.5, -129}, {-49, -122.2}} {
		x, y := v.ToScreen(p[0], p[1])
		lat, lon := v.ToMap(x, y)
		if math.Abs(lat-p[0]) > 1e-9 || math.Abs(lon-p[1]) > 1e-9 {
			t.Errorf("round trip %v → (%g, %g) → (%g, %g)", p, x, y, lat, lon)
		}
	}
	lat, lon := v.ToMap(200, 100)
	v.ZoomAt(200, 100, 1.7)
	x, y := v.ToScreen(lat, lon)
	if math.Abs(x-200) > 1e-6 || math.Abs(y-100) > 1e-6 {
		t.Errorf("after zoom the point moved to (%g, %g), want (200, 100)", x, y)
	}
	// The centre pixel shows the centre.
	if lat, lon := v.ToMap(400, 330); math.Abs(lat-v.CentreLat) > 1e-9 || math.Abs(lon-v.CentreLon) > 1e-9 {
		t.Errorf("centre pixel shows (%g, %g)", lat, lon)
	}
	// A drag moves the map with the pointer.
	lat, lon = v.ToMap(300, 300)
	v.Pan(40, 0)
	if x, y := v.ToScreen(lat, lon); math.Abs(x-340) > 1e-6 || math.Abs(y-300) > 1e-6 {
		t.Errorf("after pan east the point is at (%g, %g), want (340, 300)", x, y)
	}
	lat, lon = v.ToMap(400, 330) // on the central meridian: x does not depend on cos(lat₀)
	v.Pan(0, -25)
	if x, y := v.ToScreen(lat, lon); math.Abs(x-400) > 1e-6 || math.Abs(y-305) > 1e-6 {
		t.Errorf("after pan north the point is at (%g, %g), want (400, 305)", x, y)
	}
}

// TestAspect: at latitude 60° a degree of longitude is half a degree of
// latitude on the sphere (cos 60° = 1/2).
func TestAspect(t *testing.T) {
	v := Viewport{Area: Rect{0, 0, 800, 600}, CentreLat: 60, CentreLon: 10, PxPerDeg: 100}
	x0, _ := v.ToScreen(60, 10)
	x1, _ := v.ToScreen(60, 11)
	if d := x1 - x0; math.Abs(d-50) > 1e-9 {
		t.Errorf("1° of longitude at 60°: %g px, want 50", d)
	}
}

// TestScaleBar: a degree of latitude is 111.19 km on the 6371 km sphere
// (2π·6371/360); the bar is a round 1-2-5 length that fits.
func TestScaleBar(t *testing.T) {
	if math.Abs(KmPerDeg-111.195) > 0.001 {
		t.Errorf("KmPerDeg = %g, want 111.195", KmPerDeg)
	}
	v := Viewport{Area: Rect{0, 0, 800, 600}, PxPerDeg: KmPerDeg} // 1 km per px
	for _, c := range []struct{ max, km float64 }{{150, 100}, {250, 200}, {99, 50}, {600, 500}, {1000.5, 1000}} {
		km, px := v.ScaleBar(c.max)
		if math.Abs(km-c.km) > 1e-9 || px > c.max || math.Abs(px-km) > 1e-9 {
			t.Errorf("ScaleBar(%g) = %g km, %g px; want %g km", c.max, km, px, c.km)
		}
	}
}

func TestLayout(t *testing.T) {
	for _, s := range [][2]float64{{1280, 800}, {900, 600}, {2560, 1400}} {
		l := NewLayout(s[0], s[1])
		if l.Map.W+l.Side.W != s[0] || l.Side.W < SideMin || l.Side.W > SideMax {
			t.Errorf("%v: map %g + side %g", s, l.Map.W, l.Side.W)
		}
		if l.Results.Y+l.Results.H > s[1]+1e-9 || l.Results.H < RowH {
			t.Errorf("%v: results %+v beyond the screen", s, l.Results)
		}
		for _, p := range l.Plots {
			if !l.Map.Contains(p.X, p.Y) || !l.Map.Contains(p.X+p.W-1, p.Y+p.H-1) {
				t.Errorf("%v: plot %+v outside the map %+v", s, p, l.Map)
			}
		}
	}
}

func TestRamp(t *testing.T) {
	_, _, _, a0 := Ramp(0, 20)
	r1, g1, b1, _ := Ramp(20, 20)
	r2, g2, b2, _ := Ramp(40, 20)
	if a0 == 0 || r1 != r2 || g1 != g2 || b1 != b2 {
		t.Errorf("ramp: none alpha %d; top %d,%d,%d vs beyond %d,%d,%d", a0, r1, g1, b1, r2, g2, b2)
	}
}
