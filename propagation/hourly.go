package propagation

import (
	"math"
	"sync"
	"time"

	"gonum.org/v1/gonum/interp"
)

// Hourly loss factor L_t of Rec. ITU-R P.1147 (its Fig. 3 / Appendix 1),
// as two branches: hours after sunset and hours before sunrise at the
// control point. The Recommendation's values could not be retrieved
// (methods.md §2.5 [M]: "large (≳ 15–20 dB) more than about 1 h before
// sunset; falling through sunset to a few dB about 1 h after; about
// 0–1 dB from SS+2 h through the night; rising again from about 1 h
// before sunrise to ≳ 15 dB about 1 h after sunrise"). The numbers below
// follow that shape from memory of the figure, low confidence: they are
// a documented table meant to be replaced by the digitised figure.
// Both branches are zero from SS+6 h (the reference time) and before
// SR−3 h, so L_t = 0 at the reference time in every night of 9 h or more.
var (
	// Hours relative to sunset (negative: before sunset), L_t in dB.
	hourlySunsetH  = []float64{-3, -2, -1.5, -1, -0.5, 0, 0.5, 1, 1.5, 2, 3, 4, 5, 6}
	hourlySunsetDB = []float64{35, 26, 21, 16.5, 12, 7.5, 4.5, 2.5, 1.5, 1.0, 0.5, 0.2, 0.05, 0}
	// Hours before sunrise (negative: after sunrise), L_t in dB.
	hourlySunriseH  = []float64{-3, -2, -1.5, -1, -0.5, 0, 0.5, 1, 1.5, 2, 2.5, 3}
	hourlySunriseDB = []float64{36, 27, 22, 17.5, 12.5, 8, 5, 3, 1.8, 1.0, 0.4, 0}
)

// Beyond the tables (deeper into daylight) L_t keeps rising at
// dayRiseDBPerHour up to DaytimeLossDB.
const (
	dayRiseDBPerHour = 9.0
	// DaytimeLossDB is the loss of the MF sky wave in full daylight
	// relative to the night reference: D-region absorption leaves the
	// daytime MF sky wave tens of dB below the night value (P.1147 Annex 2,
	// methods.md §2.6 [M]); 60 dB makes it negligible beside any ground wave
	// without a step at the end of the transition.
	DaytimeLossDB = 60.0
)

var hourlyCurves = sync.OnceValue(func() (c [2]interp.FritschButland) {
	// Monotone piecewise-cubic (Fritsch–Butland) through the table: smooth
	// and free of overshoot, so L_t ≥ 0 everywhere.
	if err := c[0].Fit(hourlySunsetH, hourlySunsetDB); err != nil {
		panic("propagation: hourly loss table: " + err.Error())
	}
	if err := c[1].Fit(hourlySunriseH, hourlySunriseDB); err != nil {
		panic("propagation: hourly loss table: " + err.Error())
	}
	return c
})

// branchDB evaluates one branch of L_t at h hours (table, then the daytime
// rise, then the cap).
func branchDB(c *interp.FritschButland, hs, dbs []float64, h float64) float64 {
	switch {
	case h >= hs[len(hs)-1]:
		return dbs[len(dbs)-1]
	case h <= hs[0]:
		return math.Min(DaytimeLossDB, dbs[0]+dayRiseDBPerHour*(hs[0]-h))
	}
	return math.Max(0, c.Predict(h))
}

// HourlyLossAfterSunsetDB returns the sunset branch of L_t at hours after
// sunset (negative before), and HourlyLossBeforeSunriseDB the sunrise
// branch at hours before sunrise (negative after).
func HourlyLossAfterSunsetDB(hours float64) float64 {
	c := hourlyCurves()
	return branchDB(&c[0], hourlySunsetH, hourlySunsetDB, hours)
}

// HourlyLossBeforeSunriseDB: see HourlyLossAfterSunsetDB.
func HourlyLossBeforeSunriseDB(hours float64) float64 {
	c := hourlyCurves()
	return branchDB(&c[1], hourlySunriseH, hourlySunriseDB, hours)
}

// HourlyLoss is L_t at one instant with the sun times it came from.
type HourlyLoss struct {
	LossDB float64 // L_t, dB (0 at the reference time, DaytimeLossDB in full day)
	// HoursAfterSunset is hours since the sunset that began the night
	// (negative by day: hours until the coming sunset); HoursBeforeSunrise
	// hours until the sunrise that ends the night (negative by day: hours
	// since sunrise). Zero when the sun neither rises nor sets.
	HoursAfterSunset, HoursBeforeSunrise float64
	State                                SunState // of the governing control point
	SunElevMidDeg                        float64  // solar elevation at the path midpoint
}

// HourlyLossDB returns the hourly loss factor L_t of P.1147 for a path
// from tx to rx at instant t:
//
//	night:  L_t = max( L_SS(t − SS), L_SR(SR − t) )
//	day:    L_t = min( L_SS(t − SS), L_SR(SR − t) )
//
// (at night SS is the sunset that began it and SR the sunrise that ends
// it; by day SR began it and SS ends it, so the nearer event governs and
// L_t is continuous through sunset and sunrise)
// with SS and SR the nearest sunset and sunrise (zenith 90.833°) at the
// path midpoint, or, for paths longer than 2000 km, at two control points
// 750 km from each end, the night beginning at the later sunset and ending
// at the earlier sunrise (both reflection regions dark). In polar night L_t
// is 0; in polar day DaytimeLossDB.
//
// Reference: Rec. ITU-R P.1147-4 §2.7 and Appendix 1 (structure; the
// control points for long paths are from memory, methods.md §2.5 [M]).
func HourlyLossDB(t time.Time, tx, rx Place) (HourlyLoss, error) {
	d := DistanceKm(tx, rx)
	mid := Midpoint(tx, rx)
	var ctrl []Place
	if d > 2000 {
		for _, frac := range []float64{750 / d, 1 - 750/d} {
			p, err := PointAt(tx, rx, frac)
			if err != nil {
				return HourlyLoss{}, err
			}
			ctrl = append(ctrl, p)
		}
	} else {
		ctrl = []Place{mid}
	}
	var out HourlyLoss
	elev, err := SolarElevationDeg(t, mid.LatDeg(), mid.LonDeg())
	if err != nil {
		return HourlyLoss{}, err
	}
	out.SunElevMidDeg = elev
	for i, p := range ctrl {
		ss, sr, state, err := nearestSunEvents(t, p)
		if err != nil {
			return HourlyLoss{}, err
		}
		var loss, hSS, hSR float64
		switch {
		case state == SunPolarNight && ss.IsZero() && sr.IsZero():
			loss = 0
		case state == SunPolarDay && ss.IsZero() && sr.IsZero():
			loss = DaytimeLossDB
		default:
			a, b := 0.0, 0.0
			if !ss.IsZero() {
				hSS = t.Sub(ss).Hours()
				a = HourlyLossAfterSunsetDB(hSS)
			}
			if !sr.IsZero() {
				hSR = sr.Sub(t).Hours()
				b = HourlyLossBeforeSunriseDB(hSR)
			}
			if hSS >= 0 && hSR >= 0 {
				loss = math.Max(a, b) // night: each branch is 0 in mid-night
			} else {
				loss = math.Min(a, b) // day: the nearer event governs
			}
		}
		// Both control points must be dark: the larger loss governs.
		if i == 0 || loss > out.LossDB {
			out.LossDB, out.HoursAfterSunset, out.HoursBeforeSunrise, out.State = loss, hSS, hSR, state
		}
	}
	return out, nil
}

// nearestSunEvents returns the sun times that bound t at p: at night the
// sunset that began it and the sunrise that will end it; by day the sunset
// that will end it and the sunrise that began it. (So t − sunset ≥ 0 at
// night and < 0 by day, and likewise sunrise − t.) It searches the solar
// days around t. In continuous polar day or night both are zero and the
// state says which; an event that exists only on one side is returned
// with the other zero.
func nearestSunEvents(t time.Time, p Place) (sunset, sunrise time.Time, state SunState, err error) {
	t = t.UTC()
	day := time.Date(t.Year(), t.Month(), t.Day(), 0, 0, 0, 0, time.UTC)
	// The usual case in one or two solar days: today's sunrise and sunset
	// bound the day; before sunrise the night began at yesterday's
	// sunset; after sunset it ends at tomorrow's sunrise.
	today, err := SunEvents(day, p.LatDeg(), p.LonDeg())
	if err != nil {
		return time.Time{}, time.Time{}, 0, err
	}
	if today.State == SunNormal && !today.Sunrise.After(today.Sunset) {
		switch {
		case t.Before(today.Sunrise):
			prev, err := SunEvents(day.AddDate(0, 0, -1), p.LatDeg(), p.LonDeg())
			if err == nil && prev.State == SunNormal && !prev.Sunset.After(t) {
				return prev.Sunset, today.Sunrise, SunNormal, nil
			}
		case t.Before(today.Sunset):
			return today.Sunset, today.Sunrise, SunNormal, nil
		default:
			next, err := SunEvents(day.AddDate(0, 0, 1), p.LatDeg(), p.LonDeg())
			if err == nil && next.State == SunNormal && next.Sunrise.After(t) {
				return today.Sunset, next.Sunrise, SunNormal, nil
			}
		}
	}
	var lastSS, nextSS, lastSR, nextSR time.Time
	// The solar days before, of and after t bound it in all but polar
	// seasons; two more days each side only when an event is missing.
	days := []int{-1, 0, 1, -2, 2}
	for n, k := range days {
		if n == 3 && !lastSS.IsZero() && !nextSS.IsZero() && !lastSR.IsZero() && !nextSR.IsZero() {
			break
		}
		sd, err := SunEvents(day.AddDate(0, 0, k), p.LatDeg(), p.LonDeg())
		if err != nil {
			return time.Time{}, time.Time{}, 0, err
		}
		if k == 0 {
			state = sd.State
		}
		if ev := sd.Sunset; !ev.IsZero() {
			if !ev.After(t) {
				if ev.After(lastSS) {
					lastSS = ev
				}
			} else if nextSS.IsZero() || ev.Before(nextSS) {
				nextSS = ev
			}
		}
		if ev := sd.Sunrise; !ev.IsZero() {
			if !ev.After(t) {
				if ev.After(lastSR) {
					lastSR = ev
				}
			} else if nextSR.IsZero() || ev.Before(nextSR) {
				nextSR = ev
			}
		}
	}
	night := lastSS.After(lastSR) || (lastSR.IsZero() && !lastSS.IsZero())
	switch {
	case lastSS.IsZero() && lastSR.IsZero() && nextSS.IsZero() && nextSR.IsZero():
		elev, err := SolarElevationDeg(t, p.LatDeg(), p.LonDeg())
		if err != nil {
			return time.Time{}, time.Time{}, 0, err
		}
		if elev >= RiseSetElevationDeg {
			return time.Time{}, time.Time{}, SunPolarDay, nil
		}
		return time.Time{}, time.Time{}, SunPolarNight, nil
	case night:
		return lastSS, nextSR, state, nil
	}
	return nextSS, lastSR, state, nil
}
