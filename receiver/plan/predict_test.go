package plan

import (
	"math"
	"math/rand/v2"
	"testing"
	"time"

	"earshot/propagation"
	"earshot/receiver"
)

// Synthetic grounds for property tests (P.368 constants, methods.md §1.4).
var (
	seaG = propagation.Ground{SigmaSPerM: 5, EpsR: 70}
	dryG = propagation.Ground{SigmaSPerM: 3e-4, EpsR: 7}
)

func place(t testing.TB, lat, lon float64) propagation.Place {
	t.Helper()
	p, err := propagation.NewPlace(lat, lon)
	if err != nil {
		t.Fatal(err)
	}
	return p
}

// coastWorld is sea west of 10° E and dry land east of it.
func coastWorld(stations []Station) World {
	return World{Stations: stations, Ground: func(lat, lon float64) propagation.Ground {
		if lon < 10 {
			return seaG
		}
		return dryG
	}}
}

func newPlanner(t testing.TB, w World) *Planner {
	t.Helper()
	p, err := NewPlanner(w, receiver.DefaultRigSpec())
	if err != nil {
		t.Fatal(err)
	}
	return p
}

var noon = time.Date(2025, 6, 15, 12, 0, 0, 0, time.UTC)

// TestSeaPathBeatsLand: by day, a station 150 km away over sea is received
// more strongly than one 150 km away over dry land (P.368: sea water's
// ground wave is far stronger; the ordering of the P.368 figures).
func TestSeaPathBeatsLand(t *testing.T) {
	spot := Spot{"coast", place(t, 45, 10)}
	west := Station{ID: "W", KHz: 1000, KWDay: 10, Place: place(t, 45, 10-150/(111.195*math.Cos(45*math.Pi/180)))}
	east := Station{ID: "E", KHz: 1000, KWDay: 10, Place: place(t, 45, 10+150/(111.195*math.Cos(45*math.Pi/180)))}
	p := newPlanner(t, coastWorld([]Station{west, east}))
	pr, err := p.Predict(spot, noon)
	if err != nil {
		t.Fatal(err)
	}
	got := map[string]Heard{}
	for _, h := range pr.Heard {
		got[h.Station.ID] = h
	}
	if !(got["W"].GroundDB > got["E"].GroundDB+20) {
		t.Errorf("sea path %.1f dB(µV/m), dry-land path %.1f: want sea far stronger", got["W"].GroundDB, got["E"].GroundDB)
	}
	if got["W"].SkyDB != nil {
		t.Errorf("sky wave present at noon")
	}
}

// TestCoastCrossing: crossing a coastline the field follows Millington's
// method in both directions — a land station heard across the sea is
// stronger than over an all-land path and weaker than over an all-sea one,
// and the mixed-path result is reciprocal (P.368 Annex 2).
func TestCoastCrossing(t *testing.T) {
	lonKm := 111.195 * math.Cos(45*math.Pi/180)
	tx := Station{ID: "T", KHz: 800, KWDay: 10, Place: place(t, 45, 10+40/lonKm)} // 40 km inland
	spot := Spot{"sea", place(t, 45, 10-60/lonKm)}                                // 60 km out at sea
	p := newPlanner(t, coastWorld([]Station{tx}))
	pr, err := p.Predict(spot, noon)
	if err != nil {
		t.Fatal(err)
	}
	mixed := pr.Heard[0].GroundDB
	var cc propagation.CurveCache
	d := pr.Heard[0].DistKm
	txp := propagation.Transmitter{Freq: 800, PowerKW: 10}
	allLand, _, _ := cc.PathFieldDBuVm(txp, propagation.Path{{LengthKm: d, Ground: dryG}})
	allSea, _, _ := cc.PathFieldDBuVm(txp, propagation.Path{{LengthKm: d, Ground: seaG}})
	if !(mixed > allLand && mixed < allSea) {
		t.Errorf("land→sea path %.2f not between all-land %.2f and all-sea %.2f", mixed, allLand, allSea)
	}
	// Reverse roles: the station at sea, the listener inland.
	tx2 := Station{ID: "S", KHz: 800, KWDay: 10, Place: spot.Place}
	p2 := newPlanner(t, coastWorld([]Station{tx2}))
	pr2, err := p2.Predict(Spot{"inland", tx.Place}, noon)
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(pr2.Heard[0].GroundDB-mixed) > 0.05 {
		t.Errorf("sea→land %.3f, land→sea %.3f: Millington is reciprocal", pr2.Heard[0].GroundDB, mixed)
	}
}

// TestNightBringsDistantStations: a 100 kW station 1500 km away over land
// is inaudible at noon and audible at local midnight by sky wave (P.1147;
// the daily experience of medium-wave listening, common practice).
func TestNightBringsDistantStations(t *testing.T) {
	spot := Spot{"here", place(t, 45, 20)}
	far := Station{ID: "F", KHz: 700, KWDay: 100, Place: place(t, 45, 20-1500/(111.195*math.Cos(45*math.Pi/180)))}
	p := newPlanner(t, coastWorld([]Station{far}))
	day, err := p.Predict(spot, time.Date(2025, 1, 15, 11, 0, 0, 0, time.UTC))
	if err != nil {
		t.Fatal(err)
	}
	night, err := p.Predict(spot, time.Date(2025, 1, 15, 23, 0, 0, 0, time.UTC))
	if err != nil {
		t.Fatal(err)
	}
	if day.Heard[0].Audible || !night.Heard[0].Audible || night.Heard[0].SkyDB == nil {
		t.Errorf("1500 km station: audible by day %v (%.1f dB(µV/m)), at night %v (%.1f)", day.Heard[0].Audible, day.Heard[0].FieldDB,
			night.Heard[0].Audible, night.Heard[0].FieldDB)
	}
	if c := night.Heard[0].Chance; c <= 0.5 || c > 1 {
		t.Errorf("chance at night %g, want above one half", c)
	}
}

// TestPredictNoNaN drives 10^5 random valid inputs through Predict and
// finds no NaN or Inf (issue acceptance). Seeded.
func TestPredictNoNaN(t *testing.T) {
	n := 100000
	if testing.Short() {
		n = 5000
	}
	rng := rand.New(rand.NewPCG(7, 11))
	freqs := []propagation.KHz{531, 612, 729, 855, 990, 1098, 1233, 1395, 1530, 1701}
	var stations []Station
	for i := range 20 {
		stations = append(stations, Station{ID: string(rune('A' + i)), KHz: freqs[rng.IntN(len(freqs))],
			KWDay: 0.1 + rng.Float64()*500, KWNight: rng.Float64() * 100, HeightDeg: rng.Float64() * 200,
			Place: place(t, -60+rng.Float64()*120, -180+rng.Float64()*360)})
	}
	w := coastWorld(stations)
	p := newPlanner(t, w)
	for i := 0; i < n; i++ {
		s := stations[rng.IntN(len(stations))]
		spot := Spot{"r", place(t, -70+rng.Float64()*140, -180+rng.Float64()*360)}
		if rng.IntN(4) == 0 { // close to the station
			spot.Place = place(t, math.Max(-89, math.Min(89, s.Place.LatDeg()+rng.NormFloat64()*0.05)), s.Place.LonDeg())
		}
		at := time.Date(2025, time.Month(1+rng.IntN(12)), 1+rng.IntN(28), rng.IntN(24), rng.IntN(60), 0, 0, time.UTC)
		idx := 0
		for j := range stations {
			if stations[j].ID == s.ID {
				idx = j
			}
		}
		h, err := p.station(idx, s, spot, at)
		if err != nil {
			t.Fatalf("station %s to %v at %v: %v", s.ID, spot.Place, at, err)
		}
		for _, v := range []float64{h.GroundDB, h.FieldDB, h.MarginDB, h.SNRDB, h.Chance, h.DistKm} {
			if math.IsNaN(v) || math.IsInf(v, 0) {
				t.Fatalf("station %s to %v at %v: %+v", s.ID, spot.Place, at, h)
			}
		}
	}
}

// BenchmarkPredict measures one spot with 30 stations (warm caches), and
// the same without the planner's caches (a fresh planner each time).
func BenchmarkPredict(b *testing.B) {
	rng := rand.New(rand.NewPCG(3, 5))
	var stations []Station
	for i := range 30 {
		stations = append(stations, Station{ID: string(rune('A' + i)), KHz: propagation.KHz(531 + 9*rng.IntN(130)),
			KWDay: 1 + rng.Float64()*100, Place: place(b, 40+rng.Float64()*10, 5+rng.Float64()*10)})
	}
	w := coastWorld(stations)
	spot := Spot{"s", place(b, 45, 10.2)}
	at := time.Date(2025, 1, 15, 21, 0, 0, 0, time.UTC)
	p := newPlanner(b, w)
	if _, err := p.Predict(spot, at); err != nil {
		b.Fatal(err)
	}
	b.Run("spot-30-stations", func(b *testing.B) {
		b.ReportAllocs()
		for b.Loop() {
			if _, err := p.Predict(spot, at); err != nil {
				b.Fatal(err)
			}
		}
	})
	b.Run("spot-30-stations-uncached", func(b *testing.B) {
		b.ReportAllocs()
		for b.Loop() {
			q := newPlanner(b, w)
			if _, err := q.Predict(spot, at); err != nil {
				b.Fatal(err)
			}
		}
	})
}

// TestChainTable: the planner's interpolated margin agrees with the full
// chain (receiver.Rig.Receive) within 0.1 dB across the field range, and
// its audibility threshold is the rig's MinAudibleDBuVm.
func TestChainTable(t *testing.T) {
	p := newPlanner(t, coastWorld([]Station{{ID: "A", KHz: 1000, KWDay: 1, Place: place(t, 45, 10)}}))
	for _, f := range []propagation.KHz{540, 1000, 1700} {
		ct, err := p.chain(f)
		if err != nil {
			t.Fatal(err)
		}
		for e := -10.0; e <= 95; e += 1.3 {
			rc, err := p.rig.Receive(f, e)
			if err != nil {
				t.Fatal(err)
			}
			if got := ct.margin(e); math.Abs(got-rc.MarginDB) > 0.1 {
				t.Errorf("%g kHz, %.1f dB(µV/m): table margin %.3f, chain %.3f", float64(f), e, got, rc.MarginDB)
			}
		}
		// Beyond the table: linear extension, within 1.5 dB up to 120.
		for _, e := range []float64{105, 112, 120} {
			rc, err := p.rig.Receive(f, e)
			if err != nil {
				t.Fatal(err)
			}
			if got := ct.margin(e); math.Abs(got-rc.MarginDB) > 1.5 {
				t.Errorf("%g kHz, %.1f dB(µV/m): extended margin %.3f, chain %.3f", float64(f), e, got, rc.MarginDB)
			}
		}
		// The same bisection as the rig's, in a narrower bracket: within
		// its 0.01 dB tolerance.
		m, _ := p.rig.MinAudibleDBuVm(f)
		if math.Abs(ct.minDBuVm-m) > 0.01 {
			t.Errorf("%g kHz: table threshold %g, rig %g", float64(f), ct.minDBuVm, m)
		}
	}
}

// TestMapMatchesPredict: the map's count at a cell equals Predict's count
// at the cell centre when every cell is computed exactly (Stride 1), and
// the interpolated map (Stride 4) differs from the exact one in few cells
// (the interpolation is a speed device; here at most 3 % of cells, each by
// at most one station).
func TestMapMatchesPredict(t *testing.T) {
	rng := rand.New(rand.NewPCG(9, 9))
	var stations []Station
	for i := range 8 {
		stations = append(stations, Station{ID: string(rune('A' + i)), KHz: propagation.KHz(540 + 100*i),
			KWDay: 1 + rng.Float64()*50, Place: place(t, 44+rng.Float64()*2, 9+rng.Float64()*2)})
	}
	p := newPlanner(t, coastWorld(stations))
	box := BBox{43.5, 46.5, 8.5, 11.5}
	exact, err := p.Map(box, 24, 24, noon, MapCount, "", MapOptions{Stride: 1}, nil)
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range [][2]int{{0, 0}, {5, 17}, {12, 12}, {23, 3}} {
		lat, lon := box.Cell(c[0], c[1], 24, 24)
		pr, err := p.Predict(Spot{"c", place(t, lat, lon)}, noon)
		if err != nil {
			t.Fatal(err)
		}
		if got := exact.Values[c[1]*24+c[0]]; int(got) != pr.Audible() {
			t.Errorf("cell %v: map count %g, Predict %d", c, got, pr.Audible())
		}
	}
	one, err := p.Map(box, 24, 24, noon, MapStation, "C", MapOptions{Stride: 1}, nil)
	if err != nil {
		t.Fatal(err)
	}
	lat, lon := box.Cell(7, 9, 24, 24)
	pr, err := p.Predict(Spot{"c", place(t, lat, lon)}, noon)
	if err != nil {
		t.Fatal(err)
	}
	for _, h := range pr.Heard {
		if h.Station.ID == "C" && math.Abs(one.Values[9*24+7]-h.DetectorDB) > 1e-9 {
			t.Errorf("station map %.4f dB, Predict %.4f dB above the weakest audible field", one.Values[9*24+7], h.DetectorDB)
		}
	}
	if _, err := p.Map(box, 24, 24, noon, MapStation, "nope", MapOptions{}, nil); err == nil {
		t.Errorf("map of an unknown station: no error")
	}
	fast, err := p.Map(box, 24, 24, noon, MapCount, "", MapOptions{Stride: 4}, nil)
	if err != nil {
		t.Fatal(err)
	}
	diff := 0
	for i := range fast.Values {
		if d := math.Abs(fast.Values[i] - exact.Values[i]); d > 0 {
			diff++
			if d > 1 {
				t.Errorf("cell %d: interpolated count %g, exact %g", i, fast.Values[i], exact.Values[i])
			}
		}
	}
	if diff > len(fast.Values)*3/100 {
		t.Errorf("%d of %d cells differ between the interpolated and the exact map", diff, len(fast.Values))
	}
}

// BenchmarkMap: a 256×256 count map with 30 stations (issue target
// ≤ 0.5 s native).
func BenchmarkMap(b *testing.B) {
	rng := rand.New(rand.NewPCG(3, 5))
	var stations []Station
	for i := range 30 {
		stations = append(stations, Station{ID: string(rune('A' + i)), KHz: propagation.KHz(531 + 9*rng.IntN(130)),
			KWDay: 1 + rng.Float64()*100, Place: place(b, 43+rng.Float64()*4, 8+rng.Float64()*4)})
	}
	p := newPlanner(b, coastWorld(stations))
	box := BBox{42, 48, 7, 13}
	at := time.Date(2025, 1, 15, 21, 0, 0, 0, time.UTC)
	if _, err := p.Map(box, 32, 32, at, MapCount, "", MapOptions{}, nil); err != nil {
		b.Fatal(err)
	}
	b.Run("256x256-30-stations", func(b *testing.B) {
		b.ReportAllocs()
		for b.Loop() {
			if _, err := p.Map(box, 256, 256, at, MapCount, "", MapOptions{}, nil); err != nil {
				b.Fatal(err)
			}
		}
	})
	// The direct evaluation it replaces: every cell and station exact.
	b.Run("256x256-30-stations-every-cell-exact", func(b *testing.B) {
		b.ReportAllocs()
		for b.Loop() {
			if _, err := p.Map(box, 256, 256, at, MapCount, "", MapOptions{Stride: 1}, nil); err != nil {
				b.Fatal(err)
			}
		}
	})
}
