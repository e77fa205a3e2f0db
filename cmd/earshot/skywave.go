package main

import (
	"fmt"
	"io"
	"math"
	"strings"
	"text/tabwriter"
	"time"

	"earshot/propagation"
)

const skywaveSynopsis = `--from LAT,LON --to LAT,LON --khz F [--kw P] [--height-deg G]
       [--at RFC3339] [--sunspots R] [--coastal N] [--json]

Night-time sky wave by the structure of Rec. ITU-R P.1147: the annual median
field at the reference time (six hours after sunset at the path midpoint),
the field exceeded on 10 % of nights, and with --at the median at that
instant through the hourly loss factor. Fields are P.1147's loop-equivalent
values at ground level; vertical_wire_corr_db converts to the vertical
electric field a wire antenna sees.`

// skywaveJSON is the --json output of "earshot skywave".
type skywaveJSON struct {
	KHz              float64  `json:"khz"`
	KW               float64  `json:"kw"`
	Km               float64  `json:"km"`
	GeomagLatDeg     float64  `json:"geomag_lat_deg"`
	SlantKm          float64  `json:"slant_km"`
	TakeoffDeg       float64  `json:"takeoff_deg"`
	GainDB           float64  `json:"gain_db"`
	KR               float64  `json:"k_r"`
	PolLossDB        float64  `json:"pol_loss_db"`
	SeaGainDB        float64  `json:"sea_gain_db"`
	SolarLossDB      float64  `json:"solar_loss_db"`
	MedianDBuVm      float64  `json:"median_dbuvm"`
	DecileDBuVm      float64  `json:"decile_dbuvm"`
	VerticalWireCorr float64  `json:"vertical_wire_corr_db"`
	At               string   `json:"at,omitempty"`
	HourlyLossDB     *float64 `json:"hourly_loss_db,omitempty"`
	EDBuVm           *float64 `json:"e_dbuvm,omitempty"`
	SunElevMidDeg    *float64 `json:"sun_elev_mid_deg,omitempty"`
	HoursAfterSunset *float64 `json:"hours_after_sunset,omitempty"`
}

func runSkywave(args []string, stdout, stderr io.Writer) int {
	fs := newFlagSet("skywave", skywaveSynopsis, stdout)
	from := fs.String("from", "", "transmitter, LAT,LON in degrees (north, east positive)")
	to := fs.String("to", "", "receiver, LAT,LON in degrees")
	khz := fs.Float64("khz", 0, "frequency, kHz (10–30000; validated 150–1700)")
	kw := fs.Float64("kw", 1, "transmitter power, kW (> 0)")
	heightDeg := fs.Float64("height-deg", 0, "electrical height of the transmitting monopole, degrees (0 = short monopole; else 0 < G <= 270)")
	at := fs.String("at", "", "instant for the hourly loss factor, RFC 3339 (e.g. 2025-01-15T22:00:00Z)")
	sunspots := fs.Float64("sunspots", 0, "12-month smoothed sunspot number R (0–400)")
	coastal := fs.Int("coastal", 0, "terminals on the coast with the path leaving over sea (0–2)")
	asJSON := fs.Bool("json", false, "print JSON instead of a table")
	if done, status := parseFlags(fs, args, stderr); done {
		return status
	}
	set := setFlags(fs)
	out, warns, err := skywave(set, *from, *to, *khz, *kw, *heightDeg, *at, *sunspots, *coastal)
	if err != nil {
		return report("skywave", err, stderr)
	}
	for _, w := range warns {
		fmt.Fprintf(stderr, "earshot skywave: warning: %s\n", w)
	}
	if *asJSON {
		return emitJSON("skywave", out, stdout, stderr)
	}
	tw := tabwriter.NewWriter(stdout, 0, 0, 2, ' ', 0)
	fmt.Fprintf(tw, "Night sky wave, %g kHz, %g kW, %s → %s\n", out.KHz, out.KW, *from, *to)
	rows := [][3]string{
		{"great-circle distance", f2(out.Km), "km"},
		{"slant distance p", f2(out.SlantKm), "km"},
		{"geomagnetic latitude of midpoint", f2(out.GeomagLatDeg), "°"},
		{"take-off / arrival angle", f2(out.TakeoffDeg), "°"},
		{"transmitting antenna gain G_V", f2(out.GainDB), "dB"},
		{"loss factor k_R", f2(out.KR), "dB/1000 km"},
		{"polarisation coupling loss L_p", f2(out.PolLossDB), "dB"},
		{"sea gain G_S", f2(out.SeaGainDB), "dB"},
		{"solar-activity loss L_r", f2(out.SolarLossDB), "dB"},
		{"median at SS+6 h (50 % of nights)", f2(out.MedianDBuVm), "dB(µV/m)"},
		{"exceeded on 10 % of nights", f2(out.DecileDBuVm), "dB(µV/m)"},
		{"vertical-wire correction", f2(out.VerticalWireCorr), "dB"},
	}
	if out.HourlyLossDB != nil {
		rows = append(rows,
			[3]string{"at " + out.At + ": hourly loss L_t", f2(*out.HourlyLossDB), "dB"},
			[3]string{"  hours after sunset (midpoint)", f2(*out.HoursAfterSunset), "h"},
			[3]string{"  sun elevation at midpoint", f2(*out.SunElevMidDeg), "°"},
			[3]string{"  median field then", f2(*out.EDBuVm), "dB(µV/m)"})
	}
	for _, r := range rows {
		fmt.Fprintf(tw, "  %s\t%s\t%s\n", r[0], r[1], r[2])
	}
	tw.Flush()
	return exitOK
}

func f2(v float64) string { return fmt.Sprintf("%.2f", v) }

func round4(v float64) float64 { return math.Round(v*1e4) / 1e4 }

// placeFlag parses a LAT,LON flag, naming the flag in errors.
func placeFlag(name, s string) (propagation.Place, error) {
	if s == "" {
		return propagation.Place{}, usagef("--%s is required (LAT,LON in degrees)", name)
	}
	p, err := propagation.ParsePlace(s)
	if err != nil {
		return p, usagef("--%s: %s", name, strings.TrimPrefix(err.Error(), "propagation: "))
	}
	return p, nil
}

func skywave(set map[string]bool, from, to string, khz, kw, heightDeg float64, at string, sunspots float64, coastal int) (*skywaveJSON, []propagation.Warning, error) {
	tx, err := placeFlag("from", from)
	if err != nil {
		return nil, nil, err
	}
	rx, err := placeFlag("to", to)
	if err != nil {
		return nil, nil, err
	}
	if propagation.DistanceKm(tx, rx) < 1e-3 {
		return nil, nil, usagef("--from and --to must be different places (at least 1 m apart)")
	}
	if !set["khz"] {
		return nil, nil, usagef("--khz is required (10–30000 kHz)")
	}
	if set["height-deg"] && heightDeg == 0 {
		return nil, nil, usagef("--height-deg must be > 0 and <= 270 degrees, got 0")
	}
	sp := propagation.SkyPath{Tx: tx, Rx: rx, Freq: propagation.KHz(khz), PowerKW: kw, HeightDeg: heightDeg,
		Sunspots: sunspots, CoastalTerminals: coastal}
	s, err := propagation.NightSkyWave(sp)
	if err != nil {
		return nil, nil, skyUsage(err)
	}
	out := &skywaveJSON{KHz: khz, KW: kw, Km: round4(s.DistKm), GeomagLatDeg: round4(s.GeomagLatDeg),
		SlantKm: round4(s.SlantKm), TakeoffDeg: round4(s.TakeoffDeg), GainDB: round4(s.GainDB), KR: round4(s.KR),
		PolLossDB: round4(s.PolLossDB), SeaGainDB: round4(s.SeaGainDB), SolarLossDB: round4(s.SolarLossDB),
		MedianDBuVm: round4(s.MedianDBuVm), DecileDBuVm: round4(s.DecileDBuVm), VerticalWireCorr: round4(s.ReceiveCorrDB)}
	if set["at"] {
		t, dateOnly, err := propagation.ParseTime(at)
		if err != nil || dateOnly {
			return nil, nil, usagef("--at %q: want an RFC 3339 instant, e.g. 2025-01-15T22:00:00Z", at)
		}
		hl, err := propagation.HourlyLossDB(t, tx, rx)
		if err != nil {
			return nil, nil, skyUsage(err)
		}
		loss, e := round4(hl.LossDB), round4(s.MedianDBuVm-hl.LossDB)
		elev, hss := round4(hl.SunElevMidDeg), round4(hl.HoursAfterSunset)
		out.At = t.UTC().Format(time.RFC3339)
		out.HourlyLossDB, out.EDBuVm, out.SunElevMidDeg, out.HoursAfterSunset = &loss, &e, &elev, &hss
	}
	return out, s.Warnings, nil
}

// skyUsage names the flag behind a propagation input error.
func skyUsage(err error) error {
	names := map[string]string{"frequency": "--khz", "power": "--kw", "antenna height": "--height-deg",
		"sunspot number": "--sunspots", "coastal terminals": "--coastal", "distance": "--from/--to",
		"time": "--at", "date": "--at"}
	return asUsageWith(err, names)
}
