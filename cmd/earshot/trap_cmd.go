package main

import (
	"fmt"
	"io"

	"earshot/propagation"
	"earshot/receiver"
)

const trapSynopsis = `--khz F --wanted-khz W [--kind series-shunt|parallel-series]
       [--have-uh L | --have-pf C] [--trap-q Q]
       [--need-db N | --unwanted-dbuvm U --wanted-dbuvm V] [rig flags] [--json]

A wave trap in the antenna lead against a strong station on --khz while
listening on --wanted-khz: the trap's other part for the coil (--have-uh) or
capacitor (--have-pf) you have, its notch depth in this rig, what it costs
the wanted station, and whether it solves the problem. The attenuation
needed comes from --need-db, or from the two fields and the set's own
selectivity (26 dB protection ratio, ITU-R BS.560-4).`

type trapJSON struct {
	KHz          float64 `json:"khz"`
	WantedKHz    float64 `json:"wanted_khz"`
	Kind         string  `json:"kind"`
	InductanceUH float64 `json:"inductance_uh"`
	CapacitancPF float64 `json:"capacitance_pf"`
	Q            float64 `json:"q"`
	NeedDB       float64 `json:"need_db"`
	NotchDB      float64 `json:"notch_db"`
	WantedLossDB float64 `json:"wanted_loss_db"`
	Fixes        bool    `json:"fixes"`
	Reason       string  `json:"reason"`
}

func runTrap(args []string, stdout, stderr io.Writer) int {
	fs := newFlagSet("trap", trapSynopsis, stdout)
	spec := rigFlags(fs)
	khz := fs.Float64("khz", 0, "frequency of the strong, unwanted station, kHz")
	wanted := fs.Float64("wanted-khz", 0, "frequency of the station you want, kHz")
	kindName := fs.String("kind", "series-shunt", "trap: series-shunt (to ground) or parallel-series (in the lead)")
	haveUH := fs.Float64("have-uh", 0, "the coil you have, µH")
	havePF := fs.Float64("have-pf", 0, "the capacitor you have, pF")
	q := fs.Float64("trap-q", 150, "unloaded Q of the trap coil (5–1000)")
	need := fs.Float64("need-db", 0, "attenuation needed at the unwanted station, dB")
	uField := fs.Float64("unwanted-dbuvm", 0, "field of the unwanted station, dB(µV/m)")
	wField := fs.Float64("wanted-dbuvm", 0, "field of the wanted station, dB(µV/m)")
	asJSON := fs.Bool("json", false, "print JSON instead of text")
	if done, status := parseFlags(fs, args, stderr); done {
		return status
	}
	set := setFlags(fs)
	switch {
	case !set["khz"] || !set["wanted-khz"]:
		return report("trap", usagef("--khz and --wanted-khz are required (kHz)"), stderr)
	case !(*khz >= 100 && *khz <= 30000):
		return report("trap", usagef("--khz must be between 100 and 30000 kHz, got %g", *khz), stderr)
	case !(*wanted >= 100 && *wanted <= 30000):
		return report("trap", usagef("--wanted-khz must be between 100 and 30000 kHz, got %g", *wanted), stderr)
	case *wanted == *khz:
		return report("trap", usagef("--wanted-khz must differ from --khz: a trap cannot separate stations on one frequency"), stderr)
	case set["have-uh"] == set["have-pf"]:
		return report("trap", usagef("give exactly one of --have-uh and --have-pf"), stderr)
	case set["need-db"] && (set["unwanted-dbuvm"] || set["wanted-dbuvm"]):
		return report("trap", usagef("give --need-db or the two fields, not both"), stderr)
	case set["unwanted-dbuvm"] != set["wanted-dbuvm"]:
		return report("trap", usagef("--unwanted-dbuvm and --wanted-dbuvm go together"), stderr)
	}
	kind, err := receiver.ParseTrapKind(*kindName)
	if err != nil {
		return report("trap", usagef("--kind: %s", trimPkg(err)), stderr)
	}
	rig, err := buildRig(spec)
	if err != nil {
		return report("trap", err, stderr)
	}
	wantedSig := receiver.Signal{Name: "wanted", KHz: propagation.KHz(*wanted), FieldDBuVm: *wField}
	other := receiver.Signal{Name: "unwanted", KHz: propagation.KHz(*khz), FieldDBuVm: *uField}
	m := receiver.Masking{Wanted: wantedSig, Other: other, ShortDB: 20 - 6}
	switch {
	case set["need-db"]:
		if !(*need > 0 && *need <= 100) {
			return report("trap", usagef("--need-db must be > 0 and <= 100 dB, got %g", *need), stderr)
		}
		m.ShortDB = *need - 6
	case set["unwanted-dbuvm"]:
		ms, err := rig.Crowding(wantedSig, []receiver.Signal{other})
		if err != nil {
			return report("trap", asUsageWith(err, rigFlagNames), stderr)
		}
		if len(ms) == 0 {
			fmt.Fprintln(stdout, "No trap needed: the set's own selectivity keeps the unwanted station 26 dB or more below the wanted one.")
			return exitOK
		}
		m = ms[0]
	}
	adv, err := rig.TrapFor(m, kind, *haveUH, *havePF, *q)
	if err != nil {
		return report("trap", asUsageWith(err, map[string]string{"trap inductance": "--have-uh", "trap capacitance": "--have-pf", "trap Q": "--trap-q"}), stderr)
	}
	out := trapJSON{KHz: *khz, WantedKHz: *wanted, Kind: adv.Trap.Kind.String(), InductanceUH: round4(adv.Trap.InductanceUH),
		CapacitancPF: round4(adv.Trap.CapacitancePF), Q: adv.Trap.QUnloaded, NeedDB: round4(m.ShortDB + 6),
		NotchDB: round4(adv.NotchDB), WantedLossDB: round4(adv.WantedLossDB), Fixes: adv.Fixes, Reason: adv.Reason}
	if *asJSON {
		return emitJSON("trap", out, stdout, stderr)
	}
	fmt.Fprintf(stdout, "Wave trap (%s) against %g kHz, listening on %g kHz\n", out.Kind, out.KHz, out.WantedKHz)
	fmt.Fprintf(stdout, "  parts:            %.1f µH with %.1f pF, coil Q %g\n", out.InductanceUH, out.CapacitancPF, out.Q)
	fmt.Fprintf(stdout, "  needed:           %.1f dB at %g kHz\n", out.NeedDB, out.KHz)
	fmt.Fprintf(stdout, "  notch depth:      %.1f dB\n", out.NotchDB)
	fmt.Fprintf(stdout, "  cost to wanted:   %.2f dB\n", out.WantedLossDB)
	fmt.Fprintf(stdout, "  verdict:          %s\n", out.Reason)
	return exitOK
}
