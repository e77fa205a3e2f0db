package receiver

import (
	"math"
	"sort"
)

// Signal is a carrier at the listener's antenna.
type Signal struct {
	Name       string
	KHz        KHz
	FieldDBuVm float64
}

// Masking says how one station stands against another wanted one at the
// detector, with the set tuned to the wanted station.
type Masking struct {
	Wanted, Other Signal
	// SelectivityDB is the set's response at the other carrier (≤ 0).
	SelectivityDB float64
	// RatioDB is wanted minus other at the detector: the field difference
	// plus the set's rejection.
	RatioDB float64
	// ShortDB is how much the ratio falls short of UsableProtectionDB
	// (≤ 0: no problem).
	ShortDB float64
	Masks   bool
}

// Crowding returns, for a wanted station, every other station that masks
// it in this rig (with the set tuned to the wanted one), worst first. A
// station masks when the wanted carrier at the detector is less than
// UsableProtectionDB above it, counting the set's own selectivity:
//
//	ratio = (E_wanted − E_other) − S(f_other),  masks if ratio < 26 dB
//
// with S the rig's response (tank and antenna circuit) at the other
// carrier. The co-channel protection ratio plus the set's selectivity,
// rather than a broadcast receiver's adjacent-channel curve, is the rule of
// methods.md §4.2 for crystal sets. Not modelled: a strong carrier's
// suppression of a weaker one in the diode (the detector's capture
// effect), which only makes matters worse.
func (r Rig) Crowding(wanted Signal, others []Signal) ([]Masking, error) {
	if err := r.Antenna.validateAt(wanted.KHz); err != nil {
		return nil, err
	}
	fr, err := r.front(wanted.KHz)
	if err != nil {
		return nil, err
	}
	return fr.Crowding(wanted, others), nil
}

// Front returns the linear part of the chain at f (antenna, loading,
// tuned circuit), for callers that evaluate many signals at one tuning.
func (r Rig) Front(f KHz) (Front, error) {
	if err := r.Antenna.validateAt(f); err != nil {
		return Front{}, err
	}
	return r.front(f)
}

// Crowding is Rig.Crowding with the set tuned as fr.
func (fr Front) Crowding(wanted Signal, others []Signal) []Masking {
	var out []Masking
	for _, o := range others {
		if o.KHz == wanted.KHz && o.Name == wanted.Name {
			continue
		}
		m := Masking{Wanted: wanted, Other: o, SelectivityDB: fr.SelectivityDB(o.KHz)}
		m.RatioDB = wanted.FieldDBuVm - o.FieldDBuVm - m.SelectivityDB
		m.ShortDB = UsableProtectionDB - m.RatioDB
		m.Masks = m.ShortDB > 0
		if m.Masks {
			out = append(out, m)
		}
	}
	sort.Slice(out, func(i, j int) bool { return out[i].ShortDB > out[j].ShortDB })
	return out
}

// TrapFor advises a wave trap in the antenna lead against a masking
// station: its notch must supply the shortfall (plus 6 dB to spare), and
// the wanted station may lose at most 3 dB. The trap sits between the
// antenna circuit (source: its resistance, resonated at the wanted
// frequency, and its reactance at the unwanted one) and the set (load: the
// tank reflected through the antenna tap), both taken as seen at the
// trap's frequency.
func (r Rig) TrapFor(m Masking, kind TrapKind, inductanceUH, capacitancePF, qUnloaded float64) (TrapAdvice, error) {
	fr, err := r.front(m.Wanted.KHz)
	if err != nil {
		return TrapAdvice{}, err
	}
	return fr.TrapFor(m, kind, inductanceUH, capacitancePF, qUnloaded)
}

// TrapFor is Rig.TrapFor with the set tuned as fr.
func (fr Front) TrapFor(m Masking, kind TrapKind, inductanceUH, capacitancePF, qUnloaded float64) (TrapAdvice, error) {
	tc := TunedCircuit{AntennaTap: fr.AntennaTap, DetectorTap: fr.DetectorTap}
	load := complex(tc.AntennaTap*tc.AntennaTap*par(fr.Tank.DynamicOhm, fr.DetectorWeakOhm/(tc.DetectorTap*tc.DetectorTap)), 0)
	source := complex(fr.SourceOhm, 0)
	need := math.Max(m.ShortDB, 0) + 6
	return AdviseTrap(kind, m.Other.KHz, m.Wanted.KHz, need, source, load, inductanceUH, capacitancePF, qUnloaded)
}
