package main

import (
	"fmt"
	"math"
	"slices"

	"earshot/assets/internal/maskfile"
)

// Geometry model. Natural Earth draws its polygons as straight lines in
// longitude/latitude degrees (an equirectangular plane), and so does this
// rasterizer: an edge between two vertices is the straight segment in
// (lon, lat), taken the short way round in longitude, so an edge from 179.9°
// to -179.9° crosses the antimeridian rather than the whole map.
//
// Each ring's longitudes are unwrapped (each step brought into [-180°, 180°])
// so the ring becomes a plane curve that may run past ±180°. After one trip
// round, the unwrapped longitude has moved by 360·k degrees:
//
//	k = 0  an ordinary ring: it encloses a bounded area of the plane;
//	|k| = 1  a polar ring (Antarctica's coast): it separates the two poles and
//	   is closed by running along the meridian to the pole on the ring's inside,
//	   along the pole, and back up.
//
// Which pole is inside follows the winding convention of the source data:
// exterior rings clockwise, holes anticlockwise, i.e. the inside of an
// exterior ring lies to its right and the inside of a hole to its left.
// Walking east (k = +1), right is south. Reference: d3-geo documentation
// ("the exterior ring for polygons smaller than a hemisphere must be
// clockwise"), the convention world-atlas is built with; the same as ESRI
// shapefiles, from which Natural Earth is distributed. checkOrientation
// verifies that the data follow it before it is relied on.
//
// Fill. Each cell takes the value at its centre. For every row, the ring's
// edges are intersected with the horizontal line through the row's cell
// centres (an edge counts when lo ≤ y < hi, so a vertex on the line is counted
// once), the crossings are sorted and paired, and the cells whose centres lie
// in [x₀, x₁), [x₂, x₃), … are flipped, wrapping round in longitude. Flipping
// per ring gives the even-odd rule over all rings, so holes come out as sea.

// orientAreaDeg2 is the smallest ring area (square degrees; 1e-3 deg² ≈ 12 km²
// at the equator) whose winding is checked: quantization collapses some tiny
// islets to slivers of either winding and zero area, which is harmless to the
// fill but carries no orientation.
const orientAreaDeg2 = 1e-3

// rasterStats describes a rasterization, for the generator's report.
type rasterStats struct {
	rings, holes, polar, vertices int
	landFraction                  float64 // area-weighted (cos latitude) share of land cells
}

// rasterize returns the even-odd fill of rings on a grid of cellsPerDeg cells
// per degree.
func rasterize(rings []ring, cellsPerDeg int) (*maskfile.Grid, rasterStats, error) {
	g, err := maskfile.NewGrid(cellsPerDeg)
	if err != nil {
		return nil, rasterStats{}, err
	}
	var st rasterStats
	for _, rg := range rings {
		xs, k, err := unwrap(rg)
		if err != nil {
			return nil, st, err
		}
		if err := checkOrientation(rg, xs, k); err != nil {
			return nil, st, err
		}
		if err := fillRing(g, rg, xs, k); err != nil {
			return nil, st, err
		}
		st.rings++
		st.vertices += len(rg.pts) - 1
		if rg.hole {
			st.holes++
		}
		if k != 0 {
			st.polar++
		}
	}
	st.landFraction = landFraction(g)
	return g, st, nil
}

// unwrap returns the ring's longitudes made continuous, and k, the number of
// times the ring goes round the pole eastward (negative: westward).
func unwrap(rg ring) ([]float64, int, error) {
	xs := make([]float64, len(rg.pts))
	xs[0] = rg.pts[0].lon
	for i := 1; i < len(rg.pts); i++ {
		xs[i] = xs[i-1] + shortLonStep(rg.pts[i].lon-rg.pts[i-1].lon)
	}
	net := xs[len(xs)-1] - xs[0]
	k := math.Round(net / 360)
	if math.Abs(net-360*k) > 1e-6 {
		return nil, 0, fmt.Errorf("genmask: %s: ring does not close in longitude (net %g°)", rg.name, net)
	}
	if math.Abs(k) > 1 {
		return nil, 0, fmt.Errorf("genmask: %s: ring winds %g times round the pole; want 0 or ±1", rg.name, k)
	}
	if k == 0 && slices.Max(xs)-slices.Min(xs) > 360 {
		return nil, 0, fmt.Errorf("genmask: %s: ring spans %g° of longitude, more than the globe",
			rg.name, slices.Max(xs)-slices.Min(xs))
	}
	return xs, int(k), nil
}

// shortLonStep brings a longitude difference into [-180°, 180°]: the short way
// round. A step of exactly ±360° (from -180° to 180°, the same meridian)
// becomes 0.
func shortLonStep(d float64) float64 {
	switch {
	case d > 180:
		return d - 360
	case d < -180:
		return d + 360
	}
	return d
}

// signedArea is the shoelace area of the unwrapped ring in square degrees:
// negative for clockwise (with latitude pointing up).
func signedArea(rg ring, xs []float64) float64 {
	a := 0.0
	for i := 0; i+1 < len(xs); i++ {
		a += xs[i]*rg.pts[i+1].lat - xs[i+1]*rg.pts[i].lat
	}
	return a / 2
}

// checkOrientation rejects an ordinary ring of more than orientAreaDeg2 whose
// winding contradicts the convention that decides polar rings.
func checkOrientation(rg ring, xs []float64, k int) error {
	if k != 0 {
		return nil
	}
	a := signedArea(rg, xs)
	if math.Abs(a) < orientAreaDeg2 {
		return nil
	}
	if clockwise := a < 0; clockwise == rg.hole {
		want := "clockwise (exterior)"
		if rg.hole {
			want = "anticlockwise (hole)"
		}
		return fmt.Errorf("genmask: %s: ring of %.4g deg² is wound against the convention, want %s", rg.name, math.Abs(a), want)
	}
	return nil
}

// rowStart is the first row whose centre latitude is ≥ lat.
func rowStart(lat float64, cpd, rows int) int {
	r := int(math.Ceil((lat+90)*float64(cpd) - 0.5))
	return max(0, min(rows, r))
}

// fillRing flips the cells inside one ring (see the file comment).
func fillRing(g *maskfile.Grid, rg ring, xs []float64, k int) error {
	type vtx struct{ x, y float64 }
	vs := make([]vtx, len(xs), len(xs)+3)
	for i, x := range xs {
		vs[i] = vtx{x, rg.pts[i].lat}
	}
	if k != 0 {
		pole := -90.0 // east-going exterior or west-going hole: inside is south
		if (k > 0) == rg.hole {
			pole = 90
		}
		last, first := vs[len(vs)-1], vs[0]
		vs = append(vs, vtx{last.x, pole}, vtx{first.x, pole}, first)
	}

	lo, hi := math.Inf(1), math.Inf(-1)
	for _, v := range vs {
		lo, hi = min(lo, v.y), max(hi, v.y)
	}
	cpd := g.CellsPerDeg
	r0, r1 := rowStart(lo, cpd, g.Rows), rowStart(hi, cpd, g.Rows)
	if r0 == r1 {
		return nil // thinner than a row: no cell centre inside
	}
	cross := make([][]float64, r1-r0)
	for i := 0; i+1 < len(vs); i++ {
		p, q := vs[i], vs[i+1]
		if p.y == q.y {
			continue
		}
		ra, rb := rowStart(min(p.y, q.y), cpd, g.Rows), rowStart(max(p.y, q.y), cpd, g.Rows)
		for r := ra; r < rb; r++ {
			yc := -90 + (float64(r)+0.5)/float64(cpd)
			x := p.x + (yc-p.y)*(q.x-p.x)/(q.y-p.y)
			cross[r-r0] = append(cross[r-r0], x)
		}
	}
	for i, xsRow := range cross {
		r := r0 + i
		if len(xsRow)%2 != 0 {
			return fmt.Errorf("genmask: %s: row %d has an odd number (%d) of crossings", rg.name, r, len(xsRow))
		}
		slices.Sort(xsRow)
		for j := 0; j < len(xsRow); j += 2 {
			if err := flipSpan(g, r, xsRow[j], xsRow[j+1]); err != nil {
				return fmt.Errorf("genmask: %s: %w", rg.name, err)
			}
		}
	}
	return nil
}

// flipSpan flips the cells of row r whose centre longitude (unwrapped) lies
// in [xa, xb), wrapping round the globe.
func flipSpan(g *maskfile.Grid, r int, xa, xb float64) error {
	cpd := float64(g.CellsPerDeg)
	ca := int(math.Ceil((xa+180)*cpd - 0.5))
	cb := int(math.Ceil((xb+180)*cpd - 0.5))
	n := cb - ca
	switch {
	case n == 0:
		return nil
	case n == g.Cols:
		g.XorRun(r, 0, g.Cols)
		return nil
	case n > g.Cols:
		return fmt.Errorf("row %d: span [%g°, %g°) is wider than the globe", r, xa, xb)
	}
	a := ((ca % g.Cols) + g.Cols) % g.Cols
	if a+n <= g.Cols {
		g.XorRun(r, a, a+n)
	} else {
		g.XorRun(r, a, g.Cols)
		g.XorRun(r, 0, a+n-g.Cols)
	}
	return nil
}

// landFraction is the share of the sphere's area covered by land cells: each
// row weighted by the cosine of its centre latitude (a cell's area on a
// sphere is proportional to it, to second order in the cell size).
func landFraction(g *maskfile.Grid) float64 {
	var land, all float64
	for r := range g.Rows {
		w := math.Cos((-90 + (float64(r)+0.5)/float64(g.CellsPerDeg)) * math.Pi / 180)
		land += w * float64(g.CountRow(r))
		all += w * float64(g.Cols)
	}
	return land / all
}
