//go:build js

package main

import (
	"errors"
	"fmt"
	"math"
	"slices"
	"strconv"
	"strings"
	"time"

	"earshot/assets"
	"earshot/receiver"

	"github.com/hajimehoshi/ebiten/v2"
	"github.com/hajimehoshi/ebiten/v2/inpututil"
)

// Result-list columns.
const (
	colStation = iota
	colKHz
	colKm
	colField
	colMargin
	colChance
	nCols
)

// uiState is what the listener has set on screen, apart from the session.
type uiState struct {
	sortCol   int
	sortAsc   bool
	scroll    int
	overlayOn bool
	safety    bool
	notice    string
	rigMsg    string
	edit      struct {
		field string // rig row name being typed into, "" for none
		buf   string
	}
}

// input tracks the pointer between ticks.
type input struct {
	leftDown       bool
	pressX, pressY float64
	lastX, lastY   float64
	moved          bool
	dragSpot       bool
	dragMap        bool
	dragSlider     bool
	touches        []ebiten.TouchID
	pinchD         float64
	runes          []rune
}

// rigRow is one setting of the rig panel.
type rigRow struct {
	name, label, unit string
	get               func(r receiver.RigSpec) float64
	set               func(r *receiver.RigSpec, v float64)
	step              float64
	choices           func() []string
	getS              func(r receiver.RigSpec) string
	setS              func(r *receiver.RigSpec, v string)
}

var rigRows = []rigRow{
	{name: "wire", label: "wire length", unit: "m", step: 5,
		get: func(r receiver.RigSpec) float64 { return r.WireM }, set: func(r *receiver.RigSpec, v float64) { r.WireM = v }},
	{name: "height", label: "height", unit: "m", step: 1,
		get: func(r receiver.RigSpec) float64 { return r.HeightM }, set: func(r *receiver.RigSpec, v float64) { r.HeightM = v }},
	{name: "downlead", label: "down-lead", unit: "m", step: 1,
		get: func(r receiver.RigSpec) float64 { return r.DownleadM }, set: func(r *receiver.RigSpec, v float64) { r.DownleadM = v }},
	{name: "ground", label: "ground system", choices: func() []string {
		var out []string
		for _, g := range receiver.GroundSystems() {
			out = append(out, g.Name)
		}
		return out
	}, getS: func(r receiver.RigSpec) string { return r.GroundSystem }, setS: func(r *receiver.RigSpec, v string) { r.GroundSystem = v }},
	{name: "diode", label: "diode", choices: func() []string {
		var out []string
		for _, d := range receiver.DiodePresets() {
			out = append(out, d.Name)
		}
		return out
	}, getS: func(r receiver.RigSpec) string { return r.Diode }, setS: func(r *receiver.RigSpec, v string) { r.Diode = v }},
	{name: "phones", label: "phones", choices: func() []string {
		var out []string
		for _, p := range receiver.PhonesPresets() {
			out = append(out, p.Name)
		}
		return out
	}, getS: func(r receiver.RigSpec) string { return r.Phones }, setS: func(r *receiver.RigSpec, v string) { r.Phones = v }},
	{name: "amp", label: "amplifier gain", unit: "dB", step: 6,
		get: func(r receiver.RigSpec) float64 { return r.AmpDB }, set: func(r *receiver.RigSpec, v float64) { r.AmpDB = v }},
	{name: "noise", label: "noise where you are", choices: func() []string {
		var out []string
		for _, n := range receiver.NoiseEnvs() {
			out = append(out, n.Name)
		}
		return out
	}, getS: func(r receiver.RigSpec) string { return r.Noise }, setS: func(r *receiver.RigSpec, v string) { r.Noise = v }},
}

func (r rigRow) value(spec receiver.RigSpec) string {
	if r.choices != nil {
		return r.getS(spec)
	}
	return strconv.FormatFloat(r.get(spec), 'g', 6, 64)
}

func (g *game) hit(name string, x, y float64) bool {
	r, ok := g.widgets[name]
	return ok && r.Contains(x, y)
}

func (g *game) handleInput() {
	// Files chosen in the picker.
	for _, p := range takePicked() {
		g.importFile(p)
	}
	if g.ui.edit.field != "" {
		g.typeInto()
	}
	cx, cy := ebiten.CursorPosition()
	x, y := float64(cx), float64(cy)

	// Touch: one finger acts as the mouse; two pinch-zoom the map.
	g.in.touches = ebiten.AppendTouchIDs(g.in.touches[:0])
	if len(g.in.touches) >= 2 {
		ax, ay := ebiten.TouchPosition(g.in.touches[0])
		bx, by := ebiten.TouchPosition(g.in.touches[1])
		d := math.Hypot(float64(ax-bx), float64(ay-by))
		if g.in.pinchD > 0 && d > 0 {
			g.view.ZoomAt(float64(ax+bx)/2, float64(ay+by)/2, d/g.in.pinchD)
			g.viewChanged()
		}
		g.in.pinchD = d
		g.in.leftDown = false
		return
	}
	g.in.pinchD = 0
	down := ebiten.IsMouseButtonPressed(ebiten.MouseButtonLeft)
	if len(g.in.touches) == 1 {
		tx, ty := ebiten.TouchPosition(g.in.touches[0])
		x, y, down = float64(tx), float64(ty), true
	}

	// Wheel: zoom over the map, scroll over the list.
	if _, wy := ebiten.Wheel(); wy != 0 {
		switch {
		case g.lay.Map.Contains(x, y):
			g.view.ZoomAt(x, y, math.Pow(1.15, wy))
			g.viewChanged()
		case g.lay.Results.Contains(x, y):
			g.ui.scroll = max(0, g.ui.scroll-int(math.Copysign(math.Max(1, math.Abs(wy)), wy)))
		}
	}

	switch {
	case down && !g.in.leftDown: // press
		g.in.leftDown = true
		g.in.pressX, g.in.pressY, g.in.lastX, g.in.lastY, g.in.moved = x, y, x, y, false
		g.in.dragSpot, g.in.dragMap, g.in.dragSlider = false, false, false
		if g.ui.safety {
			break
		}
		switch {
		case g.hit("clock.slider", x, y):
			g.in.dragSlider = true
			g.slideTo(x)
		case g.overPanel(x, y):
		case g.lay.Map.Contains(x, y):
			sp := g.s.Spot().Place
			sx, sy := g.view.ToScreen(sp.LatDeg(), sp.LonDeg())
			if math.Hypot(x-sx, y-sy) <= 12 {
				g.in.dragSpot = true
			} else {
				g.in.dragMap = true
			}
		}
	case down && g.in.leftDown: // drag
		dx, dy := x-g.in.lastX, y-g.in.lastY
		if math.Hypot(x-g.in.pressX, y-g.in.pressY) > 4 {
			g.in.moved = true
		}
		switch {
		case g.in.dragSlider:
			g.slideTo(x)
		case g.in.dragSpot && g.in.moved:
			g.placeSpot(x, y)
		case g.in.dragMap && g.in.moved && (dx != 0 || dy != 0):
			g.view.Pan(dx, dy)
			g.viewChanged()
		}
		g.in.lastX, g.in.lastY = x, y
	case !down && g.in.leftDown: // release
		g.in.leftDown = false
		if g.ui.safety {
			g.ui.safety = false
			return
		}
		if !g.in.moved && !g.in.dragSlider {
			g.click(g.in.pressX, g.in.pressY)
		}
	}
	if inpututil.IsKeyJustPressed(ebiten.KeyEscape) {
		g.ui.safety = false
		g.s.Select("")
	}
}

// overPanel reports whether (x, y) is on something drawn over the map.
func (g *game) overPanel(x, y float64) bool {
	if g.s.Selected() != "" && g.lay.Card.H > 0 {
		if r, ok := g.widgets["card"]; ok && r.Contains(x, y) {
			return true
		}
	}
	for _, n := range []string{"plot.wire", "plot.day", "notice"} {
		if g.hit(n, x, y) {
			return true
		}
	}
	return false
}

func (g *game) viewChanged() {
	g.lastView = time.Now()
	g.base.dirty = true
}

// placeSpot puts the listening spot at pixel (x, y) of the map.
func (g *game) placeSpot(x, y float64) {
	lat, lon := g.view.ToMap(x, y)
	if err := g.s.SetSpot(lat, lon); err != nil {
		g.ui.notice = err.Error()
	}
}

// click handles a press and release without movement.
func (g *game) click(x, y float64) {
	if g.hit("notice", x, y) {
		g.ui.notice = ""
		return
	}
	if g.hit("card.close", x, y) {
		g.s.Select("")
		return
	}
	if g.overPanel(x, y) {
		return
	}
	// Buttons and rows, by name.
	for name, r := range g.widgets {
		if !r.Contains(x, y) {
			continue
		}
		switch {
		case name == "top.overlay":
			g.ui.overlayOn = !g.ui.overlayOn
			g.lastView = time.Time{}
			return
		case name == "top.import":
			pickFile()
			return
		case name == "top.fit":
			g.fitRegion()
			return
		case name == "top.safety" || name == "rig.safety":
			g.ui.safety = true
			return
		case name == "clock.now":
			g.s.FollowNow()
			return
		case name == "clock.prev" || name == "clock.next":
			at, _ := g.s.At()
			d := 24 * time.Hour
			if name == "clock.prev" {
				d = -d
			}
			g.setTime(at.Add(d))
			return
		case strings.HasPrefix(name, "sort."):
			c, _ := strconv.Atoi(strings.TrimPrefix(name, "sort."))
			if g.ui.sortCol == c {
				g.ui.sortAsc = !g.ui.sortAsc
			} else {
				g.ui.sortCol, g.ui.sortAsc = c, c == colStation || c == colKHz || c == colKm
			}
			g.sideKey = ""
			return
		case strings.HasPrefix(name, "row."):
			id := strings.TrimPrefix(name, "row.")
			if g.s.Selected() == id {
				g.s.Select("")
			} else {
				g.s.Select(id)
			}
			return
		case strings.HasPrefix(name, "rig."):
			g.rigClick(strings.TrimPrefix(name, "rig."))
			return
		}
	}
	if g.lay.Map.Contains(x, y) {
		// A station under the pointer is selected; elsewhere the spot moves.
		best, bestD := "", 9.0
		for _, st := range g.s.Stations() {
			sx, sy := g.view.ToScreen(st.Place.LatDeg(), st.Place.LonDeg())
			if d := math.Hypot(x-sx, y-sy); d < bestD {
				best, bestD = st.ID, d
			}
		}
		if best != "" {
			g.s.Select(best)
			return
		}
		g.placeSpot(x, y)
	}
}

func (g *game) setTime(t time.Time) {
	if err := g.s.SetTime(t); err != nil {
		g.ui.notice = err.Error()
	}
}

// slideTo sets the hour from the clock slider at pixel x (quarter hours
// of the current UTC date).
func (g *game) slideTo(x float64) {
	r := g.widgets["clock.slider"]
	u := math.Max(0, math.Min(1, (x-r.X)/r.W))
	mins := math.Round(u*24*4) * 15
	at, _ := g.s.At()
	day := time.Date(at.Year(), at.Month(), at.Day(), 0, 0, 0, 0, time.UTC)
	t := day.Add(time.Duration(math.Min(mins, 24*60-15)) * time.Minute)
	if !t.Equal(at) {
		g.setTime(t)
	}
}

// rigClick handles rig.<row>.minus|plus|value.
func (g *game) rigClick(w string) {
	name, part, _ := strings.Cut(w, ".")
	i := slices.IndexFunc(rigRows, func(r rigRow) bool { return r.name == name })
	if i < 0 {
		return
	}
	row := rigRows[i]
	spec, _ := g.s.Rig()
	switch part {
	case "value":
		if row.choices == nil {
			g.ui.edit.field, g.ui.edit.buf = name, ""
		}
		return
	case "minus", "plus":
		dir := 1.0
		if part == "minus" {
			dir = -1
		}
		if row.choices != nil {
			cs := row.choices()
			j := slices.Index(cs, row.getS(spec))
			j = (j + int(dir) + len(cs)) % len(cs)
			row.setS(&spec, cs[j])
		} else {
			v := row.get(spec) + dir*row.step
			// Step onto the grid of the step size.
			v = math.Round(v/row.step) * row.step
			row.set(&spec, v)
		}
	}
	g.applyRig(spec)
}

func (g *game) applyRig(spec receiver.RigSpec) {
	if err := g.s.SetRig(spec); err != nil {
		g.ui.rigMsg = strings.TrimPrefix(err.Error(), "receiver: ")
	} else {
		g.ui.rigMsg = ""
	}
}

// typeInto takes typed characters for the rig value being edited: digits
// and a decimal point; Enter applies, Escape cancels.
func (g *game) typeInto() {
	g.in.runes = ebiten.AppendInputChars(g.in.runes[:0])
	for _, r := range g.in.runes {
		if (r >= '0' && r <= '9') || r == '.' || r == '-' {
			if len(g.ui.edit.buf) < 12 {
				g.ui.edit.buf += string(r)
			}
		}
	}
	if inpututil.IsKeyJustPressed(ebiten.KeyBackspace) && len(g.ui.edit.buf) > 0 {
		g.ui.edit.buf = g.ui.edit.buf[:len(g.ui.edit.buf)-1]
	}
	if inpututil.IsKeyJustPressed(ebiten.KeyEscape) {
		g.ui.edit.field = ""
		return
	}
	if inpututil.IsKeyJustPressed(ebiten.KeyEnter) || inpututil.IsKeyJustPressed(ebiten.KeyNumpadEnter) {
		name := g.ui.edit.field
		g.ui.edit.field = ""
		i := slices.IndexFunc(rigRows, func(r rigRow) bool { return r.name == name })
		v, err := strconv.ParseFloat(g.ui.edit.buf, 64)
		if err != nil || math.IsNaN(v) || math.IsInf(v, 0) {
			g.ui.rigMsg = fmt.Sprintf("%s: %q is not a number", rigRows[i].label, g.ui.edit.buf)
			return
		}
		spec, _ := g.s.Rig()
		rigRows[i].set(&spec, v)
		g.applyRig(spec)
	}
}

// importFile loads a picked scenario (.json) or station list (.csv). An
// invalid file changes nothing; its error is shown with line and field.
func (g *game) importFile(p picked) {
	if p.err != "" {
		g.ui.notice = p.name + ": " + p.err
		return
	}
	var err error
	if strings.HasSuffix(strings.ToLower(p.name), ".csv") {
		err = g.s.ImportStationsCSV(p.data, p.name)
	} else {
		err = g.s.ImportScenario(p.data, p.name)
	}
	if err != nil {
		var ae *assets.Error
		msg := err.Error()
		if errors.As(err, &ae) {
			msg = ae.Error()
		}
		g.ui.notice = "Not imported, nothing changed: " + strings.TrimPrefix(msg, "assets: ")
		return
	}
	g.ui.notice = "Imported " + p.name + "."
	g.fitRegion()
}

// sortKey is a result line's value in the chosen numeric column.
func sortKey(col int, khz, km, field, margin, chance float64) float64 {
	switch col {
	case colKHz:
		return khz
	case colKm:
		return km
	case colField:
		return field
	case colChance:
		return chance
	}
	return margin
}
