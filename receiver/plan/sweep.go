package plan

import (
	"errors"
	"fmt"
	"math"
	"runtime"
	"sync"
	"time"

	"earshot/propagation"
	"earshot/receiver"
)

// Progress is told how much of a long job is done (done of total steps).
// It may be nil. It is called from one goroutine at a time.
type Progress func(done, total int)

// BBox is a latitude/longitude box in degrees (MinLon < MaxLon; boxes
// across the antimeridian are not supported).
type BBox struct{ MinLat, MaxLat, MinLon, MaxLon float64 }

// Validate checks the box.
func (b BBox) Validate() error {
	ok := func(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }
	switch {
	case !ok(b.MinLat) || !ok(b.MaxLat) || b.MinLat < -90 || b.MaxLat > 90 || b.MinLat >= b.MaxLat:
		return fmt.Errorf("plan: map box latitudes must satisfy -90 <= south < north <= 90, got %g … %g", b.MinLat, b.MaxLat)
	case !ok(b.MinLon) || !ok(b.MaxLon) || b.MinLon < -180 || b.MaxLon > 180 || b.MinLon >= b.MaxLon:
		return fmt.Errorf("plan: map box longitudes must satisfy -180 <= west < east <= 180, got %g … %g", b.MinLon, b.MaxLon)
	}
	return nil
}

// Around returns a box centred on the stations and spots given, padded by
// padDeg degrees and at least minSpanDeg across.
func Around(places []propagation.Place, padDeg float64) BBox {
	b := BBox{90, -90, 180, -180}
	for _, p := range places {
		b.MinLat, b.MaxLat = math.Min(b.MinLat, p.LatDeg()), math.Max(b.MaxLat, p.LatDeg())
		b.MinLon, b.MaxLon = math.Min(b.MinLon, p.LonDeg()), math.Max(b.MaxLon, p.LonDeg())
	}
	b.MinLat, b.MaxLat = math.Max(-89, b.MinLat-padDeg), math.Min(89, b.MaxLat+padDeg)
	b.MinLon, b.MaxLon = math.Max(-180, b.MinLon-padDeg), math.Min(180, b.MaxLon+padDeg)
	return b
}

// Cell returns the centre of cell (ix, iy) of an nx×ny grid over the box,
// iy = 0 being the northern row.
func (b BBox) Cell(ix, iy, nx, ny int) (latDeg, lonDeg float64) {
	return b.MaxLat - (float64(iy)+0.5)*(b.MaxLat-b.MinLat)/float64(ny),
		b.MinLon + (float64(ix)+0.5)*(b.MaxLon-b.MinLon)/float64(nx)
}

// MapKind says what a map shows.
type MapKind int

const (
	MapCount   MapKind = iota // number of audible stations
	MapStation                // one station's margin over the rig's weakest audible field, dB
	MapTraps                  // number of audible stations that another station swamps
)

// Grid is a computed map: Values[iy*NX+ix], iy = 0 the northern row.
type Grid struct {
	Box       BBox
	NX, NY    int
	Kind      MapKind
	StationID string
	At        time.Time
	Values    []float64
}

// MapOptions tune a map computation.
type MapOptions struct {
	// Stride is the spacing, in cells, of the lattice on which fields are
	// computed exactly; between lattice nodes the per-station fields (dB)
	// are interpolated bilinearly, except in lattice squares across which
	// a station's ground wave changes by more than 3 dB (near the station,
	// across coasts), which are computed exactly cell by cell. 1 computes
	// every cell. 0 means 4.
	Stride int
	// Workers is the number of goroutines (0: GOMAXPROCS). WebAssembly
	// builds run with one.
	Workers int
	// RefineDB is the change of a station's attenuation (dB) across a
	// lattice square beyond which its cells are computed exactly (0: 6 dB;
	// against every-cell-exact count maps, 2 % of cells differ at 2 dB,
	// 2–4 % at 3 dB, 2–6 % at 6 dB, by one station in almost all, at
	// two to three times the cost for each halving).
	RefineDB float64
	// Stop, when set, is asked between rows of work; once it reports true
	// Map returns ErrStopped (an app abandons a map the listener has
	// scrolled away from).
	Stop func() bool
	// Pause, when set, is called often (at every lattice node and map
	// cell) by the goroutine doing the work. A single-threaded caller
	// (WebAssembly) yields there so that the page keeps drawing.
	Pause func()
}

// ErrStopped is returned by Map when MapOptions.Stop asked it to stop.
var ErrStopped = errors.New("plan: map stopped")

func (o MapOptions) refine() float64 {
	if o.RefineDB > 0 {
		return o.RefineDB
	}
	return 6
}

// Map computes a map over box at nx×ny cells at instant t. For MapStation,
// stationID names the station. Fields are those of Predict: ground wave by
// Millington's method over the sampled ground, night sky wave with the
// hourly loss factor, combined; the sky wave is computed on a lattice
// twice as coarse (coarser lattices put it wrong near the stations).
func (p *Planner) Map(box BBox, nx, ny int, t time.Time, kind MapKind, stationID string, opt MapOptions, progress Progress) (*Grid, error) {
	if err := box.Validate(); err != nil {
		return nil, err
	}
	if nx < 2 || ny < 2 || nx > 4096 || ny > 4096 {
		return nil, fmt.Errorf("plan: map size must be 2–4096 cells each way, got %d×%d", nx, ny)
	}
	sel := -1
	if kind == MapStation {
		for i, s := range p.world.Stations {
			if s.ID == stationID {
				sel = i
			}
		}
		if sel < 0 {
			return nil, fmt.Errorf("plan: no station %q in the scenario", stationID)
		}
	}
	stride := opt.Stride
	if stride <= 0 {
		stride = 4
	}
	workers := opt.Workers
	if workers <= 0 {
		workers = runtime.GOMAXPROCS(0)
	}
	world := p.world
	if kind == MapStation {
		// Only the chosen station's field is drawn.
		world.Stations = []Station{p.world.Stations[sel]}
		q := *p
		q.world, q.gainHorz = world, []float64{p.gainHorz[sel]}
		p, sel = &q, 0
	}
	ns := len(p.world.Stations)
	cts := make([]*chainTable, ns)
	for i, s := range p.world.Stations {
		ct, err := p.chain(s.KHz)
		if err != nil {
			return nil, err
		}
		cts[i] = ct
	}
	// Lattice of exact fields: ground on stride, sky on 4·stride.
	lx, ly := (nx-1)/stride+2, (ny-1)/stride+2
	skyStride := 2 * stride
	sx, sy := (nx-1)/skyStride+2, (ny-1)/skyStride+2
	ground := make([]float64, lx*ly*ns) // field less its spread
	spread := make([]float64, lx*ly*ns) // the spread −20·log10 d
	sky := make([]float64, sx*sy*ns)
	cellPlace := func(fx, fy float64) propagation.Place {
		lat := box.MaxLat - (fy+0.5)*(box.MaxLat-box.MinLat)/float64(ny)
		lon := box.MinLon + (fx+0.5)*(box.MaxLon-box.MinLon)/float64(nx)
		pl, _ := propagation.NewPlace(math.Max(-90, math.Min(90, lat)), math.Max(-180, math.Min(180, lon)))
		return pl
	}
	// Steps: coarse and fine lattice rows, hourly-loss rows (at most sy),
	// sky rows, exact-square chunks (at most 64), map rows.
	total := 2*ly + 2*sy + 64 + ny
	var done int
	var progMu sync.Mutex
	step := func() {
		if progress == nil {
			return
		}
		progMu.Lock()
		done++
		progress(min(done, total), total)
		progMu.Unlock()
	}
	var firstErr error
	var errMu sync.Mutex
	fail := func(err error) {
		errMu.Lock()
		if firstErr == nil {
			firstErr = err
		}
		errMu.Unlock()
	}
	parallel := func(rows int, body func(row int)) {
		var wg sync.WaitGroup
		next := make(chan int)
		for range workers {
			wg.Add(1)
			go func() {
				defer wg.Done()
				for r := range next {
					body(r)
					step()
				}
			}()
		}
		for r := range rows {
			if opt.Stop != nil && opt.Stop() {
				fail(ErrStopped)
				break
			}
			next <- r
		}
		close(next)
		wg.Wait()
	}
	// refineDB is the change of a station's attenuation across a lattice
	// square beyond which interpolation is not trusted.
	const refineDB = 3.0
	// finalRefineDB is the same test for computing a square's cells
	// exactly (set by TestMapMatchesPredict's accuracy and the benchmark).
	finalRefineDB := opt.refine()
	svec := make([][3]float64, ns)
	for k, s := range p.world.Stations {
		svec[k] = unitVec(s.Place.LatDeg(), s.Place.LonDeg())
	}
	// The lattice is filled in two passes: exactly on every other node,
	// then on the nodes between only where the coarse square around them
	// is not smooth for that station (attenuation varying by more than
	// refineDB); elsewhere they are interpolated from the coarse nodes.
	pause := opt.Pause
	if pause == nil {
		pause = func() {}
	}
	exactNode := func(i, j int, buf *propagation.Path, only func(k int) bool) {
		pause()
		pl := cellPlace(float64(i*stride), float64(j*stride))
		v := unitVec(pl.LatDeg(), pl.LonDeg())
		for k, s := range p.world.Stations {
			sp := spreadDB(arcKm(svec[k], v))
			spread[(j*lx+i)*ns+k] = sp
			if only != nil && !only(k) {
				continue
			}
			g, err := p.groundAt(k, s, pl, t, buf)
			if err != nil {
				fail(err)
				return
			}
			ground[(j*lx+i)*ns+k] = g - sp
		}
	}
	coarse := func(i int) int { return min(i-i%2, lx-1-(lx-1)%2) }
	parallel(ly, func(j int) {
		if j%2 != 0 {
			return
		}
		var buf propagation.Path
		for i := 0; i < lx; i += 2 {
			exactNode(i, j, &buf, nil)
		}
	})
	parallel(ly, func(j int) {
		var buf propagation.Path
		for i := range lx {
			if i%2 == 0 && j%2 == 0 {
				continue
			}
			// Coarse square holding (i, j): corners (i0, j0) … (i0+2, j0+2).
			i0, j0 := coarse(i), coarse(j)
			if i0+2 >= lx || j0+2 >= ly {
				exactNode(i, j, &buf, nil) // at the far edge: no coarse square
				continue
			}
			smooth := func(k int) bool {
				a, b := ground[(j0*lx+i0)*ns+k], ground[(j0*lx+i0+2)*ns+k]
				c, d := ground[((j0+2)*lx+i0)*ns+k], ground[((j0+2)*lx+i0+2)*ns+k]
				return math.Max(math.Max(a, b), math.Max(c, d))-math.Min(math.Min(a, b), math.Min(c, d)) <= refineDB
			}
			exactNode(i, j, &buf, func(k int) bool { return !smooth(k) })
			u, w := float64(i-i0)/2, float64(j-j0)/2
			for k := range ns {
				if smooth(k) {
					at := func(ii, jj int) float64 { return ground[(jj*lx+ii)*ns+k] }
					ground[(j*lx+i)*ns+k] = (1-u)*(1-w)*at(i0, j0) + u*(1-w)*at(i0+2, j0) + (1-u)*w*at(i0, j0+2) + u*w*at(i0+2, j0+2)
				}
			}
		}
	})
	// The sky wave: its median on the sky lattice, less the hourly loss
	// factor, which varies slowly across a map and is computed on a
	// lattice four times coarser and interpolated. As in Predict, no sky
	// wave counts with the sun 10° or more up at the path midpoint.
	const noSkyLoss = 1000.0
	ltStride := 4 * skyStride
	tx, ty := (sx-1)*skyStride/ltStride+2, (sy-1)*skyStride/ltStride+2
	lt := make([]float64, tx*ty*ns)
	kws := make([]float64, ns)
	for k, s := range p.world.Stations {
		kw, err := p.powerAt(s, t)
		if err != nil {
			return nil, err
		}
		kws[k] = kw
	}
	parallel(ty, func(j int) {
		for i := range tx {
			pause()
			pl := cellPlace(float64(i*ltStride), float64(j*ltStride))
			for k, s := range p.world.Stations {
				v := noSkyLoss
				if propagation.DistanceKm(s.Place, pl) >= 1 {
					hl, err := propagation.HourlyLossDB(t, s.Place, pl)
					if err != nil {
						fail(err)
						return
					}
					if hl.LossDB < propagation.DaytimeLossDB && hl.SunElevMidDeg < 10 {
						v = hl.LossDB
					}
				}
				lt[(j*tx+i)*ns+k] = v
			}
		}
	})
	parallel(sy, func(j int) {
		fy := float64(j*skyStride) / float64(ltStride)
		lj := min(int(fy), ty-2)
		lv := fy - float64(lj)
		for i := range sx {
			pause()
			pl := cellPlace(float64(i*skyStride), float64(j*skyStride))
			fx := float64(i*skyStride) / float64(ltStride)
			li := min(int(fx), tx-2)
			lu := fx - float64(li)
			for k, s := range p.world.Stations {
				at := func(ii, jj int) float64 { return lt[(jj*tx+ii)*ns+k] }
				loss := (1-lu)*(1-lv)*at(li, lj) + lu*(1-lv)*at(li+1, lj) + (1-lu)*lv*at(li, lj+1) + lu*lv*at(li+1, lj+1)
				v := noSkyDBuVm
				if loss < propagation.DaytimeLossDB && propagation.DistanceKm(s.Place, pl) >= 1 {
					sw, err := propagation.NightSkyWave(propagation.SkyPath{Tx: s.Place, Rx: pl, Freq: s.KHz, PowerKW: kws[k], HeightDeg: s.HeightDeg})
					if err != nil {
						fail(err)
						return
					}
					v = sw.MedianDBuVm + sw.ReceiveCorrDB - loss
				}
				sky[(j*sx+i)*ns+k] = v
			}
		}
	})
	if firstErr != nil {
		return nil, firstErr
	}
	// The lattice holds each station's field less its inverse-distance
	// spread. Where that changes by more than finalRefineDB across a
	// lattice square (across a coast, very close to the station), bilinear
	// interpolation is not trusted: those squares are computed exactly for
	// that station. Where the spread itself varies by under 0.5 dB across a
	// square (far from the station) it is interpolated with the rest,
	// saving a distance per cell.
	const (
		sqSmooth = iota // interpolate field and spread together
		sqSpread        // interpolate the attenuation, compute the spread
		sqExact         // compute the field
	)
	rangeOf := func(vals []float64, i, j, k int) float64 {
		a, b := vals[(j*lx+i)*ns+k], vals[(j*lx+i+1)*ns+k]
		c, d := vals[((j+1)*lx+i)*ns+k], vals[((j+1)*lx+i+1)*ns+k]
		return math.Max(math.Max(a, b), math.Max(c, d)) - math.Min(math.Min(a, b), math.Min(c, d))
	}
	sqKind := make([]uint8, (lx-1)*(ly-1)*ns)
	for j := 0; j < ly-1; j++ {
		for i := 0; i < lx-1; i++ {
			for k := range ns {
				switch {
				case rangeOf(ground, i, j, k) > finalRefineDB:
					sqKind[(j*(lx-1)+i)*ns+k] = sqExact
				case rangeOf(spread, i, j, k) > 0.5:
					sqKind[(j*(lx-1)+i)*ns+k] = sqSpread
				}
			}
		}
	}
	// Squares marked exact are first sampled on a 3×3 sub-lattice (the
	// corners plus five points at half stride); each quarter whose
	// attenuation still changes by more than finalRefineDB is then computed
	// cell by cell, the others interpolated like the lattice.
	type subLattice struct {
		a      [3][3]float64 // attenuation (field less spread) at the sub-lattice
		smooth [2][2]bool
	}
	var subs map[int]*subLattice
	if stride >= 4 && stride%2 == 0 {
		var todo []int
		for q, kd := range sqKind {
			if kd == sqExact {
				todo = append(todo, q)
			}
		}
		subs = make(map[int]*subLattice, len(todo))
		results := make([]*subLattice, len(todo))
		half := stride / 2
		chunk := (len(todo) + 63) / 64
		parallel((len(todo)+chunk-1)/max(chunk, 1), func(c int) {
			var buf propagation.Path
			for n := c * chunk; n < min(len(todo), (c+1)*chunk); n++ {
				pause()
				q := todo[n]
				k := q % ns
				sqi := q / ns
				i, j := sqi%(lx-1), sqi/(lx-1)
				sl := &subLattice{}
				for b := range 3 {
					for a := range 3 {
						if a%2 == 0 && b%2 == 0 {
							sl.a[b][a] = ground[((j+b/2)*lx+i+a/2)*ns+k]
							continue
						}
						cx, cy := i*stride+a*half, j*stride+b*half
						pl := cellPlace(float64(cx), float64(cy))
						g, err := p.groundAt(k, p.world.Stations[k], pl, t, &buf)
						if err != nil {
							fail(err)
							return
						}
						sl.a[b][a] = g - spreadDB(arcKm(svec[k], unitVec(pl.LatDeg(), pl.LonDeg())))
					}
				}
				for b := range 2 {
					for a := range 2 {
						v := [4]float64{sl.a[b][a], sl.a[b][a+1], sl.a[b+1][a], sl.a[b+1][a+1]}
						sl.smooth[b][a] = math.Max(math.Max(v[0], v[1]), math.Max(v[2], v[3]))-
							math.Min(math.Min(v[0], v[1]), math.Min(v[2], v[3])) <= finalRefineDB
					}
				}
				results[n] = sl
			}
		})
		for n, q := range todo {
			subs[q] = results[n]
		}
	}
	// Field (attenuation + spread) at the lattice nodes, for sqSmooth.
	for i := range ground {
		spread[i] += ground[i]
	}
	field := spread
	// For a count map over smooth squares, each station's margin over its
	// weakest audible field (total field less threshold) is taken at the
	// square's corners and interpolated bilinearly to the cells; where all
	// four corners agree the square is counted, or not, whole (a bilinear
	// interpolant lies between its corner values).
	var decided []int8       // per (square, station): +1 audible, −1 not, 0 look, 2 not smooth
	var cornerM [][4]float64 // per (square, station): corner margins, for "look"
	if kind == MapCount && stride > 1 {
		decided = make([]int8, len(sqKind))
		cornerM = make([][4]float64, len(sqKind))
		skyAtNode := func(i, j, k int) float64 {
			// Ground-lattice node (i, j) on the sky lattice (skyStride = 2·stride).
			fx, fy := float64(i)/2, float64(j)/2
			si, sj := min(int(fx), sx-2), min(int(fy), sy-2)
			u, v := fx-float64(si), fy-float64(sj)
			at := func(a, b int) float64 { return sky[(b*sx+a)*ns+k] }
			return (1-u)*(1-v)*at(si, sj) + u*(1-v)*at(si+1, sj) + (1-u)*v*at(si, sj+1) + u*v*at(si+1, sj+1)
		}
		total := make([]float64, lx*ly*ns)
		for j := range ly {
			for i := range lx {
				for k := range ns {
					n := (j*lx+i)*ns + k
					total[n] = propagation.PowerSumDBuVm(field[n], skyAtNode(i, j, k)) - cts[k].minDBuVm
				}
			}
		}
		for j := 0; j < ly-1; j++ {
			for i := 0; i < lx-1; i++ {
				for k := range ns {
					q := (j*(lx-1)+i)*ns + k
					if sqKind[q] != sqSmooth {
						decided[q] = 2
						continue
					}
					c := [4]float64{total[(j*lx+i)*ns+k], total[(j*lx+i+1)*ns+k], total[((j+1)*lx+i)*ns+k], total[((j+1)*lx+i+1)*ns+k]}
					switch {
					case c[0] >= 0 && c[1] >= 0 && c[2] >= 0 && c[3] >= 0:
						decided[q] = 1
					case c[0] < 0 && c[1] < 0 && c[2] < 0 && c[3] < 0:
						decided[q] = -1
					default:
						cornerM[q] = c
					}
				}
			}
		}
	}
	g := &Grid{Box: box, NX: nx, NY: ny, Kind: kind, StationID: stationID, At: t, Values: make([]float64, nx*ny)}
	parallel(ny, func(iy int) {
		fields := make([]float64, ns)
		var buf propagation.Path
		// Row position in the two lattices.
		gy := float64(iy) / float64(stride)
		gj := int(gy)
		gv := gy - float64(gj)
		sy := float64(iy) / float64(skyStride)
		sj := int(sy)
		sv := sy - float64(sj)
		for ix := range nx {
			pause()
			var pl propagation.Place
			placed := false
			var v [3]float64
			vecDone := false
			gx := float64(ix) / float64(stride)
			gi := int(gx)
			gu := gx - float64(gi)
			g00, g10 := (gj*lx+gi)*ns, (gj*lx+gi+1)*ns
			g01, g11 := ((gj+1)*lx+gi)*ns, ((gj+1)*lx+gi+1)*ns
			sxf := float64(ix) / float64(skyStride)
			si := int(sxf)
			su := sxf - float64(si)
			s00, s10 := (sj*sx+si)*ns, (sj*sx+si+1)*ns
			s01, s11 := ((sj+1)*sx+si)*ns, ((sj+1)*sx+si+1)*ns
			sqRow := ((iy/stride)*(lx-1) + ix/stride) * ns
			known := 0 // stations counted without computing their field here
			for k, s := range p.world.Stations {
				if decided != nil && decided[sqRow+k] != 2 {
					switch decided[sqRow+k] {
					case 1:
						known++
					case 0:
						c := cornerM[sqRow+k]
						if (1-gu)*(1-gv)*c[0]+gu*(1-gv)*c[1]+(1-gu)*gv*c[2]+gu*gv*c[3] >= 0 {
							known++
						}
					}
					fields[k] = math.Inf(-1)
					continue
				}
				var gr float64
				sq := uint8(sqExact)
				if stride > 1 {
					sq = sqKind[sqRow+k]
				}
				switch sq {
				case sqExact:
					if sl := subs[sqRow+k]; sl != nil {
						half := float64(stride / 2)
						ox, oy := float64(ix%stride)/half, float64(iy%stride)/half
						a, b := int(ox), int(oy)
						if sl.smooth[b][a] {
							u, w := ox-float64(a), oy-float64(b)
							if !vecDone {
								lat, lon := box.Cell(ix, iy, nx, ny)
								v, vecDone = unitVec(lat, lon), true
							}
							gr = (1-u)*(1-w)*sl.a[b][a] + u*(1-w)*sl.a[b][a+1] + (1-u)*w*sl.a[b+1][a] + u*w*sl.a[b+1][a+1] +
								spreadDB(arcKm(svec[k], v))
							break
						}
					}
					if !placed {
						pl, placed = cellPlace(float64(ix), float64(iy)), true
					}
					var err error
					if gr, err = p.groundAt(k, s, pl, t, &buf); err != nil {
						fail(err)
						return
					}
				case sqSpread:
					if !vecDone {
						lat, lon := box.Cell(ix, iy, nx, ny)
						v, vecDone = unitVec(lat, lon), true
					}
					gr = (1-gu)*(1-gv)*ground[g00+k] + gu*(1-gv)*ground[g10+k] + (1-gu)*gv*ground[g01+k] + gu*gv*ground[g11+k] +
						spreadDB(arcKm(svec[k], v))
				default:
					gr = (1-gu)*(1-gv)*field[g00+k] + gu*(1-gv)*field[g10+k] + (1-gu)*gv*field[g01+k] + gu*gv*field[g11+k]
				}
				sk := (1-su)*(1-sv)*sky[s00+k] + su*(1-sv)*sky[s10+k] + (1-su)*sv*sky[s01+k] + su*sv*sky[s11+k]
				fields[k] = propagation.PowerSumDBuVm(gr, sk)
			}
			g.Values[iy*nx+ix] = p.cellValue(kind, sel, fields, cts) + float64(known)
		}
	})
	if firstErr != nil {
		return nil, firstErr
	}
	return g, nil
}

// unitVec returns the unit vector of a place on the sphere.
func unitVec(latDeg, lonDeg float64) [3]float64 {
	sl, cl := math.Sincos(latDeg * math.Pi / 180)
	so, co := math.Sincos(lonDeg * math.Pi / 180)
	return [3]float64{cl * co, cl * so, sl}
}

// arcKm returns the great-circle distance between two unit vectors (the
// robust atan2 form; the same sphere as propagation.DistanceKm).
func arcKm(a, b [3]float64) float64 {
	cx := a[1]*b[2] - a[2]*b[1]
	cy := a[2]*b[0] - a[0]*b[2]
	cz := a[0]*b[1] - a[1]*b[0]
	dot := a[0]*b[0] + a[1]*b[1] + a[2]*b[2]
	return propagation.EarthRadiusKm * math.Atan2(math.Sqrt(cx*cx+cy*cy+cz*cz), dot)
}

// spreadDB is the inverse-distance part of the field, −20·log10(d_km),
// taken out before interpolation so that what is interpolated (the
// attenuation and the source term) is smooth right up to the station.
func spreadDB(dKm float64) float64 { return -20 * math.Log10(math.Max(dKm, 0.05)) }

// cellValue turns the stations' fields at one cell into the map's value.
func (p *Planner) cellValue(kind MapKind, sel int, fields []float64, cts []*chainTable) float64 {
	switch kind {
	case MapStation:
		return fields[sel] - cts[sel].minDBuVm
	case MapTraps:
		n := 0
		for i, fi := range fields {
			if fi < cts[i].minDBuVm {
				continue
			}
			for j, fj := range fields {
				if j != i && fi-fj-cts[i].front.SelectivityDB(p.world.Stations[j].KHz) < receiver.UsableProtectionDB {
					n++
					break
				}
			}
		}
		return float64(n)
	}
	n := 0
	for i, f := range fields {
		if f >= cts[i].minDBuVm {
			n++
		}
	}
	return float64(n)
}

// groundAt returns station k's ground-wave field at pl, sampling the
// path into *buf (reused between calls by one goroutine).
func (p *Planner) groundAt(k int, s Station, pl propagation.Place, t time.Time, buf *propagation.Path) (float64, error) {
	d0 := propagation.DistanceKm(s.Place, pl)
	d := math.Max(d0, 0.05)
	var path propagation.Path
	var err error
	if d0 < 0.05 {
		path = propagation.Path{{LengthKm: d, Ground: p.world.Ground(s.Place.LatDeg(), s.Place.LonDeg())}}
	} else {
		path, err = propagation.AppendSamplePath(*buf, p.world.Ground, s.Place, pl, pathStepKm(d))
		if err != nil {
			return 0, err
		}
		*buf = path
	}
	kw, err := p.powerAt(s, t)
	if err != nil {
		return 0, err
	}
	e, _, err := p.curves.PathFieldDBuVm(propagation.Transmitter{Freq: s.KHz, PowerKW: kw, GainDB: p.gainHorz[k]}, path)
	return e, err
}

// noSkyDBuVm stands for "no sky wave" in interpolated lattices (−Inf
// would turn a zero interpolation weight into NaN).
const noSkyDBuVm = -300.0

// powerAt returns the station's power at t: night power when the sun is
// down at the transmitter and a night power is given.
func (p *Planner) powerAt(s Station, t time.Time) (float64, error) {
	if s.KWNight <= 0 {
		return s.KWDay, nil
	}
	el, err := propagation.SolarElevationDeg(t, s.Place.LatDeg(), s.Place.LonDeg())
	if err != nil {
		return 0, err
	}
	if el < propagation.RiseSetElevationDeg {
		return s.KWNight, nil
	}
	return s.KWDay, nil
}

// WithRig returns a planner for the same world with another rig, sharing
// this planner's ground-wave curves.
func (p *Planner) WithRig(spec receiver.RigSpec) (*Planner, error) {
	q, err := NewPlanner(p.world, spec)
	if err != nil {
		return nil, err
	}
	q.curves, q.pause = p.curves, p.pause
	return q, nil
}

// SpecWithWire returns spec with the wire length and height changed; a
// down-lead that no longer fits (shorter than the height or longer than
// twice it) becomes a plain vertical drop of the new height.
func SpecWithWire(spec receiver.RigSpec, wireM, heightM float64) receiver.RigSpec {
	spec.WireM, spec.HeightM = wireM, heightM
	if spec.DownleadM > 2*heightM || spec.DownleadM < heightM {
		spec.DownleadM = heightM
	}
	return spec
}

// Spec returns the planner's rig as specified.
func (p *Planner) Spec() receiver.RigSpec { return p.spec }

// WireRow is one wire length of an antenna sweep.
type WireRow struct {
	WireM, HeightM     float64
	AudibleDay         int
	AudibleNight       int
	MarginDay, MarginN map[string]float64 // by station id
}

// WireSweep predicts at spot for each wire length (m) and height (m), by
// day (at day) and at night (at night): how many stations each extra
// length of wire buys.
func (p *Planner) WireSweep(spot Spot, lengthsM, heightsM []float64, day, night time.Time, progress Progress) ([]WireRow, error) {
	var rows []WireRow
	total, done := len(lengthsM)*len(heightsM), 0
	for _, h := range heightsM {
		for _, l := range lengthsM {
			q, err := p.WithRig(SpecWithWire(p.spec, l, h))
			if err != nil {
				return nil, fmt.Errorf("wire %g m at %g m: %w", l, h, err)
			}
			row := WireRow{WireM: l, HeightM: h, MarginDay: map[string]float64{}, MarginN: map[string]float64{}}
			for _, c := range []struct {
				at     time.Time
				count  *int
				margin map[string]float64
			}{{day, &row.AudibleDay, row.MarginDay}, {night, &row.AudibleNight, row.MarginN}} {
				pr, err := q.Predict(spot, c.at)
				if err != nil {
					return nil, err
				}
				*c.count = pr.Audible()
				for _, hd := range pr.Heard {
					c.margin[hd.Station.ID] = hd.DetectorDB
				}
			}
			rows = append(rows, row)
			done++
			if progress != nil {
				progress(done, total)
			}
		}
	}
	return rows, nil
}

// HourRow is one hour of an hour sweep.
type HourRow struct {
	At      time.Time
	Audible int
	Night   bool
	FieldDB map[string]float64 // combined field by station id
	Heard   map[string]bool
}

// HourSweep predicts at spot every hour for 24 hours from start.
func (p *Planner) HourSweep(spot Spot, start time.Time, progress Progress) ([]HourRow, error) {
	var rows []HourRow
	for h := range 24 {
		at := start.Add(time.Duration(h) * time.Hour)
		pr, err := p.Predict(spot, at)
		if err != nil {
			return nil, err
		}
		row := HourRow{At: at, Audible: pr.Audible(), Night: pr.Night, FieldDB: map[string]float64{}, Heard: map[string]bool{}}
		for _, hd := range pr.Heard {
			row.FieldDB[hd.Station.ID] = hd.FieldDB
			row.Heard[hd.Station.ID] = hd.Audible
		}
		rows = append(rows, row)
		if progress != nil {
			progress(h+1, 24)
		}
	}
	return rows, nil
}

// Compare predicts at each spot at t.
func (p *Planner) Compare(spots []Spot, t time.Time) ([]Prediction, error) {
	var out []Prediction
	for _, s := range spots {
		pr, err := p.Predict(s, t)
		if err != nil {
			return nil, err
		}
		out = append(out, pr)
	}
	return out, nil
}
