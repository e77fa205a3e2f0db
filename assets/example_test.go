package assets_test

import (
	"fmt"
	"strings"

	"earshot/assets"
)

func ExampleParseScenario() {
	data := []byte(`{
  "format": "earshot-scenario", "version": 1, "name": "Example (invented)",
  "transmitters": [{"id": "X-1", "khz": 5, "kw_day": 10, "lat": -47, "lon": -126}],
  "spots": [{"name": "home", "lat": -47.1, "lon": -126.1}]
}`)
	_, err := assets.ParseScenario(data, "example.json")
	fmt.Println(err)
	// Output:
	// example.json: transmitters[0].khz: must be between 100 and 30000 kHz, got 5
}

func ExampleParseStationsCSV() {
	list := "id,name,khz,kw,lat,lon,kw_night\n" +
		"X-1,First Invented,999,10,-47,-126,\n" +
		"X-2,\"Second, Invented\",1404,2.5,-47.2,-125.5,1\n"
	stations, err := assets.ParseStationsCSV(strings.NewReader(list), "stations.csv")
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, st := range stations {
		fmt.Printf("%s %q %g kHz %g/%g kW at %v\n", st.ID, st.Name, float64(st.KHz), st.KWDay, st.KWNight, st.Place)
	}
	// Output:
	// X-1 "First Invented" 999 kHz 10/0 kW at -47.0000°, -126.0000°
	// X-2 "Second, Invented" 1404 kHz 2.5/1 kW at -47.2000°, -125.5000°
}

func ExamplePolygonContains() {
	// A 2° square across the 180° meridian.
	square := [][2]float64{{-10, 179}, {-10, -179}, {-12, -179}, {-12, 179}}
	for _, lon := range []float64{179.5, -179.5, 0} {
		in, _ := assets.PolygonContains(square, -11, lon)
		fmt.Println(lon, in)
	}
	// Output:
	// 179.5 true
	// -179.5 true
	// 0 false
}

func ExampleDemo() {
	s, err := assets.Demo()
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println(len(s.Stations()), "stations; spots:")
	for _, sp := range s.Spots() {
		fmt.Println(" ", sp.Name)
	}
	// Output:
	// 25 stations; spots:
	//   shore
	//   inland
	//   upland
}
