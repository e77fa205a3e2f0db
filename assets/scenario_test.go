package assets

import (
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"math"
	"reflect"
	"strings"
	"testing"

	"earshot/propagation"
	"earshot/receiver"
)

// minimalJSON is the smallest valid scenario; the tests change one thing
// in it at a time. Its values are arbitrary, not data about the world.
const minimalJSON = `{
  "format": "earshot-scenario",
  "version": 1,
  "name": "Test",
  "transmitters": [{"id": "A", "khz": 1000, "kw_day": 1, "lat": 10, "lon": 20}],
  "spots": [{"name": "here", "lat": 10.1, "lon": 20.1}]
}`

// mutate decodes minimalJSON, lets edit change it and encodes it again.
func mutate(t *testing.T, edit func(m map[string]any)) []byte {
	t.Helper()
	var m map[string]any
	dec := json.NewDecoder(strings.NewReader(minimalJSON))
	dec.UseNumber()
	if err := dec.Decode(&m); err != nil {
		t.Fatal(err)
	}
	edit(m)
	b, err := json.Marshal(m)
	if err != nil {
		t.Fatal(err)
	}
	return b
}

func tx0(m map[string]any) map[string]any { return m["transmitters"].([]any)[0].(map[string]any) }

func withRegion(ground string, poly any) func(m map[string]any) {
	return func(m map[string]any) {
		m["ground_regions"] = []any{map[string]any{"name": "r", "ground": ground, "polygon": poly}}
	}
}

func square(lat0, lon0, lat1, lon1 float64) [][2]float64 {
	return [][2]float64{{lat0, lon0}, {lat0, lon1}, {lat1, lon1}, {lat1, lon0}}
}

func TestParseScenarioMinimal(t *testing.T) {
	s, err := ParseScenario([]byte(minimalJSON), "min.json")
	if err != nil {
		t.Fatalf("ParseScenario(minimal) = %v", err)
	}
	if s.LandGround != "land" {
		t.Errorf("LandGround = %q, want the default %q", s.LandGround, "land")
	}
	if got, want := s.RigSpec(), receiver.DefaultRigSpec(); got != want {
		t.Errorf("RigSpec() with no rig = %+v, want DefaultRigSpec %+v", got, want)
	}
	st := s.Stations()
	if len(st) != 1 || st[0].ID != "A" || st[0].KHz != 1000 || st[0].KWDay != 1 || st[0].KWNight != 0 || st[0].HeightDeg != 0 ||
		st[0].Place.LatDeg() != 10 || st[0].Place.LonDeg() != 20 {
		t.Errorf("Stations() = %+v", st)
	}
	if len(s.Regions()) != 0 {
		t.Errorf("Regions() = %v, want none", s.Regions())
	}
}

func TestRigPartialTakesDefaults(t *testing.T) {
	data := mutate(t, func(m map[string]any) { m["rig"] = map[string]any{"wire_m": 25, "noise": "rural", "amp_db": 0} })
	s, err := ParseScenario(data, "rig.json")
	if err != nil {
		t.Fatal(err)
	}
	want := receiver.DefaultRigSpec()
	want.WireM = 25
	if got := s.RigSpec(); got != want {
		t.Errorf("RigSpec() = %+v, want %+v", got, want)
	}
}

func TestTransmitterOptionalFields(t *testing.T) {
	data := mutate(t, func(m map[string]any) {
		m["transmitters"] = []any{
			map[string]any{"id": "H", "khz": 600, "kw_day": 10, "kw_night": 2.5, "lat": 1, "lon": 2, "height_deg": 180},
			map[string]any{"id": "G", "khz": 700, "kw_day": 10, "lat": 1, "lon": 2, "gain_db": 2},
			map[string]any{"id": "Z", "khz": 800, "kw_day": 10, "lat": 1, "lon": 2, "height_deg": 0},
		}
	})
	s, err := ParseScenario(data, "opt.json")
	if err != nil {
		t.Fatal(err)
	}
	st := s.Stations()
	if st[0].KWNight != 2.5 || st[0].HeightDeg != 180 {
		t.Errorf("station H = %+v, want KWNight 2.5, HeightDeg 180", st[0])
	}
	// The equivalent height has the given horizon gain (tolerance: the
	// bisection stops at 1e-9°, far below 1e-6 dB).
	g, err := propagation.MonopoleGainDB(st[1].HeightDeg, 0)
	if err != nil || math.Abs(g-2) > 1e-6 {
		t.Errorf("station G: MonopoleGainDB(%g, 0) = %g, %v; want 2 ± 1e-6 dB", st[1].HeightDeg, g, err)
	}
	if st[2].HeightDeg != 0 {
		t.Errorf("station Z HeightDeg = %g, want 0", st[2].HeightDeg)
	}
}

func TestEquivalentHeightDeg(t *testing.T) {
	// The inverse of MonopoleGainDB(h, 0) on its rising branch: a closed
	// loop, tolerance 1e-6° (the bisection stops at 1e-9°).
	for _, h := range []float64{1, 10, 45, 90, 120, 180, 200, 225} {
		g, err := propagation.MonopoleGainDB(h, 0)
		if err != nil {
			t.Fatal(err)
		}
		got, err := EquivalentHeightDeg(g)
		if err != nil || math.Abs(got-h) > 1e-6 {
			t.Errorf("EquivalentHeightDeg(MonopoleGainDB(%g, 0) = %g) = %g, %v; want %g ± 1e-6", h, g, got, err, h)
		}
	}
	// The peak of the horizon gain: the "5/8-wave" (225°) anti-fading mast
	// is the classic height of greatest horizon field (J. D. Kraus,
	// Antennas, 2nd ed., §5-6: the monopole's pattern and radiation
	// resistance); with the exact pattern the maximum lies a little above.
	// Tolerance: 220–235°.
	if h, _ := monopolePeak(); h < 220 || h > 235 {
		t.Errorf("peak of the horizon gain at %g°, want 220–235°", h)
	}
	// A gain above the peak is no mast's horizon gain.
	_, peak := monopolePeak()
	if _, err := EquivalentHeightDeg(peak + 0.01); err == nil {
		t.Errorf("EquivalentHeightDeg(%g) = nil error, want an error (above the peak)", peak+0.01)
	}
	if h, err := EquivalentHeightDeg(0); h != 0 || err != nil {
		t.Errorf("EquivalentHeightDeg(0) = %g, %v; want 0, nil", h, err)
	}
}

func TestParseScenarioErrors(t *testing.T) {
	four := []byte(`{"format": "earshot-scenario", "version": 1, "name": "T",
  "transmitters": [
    {"id": "A", "khz": 600, "kw_day": 1, "lat": 0, "lon": 0},
    {"id": "B", "khz": 700, "kw_day": 1, "lat": 0, "lon": 0},
    {"id": "C", "khz": 800, "kw_day": 1, "lat": 0, "lon": 0},
    {"id": "D", "khz": 5, "kw_day": 1, "lat": 0, "lon": 0}
  ],
  "spots": [{"name": "s", "lat": 0, "lon": 0}]}`)
	peakHeight, peakGain := monopolePeak()
	cases := []struct {
		name string
		data []byte
		want string // the whole error message
	}{
		{"brief's example", four, "demo.json: transmitters[3].khz: must be between 100 and 30000 kHz, got 5"},
		{"empty", []byte(""), "demo.json: line 1: empty file; want a JSON object"},
		{"truncated", []byte("{\n\"format\": \"earshot-scenario\",\n"), "demo.json: line 3: unexpected end of file"},
		{"syntax", []byte("{\n  \"format\": \"earshot-scenario\",,\n}"), "demo.json: line 2: column 32: invalid JSON: invalid character ',' looking for beginning of object key string"},
		{"not UTF-8", []byte("{\n\"name\": \"\xff\"}"), "demo.json: line 2: column 10: not valid UTF-8 text"},
		{"array", []byte("[1, 2]"), "demo.json: must be an object, got an array"},
		{"trailing", []byte(minimalJSON + "\n{}"), "demo.json: line 8: column 1: unexpected data after the top-level object"},
		{"unknown top", mutate(t, func(m map[string]any) { m["Name"] = "x" }),
			`demo.json: unknown field "Name" (allowed: format, version, name, note, transmitters, ground_regions, land_ground, spots, rig)`},
		{"unknown in transmitter", mutate(t, func(m map[string]any) { tx0(m)["kw"] = 1 }),
			`demo.json: transmitters[0]: unknown field "kw" (allowed: id, name, khz, kw_day, kw_night, lat, lon, height_deg, gain_db)`},
		{"unknown in rig", mutate(t, func(m map[string]any) { m["rig"] = map[string]any{"WireM": 3} }),
			`demo.json: rig: unknown field "WireM" (allowed: kind, wire_m, height_m, downlead_m, wire_mm, wire_awg, ground_system, ground_ohm, loading_form_mm, loading_awg, tank_uh, tank_form_mm, tank_awg, cap_min_pf, cap_max_pf, stray_pf, diode, phones, amp_db, amp_ohm, amp_noise_uv, noise, antenna_tap, detector_tap, coupling_k, primary_uh, modulation)`},
		{"duplicate key", []byte(`{"name": "a", "name": "b"}`), "demo.json: name: given more than once"},
		{"null", mutate(t, func(m map[string]any) { m["note"] = nil }), "demo.json: note: must not be null (leave the field out instead)"},
		{"string for number", mutate(t, func(m map[string]any) { tx0(m)["khz"] = "1000" }), "demo.json: transmitters[0].khz: must be a number, got a string"},
		{"number for string", mutate(t, func(m map[string]any) { m["name"] = 3 }), "demo.json: name: must be a string, got a number"},
		{"object for array", mutate(t, func(m map[string]any) { m["spots"] = map[string]any{} }), "demo.json: spots: must be an array, got an object"},
		{"overflow", []byte(strings.Replace(minimalJSON, `"khz": 1000`, `"khz": 1e999`, 1)), "demo.json: transmitters[0].khz: must be a finite number, got 1e999"},
		{"fractional int", mutate(t, func(m map[string]any) { m["rig"] = map[string]any{"tank_awg": 24.5} }),
			"demo.json: rig.tank_awg: must be a whole number (no decimal point or exponent), got 24.5"},
		{"missing required", mutate(t, func(m map[string]any) { delete(tx0(m), "khz") }), "demo.json: transmitters[0].khz: missing (required)"},
		{"missing spots", mutate(t, func(m map[string]any) { delete(m, "spots") }), "demo.json: spots: missing (required)"},
		{"format", mutate(t, func(m map[string]any) { m["format"] = "other" }), `demo.json: format: must be "earshot-scenario", got "other"`},
		{"version", mutate(t, func(m map[string]any) { m["version"] = 2 }), "demo.json: version: must be 1 (the version this program reads), got 2"},
		{"name empty", mutate(t, func(m map[string]any) { m["name"] = " " }), "demo.json: name: must not be empty"},
		{"no transmitters", mutate(t, func(m map[string]any) { m["transmitters"] = []any{} }), "demo.json: transmitters: must list at least one transmitter"},
		{"id empty", mutate(t, func(m map[string]any) { tx0(m)["id"] = "" }), "demo.json: transmitters[0].id: must not be empty"},
		{"id duplicate", mutate(t, func(m map[string]any) {
			m["transmitters"] = append(m["transmitters"].([]any), map[string]any{"id": "a", "khz": 600, "kw_day": 1, "lat": 0, "lon": 0})
		}), `demo.json: transmitters[1].id: duplicate id "a" (also transmitters[0]; ids are compared ignoring case)`},
		{"khz high", mutate(t, func(m map[string]any) { tx0(m)["khz"] = 30001 }), "demo.json: transmitters[0].khz: must be between 100 and 30000 kHz, got 30001"},
		{"kw_day zero", mutate(t, func(m map[string]any) { tx0(m)["kw_day"] = 0 }), "demo.json: transmitters[0].kw_day: must be > 0 and <= 5000 kW, got 0"},
		{"kw_day high", mutate(t, func(m map[string]any) { tx0(m)["kw_day"] = 5001 }), "demo.json: transmitters[0].kw_day: must be > 0 and <= 5000 kW, got 5001"},
		{"kw_night zero", mutate(t, func(m map[string]any) { tx0(m)["kw_night"] = 0 }),
			"demo.json: transmitters[0].kw_night: must be > 0 and <= 5000 kW, got 0 (leave kw_night out for the day power)"},
		{"lat", mutate(t, func(m map[string]any) { tx0(m)["lat"] = 90.5 }), "demo.json: transmitters[0].lat: must be between -90 and 90 degrees, got 90.5"},
		{"lon", mutate(t, func(m map[string]any) { tx0(m)["lon"] = -181 }), "demo.json: transmitters[0].lon: must be between -180 and 180 degrees, got -181"},
		{"height low", mutate(t, func(m map[string]any) { tx0(m)["height_deg"] = 0.5 }),
			"demo.json: transmitters[0].height_deg: must be 0 (a short monopole) or between 1 and 270 degrees, got 0.5"},
		{"height high", mutate(t, func(m map[string]any) { tx0(m)["height_deg"] = 271 }),
			"demo.json: transmitters[0].height_deg: must be 0 (a short monopole) or between 1 and 270 degrees, got 271"},
		{"gain negative", mutate(t, func(m map[string]any) { tx0(m)["gain_db"] = -1 }),
			fmt.Sprintf("demo.json: transmitters[0].gain_db: must be between 0 and %.4f dB (the horizon gain of a monopole up to its peak at %.1f degrees), got -1",
				math.Floor(peakGain*1e4)/1e4, peakHeight)},
		{"height and gain", mutate(t, func(m map[string]any) { tx0(m)["gain_db"] = 1; tx0(m)["height_deg"] = 90 }),
			"demo.json: transmitters[0]: give height_deg or gain_db, not both"},
		{"region ground unknown", mutate(t, withRegion("swamp", square(0, 0, 1, 1))),
			`demo.json: ground_regions[0].ground: unknown ground "swamp"; want one of sea-low-salinity, sea, fresh-water, land-good, wet, land, medium-dry, dry, very-dry, ice-1c, ice-10c, or SIGMA/EPSR such as 0.01/15`},
		{"region ground sigma", mutate(t, withRegion("0/15", square(0, 0, 1, 1))),
			"demo.json: ground_regions[0].ground: propagation: sigma must be > 0 and <= 1000 S/m, got 0"},
		{"region ground empty", mutate(t, withRegion("", square(0, 0, 1, 1))),
			"demo.json: ground_regions[0].ground: must not be empty; want one of sea-low-salinity, sea, fresh-water, land-good, wet, land, medium-dry, dry, very-dry, ice-1c, ice-10c, or SIGMA/EPSR such as 0.01/15"},
		{"polygon short", mutate(t, withRegion("wet", [][2]float64{{0, 0}, {1, 1}})),
			"demo.json: ground_regions[0].polygon: must have at least 3 vertices, got 2"},
		{"polygon lat", mutate(t, withRegion("wet", [][2]float64{{0, 0}, {1, 1}, {95, 1}})),
			"demo.json: ground_regions[0].polygon[2][0]: latitude must be between -90 and 90 degrees, got 95"},
		{"polygon lon", mutate(t, withRegion("wet", [][2]float64{{0, 0}, {1, 190}, {2, 1}})),
			"demo.json: ground_regions[0].polygon[1][1]: longitude must be between -180 and 180 degrees, got 190"},
		{"vertex of 3", mutate(t, withRegion("wet", []any{[]any{0, 0, 0}, []any{1, 1}, []any{2, 0}})),
			"demo.json: ground_regions[0].polygon[0]: must be a [lat, lon] pair, got more"},
		{"vertex of 1", mutate(t, withRegion("wet", []any{[]any{0}, []any{1, 1}, []any{2, 0}})),
			"demo.json: ground_regions[0].polygon[0]: must be a [lat, lon] pair, got 1 elements"},
		{"vertex not array", mutate(t, withRegion("wet", []any{0, []any{1, 1}, []any{2, 0}})),
			"demo.json: ground_regions[0].polygon[0]: must be a [lat, lon] pair, got a number"},
		{"polygon 180 edge", mutate(t, withRegion("wet", [][2]float64{{0, -90}, {0, 90}, {10, 90}})),
			"demo.json: ground_regions[0].polygon[0]: the edge to the next vertex spans 180 degrees of longitude, so its way round is ambiguous; add a vertex between"},
		{"polygon round pole", mutate(t, withRegion("ice-1c", [][2]float64{{-70, 0}, {-70, 120}, {-70, -120}})),
			"demo.json: ground_regions[0].polygon: must not go round a pole (its edges wind once round the Earth in longitude); split it or trace a boundary in latitude instead"},
		{"land_ground", mutate(t, func(m map[string]any) { m["land_ground"] = "rock" }),
			`demo.json: land_ground: unknown ground "rock"; want one of sea-low-salinity, sea, fresh-water, land-good, wet, land, medium-dry, dry, very-dry, ice-1c, ice-10c, or SIGMA/EPSR such as 0.01/15`},
		{"no spots", mutate(t, func(m map[string]any) { m["spots"] = []any{} }), "demo.json: spots: must list at least one spot"},
		{"spot name empty", mutate(t, func(m map[string]any) { m["spots"].([]any)[0].(map[string]any)["name"] = "" }), "demo.json: spots[0].name: must not be empty"},
		{"spot duplicate", mutate(t, func(m map[string]any) {
			m["spots"] = append(m["spots"].([]any), map[string]any{"name": "HERE", "lat": 0, "lon": 0})
		}), `demo.json: spots[1].name: duplicate name "HERE" (also spots[0]; names are compared ignoring case)`},
		{"spot lon", mutate(t, func(m map[string]any) { m["spots"].([]any)[0].(map[string]any)["lon"] = 180.5 }),
			"demo.json: spots[0].lon: must be between -180 and 180 degrees, got 180.5"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			s, err := ParseScenario(c.data, "demo.json")
			if err == nil {
				t.Fatalf("ParseScenario(%s) = nil error, want %q", c.data, c.want)
			}
			if s != nil {
				t.Errorf("ParseScenario returned a scenario with the error %v", err)
			}
			if err.Error() != c.want {
				t.Errorf("ParseScenario error\n got %q\nwant %q", err.Error(), c.want)
			}
			var e *Error
			if !errors.As(err, &e) || e.File != "demo.json" {
				t.Errorf("error %v is not an *Error naming the file", err)
			}
		})
	}
}

func TestRigErrorWrapped(t *testing.T) {
	for _, edit := range []map[string]any{
		{"kind": "yagi"},
		{"tank_uh": -5},
		{"diode": "cat's whisker of unknown mineral"},
		{"coupling_k": 2, "primary_uh": 100},
	} {
		data := mutate(t, func(m map[string]any) { m["rig"] = edit })
		_, err := ParseScenario(data, "r.json")
		var e *Error
		if err == nil || !strings.HasPrefix(err.Error(), "r.json: rig: ") || !errors.As(err, &e) || e.Path != "rig" || e.Err == nil {
			t.Errorf("rig %v: error %v, want an *Error with path rig wrapping RigSpec.Build's error", edit, err)
		}
	}
}

func TestRoundTrip(t *testing.T) {
	inputs := map[string][]byte{
		"minimal":       []byte(minimalJSON),
		"empty regions": mutate(t, func(m map[string]any) { m["ground_regions"] = []any{}; m["rig"] = map[string]any{} }),
		"full": mutate(t, func(m map[string]any) {
			m["note"] = "quotes \" and <tags> & unicode µ°"
			m["land_ground"] = "0.002/12"
			tx0(m)["kw_night"] = 0.25
			tx0(m)["gain_db"] = 1.5
			m["ground_regions"] = []any{
				map[string]any{"name": "a", "ground": "wet", "polygon": square(0, 0, 1, 1)},
				map[string]any{"name": "b", "ground": "0.01/15", "polygon": [][2]float64{{-10, 179}, {-10, -179}, {-12, -179}, {-12, 179}, {-11, 178.5}}},
			}
			m["rig"] = map[string]any{"kind": "t", "wire_m": 30.5, "amp_db": 20}
		}),
	}
	if d, err := Demo(); err == nil {
		b, _ := d.MarshalIndent()
		inputs["demo"] = b
	} else {
		t.Fatal(err)
	}
	for name, data := range inputs {
		s1, err := ParseScenario(data, name)
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		out, err := s1.MarshalIndent()
		if err != nil {
			t.Fatalf("%s: MarshalIndent: %v", name, err)
		}
		s2, err := ParseScenario(out, name+" (saved)")
		if err != nil {
			t.Fatalf("%s: reloading the saved scenario: %v\n%s", name, err, out)
		}
		if !reflect.DeepEqual(s1, s2) {
			t.Errorf("%s: load → save → load differs:\n%+v\n%+v", name, s1, s2)
		}
		out2, _ := s2.MarshalIndent()
		if !bytes.Equal(out, out2) {
			t.Errorf("%s: saving twice gives different files", name)
		}
	}
}

func TestGroundMap(t *testing.T) {
	data := mutate(t, func(m map[string]any) {
		m["land_ground"] = "very-dry"
		m["ground_regions"] = []any{
			map[string]any{"name": "big", "ground": "land", "polygon": square(0, 0, 10, 10)},
			map[string]any{"name": "inner", "ground": "dry", "polygon": square(2, 2, 4, 4)},
			map[string]any{"name": "custom", "ground": "0.02/25", "polygon": square(20, 20, 21, 21)},
		}
	})
	s, err := ParseScenario(data, "g.json")
	if err != nil {
		t.Fatal(err)
	}
	named := func(n string) propagation.Ground {
		g, err := propagation.GroundByName(n)
		if err != nil {
			t.Fatal(err)
		}
		return g.Ground
	}
	isLand := func(lat, lon float64) bool { return lon < 0 } // a mask: land west of 0°
	gm := s.GroundMap(isLand)
	cases := []struct {
		lat, lon float64
		want     propagation.Ground
	}{
		{3, 3, named("dry")},  // inner region, painted last over "big"
		{5, 5, named("land")}, // only in "big"
		{20.5, 20.5, propagation.Ground{SigmaSPerM: 0.02, EpsR: 25}},
		{15, 15, named("sea")},       // no region, mask says sea
		{15, -15, named("very-dry")}, // no region, mask says land: land_ground
		{5, -0.5, named("very-dry")},
	}
	for _, c := range cases {
		if got := gm(c.lat, c.lon); got != c.want {
			t.Errorf("GroundMap(%g, %g) = %v, want %v", c.lat, c.lon, got, c.want)
		}
	}
	if got := s.GroundMap(nil)(15, -15); got != named("sea") {
		t.Errorf("GroundMap(nil)(15, -15) = %v, want sea", got)
	}
	regions := s.Regions()
	if len(regions) != 3 || regions[0].Name != "big" || regions[0].Ground != named("land") || len(regions[0].Polygon) != 4 {
		t.Errorf("Regions() = %+v", regions)
	}
	// Later regions override earlier ones: swap the order and "big" wins.
	s.GroundRegions[0], s.GroundRegions[1] = s.GroundRegions[1], s.GroundRegions[0]
	if got := s.GroundMap(nil)(3, 3); got != named("land") {
		t.Errorf("with the order swapped, GroundMap(3, 3) = %v, want land", got)
	}
}

func TestSpotByName(t *testing.T) {
	data := mutate(t, func(m map[string]any) {
		m["spots"] = []any{map[string]any{"name": "Shore", "lat": 1, "lon": 2}, map[string]any{"name": "Hill", "lat": 3, "lon": 4}}
	})
	s, err := ParseScenario(data, "s.json")
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct{ name, want string }{{"", "Shore"}, {"hill", "Hill"}, {"SHORE", "Shore"}} {
		sp, err := s.SpotByName(c.name)
		if err != nil || sp.Name != c.want {
			t.Errorf("SpotByName(%q) = %v, %v; want %s", c.name, sp.Name, err, c.want)
		}
	}
	if sp, _ := s.SpotByName("hill"); sp.Place.LatDeg() != 3 || sp.Place.LonDeg() != 4 {
		t.Errorf("SpotByName(hill) place = %v", sp.Place)
	}
	_, err = s.SpotByName("valley")
	if err == nil || !strings.Contains(err.Error(), `"Shore", "Hill"`) {
		t.Errorf("SpotByName(valley) error = %v, want one listing the spots", err)
	}
}

func TestValidateHandBuilt(t *testing.T) {
	s, err := ParseScenario([]byte(minimalJSON), "")
	if err != nil {
		t.Fatal(err)
	}
	s.Transmitters[0].KHz = math.NaN()
	err = s.Validate()
	if err == nil || err.Error() != "transmitters[0].khz: must be between 100 and 30000 kHz, got NaN" {
		t.Errorf("Validate with NaN kHz = %v", err)
	}
}

func TestMethodsPanicOnInvalid(t *testing.T) {
	s, err := ParseScenario([]byte(minimalJSON), "")
	if err != nil {
		t.Fatal(err)
	}
	s.LandGround = "nonsense"
	defer func() {
		if r := recover(); r == nil || !strings.HasPrefix(r.(string), "assets: ") {
			t.Errorf("GroundMap on an invalid scenario: recover() = %v, want an assets: panic", r)
		}
	}()
	s.GroundMap(nil)
}
