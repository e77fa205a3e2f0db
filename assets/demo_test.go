package assets

import (
	"bytes"
	"math"
	"testing"

	"earshot/propagation"
	"earshot/receiver"
)

func TestDemoLoads(t *testing.T) {
	s, err := Demo()
	if err != nil {
		t.Fatalf("Demo() = %v", err)
	}
	if err := s.Validate(); err != nil {
		t.Errorf("Demo().Validate() = %v", err)
	}
	// The embedded file is stored in MarshalIndent's form.
	out, err := s.MarshalIndent()
	if err != nil {
		t.Fatal(err)
	}
	if !bytes.Equal(out, demoJSON) {
		t.Errorf("demo.json is not in MarshalIndent's form; regenerate it with s.MarshalIndent()")
	}
	if !bytes.Contains([]byte(s.Note), []byte("INVENTED")) || !bytes.Contains([]byte(s.Name), []byte("invented")) {
		t.Errorf("the demo's name and note must say it is invented: %q, %q", s.Name, s.Note)
	}
	if got := s.RigSpec(); got != receiver.DefaultRigSpec() {
		t.Errorf("demo rig = %+v, want DefaultRigSpec", got)
	}
	for _, name := range []string{"shore", "inland", "upland"} {
		if _, err := s.SpotByName(name); err != nil {
			t.Error(err)
		}
	}
	if sp, _ := s.SpotByName(""); sp.Name != "shore" {
		t.Errorf("default spot = %q, want shore", sp.Name)
	}
	// Every channel is on the 9 kHz raster the README states, inside the
	// broadcast band 531–1602 kHz extended to 1701 kHz.
	for _, st := range s.Stations() {
		if k := float64(st.KHz); math.Mod(k, 9) != 0 || k < 531 || k > 1701 {
			t.Errorf("%s on %g kHz: not a 9 kHz channel of 531–1701 kHz", st.ID, k)
		}
	}
}

// pointNemo is the oceanic pole of inaccessibility, 48.87° S 123.39° W,
// 2688 km from the nearest land (Guinness World Records, "Remotest spot
// from land", citing H. Lukatela's 1992 computation).
const (
	pointNemoLat, pointNemoLon = -48.87, -123.39
	pointNemoToLandKm          = 2688.0
)

// TestDemoIsFarFromRealLand checks that the invented main islands overlap
// nothing real: every vertex of the first seven regions (the main island,
// its features and the nearby small islands), every spot and every
// transmitter on them lies within 2688 − 1500 km of Point Nemo, so (by the
// triangle inequality) at least 1500 km from any real land.
func TestDemoIsFarFromRealLand(t *testing.T) {
	s, err := Demo()
	if err != nil {
		t.Fatal(err)
	}
	nemo, err := propagation.NewPlace(pointNemoLat, pointNemoLon)
	if err != nil {
		t.Fatal(err)
	}
	const wantLandKm = 1500.0
	check := func(what string, lat, lon float64) {
		p, err := propagation.NewPlace(lat, lon)
		if err != nil {
			t.Fatal(err)
		}
		if d := propagation.DistanceKm(p, nemo); pointNemoToLandKm-d < wantLandKm {
			t.Errorf("%s (%g, %g) is %.0f km from Point Nemo: real land may be within %.0f km", what, lat, lon, d, pointNemoToLandKm-d)
		}
	}
	local := s.GroundRegions[:7]
	for _, r := range local {
		for _, v := range r.Polygon {
			check(r.Name, v[0], v[1])
		}
	}
	for _, sp := range s.ListeningSpots {
		check("spot "+sp.Name, sp.Lat, sp.Lon)
	}
	for _, tx := range s.Transmitters[:16] {
		check(tx.ID, tx.Lat, tx.Lon)
	}
}

// TestDemoIsSeaInWorldMask checks the whole demo, distant islands
// included, against the world land/sea mask: no vertex, transmitter or
// spot falls on real land.
func TestDemoIsSeaInWorldMask(t *testing.T) {
	s, err := Demo()
	if err != nil {
		t.Fatal(err)
	}
	m, err := LoadLandMask()
	if err != nil {
		t.Fatal(err)
	}
	for _, r := range s.GroundRegions {
		for _, v := range r.Polygon {
			if m.IsLand(v[0], v[1]) {
				t.Errorf("region %q vertex %v is real land", r.Name, v)
			}
		}
	}
	for _, tx := range s.Transmitters {
		if m.IsLand(tx.Lat, tx.Lon) {
			t.Errorf("transmitter %s is on real land", tx.ID)
		}
	}
	for _, sp := range s.ListeningSpots {
		if m.IsLand(sp.Lat, sp.Lon) {
			t.Errorf("spot %s is on real land", sp.Name)
		}
	}
}

// TestDemoLayout checks the demo against the layout README.md promises
// (structure, not physics): an inland spot 3–8 km from a strong local, an
// upland spot on dry ground, and high-power stations 500–3000 km away.
func TestDemoLayout(t *testing.T) {
	s, err := Demo()
	if err != nil {
		t.Fatal(err)
	}
	gm := s.GroundMap(nil)
	ground := func(name string) propagation.Ground {
		g, err := propagation.GroundByName(name)
		if err != nil {
			t.Fatal(err)
		}
		return g.Ground
	}
	inland, _ := s.SpotByName("inland")
	near := false
	for _, st := range s.Stations() {
		if d := propagation.DistanceKm(st.Place, inland.Place); d >= 3 && d <= 8 && st.KWDay >= 10 {
			near = true
		}
	}
	if !near {
		t.Errorf("no station of 10 kW or more lies 3–8 km from the inland spot")
	}
	upland, _ := s.SpotByName("upland")
	if g := gm(upland.Place.LatDeg(), upland.Place.LonDeg()); g != ground("dry") {
		t.Errorf("ground at the upland spot = %v, want dry", g)
	}
	far := 0
	for _, st := range s.Stations() {
		if st.KWDay < 100 {
			continue
		}
		far++
		for _, sp := range s.Spots() {
			if d := propagation.DistanceKm(st.Place, sp.Place); d < 500 || d > 3000 {
				t.Errorf("%s (%g kW) is %.0f km from %s, want 500–3000 km", st.ID, st.KWDay, d, sp.Name)
			}
		}
	}
	if far == 0 {
		t.Errorf("no high-power distant stations")
	}
}
