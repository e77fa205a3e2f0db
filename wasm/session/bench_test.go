package session

import (
	"testing"
	"time"

	"earshot/assets"
	"earshot/receiver/plan"
)

// BenchmarkColdStart: from nothing to the first prediction of the demo's
// default spot, as the app does it (the land mask, the session, and the
// jobs stepped until the prediction is fresh).
func BenchmarkColdStart(b *testing.B) {
	for b.Loop() {
		t0 := time.Now()
		mask, err := assets.LoadLandMask()
		if err != nil {
			b.Fatal(err)
		}
		t1 := time.Now()
		s, err := New(mask.IsLand)
		if err != nil {
			b.Fatal(err)
		}
		t2 := time.Now()
		steps := 0
		for {
			s.Step(Deadline(10 * time.Millisecond))
			steps++
			if _, fresh, err := s.Prediction(); err != nil {
				b.Fatal(err)
			} else if fresh {
				break
			}
		}
		b.ReportMetric(float64(t1.Sub(t0).Milliseconds()), "mask-ms")
		b.ReportMetric(float64(t2.Sub(t1).Milliseconds()), "session-ms")
		b.ReportMetric(float64(time.Since(t2).Milliseconds()), "predict-ms")
		b.ReportMetric(float64(steps), "steps")
	}
}

// BenchmarkOverlay: the app's overlay at full screen (122×110 cells of
// 7 px over about 5° × 3° around the demo's default spot), as one
// plan.Map call on one goroutine.
func BenchmarkOverlay(b *testing.B) {
	mask, err := assets.LoadLandMask()
	if err != nil {
		b.Fatal(err)
	}
	s, err := New(mask.IsLand)
	if err != nil {
		b.Fatal(err)
	}
	for s.predBusy {
		s.Step(func() bool { return true })
	}
	sp := s.Spot().Place
	box := plan.BBox{MinLat: sp.LatDeg() - 1.5, MaxLat: sp.LatDeg() + 1.5, MinLon: sp.LonDeg() - 2.5, MaxLon: sp.LonDeg() + 2.5}
	if _, err := s.planner.Map(box, 122, 110, s.at, plan.MapCount, "", plan.MapOptions{Workers: 1}, nil); err != nil {
		b.Fatal(err)
	}
	b.ReportAllocs()
	for b.Loop() {
		if _, err := s.planner.Map(box, 122, 110, s.at, plan.MapCount, "", plan.MapOptions{Workers: 1}, nil); err != nil {
			b.Fatal(err)
		}
	}
}
