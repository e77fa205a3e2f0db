// Package screen holds the app's pixel geometry, free of any graphics
// library: the map viewport (degrees ↔ pixels), the scale bar, and the
// layout of the panels. It is tested natively.
package screen

import "math"

// Rect is a rectangle in screen pixels: [X, X+W) × [Y, Y+H).
type Rect struct{ X, Y, W, H float64 }

// Contains reports whether (x, y) is inside r.
func (r Rect) Contains(x, y float64) bool {
	return x >= r.X && x < r.X+r.W && y >= r.Y && y < r.Y+r.H
}

// Viewport maps latitude and longitude to pixels of a map area by the
// equirectangular projection about the view's centre latitude: x grows
// east by PxPerDeg·cos(lat₀) per degree of longitude, y grows south by
// PxPerDeg per degree of latitude. At the scale of a listening region
// (hundreds of km) its distortion is a few per cent, enough to point
// at places.
type Viewport struct {
	Area             Rect
	CentreLat        float64
	CentreLon        float64
	PxPerDeg         float64 // pixels per degree of latitude
	MinPxPerDeg, Max float64 // zoom limits (0: 2 and 4000)
}

func (v *Viewport) kx() float64 { return v.PxPerDeg * math.Cos(v.CentreLat*math.Pi/180) }

// ToScreen returns the pixel of (lat, lon).
func (v *Viewport) ToScreen(latDeg, lonDeg float64) (x, y float64) {
	return v.Area.X + v.Area.W/2 + (lonDeg-v.CentreLon)*v.kx(), v.Area.Y + v.Area.H/2 - (latDeg-v.CentreLat)*v.PxPerDeg
}

// ToMap returns the latitude and longitude at pixel (x, y).
func (v *Viewport) ToMap(x, y float64) (latDeg, lonDeg float64) {
	return v.CentreLat - (y-v.Area.Y-v.Area.H/2)/v.PxPerDeg, v.CentreLon + (x-v.Area.X-v.Area.W/2)/v.kx()
}

// Pan moves the view so that the map follows a drag of (dx, dy) pixels.
func (v *Viewport) Pan(dx, dy float64) {
	v.CentreLon -= dx / v.kx()
	v.CentreLat += dy / v.PxPerDeg
	v.clamp()
}

// ZoomAt zooms by factor about pixel (x, y), which keeps its place.
func (v *Viewport) ZoomAt(x, y, factor float64) {
	lat, lon := v.ToMap(x, y)
	lo, hi := v.MinPxPerDeg, v.Max
	if lo <= 0 {
		lo = 2
	}
	if hi <= 0 {
		hi = 4000
	}
	v.PxPerDeg = math.Max(lo, math.Min(hi, v.PxPerDeg*factor))
	// Put (lat, lon) back under (x, y).
	v.CentreLat = lat + (y-v.Area.Y-v.Area.H/2)/v.PxPerDeg
	v.CentreLon = lon - (x-v.Area.X-v.Area.W/2)/v.kx()
	v.clamp()
}

func (v *Viewport) clamp() {
	v.CentreLat = math.Max(-85, math.Min(85, v.CentreLat))
	v.CentreLon = math.Max(-180, math.Min(180, v.CentreLon))
}

// Fit centres the view on a box and zooms so that it fills the area.
func (v *Viewport) Fit(minLat, maxLat, minLon, maxLon float64) {
	v.CentreLat, v.CentreLon = (minLat+maxLat)/2, (minLon+maxLon)/2
	c := math.Cos(v.CentreLat * math.Pi / 180)
	v.PxPerDeg = math.Min(v.Area.H/math.Max(maxLat-minLat, 1e-3), v.Area.W/math.Max((maxLon-minLon)*c, 1e-3))
	v.clamp()
}

// Bounds returns the latitudes and longitudes the area shows.
func (v *Viewport) Bounds() (minLat, maxLat, minLon, maxLon float64) {
	maxLat, minLon = v.ToMap(v.Area.X, v.Area.Y)
	minLat, maxLon = v.ToMap(v.Area.X+v.Area.W, v.Area.Y+v.Area.H)
	return
}

// KmPerDeg is the length of a degree of latitude on the sphere of
// propagation.EarthRadiusKm (6371 km · π/180).
const KmPerDeg = 6371 * math.Pi / 180

// ScaleBar returns a round length (1, 2 or 5 × 10ⁿ km) whose bar is at
// most maxPx pixels long at the view's centre, and its length in pixels.
func (v *Viewport) ScaleBar(maxPx float64) (km, px float64) {
	kmPerPx := KmPerDeg / v.PxPerDeg
	limit := maxPx * kmPerPx
	e := math.Pow(10, math.Floor(math.Log10(limit)))
	km = e
	for _, m := range []float64{2, 5, 10} {
		if m*e <= limit {
			km = m * e
		}
	}
	return km, km / kmPerPx
}

// Layout is where the panels go on a screen of a given size.
type Layout struct {
	Top     Rect // title and buttons
	Map     Rect
	Side    Rect // rig, clock and results
	Rig     Rect
	Clock   Rect
	Results Rect
	Plots   [2]Rect // over the map's lower edge: "more wire?" and the day plot
	Card    Rect    // over the map's upper left: the selected station
}

// Row heights and widths of the layout, pixels.
const (
	TopH    = 30
	RowH    = 22
	RigRows = 9 // a heading and eight settings
	SideMin = 330
	SideMax = 420
)

// NewLayout lays out a w×h screen: a top bar, the map on the left, the
// side panel on the right (a third of the width, 330–420 px).
func NewLayout(w, h float64) Layout {
	side := math.Max(SideMin, math.Min(SideMax, w/3))
	var l Layout
	l.Top = Rect{0, 0, w, TopH}
	l.Map = Rect{0, TopH, math.Max(w-side, 1), math.Max(h-TopH, 1)}
	l.Side = Rect{l.Map.W, TopH, side, math.Max(h-TopH, 1)}
	l.Rig = Rect{l.Side.X, l.Side.Y, side, RigRows * RowH}
	l.Clock = Rect{l.Side.X, l.Rig.Y + l.Rig.H + 6, side, 3 * RowH}
	ry := l.Clock.Y + l.Clock.H + 6
	l.Results = Rect{l.Side.X, ry, side, math.Max(l.Side.Y+l.Side.H-ry, RowH)}
	pw := math.Min(300, (l.Map.W-30)/2)
	ph := 150.0
	py := l.Map.Y + l.Map.H - ph - 30
	l.Plots = [2]Rect{{l.Map.X + 10, py, pw, ph}, {l.Map.X + 20 + pw, py, pw, ph}}
	l.Card = Rect{l.Map.X + 10, l.Map.Y + 10, math.Min(360, l.Map.W-20), 0}
	return l
}

// Ramp is the overlay's colour scale for a count of audible stations:
// from a cool grey-blue for none through green to a warm yellow at the
// scale's top, with alpha for laying over the map. Values are 0–255.
func Ramp(count, top float64) (r, g, b, a uint8) {
	if count <= 0 || top <= 0 {
		return 40, 50, 80, 70
	}
	u := math.Min(1, count/top)
	// Piecewise linear through three anchors of our own choosing.
	type rgb struct{ r, g, b float64 }
	anchors := []rgb{{40, 90, 150}, {60, 170, 90}, {240, 210, 60}}
	x := u * float64(len(anchors)-1)
	i := min(int(x), len(anchors)-2)
	f := x - float64(i)
	lerp := func(a, b float64) uint8 { return uint8(math.Round(a + (b-a)*f)) }
	return lerp(anchors[i].r, anchors[i+1].r), lerp(anchors[i].g, anchors[i+1].g), lerp(anchors[i].b, anchors[i+1].b), 120
}
