package main

import (
	"crypto/sha256"
	"fmt"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"earshot/assets/internal/maskfile"
)

// These tests read the real world-atlas package, which is not part of the
// repository. Unpack it and point EARSHOT_WORLD_ATLAS at its package/ folder:
//
//	cd /tmp/wa && npm pack world-atlas@2.0.2 && tar xzf world-atlas-2.0.2.tgz
//	EARSHOT_WORLD_ATLAS=/tmp/wa/package go test ./assets/internal/genmask
func worldAtlas(t *testing.T) string {
	dir := os.Getenv(envHint)
	if dir == "" {
		t.Skipf("%s is not set: skipping the checks against the world-atlas npm package "+
			"(npm pack world-atlas@2.0.2, untar, set %s to the package/ folder; see assets/README.md)", envHint, envHint)
	}
	return dir
}

// meridianIndex answers exact point-in-polygon queries on the decoded rings,
// by a method independent of the rasterizer's: count the ring edges that cross
// the meridian arc from the point north to the North Pole. The North Pole lies
// in the Arctic Ocean (common knowledge, from memory), so an odd count means
// land. No ring needs closing round a pole and no scanline is involved; the
// edges are the same straight (lon, lat) segments, taken the short way round.
type meridianIndex struct {
	bins [360][]edge // edges by the 1° longitude bins they overlap
}

type edge struct{ x1, y1, dx, y2 float64 } // from (x1, y1) to (x1+dx, y2), dx the short way

func newMeridianIndex(rings []ring) *meridianIndex {
	ix := &meridianIndex{}
	for _, rg := range rings {
		for i := 0; i+1 < len(rg.pts); i++ {
			p, q := rg.pts[i], rg.pts[i+1]
			e := edge{p.lon, p.lat, shortLonStep(q.lon - p.lon), q.lat}
			if e.dx == 0 {
				continue // on one meridian: never crosses another one
			}
			lo, hi := math.Floor(min(e.x1, e.x1+e.dx)), math.Floor(max(e.x1, e.x1+e.dx))
			for b := lo; b <= hi; b++ {
				k := (int(b) + 180 + 720) % 360
				ix.bins[k] = append(ix.bins[k], e)
			}
		}
	}
	return ix
}

// wrap180 brings a longitude difference into [-180°, 180°).
func wrap180(d float64) float64 { return math.Mod(math.Mod(d+180, 360)+360, 360) - 180 }

// isLand reports whether (lat, lon), lon in [-180°, 180°), is inside land.
func (ix *meridianIndex) isLand(lat, lon float64) bool {
	inside := false
	for _, e := range ix.bins[(int(math.Floor(lon))+180+360)%360] {
		u1 := wrap180(e.x1 - lon)
		u2 := u1 + e.dx
		if (u1 < 0) == (u2 < 0) {
			continue
		}
		if y := e.y1 + (0-u1)*(e.y2-e.y1)/(u2-u1); y > lat {
			inside = !inside
		}
	}
	return inside
}

// coastIndex tells whether any ring edge passes within marginDeg of a point
// (distance in the (lon, lat) degree plane).
type coastIndex struct {
	marginDeg float64
	bins      [180][360][]edge
}

func newCoastIndex(rings []ring, marginDeg float64) *coastIndex {
	ix := &coastIndex{marginDeg: marginDeg}
	for _, rg := range rings {
		for i := 0; i+1 < len(rg.pts); i++ {
			p, q := rg.pts[i], rg.pts[i+1]
			e := edge{p.lon, p.lat, shortLonStep(q.lon - p.lon), q.lat}
			x0, x1 := math.Floor(min(e.x1, e.x1+e.dx)-marginDeg), math.Floor(max(e.x1, e.x1+e.dx)+marginDeg)
			y0, y1 := math.Floor(min(e.y1, e.y2)-marginDeg), math.Floor(max(e.y1, e.y2)+marginDeg)
			for y := max(y0, -90); y <= min(y1, 89); y++ {
				for x := x0; x <= x1; x++ {
					r, c := int(y)+90, (int(x)+180+720)%360
					ix.bins[r][c] = append(ix.bins[r][c], e)
				}
			}
		}
	}
	return ix
}

// nearCoast reports whether an edge passes within the margin of (lat, lon).
func (ix *coastIndex) nearCoast(lat, lon float64) bool {
	r, c := min(int(math.Floor(lat))+90, 179), (int(math.Floor(lon))+180+360)%360
	for _, e := range ix.bins[r][c] {
		ax, ay := wrap180(e.x1-lon), e.y1-lat
		bx, by := ax+e.dx, e.y2-lat
		// distance from the origin to segment a–b
		dx, dy := bx-ax, by-ay
		t := 0.0
		if l2 := dx*dx + dy*dy; l2 > 0 {
			t = max(0, min(1, -(ax*dx+ay*dy)/l2))
		}
		if math.Hypot(ax+t*dx, ay+t*dy) < ix.marginDeg {
			return true
		}
	}
	return false
}

// TestAgainstPointInPolygon rasterizes each land file of the package and
// compares the grid with the exact point-in-polygon test above:
//   - at the centres of random cells, where both classify the same point and
//     must agree exactly;
//   - at random points spread evenly over the sphere, keeping those with no
//     coast within one cell (0.05°) of them: such a point and the centre of its
//     cell are on the same side of every edge, so the cell's value must be the
//     point's.
func TestAgainstPointInPolygon(t *testing.T) {
	dir := worldAtlas(t)
	const cpd = 20
	for _, file := range []string{"land-110m.json", "land-50m.json", "land-10m.json"} {
		t.Run(file, func(t *testing.T) {
			data, err := os.ReadFile(filepath.Join(dir, file))
			if err != nil {
				t.Fatal(err)
			}
			rings, err := decodeTopoJSON(data, "land")
			if err != nil {
				t.Fatal(err)
			}
			g, _, err := rasterize(rings, cpd)
			if err != nil {
				t.Fatal(err)
			}
			pip := newMeridianIndex(rings)
			rng := rand.New(rand.NewPCG(20, 26)) // seeded: the same points every run

			const nCells = 20000
			land, bad := 0, 0
			for range nCells {
				r, c := rng.IntN(g.Rows), rng.IntN(g.Cols)
				lat, lon := -90+(float64(r)+0.5)/cpd, -180+(float64(c)+0.5)/cpd
				want := pip.isLand(lat, lon)
				if want {
					land++
				}
				if g.Get(r, c) != want {
					bad++
					if bad <= 5 {
						t.Errorf("cell (%d, %d) centre (%.3f, %.3f): raster %v, point-in-polygon %v", r, c, lat, lon, g.Get(r, c), want)
					}
				}
			}
			t.Logf("%s: %d random cell centres, %d land by point-in-polygon, %d disagree", file, nCells, land, bad)

			coast := newCoastIndex(rings, 1.0/cpd)
			const nPoints = 20000
			used, bad := 0, 0
			for range nPoints {
				lat := math.Asin(2*rng.Float64()-1) * 180 / math.Pi // uniform in area
				lon := -180 + 360*rng.Float64()
				if coast.nearCoast(lat, lon) {
					continue
				}
				used++
				want := pip.isLand(lat, lon)
				r, c := min(int((lat+90)*cpd), g.Rows-1), min(int((lon+180)*cpd), g.Cols-1)
				if g.Get(r, c) != want {
					bad++
					if bad <= 5 {
						t.Errorf("point (%.4f, %.4f): raster cell %v, point-in-polygon %v", lat, lon, g.Get(r, c), want)
					}
				}
			}
			t.Logf("%s: %d random points, %d more than a cell from any coast, %d disagree", file, nPoints, used, bad)
			if used < nPoints*9/10 {
				t.Errorf("only %d of %d points away from coasts; the coast filter is suspect", used, nPoints)
			}
		})
	}
}

// TestReproducesAsset regenerates the embedded mask from the package and
// checks that it has the same cells as assets/landmask.bin, and that the
// package's file is the one the asset records (by SHA-256).
func TestReproducesAsset(t *testing.T) {
	dir := worldAtlas(t)
	enc, err := os.ReadFile(filepath.Join("..", "..", "landmask.bin"))
	if err != nil {
		t.Fatal(err)
	}
	asset, err := maskfile.Decode(enc)
	if err != nil {
		t.Fatal(err)
	}
	// Source: "world-atlas@VERSION FILE object OBJECT sha256:HEX" (see provenance).
	var pkg, file, object, sum string
	if _, err := fmt.Sscanf(asset.Source, "%s %s object %s sha256:%s", &pkg, &file, &object, &sum); err != nil {
		t.Fatalf("asset source %q: %v", asset.Source, err)
	}
	data, err := os.ReadFile(filepath.Join(dir, file))
	if err != nil {
		t.Fatal(err)
	}
	if got := fmt.Sprintf("%x", sha256.Sum256(data)); got != sum {
		t.Fatalf("%s in %s has sha256 %s; the asset was made from %s (%s)", file, dir, got, sum, pkg)
	}
	src, err := provenance(filepath.Join(dir, file), object, data)
	if err != nil || src != asset.Source {
		t.Errorf("provenance = %q, %v; want the asset's %q", src, err, asset.Source)
	}
	g, _, err := build(data, object, asset.CellsPerDeg)
	if err != nil {
		t.Fatal(err)
	}
	if !g.Equal(asset) {
		diff := 0
		for r := range g.Rows {
			for c := range g.Cols {
				if g.Get(r, c) != asset.Get(r, c) {
					diff++
				}
			}
		}
		t.Fatalf("regenerated mask differs from assets/landmask.bin in %d cells: run go generate ./assets/...", diff)
	}
	g.Source = asset.Source
	if again, err := maskfile.Encode(g); err == nil && string(again) != string(enc) {
		// Same cells, other bytes: compress/flate changed between Go releases.
		t.Logf("same cells, but the compressed bytes differ (%d vs %d bytes)", len(again), len(enc))
	}
	if !strings.HasPrefix(asset.Source, "world-atlas@") {
		t.Errorf("asset source %q does not name the world-atlas package", asset.Source)
	}
}
