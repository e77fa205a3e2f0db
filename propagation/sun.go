package propagation

import (
	"fmt"
	"math"
	"time"
)

// The Sun: where it is at an instant, and when it rises and sets.
//
// Sky-wave reception at medium wave switches on around sunset and off around
// sunrise at the path's reflection points, so the planner needs the local
// times of those events and the Sun's elevation at any instant. The solar
// coordinates come from the low-precision Sun of Meeus, Astronomical
// Algorithms, ch. 25, as used in the spreadsheet of the NOAA Global
// Monitoring Laboratory; everything else is spherical trigonometry.

// Sun-event conventions and the accepted span of dates.
const (
	// RiseSetZenithDeg is the zenith distance of the Sun's centre at sunrise
	// and sunset: 90° plus 34′ of standard horizontal refraction plus the
	// Sun's 16′ semi-diameter, so that the upper limb touches a level, clear
	// horizon. It is the "official" zenith 90°50′ of the USNO almanac
	// algorithm.
	//
	// Reference: USNO, Almanac for Computers (1990), sunrise/sunset
	// (methods.md §5.2); NOAA GML, General Solar Position Calculations
	// (methods.md §5.1 step 7).
	RiseSetZenithDeg = 90.833

	// RiseSetElevationDeg = 90° − RiseSetZenithDeg is the geometric
	// elevation of the Sun's centre at sunrise and sunset. The Sun counts
	// as up when SolarElevationDeg is at or above it.
	RiseSetElevationDeg = 90 - RiseSetZenithDeg

	// MinSunYear and MaxSunYear bound the accepted dates (years of the
	// proleptic Gregorian calendar, UTC). The bounds are this package's
	// choice, not the source's: the Meeus series are polynomial fits about
	// J2000.0 whose 0.01° is stated for dates near it, and time is taken as
	// UT rather than TT, which costs 0.0008° in 2024 but about 0.02° around
	// the year 1000, when TT − UT was some 25 min (from memory). The span
	// also rejects the zero time.Time (year 1), a common mistake.
	MinSunYear = 1000
	MaxSunYear = 3000
)

// SunState says which of sunrise and sunset happen in a solar day, or what
// the Sun is doing at an instant (see SunsetSunriseAround).
type SunState int

const (
	// SunNormal: the Sun rises and sets.
	SunNormal SunState = iota
	// SunPolarDay: the Sun stays up (centre at or above
	// RiseSetElevationDeg) all day; it neither rises nor sets.
	SunPolarDay
	// SunPolarNight: the Sun stays down all day; it neither rises nor sets.
	SunPolarNight
	// SunRiseOnly: the Sun rises and is still up at the end of the solar
	// day: the first day of a polar-day season (midnight sun).
	SunRiseOnly
	// SunSetOnly: the Sun is already up when the solar day begins and sets
	// before it ends: the last day of a polar-day season.
	SunSetOnly
)

// String returns a short lower-case name such as "polar night".
func (s SunState) String() string {
	switch s {
	case SunNormal:
		return "normal"
	case SunPolarDay:
		return "polar day"
	case SunPolarNight:
		return "polar night"
	case SunRiseOnly:
		return "rise only"
	case SunSetOnly:
		return "set only"
	}
	return fmt.Sprintf("SunState(%d)", int(s))
}

// SunDay holds the events of one local solar day at one place. All times are
// in UTC. Sunrise or Sunset is the zero time.Time when State says that event
// does not happen that day (polar day, polar night, or one of the two
// transition days).
type SunDay struct {
	// SolarNoon is the upper transit (hour angle 0). It is always set, also
	// in polar night, when the Sun culminates below the horizon.
	SolarNoon time.Time
	// Sunrise and Sunset are the instants when the Sun's centre crosses
	// geometric elevation RiseSetElevationDeg, rising and setting.
	Sunrise, Sunset time.Time
	// State says which events happen.
	State SunState
}

// Constants of the time scale.
const (
	// sunJ2000Unix is 2000-01-01 12:00:00 UTC in Unix seconds, taken as the
	// epoch J2000.0 (JD 2451545.0). Meeus counts T in TT, which ran
	// TT − UT ≈ 64 s ahead in 2000 and 69 s in 2024 (from memory); counting
	// it in UT instead shifts the Sun by under 0.001°, far below the
	// series' accuracy.
	sunJ2000Unix = 946728000
	// sunSecPerCentury is one Julian century, 36525 days of 86400 s.
	sunSecPerCentury = 36525 * 86400.0
	sunDegToRad      = math.Pi / 180
)

// sunCoords holds the Sun's low-precision equatorial quantities at one
// instant: the apparent declination δ (as sine and cosine) and the equation
// of time (apparent minus mean solar time) in minutes.
type sunCoords struct {
	sinDec, cosDec float64
	eqTimeMin      float64
}

// sunAt evaluates the low-precision solar coordinates at t:
//
//	T  = (JD − 2451545.0)/36525                               Julian centuries
//	L₀ = 280.46646° + 36000.76983° T + 0.0003032° T²           mean longitude
//	M  = 357.52911° + 35999.05029° T − 0.0001537° T²           mean anomaly
//	e  = 0.016708634 − 0.000042037 T − 0.0000001267 T²         eccentricity
//	C  = (1.914602° − 0.004817° T − 0.000014° T²) sin M
//	     + (0.019993° − 0.000101° T) sin 2M + 0.000289° sin 3M  equation of centre
//	Ω  = 125.04° − 1934.136° T
//	λ  = L₀ + C − 0.00569° − 0.00478° sin Ω                     apparent longitude
//	ε  = 23°26′21.448″ − 46.815″ T − 0.00059″ T² + 0.001813″ T³ + 0.00256° cos Ω
//	sin δ = sin ε sin λ
//	y  = tan²(ε/2)
//	E  = y sin 2L₀ − 2e sin M + 4ey sin M cos 2L₀ − ½y² sin 4L₀ − (5/4)e² sin 2M   (radians)
//
// and returns δ and E in minutes of time (4 min per degree). Accuracy about
// 0.01° in λ and δ and a few seconds in E for years near 2000.
//
// Reference: J. Meeus, Astronomical Algorithms, 2nd ed. (1998), ch. 25
// eqs. (25.1)–(25.4), (25.7) and the text on the apparent longitude;
// ch. 22 eq. (22.2) for ε; ch. 28 eq. (28.3) for E (equation numbers from
// memory); the same formulas as methods.md §5.3.
func sunAt(t time.Time) sunCoords {
	sec := float64(t.Unix()-sunJ2000Unix) + float64(t.Nanosecond())*1e-9
	T := sec / sunSecPerCentury // eq. (25.1)

	// Angles are left unreduced: sin and cos reduce them exactly enough
	// (|L₀| < 10⁶ degrees over the accepted years). Multiple angles come
	// from the double- and triple-angle identities.
	L0 := 280.46646 + T*(36000.76983+T*0.0003032)     // eq. (25.2)
	M := 357.52911 + T*(35999.05029-T*0.0001537)      // eq. (25.3)
	e := 0.016708634 - T*(0.000042037+T*0.0000001267) // eq. (25.4)
	sinM, cosM := math.Sincos(M * sunDegToRad)
	sin2M := 2 * sinM * cosM
	sin3M := sinM * (3 - 4*sinM*sinM)
	C := (1.914602-T*(0.004817+T*0.000014))*sinM +
		(0.019993-T*0.000101)*sin2M + 0.000289*sin3M
	sinOm, cosOm := math.Sincos((125.04 - 1934.136*T) * sunDegToRad)
	lambda := (L0 + C - 0.00569 - 0.00478*sinOm) * sunDegToRad
	// Mean obliquity, eq. (22.2), in arcseconds beyond 23°26′, then the
	// low-precision nutation correction of ch. 25.
	eps0 := 23 + 26.0/60 + (21.448-T*(46.815+T*(0.00059-T*0.001813)))/3600
	sinEps, cosEps := math.Sincos((eps0 + 0.00256*cosOm) * sunDegToRad)

	sinDec := sinEps * math.Sin(lambda)    // eq. (25.7)
	cosDec := math.Sqrt(1 - sinDec*sinDec) // δ ∈ [−24°, 24°], cos δ > 0.9

	y := (1 - cosEps) / (1 + cosEps) // tan²(ε/2)
	sin2L0, cos2L0 := math.Sincos(2 * L0 * sunDegToRad)
	sin4L0 := 2 * sin2L0 * cos2L0
	E := y*sin2L0 - 2*e*sinM + 4*e*y*sinM*cos2L0 -
		0.5*y*y*sin4L0 - 1.25*e*e*sin2M // eq. (28.3)
	return sunCoords{sinDec: sinDec, cosDec: cosDec, eqTimeMin: 4 * E / sunDegToRad}
}

// sunHourAngleDeg returns the Sun's local hour angle in degrees (west of the
// meridian positive, not reduced to a range) at t and east longitude lonDeg:
//
//	H = t_UTC/(4 min) + E/4 + λ_east − 180°
//
// where t_UTC is the time of day in minutes and E the equation of time.
//
// Reference: NOAA GML, General Solar Position Calculations, true solar time
// and hour angle (methods.md §5.1 steps 4–5).
func sunHourAngleDeg(t time.Time, lonDeg, eqTimeMin float64) float64 {
	day := t.Unix() % 86400
	if day < 0 {
		day += 86400
	}
	secOfDay := float64(day) + float64(t.Nanosecond())*1e-9
	return secOfDay/240 + eqTimeMin/4 + lonDeg - 180
}

// sunElevAz returns the geometric elevation and the azimuth (degrees
// clockwise from true north) of a body at declination δ and hour angle H
// seen from latitude φ, from the components of its unit vector in the
// local east-north-up frame:
//
//	up    = sin φ sin δ + cos φ cos δ cos H
//	north = cos φ sin δ − sin φ cos δ cos H
//	east  = −cos δ sin H
//	h = atan2(up, √(north² + east²)),  A = atan2(east, north)
//
// which is eq. (13.6) of Meeus for h and eq. (13.5) for A (measured there
// from the south), written so that no rounding can push an arcsine out of
// its domain and the pole needs no special case.
func sunElevAz(sinLat, cosLat float64, c sunCoords, haDeg float64) (elevDeg, azDeg float64) {
	sinH, cosH := math.Sincos(haDeg * sunDegToRad)
	up := sinLat*c.sinDec + cosLat*c.cosDec*cosH
	north := cosLat*c.sinDec - sinLat*c.cosDec*cosH
	east := -c.cosDec * sinH
	elevDeg = math.Atan2(up, math.Hypot(north, east)) / sunDegToRad
	azDeg = math.Atan2(east, north) / sunDegToRad
	if azDeg < 0 {
		azDeg += 360
	}
	return elevDeg, azDeg
}

// sunElevation is the geometric elevation at t in degrees, without
// validation: the elevation part of sunElevAz.
func sunElevation(t time.Time, sinLat, cosLat, lonDeg float64) float64 {
	c := sunAt(t)
	sinH, cosH := math.Sincos(sunHourAngleDeg(t, lonDeg, c.eqTimeMin) * sunDegToRad)
	up := sinLat*c.sinDec + cosLat*c.cosDec*cosH
	north := cosLat*c.sinDec - sinLat*c.cosDec*cosH
	return math.Atan2(up, math.Hypot(north, c.cosDec*sinH)) / sunDegToRad
}

// sunCheckPlace validates a latitude and an east longitude in degrees. NaN
// and ±Inf fail the range tests and are reported the same way.
func sunCheckPlace(latDeg, lonDeg float64) error {
	if !(latDeg >= -90 && latDeg <= 90) {
		return &InputError{Field: "latitude", Value: latDeg, Unit: "degrees", Want: "between -90 and 90"}
	}
	if !(lonDeg >= -180 && lonDeg <= 180) {
		return &InputError{Field: "longitude", Value: lonDeg, Unit: "degrees", Want: "between -180 and 180 (east positive)"}
	}
	return nil
}

// sunCheckYear validates the year of t (UTC) against MinSunYear..MaxSunYear.
func sunCheckYear(field string, t time.Time) error {
	if y := t.UTC().Year(); y < MinSunYear || y > MaxSunYear {
		return &InputError{Field: field, Value: float64(y), Unit: "",
			Want: fmt.Sprintf("in a year between %d and %d", MinSunYear, MaxSunYear)}
	}
	return nil
}

// SolarCoordinates returns the Sun's apparent declination in degrees and the
// equation of time (apparent minus mean solar time) in minutes at the
// instant t, from the low-precision Meeus series (see SolarElevationDeg).
// The equation of time is positive when a sundial is ahead of the clock
// (about +16.4 min in early November, −14.2 min in mid February).
//
// Reference: J. Meeus, Astronomical Algorithms, 2nd ed., ch. 25 and
// eq. (28.3) (methods.md §5.3).
func SolarCoordinates(t time.Time) (declinationDeg, equationOfTimeMin float64, err error) {
	if err := sunCheckYear("time", t); err != nil {
		return 0, 0, err
	}
	c := sunAt(t)
	return math.Asin(c.sinDec) / sunDegToRad, c.eqTimeMin, nil
}

// SolarElevationDeg returns the geometric elevation of the Sun's centre in
// degrees (−90 to 90, no atmospheric refraction, geocentric: the 0.002°
// solar parallax is ignored) at instant t, seen from latitude latDeg (north
// positive) and longitude lonDeg (east positive):
//
//	sin h = sin φ sin δ + cos φ cos δ cos H,   H = hour angle
//
// with δ and the equation of time from the low-precision Sun of Meeus
// (SolarCoordinates). Accuracy: about 0.01° in position for years near 2000
// (Meeus ch. 25). Refraction, which this omits, lifts the Sun by about 0.57°
// at the horizon.
//
// Latitude must lie in [−90, 90], longitude in [−180, 180], and t in
// a year from MinSunYear to MaxSunYear; otherwise the error is an
// *InputError naming the field.
//
// Reference: J. Meeus, Astronomical Algorithms, 2nd ed. (1998), ch. 13,
// 25 and 28; NOAA GML, General Solar Position Calculations (methods.md §5).
func SolarElevationDeg(t time.Time, latDeg, lonDeg float64) (float64, error) {
	if err := sunCheckPlace(latDeg, lonDeg); err != nil {
		return 0, err
	}
	if err := sunCheckYear("time", t); err != nil {
		return 0, err
	}
	sinLat, cosLat := math.Sincos(latDeg * sunDegToRad)
	return sunElevation(t, sinLat, cosLat, lonDeg), nil
}

// SolarPosition returns the Sun's geometric elevation (as SolarElevationDeg)
// and its azimuth in degrees clockwise from true north, in [0, 360), at
// instant t and place (latDeg, lonDeg):
//
//	tan A_S = sin H / (cos H sin φ − tan δ cos φ),   A = A_S + 180°
//
// (A_S measured westward from the south, in the quadrant of its numerator
// and denominator; computed as the atan2 of the east and north components
// of the Sun's direction). At the poles the azimuth is taken in the limit of the meridian through
// lonDeg. Errors as for SolarElevationDeg.
//
// Reference: J. Meeus, Astronomical Algorithms, 2nd ed., eq. (13.5)
// (equation number from memory); NOAA GML (methods.md §5.1 step 6).
func SolarPosition(t time.Time, latDeg, lonDeg float64) (elevationDeg, azimuthDeg float64, err error) {
	if err := sunCheckPlace(latDeg, lonDeg); err != nil {
		return 0, 0, err
	}
	if err := sunCheckYear("time", t); err != nil {
		return 0, 0, err
	}
	sinLat, cosLat := math.Sincos(latDeg * sunDegToRad)
	c := sunAt(t)
	elevationDeg, azimuthDeg = sunElevAz(sinLat, cosLat, c, sunHourAngleDeg(t, lonDeg, c.eqTimeMin))
	return elevationDeg, azimuthDeg, nil
}

// SunEvents returns the solar noon, sunrise and sunset of one local solar day
// at latitude latDeg (north positive) and longitude lonDeg (east positive).
// All returned times are UTC.
//
// Which day: only the calendar date of date is used (date.Date(), read in
// date's own Location; the time of day is ignored). It names the local mean
// solar day of that date at lonDeg, the day of a clock that keeps local mean
// time UTC + lonDeg/15 h. Its solar noon is the transit nearest to local mean
// noon, 12:00 UTC − lonDeg/15 h on that date, which it differs from by the
// equation of time (under 17 min). The solar day runs from the solar midnight
// (hour angle 180°) before that noon to the one after, so consecutive days
// tile time and every sunrise and sunset belongs to exactly one day. An
// event may fall on a neighbouring UTC date (Boulder, 105.27° W: the sunset
// of 21 June is at about 02:33 UTC on 22 June). At lonDeg = +180 the day's
// noon is near 00:00 UTC on the date, at −180 near 24:00 UTC: the two sides
// of the date line, one calendar day apart, so
// SunEvents(d, φ, 180) equals SunEvents(d − 1 day, φ, −180).
//
// Method: the solar noon t_n solves t_n = t_mean − E(t_n); sunrise and sunset
// solve the hour-angle condition with δ and E evaluated at the event itself,
//
//	cos H₀ = (cos 90.833° − sin φ sin δ(t)) / (cos φ cos δ(t))
//	t = t_mean ∓ 4 min·H₀/° − E(t)        (− for sunrise, + for sunset)
//
// iterated from the noon values until a pass moves t by less than 10 ms
// (two or three passes). On an ordinary day (|φ| ≤ 80°, the events more
// than 72 min from noon and midnight) that is all. Otherwise the state
// comes from the Sun's elevation at noon and at the two solar midnights,
// and where the iteration fails or leaves the day (near the start or end of
// a polar-day season, or at a pole, where cos φ → 0) the crossing is found
// by bisection on the elevation, to 1 ms.
//
// Accuracy: the Meeus series' ≈0.01° is about a minute of time or better at
// mid latitudes; against a full ephemeris (PyEphem 4.1.4, see the tests) the
// worst differences found were 4 s up to 60° latitude, 2.3 min at 70° and
// 3.1 min at 80°, where the Sun meets the horizon at a grazing angle. Real
// refraction at the horizon departs from the standard 34′ by enough to move
// the events by minutes.
//
// Latitude must lie in [−90, 90], longitude in [−180, 180], and the date in
// a year from MinSunYear to MaxSunYear; otherwise the error is an
// *InputError naming the field.
//
// Reference: J. Meeus, Astronomical Algorithms, 2nd ed., ch. 15 (rising and
// setting, h₀ = −0°50′ for the Sun) and ch. 25; NOAA GML, General Solar
// Position Calculations, sunrise/sunset (methods.md §5.1 step 7, §5.3).
func SunEvents(date time.Time, latDeg, lonDeg float64) (SunDay, error) {
	if err := sunCheckPlace(latDeg, lonDeg); err != nil {
		return SunDay{}, err
	}
	y, m, d := date.Date()
	if y < MinSunYear || y > MaxSunYear {
		return SunDay{}, &InputError{Field: "date", Value: float64(y), Unit: "",
			Want: fmt.Sprintf("in a year between %d and %d", MinSunYear, MaxSunYear)}
	}
	return newSunDayCalc(latDeg, lonDeg).day(y, m, d), nil
}

// SunsetSunriseAround returns, for the instant t at place (latDeg, lonDeg),
// the latest sunset at or before t and the earliest sunrise after t, both
// UTC: the night that t lies in, when t is at night. When the Sun is up at
// t, they are the previous evening's sunset and the next morning's sunrise;
// compare SolarElevationDeg(t, …) with RiseSetElevationDeg to tell day from
// night.
//
// The search covers the local solar days (see SunEvents) from two before to
// two after the local mean date of t. State is SunNormal when both events
// were found. Otherwise the missing time is zero and state says why:
// SunPolarDay if the Sun is up at t (no sunset before it, or no sunrise
// after it, within the search: midnight-sun season), SunPolarNight if it is
// down. The event that was found, if any, is still returned: on the first
// night of a polar night, lastSunset is that evening's sunset.
//
// Errors as for SunEvents, with t in place of the date (field "time").
//
// Reference: as SunEvents.
func SunsetSunriseAround(t time.Time, latDeg, lonDeg float64) (lastSunset, nextSunrise time.Time, state SunState, err error) {
	if err := sunCheckPlace(latDeg, lonDeg); err != nil {
		return time.Time{}, time.Time{}, 0, err
	}
	if err := sunCheckYear("time", t); err != nil {
		return time.Time{}, time.Time{}, 0, err
	}
	k := newSunDayCalc(latDeg, lonDeg)
	// Local mean date of t at lonDeg.
	y, m, d := t.UTC().Add(sunLonOffset(lonDeg)).Date()
	var days [5]SunDay
	var done [5]bool
	get := func(i int) SunDay { // i = 0..4 for days −2..+2
		if !done[i] {
			days[i] = k.day(y, m, d+i-2)
			done[i] = true
		}
		return days[i]
	}
	// Sunsets increase with the day, and the sunset of day +1 lies after
	// its noon, which is after t: search days 0, −1, −2.
	for i := 2; i >= 0; i-- {
		if s := get(i).Sunset; !s.IsZero() && !s.After(t) {
			lastSunset = s
			break
		}
	}
	// Sunrises: the sunrise of day −1 lies before its noon, before t.
	for i := 2; i <= 4; i++ {
		if r := get(i).Sunrise; !r.IsZero() && r.After(t) {
			nextSunrise = r
			break
		}
	}
	switch {
	case !lastSunset.IsZero() && !nextSunrise.IsZero():
		state = SunNormal
	case sunElevation(t, k.sinLat, k.cosLat, lonDeg) >= RiseSetElevationDeg:
		state = SunPolarDay
	default:
		state = SunPolarNight
	}
	return lastSunset, nextSunrise, state, nil
}

// sunLonOffset converts an east longitude to the offset of local mean time
// from UTC, lonDeg/15 hours (240 s per degree).
func sunLonOffset(lonDeg float64) time.Duration {
	return time.Duration(math.Round(lonDeg * 240 * 1e9))
}

// sunMinutes converts minutes of time to a Duration, rounded to 1 ns.
func sunMinutes(m float64) time.Duration {
	return time.Duration(math.Round(m * 60e9))
}

// sunDayCalc carries the per-place constants of the rise/set computation.
type sunDayCalc struct {
	latDeg, lonDeg float64
	sinLat, cosLat float64
}

func newSunDayCalc(latDeg, lonDeg float64) sunDayCalc {
	s, c := math.Sincos(latDeg * sunDegToRad)
	return sunDayCalc{latDeg: latDeg, lonDeg: lonDeg, sinLat: s, cosLat: c}
}

// f is the Sun's elevation above the rise/set elevation, in degrees.
func (k sunDayCalc) f(t time.Time) float64 {
	return sunElevation(t, k.sinLat, k.cosLat, k.lonDeg) - RiseSetElevationDeg
}

// cosH0 returns the cosine of the hour angle at which the Sun's centre is at
// zenith distance RiseSetZenithDeg (Meeus eq. (15.1)); outside [−1, 1] it
// does not reach it. Infinite or NaN only at a pole, where cos φ = 0 and the
// caller does not use it.
func (k sunDayCalc) cosH0(c sunCoords) float64 {
	return (sunCosZenith - k.sinLat*c.sinDec) / (k.cosLat * c.cosDec)
}

// sunCosZenith is cos 90.833°.
var sunCosZenith = math.Cos(RiseSetZenithDeg * sunDegToRad)

// transit returns the instant of hour angle 0 (or 180°, for a mean
// midnight) near the mean instant tm, t = tm − E(t), iterated twice from
// E(tm), and the solar coordinates at the last point of evaluation (within
// 0.4 s of t). E changes by under 30 s a day, so the second pass moves t by
// well under a millisecond.
func (k sunDayCalc) transit(tm time.Time) (time.Time, sunCoords) {
	t := tm
	var c sunCoords
	for range 2 {
		c = sunAt(t)
		t = tm.Add(-sunMinutes(c.eqTimeMin))
	}
	return t, c
}

// day computes the SunDay of local mean date y-m-d (d may overflow; it is
// normalised as time.Date does).
func (k sunDayCalc) day(y int, m time.Month, d int) SunDay {
	meanNoon := time.Date(y, m, d, 12, 0, 0, 0, time.UTC).Add(-sunLonOffset(k.lonDeg))
	noon, cNoon := k.transit(meanNoon)
	out := SunDay{SolarNoon: noon}

	// Fast path for an ordinary day: away from the poles and with the
	// events at least 72 min from noon and from midnight (|cos H₀| ≤ 0.95
	// at noon), the change of δ over half a day (≤ 0.2°) moves cos H₀ by
	// under 0.03 for |φ| ≤ 80°, so both events exist and lie on their own
	// side of noon within the solar day.
	if math.Abs(k.latDeg) <= 80 && math.Abs(k.cosH0(cNoon)) <= 0.95 {
		rise, ok1 := k.iterate(meanNoon, cNoon, +1)
		set, ok2 := k.iterate(meanNoon, cNoon, -1)
		if ok1 && ok2 && rise.Before(noon) && set.After(noon) &&
			noon.Sub(rise) < 12*time.Hour && set.Sub(noon) < 12*time.Hour {
			out.Sunrise, out.Sunset, out.State = rise, set, SunNormal
			return out
		}
	}

	if k.f(noon) < 0 {
		out.State = SunPolarNight
		return out
	}
	// Solar midnights bounding the day. Both are computed from the same mean
	// midnight instants as the neighbouring days use, so the days tile.
	start, _ := k.transit(meanNoon.Add(-12 * time.Hour))
	end, _ := k.transit(meanNoon.Add(12 * time.Hour))
	rises := k.f(start) < 0
	sets := k.f(end) < 0
	if rises {
		out.Sunrise = k.event(meanNoon, cNoon, start, noon, +1)
	}
	if sets {
		out.Sunset = k.event(meanNoon, cNoon, noon, end, -1)
	}
	switch {
	case rises && sets:
		out.State = SunNormal
	case rises:
		out.State = SunRiseOnly
	case sets:
		out.State = SunSetOnly
	default:
		out.State = SunPolarDay
	}
	return out
}

// iterate solves for the sunrise (dir = +1) or sunset (dir = −1) of the day
// of meanNoon by the fixed-point iteration
//
//	t = t_mean − dir·4 min·H₀(δ(t))/° − E(t)
//
// starting from the coordinates c0 at solar noon, until a pass moves t by
// less than 10 ms (two or three passes). ok is false if the Sun does not
// reach the horizon at some iterate or the iteration has not settled after
// eight passes.
func (k sunDayCalc) iterate(meanNoon time.Time, c0 sunCoords, dir float64) (t time.Time, ok bool) {
	c := c0
	for i := range 8 {
		cosH0 := k.cosH0(c)
		if !(cosH0 >= -1 && cosH0 <= 1) {
			return t, false
		}
		h0 := math.Acos(cosH0) / sunDegToRad
		next := meanNoon.Add(sunMinutes(-dir*4*h0 - c.eqTimeMin))
		if i > 0 && next.Sub(t).Abs() < 10*time.Millisecond {
			return next, true
		}
		t = next
		c = sunAt(t)
	}
	return t, false
}

// event finds the sunrise (dir = +1, the elevation crosses upward in
// [lo, hi]) or sunset (dir = −1, downward). The caller has checked that the
// crossing exists: f(lo) < 0 ≤ f(hi) for a rise, f(lo) ≥ 0 > f(hi) for a set.
// It tries the fixed-point iteration and, where that fails or leaves the
// bracket (grazing Sun, or a pole, where cos φ → 0), bisects the elevation
// to 1 ms.
func (k sunDayCalc) event(meanNoon time.Time, cNoon sunCoords, lo, hi time.Time, dir float64) time.Time {
	if t, ok := k.iterate(meanNoon, cNoon, dir); ok && !t.Before(lo) && !t.After(hi) {
		return t
	}
	a, b := lo, hi // keep f(a) on the "before" side
	for b.Sub(a) > time.Millisecond {
		mid := a.Add(b.Sub(a) / 2)
		if (k.f(mid) < 0) == (dir > 0) {
			a = mid
		} else {
			b = mid
		}
	}
	return a.Add(b.Sub(a) / 2)
}
