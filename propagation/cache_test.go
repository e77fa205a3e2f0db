package propagation

import (
	"math"
	"testing"
)

// TestCacheMatchesDirect measures the interpolation error of the curve
// cache against direct evaluation over a dense grid (issue acceptance:
// ≤ 0.1 dB); the direct evaluation is the reference.
func TestCacheMatchesDirect(t *testing.T) {
	const tol = 0.1
	freqs := []KHz{10, 153, 549, 999, 1701, 5000, 30000}
	if testing.Short() {
		freqs = []KHz{549, 1701}
	}
	worst := 0.0
	for _, f := range freqs {
		for _, g := range GroundTypes() {
			c, _, err := NewCurve(f, g.Ground)
			if err != nil {
				t.Fatal(err)
			}
			h := c.Homogeneous()
			for d := 0.1; d <= 5000; d *= 1.037 {
				diff := math.Abs(c.FieldDBuVm(d) - h.FieldDBuVm(d))
				worst = math.Max(worst, diff)
				if diff > tol {
					t.Errorf("%g kHz %s %.3f km: cache %.4f, direct %.4f", float64(f), g.Name, d, c.FieldDBuVm(d), h.FieldDBuVm(d))
				}
			}
		}
	}
	t.Logf("worst cache error %.2g dB", worst)
}

// TestCacheReuse: a curve is computed once per (frequency, ground).
func TestCacheReuse(t *testing.T) {
	var cc CurveCache
	tx := Transmitter{Freq: 1000, PowerKW: 1}
	for range 3 {
		if _, _, err := cc.PathFieldDBuVm(tx, Path{{10, sea}, {20, land}, {5, sea}}); err != nil {
			t.Fatal(err)
		}
	}
	if cc.Len() != 2 {
		t.Errorf("cache holds %d curves, want 2", cc.Len())
	}
}
