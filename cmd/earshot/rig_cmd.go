package main

import (
	"errors"
	"flag"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"
	"text/tabwriter"

	"earshot/propagation"
	"earshot/receiver"
)

const rigSynopsis = `--khz F [--field-dbuvm E] [rig flags] [--json]

The receiving chain stage by stage at one frequency: antenna impedance,
the loading needed to tune it, the loading-coil turns, the tuned circuit's
taps, loaded Q and bandwidth, the detector, the sound level in the phones,
and the weakest field this rig makes audible. Safety: keep outdoor wires
clear of power lines, disconnect and ground them in storms, and follow local
electrical codes.`

// rigFlags registers the flags that describe a rig, with the defaults of
// receiver.DefaultRigSpec, and returns the spec they fill.
func rigFlags(fs *flag.FlagSet) *receiver.RigSpec {
	s := receiver.DefaultRigSpec()
	fs.StringVar(&s.Kind, "antenna", s.Kind, "antenna: inverted-l, t or vertical")
	fs.Float64Var(&s.WireM, "wire-m", s.WireM, "horizontal wire length, m (0–1000; 0 for a vertical)")
	fs.Float64Var(&s.HeightM, "height-m", s.HeightM, "height of the wire, m (0.5–300)")
	fs.Float64Var(&s.DownleadM, "downlead-m", s.DownleadM, "down-lead length, m (0.5 … 2×height)")
	fs.Float64Var(&s.WireMm, "wire-mm", s.WireMm, "wire diameter, mm (0.1–10)")
	fs.Func("wire-awg", "wire gauge, AWG (0–40), instead of --wire-mm", func(v string) error {
		n, err := strconv.Atoi(v)
		if err != nil {
			return fmt.Errorf("want a whole gauge from 0 to 40")
		}
		s.WireMm, s.WireAWG = 0, n
		return nil
	})
	fs.Float64Var(&s.AntennaTap, "antenna-tap", 0, "antenna tap, fraction of the tank winding (0 = best for weak signals)")
	fs.Float64Var(&s.DetectorTap, "detector-tap", 0, "detector tap, fraction of the tank winding (0 = best for weak signals)")
	fs.Float64Var(&s.CouplingK, "coupling-k", 0, "loosely coupled antenna coil: coupling coefficient (0–1) instead of --antenna-tap")
	fs.Float64Var(&s.PrimaryUH, "primary-uh", 20, "loosely coupled antenna coil: its inductance, µH")
	fs.StringVar(&s.GroundSystem, "ground-system", s.GroundSystem, "ground: "+groundSystemNames())
	fs.Float64Var(&s.GroundOhm, "ground-ohm", 0, "measured ground loss instead of --ground-system, Ω")
	fs.Float64Var(&s.TankUH, "tank-uh", s.TankUH, "tuned-circuit coil, µH")
	fs.StringVar(&s.Diode, "diode", s.Diode, "detector diode: "+diodeNames())
	fs.StringVar(&s.Phones, "phones", s.Phones, "phones: "+phonesNames())
	fs.Float64Var(&s.AmpDB, "amp-db", 0, "audio amplifier voltage gain, dB (0 = none; 0–80)")
	fs.Float64Var(&s.AmpOhm, "amp-ohm", s.AmpOhm, "amplifier input resistance, Ω")
	fs.Float64Var(&s.AmpNoiseUV, "amp-noise-uv", s.AmpNoiseUV, "amplifier equivalent input noise, µV rms")
	fs.StringVar(&s.Noise, "noise", s.Noise, "man-made noise (ITU-R P.372): "+noiseNames())
	fs.Float64Var(&s.Modulation, "modulation", receiver.DefaultModulation, "AM modulation depth (0–1)")
	return &s
}

// nameList joins the names of a preset list for flag help.
func nameList[T any](items []T, name func(T) string) string {
	var n []string
	for _, it := range items {
		n = append(n, name(it))
	}
	return strings.Join(n, ", ")
}

func groundSystemNames() string {
	return nameList(receiver.GroundSystems(), func(g receiver.GroundSystem) string { return g.Name })
}

func diodeNames() string {
	return nameList(receiver.DiodePresets(), func(d receiver.Diode) string { return d.Name })
}

func phonesNames() string {
	return nameList(receiver.PhonesPresets(), func(p receiver.Phones) string { return p.Name })
}

func noiseNames() string {
	return nameList(receiver.NoiseEnvs(), func(e receiver.NoiseEnv) string { return e.Name })
}

// buildRig checks the named parts of a spec, naming the flag at fault,
// then builds the rig.
func buildRig(s *receiver.RigSpec) (receiver.Rig, error) {
	checks := []struct {
		flag string
		err  error
	}{
		{"--antenna", func() error { _, err := receiver.ParseAntennaKind(s.Kind); return err }()},
		{"--ground-system", func() error { _, err := receiver.GroundSystemByName(s.GroundSystem); return err }()},
		{"--diode", func() error { _, err := receiver.DiodeByName(s.Diode); return err }()},
		{"--phones", func() error { _, err := receiver.PhonesByName(s.Phones); return err }()},
		{"--noise", func() error { _, err := receiver.NoiseEnvByName(s.Noise); return err }()},
	}
	for _, c := range checks {
		if c.err != nil {
			return receiver.Rig{}, usagef("%s: %s", c.flag, trimPkg(c.err))
		}
	}
	r, err := s.Build()
	if err != nil {
		return r, asUsageWith(err, rigFlagNames)
	}
	return r, nil
}

// rigFlagNames maps receiver input fields to the rig flags.
var rigFlagNames = map[string]string{
	"wire length": "--wire-m", "height": "--height-m", "down-lead": "--downlead-m", "wire diameter": "--wire-mm",
	"ground loss": "--ground-ohm", "frequency": "--khz", "field": "--field-dbuvm", "amplifier gain": "--amp-db",
	"amplifier input resistance": "--amp-ohm", "amplifier noise": "--amp-noise-uv", "modulation": "--modulation",
	"inductance": "--tank-uh", "tank inductance": "--tank-uh", "antenna kind": "--antenna",
	"AWG": "--wire-awg", "antenna tap": "--antenna-tap", "detector tap": "--detector-tap",
	"coupling coefficient": "--coupling-k", "primary inductance": "--primary-uh",
}

// selJSON is one point of the selectivity curve.
type selJSON struct {
	OffsetKHz float64 `json:"offset_khz"`
	DB        float64 `json:"db"`
}

// selectivityOffsetsKHz are the offsets of the printed selectivity curve:
// one and two channels of either raster, and further out.
var selectivityOffsetsKHz = []float64{-100, -50, -20, -18, -10, -9, 9, 10, 18, 20, 50, 100}

// rigJSON is the --json output of "earshot rig".
type rigJSON struct {
	KHz             float64   `json:"khz"`
	HeffM           float64   `json:"h_eff_m"`
	RradOhm         float64   `json:"r_rad_ohm"`
	RlossOhm        float64   `json:"r_loss_ohm"`
	XOhm            float64   `json:"x_ohm"`
	LoadingUH       float64   `json:"loading_uh"`
	LoadingTurns    float64   `json:"loading_turns"`
	SeriesPF        float64   `json:"series_pf"`
	TankQ           float64   `json:"tank_q"`
	TuningPF        float64   `json:"tuning_pf"`
	Tunable         bool      `json:"tunable"`
	AntennaTap      float64   `json:"antenna_tap"`
	DetectorTap     float64   `json:"detector_tap"`
	LoadedQ         float64   `json:"loaded_q"`
	BandwidthKHz    float64   `json:"bandwidth_khz"`
	Selectivity     []selJSON `json:"selectivity"`
	TransformerTo   float64   `json:"phones_transformer_ratio,omitempty"`
	MinAudibleDBuVm *float64  `json:"min_audible_dbuvm"`
	FieldDBuVm      *float64  `json:"field_dbuvm,omitempty"`
	VocUV           *float64  `json:"voc_uv,omitempty"`
	DetectorMV      *float64  `json:"detector_mv,omitempty"`
	AudioMV         *float64  `json:"audio_mv,omitempty"`
	SPL             *float64  `json:"spl_db,omitempty"`
	MarginDB        *float64  `json:"margin_db,omitempty"`
	SNRDB           *float64  `json:"snr_db,omitempty"`
	Audible         *bool     `json:"audible,omitempty"`
}

func runRig(args []string, stdout, stderr io.Writer) int {
	fs := newFlagSet("rig", rigSynopsis, stdout)
	spec := rigFlags(fs)
	khz := fs.Float64("khz", 0, "frequency, kHz (100–30000; the band 530–1700)")
	field := fs.Float64("field-dbuvm", 0, "also follow a carrier of this field, dB(µV/m)")
	asJSON := fs.Bool("json", false, "print JSON instead of a table")
	if done, status := parseFlags(fs, args, stderr); done {
		return status
	}
	set := setFlags(fs)
	if !set["khz"] {
		return report("rig", usagef("--khz is required (kHz)"), stderr)
	}
	if set["ground-ohm"] && *&spec.GroundOhm <= 0 {
		return report("rig", usagef("--ground-ohm must be > 0 Ω, got %g", spec.GroundOhm), stderr)
	}
	if !(*khz >= 100 && *khz <= 30000) {
		return report("rig", usagef("--khz must be between 100 and 30000 kHz, got %g", *khz), stderr)
	}
	rig, err := buildRig(spec)
	if err != nil {
		return report("rig", err, stderr)
	}
	f := propagation.KHz(*khz)
	e := *field
	if !set["field-dbuvm"] {
		e = 60
	}
	rc, err := rig.Receive(f, e)
	if err != nil {
		// A bad value is the caller's (exit 2); a rig that cannot be tuned
		// at f is an answer of sorts, a failure (exit 1).
		var ie *propagation.InputError
		if errors.As(err, &ie) {
			return report("rig", asUsageWith(err, rigFlagNames), stderr)
		}
		return report("rig", fmt.Errorf("%s", trimPkg(err)), stderr)
	}
	out := rigJSON{KHz: *khz, HeffM: round4(rc.HeffM), RradOhm: round4(rc.RradOhm), RlossOhm: round4(rc.RlossOhm),
		XOhm: round4(rc.XOhm), LoadingUH: round4(rc.LoadingUH), LoadingTurns: math.Round(rc.LoadingTurns*10) / 10,
		SeriesPF: round4(rc.SeriesPF), TankQ: round4(rc.TankQ), TuningPF: round4(rc.Tank.TuningPF), Tunable: rc.Tunable,
		AntennaTap: round4(rc.AntennaTap), DetectorTap: round4(rc.DetectorTap), LoadedQ: round4(rc.Tank.LoadedQ),
		BandwidthKHz: round4(rc.Tank.BandwidthKHz), TransformerTo: round4(rig.Phones.TransformerRatio)}
	for _, off := range selectivityOffsetsKHz {
		if g := *khz + off; g > 0 {
			out.Selectivity = append(out.Selectivity, selJSON{off, math.Round(rc.SelectivityDB(propagation.KHz(g))*100) / 100})
		}
	}
	if m, err := rig.MinAudibleDBuVm(f); err == nil {
		m = math.Round(m*100) / 100
		out.MinAudibleDBuVm = &m
	} else {
		fmt.Fprintf(stderr, "earshot rig: warning: %s\n", strings.TrimPrefix(err.Error(), "receiver: "))
	}
	if set["field-dbuvm"] {
		v := func(x float64) *float64 { y := round4(x); return &y }
		out.FieldDBuVm, out.VocUV, out.DetectorMV, out.AudioMV = v(e), v(rc.VocUV), v(rc.DetectorMV), v(rc.AudioMV)
		out.SPL, out.MarginDB, out.SNRDB, out.Audible = v(rc.SPL), v(rc.MarginDB), v(rc.SNRDB), &rc.Audible
	}
	if *asJSON {
		return emitJSON("rig", out, stdout, stderr)
	}
	printRig(stdout, spec, rig, rc, out, set["field-dbuvm"])
	return exitOK
}

func printRig(w io.Writer, s *receiver.RigSpec, rig receiver.Rig, rc receiver.Reception, out rigJSON, withField bool) {
	fmt.Fprintf(w, "Receiving chain at %g kHz: %s, %g m wire %g m up, %g m down-lead, %.2f mm; ground %s (%.0f Ω)\n",
		out.KHz, s.Kind, s.WireM, s.HeightM, rig.Antenna.DownleadM, rig.Antenna.WireDiameterMm, rig.Antenna.Ground.Name, rig.Antenna.Ground.LossOhm)
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	row := func(stage, what, val, unit string) { fmt.Fprintf(tw, "  %s\t%s\t%s\t%s\n", stage, what, val, unit) }
	row("antenna", "effective height", f2(rc.HeffM), "m")
	row("", "radiation resistance", fmt.Sprintf("%.3f", rc.RradOhm), "Ω")
	row("", "loss resistance (ground, wire, coil)", f2(rc.RlossOhm), "Ω")
	row("", "reactance", f2(rc.XOhm), "Ω")
	if rc.LoadingUH > 0 {
		row("loading", "series loading coil", f2(rc.LoadingUH), "µH")
		if rc.LoadingTurns > 0 {
			row("", fmt.Sprintf("close-wound on %g mm form, AWG %d", s.LoadingFormMm, s.LoadingAWG), fmt.Sprintf("%.1f", rc.LoadingTurns), "turns")
		}
		row("", "loading coil Q", fmt.Sprintf("%.0f", rc.LoadingQ), "")
	} else {
		row("loading", "none: the wire is inductive; series capacitor", fmt.Sprintf("%.0f", rc.SeriesPF), "pF")
	}
	row("tuned circuit", "coil / unloaded Q", fmt.Sprintf("%g µH / %.0f", s.TankUH, rc.TankQ), "")
	tun := "tuning capacitance"
	if !rc.Tunable {
		tun += " (OUT OF THE CAPACITOR'S RANGE)"
	}
	row("", tun, f2(rc.Tank.TuningPF), "pF")
	row("", "antenna tap / detector tap", fmt.Sprintf("%.3f / %.3f", rc.AntennaTap, rc.DetectorTap), "of the winding")
	row("", "loaded Q", fmt.Sprintf("%.1f", rc.Tank.LoadedQ), "")
	row("", "bandwidth (−3 dB)", f2(rc.Tank.BandwidthKHz), "kHz")
	var sel []string
	for _, p := range out.Selectivity {
		if p.OffsetKHz > 0 {
			sel = append(sel, fmt.Sprintf("%+g kHz %.1f", p.OffsetKHz, p.DB))
		}
	}
	row("", "selectivity (dB at offset)", strings.Join(sel, ", "), "dB")
	row("detector", fmt.Sprintf("%s, weak-signal input resistance", rig.Diode.Name), fmt.Sprintf("%.0f", rc.DetectorWeakOhm), "Ω")
	if rig.Phones.TransformerRatio > 0 {
		row("phones", fmt.Sprintf("audio transformer for %s", rig.Phones.Name), fmt.Sprintf("%.1f:1", rig.Phones.TransformerRatio), "turns ratio")
	}
	if withField {
		row("signal", "field", f2(rc.FieldDBuVm), "dB(µV/m)")
		row("", "open-circuit antenna voltage", f2(rc.VocUV), "µV rms")
		row("", "available power", fmt.Sprintf("%.3g", rc.AvailablePW), "pW")
		row("", "RF at the detector", fmt.Sprintf("%.4g", rc.DetectorMV), "mV peak")
		row("", "audio at the phones", fmt.Sprintf("%.4g", rc.AudioMV), "mV rms")
		row("phones", rig.Phones.Name+" sound level", f2(rc.SPL), "dB SPL")
		row("", "margin over hearing threshold + allowance", f2(rc.MarginDB), "dB")
		row("noise", rig.Noise.Name+" man-made noise field", f2(rc.NoiseDBuVm), "dB(µV/m)")
		row("", "audio S/N", f2(rc.SNRDB), "dB")
		verdict := "audible"
		if !rc.Audible {
			verdict = "not audible (limited by " + rc.Limit + ")"
		}
		row("verdict", "", verdict, "")
	}
	if out.MinAudibleDBuVm != nil {
		row("sensitivity", "weakest audible field", f2(*out.MinAudibleDBuVm), "dB(µV/m)")
	}
	tw.Flush()
}
