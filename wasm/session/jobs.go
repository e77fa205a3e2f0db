package session

import (
	"math"
	"slices"
	"sync"
	"sync/atomic"
	"time"

	"earshot/propagation"
	"earshot/receiver/plan"
)

// overlayJob computes the count map over the visible box: a coarse grid
// (a quarter of the resolution each way), then the full grid, each by one
// plan.Map call in a goroutine of its own. Under WebAssembly that
// goroutine shares the single thread with the app: Map's progress
// Pause hook calls the session's yield, which lets the browser draw
// frames between pieces of the map (see SetYield).
type overlayJob struct {
	enabled    bool
	box        plan.BBox
	cols, rows int
	at         time.Time // the instant of the grids
	gen        int       // bumped on every restart

	mu      sync.Mutex // guards the fields below, written by the worker
	running bool
	shown   *plan.Grid // the last complete grid
	level   int        // 0 none yet, 1 coarse, 2 full
	done    float64    // fraction of the current grid
	err     error
	stop    atomic.Int64 // the generation the worker must stop at
}

// overlayRetime is how far the clock may move before the overlay is
// computed again (the sky wave changes slowly but for twilight).
const overlayRetime = 15 * time.Minute

func (o *overlayJob) restart() {
	o.mu.Lock()
	defer o.mu.Unlock()
	o.gen++
	o.stop.Store(int64(o.gen))
	o.shown, o.level, o.done, o.err = nil, 0, 0, nil
}

func (o *overlayJob) pending(s *Session) bool {
	if !o.enabled || o.cols == 0 {
		return false
	}
	o.mu.Lock()
	level, shown, err := o.level, o.shown, o.err
	o.mu.Unlock()
	if shown != nil && (s.at.Sub(o.at) >= overlayRetime || o.at.Sub(s.at) >= overlayRetime) {
		o.restart()
		level = 0
	}
	return level < 2 && err == nil
}

// SetOverlay asks for the count overlay over box at cols×rows cells (the
// app passes the visible map), or turns it off with enabled false. The box
// is clipped to valid latitudes and longitudes. A different box or size
// restarts it.
func (s *Session) SetOverlay(enabled bool, box plan.BBox, cols, rows int) {
	o := s.overlay
	box.MinLat, box.MaxLat = math.Max(-89.9, box.MinLat), math.Min(89.9, box.MaxLat)
	box.MinLon, box.MaxLon = math.Max(-180, box.MinLon), math.Min(180, box.MaxLon)
	cols, rows = max(cols, 8), max(rows, 8)
	if enabled != o.enabled {
		o.enabled = enabled
		o.restart()
	}
	if box == o.box && cols == o.cols && rows == o.rows {
		return
	}
	o.box, o.cols, o.rows = box, cols, rows
	o.restart()
}

// SetYield sets a function that Map calls at every node and cell while
// the overlay is computed in its goroutine. A single-threaded caller
// (WebAssembly) passes one that sleeps briefly every few milliseconds so
// the browser can run its frames; natively it is not needed.
func (s *Session) SetYield(yield func()) { s.yield = yield }

// OverlayState is what the overlay has to show.
type OverlayState struct {
	Enabled bool
	Shown   *plan.Grid // the latest complete grid (coarse, then full), nil at first
	Done    bool       // the full grid is shown
	Frac    float64    // progress of the grid being computed
	Err     error
}

// Overlay returns the overlay's state.
func (s *Session) Overlay() OverlayState {
	o := s.overlay
	o.mu.Lock()
	defer o.mu.Unlock()
	return OverlayState{Enabled: o.enabled, Shown: o.shown, Done: o.level == 2, Frac: o.done, Err: o.err}
}

func (o *overlayJob) step(s *Session, more Budget) (Progress, bool) {
	o.mu.Lock()
	running, frac, level := o.running, o.done, o.level
	o.mu.Unlock()
	if running {
		return Progress{Job: JobOverlay, Done: (float64(level) + frac) / 2}, false
	}
	if err := o.box.Validate(); err != nil {
		o.mu.Lock()
		o.err = err
		o.mu.Unlock()
		return Progress{}, true
	}
	o.at = s.at
	gen, box, cols, rows, at, p, yield := o.gen, o.box, o.cols, o.rows, o.at, s.planner, s.yield
	o.mu.Lock()
	o.running = true
	o.mu.Unlock()
	go func() {
		defer func() {
			o.mu.Lock()
			o.running = false
			o.mu.Unlock()
		}()
		stop := func() bool { return o.stop.Load() != int64(gen) }
		for lvl, div := range []int{4, 1} {
			if lvl < level {
				continue
			}
			progress := func(done, total int) {
				o.mu.Lock()
				o.done = float64(done) / float64(total)
				o.mu.Unlock()
			}
			g, err := p.Map(box, max(cols/div, 2), max(rows/div, 2), at, plan.MapCount, "", plan.MapOptions{Workers: 1, Stop: stop, Pause: yield}, progress)
			o.mu.Lock()
			if o.gen != gen {
				o.mu.Unlock()
				return
			}
			if err != nil {
				o.err = err
				o.mu.Unlock()
				return
			}
			o.shown, o.level, o.done = g, lvl+1, 0
			o.mu.Unlock()
		}
	}()
	return Progress{Job: JobOverlay}, false
}

// wireJob counts the audible stations by day and at night for each wire
// length of plan.WireLengthsM at the current spot, height and rig. Each
// length needs the rig's response worked out afresh (about a second of
// WebAssembly for the whole band), so the sweep runs in a goroutine of its
// own which, like the overlay's, yields through the session's yield.
type wireJob struct {
	stale bool
	gen   int
	stop  atomic.Int64
	dayAt time.Time // local noon of the sweep's day

	mu         sync.Mutex // guards the fields below, written by the worker
	running    bool
	lengthsM   []float64
	day, night []int // −1: not yet known; −2: that rig cannot be built
	done       int   // lengths finished
}

func (w *wireJob) pending(s *Session) bool {
	if day, _ := plan.DayAndNight(s.at, s.spot); !day.Equal(w.dayAt) {
		w.stale = true
	}
	w.mu.Lock()
	defer w.mu.Unlock()
	return w.stale || w.running || w.done < len(w.lengthsM)
}

// Wire returns the wire sweep so far: lengths (m) and day and night
// counts (−1 where not yet known, −2 where that rig is invalid).
func (s *Session) Wire() (lengthsM []float64, day, night []int, done bool) {
	w := s.wire
	w.mu.Lock()
	defer w.mu.Unlock()
	return w.lengthsM, slices.Clone(w.day), slices.Clone(w.night), !w.stale && !w.running && w.done == len(w.lengthsM)
}

func (w *wireJob) step(s *Session, more Budget) (Progress, bool) {
	w.mu.Lock()
	running, done, n := w.running, w.done, len(w.lengthsM)
	w.mu.Unlock()
	if !w.stale {
		if running {
			return Progress{Job: JobWire, Done: float64(done) / float64(max(n, 1))}, false
		}
		return Progress{}, true
	}
	if running { // a stale sweep still stopping
		w.stop.Store(-1)
		return Progress{Job: JobWire}, false
	}
	w.stale = false
	w.gen++
	gen := w.gen
	w.stop.Store(int64(gen))
	w.dayAt, _ = plan.DayAndNight(s.at, s.spot)
	lengths := plan.WireLengthsM(s.planner.Spec().WireM)
	w.mu.Lock()
	w.lengthsM, w.done, w.running = lengths, 0, true
	w.day, w.night = make([]int, len(lengths)), make([]int, len(lengths))
	for i := range w.day {
		w.day[i], w.night[i] = -1, -1
	}
	w.mu.Unlock()
	base, spot, heightM, dayAt, yield := s.planner, s.spot, s.planner.Spec().HeightM, w.dayAt, s.yield
	go func() {
		defer func() {
			w.mu.Lock()
			w.running = false
			w.mu.Unlock()
		}()
		stopped := func() bool { return w.stop.Load() != int64(gen) }
		more := func() bool {
			if yield != nil {
				yield()
			}
			return !stopped()
		}
		for i, l := range lengths {
			d, n := -2, -2
			spec := plan.SpecWithWire(base.Spec(), l, heightM)
			q := base
			if spec != base.Spec() {
				var err error
				if q, err = base.WithRig(spec); err != nil {
					q = nil
				} else {
					q.SetPause(yield) // this planner is the worker's alone
				}
			}
			if q != nil {
				ok, err := q.Prepare(spot, more)
				if stopped() {
					return
				}
				if ok && err == nil {
					if pr, err := q.Predict(spot, dayAt); err == nil {
						d = pr.Audible()
					}
					if pr, err := q.Predict(spot, dayAt.Add(12*time.Hour)); err == nil {
						n = pr.Audible()
					}
				}
			}
			w.mu.Lock()
			if stopped() {
				w.mu.Unlock()
				return
			}
			w.day[i], w.night[i], w.done = d, n, i+1
			w.mu.Unlock()
		}
	}()
	return Progress{Job: JobWire}, false
}

// DayPoints is the number of points of the selected station's day plot
// (every half hour, both midnights included).
const DayPoints = 49

// hourJob follows the selected station's field through the local day.
type hourJob struct {
	stale bool
	id    string
	day   Day
	i     int
}

// Day is the selected station's field through one day at the spot, from
// local (mean solar) midnight to midnight.
type Day struct {
	StationID string
	Start     time.Time // local mean midnight, UTC instant
	At        []time.Time
	// Fields in dB(µV/m) at each instant; NaN where not yet computed. Sky
	// is NaN where there is no sky wave (day). MinDBuVm is the rig's
	// weakest audible field (+Inf where the rig cannot tune the station).
	FieldDB, GroundDB, SkyDB, MinDBuVm []float64
	Sun                                propagation.SunDay
	Done                               bool
}

func (h *hourJob) pending(s *Session) bool {
	if s.selected == "" {
		return false
	}
	if _, night := plan.DayAndNight(s.at, s.spot); !night.Add(-24 * time.Hour).Equal(h.day.Start) {
		h.stale = true
	}
	return h.stale || h.id != s.selected || !h.day.Done
}

// Day returns the selected station's day so far (Done when complete).
func (s *Session) Day() Day { return s.hours.day }

func (h *hourJob) step(s *Session, more Budget) (Progress, bool) {
	if h.stale || h.id != s.selected {
		h.stale, h.id, h.i = false, s.selected, 0
		_, night := plan.DayAndNight(s.at, s.spot)
		start := night.Add(-24 * time.Hour)
		d := Day{StationID: s.selected, Start: start}
		for i := range DayPoints {
			d.At = append(d.At, start.Add(time.Duration(i)*30*time.Minute))
			d.FieldDB = append(d.FieldDB, math.NaN())
			d.GroundDB = append(d.GroundDB, math.NaN())
			d.SkyDB = append(d.SkyDB, math.NaN())
			d.MinDBuVm = append(d.MinDBuVm, math.NaN())
		}
		d.Sun, _ = propagation.SunEvents(start.Add(12*time.Hour), s.spot.Place.LatDeg(), s.spot.Place.LonDeg())
		h.day = d
	}
	if s.predBusy {
		return Progress{Job: JobHours}, false
	}
	for h.i < DayPoints && more() {
		pr, err := s.planner.Predict(s.spot, h.day.At[h.i])
		if err == nil {
			for _, hd := range pr.Heard {
				if hd.Station.ID != h.id {
					continue
				}
				h.day.FieldDB[h.i], h.day.GroundDB[h.i] = hd.FieldDB, hd.GroundDB
				if hd.SkyDB != nil {
					h.day.SkyDB[h.i] = *hd.SkyDB
				}
				h.day.MinDBuVm[h.i] = hd.FieldDB - hd.DetectorDB
				if math.IsInf(hd.DetectorDB, -1) {
					h.day.MinDBuVm[h.i] = math.Inf(1)
				}
			}
		}
		h.i++
	}
	if h.i == DayPoints {
		h.day.Done = true
		return Progress{}, true
	}
	return Progress{Job: JobHours, Done: float64(h.i) / DayPoints}, false
}
