package propagation

import (
	"testing"
	"time"
)

// BenchmarkCurve measures building one homogeneous curve (mode roots plus
// the residue series at every grid distance), per regime.
func BenchmarkCurve(b *testing.B) {
	for _, c := range []struct {
		name string
		f    KHz
		g    Ground
	}{
		{"sea-1000kHz", 1000, sea},
		{"land-1000kHz", 1000, land},
		{"very-dry-1700kHz", 1700, veryDry},
	} {
		b.Run(c.name, func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				if _, _, err := NewCurve(c.f, c.g); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

// BenchmarkPath measures one path evaluation from a warm cache, and the
// direct (uncached) evaluation it replaces.
func BenchmarkPath(b *testing.B) {
	tx := Transmitter{Freq: 1000, PowerKW: 10}
	homog := Path{{137, land}}
	mixed := Path{{12, land}, {40, sea}, {25, wet}, {60, mediumDry}, {8, sea}}
	var cc CurveCache
	for _, p := range []Path{homog, mixed} {
		if _, _, err := cc.PathFieldDBuVm(tx, p); err != nil {
			b.Fatal(err)
		}
	}
	dists := []float64{0.7, 3, 17, 137, 800, 2500}
	b.Run("cached-homogeneous", func(b *testing.B) {
		b.ReportAllocs()
		i := 0
		for b.Loop() {
			p := Path{{dists[i%len(dists)], land}}
			i++
			if _, _, err := cc.PathFieldDBuVm(tx, p); err != nil {
				b.Fatal(err)
			}
		}
	})
	b.Run("cached-5-segment", func(b *testing.B) {
		b.ReportAllocs()
		for b.Loop() {
			if _, _, err := cc.PathFieldDBuVm(tx, mixed); err != nil {
				b.Fatal(err)
			}
		}
	})
	b.Run("direct-homogeneous", func(b *testing.B) {
		b.ReportAllocs()
		for b.Loop() {
			if _, _, err := DirectPathFieldDBuVm(tx, homog); err != nil {
				b.Fatal(err)
			}
		}
	})
}

// BenchmarkSkyWave measures one sky-wave evaluation at the reference time
// and one at a given instant (with the hourly loss factor and sun times).
func BenchmarkSkyWave(b *testing.B) {
	tx, _ := NewPlace(51.5, -0.1)
	rx, _ := NewPlace(40.4, -3.7)
	sp := SkyPath{Tx: tx, Rx: rx, Freq: 999, PowerKW: 100, HeightDeg: 120}
	b.Run("reference-time", func(b *testing.B) {
		b.ReportAllocs()
		for b.Loop() {
			if _, err := NightSkyWave(sp); err != nil {
				b.Fatal(err)
			}
		}
	})
	at := time.Date(2025, 1, 15, 22, 0, 0, 0, time.UTC)
	b.Run("at-instant", func(b *testing.B) {
		b.ReportAllocs()
		for b.Loop() {
			if _, _, _, err := SkyWaveAt(sp, at); err != nil {
				b.Fatal(err)
			}
		}
	})
}
