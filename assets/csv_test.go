package assets

import (
	"errors"
	"reflect"
	"strings"
	"testing"

	"earshot/propagation"
	"earshot/receiver"
	"earshot/receiver/plan"
)

func place(t *testing.T, lat, lon float64) propagation.Place {
	t.Helper()
	p, err := propagation.NewPlace(lat, lon)
	if err != nil {
		t.Fatal(err)
	}
	return p
}

func TestParseStationsCSV(t *testing.T) {
	// Columns in another order, optional columns, quoting, a quoted name
	// over two lines, spaces, a byte-order mark, CRLF line ends.
	in := "\ufefflon, lat ,id,name,khz,kw,height_deg,kw_night\r\n" +
		"20,10,A,First,999,10,,\r\n" +
		"-20.5,-10.25,B,\"Second, with comma\",1404,2.5,90,1\r\n" +
		"0,0,C,\"two\nlines\",153,500,270, \r\n"
	got, err := ParseStationsCSV(strings.NewReader(in), "s.csv")
	if err != nil {
		t.Fatal(err)
	}
	want := []plan.Station{
		{ID: "A", Name: "First", KHz: 999, KWDay: 10, Place: place(t, 10, 20)},
		{ID: "B", Name: "Second, with comma", KHz: 1404, KWDay: 2.5, KWNight: 1, HeightDeg: 90, Place: place(t, -10.25, -20.5)},
		{ID: "C", Name: "two\nlines", KHz: 153, KWDay: 500, HeightDeg: 270, Place: place(t, 0, 0)},
	}
	if !reflect.DeepEqual(got, want) {
		t.Errorf("ParseStationsCSV =\n%+v\nwant\n%+v", got, want)
	}
}

func TestParseStationsCSVErrors(t *testing.T) {
	const head = "id,name,khz,kw,lat,lon\n"
	const ok = "A,a,1000,1,0,0\n"
	cases := []struct {
		name, in, want string
	}{
		{"brief's example", head + ok + "B,b,1000,1,0,0\nC,c,5,1,0,0\n", "stations.csv: line 4: khz: must be between 100 and 30000 kHz, got 5"},
		{"empty", "", "stations.csv: line 1: empty file; want a header row id,name,khz,kw,lat,lon"},
		{"header only", head, "stations.csv: line 2: no stations; want one station per line after the header"},
		{"unknown column", "id,name,khz,kw,lat,lon,power\n" + ok,
			`stations.csv: line 1: unknown column "power" (allowed: id, name, khz, kw, lat, lon, kw_night, height_deg)`},
		{"wrong case", "ID,name,khz,kw,lat,lon\n" + ok, `stations.csv: line 1: unknown column "ID" (allowed: id, name, khz, kw, lat, lon, kw_night, height_deg)`},
		{"repeated column", "id,name,khz,kw,lat,lon,kw\n" + ok, `stations.csv: line 1: column "kw" given more than once`},
		{"missing column", "id,name,khz,kw,lat\n" + "A,a,1000,1,0\n", `stations.csv: line 1: missing column "lon" (required: id, name, khz, kw, lat, lon)`},
		{"field count", head + ok + "B,b,1000,1,0\n", "stations.csv: line 3: the number of fields differs from the header's"},
		{"bad quote", head + ok + "B,b\"x,1000,1,0,0\n", `stations.csv: line 3: column 4: bare " in non-quoted-field`},
		{"not a number", head + "A,a,1 MHz,1,0,0\n", `stations.csv: line 2: khz: must be a number, got "1 MHz"`},
		{"empty number", head + "A,a,1000,,0,0\n", "stations.csv: line 2: kw: must not be empty"},
		{"NaN", head + "A,a,NaN,1,0,0\n", "stations.csv: line 2: khz: must be between 100 and 30000 kHz, got NaN"},
		{"kw zero", head + "A,a,1000,0,0,0\n", "stations.csv: line 2: kw: must be > 0 and <= 5000 kW, got 0"},
		{"kw high", head + "A,a,1000,5000.5,0,0\n", "stations.csv: line 2: kw: must be > 0 and <= 5000 kW, got 5000.5"},
		{"lat", head + "A,a,1000,1,-90.1,0\n", "stations.csv: line 2: lat: must be between -90 and 90 degrees, got -90.1"},
		{"lon", head + "A,a,1000,1,0,Inf\n", "stations.csv: line 2: lon: must be between -180 and 180 degrees, got +Inf"},
		{"id empty", head + " ,a,1000,1,0,0\n", "stations.csv: line 2: id: must not be empty"},
		{"id duplicate", head + ok + "\n" + "a,b,1000,1,0,0\n", `stations.csv: line 4: id: duplicate id "a" (first on line 2; ids are compared ignoring case)`},
		{"kw_night zero", "id,name,khz,kw,lat,lon,kw_night\nA,a,1000,1,0,0,0\n",
			"stations.csv: line 2: kw_night: must be > 0 and <= 5000 kW, got 0 (leave the cell empty for the day power)"},
		{"height", "id,name,khz,kw,lat,lon,height_deg\nA,a,1000,1,0,0,300\n",
			"stations.csv: line 2: height_deg: must be 0 (a short monopole) or between 1 and 270 degrees, got 300"},
		{"after a two-line field", head + "A,\"x\ny\",1000,1,0,0\nB,b,1,1,0,0\n", "stations.csv: line 4: khz: must be between 100 and 30000 kHz, got 1"},
		{"not UTF-8", head + "A,\xff,1000,1,0,0\n", "stations.csv: line 2: name: not valid UTF-8 text"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			got, err := ParseStationsCSV(strings.NewReader(c.in), "stations.csv")
			if err == nil {
				t.Fatalf("ParseStationsCSV(%q) = %v, nil; want error %q", c.in, got, c.want)
			}
			if got != nil {
				t.Errorf("ParseStationsCSV returned stations with the error %v", err)
			}
			if err.Error() != c.want {
				t.Errorf("ParseStationsCSV(%q) error\n got %q\nwant %q", c.in, err.Error(), c.want)
			}
			var e *Error
			if !errors.As(err, &e) || e.File != "stations.csv" || e.Line < 1 {
				t.Errorf("error %v is not an *Error naming file and line", err)
			}
		})
	}
}

func TestScenarioFromStations(t *testing.T) {
	in := "id,name,khz,kw,lat,lon,kw_night,height_deg\nA,First,999,10,10,20,,\nB,Second,1404,2.5,-10.25,-20.5,1,90\n"
	stations, err := ParseStationsCSV(strings.NewReader(in), "s.csv")
	if err != nil {
		t.Fatal(err)
	}
	spot := plan.Spot{Name: "garden", Place: place(t, 11, 21)}
	s := ScenarioFromStations(stations, spot)
	if err := s.Validate(); err != nil {
		t.Fatalf("ScenarioFromStations(…).Validate() = %v", err)
	}
	if got := s.Stations(); !reflect.DeepEqual(got, stations) {
		t.Errorf("Stations() = %+v, want the input %+v", got, stations)
	}
	if got := s.Spots(); !reflect.DeepEqual(got, []plan.Spot{spot}) {
		t.Errorf("Spots() = %+v, want [%+v]", got, spot)
	}
	if len(s.Regions()) != 0 || s.RigSpec() != receiver.DefaultRigSpec() || s.LandGround != "land" {
		t.Errorf("want no regions, the default rig and land_ground land; got %v, %+v, %q", s.Regions(), s.RigSpec(), s.LandGround)
	}
	// Saved and loaded, it is the same scenario.
	out, err := s.MarshalIndent()
	if err != nil {
		t.Fatal(err)
	}
	s2, err := ParseScenario(out, "saved.json")
	if err != nil {
		t.Fatalf("reloading: %v\n%s", err, out)
	}
	if !reflect.DeepEqual(s, s2) {
		t.Errorf("save → load differs:\n%+v\n%+v", s, s2)
	}
	// An unnamed spot gets a name, so that the scenario validates.
	if s := ScenarioFromStations(stations, plan.Spot{Place: place(t, 0, 0)}); s.Validate() != nil || s.ListeningSpots[0].Name != "spot" {
		t.Errorf("unnamed spot: %v, %q", s.Validate(), s.ListeningSpots[0].Name)
	}
}
