//go:build js

// Command app is earshot's field app: a map of the region with its
// transmitters and the listening spot, the rig and the clock, and the list
// of what the rig hears there, drawn on an ebiten canvas in the browser.
// All answers come from earshot/wasm/session, which uses the same planner
// as the command line.
//
// Build: GOOS=js GOARCH=wasm go build -o app.wasm ./wasm/app (make app).
package main

import (
	"bytes"
	"encoding/json"
	"fmt"
	"log"
	"math"
	"time"

	"earshot/assets"
	"earshot/receiver/plan"
	"earshot/wasm/screen"
	"earshot/wasm/session"

	"github.com/hajimehoshi/ebiten/v2"
	"github.com/hajimehoshi/ebiten/v2/text/v2"
	"golang.org/x/image/font/gofont/gobold"
	"golang.org/x/image/font/gofont/goregular"
)

// Frame budgets for the session's jobs: generous until the first answer
// is on screen, then small enough to keep drawing at full rate.
const (
	coldBudget = 100 * time.Millisecond
	warmBudget = 9 * time.Millisecond
	// overlaySlice is how long the overlay's goroutine works between
	// sleeps.
	overlaySlice = 6 * time.Millisecond
)

type game struct {
	s    *session.Session
	mask *assets.LandMask

	face, small, bold *text.GoTextFace

	w, h int
	lay  screen.Layout
	view screen.Viewport
	fit  bool // the view has been fitted to the region once

	in       input
	ui       uiState
	widgets  map[string]screen.Rect
	progress session.Progress

	shownProgress session.Progress // the progress the top bar shows
	progressShown time.Time

	base      baseMap
	side      *ebiten.Image
	sideKey   string
	plots     plotCache
	ovl       overlayCache
	lastView  time.Time // last pan or zoom
	savedJSON string

	draws      int
	updates    int
	started    time.Time // when main began
	frames     frameKeys // what is on screen
	cold       coldStart
	lastUpdate time.Time
	ready      bool
	timing     map[string]float64 // smoothed milliseconds per part of a tick
}

// started is when the program began.
var started = time.Now()

func main() {
	navStart := navMs()
	installHook()
	g, err := newGame()
	if err != nil {
		log.Fatal(err)
	}
	g.cold.NavStartMs = navStart
	ebiten.SetWindowTitle("earshot — what will the crystal set hear?")
	ebiten.SetRunnableOnUnfocused(true)
	// One Update per frame: the app is not a simulation that must catch up,
	// and each Update already spends a time budget on the jobs.
	ebiten.SetTPS(ebiten.SyncWithFPS)
	ebiten.SetScreenClearedEveryFrame(false)
	if err := ebiten.RunGame(g); err != nil {
		log.Fatal(err)
	}
}

func newGame() (*game, error) {
	mask, err := assets.LoadLandMask()
	if err != nil {
		return nil, err
	}
	s, err := session.New(mask.IsLand)
	if err != nil {
		return nil, err
	}
	g := &game{s: s, mask: mask, widgets: map[string]screen.Rect{}, timing: map[string]float64{}, started: started}
	// The overlay is worked out in a goroutine; on the browser's single
	// thread it must sleep now and then for the page to draw (a sleep hands
	// control back to the browser until its timer fires).
	slice := time.Now()
	s.SetYield(func() {
		if work := time.Since(slice); work > overlaySlice {
			t := time.Now()
			time.Sleep(time.Millisecond)
			slice = time.Now()
			g.timing["overlay_work"] = 0.9*g.timing["overlay_work"] + 0.1*float64(work.Microseconds())/1000
			g.timing["overlay_sleep"] = 0.9*g.timing["overlay_sleep"] + 0.1*float64(slice.Sub(t).Microseconds())/1000
		}
	})
	g.ui.sortCol, g.ui.overlayOn = colMargin, true
	if saved, ok := storageGet(); ok {
		if err := s.Restore([]byte(saved)); err != nil {
			storageRemove()
			g.ui.notice = "Saved settings could not be read, so the app starts afresh (" + err.Error() + ")."
		} else {
			g.savedJSON = saved
		}
	}
	// The Go fonts, embedded (their licence: FONTS.txt), loaded once.
	for _, src := range []struct {
		face **text.GoTextFace
		ttf  []byte
		size float64
	}{{&g.face, goregular.TTF, 13}, {&g.small, goregular.TTF, 11}, {&g.bold, gobold.TTF, 13}} {
		fs, err := text.NewGoTextFaceSource(bytes.NewReader(src.ttf))
		if err != nil {
			return nil, err
		}
		*src.face = &text.GoTextFace{Source: fs, Size: src.size}
	}
	return g, nil
}

// Layout uses the browser window's size in CSS pixels.
func (g *game) Layout(outsideWidth, outsideHeight int) (int, int) {
	if outsideWidth != g.w || outsideHeight != g.h {
		g.w, g.h = max(outsideWidth, 480), max(outsideHeight, 360)
		g.lay = screen.NewLayout(float64(g.w), float64(g.h))
		g.view.Area = g.lay.Map
		g.base.dirty = true
		g.sideKey = ""
		g.plots.key = [2]string{}
	}
	return g.w, g.h
}

func (g *game) Update() error {
	g.updates++
	if g.w == 0 {
		return nil
	}
	if !g.fit {
		g.fitRegion()
		g.fit = true
	}
	g.handleInput()
	g.s.Tick()
	budget := warmBudget
	if !g.ready {
		budget = coldBudget
	}
	// The overlay follows the view once it has been still for a moment.
	if time.Since(g.lastView) > 300*time.Millisecond {
		minLat, maxLat, minLon, maxLon := g.view.Bounds()
		cols := max(int(g.lay.Map.W/7), 8)
		rows := max(int(g.lay.Map.H/7), 8)
		g.s.SetOverlay(g.ui.overlayOn, plan.BBox{MinLat: minLat, MaxLat: maxLat, MinLon: minLon, MaxLon: maxLon}, cols, rows)
	}
	t := time.Now()
	g.progress = g.s.Step(session.Deadline(budget))
	stepMs := float64(time.Since(t).Microseconds()) / 1000
	g.timing["step"] = 0.8*g.timing["step"] + 0.2*stepMs
	if !g.ready {
		if !g.lastUpdate.IsZero() {
			g.cold.FrameGapMs = math.Max(g.cold.FrameGapMs, float64(time.Since(g.lastUpdate).Microseconds())/1000)
		}
		g.lastUpdate = time.Now()
		g.cold.Updates++
		g.cold.StepMs += stepMs
		g.cold.WallMs = float64(time.Since(g.started).Microseconds()) / 1000
	}
	t = time.Now()
	g.persist()
	g.publish()
	g.timing["publish"] = 0.8*g.timing["publish"] + 0.2*float64(time.Since(t).Microseconds())/1000
	return nil
}

// fitRegion shows the scenario's local area: the spots and the stations
// within 300 km of the first spot.
func (g *game) fitRegion() {
	sp := g.s.Spot().Place
	minLat, maxLat, minLon, maxLon := sp.LatDeg(), sp.LatDeg(), sp.LonDeg(), sp.LonDeg()
	grow := func(lat, lon float64) {
		minLat, maxLat = math.Min(minLat, lat), math.Max(maxLat, lat)
		minLon, maxLon = math.Min(minLon, lon), math.Max(maxLon, lon)
	}
	sc, _ := g.s.Scenario()
	for _, s := range sc.Spots() {
		grow(s.Place.LatDeg(), s.Place.LonDeg())
	}
	for _, st := range g.s.Stations() {
		if dist(st.Place.LatDeg(), st.Place.LonDeg(), sp.LatDeg(), sp.LonDeg()) < 300 {
			grow(st.Place.LatDeg(), st.Place.LonDeg())
		}
	}
	pad := 0.3
	g.view.Fit(minLat-pad, maxLat+pad, minLon-pad, maxLon+pad)
	g.lastView = time.Now()
	g.base.dirty = true
}

// dist is a great-circle distance in km for layout decisions (haversine
// on the 6371 km sphere).
func dist(lat1, lon1, lat2, lon2 float64) float64 {
	r := math.Pi / 180
	a := math.Pow(math.Sin((lat2-lat1)*r/2), 2) + math.Cos(lat1*r)*math.Cos(lat2*r)*math.Pow(math.Sin((lon2-lon1)*r/2), 2)
	return 2 * 6371 * math.Asin(math.Min(1, math.Sqrt(a)))
}

// persist saves the listener's choices as soon as they change (the
// saved form is small; writing it only when it differs keeps storage
// quiet), so a reload right after a change keeps it.
func (g *game) persist() {
	data, err := g.s.Save()
	if err != nil {
		return
	}
	if string(data) != g.savedJSON {
		storageSet(string(data))
		g.savedJSON = string(data)
	}
}

// appState is what earshot_state() returns.
type appState struct {
	session.Snapshot
	Ready     bool                   `json:"ready"`
	Draws     int                    `json:"draws"`
	FPS       float64                `json:"fps"`
	MouseDown bool                   `json:"mouse_down"`
	Editing   string                 `json:"editing"`
	Notice    string                 `json:"notice"`
	Work      string                 `json:"work"`
	Overlay   overlayStateJSON       `json:"overlay"`
	Widgets   map[string]screen.Rect `json:"widgets"`
	Screen    [2]int                 `json:"screen"`
	Timing    map[string]float64     `json:"timing_ms"`
	Updates   int                    `json:"updates"`
	Cold      coldStart              `json:"cold_start"`
}

// coldStart measures the way to the first answer: frames, the time spent
// on the session's jobs in them, and the time since the program started.
type coldStart struct {
	Updates int     `json:"updates"`
	StepMs  float64 `json:"step_ms"`
	WallMs  float64 `json:"wall_ms"`
	// Milliseconds from the page's navigation (performance.now) to the
	// program's start, to its first frame (interactive: the map and the
	// panels respond) and to the first results on screen.
	DrawMs          float64 `json:"draw_ms"`
	FrameGapMs      float64 `json:"frame_gap_ms"` // longest time between two updates
	NavStartMs      float64 `json:"nav_start_ms"`
	NavFirstFrameMs float64 `json:"nav_first_frame_ms"`
	NavReadyMs      float64 `json:"nav_ready_ms"`
}

type overlayStateJSON struct {
	On   bool    `json:"on"`
	Frac float64 `json:"progress"`
	Done bool    `json:"done"`
}

// publish tells the test hook what it needs every frame; the state itself
// is encoded only when the hook asks for it (stateJSON).
func (g *game) publish() {
	v := g.view
	hookPublish(g.stateJSON, g.draws, g.ready, func(lat, lon float64) (float64, float64) { return v.ToScreen(lat, lon) })
}

// stateJSON encodes the app's state for earshot_state(). The browser calls
// it between frames, on the thread that runs Update and Draw, so it reads
// the game without locks.
func (g *game) stateJSON() string {
	o := g.s.Overlay()
	st := appState{Snapshot: g.s.Snapshot(), Ready: g.ready, Draws: g.draws, FPS: ebiten.ActualFPS(), MouseDown: g.in.leftDown,
		Editing: g.ui.edit.field, Notice: g.ui.notice, Work: g.progress.Job, Widgets: g.widgets, Screen: [2]int{g.w, g.h}, Timing: g.timing, Updates: g.updates, Cold: g.cold,
		Overlay: overlayStateJSON{On: o.Enabled, Frac: o.Frac, Done: o.Done}}
	data, err := json.Marshal(st)
	if err != nil {
		return fmt.Sprintf(`{"error":%q}`, err.Error())
	}
	return string(data)
}

func (g *game) Draw(dst *ebiten.Image) {
	if g.w == 0 {
		return
	}
	if g.cold.NavFirstFrameMs == 0 {
		g.cold.NavFirstFrameMs = navMs()
	}
	// Draw only the regions whose content changed: the screen keeps the
	// last frame (SetScreenClearedEveryFrame(false)), and the software
	// renderer of a machine without a GPU is spared full redraws (a full
	// 1280×800 frame costs it tens of milliseconds).
	mk, sk, tk := g.mapKey(), g.sideKeyNow(), g.topKey()
	full := g.draws == 0 || g.ui.safety != g.frames.safety || g.w != g.frames.w || g.h != g.frames.h
	if g.ui.safety && !full {
		return // the safety note covers everything
	}
	t := time.Now()
	lap := func(name string) {
		now := time.Now()
		ms := float64(now.Sub(t).Microseconds()) / 1000
		g.timing[name] = 0.8*g.timing[name] + 0.2*ms
		if !g.ready {
			g.cold.DrawMs += ms
		}
		t = now
	}
	drew := false
	if full || mk != g.frames.mapKey {
		fillRect(dst, g.lay.Map, colBackground)
		g.drawMap(dst)
		g.drawPlots(dst)
		g.drawCard(dst)
		g.drawNotice(dst)
		lap("map")
		drew = true
	}
	if full || sk != g.frames.sideKey {
		g.drawSide(dst)
		lap("side")
		drew = true
	}
	if full || tk != g.frames.topKey {
		g.drawTop(dst)
		lap("top")
		drew = true
	}
	if g.ui.safety {
		g.drawSafety(dst)
	}
	g.frames = frameKeys{mapKey: mk, sideKey: sk, topKey: tk, safety: g.ui.safety, w: g.w, h: g.h}
	if drew {
		g.draws++
	}
	if _, fresh, _ := g.s.Prediction(); fresh && !g.ready && drew {
		g.ready = true
		g.cold.NavReadyMs = navMs()
	}
}

// frameKeys are the keys of the regions on screen.
type frameKeys struct {
	mapKey, sideKey, topKey string
	safety                  bool
	w, h                    int
}

// topKey sums up the top bar: scenario, buttons, work in progress (in
// steps of 5 %).
// The progress shown changes at most twice a second: each redraw costs a
// full present of the canvas.
func (g *game) topKey() string {
	sc, src := g.s.Scenario()
	if time.Since(g.progressShown) > 500*time.Millisecond || (g.progress.Job == "") != (g.shownProgress.Job == "") {
		g.shownProgress, g.progressShown = g.progress, time.Now()
	}
	return fmt.Sprint(sc.Name, src, g.ui.overlayOn, g.shownProgress.Job, int(20*g.shownProgress.Done))
}

// mapKey sums up the map region (with the plots, the card and the
// notice drawn over it); equal keys, equal pictures.
func (g *game) mapKey() string {
	pr, _, _ := g.s.Prediction()
	at, _ := g.s.At()
	o := g.s.Overlay()
	lengths, day, night, wdone := g.s.Wire()
	spec, _ := g.s.Rig()
	known := 0
	for i := range day {
		if day[i] != -1 {
			known++
		}
		if night[i] != -1 {
			known++
		}
	}
	dp := g.s.Day()
	dayKnown := 0
	for _, v := range dp.FieldDB {
		if v == v {
			dayKnown++
		}
	}
	settled := time.Since(g.lastView) > 150*time.Millisecond
	return fmt.Sprint(g.view.CentreLat, g.view.CentreLon, g.view.PxPerDeg, g.base.dirty && settled, g.base.at != at,
		fmt.Sprintf("%p", pr), spec.WireM, g.s.Selected(), g.s.Spot(),
		fmt.Sprintf("%p", o.Shown), o.Done, o.Err, o.Enabled, g.ui.overlayOn, g.ui.notice,
		len(lengths), known, wdone, dp.StationID, dp.Start, dayKnown)
}
