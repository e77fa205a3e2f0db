package propagation

import (
	"math"
	"math/rand/v2"
	"testing"
)

// TestMillingtonWorkedExample reproduces the worked example of
// methods.md §1.9 (1 MHz, 50 km land εr 22/σ 0.003 then 50 km sea): from
// the [C] curve values E_R = 44.97, E_T = 61.37, E = 53.17 dB(µV/m).
// Regression values of the same method; the curve values carry ±0.05 dB.
func TestMillingtonWorkedExample(t *testing.T) {
	const tol = 0.05
	var cc CurveCache
	tx := Transmitter{Freq: 1000, PowerKW: 1}
	for _, c := range []struct {
		name string
		p    Path
	}{
		{"land then sea", Path{{50, land}, {50, sea}}},
		{"sea then land (reciprocity)", Path{{50, sea}, {50, land}}},
	} {
		got, _, err := cc.PathFieldDBuVm(tx, c.p)
		if err != nil {
			t.Fatal(err)
		}
		if math.Abs(got-53.17) > tol {
			t.Errorf("%s: E = %.3f dB(µV/m), want 53.17 ± %g (methods.md §1.9 [C])", c.name, got, tol)
		}
	}
}

// TestMillingtonHand checks MillingtonDBuVm against the three-section
// formula written out by hand (Rec. ITU-R P.368 Annex 2, as quoted in
// methods.md §1.9), with synthetic straight-line curves.
func TestMillingtonHand(t *testing.T) {
	e := []lineCurve{{100, 20}, {90, 35}, {95, 28}}
	d := []float64{12, 30, 7}
	p := Path{{d[0], sea}, {d[1], land}, {d[2], wet}}
	fwd := e[0].at(d[0]) - e[1].at(d[0]) + e[1].at(d[0]+d[1]) - e[2].at(d[0]+d[1]) + e[2].at(d[0]+d[1]+d[2])
	rev := e[2].at(d[2]) - e[1].at(d[2]) + e[1].at(d[2]+d[1]) - e[0].at(d[2]+d[1]) + e[0].at(d[0]+d[1]+d[2])
	want := (fwd + rev) / 2
	got := MillingtonDBuVm(p, []FieldCurve{e[0], e[1], e[2]})
	if math.Abs(got-want) > 1e-12 {
		t.Errorf("MillingtonDBuVm = %.12f, hand formula %.12f", got, want)
	}
}

// lineCurve is a synthetic field curve a − b·log10(d).
type lineCurve struct{ a, b float64 }

func (l lineCurve) at(d float64) float64         { return l.a - l.b*math.Log10(d) }
func (l lineCurve) FieldDBuVm(d float64) float64 { return l.at(d) }

// TestMillingtonProperties: exact for a homogeneous path however it is cut
// into segments, and reciprocal (Millington 1949; P.368 Annex 2). Random
// paths from a seeded generator.
func TestMillingtonProperties(t *testing.T) {
	var cc CurveCache
	rng := rand.New(rand.NewPCG(1, 2))
	grounds := []Ground{sea, wet, land, mediumDry, dry, veryDry}
	for _, f := range []KHz{198, 729, 1593} {
		tx := Transmitter{Freq: f, PowerKW: 10}
		for trial := range 20 {
			n := 1 + rng.IntN(5)
			var p, homog Path
			g0 := grounds[rng.IntN(len(grounds))]
			for range n {
				l := 1 + rng.Float64()*300
				p = append(p, Segment{l, grounds[rng.IntN(len(grounds))]})
				homog = append(homog, Segment{l, g0})
			}
			a, _, err1 := cc.PathFieldDBuVm(tx, p)
			b, _, err2 := cc.PathFieldDBuVm(tx, p.Reversed())
			if err1 != nil || err2 != nil {
				t.Fatal(err1, err2)
			}
			if math.Abs(a-b) > 1e-9 {
				t.Errorf("%g kHz trial %d: forward %.6f, reversed %.6f (not reciprocal)", float64(f), trial, a, b)
			}
			h, _, _ := cc.PathFieldDBuVm(tx, homog)
			whole, _, _ := cc.PathFieldDBuVm(tx, Path{{homog.LengthKm(), g0}})
			if math.Abs(h-whole) > 1e-9 {
				t.Errorf("%g kHz trial %d: homogeneous path in %d segments %.6f, whole %.6f", float64(f), trial, n, h, whole)
			}
		}
	}
}

// TestMillingtonLandSeaRecovery: crossing from land to sea the field
// recovers (rises) over the sea, the effect Millington's method was built
// to describe (Millington 1949; common practice), and the mixed-path
// field lies between the all-land and all-sea fields.
func TestMillingtonLandSeaRecovery(t *testing.T) {
	var cc CurveCache
	tx := Transmitter{Freq: 1000, PowerKW: 1}
	prev := math.Inf(-1)
	rose := false
	for _, s := range []float64{1, 5, 10, 20} {
		e, _, _ := cc.PathFieldDBuVm(tx, Path{{80, land}, {s, sea}})
		if e > prev {
			rose = rose || prev > math.Inf(-1)
		}
		prev = e
		all, _, _ := cc.PathFieldDBuVm(tx, Path{{80 + s, land}})
		allSea, _, _ := cc.PathFieldDBuVm(tx, Path{{80 + s, sea}})
		if !(e > all && e < allSea) {
			t.Errorf("80 km land + %g km sea: %.2f not between all-land %.2f and all-sea %.2f", s, e, all, allSea)
		}
	}
	if !rose {
		t.Errorf("no recovery of the field over the sea after a land path")
	}
}
