package propagation

import (
	"math"
	"math/cmplx"
	"testing"
)

// Named grounds used by the checks (constants of the P.368 figures,
// methods.md §1.4, from memory there).
var (
	sea       = Ground{5, 70}
	wet       = Ground{0.01, 30}
	land      = Ground{0.003, 22}
	mediumDry = Ground{0.001, 15}
	dry       = Ground{3e-4, 7}
	veryDry   = Ground{1e-4, 3}
)

func mustHomogeneous(t testing.TB, f KHz, g Ground) *Homogeneous {
	t.Helper()
	h, _, err := NewHomogeneous(f, g)
	if err != nil {
		t.Fatalf("NewHomogeneous(%g, %v): %v", float64(f), g, err)
	}
	return h
}

// TestInverseDistanceLimit: 1 kW from a short monopole gives 300 mV/m at
// 1 km over a perfectly conducting plane, 109.54 dB(µV/m) (Rec. ITU-R P.368
// Annex 1; P.525-5 eq. (2): 173·√3 kW e.i.r.p. = 299.6 mV/m).
func TestInverseDistanceLimit(t *testing.T) {
	const tol = 0.1 // dB: issue acceptance, sea water at 1 km
	if got, want := RefFieldDBuVm1km, 109.54; math.Abs(got-want) > 0.005 {
		t.Errorf("RefFieldDBuVm1km = %.4f, want %.2f", got, want)
	}
	// P.525-5 eq. (2): e (mV/m) = 173·√p (kW e.i.r.p.)/d; 3 dB(i) gain of a
	// short monopole over perfect ground doubled by the ground: p = 3 kW.
	if got, want := MicroVoltsPerMetre(RefFieldDBuVm1km)/1e3, 173*math.Sqrt(3); math.Abs(got-want)/want > 2e-3 {
		t.Errorf("300 V c.m.f. gives %.1f mV/m at 1 km, P.525 gives %.1f", got, want)
	}
	for _, f := range []KHz{150, 550, 1000, 1700} {
		h := mustHomogeneous(t, f, sea)
		got := h.FieldDBuVm(1)
		if math.Abs(got-109.54) > tol {
			t.Errorf("%g kHz over sea at 1 km: E = %.3f dB(µV/m), want 109.54 ± %g", float64(f), got, tol)
		}
	}
}

// TestSommerfeldF checks F(w) for real w = p against the [C] regression
// values of methods.md §1.6 (mpmath, "exact |F|" column) — regression
// values of the same formula, not readings of a published table.
func TestSommerfeldF(t *testing.T) {
	const tol = 1e-5 // values quoted to 5 decimals
	for _, c := range []struct{ p, want float64 }{
		{0.1, 0.95806}, {0.5, 0.80846}, {1, 0.65648}, {2, 0.43985},
		{5, 0.15931}, {10, 0.06075}, {100, 0.00508},
	} {
		got := cmplx.Abs(sommerfeldF(complex(c.p, 0)))
		if math.Abs(got-c.want) > tol {
			t.Errorf("|F(%g)| = %.6f, want %.5f (methods.md §1.6 [C])", c.p, got, c.want)
		}
	}
}

// TestSommerfeldFAsymptote: for |w| ≫ 1, F ≈ −1/(2w) − 3/(4w²) − 15/(8w³)
// (the asymptotic series of the erfc; Norton 1937), a closed form
// independent of the Faddeeva implementation.
func TestSommerfeldFAsymptote(t *testing.T) {
	for _, w := range []complex128{1e3, 2e3 - 1e3i, 500 - 2000i, 1e4i * -1, 3e4 - 3e4i} {
		want := -1/(2*w) - 3/(4*w*w) - 15/(8*w*w*w)
		got := sommerfeldF(w)
		if cmplx.Abs(got-want) > 1e-6*cmplx.Abs(want) {
			t.Errorf("F(%v) = %v, asymptote %v", w, got, want)
		}
	}
	// Small |w|: F → 1 − j√(πw) + … (leading terms of the same series).
	for _, w := range []complex128{1e-8, 1e-8 - 1e-8i} {
		want := 1 - 1i*cmplx.Sqrt(math.Pi*w)
		if got := sommerfeldF(w); cmplx.Abs(got-want) > 1e-7 {
			t.Errorf("F(%v) = %v, small-w limit %v", w, got, want)
		}
	}
}

// TestWetGroundNumericalDistance reproduces the worked example of
// methods.md §1.11: wet ground εr 30, σ 0.01 S/m, 1 MHz, 10 km gives
// w = 0.56579 − j0.09752 and |F| = 0.70790 [C]; Norton's real numerical
// distance p = 0.57412 and phase constant b = 9.778° for the same case.
func TestWetGroundNumericalDistance(t *testing.T) {
	h := mustHomogeneous(t, 1000, wet)
	w := h.NumericalDistance(10)
	if cmplx.Abs(w-complex(0.56579, -0.09752)) > 2e-5 {
		t.Errorf("w(10 km) = %v, want 0.56579−j0.09752", w)
	}
	if got := cmplx.Abs(sommerfeldF(w)); math.Abs(got-0.70790) > 1e-5 {
		t.Errorf("|F(w)| = %.6f, want 0.70790", got)
	}
	// Norton's p = (π d/λ)·cos b / x with x = 60λσ, b = atan((εr+1)/x)
	// (Terman's handbook form) equals |w| up to the −1 in Δ.
	lambda := KHz(1000).WavelengthMetres()
	x := 60 * lambda * wet.SigmaSPerM
	b := math.Atan((wet.EpsR + 1) / x)
	p := math.Pi * 10e3 / lambda * math.Cos(b) / x
	if math.Abs(p-0.57412) > 1e-5 || math.Abs(b*180/math.Pi-9.778) > 1e-3 {
		t.Errorf("Norton p = %.5f, b = %.3f°, want 0.57412, 9.778°", p, b*180/math.Pi)
	}
}

// TestPerfectlyConductingSphere checks |W(x, 0)| against the [C] values of
// methods.md §1.11 (Fock's attenuation function, 3000 modes) — regression
// values of the same series.
func TestPerfectlyConductingSphere(t *testing.T) {
	r, err := newResidue(0, modesFor(0.1))
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct{ x, want float64 }{
		{0.1, 0.99014}, {0.3, 0.94982}, {1, 0.73172}, {2, 0.41957}, {5, 0.04722},
	} {
		got := math.Pow(10, r.residueDB(c.x)/20)
		if math.Abs(got-c.want) > 2e-5 {
			t.Errorf("|W(%g, 0)| = %.6f, want %.5f (methods.md §1.11 [C])", c.x, got, c.want)
		}
	}
}

// TestRegressionTable checks the field against the [C] table of
// methods.md §1.11 (a_e = 4/3·6371 km, 300 V; 10 km flat earth, the rest
// residue series). These are regression values of the same formulas
// computed with mpmath by the sheet's author; tolerance ±0.05 dB as the
// sheet suggests.
func TestRegressionTable(t *testing.T) {
	const tol = 0.05
	dists := []float64{10, 50, 100, 300, 1000}
	for _, c := range []struct {
		f    KHz
		g    Ground
		want [5]float64
	}{
		{500, sea, [5]float64{89.54, 75.30, 68.81, 56.26, 29.05}},
		{500, wet, [5]float64{88.76, 72.19, 63.15, 42.62, -2.29}},
		{500, land, [5]float64{86.79, 65.53, 52.70, 27.43, -23.64}},
		{500, mediumDry, [5]float64{82.08, 54.79, 41.14, 16.41, -36.92}},
		{1000, sea, [5]float64{89.54, 75.18, 68.49, 54.77, 22.21}},
		{1000, wet, [5]float64{86.54, 64.17, 50.49, 23.35, -38.75}},
		{1000, land, [5]float64{80.49, 51.66, 37.85, 11.03, -54.35}},
		{1000, mediumDry, [5]float64{72.12, 42.72, 29.35, 2.40, -64.42}},
		{1600, sea, [5]float64{89.53, 75.06, 68.18, 53.40, 16.44}},
		{1600, wet, [5]float64{82.54, 54.14, 39.77, 11.05, -63.43}},
		{1600, land, [5]float64{73.09, 43.20, 29.49, 0.51, -76.28}},
		{1600, mediumDry, [5]float64{65.50, 36.35, 22.75, -6.44, -84.28}},
	} {
		h := mustHomogeneous(t, c.f, c.g)
		for i, d := range dists {
			got := h.FieldDBuVm(d)
			if math.Abs(got-c.want[i]) > tol {
				t.Errorf("E(%g kHz, %v, %g km) = %.3f, want %.2f ± %g (methods.md §1.11 [C])",
					float64(c.f), c.g, d, got, c.want[i], tol)
			}
		}
	}
}

// TestFlatMeetsSpherical: at the switch point x = SwitchX the flat-earth
// function and the residue series describe the same field. The curvature
// correction there is −0.09 dB for a perfect conductor (methods.md §1.11,
// |W(0.1)| = 0.990) and grows with |q| to 0.16 dB for ice and very dry
// ground (measured here, 10 kHz–30 MHz); allow 0.2 dB.
func TestFlatMeetsSpherical(t *testing.T) {
	const tol = 0.2
	for _, f := range []KHz{10, 150, 550, 1000, 1700, 5000, 30000} {
		for _, g := range GroundTypes() {
			h := mustHomogeneous(t, f, g.Ground)
			d := SwitchX * EffectiveEarthRadiusKm / h.m
			sph, ok := h.SphericalDB(d)
			if !ok {
				t.Fatalf("SphericalDB(%g km) not available at the switch point", d)
			}
			if diff := h.FlatEarthDB(d) - sph; math.Abs(diff) > tol || diff < -0.01 {
				t.Errorf("%g kHz %s at %.2f km (x = %g): flat − spherical = %.3f dB, want 0 … %g",
					float64(f), g.Name, d, SwitchX, diff, tol)
			}
		}
	}
}

// TestGroundOrdering: better ground gives a stronger ground wave at every
// distance (common practice; the ordering of the P.368 figures).
func TestGroundOrdering(t *testing.T) {
	order := []Ground{sea, wet, land, mediumDry, dry, veryDry}
	for _, f := range []KHz{150, 550, 1000, 1700} {
		hs := make([]*Homogeneous, len(order))
		for i, g := range order {
			hs[i] = mustHomogeneous(t, f, g)
		}
		for _, d := range []float64{5, 20, 50, 100, 300, 1000, 2000} {
			for i := 1; i < len(hs); i++ {
				better, worse := hs[i-1].FieldDBuVm(d), hs[i].FieldDBuVm(d)
				if !(better > worse) {
					t.Errorf("%g kHz, %g km: %v gives %.2f, not above %v's %.2f",
						float64(f), d, order[i-1], better, order[i], worse)
				}
			}
		}
	}
}

// TestFieldFallsWithDistance: over a dense distance grid the field
// decreases monotonically, for every standard ground (physics: the ground
// wave only loses energy along a smooth homogeneous path).
func TestFieldFallsWithDistance(t *testing.T) {
	for _, f := range []KHz{150, 1000, 1700} {
		for _, g := range GroundTypes() {
			h := mustHomogeneous(t, f, g.Ground)
			prev := math.Inf(1)
			for d := 0.1; d <= 5000; d *= 1.05 {
				e := h.FieldDBuVm(d)
				if !(e < prev) {
					t.Errorf("%g kHz %s: E(%.3f km) = %.4f not below %.4f", float64(f), g.Name, d, e, prev)
					break
				}
				prev = e
			}
		}
	}
}

// TestNoNaNDenseGrid: no NaN or Inf for any valid input over a dense grid
// of frequencies, grounds and distances (issue acceptance).
func TestNoNaNDenseGrid(t *testing.T) {
	grounds := append([]Ground{{1000, 1}, {1e-5, 1}, {1e-5, 1000}, {1000, 1000}}, func() []Ground {
		var gs []Ground
		for _, g := range GroundTypes() {
			gs = append(gs, g.Ground)
		}
		return gs
	}()...)
	freqs := []KHz{MinKHz, 10, 30, 100, 300, 1000, 1700, 3000, 10000, 30000, MaxKHz}
	if testing.Short() {
		freqs = []KHz{10, 1000, 30000}
	}
	for _, f := range freqs {
		for _, g := range grounds {
			c, _, err := NewCurve(f, g)
			if err != nil {
				t.Errorf("NewCurve(%g kHz, %v): %v", float64(f), g, err)
				continue
			}
			for d := 1e-3; d <= MaxDistKm; d *= 1.3 {
				e := c.FieldDBuVm(d)
				if math.IsNaN(e) || math.IsInf(e, 0) {
					t.Errorf("E(%g kHz, %v, %g km) = %v", float64(f), g, d, e)
				}
			}
			if e := c.FieldDBuVm(MaxDistKm); math.IsNaN(e) || math.IsInf(e, 0) {
				t.Errorf("E(%g kHz, %v, %g km) = %v", float64(f), g, MaxDistKm, e)
			}
		}
	}
}

// TestValidation: invalid input is an error naming the field; input
// outside the validated range gives a result and a warning.
func TestValidation(t *testing.T) {
	for _, c := range []struct {
		name  string
		f     KHz
		g     Ground
		field string
	}{
		{"zero sigma", 1000, Ground{0, 15}, "sigma"},
		{"negative sigma", 1000, Ground{-1, 15}, "sigma"},
		{"epsr below 1", 1000, Ground{0.01, 0.5}, "epsr"},
		{"NaN epsr", 1000, Ground{0.01, math.NaN()}, "epsr"},
		{"NaN frequency", KHz(math.NaN()), sea, "frequency"},
		{"zero frequency", 0, sea, "frequency"},
		{"huge frequency", 1e9, sea, "frequency"},
	} {
		_, _, err := NewHomogeneous(c.f, c.g)
		ie, ok := err.(*InputError)
		if !ok || ie.Field != c.field {
			t.Errorf("%s: NewHomogeneous(%g, %v) error = %v, want an InputError on %q", c.name, float64(c.f), c.g, err, c.field)
		}
	}
	var cc CurveCache
	tx := Transmitter{Freq: 1000, PowerKW: 1}
	for _, d := range []float64{0, -5, math.NaN(), math.Inf(1), 30000} {
		if _, _, err := cc.PathFieldDBuVm(tx, Path{{d, sea}}); err == nil {
			t.Errorf("path length %g km: no error", d)
		}
	}
	for _, c := range []struct {
		name string
		tx   Transmitter
		d    float64
	}{
		{"6000 km", tx, 6000},
		{"50 m", tx, 0.05},
		{"5 kHz", Transmitter{Freq: 5, PowerKW: 1}, 100},
	} {
		e, warn, err := cc.PathFieldDBuVm(c.tx, Path{{c.d, sea}})
		if err != nil || len(warn) == 0 || math.IsNaN(e) {
			t.Errorf("%s: got %v, warnings %v, error %v; want a result and a warning", c.name, e, warn, err)
		}
	}
	// Within a wavelength (300 m at 1 MHz) the far-field ground wave is
	// incomplete: a warning (Norton 1937: the induction and static terms
	// fall as 1/d² and 1/d³).
	if _, warn, _ := cc.PathFieldDBuVm(tx, Path{{0.2, sea}}); len(warn) == 0 {
		t.Errorf("200 m from a 1 MHz transmitter: no warning")
	}
	if _, warn, _ := cc.PathFieldDBuVm(tx, Path{{2, sea}}); len(warn) != 0 {
		t.Errorf("2 km from a 1 MHz transmitter: warnings %v", warn)
	}
	if _, _, err := cc.PathFieldDBuVm(Transmitter{Freq: 1000, PowerKW: 0}, Path{{10, sea}}); err == nil {
		t.Errorf("zero power: no error")
	}
}

// TestPowerScaling: the field scales as 10·log10(P) and adds the gain
// (definition of the c.m.f., Rec. ITU-R P.368 Annex 1).
func TestPowerScaling(t *testing.T) {
	var cc CurveCache
	p := Path{{100, land}}
	e1, _, err := cc.PathFieldDBuVm(Transmitter{Freq: 1000, PowerKW: 1}, p)
	if err != nil {
		t.Fatal(err)
	}
	e2, _, _ := cc.PathFieldDBuVm(Transmitter{Freq: 1000, PowerKW: 100, GainDB: 2}, p)
	if math.Abs(e2-e1-22) > 1e-9 {
		t.Errorf("100 kW with +2 dB gain: %.4f − %.4f = %.4f dB, want 22", e2, e1, e2-e1)
	}
}
