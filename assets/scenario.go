package assets

import (
	"bytes"
	"encoding/json"
	"fmt"
	"math"
	"strings"
	"sync"

	"earshot/propagation"
	"earshot/receiver"
	"earshot/receiver/plan"
)

// Format and Version identify a scenario file; ParseScenario reads only
// this format and version.
const (
	Format  = "earshot-scenario"
	Version = 1
)

// Limits that a scenario's values must respect. The medium-wave broadcast
// band is 530–1700 kHz; long-wave and short-wave stations are accepted too.
const (
	MinKHz       = 100.0   // lowest accepted frequency, kHz
	MaxKHz       = 30000.0 // highest accepted frequency, kHz
	MaxKW        = 5000.0  // highest accepted carrier power, kW (> 0 required)
	MinHeightDeg = 1.0     // lowest mast height other than 0 (a short monopole), degrees
	MaxHeightDeg = propagation.MaxHeightDeg
)

// Scenario is a listening scenario as stored in a scenario file: the
// transmitters, the ground, the listening spots and the rig. Its fields
// hold the file's values as written (grounds as text), so that a scenario
// loaded and saved again is the same file; the methods turn it into the
// planner's types.
//
// ParseScenario, Demo and ScenarioFromStations return valid scenarios. A
// scenario built or changed by hand must pass Validate before its methods
// are used: they panic with an "assets: " message on invalid content.
type Scenario struct {
	Format  string `json:"format" scenario:"required"`
	Version int    `json:"version" scenario:"required"`
	Name    string `json:"name" scenario:"required"`
	Note    string `json:"note,omitempty"`

	Transmitters  []Transmitter  `json:"transmitters" scenario:"required"`
	GroundRegions []GroundRegion `json:"ground_regions,omitempty"`
	// LandGround is the ground where the world land/sea mask says land and
	// no region applies: a standard ground name or "SIGMA/EPSR". Parsing
	// sets it to "land" when the file leaves it out.
	LandGround string `json:"land_ground,omitempty"`
	// ListeningSpots are the places to listen at; the first is the default.
	ListeningSpots []Spot `json:"spots" scenario:"required"`
	// Rig is the listener's rig. Fields the file leaves out take the
	// values of receiver.DefaultRigSpec.
	Rig Rig `json:"rig"`
}

// Transmitter is a station of a scenario file.
type Transmitter struct {
	ID    string  `json:"id" scenario:"required"`
	Name  string  `json:"name"`
	KHz   float64 `json:"khz" scenario:"required"`
	KWDay float64 `json:"kw_day" scenario:"required"`
	// KWNight is the carrier power at night, kW; nil: as by day.
	KWNight *float64 `json:"kw_night,omitempty"`
	Lat     float64  `json:"lat" scenario:"required"`
	Lon     float64  `json:"lon" scenario:"required"`
	// HeightDeg is the mast's electrical height, degrees: 0 for a short
	// monopole, else 1–270. GainDB is the alternative: the gain toward the
	// horizon relative to a short monopole, dB. At most one is given;
	// neither means a short monopole.
	HeightDeg *float64 `json:"height_deg,omitempty"`
	GainDB    *float64 `json:"gain_db,omitempty"`
}

// GroundRegion is an area of given ground that overrides the land/sea
// mask.
type GroundRegion struct {
	Name string `json:"name"`
	// Ground is a standard ground name (see propagation.GroundTypes) or
	// "SIGMA/EPSR" in S/m and relative permittivity, e.g. "0.01/15".
	Ground string `json:"ground" scenario:"required"`
	// Polygon is a ring of [lat, lon] vertices in degrees; the last vertex
	// joins the first. See Contains for the geometry.
	Polygon [][2]float64 `json:"polygon" scenario:"required"`
}

// Spot is a named listening place of a scenario file.
type Spot struct {
	Name string  `json:"name" scenario:"required"`
	Lat  float64 `json:"lat" scenario:"required"`
	Lon  float64 `json:"lon" scenario:"required"`
}

// Rig is receiver.RigSpec with its JSON names; see receiver.RigSpec for
// the meaning and unit of each field. It converts to and from RigSpec
// directly (the fields are the same, in the same order).
type Rig struct {
	Kind         string  `json:"kind"`
	WireM        float64 `json:"wire_m"`
	HeightM      float64 `json:"height_m"`
	DownleadM    float64 `json:"downlead_m"`
	WireMm       float64 `json:"wire_mm"`
	WireAWG      int     `json:"wire_awg"`
	GroundSystem string  `json:"ground_system"`
	GroundOhm    float64 `json:"ground_ohm"`

	LoadingFormMm float64 `json:"loading_form_mm"`
	LoadingAWG    int     `json:"loading_awg"`

	TankUH     float64 `json:"tank_uh"`
	TankFormMm float64 `json:"tank_form_mm"`
	TankAWG    int     `json:"tank_awg"`
	CapMinPF   float64 `json:"cap_min_pf"`
	CapMaxPF   float64 `json:"cap_max_pf"`
	StrayPF    float64 `json:"stray_pf"`

	Diode      string  `json:"diode"`
	Phones     string  `json:"phones"`
	AmpDB      float64 `json:"amp_db"`
	AmpOhm     float64 `json:"amp_ohm"`
	AmpNoiseUV float64 `json:"amp_noise_uv"`
	Noise      string  `json:"noise"`

	AntennaTap  float64 `json:"antenna_tap"`
	DetectorTap float64 `json:"detector_tap"`
	CouplingK   float64 `json:"coupling_k"`
	PrimaryUH   float64 `json:"primary_uh"`
	Modulation  float64 `json:"modulation"`
}

// DefaultRig returns receiver.DefaultRigSpec in its JSON form.
func DefaultRig() Rig { return Rig(receiver.DefaultRigSpec()) }

// Error is an invalid scenario or station file. It names the file, the
// line (CSV files) and the JSON path or CSV column at fault, so that a user
// interface can point at it.
type Error struct {
	File string // file name as given to the parser; may be empty
	Line int    // 1-based line (CSV: the header is line 1); 0 if none
	Path string // JSON path ("transmitters[3].khz") or CSV column ("khz"); may be empty
	Msg  string // what is wrong, e.g. "must be between 100 and 30000 kHz, got 5"
	Err  error  // the underlying error, if any
}

func (e *Error) Error() string {
	var b strings.Builder
	sep := func() {
		if b.Len() > 0 {
			b.WriteString(": ")
		}
	}
	if e.File != "" {
		b.WriteString(e.File)
	}
	if e.Line > 0 {
		sep()
		fmt.Fprintf(&b, "line %d", e.Line)
	}
	if e.Path != "" {
		sep()
		b.WriteString(e.Path)
	}
	msg := e.Msg
	if msg == "" && e.Err != nil {
		msg = e.Err.Error()
	}
	sep()
	b.WriteString(msg)
	return b.String()
}

func (e *Error) Unwrap() error { return e.Err }

// ParseScenario decodes and validates a scenario file; file names it in
// errors. Decoding is strict: a field the format does not define, a field
// given twice, a null, a value of the wrong JSON type, a missing required
// field or data after the scenario object is an error. Every error is an
// *Error naming file and JSON path, e.g.
//
//	demo.json: transmitters[3].khz: must be between 100 and 30000 kHz, got 5
//
// On error no scenario is returned.
func ParseScenario(data []byte, file string) (*Scenario, error) {
	if err := checkStrictJSON(data, scenarioType); err != nil {
		err.File = file
		return nil, err
	}
	s := &Scenario{Rig: DefaultRig()}
	if err := json.Unmarshal(data, s); err != nil {
		// checkStrictJSON accepts only what Unmarshal can store.
		return nil, &Error{File: file, Msg: "cannot decode", Err: err}
	}
	if s.LandGround == "" {
		s.LandGround = "land"
	}
	if len(s.GroundRegions) == 0 {
		s.GroundRegions = nil // "ground_regions": [] is saved as no field
	}
	if err := s.Validate(); err != nil {
		err.(*Error).File = file
		return nil, err
	}
	return s, nil
}

// MarshalIndent returns the scenario as a scenario file: indented JSON,
// one transmitter, spot or polygon vertex row per line. ParseScenario reads
// it back into a deep-equal scenario.
func (s *Scenario) MarshalIndent() ([]byte, error) {
	var b bytes.Buffer
	b.WriteString("{\n")
	field := func(key string, v any, last bool) error {
		enc, err := compactJSON(v)
		if err != nil {
			return err
		}
		fmt.Fprintf(&b, "  %q: %s", key, enc)
		if !last {
			b.WriteByte(',')
		}
		b.WriteByte('\n')
		return nil
	}
	list := func(key string, n int, item func(i int) ([]byte, error)) error {
		fmt.Fprintf(&b, "  %q: [", key)
		for i := 0; i < n; i++ {
			enc, err := item(i)
			if err != nil {
				return err
			}
			if i > 0 {
				b.WriteByte(',')
			}
			b.WriteString("\n    ")
			b.Write(enc)
		}
		if n > 0 {
			b.WriteString("\n  ")
		}
		b.WriteString("],\n")
		return nil
	}
	if err := field("format", s.Format, false); err != nil {
		return nil, err
	}
	if err := field("version", s.Version, false); err != nil {
		return nil, err
	}
	if err := field("name", s.Name, false); err != nil {
		return nil, err
	}
	if s.Note != "" {
		if err := field("note", s.Note, false); err != nil {
			return nil, err
		}
	}
	if err := list("transmitters", len(s.Transmitters), func(i int) ([]byte, error) {
		return compactJSON(s.Transmitters[i])
	}); err != nil {
		return nil, err
	}
	if len(s.GroundRegions) > 0 {
		if err := list("ground_regions", len(s.GroundRegions), func(i int) ([]byte, error) {
			return regionJSON(s.GroundRegions[i])
		}); err != nil {
			return nil, err
		}
	}
	if s.LandGround != "" {
		if err := field("land_ground", s.LandGround, false); err != nil {
			return nil, err
		}
	}
	if err := list("spots", len(s.ListeningSpots), func(i int) ([]byte, error) {
		return compactJSON(s.ListeningSpots[i])
	}); err != nil {
		return nil, err
	}
	rig, err := json.MarshalIndent(s.Rig, "  ", "  ")
	if err != nil {
		return nil, err
	}
	fmt.Fprintf(&b, "  \"rig\": %s\n}\n", rig)
	return b.Bytes(), nil
}

// regionJSON writes a ground region with its polygon four vertices a line.
func regionJSON(r GroundRegion) ([]byte, error) {
	name, err := compactJSON(r.Name)
	if err != nil {
		return nil, err
	}
	ground, err := compactJSON(r.Ground)
	if err != nil {
		return nil, err
	}
	var b bytes.Buffer
	fmt.Fprintf(&b, `{"name": %s, "ground": %s, "polygon": [`, name, ground)
	for i, v := range r.Polygon {
		if i > 0 {
			b.WriteByte(',')
		}
		if i%4 == 0 {
			b.WriteString("\n      ")
		} else {
			b.WriteByte(' ')
		}
		pair, err := compactJSON(v)
		if err != nil {
			return nil, err
		}
		b.Write(pair)
	}
	if len(r.Polygon) > 0 {
		b.WriteString("\n    ")
	}
	b.WriteString("]}")
	return b.Bytes(), nil
}

// compactJSON encodes v on one line with a space after each ':' and ','
// outside strings, and without escaping <, > and &.
func compactJSON(v any) ([]byte, error) {
	var buf bytes.Buffer
	enc := json.NewEncoder(&buf)
	enc.SetEscapeHTML(false)
	if err := enc.Encode(v); err != nil {
		return nil, err
	}
	raw := bytes.TrimRight(buf.Bytes(), "\n")
	out := make([]byte, 0, len(raw)+len(raw)/4)
	inStr, esc := false, false
	for _, c := range raw {
		out = append(out, c)
		switch {
		case esc:
			esc = false
		case inStr && c == '\\':
			esc = true
		case c == '"':
			inStr = !inStr
		case !inStr && (c == ':' || c == ','):
			out = append(out, ' ')
		}
	}
	return out, nil
}

// Validate checks the scenario; the error is an *Error naming the JSON
// path and field at fault (with an empty File). ParseScenario calls it.
func (s *Scenario) Validate() error {
	if err := s.validate(); err != nil {
		return err
	}
	return nil
}

func (s *Scenario) validate() *Error {
	if s.Format != Format {
		return &Error{Path: "format", Msg: fmt.Sprintf("must be %q, got %q", Format, s.Format)}
	}
	if s.Version != Version {
		return &Error{Path: "version", Msg: fmt.Sprintf("must be %d (the version this program reads), got %d", Version, s.Version)}
	}
	if strings.TrimSpace(s.Name) == "" {
		return &Error{Path: "name", Msg: "must not be empty"}
	}
	if len(s.Transmitters) == 0 {
		return &Error{Path: "transmitters", Msg: "must list at least one transmitter"}
	}
	ids := map[string]int{}
	for i, t := range s.Transmitters {
		where := fmt.Sprintf("transmitters[%d]", i)
		if e := checkStationID(t.ID); e != nil {
			return e.at(where)
		}
		key := strings.ToLower(t.ID)
		if j, dup := ids[key]; dup {
			return &Error{Path: where + ".id", Msg: fmt.Sprintf("duplicate id %q (also transmitters[%d]; ids are compared ignoring case)", t.ID, j)}
		}
		ids[key] = i
		if e := checkTransmitter(t); e != nil {
			return e.at(where)
		}
	}
	for i, r := range s.GroundRegions {
		where := fmt.Sprintf("ground_regions[%d]", i)
		if _, e := parseGround(r.Ground); e != nil {
			return e.at(where)
		}
		if _, e := newRing(r.Polygon); e != nil {
			return e.at(where)
		}
	}
	if _, e := parseGround(s.LandGround); e != nil {
		e.Path = "land_ground"
		return e
	}
	if len(s.ListeningSpots) == 0 {
		return &Error{Path: "spots", Msg: "must list at least one spot"}
	}
	names := map[string]int{}
	for i, sp := range s.ListeningSpots {
		where := fmt.Sprintf("spots[%d]", i)
		if strings.TrimSpace(sp.Name) == "" {
			return &Error{Path: where + ".name", Msg: "must not be empty"}
		}
		key := strings.ToLower(sp.Name)
		if j, dup := names[key]; dup {
			return &Error{Path: where + ".name", Msg: fmt.Sprintf("duplicate name %q (also spots[%d]; names are compared ignoring case)", sp.Name, j)}
		}
		names[key] = i
		if e := checkLatLon(sp.Lat, sp.Lon); e != nil {
			return e.at(where)
		}
	}
	if _, err := receiver.RigSpec(s.Rig).Build(); err != nil {
		return &Error{Path: "rig", Err: err}
	}
	return nil
}

// at prefixes the error's path with where.
func (e *Error) at(where string) *Error {
	if e.Path == "" {
		e.Path = where
	} else {
		e.Path = where + "." + e.Path
	}
	return e
}

// inRange reports lo ≤ v ≤ hi; false for NaN.
func inRange(v, lo, hi float64) bool { return v >= lo && v <= hi }

func checkStationID(id string) *Error {
	if strings.TrimSpace(id) == "" {
		return &Error{Path: "id", Msg: "must not be empty"}
	}
	return nil
}

func checkKHz(v float64) *Error {
	if !inRange(v, MinKHz, MaxKHz) {
		return &Error{Path: "khz", Msg: fmt.Sprintf("must be between %g and %g kHz, got %g", MinKHz, MaxKHz, v)}
	}
	return nil
}

func checkKW(field string, v float64) *Error {
	if !(v > 0 && v <= MaxKW) {
		return &Error{Path: field, Msg: fmt.Sprintf("must be > 0 and <= %g kW, got %g", MaxKW, v)}
	}
	return nil
}

func checkLatLon(lat, lon float64) *Error {
	if !inRange(lat, -90, 90) {
		return &Error{Path: "lat", Msg: fmt.Sprintf("must be between -90 and 90 degrees, got %g", lat)}
	}
	if !inRange(lon, -180, 180) {
		return &Error{Path: "lon", Msg: fmt.Sprintf("must be between -180 and 180 degrees, got %g", lon)}
	}
	return nil
}

func checkHeightDeg(v float64) *Error {
	if v != 0 && !inRange(v, MinHeightDeg, MaxHeightDeg) {
		return &Error{Path: "height_deg", Msg: fmt.Sprintf("must be 0 (a short monopole) or between %g and %g degrees, got %g", MinHeightDeg, MaxHeightDeg, v)}
	}
	return nil
}

func checkGainDB(v float64) *Error {
	_, peak := monopolePeak()
	if !inRange(v, 0, peak) {
		return &Error{Path: "gain_db", Msg: fmt.Sprintf("must be between 0 and %.4f dB (the horizon gain of a monopole up to its peak at %.1f degrees), got %g",
			math.Floor(peak*1e4)/1e4, peakHeightDeg(), v)}
	}
	return nil
}

func checkTransmitter(t Transmitter) *Error {
	if e := checkKHz(t.KHz); e != nil {
		return e
	}
	if e := checkKW("kw_day", t.KWDay); e != nil {
		return e
	}
	if t.KWNight != nil {
		if e := checkKW("kw_night", *t.KWNight); e != nil {
			e.Msg += " (leave kw_night out for the day power)"
			return e
		}
	}
	if e := checkLatLon(t.Lat, t.Lon); e != nil {
		return e
	}
	if t.HeightDeg != nil && t.GainDB != nil {
		return &Error{Msg: "give height_deg or gain_db, not both"}
	}
	if t.HeightDeg != nil {
		if e := checkHeightDeg(*t.HeightDeg); e != nil {
			return e
		}
	}
	if t.GainDB != nil {
		if e := checkGainDB(*t.GainDB); e != nil {
			return e
		}
	}
	return nil
}

// groundNames lists the standard ground names for error messages.
func groundNames() string {
	var names []string
	for _, g := range propagation.GroundTypes() {
		names = append(names, g.Name)
	}
	return strings.Join(names, ", ")
}

// parseGround reads a ground field; the error's Path is "ground".
func parseGround(s string) (propagation.Ground, *Error) {
	if strings.TrimSpace(s) == "" {
		return propagation.Ground{}, &Error{Path: "ground", Msg: fmt.Sprintf("must not be empty; want one of %s, or SIGMA/EPSR such as 0.01/15", groundNames())}
	}
	g, err := propagation.ParseGround(s)
	if err != nil {
		if !strings.Contains(s, "/") {
			return propagation.Ground{}, &Error{Path: "ground", Msg: fmt.Sprintf("unknown ground %q; want one of %s, or SIGMA/EPSR such as 0.01/15", s, groundNames()), Err: err}
		}
		return propagation.Ground{}, &Error{Path: "ground", Err: err}
	}
	return g, nil
}

// Monopole horizon gain: the gain rises from 0 dB (short monopole) to a
// peak near 228° and falls beyond. gain_db is mapped to the mast height on
// the rising branch with that horizon gain.
var (
	peakOnce sync.Once
	peakH    float64 // height of the peak, degrees
	peakG    float64 // horizon gain at the peak, dB
)

// monopolePeak returns the height (degrees) and horizon gain (dB) of the
// peak of propagation.MonopoleGainDB(h, 0), found by golden-section search
// on [180, 270] degrees.
func monopolePeak() (heightDeg, gainDB float64) {
	peakOnce.Do(func() {
		g := func(h float64) float64 {
			v, err := propagation.MonopoleGainDB(h, 0)
			if err != nil {
				panic("assets: " + err.Error())
			}
			return v
		}
		a, b := 180.0, 270.0
		const phi = 0.6180339887498949
		for b-a > 1e-9 {
			c, d := b-phi*(b-a), a+phi*(b-a)
			if g(c) > g(d) {
				b = d
			} else {
				a = c
			}
		}
		peakH = (a + b) / 2
		peakG = g(peakH)
	})
	return peakH, peakG
}

func peakHeightDeg() float64 { h, _ := monopolePeak(); return h }

// EquivalentHeightDeg returns the electrical height (degrees) of the
// monopole whose horizon gain (propagation.MonopoleGainDB(h, 0)) is gainDB,
// on the rising branch of the gain from 0 (a short monopole, 0 dB) to the
// peak near 228°. It is how a transmitter given by gain_db becomes a
// plan.Station, which carries a height; the sky-wave gain then follows that
// monopole's pattern. It returns an *Error naming "gain_db" unless gainDB is
// between 0 and the peak gain (about 3.41 dB).
func EquivalentHeightDeg(gainDB float64) (float64, error) {
	if e := checkGainDB(gainDB); e != nil {
		return 0, e
	}
	if gainDB == 0 {
		return 0, nil
	}
	lo, hi := 1e-3, peakHeightDeg() // gain(1e-3°) ≈ 4e-11 dB
	for range 200 {
		mid := (lo + hi) / 2
		g, err := propagation.MonopoleGainDB(mid, 0)
		if err != nil {
			return 0, err
		}
		if g < gainDB {
			lo = mid
		} else {
			hi = mid
		}
		if hi-lo < 1e-9 {
			break
		}
	}
	return (lo + hi) / 2, nil
}

func mustPlace(lat, lon float64) propagation.Place {
	p, err := propagation.NewPlace(lat, lon)
	if err != nil {
		panic("assets: invalid scenario (call Validate): " + err.Error())
	}
	return p
}

// Stations returns the transmitters as planner stations, in file order.
// A transmitter given by gain_db gets the height of EquivalentHeightDeg.
func (s *Scenario) Stations() []plan.Station {
	out := make([]plan.Station, len(s.Transmitters))
	for i, t := range s.Transmitters {
		st := plan.Station{ID: t.ID, Name: t.Name, KHz: propagation.KHz(t.KHz), KWDay: t.KWDay,
			Place: mustPlace(t.Lat, t.Lon)}
		if t.KWNight != nil {
			st.KWNight = *t.KWNight
		}
		switch {
		case t.HeightDeg != nil:
			st.HeightDeg = *t.HeightDeg
		case t.GainDB != nil:
			h, err := EquivalentHeightDeg(*t.GainDB)
			if err != nil {
				panic("assets: invalid scenario (call Validate): " + err.Error())
			}
			st.HeightDeg = h
		}
		out[i] = st
	}
	return out
}

// Spots returns the listening spots, the default one first.
func (s *Scenario) Spots() []plan.Spot {
	out := make([]plan.Spot, len(s.ListeningSpots))
	for i, sp := range s.ListeningSpots {
		out[i] = plan.Spot{Name: sp.Name, Place: mustPlace(sp.Lat, sp.Lon)}
	}
	return out
}

// SpotByName returns the spot with the given name, compared ignoring case;
// an empty name gives the first (default) spot. The error lists the names.
func (s *Scenario) SpotByName(name string) (plan.Spot, error) {
	spots := s.Spots()
	if len(spots) == 0 {
		return plan.Spot{}, fmt.Errorf("assets: scenario %q has no spots", s.Name)
	}
	if name == "" {
		return spots[0], nil
	}
	names := make([]string, len(spots))
	for i, sp := range spots {
		if strings.EqualFold(sp.Name, name) {
			return sp, nil
		}
		names[i] = fmt.Sprintf("%q", sp.Name)
	}
	return plan.Spot{}, fmt.Errorf("assets: scenario %q has no spot %q (spots: %s)", s.Name, name, strings.Join(names, ", "))
}

// Regions returns the ground regions with their grounds parsed, in file
// order (a later region overrides an earlier one where they overlap).
func (s *Scenario) Regions() []plan.Region {
	out := make([]plan.Region, len(s.GroundRegions))
	for i, r := range s.GroundRegions {
		g, e := parseGround(r.Ground)
		if e != nil {
			panic("assets: invalid scenario (call Validate): " + e.Error())
		}
		out[i] = plan.Region{Name: r.Name, Ground: g, Polygon: append([][2]float64(nil), r.Polygon...)}
	}
	return out
}

// RigSpec returns the listener's rig.
func (s *Scenario) RigSpec() receiver.RigSpec { return receiver.RigSpec(s.Rig) }

// GroundMap returns the scenario's ground everywhere: the last ground
// region (in file order) whose polygon contains the point (see Contains);
// else, where isLand reports land, the land_ground; else the "sea" ground
// of propagation.GroundTypes. A nil isLand means sea everywhere outside the
// regions. The polygons are prepared once; the map is safe for concurrent
// use if isLand is.
func (s *Scenario) GroundMap(isLand func(lat, lon float64) bool) propagation.GroundMap {
	type area struct {
		ring   ring
		ground propagation.Ground
	}
	areas := make([]area, len(s.GroundRegions))
	for i, r := range s.GroundRegions {
		g, e := parseGround(r.Ground)
		if e != nil {
			panic("assets: invalid scenario (call Validate): " + e.Error())
		}
		rg, e := newRing(r.Polygon)
		if e != nil {
			panic("assets: invalid scenario (call Validate): " + e.Error())
		}
		areas[i] = area{rg, g}
	}
	land, e := parseGround(s.LandGround)
	if e != nil {
		panic("assets: invalid scenario (call Validate): " + e.Error())
	}
	seaType, err := propagation.GroundByName("sea")
	if err != nil {
		panic("assets: " + err.Error())
	}
	sea := seaType.Ground
	return func(lat, lon float64) propagation.Ground {
		for i := len(areas) - 1; i >= 0; i-- {
			if areas[i].ring.contains(lat, lon) {
				return areas[i].ground
			}
		}
		if isLand != nil && isLand(lat, lon) {
			return land
		}
		return sea
	}
}

// World returns the planner's world: the stations and GroundMap(isLand).
func (s *Scenario) World(isLand func(lat, lon float64) bool) plan.World {
	return plan.World{Stations: s.Stations(), Ground: s.GroundMap(isLand)}
}

// ScenarioFromStations makes a scenario of stations (as from
// ParseStationsCSV) heard at spot: no ground regions (the world mask gives
// sea and "land"), the default rig. An empty spot name becomes "spot".
// The scenario validates if the stations and spot are valid.
func ScenarioFromStations(stations []plan.Station, spot plan.Spot) *Scenario {
	s := &Scenario{
		Format: Format, Version: Version,
		Name:       "Imported stations",
		Note:       "Stations from a station list; ground from the world land/sea mask.",
		LandGround: "land",
		Rig:        DefaultRig(),
	}
	for _, st := range stations {
		t := Transmitter{ID: st.ID, Name: st.Name, KHz: float64(st.KHz), KWDay: st.KWDay,
			Lat: st.Place.LatDeg(), Lon: st.Place.LonDeg()}
		if st.KWNight != 0 {
			t.KWNight = ptr(st.KWNight)
		}
		if st.HeightDeg != 0 {
			t.HeightDeg = ptr(st.HeightDeg)
		}
		s.Transmitters = append(s.Transmitters, t)
	}
	name := spot.Name
	if name == "" {
		name = "spot"
	}
	s.ListeningSpots = []Spot{{Name: name, Lat: spot.Place.LatDeg(), Lon: spot.Place.LonDeg()}}
	return s
}

func ptr(v float64) *float64 { return &v }
