// Package session is the browser app's planning state, free of any UI: the
// scenario, the listening spot, the rig and the clock, and the jobs that
// turn them into answers — the spot prediction, the "how many stations
// here" overlay, the "more wire?" sweep and the selected station's day.
//
// WebAssembly runs on one thread, so every job advances in small pieces
// through Step, which the app calls once per frame with a time budget. The
// answers are those of the planner the command line uses (receiver/plan).
package session

import (
	"errors"
	"fmt"
	"math"
	"time"

	"earshot/assets"
	"earshot/propagation"
	"earshot/receiver"
	"earshot/receiver/plan"
)

// Session holds what the listener has chosen and what has been worked out
// from it. The zero value is not usable; call New.
type Session struct {
	scenario *assets.Scenario
	source   string // "demo" or the imported file's name
	isLand   func(lat, lon float64) bool
	world    plan.World

	spot      plan.Spot
	rig       receiver.RigSpec
	at        time.Time
	followNow bool
	selected  string

	planner *plan.Planner
	rigErr  error

	gen      int // bumped on every change of the inputs
	pred     *plan.Prediction
	predErr  error
	predGen  int
	predBusy bool

	overlay *overlayJob
	wire    *wireJob
	hours   hourJob

	now   func() time.Time
	yield func()
}

// New returns a session on the embedded demo scenario at its first spot,
// with the scenario's rig, following the current time.
func New(isLand func(lat, lon float64) bool) (*Session, error) {
	sc, err := assets.Demo()
	if err != nil {
		return nil, err
	}
	s := &Session{isLand: isLand, now: func() time.Time { return time.Now().UTC() }, followNow: true, overlay: new(overlayJob), wire: new(wireJob)}
	if err := s.setScenario(sc, "demo"); err != nil {
		return nil, err
	}
	s.at = s.now().Truncate(time.Minute)
	return s, nil
}

// SetClock replaces the session's source of the current time (tests).
func (s *Session) SetClock(now func() time.Time) {
	s.now = now
	if s.followNow {
		s.at = now().Truncate(time.Minute)
		s.changed(changeTime)
	}
}

// setScenario switches to sc: its first spot, its rig, a new planner.
func (s *Session) setScenario(sc *assets.Scenario, source string) error {
	world := sc.World(s.isLand)
	spots := sc.Spots()
	if len(spots) == 0 {
		return errors.New("session: the scenario has no listening spot")
	}
	p, err := plan.NewPlanner(world, sc.RigSpec())
	if err != nil {
		return err
	}
	s.scenario, s.source, s.world = sc, source, world
	s.spot, s.rig, s.planner, s.rigErr = spots[0], sc.RigSpec(), p, nil
	s.selected = ""
	s.changed(changeAll)
	return nil
}

// Scenario returns the scenario in use and where it came from ("demo" or
// a file name).
func (s *Session) Scenario() (*assets.Scenario, string) { return s.scenario, s.source }

// Stations returns the scenario's stations.
func (s *Session) Stations() []plan.Station { return s.world.Stations }

// Ground returns the ground at a point (regions over the land/sea mask).
func (s *Session) Ground(latDeg, lonDeg float64) propagation.Ground {
	return s.world.Ground(latDeg, lonDeg)
}

// Spot returns the listening spot.
func (s *Session) Spot() plan.Spot { return s.spot }

// Rig returns the rig as specified, and the error that keeps it from
// being built, if any (the previous rig stays in use meanwhile).
func (s *Session) Rig() (receiver.RigSpec, error) { return s.rig, s.rigErr }

// At returns the instant predicted for, and whether it follows the clock.
func (s *Session) At() (time.Time, bool) { return s.at, s.followNow }

// Selected returns the selected station's id ("" for none).
func (s *Session) Selected() string { return s.selected }

// What changed, for invalidating jobs.
const (
	changeSpot = 1 << iota
	changeRig
	changeTime
	changeSelect
	changeAll = changeSpot | changeRig | changeTime | changeSelect
)

func (s *Session) changed(what int) {
	s.gen++
	if what&(changeSpot|changeRig|changeTime) != 0 {
		s.predBusy = true
	}
	if what&changeRig != 0 {
		s.overlay.restart()
	}
	if what&(changeSpot|changeRig) != 0 {
		s.wire.stale = true
	}
	if what&(changeSpot|changeRig|changeSelect) != 0 {
		s.hours.stale = true
	}
	// A change of time restarts the wire sweep and the day plot only when
	// the day changes (see their pending), and the overlay when it moves
	// by overlayRetime or more.
}

// SetSpot moves the listening spot. A spot that matches a named spot of
// the scenario keeps its name; any other is named by its coordinates.
func (s *Session) SetSpot(latDeg, lonDeg float64) error {
	pl, err := propagation.NewPlace(latDeg, lonDeg)
	if err != nil {
		return err
	}
	name := fmt.Sprintf("%.4f, %.4f", latDeg, lonDeg)
	for _, sp := range s.scenario.Spots() {
		if sp.Place.LatDeg() == latDeg && sp.Place.LonDeg() == lonDeg {
			name = sp.Name
		}
	}
	s.spot = plan.Spot{Name: name, Place: pl}
	s.changed(changeSpot)
	return nil
}

// SetNamedSpot moves to one of the scenario's spots.
func (s *Session) SetNamedSpot(name string) error {
	sp, err := s.scenario.SpotByName(name)
	if err != nil {
		return err
	}
	s.spot = sp
	s.changed(changeSpot)
	return nil
}

// SetRig changes the rig. An invalid spec is kept (so the listener can see
// and correct it) with its error, and the last valid rig stays in use.
func (s *Session) SetRig(spec receiver.RigSpec) error {
	s.rig = spec
	p, err := s.planner.WithRig(spec)
	if err != nil {
		s.rigErr = err
		return err
	}
	s.planner, s.rigErr = p, nil
	s.changed(changeRig)
	return nil
}

// SetTime fixes the instant predicted for.
func (s *Session) SetTime(t time.Time) error {
	if y := t.Year(); y < propagation.MinSunYear || y > propagation.MaxSunYear {
		return &propagation.InputError{Field: "time", Value: float64(y), Want: fmt.Sprintf("in a year between %d and %d", propagation.MinSunYear, propagation.MaxSunYear)}
	}
	s.at, s.followNow = t.UTC().Truncate(time.Minute), false
	s.changed(changeTime)
	return nil
}

// FollowNow makes the clock follow the current time again.
func (s *Session) FollowNow() {
	s.followNow = true
	s.at = s.now().Truncate(time.Minute)
	s.changed(changeTime)
}

// Tick advances a following clock; it reports whether the minute changed.
func (s *Session) Tick() bool {
	if !s.followNow {
		return false
	}
	if t := s.now().Truncate(time.Minute); !t.Equal(s.at) {
		s.at = t
		s.changed(changeTime)
		return true
	}
	return false
}

// Select selects a station by id ("" for none).
func (s *Session) Select(id string) {
	if id == s.selected {
		return
	}
	s.selected = id
	s.changed(changeSelect)
}

// Prediction returns the latest prediction for the current inputs, or the
// previous one while the new one is worked out (fresh reports which), and
// the error of the last attempt.
func (s *Session) Prediction() (pr *plan.Prediction, fresh bool, err error) {
	return s.pred, s.pred != nil && s.predGen == s.gen && !s.predBusy, s.predErr
}

// Heard returns the selected station's line of the prediction, if any.
func (s *Session) Heard(id string) (plan.Heard, bool) {
	if s.pred == nil {
		return plan.Heard{}, false
	}
	for _, h := range s.pred.Heard {
		if h.Station.ID == id {
			return h, true
		}
	}
	return plan.Heard{}, false
}

// Receive follows a carrier at station frequency f and field e through
// the current rig, stage by stage.
func (s *Session) Receive(f propagation.KHz, fieldDBuVm float64) (receiver.Reception, error) {
	return s.planner.Rig().Receive(f, fieldDBuVm)
}

// Budget says whether a job may start another piece of work.
type Budget func() bool

// Deadline returns a Budget that allows work until d has passed since the
// call (at least the first piece always runs).
func Deadline(d time.Duration) Budget {
	end := time.Now().Add(d)
	first := true
	return func() bool {
		if first {
			first = false
			return true
		}
		return time.Now().Before(end)
	}
}

// Job names for Progress.
const (
	JobNone    = ""
	JobPredict = "prediction"
	JobHours   = "day plot"
	JobOverlay = "map overlay"
	JobWire    = "wire sweep"
)

// Progress says what the session is working on and how far it is (0–1).
type Progress struct {
	Job  string
	Done float64
}

// Busy reports whether any job has work left.
func (s *Session) Busy() bool {
	return s.predBusy || s.hours.pending(s) || s.overlay.pending(s) || s.wire.pending(s)
}

// Step advances the jobs while more allows, most urgent first: the spot
// prediction (which always completes in the call once its caches are
// warm), then the selected station's day, the overlay, and the wire sweep.
// It returns what it is working on.
func (s *Session) Step(more Budget) Progress {
	if s.predBusy {
		done, err := s.planner.Prepare(s.spot, more)
		if err != nil {
			s.predErr, s.predBusy = err, false
			return Progress{}
		}
		if !done {
			return Progress{Job: JobPredict}
		}
		pr, err := s.planner.Predict(s.spot, s.at)
		s.predBusy = false
		s.predGen = s.gen
		if err != nil {
			s.predErr = err
		} else {
			s.pred, s.predErr = &pr, nil
		}
	}
	if s.hours.pending(s) {
		if p, ok := s.hours.step(s, more); !ok {
			return p
		}
	}
	if s.overlay.pending(s) {
		if p, ok := s.overlay.step(s, more); !ok {
			return p
		}
	}
	if s.wire.pending(s) {
		if p, ok := s.wire.step(s, more); !ok {
			return p
		}
	}
	return Progress{}
}

// finite reports whether v is neither NaN nor infinite.
func finite(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }
