package main

import (
	"encoding/csv"
	"flag"
	"fmt"
	"io"
	"math"
	"os"
	"sort"
	"strings"
	"text/tabwriter"
	"time"

	"earshot/assets"
	"earshot/propagation"
	"earshot/receiver"
	"earshot/receiver/plan"
)

// worldFlags are the flags that choose the scenario, the spot and the time.
type worldFlags struct {
	scenario, stations string
	landGround         string
	spots              multiFlag
	lat, lon           float64
	at                 string
	spec               *receiver.RigSpec
	fs                 *flag.FlagSet
}

// multiFlag collects a repeated string flag.
type multiFlag []string

func (m *multiFlag) String() string     { return strings.Join(*m, ",") }
func (m *multiFlag) Set(v string) error { *m = append(*m, v); return nil }

func addWorldFlags(fs *flag.FlagSet, withSpot bool) *worldFlags {
	w := &worldFlags{fs: fs}
	fs.StringVar(&w.scenario, "scenario", "", "scenario JSON file (default: the embedded, invented demo)")
	fs.StringVar(&w.stations, "stations", "", "CSV of your own stations (id,name,khz,kw,lat,lon[,kw_night,height_deg]) instead of a scenario")
	fs.StringVar(&w.landGround, "land-ground", "", "ground of land outside the scenario's regions: a standard name or SIGMA/EPSR (default the scenario's, usually land)")
	if withSpot {
		fs.Var(&w.spots, "spot", "listening spot by name (default: the scenario's first)")
		fs.Float64Var(&w.lat, "at-lat", 0, "listening spot latitude, degrees, instead of --spot")
		fs.Float64Var(&w.lon, "at-lon", 0, "listening spot longitude, degrees")
	}
	fs.StringVar(&w.at, "time", "", "instant, RFC 3339 (default now)")
	w.spec = rigFlags(fs)
	return w
}

// loaded is a scenario turned into a planner.
type loaded struct {
	sc      *assets.Scenario
	planner *plan.Planner
	ground  propagation.GroundMap
	spots   []plan.Spot
	at      time.Time
}

// load reads the scenario (or stations), resolves spots and time, and
// builds the planner with the rig flags applied over the scenario's rig.
func (w *worldFlags) load(set map[string]bool) (*loaded, error) {
	var sc *assets.Scenario
	var err error
	switch {
	case w.scenario != "" && w.stations != "":
		return nil, usagef("give --scenario or --stations, not both")
	case w.scenario != "":
		data, err := os.ReadFile(w.scenario)
		if err != nil {
			return nil, fmt.Errorf("%s", trimPkg(err))
		}
		if sc, err = assets.ParseScenario(data, w.scenario); err != nil {
			return nil, &usageError{trimPkg(err)}
		}
	case w.stations != "":
		f, err := os.Open(w.stations)
		if err != nil {
			return nil, fmt.Errorf("%s", trimPkg(err))
		}
		defer f.Close()
		st, err := assets.ParseStationsCSV(f, w.stations)
		if err != nil {
			return nil, &usageError{trimPkg(err)}
		}
		if !set["at-lat"] || !set["at-lon"] {
			return nil, usagef("--stations needs the listening spot: --at-lat and --at-lon")
		}
		pl, err := propagation.NewPlace(w.lat, w.lon)
		if err != nil {
			return nil, asUsageWith(err, map[string]string{"latitude": "--at-lat", "longitude": "--at-lon"})
		}
		sc = assets.ScenarioFromStations(st, plan.Spot{Name: "here", Place: pl})
	default:
		if sc, err = assets.Demo(); err != nil {
			return nil, err
		}
	}
	if set["land-ground"] {
		if _, err := propagation.ParseGround(w.landGround); err != nil {
			return nil, usagef("--land-ground: %s", trimPkg(err))
		}
		sc.LandGround = w.landGround
	}
	l := &loaded{sc: sc}
	switch {
	case set["at-lat"] || set["at-lon"]:
		if !set["at-lat"] || !set["at-lon"] {
			return nil, usagef("--at-lat and --at-lon go together")
		}
		pl, err := propagation.NewPlace(w.lat, w.lon)
		if err != nil {
			return nil, asUsageWith(err, map[string]string{"latitude": "--at-lat", "longitude": "--at-lon"})
		}
		l.spots = []plan.Spot{{Name: fmt.Sprintf("%.4f,%.4f", w.lat, w.lon), Place: pl}}
	case len(w.spots) > 0:
		for _, name := range w.spots {
			s, err := sc.SpotByName(name)
			if err != nil {
				return nil, usagef("--spot: %s", trimPkg(err))
			}
			l.spots = append(l.spots, s)
		}
	default:
		l.spots = sc.Spots()[:1]
	}
	l.at = time.Now().UTC()
	if set["time"] {
		t, dateOnly, err := propagation.ParseTime(w.at)
		if err != nil || dateOnly {
			return nil, usagef("--time %q: want an RFC 3339 instant, e.g. 2025-01-15T22:00:00Z", w.at)
		}
		l.at = t
	}
	spec := sc.RigSpec()
	w.fs.Visit(func(f *flag.Flag) { applyRigFlag(&spec, w.spec, f.Name) })
	if _, err := buildRig(&spec); err != nil {
		return nil, err
	}
	mask, err := assets.LoadLandMask()
	if err != nil {
		return nil, err
	}
	world := sc.World(mask.IsLand)
	l.ground = world.Ground
	if l.planner, err = plan.NewPlanner(world, spec); err != nil {
		return nil, err
	}
	return l, nil
}

// applyRigFlag copies the rig field set by flag name from the flags' spec
// to the scenario's.
func applyRigFlag(dst, src *receiver.RigSpec, name string) {
	switch name {
	case "antenna":
		dst.Kind = src.Kind
	case "wire-m":
		dst.WireM = src.WireM
	case "height-m":
		dst.HeightM = src.HeightM
	case "downlead-m":
		dst.DownleadM = src.DownleadM
	case "wire-mm", "wire-awg":
		dst.WireMm, dst.WireAWG = src.WireMm, src.WireAWG
	case "ground-system":
		dst.GroundSystem = src.GroundSystem
	case "ground-ohm":
		dst.GroundOhm = src.GroundOhm
	case "tank-uh":
		dst.TankUH = src.TankUH
	case "diode":
		dst.Diode = src.Diode
	case "phones":
		dst.Phones = src.Phones
	case "amp-db":
		dst.AmpDB = src.AmpDB
	case "amp-ohm":
		dst.AmpOhm = src.AmpOhm
	case "amp-noise-uv":
		dst.AmpNoiseUV = src.AmpNoiseUV
	case "noise":
		dst.Noise = src.Noise
	case "modulation":
		dst.Modulation = src.Modulation
	case "antenna-tap":
		dst.AntennaTap = src.AntennaTap
	case "detector-tap":
		dst.DetectorTap = src.DetectorTap
	case "coupling-k":
		dst.CouplingK = src.CouplingK
	case "primary-uh":
		dst.PrimaryUH = src.PrimaryUH
	}
}

const predictSynopsis = `[--spot NAME | --at-lat LAT --at-lon LON] [--scenario FILE | --stations FILE.csv]
       [rig flags as in "earshot rig"] [--time RFC3339] [--json | --csv]

What the rig hears at the spot at that time, station by station, best
first: distance, ground wave, night sky wave, combined field, margin over
the rig's weakest audible field, chance of hearing over nights, which
station swamps it and the wave trap that would cure it. Without
--scenario the embedded demo (an invented region) is used.`

// heardJSON is one station of "earshot predict --json".
type heardJSON struct {
	ID         string    `json:"id"`
	Name       string    `json:"name"`
	KHz        float64   `json:"khz"`
	Km         float64   `json:"km"`
	BearingDeg float64   `json:"bearing_deg"`
	GroundDB   float64   `json:"ground_dbuvm"`
	SkyDB      *float64  `json:"sky_dbuvm"`
	EDB        float64   `json:"e_dbuvm"`
	AboveMinDB float64   `json:"above_min_db"`
	MarginDB   float64   `json:"margin_db"`
	SNRDB      float64   `json:"snr_db"`
	Chance     float64   `json:"chance"`
	Audible    bool      `json:"audible"`
	Fading     bool      `json:"fading"`
	MaskedBy   *string   `json:"masked_by"`
	Trap       *trapJSON `json:"trap"`
	Verdict    string    `json:"verdict"`
}

type predictJSON struct {
	Spot     string      `json:"spot"`
	Lat      float64     `json:"lat"`
	Lon      float64     `json:"lon"`
	At       string      `json:"at"`
	Night    bool        `json:"night"`
	Audible  int         `json:"audible"`
	Stations []heardJSON `json:"stations"`
}

func predictionJSON(pr plan.Prediction) predictJSON {
	out := predictJSON{Spot: pr.Spot.Name, Lat: pr.Spot.Place.LatDeg(), Lon: pr.Spot.Place.LonDeg(),
		At: pr.At.UTC().Format(time.RFC3339), Night: pr.Night, Audible: pr.Audible(), Stations: []heardJSON{}}
	for _, h := range pr.Heard {
		j := heardJSON{ID: h.Station.ID, Name: h.Station.Name, KHz: float64(h.Station.KHz), Km: round4(h.DistKm),
			BearingDeg: math.Round(h.BearingDeg*10) / 10, GroundDB: round4(h.GroundDB), EDB: round4(h.FieldDB),
			AboveMinDB: round4(finiteOr(h.DetectorDB, -999)), MarginDB: round4(h.MarginDB), SNRDB: round4(h.SNRDB),
			Chance: math.Round(h.Chance*1000) / 1000, Audible: h.Audible, Fading: h.Fading, Verdict: h.Verdict}
		if h.SkyDB != nil {
			v := round4(*h.SkyDB)
			j.SkyDB = &v
		}
		if h.MaskedBy != nil {
			id := h.MaskedBy.ID
			j.MaskedBy = &id
		}
		if h.Trap != nil {
			j.Trap = &trapJSON{KHz: float64(h.Trap.AgainstKHz), WantedKHz: float64(h.Station.KHz), Kind: h.Trap.Kind,
				InductanceUH: round4(h.Trap.InductanceUH), CapacitancPF: round4(h.Trap.CapacitancPF), Q: 150, NeedDB: round4(h.Trap.NeedDB),
				NotchDB: round4(h.Trap.NotchDB), WantedLossDB: round4(h.Trap.WantedLossDB), Fixes: h.Trap.Fixes, Reason: h.Trap.Advice}
		}
		out.Stations = append(out.Stations, j)
	}
	return out
}

func finiteOr(v, alt float64) float64 {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return alt
	}
	return v
}

func runPredict(args []string, stdout, stderr io.Writer) int {
	fs := newFlagSet("predict", predictSynopsis, stdout)
	w := addWorldFlags(fs, true)
	asJSON := fs.Bool("json", false, "print JSON")
	asCSV := fs.Bool("csv", false, "print CSV")
	if done, status := parseFlags(fs, args, stderr); done {
		return status
	}
	set := setFlags(fs)
	if *asJSON && *asCSV {
		return report("predict", usagef("give --json or --csv, not both"), stderr)
	}
	if len(w.spots) > 1 {
		return report("predict", usagef("--spot once (use \"earshot compare\" for several)"), stderr)
	}
	l, err := w.load(set)
	if err != nil {
		return report("predict", err, stderr)
	}
	pr, err := l.planner.Predict(l.spots[0], l.at)
	if err != nil {
		return report("predict", err, stderr)
	}
	out := predictionJSON(pr)
	switch {
	case *asJSON:
		return emitJSON("predict", out, stdout, stderr)
	case *asCSV:
		cw := csv.NewWriter(stdout)
		cw.Write([]string{"id", "name", "khz", "km", "ground_dbuvm", "sky_dbuvm", "e_dbuvm", "margin_db", "chance", "audible", "masked_by", "verdict"})
		for _, h := range out.Stations {
			sky, mb := "", ""
			if h.SkyDB != nil {
				sky = fmt.Sprintf("%.2f", *h.SkyDB)
			}
			if h.MaskedBy != nil {
				mb = *h.MaskedBy
			}
			cw.Write([]string{h.ID, h.Name, fmt.Sprint(h.KHz), fmt.Sprintf("%.1f", h.Km), fmt.Sprintf("%.2f", h.GroundDB), sky,
				fmt.Sprintf("%.2f", h.EDB), fmt.Sprintf("%.2f", h.MarginDB), fmt.Sprintf("%.3f", h.Chance), fmt.Sprint(h.Audible), mb, h.Verdict})
		}
		cw.Flush()
		return exitOK
	}
	printPrediction(stdout, l, pr)
	return exitOK
}

func printPrediction(w io.Writer, l *loaded, pr plan.Prediction) {
	when := "day"
	if pr.Night {
		when = "night"
	}
	fmt.Fprintf(w, "%s — spot %q (%.3f°, %.3f°), %s UTC (%s)\n", l.sc.Name, pr.Spot.Name, pr.Spot.Place.LatDeg(), pr.Spot.Place.LonDeg(),
		pr.At.UTC().Format("2006-01-02 15:04"), when)
	r := l.planner.Rig()
	fmt.Fprintf(w, "Rig: %s, %g m wire %g m up, ground %s, %s diode, %s phones; %d of %d stations audible.\n\n",
		r.Antenna.Kind, r.Antenna.TopM, r.Antenna.HeightM, r.Antenna.Ground.Name, r.Diode.Name, r.Phones.Name, pr.Audible(), len(pr.Heard))
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	fmt.Fprintln(tw, "station\tkHz\tkm\tground\tsky\tfield\tmargin\tchance\tverdict")
	for _, h := range pr.Heard {
		sky := "—"
		if h.SkyDB != nil {
			sky = fmt.Sprintf("%.1f", *h.SkyDB)
		}
		v := h.Verdict
		if h.Trap != nil && h.Trap.Fixes {
			v += fmt.Sprintf(" (%.0f µH + %.0f pF to ground in the antenna lead)", h.Trap.InductanceUH, h.Trap.CapacitancPF)
		}
		fmt.Fprintf(tw, "%s %s\t%g\t%.0f\t%.1f\t%s\t%.1f\t%+.1f\t%.0f%%\t%s\n", h.Station.ID, h.Station.Name, float64(h.Station.KHz), h.DistKm,
			h.GroundDB, sky, h.FieldDB, h.MarginDB, 100*h.Chance, v)
	}
	tw.Flush()
	fmt.Fprintln(w, "\nFields in dB(µV/m); margin over the threshold of hearing plus a listening allowance, in dB.")
	fmt.Fprintln(w, "Safety: keep outdoor wires clear of power lines, disconnect and ground them in storms, follow local codes.")
}

const compareSynopsis = `--spot A --spot B [...] [--scenario FILE] [rig flags] [--time RFC3339] [--json]

Stations × spots: each station's margin at each spot, and how many are
audible at each.`

func runCompare(args []string, stdout, stderr io.Writer) int {
	fs := newFlagSet("compare", compareSynopsis, stdout)
	w := addWorldFlags(fs, true)
	asJSON := fs.Bool("json", false, "print JSON")
	if done, status := parseFlags(fs, args, stderr); done {
		return status
	}
	set := setFlags(fs)
	if len(w.spots) == 0 {
		// All the scenario's spots.
		w.spots = nil
	}
	l, err := w.load(set)
	if err != nil {
		return report("compare", err, stderr)
	}
	spots := l.spots
	if len(w.spots) == 0 && !set["at-lat"] {
		spots = l.sc.Spots()
	}
	prs, err := l.planner.Compare(spots, l.at)
	if err != nil {
		return report("compare", err, stderr)
	}
	if *asJSON {
		var out []predictJSON
		for _, pr := range prs {
			out = append(out, predictionJSON(pr))
		}
		return emitJSON("compare", out, stdout, stderr)
	}
	margin := make([]map[string]plan.Heard, len(prs))
	for i, pr := range prs {
		margin[i] = map[string]plan.Heard{}
		for _, h := range pr.Heard {
			margin[i][h.Station.ID] = h
		}
	}
	tw := tabwriter.NewWriter(stdout, 0, 0, 2, ' ', tabwriter.AlignRight)
	fmt.Fprint(tw, "station\tkHz\t")
	for _, pr := range prs {
		fmt.Fprintf(tw, "%s\t", pr.Spot.Name)
	}
	fmt.Fprintln(tw)
	stations := append([]plan.Station(nil), l.planner.Stations()...)
	sort.Slice(stations, func(i, j int) bool { return stations[i].KHz < stations[j].KHz })
	for _, s := range stations {
		fmt.Fprintf(tw, "%s\t%g\t", s.ID, float64(s.KHz))
		for i := range prs {
			h := margin[i][s.ID]
			mark := " "
			if h.Audible {
				mark = "*"
			}
			fmt.Fprintf(tw, "%+.1f%s\t", h.MarginDB, mark)
		}
		fmt.Fprintln(tw)
	}
	fmt.Fprint(tw, "audible\t\t")
	for _, pr := range prs {
		fmt.Fprintf(tw, "%d\t", pr.Audible())
	}
	fmt.Fprintln(tw)
	tw.Flush()
	fmt.Fprintln(stdout, "Margins in dB; * marks an audible station.")
	return exitOK
}

// progressTo returns a progress callback printing to stderr after a
// second has passed, and a function to finish the line.
func progressTo(stderr io.Writer, what string) (plan.Progress, func()) {
	start := time.Now()
	shown := false
	var last time.Time
	return func(done, total int) {
			now := time.Now()
			if now.Sub(start) < time.Second || (now.Sub(last) < 250*time.Millisecond && done < total) {
				return
			}
			last, shown = now, true
			fmt.Fprintf(stderr, "\rearshot: %s %3.0f %%", what, 100*float64(done)/float64(total))
		}, func() {
			if shown {
				fmt.Fprintln(stderr)
			}
		}
}
