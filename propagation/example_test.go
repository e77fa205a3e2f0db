package propagation_test

import (
	"fmt"
	"time"

	"earshot/propagation"
)

// The ground wave of a 10 kW, 999 kHz transmitter after 20 km of sea and
// 35 km of land (Millington's method).
func ExampleCurveCache_PathFieldDBuVm() {
	var cache propagation.CurveCache
	sea, _ := propagation.GroundByName("sea")
	land, _ := propagation.GroundByName("land")
	tx := propagation.Transmitter{Freq: 999, PowerKW: 10}
	e, _, err := cache.PathFieldDBuVm(tx, propagation.Path{{LengthKm: 20, Ground: sea.Ground}, {LengthKm: 35, Ground: land.Ground}})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("%.1f dB(µV/m)\n", e)
	// Output: 69.3 dB(µV/m)
}

// The night sky wave over a 1000 km path at the reference time and late
// in a winter evening.
func ExampleSkyWaveAt() {
	tx, _ := propagation.NewPlace(50, 5)
	rx, _ := propagation.NewPlace(42, 12)
	sp := propagation.SkyPath{Tx: tx, Rx: rx, Freq: 1000, PowerKW: 100}
	s, hl, e, err := propagation.SkyWaveAt(sp, time.Date(2025, 1, 15, 18, 0, 0, 0, time.UTC))
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("median at SS+6: %.1f dB(µV/m), at 18:00 UTC: %.1f (L_t %.1f dB)\n", s.MedianDBuVm, e, hl.LossDB)
	// Output: median at SS+6: 58.4 dB(µV/m), at 18:00 UTC: 57.3 (L_t 1.1 dB)
}
