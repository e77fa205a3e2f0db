package receiver

import (
	"math"
	"testing"
)

func defaultRig(t testing.TB) Rig {
	t.Helper()
	r, err := DefaultRigSpec().Build()
	if err != nil {
		t.Fatal(err)
	}
	return r
}

// TestRigFactsOfTheTrade: a ~40 m wire at 8–12 m with a ~10 m down-lead
// needs roughly 200 µH of loading near 600 kHz — about 200 close-wound
// turns of AWG 24 on a 25 mm form — and no loading coil near 1600 kHz
// (common practice, the facts of the trade).
func TestRigFactsOfTheTrade(t *testing.T) {
	for _, h := range []float64{8, 10, 12} {
		s := DefaultRigSpec()
		s.HeightM, s.DownleadM = h, h
		r, err := s.Build()
		if err != nil {
			t.Fatal(err)
		}
		lo, err := r.Receive(600, 60)
		if err != nil {
			t.Fatal(err)
		}
		if lo.LoadingUH < 150 || lo.LoadingUH > 260 || lo.LoadingTurns < 150 || lo.LoadingTurns > 260 {
			t.Errorf("height %g m, 600 kHz: loading %.1f µH, %.0f turns; want about 200 of each", h, lo.LoadingUH, lo.LoadingTurns)
		}
		hi, err := r.Receive(1600, 60)
		if err != nil {
			t.Fatal(err)
		}
		if hi.LoadingUH > 0 {
			t.Errorf("height %g m, 1600 kHz: loading %.1f µH, want none", h, hi.LoadingUH)
		}
	}
}

// TestMarginProperties: a better ground system never lowers the margin; a
// weak-signal diode with a low zero-bias resistance matched to the source
// (germanium, zero-bias Schottky) beats a high-R₀ one (silicon, ordinary
// Schottky) at weak signals (methods.md §7.3; common practice); and at weak
// signals the margin rises 2 dB per dB of field (square-law detection,
// methods.md §7.2).
func TestMarginProperties(t *testing.T) {
	grounds := GroundSystems() // lowest loss first
	for _, f := range []KHz{550, 1000, 1600} {
		prev := math.Inf(1)
		for _, g := range grounds {
			s := DefaultRigSpec()
			s.GroundSystem = g.Name
			r, err := s.Build()
			if err != nil {
				t.Fatal(err)
			}
			rc, err := r.Receive(f, 40)
			if err != nil {
				t.Fatal(err)
			}
			if rc.MarginDB > prev+1e-9 {
				t.Errorf("%g kHz: ground %s gives margin %.2f dB, above a better ground's %.2f", float64(f), g.Name, rc.MarginDB, prev)
			}
			prev = rc.MarginDB
		}
	}
	margin := func(diode string, e float64) float64 {
		s := DefaultRigSpec()
		s.Diode = diode
		r, err := s.Build()
		if err != nil {
			t.Fatal(err)
		}
		rc, err := r.Receive(1000, e)
		if err != nil {
			t.Fatal(err)
		}
		return rc.MarginDB
	}
	for _, good := range []string{"germanium", "schottky-zero-bias"} {
		for _, poor := range []string{"silicon", "schottky"} {
			if g, p := margin(good, 35), margin(poor, 35); !(g > p) {
				t.Errorf("weak signal: %s margin %.2f not above %s %.2f", good, g, poor, p)
			}
		}
	}
	a, b := margin("germanium", 20), margin("germanium", 21)
	if math.Abs((b-a)-2) > 0.02 {
		t.Errorf("weak-signal slope %.3f dB per dB, want 2 (square law)", b-a)
	}
}

// TestMinAudible: the sensitivity is where the chain just becomes audible
// (bisection to 0.01 dB), and better parts lower it.
func TestMinAudible(t *testing.T) {
	r := defaultRig(t)
	for _, f := range []KHz{540, 1000, 1700} {
		m, err := r.MinAudibleDBuVm(f)
		if err != nil {
			t.Fatal(err)
		}
		below, _ := r.Receive(f, m-0.05)
		at, _ := r.Receive(f, m+0.01)
		if below.Audible || !at.Audible {
			t.Errorf("%g kHz: min audible %.2f, but audible %v just below and %v just above", float64(f), m, below.Audible, at.Audible)
		}
	}
	base, _ := r.MinAudibleDBuVm(1000)
	s := DefaultRigSpec()
	s.GroundSystem = "radials-many"
	better, _ := s.Build()
	m, _ := better.MinAudibleDBuVm(1000)
	if !(m < base) {
		t.Errorf("many radials: min audible %.2f not below a rod's %.2f", m, base)
	}
	// A noisy city with an amplifier is noise-limited: the minimum field is
	// then the noise field plus the required S/N less 20 log m.
	s = DefaultRigSpec()
	s.AmpDB, s.Noise = 60, "city"
	loud, err := s.Build()
	if err != nil {
		t.Fatal(err)
	}
	m, err = loud.MinAudibleDBuVm(1000)
	if err != nil {
		t.Fatal(err)
	}
	rc, _ := loud.Receive(1000, m)
	if want := rc.NoiseDBuVm + RequiredSNRDB - 20*math.Log10(DefaultModulation); math.Abs(m-want) > 0.02 {
		t.Errorf("noise-limited min audible %.2f, want %.2f (noise + S/N − 20 log m)", m, want)
	}
}

// TestCrowdingAndTrap: a strong local station 9 kHz away masks a weak one
// (a crystal set's selectivity is a few tens of kHz; common practice),
// while one 300 kHz away is rejected by the tuned circuits less; and a
// trap is proposed that fixes the distant-frequency case.
func TestCrowdingAndTrap(t *testing.T) {
	r := defaultRig(t)
	wanted := Signal{"weak", 700, 65}
	near := Signal{"local-near", 709, 95}
	far := Signal{"local-far", 1000, 100}
	ms, err := r.Crowding(wanted, []Signal{near, far})
	if err != nil {
		t.Fatal(err)
	}
	var gotNear, gotFar *Masking
	for i := range ms {
		switch ms[i].Other.Name {
		case "local-near":
			gotNear = &ms[i]
		case "local-far":
			gotFar = &ms[i]
		}
	}
	if gotNear == nil {
		t.Fatalf("a 90 dB(µV/m) station 9 kHz away does not mask a 65 dB(µV/m) one: %+v", ms)
	}
	if gotFar == nil {
		t.Fatalf("a 100 dB(µV/m) station 300 kHz away does not mask a 65 dB(µV/m) one")
	}
	if !(gotFar.SelectivityDB < gotNear.SelectivityDB) {
		t.Errorf("rejection at 300 kHz (%.1f dB) not stronger than at 9 kHz (%.1f dB)", gotFar.SelectivityDB, gotNear.SelectivityDB)
	}
	adv, err := r.TrapFor(*gotFar, SeriesShuntTrap, 0, 1000, 150) // a 1000 pF capacitor to hand
	if err != nil {
		t.Fatal(err)
	}
	if !adv.Fixes {
		t.Errorf("trap against 1000 kHz while listening on 700 kHz does not fix it: %s", adv.Reason)
	}
	adv, err = r.TrapFor(*gotNear, SeriesShuntTrap, 100, 0, 150)
	if err != nil {
		t.Fatal(err)
	}
	if adv.Fixes {
		t.Errorf("trap separates stations 9 kHz apart: %s", adv.Reason)
	}
}

// TestRigValidation: bad input names the field.
func TestRigValidation(t *testing.T) {
	for _, c := range []struct {
		name  string
		edit  func(*RigSpec)
		field string
	}{
		{"height", func(s *RigSpec) { s.HeightM = 0.1 }, "height"},
		{"wire", func(s *RigSpec) { s.WireM = -3 }, "wire length"},
		{"diameter", func(s *RigSpec) { s.WireMm = 50 }, "wire diameter"},
		{"amp", func(s *RigSpec) { s.AmpDB = 100 }, "amplifier gain"},
		{"modulation", func(s *RigSpec) { s.Modulation = 1.5 }, "modulation"},
	} {
		s := DefaultRigSpec()
		c.edit(&s)
		_, err := s.Build()
		ie, ok := err.(*InputError)
		if !ok || ie.Field != c.field {
			t.Errorf("%s: error %v, want an InputError on %q", c.name, err, c.field)
		}
	}
	for _, name := range []string{"diode", "phones", "noise", "ground"} {
		s := DefaultRigSpec()
		switch name {
		case "diode":
			s.Diode = "cat-whisker-9000"
		case "phones":
			s.Phones = "earbuds"
		case "noise":
			s.Noise = "mars"
		case "ground":
			s.GroundSystem = "none"
		}
		if _, err := s.Build(); err == nil {
			t.Errorf("unknown %s: no error", name)
		}
	}
	r := defaultRig(t)
	for _, e := range []float64{math.NaN(), 300, -200} {
		if _, err := r.Receive(1000, e); err == nil {
			t.Errorf("Receive(1000, %g): no error", e)
		}
	}
}

// BenchmarkChain measures the chain for one station and the rig's
// sensitivity at one frequency and across the band.
func BenchmarkChain(b *testing.B) {
	r := defaultRig(b)
	b.Run("receive-one-station", func(b *testing.B) {
		b.ReportAllocs()
		for b.Loop() {
			if _, err := r.Receive(1000, 60); err != nil {
				b.Fatal(err)
			}
		}
	})
	b.Run("min-audible-one-frequency", func(b *testing.B) {
		b.ReportAllocs()
		for b.Loop() {
			if _, err := r.MinAudibleDBuVm(1000); err != nil {
				b.Fatal(err)
			}
		}
	})
	b.Run("min-audible-across-band", func(b *testing.B) {
		b.ReportAllocs()
		for b.Loop() {
			for f := KHz(540); f <= 1700; f += 40 {
				if _, err := r.MinAudibleDBuVm(f); err != nil {
					b.Fatal(err)
				}
			}
		}
	})
}
