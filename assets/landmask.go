package assets

import (
	_ "embed"
	"fmt"
	"math"
	"sync"

	"earshot/assets/internal/maskfile"
)

// The mask is made from Natural Earth's 1:10m land polygons (public domain,
// Natural Earth vector data 4.1.0) as redistributed in TopoJSON by the npm
// package world-atlas@2.0.2 (file land-10m.json, object "land"), at 20 cells
// per degree. To remake it, unpack the package and name its package/ folder
// in EARSHOT_WORLD_ATLAS (see assets/README.md):
//
//	mkdir -p /tmp/wa && cd /tmp/wa && npm pack world-atlas@2.0.2 && tar xzf world-atlas-2.0.2.tgz
//	cd -   # back to the repository root
//	EARSHOT_WORLD_ATLAS=/tmp/wa/package go generate ./assets/...
//
// With the same variable set, go test ./assets/internal/genmask also checks
// that the result equals the committed landmask.bin.
//
//go:generate go run ./internal/genmask -in=${EARSHOT_WORLD_ATLAS}/land-10m.json -object=land -cpd=20 -out=landmask.bin

//go:embed landmask.bin
var landmaskBin []byte

// LandMask is a world land/sea mask on a regular latitude/longitude grid of
// ResolutionDeg() degrees (1/20° ≈ 5.6 km north–south), one bit per cell,
// made by filling Natural Earth's land polygons with the even-odd rule and
// sampling each cell at its centre (assets/internal/genmask). A LandMask is
// immutable and safe for concurrent use.
//
// What counts as land is what Natural Earth's "land" layer holds:
//   - lakes are land: Lake Superior, Lake Victoria, Lake Baikal and the other
//     inland lakes lie inside the land polygons (Natural Earth keeps lakes in
//     a separate layer). For ground-wave work this is the better default:
//     fresh water conducts like land, not like sea (ITU-R P.368's curves take
//     3 mS/m for fresh water, 10 mS/m for wet ground, 5 S/m for sea water;
//     from memory).
//   - the Caspian Sea is sea: it is the one hole in the land polygons.
//   - Antarctica's grounded ice is land; its floating ice shelves (the Ross
//     and Ronne–Filchner shelves) are not in the layer and so are sea.
//   - Cells straddling a coast take the value at their centre, so coasts are
//     right to about half a cell (≈ 2.8 km) plus the 1:10m source's own
//     generalisation.
//
// Reference: Natural Earth, 1:10m Physical Vectors, "Land" (naturalearthdata.com);
// world-atlas 2.0.2 README (Natural Earth 4.1.0, land-10m.json).
type LandMask struct {
	words       []uint64 // rows·stride words; see maskfile.Grid
	stride      int      // words per row
	rows, cols  int
	cellsPerDeg float64
	source      string // provenance stored in the file
}

// loadLandMask decodes the embedded mask on first use and keeps the result.
var loadLandMask = sync.OnceValues(func() (*LandMask, error) { return decodeLandMask(landmaskBin) })

// LoadLandMask returns the embedded world land/sea mask. The first call
// decodes it (a few milliseconds; about 3.3 MB of bits); later calls return
// the same *LandMask and error.
func LoadLandMask() (*LandMask, error) { return loadLandMask() }

// decodeLandMask turns a mask file (format: package maskfile) into a LandMask.
func decodeLandMask(data []byte) (*LandMask, error) {
	g, err := maskfile.Decode(data)
	if err != nil {
		return nil, fmt.Errorf("assets: land mask: %w", err)
	}
	return &LandMask{
		words:       g.Words,
		stride:      g.Stride,
		rows:        g.Rows,
		cols:        g.Cols,
		cellsPerDeg: float64(g.CellsPerDeg),
		source:      g.Source,
	}, nil
}

// IsLand reports whether the point at latitude latDeg and longitude lonDeg
// (degrees, WGS 84 as in Natural Earth) falls in a land cell. It takes O(1)
// time and does not allocate.
//
// Longitude is taken modulo 360°, so -180°, 180° and 540° are the same
// meridian. Latitude must lie in [-90°, 90°]: the poles themselves fall in the
// southernmost and northernmost rows. A latitude outside that range, or a NaN
// or infinite coordinate, is no place on Earth and gives false.
func (m *LandMask) IsLand(latDeg, lonDeg float64) bool {
	if !(latDeg >= -90 && latDeg <= 90) || math.IsNaN(lonDeg) || math.IsInf(lonDeg, 0) {
		return false
	}
	r := int((latDeg + 90) * m.cellsPerDeg)
	if r >= m.rows { // latDeg == 90 exactly
		r = m.rows - 1
	}
	x := lonDeg + 180 // degrees east of -180°
	if x < 0 {
		x += 360
	} else if x >= 360 {
		x -= 360
	}
	if x < 0 || x >= 360 { // more than one turn out: the slow, exact way
		x = math.Mod(x, 360)
		if x < 0 {
			x += 360
		}
	}
	c := int(x * m.cellsPerDeg)
	if c >= m.cols { // x rounded up to 360 (a tiny negative x plus 360)
		c -= m.cols
	}
	return m.words[r*m.stride+c>>6]>>(uint(c)&63)&1 != 0
}

// ResolutionDeg returns the cell size in degrees, the same in latitude and
// longitude.
func (m *LandMask) ResolutionDeg() float64 { return 1 / m.cellsPerDeg }

// Size returns the grid's number of rows (latitude, 180/ResolutionDeg()) and
// columns (longitude, 360/ResolutionDeg()).
func (m *LandMask) Size() (rows, cols int) { return m.rows, m.cols }
