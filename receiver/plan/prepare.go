package plan

import (
	"cmp"
	"fmt"
	"math"
	"slices"
	"time"

	"earshot/propagation"
)

// Prepare does, one piece at a time, the work that Predict at spot needs
// before it can answer quickly: the ground-wave curve for each station's
// frequency over each ground its path crosses (a few milliseconds each),
// the rig's response at each station frequency (tens of milliseconds),
// and the table of the set's selectivity. Before each piece it asks more;
// when more reports false it returns (false, nil) with the rest left for
// the next call. It returns true when nothing is left for this spot.
//
// A single-threaded caller (the WebAssembly app) spreads a cold start over
// frames this way: more is a time budget for the frame.
func (p *Planner) Prepare(spot Spot, more func() bool) (bool, error) {
	var buf propagation.Path
	for _, s := range p.world.Stations {
		d := propagation.DistanceKm(s.Place, spot.Place)
		var path propagation.Path
		if d < 0.05 {
			path = propagation.Path{{LengthKm: 0.05, Ground: p.world.Ground(s.Place.LatDeg(), s.Place.LonDeg())}}
		} else {
			var err error
			if path, err = propagation.AppendSamplePath(buf, p.world.Ground, s.Place, spot.Place, pathStepKm(d)); err != nil {
				return false, fmt.Errorf("plan: %s: %w", s.ID, err)
			}
			buf = path
		}
		for _, seg := range path {
			if p.curves.Has(s.KHz, seg.Ground) {
				continue
			}
			if !more() {
				return false, nil
			}
			if _, err := p.curves.Curve(s.KHz, seg.Ground); err != nil {
				return false, fmt.Errorf("plan: %s: %w", s.ID, err)
			}
		}
	}
	for _, s := range p.world.Stations {
		p.mu.Lock()
		_, ok := p.chains[s.KHz]
		p.mu.Unlock()
		if ok {
			continue
		}
		if !more() {
			return false, nil
		}
		if _, err := p.chain(s.KHz); err != nil {
			return false, err
		}
	}
	p.mu.Lock()
	ready := p.sel != nil
	p.mu.Unlock()
	if !ready {
		if !more() {
			return false, nil
		}
		if _, err := p.selectivity(); err != nil {
			return false, err
		}
	}
	return true, nil
}

// CountAt returns the number of stations the rig hears at place pl at
// instant t: Predict's Audible count without the masking analysis (a
// station counts when its combined median field reaches the rig's weakest
// audible field). It is the value of a count map's cell, computed exactly.
func (p *Planner) CountAt(pl propagation.Place, t time.Time) (int, error) {
	spot := Spot{Place: pl}
	n := 0
	for i, s := range p.world.Stations {
		h, err := p.station(i, s, spot, t)
		if err != nil {
			return 0, fmt.Errorf("plan: %s: %w", s.ID, err)
		}
		if h.Audible {
			n++
		}
	}
	return n, nil
}

// DayAndNight returns local noon and local midnight (mean solar time at
// the spot) on the UTC date of t: the two instants of a day-and-night
// comparison.
func DayAndNight(t time.Time, spot Spot) (day, night time.Time) {
	off := time.Duration(-spot.Place.LonDeg() / 15 * float64(time.Hour))
	d := time.Date(t.Year(), t.Month(), t.Day(), 12, 0, 0, 0, time.UTC).Add(off)
	return d, d.Add(12 * time.Hour)
}

// WireLengthsM are the wire lengths of a "more wire?" sweep: 10 m to
// 100 m in 10 m steps, with currentM added in order when it is positive
// and not among them.
func WireLengthsM(currentM float64) []float64 {
	var out []float64
	for l := 10.0; l <= 100; l += 10 {
		out = append(out, l)
	}
	if currentM <= 0 || math.IsNaN(currentM) || math.IsInf(currentM, 0) {
		return out
	}
	i, found := slices.BinarySearchFunc(out, currentM, func(a, b float64) int {
		if math.Abs(a-b) < 1e-9 {
			return 0
		}
		return cmp.Compare(a, b)
	})
	if !found {
		out = slices.Insert(out, i, currentM)
	}
	return out
}
