package receiver

import "math"

// illinoisRoot returns a root of g in [lo, hi], given g's values glo and
// ghi there with opposite signs, by the Illinois variant of regula falsi:
// the secant through the bracket's ends, halving the value kept at an end
// that stays put twice, so that convergence is superlinear and the
// iterate never leaves the bracket. It stops when the bracket is narrower
// than xtol or |g| is at most ftol (after at most 100 steps) and returns
// the last iterate; an error from g is returned at once.
//
// Reference: M. Dowell and P. Jarratt, "A modified regula falsi method for
// computing the root of an equation", BIT 11 (1971) 168–174.
func illinoisRoot(g func(x float64) (float64, error), lo, hi, glo, ghi, xtol, ftol float64) (float64, error) {
	x, side := lo, 0
	for range 100 {
		if hi-lo <= xtol {
			break
		}
		x = (lo*ghi - hi*glo) / (ghi - glo)
		if !(x > lo && x < hi) {
			x = (lo + hi) / 2
		}
		gx, err := g(x)
		if err != nil {
			return 0, err
		}
		if gx == 0 || math.Abs(gx) <= ftol {
			return x, nil
		}
		if (gx < 0) == (glo < 0) {
			lo, glo = x, gx
			if side == -1 {
				ghi /= 2
			}
			side = -1
		} else {
			hi, ghi = x, gx
			if side == 1 {
				glo /= 2
			}
			side = 1
		}
	}
	return x, nil
}
