package main

import (
	"fmt"
	"io"
	"time"

	"earshot/propagation"
)

const sunSynopsis = `--at DATE|RFC3339 --lat LAT --lon LON [--json]

Sunrise, sunset and solar noon (UTC, zenith 90.833°, Meeus low-precision
Sun) for the local solar day of DATE at the place, and the Sun's elevation
at the given instant (at solar noon when only a date is given).`

// sunJSON is the --json output of "earshot sun".
type sunJSON struct {
	Date         string  `json:"date"`
	Lat          float64 `json:"lat"`
	Lon          float64 `json:"lon"`
	State        string  `json:"state"`
	Sunrise      string  `json:"sunrise,omitempty"`
	Sunset       string  `json:"sunset,omitempty"`
	SolarNoon    string  `json:"solar_noon"`
	ElevationAt  string  `json:"elevation_at"`
	ElevationDeg float64 `json:"elevation_deg"`
}

func runSun(args []string, stdout, stderr io.Writer) int {
	fs := newFlagSet("sun", sunSynopsis, stdout)
	at := fs.String("at", "", "date (2025-06-21) or instant (RFC 3339); default now")
	lat := fs.Float64("lat", 0, "latitude, degrees (-90 … 90, north positive)")
	lon := fs.Float64("lon", 0, "longitude, degrees (-180 … 180, east positive)")
	asJSON := fs.Bool("json", false, "print JSON instead of text")
	if done, status := parseFlags(fs, args, stderr); done {
		return status
	}
	set := setFlags(fs)
	if !set["lat"] || !set["lon"] {
		return report("sun", usagef("--lat and --lon are required (degrees)"), stderr)
	}
	t, dateOnly := time.Now().UTC(), false
	if set["at"] {
		var err error
		if t, dateOnly, err = propagation.ParseTime(*at); err != nil {
			return report("sun", usagef("--at %q: want a date (2025-06-21) or an RFC 3339 instant", *at), stderr)
		}
	}
	names := map[string]string{"latitude": "--lat", "longitude": "--lon", "time": "--at", "date": "--at"}
	day, err := propagation.SunEvents(t, *lat, *lon)
	if err != nil {
		return report("sun", asUsageWith(err, names), stderr)
	}
	when := t
	if dateOnly {
		when = day.SolarNoon
	}
	elev, err := propagation.SolarElevationDeg(when, *lat, *lon)
	if err != nil {
		return report("sun", asUsageWith(err, names), stderr)
	}
	out := sunJSON{Date: t.Format(time.DateOnly), Lat: *lat, Lon: *lon, State: day.State.String(),
		SolarNoon: rfc(day.SolarNoon), Sunrise: rfc(day.Sunrise), Sunset: rfc(day.Sunset),
		ElevationAt: rfc(when), ElevationDeg: round4(elev)}
	if *asJSON {
		return emitJSON("sun", out, stdout, stderr)
	}
	fmt.Fprintf(stdout, "Sun at %.4f°, %.4f° on %s (times UTC)\n", *lat, *lon, out.Date)
	fmt.Fprintf(stdout, "  day:        %s\n", out.State)
	fmt.Fprintf(stdout, "  sunrise:    %s\n", orNone(out.Sunrise))
	fmt.Fprintf(stdout, "  solar noon: %s\n", out.SolarNoon)
	fmt.Fprintf(stdout, "  sunset:     %s\n", orNone(out.Sunset))
	fmt.Fprintf(stdout, "  elevation:  %.2f° at %s\n", elev, out.ElevationAt)
	return exitOK
}

func rfc(t time.Time) string {
	if t.IsZero() {
		return ""
	}
	return t.UTC().Format(time.RFC3339)
}

func orNone(s string) string {
	if s == "" {
		return "none"
	}
	return s
}
