package assets

import (
	"bytes"
	"errors"
	"reflect"
	"strings"
	"testing"

	"earshot/propagation"
	"earshot/receiver/plan"
)

// FuzzParseScenario checks that ParseScenario never panics and either
// returns an *Error naming the file, or a scenario that validates, whose
// methods work, and that saves and loads back deep-equal.
// Seeds: testdata/fuzz/FuzzParseScenario.
func FuzzParseScenario(f *testing.F) {
	f.Add([]byte(minimalJSON))
	f.Fuzz(func(t *testing.T, data []byte) {
		s, err := ParseScenario(data, "fuzz.json")
		if err != nil {
			var e *Error
			if s != nil || !errors.As(err, &e) || !strings.HasPrefix(err.Error(), "fuzz.json") {
				t.Fatalf("error %v (scenario %v): want a nil scenario and an *Error naming the file", err, s)
			}
			return
		}
		if err := s.Validate(); err != nil {
			t.Fatalf("parsed scenario does not validate: %v", err)
		}
		gm := s.GroundMap(func(lat, lon float64) bool { return lat > 0 })
		for _, sp := range s.Spots() {
			if err := gm(sp.Place.LatDeg(), sp.Place.LonDeg()).Validate(); err != nil {
				t.Fatalf("ground at spot %s: %v", sp.Name, err)
			}
		}
		for _, st := range s.Stations() {
			if st.HeightDeg != 0 {
				if g, err := propagation.MonopoleGainDB(st.HeightDeg, 0); err != nil || g != g {
					t.Fatalf("station %s: gain %g, %v", st.ID, g, err)
				}
			}
		}
		s.Regions()
		if _, err := s.RigSpec().Build(); err != nil {
			t.Fatalf("rig: %v", err)
		}
		out, err := s.MarshalIndent()
		if err != nil {
			t.Fatalf("MarshalIndent: %v", err)
		}
		s2, err := ParseScenario(out, "saved.json")
		if err != nil {
			t.Fatalf("reloading the saved scenario: %v\n%s", err, out)
		}
		if !reflect.DeepEqual(s, s2) {
			t.Fatalf("load → save → load differs:\n%+v\n%+v", s, s2)
		}
	})
}

// FuzzParseStationsCSV checks that ParseStationsCSV never panics and
// either returns an *Error naming file and line, or stations that make a
// valid scenario which saves and loads back to the same stations.
// Seeds: testdata/fuzz/FuzzParseStationsCSV.
func FuzzParseStationsCSV(f *testing.F) {
	f.Add([]byte("id,name,khz,kw,lat,lon\nA,a,1000,1,0,0\n"))
	spotPlace, err := propagation.NewPlace(1, 2)
	if err != nil {
		f.Fatal(err)
	}
	f.Fuzz(func(t *testing.T, data []byte) {
		stations, err := ParseStationsCSV(bytes.NewReader(data), "fuzz.csv")
		if err != nil {
			var e *Error
			if stations != nil || !errors.As(err, &e) || !strings.HasPrefix(err.Error(), "fuzz.csv") {
				t.Fatalf("error %v (stations %v): want no stations and an *Error naming the file", err, stations)
			}
			return
		}
		s := ScenarioFromStations(stations, plan.Spot{Name: "here", Place: spotPlace})
		if err := s.Validate(); err != nil {
			t.Fatalf("scenario of the stations does not validate: %v", err)
		}
		out, err := s.MarshalIndent()
		if err != nil {
			t.Fatalf("MarshalIndent: %v", err)
		}
		s2, err := ParseScenario(out, "saved.json")
		if err != nil {
			t.Fatalf("reloading: %v\n%s", err, out)
		}
		if got := s2.Stations(); !reflect.DeepEqual(got, stations) {
			t.Fatalf("stations → scenario → save → load differ:\n%+v\n%+v", stations, got)
		}
	})
}
