package main

import (
	"errors"
	"fmt"
	"io"
	"math"
	"strings"
	"text/tabwriter"

	"earshot/propagation"
)

const groundwaveSynopsis = `--khz F (--sigma S --epsr E | --ground NAME) --km D1,D2,…
                          | --khz F --path "KM:GROUND,KM:GROUND,…" [--km D1,…]
       [--kw P] [--height-deg G] [--json]

Ground-wave field strength (vertical field at ground level, dB(µV/m)) by the
method of Rec. ITU-R P.368: Sommerfeld–Norton flat earth near the
transmitter, the spherical-earth residue series beyond, Millington's method
for mixed paths. GROUND is a standard name or SIGMA/EPSR (e.g. 0.01/15).
Standard grounds:
%s`

func groundList() string {
	var b strings.Builder
	for _, g := range propagation.GroundTypes() {
		fmt.Fprintf(&b, "  %-17s σ %-7g S/m  εr %-3g  %s\n", g.Name, g.SigmaSPerM, g.EpsR, g.Description)
	}
	return b.String()
}

// groundwaveJSON is the --json output.
type groundwaveJSON struct {
	KHz    float64     `json:"khz"`
	KW     float64     `json:"kw"`
	Sigma  *float64    `json:"sigma,omitempty"`
	EpsR   *float64    `json:"epsr,omitempty"`
	Points []pointJSON `json:"points"`
}

type pointJSON struct {
	Km     float64 `json:"km"`
	EDBuVm float64 `json:"e_dbuvm"`
}

// flagNames maps a propagation input field to the flag that sets it.
var flagNames = map[string]string{
	"frequency": "--khz", "distance": "--km", "sigma": "--sigma", "epsr": "--epsr",
	"power": "--kw", "antenna height": "--height-deg", "gain": "--height-deg",
}

// asUsage turns a propagation.InputError into a usage error naming the flag.
func asUsage(err error) error { return asUsageWith(err, flagNames) }

// asUsageWith is asUsage with a given field-to-flag table.
func asUsageWith(err error, names map[string]string) error {
	var ie *propagation.InputError
	if errors.As(err, &ie) {
		if name, ok := names[ie.Field]; ok {
			unit := ""
			if ie.Unit != "" {
				unit = " " + ie.Unit
			}
			return usagef("%s must be %s%s, got %g", name, ie.Want, unit, ie.Value)
		}
	}
	return &usageError{trimPkg(err)}
}

func runGroundwave(args []string, stdout, stderr io.Writer) int {
	fs := newFlagSet("groundwave", fmt.Sprintf(groundwaveSynopsis, groundList()), stdout)
	khz := fs.Float64("khz", 0, "frequency, kHz (1–100000; validated 10–30000)")
	sigma := fs.Float64("sigma", 0, "ground conductivity, S/m (> 0)")
	epsr := fs.Float64("epsr", 0, "ground relative permittivity (>= 1)")
	ground := fs.String("ground", "", "standard ground name instead of --sigma/--epsr")
	kmList := fs.String("km", "", "distances along the ground, km, comma-separated (0 < d <= 20000)")
	pathSpec := fs.String("path", "", "mixed path from the transmitter, KM:GROUND,… (field at its end)")
	kw := fs.Float64("kw", 1, "transmitter power, kW (> 0)")
	heightDeg := fs.Float64("height-deg", 0, "electrical height of the transmitting monopole, degrees (0 = short monopole; else 0 < G <= 270)")
	asJSON := fs.Bool("json", false, "print JSON instead of a table")
	if done, status := parseFlags(fs, args, stderr); done {
		return status
	}
	set := setFlags(fs)

	out, warns, err := groundwave(set, *khz, *sigma, *epsr, *ground, *kmList, *pathSpec, *kw, *heightDeg)
	if err != nil {
		return report("groundwave", err, stderr)
	}
	for _, w := range warns {
		fmt.Fprintf(stderr, "earshot groundwave: warning: %s\n", w)
	}
	if *asJSON {
		return emitJSON("groundwave", out, stdout, stderr)
	}
	printGroundwaveTable(stdout, out, *ground, *pathSpec)
	return exitOK
}

// groundwave checks the flags and computes the result.
func groundwave(set map[string]bool, khz, sigma, epsr float64, ground, kmList, pathSpec string, kw, heightDeg float64) (*groundwaveJSON, []propagation.Warning, error) {
	if !set["khz"] {
		return nil, nil, usagef("--khz is required (1–100000 kHz)")
	}
	homog := set["sigma"] || set["epsr"] || set["ground"]
	switch {
	case set["path"] && homog:
		return nil, nil, usagef("--path cannot be combined with --sigma, --epsr or --ground")
	case !set["path"] && !homog:
		return nil, nil, usagef("give the ground: --sigma and --epsr, --ground NAME, or --path")
	case set["ground"] && (set["sigma"] || set["epsr"]):
		return nil, nil, usagef("--ground cannot be combined with --sigma or --epsr")
	case !set["path"] && !set["ground"] && !(set["sigma"] && set["epsr"]):
		return nil, nil, usagef("--sigma and --epsr must be given together")
	case !set["path"] && !set["km"]:
		return nil, nil, usagef("--km is required with a homogeneous ground (0 < d <= 20000 km)")
	}
	gain := 0.0
	if set["height-deg"] {
		var err error
		gain, err = propagation.MonopoleGainDB(heightDeg, 0)
		if err != nil {
			return nil, nil, asUsage(err)
		}
	}
	tx := propagation.Transmitter{Freq: propagation.KHz(khz), PowerKW: kw, GainDB: gain}
	if _, err := tx.Validate(); err != nil {
		return nil, nil, asUsage(err)
	}
	var dists []float64
	if set["km"] {
		var err error
		if dists, err = propagation.ParseKmList(kmList); err != nil {
			return nil, nil, asUsage(err)
		}
	}
	out := &groundwaveJSON{KHz: khz, KW: kw}
	var path propagation.Path
	if set["path"] {
		var err error
		if path, err = propagation.ParsePath(pathSpec); err != nil {
			return nil, nil, &usageError{strings.TrimPrefix(err.Error(), "propagation: ")}
		}
		total := path.LengthKm()
		if len(dists) == 0 {
			dists = []float64{total}
		}
		for _, d := range dists {
			if d > total*(1+1e-12) {
				return nil, nil, usagef("--km %g is beyond the end of --path (%g km)", d, total)
			}
		}
	} else {
		g := propagation.Ground{SigmaSPerM: sigma, EpsR: epsr}
		if set["ground"] {
			gt, err := propagation.GroundByName(ground)
			if err != nil {
				return nil, nil, usagef("--ground: %s", strings.TrimPrefix(err.Error(), "propagation: "))
			}
			g = gt.Ground
		}
		if err := g.Validate(); err != nil {
			return nil, nil, asUsage(err)
		}
		out.Sigma, out.EpsR = &g.SigmaSPerM, &g.EpsR
		path = propagation.Path{{LengthKm: math.MaxFloat64, Ground: g}}
	}

	var cache propagation.CurveCache
	var warns []propagation.Warning
	seen := map[string]bool{}
	for _, d := range dists {
		e, w, err := cache.PathFieldDBuVm(tx, path.Truncate(d))
		if err != nil {
			return nil, nil, err
		}
		for _, x := range w {
			if !seen[x.String()] {
				seen[x.String()] = true
				warns = append(warns, x)
			}
		}
		out.Points = append(out.Points, pointJSON{Km: d, EDBuVm: math.Round(e*1e4) / 1e4})
	}
	return out, warns, nil
}

func printGroundwaveTable(w io.Writer, out *groundwaveJSON, ground, pathSpec string) {
	switch {
	case pathSpec != "":
		fmt.Fprintf(w, "Ground wave, %g kHz, %g kW, mixed path %s (Millington)\n", out.KHz, out.KW, pathSpec)
	case ground != "":
		fmt.Fprintf(w, "Ground wave, %g kHz, %g kW, ground %s (σ %g S/m, εr %g)\n", out.KHz, out.KW, ground, *out.Sigma, *out.EpsR)
	default:
		fmt.Fprintf(w, "Ground wave, %g kHz, %g kW, σ %g S/m, εr %g\n", out.KHz, out.KW, *out.Sigma, *out.EpsR)
	}
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', tabwriter.AlignRight)
	fmt.Fprintln(tw, "km\tdB(µV/m)\tmV/m\t")
	for _, p := range out.Points {
		fmt.Fprintf(tw, "%g\t%.2f\t%s\t\n", p.Km, p.EDBuVm, fmtMilliVolts(p.EDBuVm))
	}
	tw.Flush()
}

// fmtMilliVolts formats a field in dB(µV/m) as mV/m with sensible digits.
func fmtMilliVolts(dBuVm float64) string {
	mv := propagation.MicroVoltsPerMetre(dBuVm) / 1e3
	switch {
	case mv >= 100:
		return fmt.Sprintf("%.0f", mv)
	case mv >= 0.001:
		return fmt.Sprintf("%.4g", mv)
	}
	return fmt.Sprintf("%.2e", mv)
}
