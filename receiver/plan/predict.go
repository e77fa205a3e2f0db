package plan

import (
	"fmt"
	"math"
	"runtime"
	"sort"
	"sync"
	"time"

	"earshot/propagation"
	"earshot/receiver"

	"gonum.org/v1/gonum/interp"
)

// Planner predicts reception for one world and one rig. Build it with
// NewPlanner; it caches ground-wave curves and the rig's response per
// frequency, so repeated predictions (other spots, other times) are fast.
// It is safe for concurrent use.
type Planner struct {
	world    World
	spec     receiver.RigSpec
	rig      receiver.Rig
	curves   *propagation.CurveCache
	mu       *sync.Mutex // shared by the views made for one-station maps
	chains   map[propagation.KHz]*chainTable
	gainHorz []float64 // per station, G_V at the horizon
	traps    map[trapKey]*Trap
	sel      [][]float64 // rig response at station j when tuned to i
	pause    func()      // called between the rig evaluations of a table (may be nil)
}

// SetPause sets a function called between the rig evaluations that make
// up the table of one frequency (each a fraction of a millisecond to a few
// milliseconds). A single-threaded caller that works in a goroutine
// (WebAssembly) yields there; planners made by WithRig inherit it.
func (p *Planner) SetPause(pause func()) { p.pause = pause }

// trapKey identifies a trap design: the two frequencies and the
// attenuation needed, rounded up to a whole 2 dB.
type trapKey struct {
	wanted, other propagation.KHz
	needDB        float64
}

// NewPlanner checks the world and the rig and prepares a planner.
func NewPlanner(w World, spec receiver.RigSpec) (*Planner, error) {
	if len(w.Stations) == 0 {
		return nil, fmt.Errorf("plan: the world has no stations")
	}
	if w.Ground == nil {
		return nil, fmt.Errorf("plan: the world has no ground map")
	}
	rig, err := spec.Build()
	if err != nil {
		return nil, err
	}
	p := &Planner{world: w, spec: spec, rig: rig, curves: new(propagation.CurveCache), mu: new(sync.Mutex), chains: map[propagation.KHz]*chainTable{}, traps: map[trapKey]*Trap{}}
	for i, s := range w.Stations {
		if _, err := (propagation.Transmitter{Freq: s.KHz, PowerKW: s.KWDay}).Validate(); err != nil {
			return nil, fmt.Errorf("plan: station %d (%s): %w", i+1, s.ID, err)
		}
		if s.KWNight < 0 || math.IsNaN(s.KWNight) {
			return nil, fmt.Errorf("plan: station %d (%s): night power must be >= 0 kW, got %g", i+1, s.ID, s.KWNight)
		}
		g := 0.0
		if s.HeightDeg != 0 {
			if g, err = propagation.MonopoleGainDB(s.HeightDeg, 0); err != nil {
				return nil, fmt.Errorf("plan: station %d (%s): %w", i+1, s.ID, err)
			}
		}
		p.gainHorz = append(p.gainHorz, g)
	}
	return p, nil
}

// Rig returns the planner's rig.
func (p *Planner) Rig() receiver.Rig { return p.rig }

// Stations returns the planner's stations.
func (p *Planner) Stations() []Station { return p.world.Stations }

// Warm computes the rig's response at every station frequency, spread
// over GOMAXPROCS goroutines (tens of milliseconds per frequency). Predict
// and Map call it; an app may call it between frames.
func (p *Planner) Warm() error {
	var todo []propagation.KHz
	seen := map[propagation.KHz]bool{}
	p.mu.Lock()
	for _, s := range p.world.Stations {
		if _, ok := p.chains[s.KHz]; !ok && !seen[s.KHz] {
			seen[s.KHz] = true
			todo = append(todo, s.KHz)
		}
	}
	p.mu.Unlock()
	if len(todo) == 0 {
		return nil
	}
	work := make(chan propagation.KHz)
	errs := make(chan error, len(todo))
	var wg sync.WaitGroup
	for range min(runtime.GOMAXPROCS(0), len(todo)) {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for f := range work {
				if _, err := p.chain(f); err != nil {
					errs <- err
				}
			}
		}()
	}
	for _, f := range todo {
		work <- f
	}
	close(work)
	wg.Wait()
	close(errs)
	return <-errs
}

// chainTable is the rig's response at one frequency as a function of the
// carrier field: margin and S/N on a grid of fields, and the weakest
// audible field, so that a prediction does not run the detector for every
// station and spot.
type chainTable struct {
	front     receiver.Front
	minDBuVm  float64 // weakest audible field (+Inf if none)
	limit     string  // what limits when nothing is audible
	lo, step  float64
	snrOffset float64 // S/N = E − snrOffset (external noise)

	// The table grows on demand (see extend): mu guards it.
	mu       sync.Mutex
	marginDB []float64
	spline   interp.AkimaSpline // margin against field, through marginDB
	ampSNR   []float64
	closed   bool // no more rows: the top of the grid or of the detector model
	// firstAudible is the first row's field at which the chain is audible
	// (margin and S/N), or −Inf.
	firstAudible float64
	rig          receiver.Rig
	f            propagation.KHz
	pause        func()
}

// Field grid of a chain table: −20 … 100 dB(µV/m) every 5 dB (the margin
// is smooth in dB: a spline through it errs by under 0.1 dB, checked in
// TestChainTable). Above 100 dB(µV/m) — within a few km of a strong
// transmitter, margins of 60 dB and more — the margin is extended at
// 1 dB per dB (linear detection); the chain's own slope there is 0.9–1,
// so the extension overstates the margin by at most 1 dB at 120 dB(µV/m).
// The detector is slowest to solve at those levels: ending the table at
// 100 halves the cost of a rig's first prediction. Rows above
// tableEagerDBuVm are computed only when a station's field needs them
// (extend), which saves most of the rest.
const (
	tableLoDBuVm    = -20.0
	tableHiDBuVm    = 100.0
	tableStepDBuVm  = 5.0
	tableEagerDBuVm = 70.0
)

func (p *Planner) chain(f propagation.KHz) (*chainTable, error) {
	p.mu.Lock()
	ct, ok := p.chains[f]
	p.mu.Unlock()
	if ok {
		return ct, nil
	}
	ct = &chainTable{lo: tableLoDBuVm, step: tableStepDBuVm, rig: p.rig, f: f, pause: p.pause, firstAudible: math.Inf(-1)}
	firstErr := ct.extend(tableEagerDBuVm)
	if len(ct.marginDB) < 5 {
		// The rig cannot follow this frequency at all (for example a wire
		// near half a wavelength long, whose loading no coil provides):
		// nothing is heard on it.
		ct = deadChain(f, firstErr)
		p.mu.Lock()
		p.chains[f] = ct
		p.mu.Unlock()
		return ct, nil
	}
	// The weakest audible field: bisection through the chain, inside the
	// table's first audible step when there is one.
	var min float64
	var err error
	if ct.firstAudible > ct.lo {
		min, err = p.rig.MinAudibleWithin(f, ct.firstAudible-ct.step, ct.firstAudible)
	} else {
		min, err = p.rig.MinAudibleDBuVm(f)
	}
	if err != nil {
		ct.minDBuVm, ct.limit = math.Inf(1), "nothing audible"
		if !ct.front.Tunable {
			ct.limit = "out of tuning range"
		}
	} else {
		ct.minDBuVm = min
	}
	p.mu.Lock()
	p.chains[f] = ct
	p.mu.Unlock()
	return ct, nil
}

// extend computes the table's rows up to field e (at most tableHiDBuVm)
// and refits the spline; it returns the chain's error if the detector
// model ends first. The caller holds ct.mu or owns ct.
func (ct *chainTable) extend(e float64) error {
	if ct.closed {
		return nil
	}
	top := math.Min(tableHiDBuVm, e)
	n0 := len(ct.marginDB)
	var firstErr error
	for x := ct.lo + float64(n0)*ct.step; x <= top+1e-9; x += ct.step {
		if ct.pause != nil {
			ct.pause()
		}
		rc, err := ct.rig.Receive(ct.f, x)
		if err != nil {
			firstErr = err
			ct.closed = true // beyond the detector model's range: the table ends here
			break
		}
		if len(ct.marginDB) == 0 {
			ct.front = rc.Front
			ct.snrOffset = rc.NoiseDBuVm - 20*math.Log10(modulationOf(ct.rig))
		}
		if rc.Audible && math.IsInf(ct.firstAudible, -1) {
			ct.firstAudible = x
		}
		ct.marginDB = append(ct.marginDB, rc.MarginDB)
		amp := 200.0 // the amplifier's own noise does not limit
		if ext := x - ct.snrOffset; rc.SNRDB < ext-1e-9 {
			amp = rc.SNRDB
		}
		ct.ampSNR = append(ct.ampSNR, amp)
	}
	if ct.lo+float64(len(ct.marginDB)-1)*ct.step >= tableHiDBuVm-1e-9 {
		ct.closed = true
	}
	if len(ct.marginDB) != n0 && len(ct.marginDB) >= 5 {
		xs := make([]float64, len(ct.marginDB))
		for i := range xs {
			xs[i] = ct.lo + float64(i)*ct.step
		}
		if err := ct.spline.Fit(xs, ct.marginDB); err != nil {
			panic("plan: " + err.Error()) // increasing xs always fit
		}
	}
	return firstErr
}

// cover makes sure the table reaches two rows beyond e (where it can),
// so that the spline at e rests on computed rows. The caller holds ct.mu.
func (ct *chainTable) cover(e float64) {
	if !ct.closed && e+2*ct.step > ct.lo+float64(len(ct.marginDB)-1)*ct.step {
		ct.extend(math.Ceil((e-ct.lo)/ct.step)*ct.step + ct.lo + 2*ct.step)
	}
}

// deadChain is the table of a frequency the rig cannot receive: no field
// is audible (minDBuVm = +Inf) and the limit says why.
func deadChain(f propagation.KHz, why error) *chainTable {
	ct := &chainTable{lo: tableLoDBuVm, step: tableStepDBuVm, minDBuVm: math.Inf(1), front: receiver.Front{KHz: f}, closed: true}
	ct.limit = "the rig cannot be tuned here"
	if why != nil {
		ct.limit += ": " + why.Error()
	}
	var xs []float64
	for e := tableLoDBuVm; e <= tableHiDBuVm+1e-9; e += tableStepDBuVm {
		xs = append(xs, e)
		ct.marginDB = append(ct.marginDB, noMarginDB)
		ct.ampSNR = append(ct.ampSNR, noMarginDB)
	}
	if err := ct.spline.Fit(xs, ct.marginDB); err != nil {
		panic("plan: " + err.Error()) // a constant table always fits
	}
	return ct
}

// noMarginDB is the margin and S/N of a station the rig cannot receive.
const noMarginDB = -200.0

// modulationOf returns the rig's modulation depth.
func modulationOf(r receiver.Rig) float64 {
	if r.Modulation > 0 {
		return r.Modulation
	}
	return receiver.DefaultModulation
}

// snr returns the audio S/N at field e: the external-noise S/N, or the
// amplifier's where it is lower (interpolated linearly in dB on the table,
// holding the end values beyond it).
func (ct *chainTable) snr(e float64) float64 {
	ct.mu.Lock()
	defer ct.mu.Unlock()
	ct.cover(e)
	col := ct.ampSNR
	x := math.Max(0, (e-ct.lo)/ct.step)
	i := int(x)
	if i >= len(col)-1 {
		return col[len(col)-1]
	}
	fr := x - float64(i)
	return math.Min(e-ct.snrOffset, col[i]*(1-fr)+col[i+1]*fr)
}

// margin returns the audibility margin at field e: an Akima spline
// (gonum/interp) through the table, extended below it by the square law
// (2 dB per dB; methods.md §7.2) and above it by linear detection (1 dB
// per dB).
func (ct *chainTable) margin(e float64) float64 {
	ct.mu.Lock()
	defer ct.mu.Unlock()
	ct.cover(e)
	hi := ct.lo + float64(len(ct.marginDB)-1)*ct.step
	switch {
	case e < ct.lo:
		return ct.marginDB[0] - 2*(ct.lo-e)
	case e > hi:
		return ct.marginDB[len(ct.marginDB)-1] + (e - hi)
	}
	return ct.spline.Predict(e)
}

// Trap is the wave trap a masked station needs.
type Trap struct {
	AgainstID    string
	AgainstKHz   propagation.KHz
	NeedDB       float64 // attenuation asked of it at the masker's frequency
	Kind         string
	InductanceUH float64
	CapacitancPF float64
	NotchDB      float64
	WantedLossDB float64
	Fixes        bool
	Advice       string
}

// Heard is one station's prediction at a spot.
type Heard struct {
	Station    Station
	DistKm     float64
	BearingDeg float64
	Path       propagation.Path
	GroundDB   float64  // ground-wave field, dB(µV/m)
	SkyDB      *float64 // sky-wave median for a wire antenna at that time, nil by day
	SkyDecile  float64  // decile spread of the sky wave, dB
	FieldDB    float64  // combined median field
	Fading     bool     // ground and sky within 6 dB: fading and distortion
	DetectorDB float64  // field of this station relative to the rig's weakest audible field
	MarginDB   float64  // audibility margin, dB
	SNRDB      float64  // audio S/N
	Chance     float64  // probability (over nights) of being audible at this time
	Audible    bool
	MaskedBy   *Station
	Trap       *Trap
	Verdict    string
}

// Prediction is everything heard at a spot at a time.
type Prediction struct {
	Spot  Spot
	At    time.Time
	Night bool // the sun is down at the spot
	Heard []Heard
}

// Audible returns the number of audible stations.
func (pr Prediction) Audible() int {
	n := 0
	for _, h := range pr.Heard {
		if h.Audible {
			n++
		}
	}
	return n
}

// pathStepKm returns the sampling step for a path of distKm: about 16
// samples, never finer than 1 km nor coarser than 20 km. A coastline is
// then placed within half a step (3 % of the path), which moves a
// Millington field by a fraction of a dB; the ground map itself is a few
// km coarse.
func pathStepKm(distKm float64) float64 {
	return math.Min(20, math.Max(1, distKm/16))
}

// Predict returns what the rig hears at spot at instant t: every station's
// ground wave (Millington's method over the ground sampled along the great
// circle), night sky wave (P.1147 with the hourly loss factor, corrected
// for a vertical wire), their combination, the chain's audibility margin
// and S/N, the chance of hearing it over nights, masking by other
// stations and the trap that would cure it. Results are sorted by margin,
// best first.
func (p *Planner) Predict(spot Spot, t time.Time) (Prediction, error) {
	if err := p.Warm(); err != nil {
		return Prediction{}, err
	}
	pr := Prediction{Spot: spot, At: t}
	elev, err := propagation.SolarElevationDeg(t, spot.Place.LatDeg(), spot.Place.LonDeg())
	if err != nil {
		return Prediction{}, err
	}
	pr.Night = elev < propagation.RiseSetElevationDeg
	for i, s := range p.world.Stations {
		h, err := p.station(i, s, spot, t)
		if err != nil {
			return Prediction{}, fmt.Errorf("plan: %s: %w", s.ID, err)
		}
		pr.Heard = append(pr.Heard, h)
	}
	if err := p.masking(pr.Heard); err != nil {
		return Prediction{}, err
	}
	for i := range pr.Heard {
		pr.Heard[i].Verdict = verdict(&pr.Heard[i])
	}
	sort.SliceStable(pr.Heard, func(i, j int) bool { return pr.Heard[i].MarginDB > pr.Heard[j].MarginDB })
	return pr, nil
}

// station predicts one station at the spot.
func (p *Planner) station(i int, s Station, spot Spot, t time.Time) (Heard, error) {
	h := Heard{Station: s}
	h.DistKm = propagation.DistanceKm(s.Place, spot.Place)
	h.BearingDeg = propagation.InitialBearingDeg(spot.Place, s.Place)
	dist := math.Max(h.DistKm, 0.05) // listener at the mast: 50 m
	path, err := p.samplePath(s, spot, dist)
	if err != nil {
		return Heard{}, err
	}
	h.Path = path
	// Power: night power when the sun is down at the transmitter.
	kw := s.KWDay
	if s.KWNight > 0 {
		el, err := propagation.SolarElevationDeg(t, s.Place.LatDeg(), s.Place.LonDeg())
		if err != nil {
			return Heard{}, err
		}
		if el < propagation.RiseSetElevationDeg {
			kw = s.KWNight
		}
	}
	tx := propagation.Transmitter{Freq: s.KHz, PowerKW: kw, GainDB: p.gainHorz[i]}
	g, _, err := p.curves.PathFieldDBuVm(tx, path)
	if err != nil {
		return Heard{}, err
	}
	h.GroundDB = g
	h.FieldDB = g
	skyMedian := math.Inf(-1)
	if h.DistKm >= 1 {
		sp := propagation.SkyPath{Tx: s.Place, Rx: spot.Place, Freq: s.KHz, PowerKW: kw, HeightDeg: s.HeightDeg}
		sw, hl, e, err := propagation.SkyWaveAt(sp, t)
		if err != nil {
			return Heard{}, err
		}
		// The sky wave counts at night and through the transition; with the
		// sun more than 10° up at the path midpoint it is absorbed (P.1147
		// Annex 2) and reported as absent.
		if hl.LossDB < propagation.DaytimeLossDB && hl.SunElevMidDeg < 10 {
			sky := e + sw.ReceiveCorrDB
			h.SkyDB = &sky
			h.SkyDecile = sw.DecileSpread
			skyMedian = sky
			h.FieldDB = propagation.PowerSumDBuVm(g, sky)
			h.Fading = propagation.InFadingZone(g, sky)
		}
	}
	ct, err := p.chain(s.KHz)
	if err != nil {
		return Heard{}, err
	}
	h.DetectorDB = h.FieldDB - ct.minDBuVm
	h.MarginDB = ct.margin(h.FieldDB)
	h.SNRDB = ct.snr(h.FieldDB)
	h.Audible = h.FieldDB >= ct.minDBuVm
	h.Chance = propagation.ExceedanceProbability(ct.minDBuVm, g, skyMedian, h.SkyDecile)
	if math.IsInf(ct.minDBuVm, 1) {
		h.Chance, h.DetectorDB = 0, math.Inf(-1)
	}
	for _, v := range []float64{h.GroundDB, h.FieldDB, h.MarginDB, h.Chance} {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return Heard{}, fmt.Errorf("prediction is not finite (ground %g, field %g, margin %g)", h.GroundDB, h.FieldDB, h.MarginDB)
		}
	}
	return h, nil
}

// samplePath samples the ground along the great circle from the station
// to the spot.
func (p *Planner) samplePath(s Station, spot Spot, dist float64) (propagation.Path, error) {
	if propagation.DistanceKm(s.Place, spot.Place) < 0.05 {
		return propagation.Path{{LengthKm: dist, Ground: p.world.Ground(s.Place.LatDeg(), s.Place.LonDeg())}}, nil
	}
	return propagation.SamplePath(p.world.Ground, s.Place, spot.Place, pathStepKm(dist))
}

// masking finds, for each station the listener could hear, the strongest
// other station that masks it, and the trap that would cure it.
func (p *Planner) masking(heard []Heard) error {
	sel, err := p.selectivity()
	if err != nil {
		return err
	}
	// heard is in station order here (sorted by margin only afterwards).
	for i := range heard {
		h := &heard[i]
		if !h.Audible {
			continue
		}
		// The worst masker: the largest shortfall below the protection
		// ratio, counting the set's rejection (receiver.Front.Crowding's
		// rule, with the rejections taken from the planner's table).
		worst, short := -1, 0.0
		for j := range heard {
			if j == i {
				continue
			}
			ratio := h.FieldDB - heard[j].FieldDB - sel[i][j]
			if sh := receiver.UsableProtectionDB - ratio; sh > 0 && (worst < 0 || sh > short) {
				worst, short = j, sh
			}
		}
		if worst < 0 {
			continue
		}
		masker := heard[worst].Station // a copy: heard is sorted later
		h.MaskedBy = &masker
		if masker.KHz == h.Station.KHz {
			continue // co-channel: no trap can help
		}
		ct, err := p.chain(h.Station.KHz)
		if err != nil {
			return err
		}
		m := receiver.Masking{
			Wanted:        receiver.Signal{Name: h.Station.ID, KHz: h.Station.KHz, FieldDBuVm: h.FieldDB},
			Other:         receiver.Signal{Name: masker.ID, KHz: masker.KHz, FieldDBuVm: heard[worst].FieldDB},
			SelectivityDB: sel[i][worst], RatioDB: receiver.UsableProtectionDB - short, ShortDB: short, Masks: true,
		}
		h.Trap = p.trap(ct.front, m)
	}
	return nil
}

// selectivity returns sel[i][j], the rig's response (dB) at station j's
// carrier when tuned to station i, computed once per planner.
func (p *Planner) selectivity() ([][]float64, error) {
	p.mu.Lock()
	sel := p.sel
	p.mu.Unlock()
	if sel != nil {
		return sel, nil
	}
	n := len(p.world.Stations)
	sel = make([][]float64, n)
	for i, wi := range p.world.Stations {
		ct, err := p.chain(wi.KHz)
		if err != nil {
			return nil, err
		}
		sel[i] = make([]float64, n)
		for j, wj := range p.world.Stations {
			sel[i][j] = ct.front.SelectivityDB(wj.KHz)
		}
	}
	p.mu.Lock()
	p.sel = sel
	p.mu.Unlock()
	return sel, nil
}

// trapCapsPF are the capacitors tried for a trap, common fixed values.
var trapCapsPF = []float64{100, 220, 470, 1000, 2200}

// trap designs (or recalls) a series-resonant shunt trap in the antenna
// lead against the masking station, with a coil of Q 150 and one of the
// common capacitors trapCapsPF: the first that cures the masking with
// the least loss to the wanted station, else the deepest; nil when no trap
// can be built.
func (p *Planner) trap(fr receiver.Front, m receiver.Masking) *Trap {
	key := trapKey{m.Wanted.KHz, m.Other.KHz, 2 * math.Ceil(m.ShortDB/2)}
	p.mu.Lock()
	t, ok := p.traps[key]
	p.mu.Unlock()
	if !ok {
		m.ShortDB = key.needDB
		var best *receiver.TrapAdvice
		for _, c := range trapCapsPF {
			adv, err := fr.TrapFor(m, receiver.SeriesShuntTrap, 0, c, 150)
			if err != nil {
				continue
			}
			better := best == nil ||
				adv.Fixes && (!best.Fixes || adv.WantedLossDB < best.WantedLossDB) ||
				!adv.Fixes && !best.Fixes && adv.NotchDB > best.NotchDB
			if better {
				a := adv
				best = &a
			}
		}
		if best != nil {
			t = &Trap{Kind: best.Trap.Kind.String(), InductanceUH: best.Trap.InductanceUH, NeedDB: key.needDB + 6,
				CapacitancPF: best.Trap.CapacitancePF, NotchDB: best.NotchDB, WantedLossDB: best.WantedLossDB,
				Fixes: best.Fixes, Advice: best.Reason}
		}
		p.mu.Lock()
		p.traps[key] = t
		p.mu.Unlock()
	}
	if t == nil {
		return nil
	}
	c := *t
	c.AgainstID, c.AgainstKHz = m.Other.Name, m.Other.KHz
	return &c
}

// verdict puts a prediction in a few plain words.
func verdict(h *Heard) string {
	switch {
	case math.IsInf(h.DetectorDB, -1):
		return "cannot be tuned with this rig"
	case !h.Audible && h.Chance >= 0.1:
		return fmt.Sprintf("below hearing most nights; some nights (%.0f %%)", 100*h.Chance)
	case !h.Audible:
		return "too weak to hear"
	case h.MaskedBy != nil && h.Trap != nil && h.Trap.Fixes:
		return "swamped by " + h.MaskedBy.ID + ": a wave trap cures it"
	case h.MaskedBy != nil && h.Trap != nil:
		return "swamped by " + h.MaskedBy.ID + "; a trap helps but does not cure it"
	case h.MaskedBy != nil:
		return "swamped by " + h.MaskedBy.ID
	case h.Fading:
		return "heard, but fading and distorted (ground and sky waves fight)"
	case h.SkyDB != nil && *h.SkyDB > h.GroundDB:
		if h.Chance < 0.9 {
			return fmt.Sprintf("heard by sky wave on %.0f %% of nights", 100*h.Chance)
		}
		return "heard by sky wave"
	case h.MarginDB >= 20:
		return "loud and clear"
	case h.MarginDB >= 6:
		return "clearly heard"
	}
	return "faint but heard"
}
