package propagation

import (
	"math"
	"sync"

	"gonum.org/v1/gonum/interp"
)

// Curve grid: distances from curveMinKm to curveMaxKm, curvePerDecade points
// per decade of distance, equally spaced in ln d.
const (
	curveMinKm     = 0.05
	curveMaxKm     = MaxDistKm
	curvePerDecade = 40
)

// Curve is a precomputed homogeneous ground-wave curve for one frequency and
// one ground: the attenuation 20·log10|A| against ln d, interpolated by a
// not-a-knot cubic spline (fitNotAKnot, evaluated by gonum's interp.PiecewiseCubic). The flat-earth and the
// residue-series parts are fitted separately so that the small step
// between the two methods at SwitchX is not smeared by the spline.
// A Curve is immutable and safe for concurrent use.
type Curve struct {
	h        *Homogeneous
	switchKm float64
	flat     interp.PiecewiseCubic // ln d ≤ ln switchKm, not-a-knot (fitNotAKnot)
	sphere   interp.PiecewiseCubic // ln d ≥ ln switchKm, not-a-knot
}

// NewCurve computes the ground-wave curve at f over g (a few milliseconds).
func NewCurve(f KHz, g Ground) (*Curve, []Warning, error) {
	h, warn, err := NewHomogeneous(f, g)
	if err != nil {
		return nil, nil, err
	}
	c := &Curve{h: h, switchKm: SwitchX * EffectiveEarthRadiusKm / h.m}
	lnMin, lnMax, lnSw := math.Log(curveMinKm), math.Log(curveMaxKm), math.Log(c.switchKm)
	step := math.Ln10 / curvePerDecade
	var fx, fy, sx, sy []float64
	if lnSw > lnMin {
		n := int(math.Ceil((lnSw - lnMin) / step))
		if n < 4 {
			n = 4
		}
		for i := 0; i <= n; i++ {
			u := lnMin + (lnSw-lnMin)*float64(i)/float64(n)
			fx = append(fx, u)
			fy = append(fy, h.FlatEarthDB(math.Exp(u)))
		}
		if err := fitNotAKnot(&c.flat, fx, fy); err != nil {
			return nil, nil, err
		}
	} else {
		lnSw = lnMin
		c.switchKm = curveMinKm
	}
	n := int(math.Ceil((lnMax - lnSw) / step))
	for i := 0; i <= n; i++ {
		u := lnSw + (lnMax-lnSw)*float64(i)/float64(n)
		sx = append(sx, u)
		sy = append(sy, h.residueDB(h.NormalisedDistance(math.Exp(u))))
	}
	if err := fitNotAKnot(&c.sphere, sx, sy); err != nil {
		return nil, nil, err
	}
	return c, warn, nil
}

// Homogeneous returns the direct model behind the curve.
func (c *Curve) Homogeneous() *Homogeneous { return c.h }

// AttenuationDB returns the interpolated 20·log10|A| at distKm (> 0).
// Outside the grid it evaluates the model directly.
func (c *Curve) AttenuationDB(distKm float64) float64 {
	return c.attenuationDB(distKm, math.Log(distKm))
}

// attenuationDB is AttenuationDB with u = ln(distKm) already known.
func (c *Curve) attenuationDB(distKm, u float64) float64 {
	switch {
	case distKm < curveMinKm:
		return c.h.AttenuationDB(distKm)
	case distKm < c.switchKm:
		return c.flat.Predict(u)
	case distKm <= curveMaxKm:
		return c.sphere.Predict(u)
	}
	return c.h.AttenuationDB(distKm)
}

// FieldDBuVm returns the interpolated field in dB(µV/m) at distKm for the
// reference source (1 kW, short monopole), as Homogeneous.FieldDBuVm.
func (c *Curve) FieldDBuVm(distKm float64) float64 {
	u := math.Log(distKm)
	return RefFieldDBuVm1km - (20/math.Ln10)*u + c.attenuationDB(distKm, u)
}

// curveKey identifies a cached curve.
type curveKey struct {
	f KHz
	g Ground
}

// CurveCache holds homogeneous ground-wave curves, computed on first use.
// The zero value is ready to use and safe for concurrent use.
type CurveCache struct {
	mu     sync.Mutex
	curves map[curveKey]*Curve
}

// Curve returns the cached curve for f and g, computing it if needed.
func (cc *CurveCache) Curve(f KHz, g Ground) (*Curve, error) {
	key := curveKey{f, g}
	cc.mu.Lock()
	c, ok := cc.curves[key]
	cc.mu.Unlock()
	if ok {
		return c, nil
	}
	c, _, err := NewCurve(f, g)
	if err != nil {
		return nil, err
	}
	cc.mu.Lock()
	if cc.curves == nil {
		cc.curves = make(map[curveKey]*Curve)
	}
	cc.curves[key] = c
	cc.mu.Unlock()
	return c, nil
}

// Has reports whether the curve for f and g is already computed.
func (cc *CurveCache) Has(f KHz, g Ground) bool {
	cc.mu.Lock()
	defer cc.mu.Unlock()
	_, ok := cc.curves[curveKey{f, g}]
	return ok
}

// Len returns the number of cached curves.
func (cc *CurveCache) Len() int {
	cc.mu.Lock()
	defer cc.mu.Unlock()
	return len(cc.curves)
}
