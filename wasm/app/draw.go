//go:build js

package main

import (
	"fmt"
	"image"
	"image/color"
	"math"
	"sort"
	"strings"
	"time"

	"earshot/propagation"
	"earshot/receiver/plan"
	"earshot/wasm/screen"

	"github.com/hajimehoshi/ebiten/v2"
	"github.com/hajimehoshi/ebiten/v2/text/v2"
	"github.com/hajimehoshi/ebiten/v2/vector"
)

// The palette (our own): a dark slate frame, pale text, an amber accent.
var (
	colBackground = color.RGBA{22, 26, 32, 255}
	colPanel      = color.RGBA{32, 37, 45, 255}
	colPanelEdge  = color.RGBA{60, 68, 80, 255}
	colText       = color.RGBA{225, 228, 232, 255}
	colDim        = color.RGBA{150, 158, 168, 255}
	colAccent     = color.RGBA{245, 170, 40, 255}
	colGood       = color.RGBA{110, 200, 120, 255}
	colWarn       = color.RGBA{240, 120, 90, 255}
	colButton     = color.RGBA{50, 57, 68, 255}
	colSelect     = color.RGBA{70, 80, 100, 255}
	colSpot       = color.RGBA{255, 80, 60, 255}
	colCoast      = color.RGBA{20, 24, 30, 255}
)

func (g *game) label(dst *ebiten.Image, s string, x, y float64, face *text.GoTextFace, c color.Color) {
	op := &text.DrawOptions{}
	op.GeoM.Translate(x, y)
	op.ColorScale.ScaleWithColor(c)
	text.Draw(dst, s, face, op)
}

// fitText shortens s with an ellipsis to fit w pixels. Widths are summed
// from each rune's advance (measured once per face: shaping whole strings
// is slow in WebAssembly, and kerning does not matter for a cut).
func fitText(s string, face *text.GoTextFace, w float64) string {
	key := fitKey{s, face.Size, w}
	if v, ok := fitMemo[key]; ok {
		return v
	}
	out := s
	if textWidth(s, face) > w {
		ell := runeAdvance('…', face)
		r := []rune(s)
		width, n := 0.0, 0
		for n < len(r) && width+runeAdvance(r[n], face)+ell <= w {
			width += runeAdvance(r[n], face)
			n++
		}
		out = string(r[:n]) + "…"
	}
	if len(fitMemo) > 4000 {
		clear(fitMemo)
	}
	fitMemo[key] = out
	return out
}

// textWidth is the sum of the runes' advances.
func textWidth(s string, face *text.GoTextFace) float64 {
	w := 0.0
	for _, r := range s {
		w += runeAdvance(r, face)
	}
	return w
}

type runeKey struct {
	r    rune
	face *text.GoTextFace
}

var runeAdvances = map[runeKey]float64{}

func runeAdvance(r rune, face *text.GoTextFace) float64 {
	k := runeKey{r, face}
	if v, ok := runeAdvances[k]; ok {
		return v
	}
	v := text.Advance(string(r), face)
	runeAdvances[k] = v
	return v
}

type fitKey struct {
	s    string
	size float64
	w    float64
}

var fitMemo = map[fitKey]string{}

func fillRect(dst *ebiten.Image, r screen.Rect, c color.Color) {
	vector.DrawFilledRect(dst, float32(r.X), float32(r.Y), float32(r.W), float32(r.H), c, false)
}

func strokeRect(dst *ebiten.Image, r screen.Rect, c color.Color) {
	vector.StrokeRect(dst, float32(r.X)+0.5, float32(r.Y)+0.5, float32(r.W)-1, float32(r.H)-1, 1, c, false)
}

// button draws a named button and records it for clicks and the test hook.
func (g *game) button(dst *ebiten.Image, name, caption string, r screen.Rect, active bool) {
	g.widgets[name] = r
	c := colButton
	if active {
		c = colSelect
	}
	fillRect(dst, r, c)
	strokeRect(dst, r, colPanelEdge)
	w := text.Advance(caption, g.face)
	g.label(dst, caption, r.X+(r.W-w)/2, r.Y+(r.H-15)/2, g.face, colText)
}

// groundColour shades a ground by its conductivity: sea and fresh water in
// blues, land from green (wet, conductive) to sand (very dry), ice pale.
func groundColour(gr propagation.Ground) (r, g, b uint8) {
	switch {
	case gr.SigmaSPerM >= 1:
		return 28, 58, 98
	case gr.EpsR >= 60:
		return 62, 112, 160
	case gr.EpsR <= 4:
		return 205, 212, 222
	}
	// log10 σ from −4 (very dry) to −2 (wet).
	u := math.Max(0, math.Min(1, (math.Log10(gr.SigmaSPerM)+4)/2))
	lerp := func(a, b float64) uint8 { return uint8(a + (b-a)*u) }
	return lerp(176, 72), lerp(160, 116), lerp(118, 62)
}

// baseMap is the ground, coastline and night shading of the view, drawn
// at half resolution and rebuilt when the view or the hour settles.
type baseMap struct {
	img   *ebiten.Image
	veil  *ebiten.Image // night
	view  screen.Viewport
	at    time.Time
	dirty bool
	pix   []byte
}

const baseScale = 2 // screen pixels per base pixel

func (g *game) rebuildBase() {
	t0 := time.Now()
	defer func() { g.timing["base"] = float64(time.Since(t0).Microseconds()) / 1000 }()
	w, h := int(g.lay.Map.W)/baseScale+1, int(g.lay.Map.H)/baseScale+1
	if g.base.img == nil || g.base.img.Bounds().Dx() != w || g.base.img.Bounds().Dy() != h {
		g.base.img = ebiten.NewImage(w, h)
		g.base.pix = make([]byte, 4*w*h)
	}
	at, _ := g.s.At()
	v := g.view
	bv := v // the view in base pixels
	bv.Area = screen.Rect{W: float64(w * baseScale), H: float64(h * baseScale)}
	bv.PxPerDeg /= baseScale
	bv.Area.W /= baseScale
	bv.Area.H /= baseScale
	// Land and sea from the world mask, pixel by pixel, with the
	// coastline dark where they meet.
	seaR, seaG, seaB := groundColour(propagation.Ground{SigmaSPerM: 5, EpsR: 70})
	sc, _ := g.s.Scenario()
	landGround, err := propagation.ParseGround(sc.LandGround)
	if err != nil {
		landGround = propagation.Ground{SigmaSPerM: 0.003, EpsR: 22}
	}
	lr, lg, lb := groundColour(landGround)
	land := make([]bool, w*h)
	for y := range h {
		for x := range w {
			lat, lon := bv.ToMap(float64(x)+0.5, float64(y)+0.5)
			lat, lon = math.Max(-89.99, math.Min(89.99, lat)), wrapLon(lon)
			isLand := g.mask.IsLand(lat, lon)
			land[y*w+x] = isLand
			p := g.base.pix[4*(y*w+x):]
			if isLand {
				p[0], p[1], p[2], p[3] = lr, lg, lb, 255
			} else {
				p[0], p[1], p[2], p[3] = seaR, seaG, seaB, 255
			}
		}
	}
	for y := 1; y < h; y++ {
		for x := 1; x < w; x++ {
			if land[y*w+x] != land[y*w+x-1] || land[y*w+x] != land[(y-1)*w+x] {
				p := g.base.pix[4*(y*w+x):]
				p[0], p[1], p[2] = colCoast.R, colCoast.G, colCoast.B
			}
		}
	}
	g.base.img.WritePixels(g.base.pix)
	// The scenario's ground regions, filled in file order (a later region
	// overrides an earlier one, as in the planner) and outlined.
	for _, r := range sc.GroundRegions {
		gr, err := propagation.ParseGround(r.Ground)
		if err != nil || len(r.Polygon) < 3 {
			continue
		}
		var path vector.Path
		for i, p := range r.Polygon {
			x, y := bv.ToScreen(p[0], p[1])
			if i == 0 {
				path.MoveTo(float32(x), float32(y))
			} else {
				path.LineTo(float32(x), float32(y))
			}
		}
		path.Close()
		cr, cg, cb := groundColour(gr)
		vs, is := path.AppendVerticesAndIndicesForFilling(nil, nil)
		drawShape(g.base.img, vs, is, color.RGBA{cr, cg, cb, 255}, ebiten.FillRuleEvenOdd)
		vs, is = path.AppendVerticesAndIndicesForStroke(nil, nil, &vector.StrokeOptions{Width: 1})
		drawShape(g.base.img, vs, is, color.RGBA{cr / 2, cg / 2, cb / 2, 255}, ebiten.FillRuleFillAll)
	}
	// Night: the sun's elevation on a coarse lattice (every 8 base pixels),
	// as a dark blue veil through twilight (sun 0° to −12°), scaled up
	// smoothly over the ground.
	const cs = 8
	cw, ch := w/cs+2, h/cs+2
	veil := make([]byte, 4*cw*ch)
	for j := range ch {
		for i := range cw {
			lat, lon := bv.ToMap(float64(i*cs), float64(j*cs))
			e, err := propagation.SolarElevationDeg(at, math.Max(-90, math.Min(90, lat)), wrapLon(lon))
			if err != nil || e >= 0 {
				continue
			}
			a := 0.45 * math.Min(1, -e/12)
			p := veil[4*(j*cw+i):]
			p[0], p[1], p[2], p[3] = 0, 0, uint8(30*a), uint8(255*a) // premultiplied
		}
	}
	if g.base.veil == nil || g.base.veil.Bounds().Dx() != cw || g.base.veil.Bounds().Dy() != ch {
		g.base.veil = ebiten.NewImage(cw, ch)
	}
	g.base.veil.WritePixels(veil)
	op := &ebiten.DrawImageOptions{}
	op.GeoM.Scale(cs, cs)
	op.Filter = ebiten.FilterLinear
	g.base.img.DrawImage(g.base.veil, op)
	g.base.view, g.base.at, g.base.dirty = v, at, false
}

// white is a one-pixel white source for drawing shapes.
var white = func() *ebiten.Image {
	img := ebiten.NewImage(3, 3)
	img.Fill(color.White)
	return img.SubImage(image.Rect(1, 1, 2, 2)).(*ebiten.Image)
}()

// drawShape draws triangles (from a vector.Path) in one colour.
func drawShape(dst *ebiten.Image, vs []ebiten.Vertex, is []uint16, c color.RGBA, rule ebiten.FillRule) {
	for i := range vs {
		vs[i].SrcX, vs[i].SrcY = 1, 1
		vs[i].ColorR, vs[i].ColorG, vs[i].ColorB, vs[i].ColorA = float32(c.R)/255, float32(c.G)/255, float32(c.B)/255, float32(c.A)/255
	}
	op := &ebiten.DrawTrianglesOptions{FillRule: rule}
	dst.DrawTriangles(vs, is, white, op)
}

func wrapLon(lon float64) float64 {
	for lon > 180 {
		lon -= 360
	}
	for lon < -180 {
		lon += 360
	}
	return lon
}

// drawMap draws the ground, the overlay, the stations, the selected path
// and the spot, with the scale bar and the overlay's legend.
func (g *game) drawMap(dst *ebiten.Image) {
	m := g.lay.Map
	mapImg := dst.SubImage(imageRect(m)).(*ebiten.Image)
	at, _ := g.s.At()
	settled := time.Since(g.lastView) > 150*time.Millisecond
	if g.base.img == nil || (settled && (g.base.dirty || !at.Equal(g.base.at))) {
		g.rebuildBase()
	}
	// The base image as it was drawn, moved and scaled to the current view.
	{
		bv := g.base.view
		op := &ebiten.DrawImageOptions{}
		op.GeoM.Scale(baseScale, baseScale)
		lat0, lon0 := bv.ToMap(bv.Area.X, bv.Area.Y)
		x0, y0 := g.view.ToScreen(lat0, lon0)
		k := g.view.PxPerDeg / bv.PxPerDeg
		op.GeoM.Scale(k, k)
		op.GeoM.Translate(x0, y0)
		op.Filter = ebiten.FilterLinear
		mapImg.DrawImage(g.base.img, op)
	}
	g.drawOverlay(mapImg)

	// The selected station's path.
	sp := g.s.Spot().Place
	if id := g.s.Selected(); id != "" {
		for _, st := range g.s.Stations() {
			if st.ID != id {
				continue
			}
			var px, py float64
			for i := 0; i <= 64; i++ {
				p, err := propagation.PointAt(st.Place, sp, float64(i)/64)
				if err != nil {
					break
				}
				x, y := g.view.ToScreen(p.LatDeg(), p.LonDeg())
				if i > 0 {
					vector.StrokeLine(mapImg, float32(px), float32(py), float32(x), float32(y), 2, colAccent, false)
				}
				px, py = x, y
			}
		}
	}
	// Stations: size by power, colour by frequency, ring when audible.
	heard := map[string]bool{}
	if pr, _, _ := g.s.Prediction(); pr != nil {
		for _, h := range pr.Heard {
			heard[h.Station.ID] = h.Audible
		}
	}
	showIDs := g.view.PxPerDeg > 50
	for _, st := range g.s.Stations() {
		x, y := g.view.ToScreen(st.Place.LatDeg(), st.Place.LonDeg())
		if !m.Contains(x, y) {
			continue
		}
		r := float32(3 + 1.6*math.Log10(math.Max(st.KWDay, st.KWNight)*10+1))
		c := bandColour(float64(st.KHz))
		vector.DrawFilledCircle(mapImg, float32(x), float32(y), r, c, false)
		edge := color.RGBA{15, 15, 15, 255}
		if heard[st.ID] {
			edge = color.RGBA{250, 250, 250, 255}
		}
		vector.StrokeCircle(mapImg, float32(x), float32(y), r, 1.5, edge, false)
		if st.ID == g.s.Selected() {
			vector.StrokeCircle(mapImg, float32(x), float32(y), r+4, 2, colAccent, false)
		}
		if showIDs {
			g.label(mapImg, st.ID, x+float64(r)+3, y-8, g.small, colText)
		}
	}
	// The listening spot: a ring with a cross.
	x, y := g.view.ToScreen(sp.LatDeg(), sp.LonDeg())
	vector.StrokeCircle(mapImg, float32(x), float32(y), 8, 2.5, colSpot, false)
	vector.StrokeLine(mapImg, float32(x-13), float32(y), float32(x-4), float32(y), 2, colSpot, false)
	vector.StrokeLine(mapImg, float32(x+4), float32(y), float32(x+13), float32(y), 2, colSpot, false)
	vector.StrokeLine(mapImg, float32(x), float32(y-13), float32(x), float32(y-4), 2, colSpot, false)
	vector.StrokeLine(mapImg, float32(x), float32(y+4), float32(x), float32(y+13), 2, colSpot, false)

	// Scale bar, lower right.
	km, px := g.view.ScaleBar(160)
	bx, by := m.X+m.W-px-16, m.Y+m.H-16
	vector.StrokeLine(dst, float32(bx), float32(by), float32(bx+px), float32(by), 3, colText, false)
	vector.StrokeLine(dst, float32(bx), float32(by-5), float32(bx), float32(by+1), 2, colText, false)
	vector.StrokeLine(dst, float32(bx+px), float32(by-5), float32(bx+px), float32(by+1), 2, colText, false)
	g.label(dst, fmt.Sprintf("%g km", km), bx, by-20, g.small, colText)
}

func imageRect(r screen.Rect) image.Rectangle {
	return image.Rect(int(r.X), int(r.Y), int(r.X+r.W), int(r.Y+r.H))
}

// bandColour maps 530–1700 kHz to a hue from amber (low) through teal to
// violet (high).
func bandColour(kHz float64) color.RGBA {
	u := math.Max(0, math.Min(1, (kHz-530)/(1700-530)))
	anchors := [][3]float64{{250, 160, 50}, {60, 200, 190}, {170, 110, 240}}
	x := u * 2
	i := min(int(x), 1)
	f := x - float64(i)
	c := func(k int) uint8 { return uint8(anchors[i][k] + (anchors[i+1][k]-anchors[i][k])*f) }
	return color.RGBA{c(0), c(1), c(2), 255}
}

// overlayCache holds the overlay's image, rebuilt when its grid changes.
type overlayCache struct {
	shown     *plan.Grid
	img       *ebiten.Image
	top       float64
	legend    *ebiten.Image
	legendTop float64
}

func gridImage(old *ebiten.Image, gr *plan.Grid, top float64) *ebiten.Image {
	if old == nil || old.Bounds().Dx() != gr.NX || old.Bounds().Dy() != gr.NY {
		old = ebiten.NewImage(gr.NX, gr.NY)
	}
	pix := make([]byte, 4*gr.NX*gr.NY)
	for i, v := range gr.Values {
		r, g, b, a := screen.Ramp(v, top)
		// Premultiplied alpha.
		pix[4*i], pix[4*i+1], pix[4*i+2], pix[4*i+3] = uint8(int(r)*int(a)/255), uint8(int(g)*int(a)/255), uint8(int(b)*int(a)/255), a
	}
	old.WritePixels(pix)
	return old
}

func (g *game) drawOverlay(dst *ebiten.Image) {
	o := g.s.Overlay()
	if !o.Enabled || !g.ui.overlayOn {
		return
	}
	c := &g.ovl
	c.top = math.Max(1, math.Round(float64(len(g.s.Stations()))*0.6))
	if o.Shown != c.shown {
		c.shown = o.Shown
		if o.Shown != nil {
			c.img = gridImage(c.img, o.Shown, c.top)
		}
	}
	if c.shown != nil && c.img != nil {
		gr := c.shown
		x0, y0 := g.view.ToScreen(gr.Box.MaxLat, gr.Box.MinLon)
		x1, y1 := g.view.ToScreen(gr.Box.MinLat, gr.Box.MaxLon)
		op := &ebiten.DrawImageOptions{}
		op.GeoM.Scale((x1-x0)/float64(gr.NX), (y1-y0)/float64(gr.NY))
		op.GeoM.Translate(x0, y0)
		dst.DrawImage(c.img, op)
	}
	// Legend, upper right of the map (its colour bar drawn once).
	m := g.lay.Map
	lw, lh := 150.0, 44.0
	lr := screen.Rect{X: m.X + m.W - lw - 10, Y: m.Y + 10, W: lw, H: lh}
	fillRect(dst, lr, color.RGBA{22, 26, 32, 210})
	g.label(dst, "stations heard here", lr.X+6, lr.Y+3, g.small, colText)
	if c.legend == nil || c.legendTop != c.top {
		c.legend, c.legendTop = ebiten.NewImage(128, 1), c.top
		pix := make([]byte, 4*128)
		for i := range 128 {
			r, gg, b, _ := screen.Ramp(float64(i)/127*c.top, c.top)
			pix[4*i], pix[4*i+1], pix[4*i+2], pix[4*i+3] = r, gg, b, 255
		}
		c.legend.WritePixels(pix)
	}
	lop := &ebiten.DrawImageOptions{}
	lop.GeoM.Scale(1, 10)
	lop.GeoM.Translate(lr.X+6, lr.Y+19)
	dst.DrawImage(c.legend, lop)
	g.label(dst, "0", lr.X+6, lr.Y+29, g.small, colDim)
	top := fmt.Sprintf("%.0f+", c.top)
	g.label(dst, top, lr.X+134-text.Advance(top, g.small), lr.Y+29, g.small, colDim)
	switch {
	case o.Err != nil:
		g.label(dst, "failed", lr.X+56, lr.Y+29, g.small, colWarn)
	case !o.Done:
		g.label(dst, "refining…", lr.X+50, lr.Y+29, g.small, colDim)
	}
}

func (g *game) drawTop(dst *ebiten.Image) {
	t := g.lay.Top
	fillRect(dst, t, colPanel)
	g.label(dst, "earshot", t.X+10, t.Y+6, g.bold, colAccent)
	sc, src := g.s.Scenario()
	name := sc.Name
	if src != "demo" {
		name += " (" + src + ")"
	} else if !strings.Contains(strings.ToLower(name), "invented") {
		name += " — invented demo data"
	}
	g.label(dst, fitText(name, g.face, 360), t.X+80, t.Y+7, g.face, colText)
	x := t.X + t.W - 8
	for _, b := range []struct{ name, caption string }{
		{"top.safety", "safety"}, {"top.import", "import…"}, {"top.fit", "home view"}, {"top.overlay", "overlay"},
	} {
		w := text.Advance(b.caption, g.face) + 20
		x -= w + 6
		g.button(dst, b.name, b.caption, screen.Rect{X: x, Y: t.Y + 4, W: w, H: t.H - 8}, b.name == "top.overlay" && g.ui.overlayOn)
	}
	// Work in progress.
	if p := g.shownProgress; p.Job != "" {
		msg := "working: " + p.Job
		if p.Done > 0 {
			msg += fmt.Sprintf(" %.0f%%", 100*p.Done)
		}
		g.label(dst, msg, x-text.Advance(msg, g.small)-12, t.Y+9, g.small, colDim)
	}
}

func (g *game) drawNotice(dst *ebiten.Image) {
	if g.ui.notice == "" {
		delete(g.widgets, "notice")
		return
	}
	m := g.lay.Map
	w := math.Min(m.W-40, text.Advance(g.ui.notice, g.face)+50)
	r := screen.Rect{X: m.X + (m.W-w)/2, Y: m.Y + 60, W: w, H: 28}
	g.widgets["notice"] = r
	fillRect(dst, r, color.RGBA{70, 40, 30, 235})
	strokeRect(dst, r, colWarn)
	g.label(dst, fitText(g.ui.notice, g.face, w-40), r.X+10, r.Y+6, g.face, colText)
	g.label(dst, "×", r.X+r.W-18, r.Y+6, g.face, colText)
}

// safetyText is the app's safety note (the README says the same).
var safetyText = []string{
	"Stay safe with outdoor antennas",
	"",
	"• Power lines kill. Keep the wire, its supports and anything you throw or",
	"  carry well clear: at least the antenna's length plus a wide margin, so",
	"  nothing can touch a line if it falls, sags or swings.",
	"• Lightning: fit an arrestor and a proper earth where the lead comes in;",
	"  disconnect and earth the antenna when storms are near or you are away;",
	"  never listen in a thunderstorm.",
	"• Climbing: not alone, not in wind or wet; a sound, footed ladder; keep",
	"  off fragile roofs.",
	"• Valve amplifiers run plate voltages that can kill, and their capacitors",
	"  hold a charge after switch-off. Leave them to people trained for it.",
	"• Your local electrical and building codes, and licensed electricians,",
	"  have the last word on earthing, bonding and arrestors.",
	"",
	"Click anywhere to close.",
}

func (g *game) drawSafety(dst *ebiten.Image) {
	vector.DrawFilledRect(dst, 0, 0, float32(g.w), float32(g.h), color.RGBA{0, 0, 0, 150}, false)
	w, h := 560.0, float64(len(safetyText))*19+24
	r := screen.Rect{X: (float64(g.w) - w) / 2, Y: (float64(g.h) - h) / 2, W: w, H: h}
	fillRect(dst, r, colPanel)
	strokeRect(dst, r, colAccent)
	for i, l := range safetyText {
		f, c := g.face, colText
		if i == 0 {
			f, c = g.bold, colAccent
		}
		g.label(dst, l, r.X+16, r.Y+12+float64(i)*19, f, c)
	}
}

// drawSide draws the rig, the clock and the result list, through an
// offscreen image redrawn only when what it shows changes.
func (g *game) drawSide(dst *ebiten.Image) {
	s := g.lay.Side
	key := g.sideKeyNow()
	if g.side == nil || g.side.Bounds().Dx() != g.w || g.side.Bounds().Dy() != g.h {
		g.side = ebiten.NewImage(g.w, g.h)
		g.sideKey = ""
	}
	if key != g.sideKey {
		g.sideKey = key
		g.side.Clear()
		g.drawSidePanel(g.side)
	}
	op := &ebiten.DrawImageOptions{}
	op.GeoM.Translate(s.X, s.Y)
	dst.DrawImage(g.side.SubImage(imageRect(s)).(*ebiten.Image), op)
}

// sideKeyNow sums up what the side panel shows.
func (g *game) sideKeyNow() string {
	pr, fresh, err := g.s.Prediction()
	spec, rigErr := g.s.Rig()
	at, follow := g.s.At()
	return fmt.Sprintf("%p %v %v|%+v %v|%v %v|%v %v %d %s %s %s %s|%s %v", pr, fresh, err, spec, rigErr, at, follow,
		g.ui.sortCol, g.ui.sortAsc, g.ui.scroll, g.ui.edit.field, g.ui.edit.buf, g.ui.rigMsg, g.s.Selected(), g.s.Spot().Name, g.lay.Side)
}

func (g *game) drawSidePanel(dst *ebiten.Image) {
	s := g.lay.Side
	fillRect(dst, s, colPanel)
	vector.StrokeLine(dst, float32(s.X)+0.5, float32(s.Y), float32(s.X)+0.5, float32(s.Y+s.H), 1, colPanelEdge, false)
	g.drawRig(dst)
	g.drawClock(dst)
	g.drawResults(dst)
}

func (g *game) drawRig(dst *ebiten.Image) {
	r := g.lay.Rig
	spec, rigErr := g.s.Rig()
	g.label(dst, "Your rig", r.X+10, r.Y+4, g.bold, colAccent)
	g.button(dst, "rig.safety", "safety first", screen.Rect{X: r.X + r.W - 100, Y: r.Y + 2, W: 90, H: screen.RowH - 4}, false)
	for i, row := range rigRows {
		y := r.Y + float64(i+1)*screen.RowH
		g.label(dst, row.label, r.X+10, y+3, g.face, colDim)
		vx := r.X + 150
		vw := r.W - 150 - 58
		g.button(dst, "rig."+row.name+".minus", "−", screen.Rect{X: r.X + r.W - 54, Y: y + 1, W: 22, H: screen.RowH - 3}, false)
		g.button(dst, "rig."+row.name+".plus", "+", screen.Rect{X: r.X + r.W - 30, Y: y + 1, W: 22, H: screen.RowH - 3}, false)
		vr := screen.Rect{X: vx, Y: y + 1, W: vw, H: screen.RowH - 3}
		g.widgets["rig."+row.name+".value"] = vr
		val := row.value(spec)
		c := colText
		if g.ui.edit.field == row.name {
			fillRect(dst, vr, colSelect)
			val = g.ui.edit.buf + "|"
			c = colAccent
		}
		if row.unit != "" && g.ui.edit.field != row.name {
			val += " " + row.unit
		}
		if row.name == "amp" && spec.AmpDB == 0 && g.ui.edit.field != row.name {
			val = "none"
		}
		g.label(dst, fitText(val, g.face, vw-6), vx+4, y+3, g.face, c)
	}
	msg := g.ui.rigMsg
	if msg == "" && rigErr != nil {
		msg = rigErr.Error()
	}
	if msg != "" {
		y := r.Y + r.H - 2
		g.label(dst, fitText(msg, g.small, r.W-20), r.X+10, y, g.small, colWarn)
	}
}

func (g *game) drawClock(dst *ebiten.Image) {
	r := g.lay.Clock
	at, follow := g.s.At()
	sp := g.s.Spot().Place
	g.label(dst, "Clock (UTC)", r.X+10, r.Y+3, g.bold, colAccent)
	g.label(dst, at.Format("Mon 2 Jan 2006  15:04"), r.X+100, r.Y+3, g.face, colText)
	g.button(dst, "clock.prev", "◄ day", screen.Rect{X: r.X + r.W - 170, Y: r.Y + 1, W: 54, H: screen.RowH - 3}, false)
	g.button(dst, "clock.next", "day ►", screen.Rect{X: r.X + r.W - 112, Y: r.Y + 1, W: 54, H: screen.RowH - 3}, false)
	g.button(dst, "clock.now", "now", screen.Rect{X: r.X + r.W - 54, Y: r.Y + 1, W: 46, H: screen.RowH - 3}, follow)
	// The 24 h slider, shaded where the sun is down at the spot.
	sl := screen.Rect{X: r.X + 10, Y: r.Y + screen.RowH + 4, W: r.W - 20, H: 14}
	g.widgets["clock.slider"] = sl
	day := time.Date(at.Year(), at.Month(), at.Day(), 0, 0, 0, 0, time.UTC)
	for i := 0; i < 96; i++ {
		t := day.Add(time.Duration(i*15+7) * time.Minute)
		e, _ := propagation.SolarElevationDeg(t, sp.LatDeg(), sp.LonDeg())
		c := color.RGBA{150, 130, 70, 255}
		if e < -0.833 {
			c = color.RGBA{40, 50, 90, 255}
		} else if e < 6 {
			c = color.RGBA{110, 90, 90, 255}
		}
		vector.DrawFilledRect(dst, float32(sl.X+float64(i)*sl.W/96), float32(sl.Y), float32(sl.W/96+1), float32(sl.H), c, false)
	}
	u := float64(at.Sub(day)) / float64(24*time.Hour)
	hx := sl.X + u*sl.W
	vector.DrawFilledRect(dst, float32(hx-3), float32(sl.Y-3), 6, float32(sl.H+6), colAccent, false)
	for h := 0; h <= 24; h += 6 {
		g.label(dst, fmt.Sprintf("%02d", h%24), sl.X+float64(h)/24*sl.W-6, sl.Y+sl.H+1, g.small, colDim)
	}
	lmt := at.Add(time.Duration(sp.LonDeg() / 15 * float64(time.Hour)))
	e, _ := propagation.SolarElevationDeg(at, sp.LatDeg(), sp.LonDeg())
	state := "day"
	if e < -0.833 {
		state = "night"
	}
	g.label(dst, fmt.Sprintf("local mean time %s · %s at the spot", lmt.Format("15:04"), state), r.X+10, r.Y+2*screen.RowH+12, g.small, colDim)
}

// Column x offsets and captions of the result list.
var colX = [nCols]float64{10, 110, 158, 210, 262, 318}
var colCaption = [nCols]string{"station", "kHz", "km", "dBµV/m", "margin", "chance"}

func (g *game) drawResults(dst *ebiten.Image) {
	r := g.lay.Results
	pr, fresh, err := g.s.Prediction()
	for k := range g.widgets {
		if strings.HasPrefix(k, "row.") {
			delete(g.widgets, k)
		}
	}
	title := "What you will hear"
	g.label(dst, title, r.X+10, r.Y+2, g.bold, colAccent)
	if pr != nil {
		g.label(dst, fmt.Sprintf("%d of %d audible", pr.Audible(), len(pr.Heard)), r.X+170, r.Y+3, g.face, colText)
	}
	if !fresh {
		g.label(dst, "updating…", r.X+r.W-70, r.Y+3, g.small, colDim)
	}
	hy := r.Y + screen.RowH
	for c := range nCols {
		cap := colCaption[c]
		if g.ui.sortCol == c {
			if g.ui.sortAsc {
				cap += " ▲"
			} else {
				cap += " ▼"
			}
		}
		w := 50.0
		if c+1 < nCols {
			w = colX[c+1] - colX[c]
		}
		g.widgets[fmt.Sprintf("sort.%d", c)] = screen.Rect{X: r.X + colX[c], Y: hy, W: w, H: screen.RowH}
		g.label(dst, cap, r.X+colX[c], hy+3, g.small, colDim)
	}
	if err != nil {
		g.label(dst, fitText(err.Error(), g.small, r.W-20), r.X+10, hy+24, g.small, colWarn)
		return
	}
	if pr == nil {
		g.label(dst, "working out the first answer…", r.X+10, hy+24, g.face, colDim)
		return
	}
	rows := append([]plan.Heard(nil), pr.Heard...)
	key := func(h plan.Heard) float64 {
		return sortKey(g.ui.sortCol, float64(h.Station.KHz), h.DistKm, h.FieldDB, h.MarginDB, h.Chance)
	}
	sort.SliceStable(rows, func(i, j int) bool {
		if g.ui.sortCol == colStation {
			if g.ui.sortAsc {
				return rows[i].Station.ID < rows[j].Station.ID
			}
			return rows[i].Station.ID > rows[j].Station.ID
		}
		if g.ui.sortAsc {
			return key(rows[i]) < key(rows[j])
		}
		return key(rows[i]) > key(rows[j])
	})
	const rowH = 32.0
	y := hy + screen.RowH
	visible := int((r.Y + r.H - y) / rowH)
	if visible < len(rows) {
		visible = int((r.Y + r.H - 18 - y) / rowH) // room for the scroll note
	}
	g.ui.scroll = max(0, min(g.ui.scroll, len(rows)-visible))
	for _, h := range rows[g.ui.scroll:min(len(rows), g.ui.scroll+visible)] {
		rr := screen.Rect{X: r.X + 4, Y: y, W: r.W - 8, H: rowH - 2}
		g.widgets["row."+h.Station.ID] = rr
		if h.Station.ID == g.s.Selected() {
			fillRect(dst, rr, colSelect)
		}
		c := colDim
		if h.Audible {
			c = colText
		}
		vector.DrawFilledCircle(dst, float32(r.X+10), float32(y+8), 4, bandColour(float64(h.Station.KHz)), false)
		g.label(dst, fitText(h.Station.ID+" "+h.Station.Name, g.face, colX[1]-colX[0]-14), r.X+colX[0]+8, y+1, g.face, c)
		g.label(dst, fmt.Sprintf("%.0f", float64(h.Station.KHz)), r.X+colX[1], y+1, g.face, c)
		g.label(dst, fmt.Sprintf("%.0f", h.DistKm), r.X+colX[2], y+1, g.face, c)
		g.label(dst, fmt.Sprintf("%.1f", h.FieldDB), r.X+colX[3], y+1, g.face, c)
		mc := colWarn
		if h.Audible {
			mc = colGood
		}
		g.label(dst, fmt.Sprintf("%+.1f", h.MarginDB), r.X+colX[4], y+1, g.face, mc)
		g.label(dst, fmt.Sprintf("%.0f%%", 100*h.Chance), r.X+colX[5], y+1, g.face, c)
		g.label(dst, fitText(h.Verdict, g.small, r.W-30), r.X+colX[0]+8, y+16, g.small, colDim)
		y += rowH
	}
	if g.ui.scroll > 0 || len(rows)-g.ui.scroll > visible {
		g.label(dst, fmt.Sprintf("%d–%d of %d (wheel to scroll)", g.ui.scroll+1, min(len(rows), g.ui.scroll+visible), len(rows)), r.X+10, r.Y+r.H-16, g.small, colDim)
	}
}
