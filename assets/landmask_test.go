package assets

import (
	"fmt"
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"earshot/assets/internal/maskfile"
)

// TestLandMaskKnownPoints: places that are land or sea beyond doubt, each
// well over 5 km (one cell is 5.6 km) from the nearest coast, so the
// grid's half-cell coast error cannot matter. Coordinates are rounded
// positions of common knowledge (from memory); "documented" rows are what the
// Natural Earth land layer does with lakes and ice shelves (see LandMask).
func TestLandMaskKnownPoints(t *testing.T) {
	m, err := LoadLandMask()
	if err != nil {
		t.Fatal(err)
	}
	cases := []struct {
		name     string
		lat, lon float64
		land     bool
		source   string
	}{
		{"central Sahara (Libya–Niger–Algeria)", 23, 12, true, "common knowledge (from memory)"},
		{"central Australia, Alice Springs", -23.7, 133.9, true, "common knowledge (from memory)"},
		{"central Siberia", 62, 100, true, "common knowledge (from memory)"},
		{"Amazon basin, Brazil", -8, -63, true, "common knowledge (from memory)"},
		{"Kazakh steppe", 48, 68, true, "common knowledge (from memory)"},
		{"Kansas", 38.5, -98.5, true, "common knowledge (from memory)"},
		{"Greenland ice sheet", 72, -40, true, "common knowledge (from memory)"},
		{"Antarctica, Vostok station", -78.5, 106.8, true, "common knowledge (from memory)"},
		{"South Pole (latitude -90 exactly)", -90, 0, true, "common knowledge (from memory)"},
		{"Wrangel Island on the 180° meridian", 71.2, 180, true, "common knowledge (from memory)"},
		{"Wrangel Island as -180°", 71.2, -180, true, "common knowledge (from memory)"},
		{"Wrangel Island as 540°", 71.2, 540, true, "common knowledge (from memory)"},
		{"equatorial Pacific", 0, -140, false, "common knowledge (from memory)"},
		{"North Pacific between Hawaii and California", 30, -140, false, "common knowledge (from memory)"},
		{"mid North Atlantic", 40, -40, false, "common knowledge (from memory)"},
		{"South Atlantic", -30, -15, false, "common knowledge (from memory)"},
		{"Indian Ocean", -20, 80, false, "common knowledge (from memory)"},
		{"Southern Ocean", -60, -120, false, "common knowledge (from memory)"},
		{"North Pole (latitude 90 exactly)", 90, 0, false, "common knowledge (from memory): in the Arctic Ocean"},
		{"Black Sea centre", 43.3, 34, false, "common knowledge (from memory)"},
		{"Ionian Sea (Mediterranean)", 35, 18, false, "common knowledge (from memory)"},
		{"Hudson Bay centre", 60, -85, false, "common knowledge (from memory)"},
		{"Caspian Sea centre", 42, 50.8, false, "documented: the Caspian is the one hole in Natural Earth land"},
		{"Lake Superior centre", 47.7, -86.5, true, "documented: lakes lie inside Natural Earth land"},
		{"Lake Michigan centre", 43.8, -87, true, "documented: lakes lie inside Natural Earth land"},
		{"Lake Victoria centre", -1, 33, true, "documented: lakes lie inside Natural Earth land"},
		{"Ross Ice Shelf", -81, -175, false, "documented: floating ice shelves are not in Natural Earth land"},
	}
	for _, tc := range cases {
		if got := m.IsLand(tc.lat, tc.lon); got != tc.land {
			t.Errorf("IsLand(%g, %g) [%s] = %v, want %v (%s)", tc.lat, tc.lon, tc.name, got, tc.land, tc.source)
		}
	}
}

// TestLandMaskLandFraction: the area-weighted share of land cells. About 29%
// of the Earth's surface is land (common knowledge: ≈ 149 of 510 million
// km²). Tolerance ±1.5 percentage points, for what Natural Earth counts as
// land (lakes in, ≈ +0.4 point; floating ice shelves out, ≈ −0.3 point) and
// for sampling cells at their centres.
func TestLandMaskLandFraction(t *testing.T) {
	m, err := LoadLandMask()
	if err != nil {
		t.Fatal(err)
	}
	rows, cols := m.Size()
	res := m.ResolutionDeg()
	var land, all float64
	for r := range rows {
		lat := -90 + (float64(r)+0.5)*res
		w := math.Cos(lat * math.Pi / 180) // a cell's area ∝ cos(latitude)
		n := 0
		for c := range cols {
			if m.IsLand(lat, -180+(float64(c)+0.5)*res) {
				n++
			}
		}
		land += w * float64(n)
		all += w * float64(cols)
	}
	const want, tol = 0.29, 0.015
	if got := land / all; math.Abs(got-want) > tol {
		t.Errorf("land fraction = %.4f, want %.2f ± %.3f", got, want, tol)
	} else {
		t.Logf("land fraction = %.4f (want %.2f ± %.3f)", got, want, tol)
	}
}

// TestLandMaskShape: the embedded mask's grid and provenance.
func TestLandMaskShape(t *testing.T) {
	m, err := LoadLandMask()
	if err != nil {
		t.Fatal(err)
	}
	if rows, cols := m.Size(); rows != 3600 || cols != 7200 {
		t.Errorf("Size() = %d, %d; want 3600, 7200 (180° and 360° at 1/20°)", rows, cols)
	}
	if got := m.ResolutionDeg(); got != 0.05 {
		t.Errorf("ResolutionDeg() = %g, want 0.05", got)
	}
	if want := "world-atlas@2.0.2 land-10m.json object land sha256:"; !strings.HasPrefix(m.source, want) {
		t.Errorf("provenance = %q, want it to start with %q", m.source, want)
	}
	if m2, err2 := LoadLandMask(); m2 != m || err2 != err {
		t.Errorf("second LoadLandMask() = %p, %v; want the cached %p, %v", m2, err2, m, err)
	}
}

// syntheticMask encodes a 1-cell-per-degree grid with the given cells set
// and decodes it as a LandMask.
func syntheticMask(t testing.TB, cells [][2]int) (*LandMask, *maskfile.Grid) {
	t.Helper()
	g, err := maskfile.NewGrid(1)
	if err != nil {
		t.Fatal(err)
	}
	for _, rc := range cells {
		g.Set(rc[0], rc[1], true)
	}
	enc, err := maskfile.Encode(g)
	if err != nil {
		t.Fatal(err)
	}
	m, err := decodeLandMask(enc)
	if err != nil {
		t.Fatal(err)
	}
	return m, g
}

// TestIsLandIndexing: on a synthetic 1° grid, each coordinate lands in the
// cell the grid layout says (row 0 south, column 0 at -180°), longitude wraps
// every 360°, the poles fall in the end rows, and impossible coordinates are
// sea. The expected cells are worked out by hand from the layout.
func TestIsLandIndexing(t *testing.T) {
	// corners, and one interior cell: row 100 = [10°, 11°) N, column 200 = [20°, 21°) E
	m, _ := syntheticMask(t, [][2]int{{0, 0}, {179, 359}, {100, 200}})
	cases := []struct {
		lat, lon float64
		want     bool
	}{
		{-90, -180, true}, {-89.5, -179.5, true}, {-90, 180, true}, {-90, 540, true}, {-90, -540, true},
		{-89.5, -180.5, false}, // column 359
		{-89.5, -179, false},   // column 1
		{-89, -179.5, false},   // row 1
		{90, 179.99, true}, {90, -180.01, true}, {89.5, 179.5, true}, {90, 180, false},
		{10.5, 20.5, true}, {10, 20, true}, {10.999, 20.999, true}, {11, 20.5, false}, {10.5, 21, false},
		{9.999, 20.5, false}, {10.5, 19.999, false}, {10.5, 20.5 + 360*7, true}, {10.5, 20.5 - 360*7, true},
		{90.000001, 179.5, false}, {-90.000001, -179.5, false}, {math.NaN(), 0, false}, {-90, math.NaN(), false},
		{-90, math.Inf(1), false}, {math.Inf(-1), 0, false},
	}
	for _, tc := range cases {
		if got := m.IsLand(tc.lat, tc.lon); got != tc.want {
			t.Errorf("IsLand(%g, %g) = %v, want %v", tc.lat, tc.lon, got, tc.want)
		}
	}
	// Extreme longitudes stay in range (no panic).
	for _, lon := range []float64{math.MaxFloat64, -math.MaxFloat64, 1e300, -180 - 1e-15, math.Nextafter(180, 0), -math.SmallestNonzeroFloat64} {
		_ = m.IsLand(0, lon)
	}
}

// TestIsLandMatchesGrid: IsLand at random points inside random cells agrees
// with the grid it was decoded from (a round trip of the file format through
// the public API).
func TestIsLandMatchesGrid(t *testing.T) {
	rng := rand.New(rand.NewPCG(5, 6))
	var cells [][2]int
	for range 5000 {
		cells = append(cells, [2]int{rng.IntN(180), rng.IntN(360)})
	}
	m, g := syntheticMask(t, cells)
	for range 100000 {
		r, c := rng.IntN(180), rng.IntN(360)
		lat, lon := -90+float64(r)+rng.Float64()*0.999, -180+float64(c)+rng.Float64()*0.999
		if got, want := m.IsLand(lat, lon), g.Get(r, c); got != want {
			t.Fatalf("IsLand(%g, %g) = %v, want cell (%d, %d) = %v", lat, lon, got, r, c, want)
		}
	}
}

// TestDecodeLandMaskErrors: a damaged file is an error naming the part at
// fault, never a panic.
func TestDecodeLandMaskErrors(t *testing.T) {
	for _, tc := range []struct {
		name string
		data []byte
		want string
	}{
		{"empty", nil, "magic"},
		{"truncated", landmaskBin[:len(landmaskBin)/2], "body"},
		{"not a mask", []byte(`{"name":"demo"}`), "magic"},
	} {
		m, err := decodeLandMask(tc.data)
		if err == nil || !strings.Contains(err.Error(), "assets: land mask") || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("decodeLandMask(%s) = %v, %v; want an assets: land mask error mentioning %q", tc.name, m, err, tc.want)
		}
	}
}

func ExampleLandMask_IsLand() {
	m, err := LoadLandMask()
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println("Sahara:", m.IsLand(23, 12))
	fmt.Println("mid-Atlantic:", m.IsLand(40, -40))
	fmt.Println("Lake Superior:", m.IsLand(47.7, -86.5))
	rows, cols := m.Size()
	fmt.Printf("%d×%d cells of %g°\n", rows, cols, m.ResolutionDeg())
	// Output:
	// Sahara: true
	// mid-Atlantic: false
	// Lake Superior: true
	// 3600×7200 cells of 0.05°
}

var sinkBool bool

// BenchmarkIsLand: one lookup, at points spread over the globe, at longitudes
// that need wrapping, and at invalid input.
func BenchmarkIsLand(b *testing.B) {
	m, err := LoadLandMask()
	if err != nil {
		b.Fatal(err)
	}
	rng := rand.New(rand.NewPCG(7, 8))
	const n = 1 << 12
	regimes := []struct {
		name string
		gen  func() (lat, lon float64)
	}{
		{"globe", func() (float64, float64) { return -90 + 180*rng.Float64(), -180 + 360*rng.Float64() }},
		{"wrapped", func() (float64, float64) { return -90 + 180*rng.Float64(), -1000 + 2000*rng.Float64() }},
		{"NaN", func() (float64, float64) { return math.NaN(), 0 }},
	}
	for _, rg := range regimes {
		var lat, lon [n]float64
		for i := range n {
			lat[i], lon[i] = rg.gen()
		}
		b.Run(rg.name, func(b *testing.B) {
			b.ReportAllocs()
			i := 0
			for b.Loop() {
				sinkBool = m.IsLand(lat[i&(n-1)], lon[i&(n-1)])
				i++
			}
		})
	}
}

// BenchmarkLoadLandMask: "decode" is the work of the first LoadLandMask call
// (decompressing and filling the bitset); "cached" is every later call.
func BenchmarkLoadLandMask(b *testing.B) {
	b.Run("decode", func(b *testing.B) {
		b.ReportAllocs()
		b.SetBytes(int64(len(landmaskBin)))
		for b.Loop() {
			if _, err := decodeLandMask(landmaskBin); err != nil {
				b.Fatal(err)
			}
		}
	})
	b.Run("cached", func(b *testing.B) {
		b.ReportAllocs()
		for b.Loop() {
			if _, err := LoadLandMask(); err != nil {
				b.Fatal(err)
			}
		}
	})
}
