package propagation

import (
	"math"
	"testing"
)

// TestMonopoleGain checks G_V at the horizon and the c.m.f. of 1 kW
// against the [C] values of methods.md §2.3 (closed-form R_m with Si/Ci,
// mpmath) — an independent formula for the same quantity, computed here by
// gonum's Gauss–Legendre quadrature.
func TestMonopoleGain(t *testing.T) {
	for _, c := range []struct {
		deg, gainDB, cmfV, rm float64
	}{
		{90, 0.39, 313.8, 36.57},
		{120, 0.74, 326.9, 0},
		{180, 2.06, 380.3, 99.54},
		{225, 3.40, 443.8, 0},
	} {
		got, err := MonopoleGainDB(c.deg, 0)
		if err != nil {
			t.Fatal(err)
		}
		if math.Abs(got-c.gainDB) > 0.005 {
			t.Errorf("MonopoleGainDB(%g°, 0) = %.4f dB, want %.2f (methods.md §2.3 [C])", c.deg, got, c.gainDB)
		}
		if cmf := 300 * math.Pow(10, got/20); math.Abs(cmf-c.cmfV) > 0.06 {
			t.Errorf("c.m.f. of 1 kW at %g° = %.2f V, want %.1f (methods.md §2.3 [C])", c.deg, cmf, c.cmfV)
		}
		if c.rm != 0 {
			if rm := monopoleResistance(c.deg * math.Pi / 180); math.Abs(rm-c.rm) > 0.01 { // quoted to 0.01 Ω
				t.Errorf("R_m(%g°) = %.4f Ω, want %.2f (methods.md §2.3 [C])", c.deg, rm, c.rm)
			}
		}
	}
	// A thin half-wave dipole has a radiation resistance of 73.13 Ω, so a
	// quarter-wave monopole over perfect ground 36.56 Ω (Kraus, Antennas,
	// 2nd ed. §5-6; from memory).
	if rm := monopoleResistance(math.Pi / 2); math.Abs(rm-73.13/2) > 0.01 {
		t.Errorf("quarter-wave R = %.3f Ω, want 36.565", rm)
	}
	// Short-monopole limit: G_V → 0 dB, and R_base = 40π²(h/λ)² = 10·G²
	// (methods.md §6.1), R_m = R_base·sin²G.
	for _, deg := range []float64{0.01, 1, 5} {
		g := deg * math.Pi / 180
		if rm, want := monopoleResistance(g), 10*g*g*math.Pow(math.Sin(g), 2); math.Abs(rm-want) > 0.01*want {
			t.Errorf("R_m(%g°) = %.4g Ω, short-monopole limit %.4g", deg, rm, want)
		}
		if got, _ := MonopoleGainDB(deg, 0); math.Abs(got) > 0.01 {
			t.Errorf("MonopoleGainDB(%g°, 0) = %.4f dB, want ≈ 0", deg, got)
		}
	}
	for _, tiny := range []float64{1e-300, 1e-100, 1e-6, 0.05} {
		got, err := MonopoleGainDB(tiny, 30)
		if err != nil || math.Abs(got-20*math.Log10(math.Cos(math.Pi/6))) > 1e-3 {
			t.Errorf("MonopoleGainDB(%g, 30) = %v, %v; want the short-monopole 20·log10(cos 30°)", tiny, got, err)
		}
	}
	for _, bad := range []struct{ deg, elev float64 }{{0, 0}, {-10, 0}, {300, 0}, {math.NaN(), 0}, {90, 90}, {90, -1}} {
		if _, err := MonopoleGainDB(bad.deg, bad.elev); err == nil {
			t.Errorf("MonopoleGainDB(%g, %g): no error", bad.deg, bad.elev)
		}
	}
}
