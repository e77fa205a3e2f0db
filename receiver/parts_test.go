package receiver

import (
	"math"
	"testing"
)

// TestVoltageSensitivity: methods.md §8.2 worked example (verified there:
// 104 dB/V at 474 Ω ↔ 100.76 dB/mW) and §8.4 [C] values.
func TestVoltageSensitivity(t *testing.T) {
	for _, c := range []struct{ mw, z, want float64 }{
		{100.76, 474, 104.0}, {100, 2000, 96.99}, {100, 32, 114.95},
	} {
		if got := VoltageSensitivity(c.mw, c.z); math.Abs(got-c.want) > 0.006 {
			t.Errorf("VoltageSensitivity(%g, %g) = %.3f, want %g", c.mw, c.z, got, c.want)
		}
	}
	// §8.4 [C]: 1 µW into 2000 Ω ↔ 44.7 mV rms; 100 pW ↔ 0.447 mV, so a
	// 100 dB/mW, 2000 Ω transducer gives 100 − 30 = 70 dB SPL at 1 µW.
	p, _ := PhonesByName("magnetic-2000")
	if got := p.SPL(math.Sqrt(1e-6 * 2000)); math.Abs(got-70) > 0.01 {
		t.Errorf("SPL at 1 µW into 2000 Ω = %.3f, want 70", got)
	}
	// A 110 dB/mW transducer reaches the 7 dB SPL earphone threshold at
	// 10^((7−110)/10) mW = 50 fW (methods.md §8.3 consistency check).
	sp, _ := PhonesByName("sound-powered")
	v := math.Sqrt(50e-15 * sp.LoadOhm)
	if got := sp.SPL(v); math.Abs(got-EarphoneThresholdDBSPL) > 0.02 {
		t.Errorf("sound-powered element at 50 fW: %.3f dB SPL, want 7", got)
	}
	// The transformer preset: 10 kΩ seen by the detector.
	m, _ := PhonesByName("modern-32")
	if math.Abs(m.LoadOhm-10000) > 1 || m.TransformerRatio < 17 {
		t.Errorf("modern-32 through transformer: load %g Ω, ratio %g", m.LoadOhm, m.TransformerRatio)
	}
	if _, err := PhonesByName("earbuds"); err == nil {
		t.Errorf("unknown phones: no error")
	}
}

// TestManMadeNoise: Rec. ITU-R P.372 man-made noise (methods.md §3.2
// constants verified against SG3's reference code; §3.5 [C] values).
func TestManMadeNoise(t *testing.T) {
	for _, c := range []struct {
		env       string
		khz, want float64
	}{
		{"city", 500, 85.14}, {"residential", 500, 80.84}, {"rural", 500, 75.54},
		{"quiet-rural", 500, 62.21}, {"residential", 1600, 66.85}, {"residential", 1000, 72.5},
	} {
		n, err := NoiseEnvByName(c.env)
		if err != nil {
			t.Fatal(err)
		}
		if got := n.NoiseFigureDB(KHz(c.khz)); math.Abs(got-c.want) > 0.006 {
			t.Errorf("%s F_am(%g kHz) = %.3f, want %g", c.env, c.khz, got, c.want)
		}
	}
	n, _ := NoiseEnvByName("residential")
	if got := n.NoiseFieldDBuVm(1000, 5000); math.Abs(got-13.99) > 0.006 {
		t.Errorf("E_n residential 1 MHz 5 kHz = %.3f, want 13.99 (methods.md §3.5 [C])", got)
	}
}

// TestTunedCircuit checks the tank against methods.md §9.5 [C]: L 240 µH
// with 105.5 pF → 1.000 MHz, X₀ 1508 Ω; Q_u 150: R_p 226.2 kΩ, B 6.67 kHz;
// loaded by 50 kΩ on a 0.5 tap: R_tot 106.1 kΩ, Q_L 70.4, B 14.2 kHz.
func TestTunedCircuit(t *testing.T) {
	f := KHz(1 / (2 * math.Pi * math.Sqrt(240e-6*105.5e-12)) / 1e3)
	if math.Abs(float64(f)-1000) > 0.5 {
		t.Fatalf("resonance %g kHz, want 1000", float64(f))
	}
	tc := TunedCircuit{InductanceUH: 240, QUnloaded: 150, AntennaTap: 1, DetectorTap: 1}
	free := tc.Solve(f, math.Inf(1), math.Inf(1))
	if math.Abs(free.ReactanceOhm-1508) > 1 || math.Abs(free.DynamicOhm-226.2e3) > 200 || math.Abs(free.BandwidthKHz-6.67) > 0.01 {
		t.Errorf("unloaded: X₀ %.1f, R_p %.0f, B %.3f", free.ReactanceOhm, free.DynamicOhm, free.BandwidthKHz)
	}
	if math.Abs(free.TuningPF-105.5) > 0.1 {
		t.Errorf("tuning capacitance %.2f pF, want 105.5", free.TuningPF)
	}
	tc.DetectorTap = 0.5
	loaded := tc.Solve(f, math.Inf(1), 50e3)
	if math.Abs(loaded.LoadedOhm-106.1e3) > 100 || math.Abs(loaded.LoadedQ-70.4) > 0.1 || math.Abs(loaded.BandwidthKHz-14.2) > 0.05 {
		t.Errorf("loaded: R_tot %.0f, Q_L %.2f, B %.2f; want 106.1k, 70.4, 14.2", loaded.LoadedOhm, loaded.LoadedQ, loaded.BandwidthKHz)
	}
	// Response: −3.01 dB at the band edges (definition of the bandwidth).
	q := loaded.LoadedQ
	edge := KHz(float64(f) / 2 * (math.Sqrt(1/(q*q)+4) + 1/q))
	if got := ResponseDB(f, edge, q); math.Abs(got+10*math.Log10(2)) > 1e-9 {
		t.Errorf("response at the upper −3 dB edge = %.4f dB", got)
	}
}

// TestBestTaps: for the antenna tap BestTaps chooses (antenna matched to
// the tank's dynamic resistance), the detector tap delivers the most power
// (maximum power transfer; methods.md §9.2), the loaded Q is Q_u/4 when
// neither tap is capped, and a tighter antenna tap gives more power but a
// lower loaded Q (the sensitivity–selectivity trade; common practice).
func TestBestTaps(t *testing.T) {
	f := KHz(1000)
	src, det := 40.0, 9130.0
	na, nd := BestTaps(f, 240, 150, src, det)
	power := func(na, nd float64) (float64, float64) {
		tk := TunedCircuit{240, 150, na, nd}.Solve(f, src, det)
		v := tk.TheveninV * det / (tk.TheveninOhm + det)
		return v * v / det, tk.LoadedQ
	}
	best, q := power(na, nd)
	if math.Abs(q-150.0/4) > 1e-6 {
		t.Errorf("loaded Q with best taps = %.3f, want Q_u/4 = 37.5", q)
	}
	for d := 0.01; d <= 1; d += 0.01 {
		if p, _ := power(na, d); p > best*(1+1e-9) {
			t.Fatalf("detector tap %.2f delivers %.4g W, more than BestTaps' %.3f (%.4g W)", d, p, nd, best)
		}
	}
	na2 := math.Min(1, 2*na)
	rp := 150 * omega(f) * 240e-6
	nd2 := math.Min(1, math.Sqrt(det/par(rp, src/(na2*na2))))
	tight, qTight := power(na2, nd2)
	if !(tight > best && qTight < q) {
		t.Errorf("tighter antenna tap: power %.3g (best %.3g), Q %.1f (best %.1f)", tight, best, qTight, q)
	}
}

// TestLooseCoupling: a primary coupled with coefficient k transforms like
// a tap of k·√(L₁/L₂) (reflected resistance (ωM)²/R with M = k√(L₁L₂);
// Terman, Radio Engineers' Handbook, coupled circuits, from memory): the
// reflected resistance across the tank computed from (ωM)² equals the tap
// formula's R_s/n².
func TestLooseCoupling(t *testing.T) {
	f := KHz(1000)
	w := omega(f)
	for _, c := range []struct{ k, l1, l2, rs float64 }{{0.3, 30, 240, 200}, {1, 60, 240, 50}, {0.05, 200, 240, 20}} {
		n := LooseCouplingTap(c.k, c.l1, c.l2)
		m := c.k * math.Sqrt(c.l1*c.l2) * 1e-6
		x2 := w * c.l2 * 1e-6
		// Series resistance reflected into the tank coil, then its parallel
		// equivalent across the tank: R' = X₂² / ((ωM)²/R_s).
		rPar := x2 * x2 / ((w * m) * (w * m) / c.rs)
		if want := c.rs / (n * n); math.Abs(rPar-want) > 1e-9*want {
			t.Errorf("k %g, L1 %g, L2 %g: reflected %.6g Ω, tap model %.6g Ω", c.k, c.l1, c.l2, rPar, want)
		}
	}
	s := DefaultRigSpec()
	s.CouplingK, s.PrimaryUH = 0.3, 30
	r, err := s.Build()
	if err != nil {
		t.Fatal(err)
	}
	if got, want := r.Tank.AntennaTap, 0.3*math.Sqrt(30/s.TankUH); math.Abs(got-want) > 1e-12 || r.AutoTaps || !r.AutoDetectorTap {
		t.Errorf("loosely coupled rig: antenna tap %g (want %g), auto %v/%v", got, want, r.AutoTaps, r.AutoDetectorTap)
	}
	s.CouplingK = 1.5
	if _, err := s.Build(); err == nil {
		t.Errorf("coupling 1.5: no error")
	}
}
