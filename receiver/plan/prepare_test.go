package plan

import (
	"earshot/receiver"
	"math/rand/v2"
	"slices"
	"testing"
	"time"

	"earshot/propagation"
)

// TestPrepareIncremental: Prepare with a budget of one piece per call
// finishes, each call doing at most one piece, and leaves Predict nothing
// to compute (the curve count does not change); the prediction equals that
// of a planner that was never prepared (the same numbers: Prepare only
// fills caches).
func TestPrepareIncremental(t *testing.T) {
	stations := []Station{
		{ID: "A", KHz: 600, KWDay: 5, Place: place(t, 45, 9.5)},
		{ID: "B", KHz: 900, KWDay: 20, Place: place(t, 45.5, 10.5)},
		{ID: "C", KHz: 1400, KWDay: 1, Place: place(t, 44.5, 10.1)},
	}
	w := coastWorld(stations)
	spot := Spot{"s", place(t, 45, 10.2)}
	p := newPlanner(t, w)
	calls := 0
	for {
		calls++
		if calls > 100 {
			t.Fatal("Prepare did not finish in 100 calls of one piece each")
		}
		budget := 1
		done, err := p.Prepare(spot, func() bool { budget--; return budget >= 0 })
		if err != nil {
			t.Fatal(err)
		}
		if done {
			break
		}
	}
	// Paths from A cross sea and dry land; B and C lie over dry land: 4
	// curves, 3 rig tables and the selectivity table, one per call (the
	// call that does the last piece reports done).
	if want := 4 + 3 + 1; calls != want {
		t.Errorf("Prepare took %d calls, want %d", calls, want)
	}
	n := p.curves.Len()
	got, err := p.Predict(spot, noon)
	if err != nil {
		t.Fatal(err)
	}
	if p.curves.Len() != n {
		t.Errorf("Predict computed %d more curves after Prepare", p.curves.Len()-n)
	}
	want, err := newPlanner(t, w).Predict(spot, noon)
	if err != nil {
		t.Fatal(err)
	}
	for i := range want.Heard {
		if got.Heard[i].Station.ID != want.Heard[i].Station.ID || got.Heard[i].FieldDB != want.Heard[i].FieldDB || got.Heard[i].MarginDB != want.Heard[i].MarginDB {
			t.Errorf("station %d: prepared %+v, fresh %+v", i, got.Heard[i], want.Heard[i])
		}
	}
	if done, _ := p.Prepare(spot, func() bool { return false }); !done {
		t.Error("Prepare with nothing left and no budget: want done")
	}
}

// TestCountAt: the exact count at a place is Predict's audible count there
// (the definition), over random places and times.
func TestCountAt(t *testing.T) {
	rng := rand.New(rand.NewPCG(4, 2))
	var stations []Station
	for i := range 6 {
		stations = append(stations, Station{ID: string(rune('A' + i)), KHz: propagation.KHz(540 + 190*i),
			KWDay: 1 + rng.Float64()*50, Place: place(t, 44+rng.Float64()*2, 9+rng.Float64()*2)})
	}
	p := newPlanner(t, coastWorld(stations))
	for i := range 12 {
		pl := place(t, 43+rng.Float64()*4, 8+rng.Float64()*4)
		at := noon.Add(time.Duration(i) * 2 * time.Hour)
		n, err := p.CountAt(pl, at)
		if err != nil {
			t.Fatal(err)
		}
		pr, err := p.Predict(Spot{"x", pl}, at)
		if err != nil {
			t.Fatal(err)
		}
		if n != pr.Audible() {
			t.Errorf("CountAt(%v, %v) = %d, Predict audible %d", pl, at, n, pr.Audible())
		}
	}
}

// TestDayAndNight: noon and midnight of mean solar time at the spot
// (15° of longitude per hour: the definition of mean solar time).
func TestDayAndNight(t *testing.T) {
	spot := Spot{"x", place(t, -47, -126)}
	day, night := DayAndNight(time.Date(2025, 3, 1, 5, 0, 0, 0, time.UTC), spot)
	if want := time.Date(2025, 3, 1, 20, 24, 0, 0, time.UTC); !day.Equal(want) {
		t.Errorf("day = %v, want %v", day, want)
	}
	if want := time.Date(2025, 3, 2, 8, 24, 0, 0, time.UTC); !night.Equal(want) {
		t.Errorf("night = %v, want %v", night, want)
	}
}

// TestWireLengthsM: the sweep's lengths are 10 m steps to 100 m (the
// issue's question, "how many stations each extra 10 m buys"), with the
// rig's own length added once and in order.
func TestWireLengthsM(t *testing.T) {
	tens := []float64{10, 20, 30, 40, 50, 60, 70, 80, 90, 100}
	for _, c := range []struct {
		current float64
		want    []float64
	}{
		{40, tens},
		{0, tens},
		{35, []float64{10, 20, 30, 35, 40, 50, 60, 70, 80, 90, 100}},
		{5, append([]float64{5}, tens...)},
		{150, append(slices.Clone(tens), 150)},
	} {
		if got := WireLengthsM(c.current); !slices.Equal(got, c.want) {
			t.Errorf("WireLengthsM(%g) = %v, want %v", c.current, got, c.want)
		}
	}
}

// TestUntunableStation: with 100 m of wire 10 m up (110 m in all, about
// half a wavelength at 1368 kHz, where the antenna's reactance is far
// beyond any loading coil: a wire near λ/2 is a high-impedance load, common
// practice), the station at 1368 kHz is reported as not receivable while
// the rest of the prediction goes on.
func TestUntunableStation(t *testing.T) {
	stations := []Station{
		{ID: "A", KHz: 1368, KWDay: 10, Place: place(t, 45, 10.5)},
		{ID: "B", KHz: 700, KWDay: 10, Place: place(t, 45, 10.6)},
	}
	spec := receiver.DefaultRigSpec()
	spec.WireM = 100
	rig, err := spec.Build()
	if err != nil {
		t.Fatal(err)
	}
	if _, err := rig.Receive(1368, 60); err == nil {
		t.Fatal("the rig follows 1368 kHz through its chain; expected no loading coil to tune it there")
	}
	p, err := NewPlanner(coastWorld(stations), spec)
	if err != nil {
		t.Fatal(err)
	}
	pr, err := p.Predict(Spot{"s", place(t, 45, 10.2)}, noon)
	if err != nil {
		t.Fatal(err)
	}
	for _, h := range pr.Heard {
		switch h.Station.ID {
		case "A":
			if h.Audible || h.Chance != 0 || h.Verdict != "cannot be tuned with this rig" {
				t.Errorf("A: audible %v chance %g verdict %q", h.Audible, h.Chance, h.Verdict)
			}
		case "B":
			if !h.Audible {
				t.Errorf("B (10 kW, 30 km): not audible, verdict %q", h.Verdict)
			}
		}
	}
}
