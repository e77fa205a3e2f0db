package main

import (
	"fmt"
	"io"
	"text/tabwriter"

	"earshot/assets"
	"earshot/propagation"
)

// demoDistancesKm are the distances of the demo table.
var demoDistancesKm = []float64{1, 10, 30, 100, 300, 1000}

func runDemo(args []string, stdout, stderr io.Writer) int {
	fs := newFlagSet("demo", "\n\nPrints the ground-wave field (by day power) of each transmitter of the embedded\n(invented) demo scenario over sea and over land, against distance.", stdout)
	if done, status := parseFlags(fs, args, stderr); done {
		return status
	}
	sc, err := assets.Demo()
	if err != nil {
		return report("demo", err, stderr)
	}
	fmt.Fprintf(stdout, "%s\n%s\n\n", sc.Name, sc.Note)
	fmt.Fprint(stdout, "Listening spots:")
	for _, sp := range sc.Spots() {
		fmt.Fprintf(stdout, "  %s (%s)", sp.Name, sp.Place)
	}
	fmt.Fprint(stdout, "\n\n")
	fmt.Fprintln(stdout, "Ground-wave field, dB(µV/m), by distance from each transmitter (Rec. ITU-R P.368 method).")
	fmt.Fprintln(stdout, "A crystal set with a good outdoor wire usually needs some 60–70 dB(µV/m) or more (1–3 mV/m).")
	fmt.Fprintln(stdout)
	var cache propagation.CurveCache
	tw := tabwriter.NewWriter(stdout, 0, 0, 2, ' ', tabwriter.AlignRight)
	fmt.Fprint(tw, "station\tkHz\tkW day/night\tground\t")
	for _, d := range demoDistancesKm {
		fmt.Fprintf(tw, "%g km\t", d)
	}
	fmt.Fprintln(tw)
	for _, st := range sc.Stations() {
		gain := 0.0 // a short monopole
		if st.HeightDeg != 0 {
			if gain, err = propagation.MonopoleGainDB(st.HeightDeg, 0); err != nil {
				return report("demo", err, stderr)
			}
		}
		kw := fmt.Sprintf("%g", st.KWDay)
		if st.KWNight != 0 && st.KWNight != st.KWDay {
			kw += fmt.Sprintf("/%g", st.KWNight)
		}
		tx := propagation.Transmitter{Freq: st.KHz, PowerKW: st.KWDay, GainDB: gain}
		for _, gname := range []string{"sea", "land"} {
			gt, err := propagation.GroundByName(gname)
			if err != nil {
				return report("demo", err, stderr)
			}
			fmt.Fprintf(tw, "%s %s\t%g\t%s\t%s\t", st.ID, st.Name, float64(st.KHz), kw, gname)
			for _, d := range demoDistancesKm {
				e, _, err := cache.PathFieldDBuVm(tx, propagation.Path{{LengthKm: d, Ground: gt.Ground}})
				if err != nil {
					return report("demo", err, stderr)
				}
				fmt.Fprintf(tw, "%.1f\t", e)
			}
			fmt.Fprintln(tw)
		}
	}
	tw.Flush()
	fmt.Fprint(stdout, "\nSafety: keep every antenna well clear of power lines, disconnect and ground it in thunderstorms, and follow local electrical codes.\n")
	return exitOK
}
