//go:build js

package main

import (
	"fmt"
	"image/color"
	"math"
	"strings"
	"time"

	"earshot/propagation"
	"earshot/wasm/screen"

	"github.com/hajimehoshi/ebiten/v2"
	"github.com/hajimehoshi/ebiten/v2/vector"
)

// plotCache holds the two plots as images, redrawn when their data change.
type plotCache struct {
	img [2]*ebiten.Image
	key [2]string
}

var (
	colDayLine   = color.RGBA{245, 190, 70, 255}
	colNightLine = color.RGBA{120, 150, 250, 255}
	colThreshold = color.RGBA{240, 100, 90, 255}
)

// frame is a plot's axes: data ranges mapped into a rectangle.
type frame struct {
	r                        screen.Rect
	x0, x1, y0, y1           float64
	left, right, top, bottom float64
}

func (f frame) px(x, y float64) (float32, float32) {
	w := f.r.W - f.left - f.right
	h := f.r.H - f.top - f.bottom
	return float32(f.left + (x-f.x0)/(f.x1-f.x0)*w), float32(f.top + h - (y-f.y0)/(f.y1-f.y0)*h)
}

func (g *game) plotImage(i int, r screen.Rect) *ebiten.Image {
	img := g.plots.img[i]
	if img == nil || img.Bounds().Dx() != int(r.W) || img.Bounds().Dy() != int(r.H) {
		img = ebiten.NewImage(int(r.W), int(r.H))
		g.plots.img[i] = img
	}
	img.Fill(color.RGBA{22, 26, 32, 225})
	strokeRect(img, screen.Rect{W: r.W, H: r.H}, colPanelEdge)
	return img
}

func (g *game) drawPlots(dst *ebiten.Image) {
	g.drawWirePlot(dst, g.lay.Plots[0])
	if g.s.Selected() != "" {
		g.drawDayPlot(dst, g.lay.Plots[1])
	} else {
		delete(g.widgets, "plot.day")
	}
}

func (g *game) blit(dst, img *ebiten.Image, r screen.Rect) {
	op := &ebiten.DrawImageOptions{}
	op.GeoM.Translate(r.X, r.Y)
	dst.DrawImage(img, op)
}

// drawWirePlot: audible stations against wire length, by day and at
// night, with the current length marked.
func (g *game) drawWirePlot(dst *ebiten.Image, r screen.Rect) {
	g.widgets["plot.wire"] = r
	lengths, day, night, done := g.s.Wire()
	spec, _ := g.s.Rig()
	key := fmt.Sprint(lengths, day, night, done, spec.WireM, r)
	if key == g.plots.key[0] && g.plots.img[0] != nil {
		g.blit(dst, g.plots.img[0], r)
		return
	}
	g.plots.key[0] = key
	img := g.plotImage(0, r)
	g.label(img, "More wire? Stations heard by length", 8, 4, g.small, colText)
	ymax := 1.0
	for i := range day {
		ymax = math.Max(ymax, float64(max(day[i], night[i])))
	}
	f := frame{r: r, x0: 0, x1: 100, y0: 0, y1: math.Ceil(ymax/5) * 5, left: 30, right: 10, top: 24, bottom: 22}
	if len(lengths) > 0 {
		f.x1 = math.Max(100, lengths[len(lengths)-1])
	}
	g.axes(img, f, "m", "")
	for _, s := range []struct {
		v []int
		c color.RGBA
	}{{day, colDayLine}, {night, colNightLine}} {
		var px, py float32
		first := true
		for i, n := range s.v {
			if n < 0 {
				first = true
				continue
			}
			x, y := f.px(lengths[i], float64(n))
			if !first {
				vector.StrokeLine(img, px, py, x, y, 2, s.c, false)
			}
			vector.DrawFilledCircle(img, x, y, 2.5, s.c, false)
			px, py, first = x, y, false
		}
	}
	x, _ := f.px(spec.WireM, 0)
	_, ytop := f.px(0, f.y1)
	_, ybot := f.px(0, 0)
	vector.StrokeLine(img, x, ytop, x, ybot, 1, colAccent, false)
	g.label(img, "day", r.W-80, 4, g.small, colDayLine)
	g.label(img, "night", r.W-48, 4, g.small, colNightLine)
	if !done {
		g.label(img, "working…", f.left+6, f.top, g.small, colDim)
	}
	g.blit(dst, img, r)
}

// drawDayPlot: the selected station's field through the local day
// against the rig's weakest audible field, sunrise and sunset marked.
func (g *game) drawDayPlot(dst *ebiten.Image, r screen.Rect) {
	g.widgets["plot.day"] = r
	d := g.s.Day()
	key := fmt.Sprint(d.StationID, d.Start, d.FieldDB, d.MinDBuVm, r)
	if key == g.plots.key[1] && g.plots.img[1] != nil {
		g.blit(dst, g.plots.img[1], r)
		return
	}
	g.plots.key[1] = key
	img := g.plotImage(1, r)
	g.label(img, d.StationID+" through the day, dBµV/m", 8, 4, g.small, colText)
	lo, hi := math.Inf(1), math.Inf(-1)
	for i := range d.FieldDB {
		for _, v := range []float64{d.FieldDB[i], d.MinDBuVm[i]} {
			if !math.IsNaN(v) && !math.IsInf(v, 0) {
				lo, hi = math.Min(lo, v), math.Max(hi, v)
			}
		}
	}
	if math.IsInf(lo, 1) {
		lo, hi = 0, 60
	}
	lo, hi = math.Floor(lo/10)*10-5, math.Ceil(hi/10)*10+5
	f := frame{r: r, x0: 0, x1: 24, y0: lo, y1: hi, left: 34, right: 10, top: 24, bottom: 22}
	g.axes(img, f, "h", "")
	_, ytop := f.px(0, f.y1)
	_, ybot := f.px(0, f.y0)
	hours := func(t time.Time) float64 { return t.Sub(d.Start).Hours() }
	if d.Sun.State == propagation.SunNormal {
		for _, ev := range []struct {
			t    time.Time
			name string
		}{{d.Sun.Sunrise, "rise"}, {d.Sun.Sunset, "set"}} {
			h := math.Mod(hours(ev.t)+48, 24)
			x, _ := f.px(h, 0)
			vector.StrokeLine(img, x, ytop, x, ybot, 1, colAccent, false)
			g.label(img, ev.name, float64(x)+2, float64(ytop), g.small, colAccent)
		}
	}
	line := func(v []float64, c color.RGBA) {
		var px, py float32
		first := true
		for i, y := range v {
			if math.IsNaN(y) || math.IsInf(y, 0) {
				first = true
				continue
			}
			x, yy := f.px(hours(d.At[i]), y)
			if !first {
				vector.StrokeLine(img, px, py, x, yy, 2, c, false)
			}
			px, py, first = x, yy, false
		}
	}
	line(d.MinDBuVm, colThreshold)
	line(d.FieldDB, colDayLine)
	g.label(img, "field", r.W-92, 4, g.small, colDayLine)
	g.label(img, "weakest", r.W-56, 4, g.small, colThreshold)
	at, _ := g.s.At()
	if h := hours(at); h >= 0 && h <= 24 {
		x, _ := f.px(h, 0)
		vector.StrokeLine(img, x, ytop, x, ybot, 1, colText, false)
	}
	g.blit(dst, img, r)
}

// axes draws a plot's frame and tick labels (local mean time in hours or
// metres along x).
func (g *game) axes(img *ebiten.Image, f frame, xunit, yunit string) {
	x0, y0 := f.px(f.x0, f.y0)
	x1, y1 := f.px(f.x1, f.y1)
	vector.StrokeLine(img, x0, y0, x1, y0, 1, colDim, false)
	vector.StrokeLine(img, x0, y0, x0, y1, 1, colDim, false)
	xs := 20.0
	if xunit == "h" {
		xs = 6
	}
	for v := f.x0; v <= f.x1+1e-9; v += xs {
		x, y := f.px(v, f.y0)
		vector.StrokeLine(img, x, y, x, y+3, 1, colDim, false)
		lbl := fmt.Sprintf("%g", v)
		if v == f.x1 {
			lbl += " " + xunit
		}
		g.label(img, lbl, float64(x)-6, float64(y)+3, g.small, colDim)
	}
	ys := niceStep((f.y1 - f.y0) / 4)
	for v := math.Ceil(f.y0/ys) * ys; v <= f.y1+1e-9; v += ys {
		x, y := f.px(f.x0, v)
		vector.StrokeLine(img, x-3, y, x, y, 1, colDim, false)
		g.label(img, strings.TrimSpace(fmt.Sprintf("%4g", v)), 4, float64(y)-7, g.small, colDim)
	}
}

func niceStep(raw float64) float64 {
	if raw <= 0 {
		return 1
	}
	e := math.Pow(10, math.Floor(math.Log10(raw)))
	for _, m := range []float64{1, 2, 5, 10} {
		if m*e >= raw {
			return m * e
		}
	}
	return 10 * e
}
