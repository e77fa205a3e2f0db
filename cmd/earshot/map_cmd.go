package main

import (
	"fmt"
	"image"
	"image/color"
	"image/draw"
	"image/png"
	"io"
	"math"
	"os"
	"strconv"
	"strings"

	"earshot/propagation"
	"earshot/receiver/plan"

	"golang.org/x/image/font"
	"golang.org/x/image/font/basicfont"
	"golang.org/x/image/math/fixed"
)

const mapSynopsis = `--out FILE.png [--show count|station:ID|traps] [--grid N] [--box S,N,W,E]
       [--scenario FILE | --stations FILE.csv] [rig flags] [--time RFC3339]

A map picture of the region: how many stations the rig hears at each place
(count), one station's margin over the rig's weakest audible field
(station:ID), or how many audible stations another one swamps, i.e. where
a wave trap is needed (traps). Land, sea and coastline, transmitters and the
scenario's listening spots are drawn with a colour scale and legend.`

func runMap(args []string, stdout, stderr io.Writer) int {
	fs := newFlagSet("map", mapSynopsis, stdout)
	w := addWorldFlags(fs, false)
	out := fs.String("out", "", "PNG file to write")
	show := fs.String("show", "count", "count, station:ID or traps")
	grid := fs.Int("grid", 256, "cells each way (16–1024)")
	boxFlag := fs.String("box", "", "S,N,W,E in degrees (default: around the scenario's spots)")
	if done, status := parseFlags(fs, args, stderr); done {
		return status
	}
	set := setFlags(fs)
	if *out == "" {
		return report("map", usagef("--out FILE.png is required"), stderr)
	}
	if *grid < 16 || *grid > 1024 {
		return report("map", usagef("--grid must be between 16 and 1024, got %d", *grid), stderr)
	}
	kind, id := plan.MapCount, ""
	switch {
	case *show == "count":
	case *show == "traps":
		kind = plan.MapTraps
	case strings.HasPrefix(*show, "station:"):
		kind, id = plan.MapStation, strings.TrimPrefix(*show, "station:")
	default:
		return report("map", usagef("--show must be count, traps or station:ID, got %q", *show), stderr)
	}
	l, err := w.load(set)
	if err != nil {
		return report("map", err, stderr)
	}
	var box plan.BBox
	if *boxFlag != "" {
		if box, err = parseBox(*boxFlag); err != nil {
			return report("map", err, stderr)
		}
	} else {
		var places []propagation.Place
		for _, s := range l.sc.Spots() {
			places = append(places, s.Place)
		}
		box = plan.Around(places, 1.5)
	}
	progress, finish := progressTo(stderr, "map")
	g, err := l.planner.Map(box, *grid, *grid, l.at, kind, id, plan.MapOptions{}, progress)
	finish()
	if err != nil {
		if kind == plan.MapStation {
			return report("map", usagef("--show: %s", trimPkg(err)), stderr)
		}
		return report("map", err, stderr)
	}
	img := renderMap(g, l)
	f, err := os.Create(*out)
	if err != nil {
		return report("map", err, stderr)
	}
	if err := png.Encode(f, img); err != nil {
		f.Close()
		return report("map", err, stderr)
	}
	if err := f.Close(); err != nil {
		return report("map", err, stderr)
	}
	fmt.Fprintf(stdout, "wrote %s (%d×%d cells, %s)\n", *out, g.NX, g.NY, *show)
	return exitOK
}

func parseBox(s string) (plan.BBox, error) {
	parts := strings.Split(s, ",")
	if len(parts) != 4 {
		return plan.BBox{}, usagef("--box %q: want S,N,W,E in degrees", s)
	}
	var v [4]float64
	for i, p := range parts {
		x, err := strconv.ParseFloat(strings.TrimSpace(p), 64)
		if err != nil {
			return plan.BBox{}, usagef("--box %q: %q is not a number", s, p)
		}
		v[i] = x
	}
	b := plan.BBox{MinLat: v[0], MaxLat: v[1], MinLon: v[2], MaxLon: v[3]}
	if err := b.Validate(); err != nil {
		return plan.BBox{}, usagef("--box: %s", trimPkg(err))
	}
	return b, nil
}

// Map picture layout, in pixels.
const (
	mapMargin  = 10
	mapTitleH  = 24
	mapLegendW = 150
)

// scaleColour is earshot's own colour scale: dusk violet through sea
// green to pale gold as the value rises from 0 to 1.
func scaleColour(t float64) color.RGBA {
	t = math.Max(0, math.Min(1, t))
	stops := []struct {
		at      float64
		r, g, b float64
	}{{0, 46, 26, 71}, {0.35, 40, 110, 120}, {0.7, 120, 185, 110}, {1, 245, 225, 140}}
	for i := 1; i < len(stops); i++ {
		if t <= stops[i].at {
			a, b := stops[i-1], stops[i]
			u := (t - a.at) / (b.at - a.at)
			return color.RGBA{uint8(a.r + u*(b.r-a.r)), uint8(a.g + u*(b.g-a.g)), uint8(a.b + u*(b.b-a.b)), 255}
		}
	}
	return color.RGBA{245, 225, 140, 255}
}

// valueRange returns the colour-scale range for a grid.
func valueRange(g *plan.Grid) (lo, hi float64, label string) {
	switch g.Kind {
	case plan.MapStation:
		return -30, 30, "dB above weakest audible, " + g.StationID
	case plan.MapTraps:
		hi = 1
		for _, v := range g.Values {
			hi = math.Max(hi, v)
		}
		return 0, hi, "stations swamped (trap needed)"
	}
	hi = 1
	for _, v := range g.Values {
		hi = math.Max(hi, v)
	}
	return 0, hi, "stations audible"
}

// renderMap draws the grid with land shading, coastline, stations, spots,
// title and legend.
func renderMap(g *plan.Grid, l *loaded) *image.RGBA {
	cell := int(math.Max(1, math.Round(512/float64(g.NX))))
	mw, mh := g.NX*cell, g.NY*cell
	img := image.NewRGBA(image.Rect(0, 0, mw+2*mapMargin+mapLegendW, mh+2*mapMargin+mapTitleH))
	draw.Draw(img, img.Bounds(), &image.Uniform{color.RGBA{250, 248, 242, 255}}, image.Point{}, draw.Src)
	lo, hi, label := valueRange(g)
	ox, oy := mapMargin, mapMargin+mapTitleH
	groundAt := make([]propagation.Ground, g.NX*g.NY)
	gm := l.ground
	for iy := range g.NY {
		for ix := range g.NX {
			lat, lon := g.Box.Cell(ix, iy, g.NX, g.NY)
			groundAt[iy*g.NX+ix] = gm(lat, lon)
		}
	}
	sea, _ := propagation.GroundByName("sea")
	for iy := range g.NY {
		for ix := range g.NX {
			c := scaleColour((g.Values[iy*g.NX+ix] - lo) / (hi - lo))
			if groundAt[iy*g.NX+ix] != sea.Ground { // land a touch lighter
				c = color.RGBA{uint8(min(255, int(c.R)+18)), uint8(min(255, int(c.G)+18)), uint8(min(255, int(c.B)+10)), 255}
			}
			for dy := range cell {
				for dx := range cell {
					img.SetRGBA(ox+ix*cell+dx, oy+iy*cell+dy, c)
				}
			}
		}
	}
	// Coastline and ground-region edges.
	ink := color.RGBA{20, 20, 24, 255}
	for iy := range g.NY {
		for ix := range g.NX {
			gr := groundAt[iy*g.NX+ix]
			if ix+1 < g.NX && groundAt[iy*g.NX+ix+1] != gr {
				for dy := range cell {
					img.SetRGBA(ox+(ix+1)*cell, oy+iy*cell+dy, ink)
				}
			}
			if iy+1 < g.NY && groundAt[(iy+1)*g.NX+ix] != gr {
				for dx := range cell {
					img.SetRGBA(ox+ix*cell+dx, oy+(iy+1)*cell, ink)
				}
			}
		}
	}
	toPix := func(p propagation.Place) (int, int, bool) {
		x := (p.LonDeg() - g.Box.MinLon) / (g.Box.MaxLon - g.Box.MinLon) * float64(mw)
		y := (g.Box.MaxLat - p.LatDeg()) / (g.Box.MaxLat - g.Box.MinLat) * float64(mh)
		return ox + int(x), oy + int(y), x >= 0 && y >= 0 && x < float64(mw) && y < float64(mh)
	}
	face := basicfont.Face7x13
	text := func(x, y int, s string, c color.Color) {
		d := font.Drawer{Dst: img, Src: image.NewUniform(c), Face: face, Dot: fixed.P(x, y)}
		d.DrawString(s)
	}
	for _, s := range l.planner.Stations() {
		x, y, ok := toPix(s.Place)
		if !ok {
			continue
		}
		r := 2 + int(math.Round(math.Log10(math.Max(1, s.KWDay*10))))
		disc(img, x, y, r+1, color.RGBA{255, 255, 255, 255})
		disc(img, x, y, r, color.RGBA{200, 40, 40, 255})
		text(x+r+2, y+4, fmt.Sprintf("%s %g", s.ID, float64(s.KHz)), ink)
	}
	for _, sp := range l.sc.Spots() {
		x, y, ok := toPix(sp.Place)
		if !ok {
			continue
		}
		for d := -5; d <= 5; d++ { // a white cross
			for t := -1; t <= 1; t++ {
				img.SetRGBA(x+d, y+t, color.RGBA{255, 255, 255, 255})
				img.SetRGBA(x+t, y+d, color.RGBA{255, 255, 255, 255})
			}
		}
		text(x+7, y-6, sp.Name, color.RGBA{255, 255, 255, 255})
	}
	when := g.At.UTC().Format("2006-01-02 15:04 UTC")
	text(mapMargin, mapMargin+14, fmt.Sprintf("%s - %s - %s", l.sc.Name, label, when), ink) // the bitmap font is ASCII
	// Legend: colour bar with ticks.
	lx, ly := mw+2*mapMargin, oy
	barH := mh - 40
	for y := range barH {
		c := scaleColour(1 - float64(y)/float64(barH-1))
		for x := range 18 {
			img.SetRGBA(lx+x, ly+y, c)
		}
	}
	for i := range 5 {
		v := hi - float64(i)*(hi-lo)/4
		y := ly + i*(barH-1)/4
		text(lx+24, y+4, fmt.Sprintf("%.0f", v), ink)
	}
	text(lx, ly+barH+16, "red dot: transmitter", ink)
	text(lx, ly+barH+30, "cross: listening spot", ink)
	return img
}

func disc(img *image.RGBA, cx, cy, r int, c color.RGBA) {
	for y := -r; y <= r; y++ {
		for x := -r; x <= r; x++ {
			if x*x+y*y <= r*r {
				img.SetRGBA(cx+x, cy+y, c)
			}
		}
	}
}
