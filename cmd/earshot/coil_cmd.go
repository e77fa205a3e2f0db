package main

import (
	"fmt"
	"io"
	"math"

	"earshot/propagation"
	"earshot/receiver"
)

const coilSynopsis = `--form-mm D --awg N (--turns T | --uh L) [--pitch-mm P] [--khz F]
       [--cap-min-pf C1 --cap-max-pf C2 [--stray-pf S]] [--json]

A single-layer coil on a round form: its inductance (Nagaoka's current-sheet
formula with Rosa's round-wire correction), winding length, and its
resistance and Q at --khz (skin and proximity effect); or, with --uh, the
close-wound turns that give that inductance. With a variable capacitor, the
tuning range and whether it covers the medium-wave band (530–1700 kHz).`

type coilJSON struct {
	FormMm       float64 `json:"form_mm"`
	AWG          int     `json:"awg"`
	Turns        float64 `json:"turns"`
	InductanceUH float64 `json:"inductance_uh"`
	LengthMm     float64 `json:"length_mm"`
	KHz          float64 `json:"khz"`
	ResistanceOh float64 `json:"resistance_ohm"`
	Q            float64 `json:"q"`
	TuneMinKHz   float64 `json:"tune_min_khz,omitempty"`
	TuneMaxKHz   float64 `json:"tune_max_khz,omitempty"`
	CoversBand   *bool   `json:"covers_band,omitempty"`
}

func runCoil(args []string, stdout, stderr io.Writer) int {
	fs := newFlagSet("coil", coilSynopsis, stdout)
	form := fs.Float64("form-mm", 0, "form diameter, mm (1–500)")
	awg := fs.Int("awg", 0, "wire gauge, AWG (0–40), enamelled")
	turns := fs.Float64("turns", 0, "number of turns (1–2000)")
	uh := fs.Float64("uh", 0, "wanted inductance, µH (instead of --turns)")
	pitch := fs.Float64("pitch-mm", 0, "turn spacing, mm (0 = close-wound)")
	khz := fs.Float64("khz", 1000, "frequency for resistance and Q, kHz (1–30000)")
	capMin := fs.Float64("cap-min-pf", 0, "variable capacitor minimum, pF")
	capMax := fs.Float64("cap-max-pf", 0, "variable capacitor maximum, pF")
	stray := fs.Float64("stray-pf", 20, "stray capacitance across the coil, pF")
	asJSON := fs.Bool("json", false, "print JSON instead of text")
	if done, status := parseFlags(fs, args, stderr); done {
		return status
	}
	set := setFlags(fs)
	names := map[string]string{"minimum capacitance": "--cap-min-pf", "maximum capacitance": "--cap-max-pf", "stray capacitance": "--stray-pf", "form diameter": "--form-mm", "AWG": "--awg", "turns": "--turns", "pitch": "--pitch-mm", "inductance": "--uh"}
	switch {
	case !set["form-mm"] || !set["awg"]:
		return report("coil", usagef("--form-mm and --awg are required"), stderr)
	case set["turns"] == set["uh"]:
		return report("coil", usagef("give exactly one of --turns and --uh"), stderr)
	case set["cap-min-pf"] != set["cap-max-pf"]:
		return report("coil", usagef("--cap-min-pf and --cap-max-pf go together"), stderr)
	case !(*khz >= 1 && *khz <= 30000):
		return report("coil", usagef("--khz must be between 1 and 30000 kHz, got %g", *khz), stderr)
	}
	c := receiver.Coil{FormDiameterMm: *form, AWG: *awg, Turns: *turns, PitchMm: *pitch}
	if set["uh"] {
		if set["pitch-mm"] {
			return report("coil", usagef("--pitch-mm works with --turns only (--uh designs a close-wound coil)"), stderr)
		}
		var err error
		if c, err = receiver.CoilForInductance(*form, *awg, *uh); err != nil {
			return report("coil", asUsageWith(err, names), stderr)
		}
	}
	if err := c.Validate(); err != nil {
		return report("coil", asUsageWith(err, names), stderr)
	}
	f := propagation.KHz(*khz)
	out := coilJSON{FormMm: *form, AWG: *awg, Turns: c.Turns, InductanceUH: round4(c.InductanceUH()),
		LengthMm: round4(c.LengthMm()), KHz: *khz, ResistanceOh: round4(c.ResistanceOhm(f)), Q: math.Round(c.Q(f)*10) / 10}
	if set["cap-max-pf"] {
		tr, err := receiver.TuningRangeFor(c.InductanceUH(), *capMin, *capMax, *stray)
		if err != nil {
			return report("coil", asUsageWith(err, names), stderr)
		}
		covers := tr.Covers(530, 1700)
		out.TuneMinKHz, out.TuneMaxKHz, out.CoversBand = round4(float64(tr.MinKHz)), round4(float64(tr.MaxKHz)), &covers
	}
	if *asJSON {
		return emitJSON("coil", out, stdout, stderr)
	}
	fmt.Fprintf(stdout, "Coil: %.2f turns of AWG %d enamelled on a %g mm form\n", out.Turns, out.AWG, out.FormMm)
	fmt.Fprintf(stdout, "  inductance:      %.2f µH\n", out.InductanceUH)
	fmt.Fprintf(stdout, "  winding length:  %.1f mm\n", out.LengthMm)
	fmt.Fprintf(stdout, "  at %g kHz:       %.2f Ω, Q %.0f\n", out.KHz, out.ResistanceOh, out.Q)
	if out.CoversBand != nil {
		verdict := "does not cover 530–1700 kHz"
		if *out.CoversBand {
			verdict = "covers 530–1700 kHz"
		}
		fmt.Fprintf(stdout, "  tunes:           %.0f–%.0f kHz with %g–%g pF (+%g pF stray): %s\n", out.TuneMinKHz, out.TuneMaxKHz, *capMin, *capMax, *stray, verdict)
	}
	return exitOK
}
