package session

import (
	"bytes"
	"encoding/json"
	"fmt"
	"math"
	"strconv"
	"time"

	"earshot/assets"
	"earshot/receiver"
)

// SavedFormat and SavedVersion identify the app's saved state (kept in the
// browser's local storage).
const (
	SavedFormat  = "earshot-app-state"
	SavedVersion = 1
)

// saved is the persisted form of a session.
type saved struct {
	Format  string `json:"format"`
	Version int    `json:"version"`
	// Scenario is an imported scenario in the scenario file format
	// (assets/README.md); absent for the embedded demo.
	Scenario json.RawMessage `json:"scenario,omitempty"`
	Source   string          `json:"source"`
	Lat      float64         `json:"lat"`
	Lon      float64         `json:"lon"`
	Rig      assets.Rig      `json:"rig"`
	// Time is an RFC 3339 instant, or empty to follow the clock.
	Time     string `json:"time"`
	Selected string `json:"selected,omitempty"`
}

// Save returns the session's choices as JSON: scenario (unless it is the
// demo), spot, rig, clock and selection.
func (s *Session) Save() ([]byte, error) {
	sv := saved{Format: SavedFormat, Version: SavedVersion, Source: s.source,
		Lat: s.spot.Place.LatDeg(), Lon: s.spot.Place.LonDeg(), Rig: assets.Rig(s.rig), Selected: s.selected}
	if s.source != "demo" {
		data, err := s.scenario.MarshalIndent()
		if err != nil {
			return nil, err
		}
		var buf bytes.Buffer
		if err := json.Compact(&buf, data); err != nil {
			return nil, err
		}
		sv.Scenario = buf.Bytes()
	}
	if !s.followNow {
		sv.Time = s.at.Format(time.RFC3339)
	}
	return json.Marshal(sv)
}

// Restore applies saved choices (from Save). On any error the session is
// left as it was and the error says what was wrong.
func (s *Session) Restore(data []byte) error {
	var sv saved
	dec := json.NewDecoder(bytes.NewReader(data))
	dec.DisallowUnknownFields()
	if err := dec.Decode(&sv); err != nil {
		return fmt.Errorf("saved state: %v", err)
	}
	if sv.Format != SavedFormat || sv.Version != SavedVersion {
		return fmt.Errorf("saved state: format %q version %d, want %q version %d", sv.Format, sv.Version, SavedFormat, SavedVersion)
	}
	t := *s // a copy to try on
	if len(sv.Scenario) > 0 {
		sc, err := assets.ParseScenario(sv.Scenario, "saved scenario")
		if err != nil {
			return fmt.Errorf("saved state: %v", err)
		}
		if err := t.setScenario(sc, sv.Source); err != nil {
			return fmt.Errorf("saved state: %v", err)
		}
	} else if t.source != "demo" {
		sc, err := assets.Demo()
		if err != nil {
			return err
		}
		if err := t.setScenario(sc, "demo"); err != nil {
			return err
		}
	}
	if err := t.SetSpot(sv.Lat, sv.Lon); err != nil {
		return fmt.Errorf("saved state: spot: %v", err)
	}
	if err := t.SetRig(receiver.RigSpec(sv.Rig)); err != nil {
		return fmt.Errorf("saved state: rig: %v", err)
	}
	if sv.Time == "" {
		t.FollowNow()
	} else {
		at, err := time.Parse(time.RFC3339, sv.Time)
		if err != nil {
			return fmt.Errorf("saved state: time: %v", err)
		}
		if err := t.SetTime(at); err != nil {
			return fmt.Errorf("saved state: %v", err)
		}
	}
	t.Select("")
	for _, st := range t.world.Stations {
		if st.ID == sv.Selected {
			t.Select(sv.Selected)
		}
	}
	*s = t
	return nil
}

// ImportScenario replaces the scenario with a scenario file's content. An
// invalid file changes nothing; its error names the line or JSON path and
// the field.
func (s *Session) ImportScenario(data []byte, name string) error {
	sc, err := assets.ParseScenario(data, name)
	if err != nil {
		return err
	}
	return s.setScenario(sc, name)
}

// ImportStationsCSV replaces the stations with those of a CSV file
// (id,name,khz,kw,lat,lon[,kw_night,height_deg]), heard at the current
// spot with the current rig, over the world land/sea mask. An invalid file
// changes nothing; its error names the row and field.
func (s *Session) ImportStationsCSV(data []byte, name string) error {
	st, err := assets.ParseStationsCSV(bytes.NewReader(data), name)
	if err != nil {
		return err
	}
	sc := assets.ScenarioFromStations(st, s.spot)
	sc.Rig = assets.Rig(s.rig)
	if err := sc.Validate(); err != nil {
		return err
	}
	return s.setScenario(sc, name)
}

// StationJSON is one line of the result list in the app's state, with the
// names and units of `earshot predict --json`.
type StationJSON struct {
	ID       string   `json:"id"`
	Name     string   `json:"name"`
	KHz      float64  `json:"khz"`
	Km       float64  `json:"km"`
	GroundDB float64  `json:"ground_dbuvm"`
	SkyDB    *float64 `json:"sky_dbuvm"`
	EDB      float64  `json:"e_dbuvm"`
	MarginDB float64  `json:"margin_db"`
	Chance   float64  `json:"chance"`
	Audible  bool     `json:"audible"`
	MaskedBy *string  `json:"masked_by"`
	Verdict  string   `json:"verdict"`
}

// Snapshot is the session's state as the app's test hook reports it.
type Snapshot struct {
	Source   string        `json:"source"`
	Spot     string        `json:"spot"`
	Lat      float64       `json:"lat"`
	Lon      float64       `json:"lon"`
	Time     string        `json:"time"`
	Follow   bool          `json:"follow_now"`
	Rig      assets.Rig    `json:"rig"`
	RigError string        `json:"rig_error,omitempty"`
	Selected string        `json:"selected"`
	Fresh    bool          `json:"fresh"` // the results answer the current inputs
	Busy     bool          `json:"busy"`
	Audible  int           `json:"audible"`
	Results  []StationJSON `json:"results"`
	// Args are the command-line arguments of `earshot` that predict the
	// same (for the demo scenario; an imported one needs --scenario FILE).
	Args []string `json:"cli_args"`
}

// Snapshot returns the state for the test hook.
func (s *Session) Snapshot() Snapshot {
	pr, fresh, err := s.Prediction()
	snap := Snapshot{Source: s.source, Spot: s.spot.Name, Lat: s.spot.Place.LatDeg(), Lon: s.spot.Place.LonDeg(),
		Time: s.at.Format(time.RFC3339), Follow: s.followNow, Rig: assets.Rig(s.rig), Selected: s.selected,
		Fresh: fresh, Busy: s.Busy(), Args: s.CLIArgs(), Results: []StationJSON{}}
	if s.rigErr != nil {
		snap.RigError = s.rigErr.Error()
	}
	if err != nil || pr == nil {
		return snap
	}
	snap.Audible = pr.Audible()
	for _, h := range pr.Heard {
		r := StationJSON{ID: h.Station.ID, Name: h.Station.Name, KHz: float64(h.Station.KHz), Km: round(h.DistKm, 2),
			GroundDB: round(h.GroundDB, 2), EDB: round(h.FieldDB, 2), MarginDB: round(h.MarginDB, 2),
			Chance: round(h.Chance, 3), Audible: h.Audible, Verdict: h.Verdict}
		if h.SkyDB != nil {
			v := round(*h.SkyDB, 2)
			r.SkyDB = &v
		}
		if h.MaskedBy != nil {
			id := h.MaskedBy.ID
			r.MaskedBy = &id
		}
		snap.Results = append(snap.Results, r)
	}
	return snap
}

// CLIArgs returns `earshot predict` arguments that ask the same question
// as the session: the spot, the time and every rig setting the app
// changes.
func (s *Session) CLIArgs() []string {
	f := func(v float64) string { return strconv.FormatFloat(v, 'g', -1, 64) }
	args := []string{"predict", "--json",
		"--at-lat", f(s.spot.Place.LatDeg()), "--at-lon", f(s.spot.Place.LonDeg()),
		"--time", s.at.Format(time.RFC3339)}
	r := s.planner.Spec()
	args = append(args, "--antenna", r.Kind, "--wire-m", f(r.WireM), "--height-m", f(r.HeightM), "--downlead-m", f(r.DownleadM),
		"--ground-system", r.GroundSystem, "--diode", r.Diode, "--phones", r.Phones, "--amp-db", f(r.AmpDB), "--noise", r.Noise)
	return args
}

func round(v float64, places int) float64 {
	if math.IsInf(v, 0) || math.IsNaN(v) {
		return v
	}
	p := math.Pow(10, float64(places))
	return math.Round(v*p) / p
}
