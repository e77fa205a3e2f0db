package propagation

import (
	"fmt"

	"gonum.org/v1/gonum/interp"
	"gonum.org/v1/gonum/mat"
)

// fitNotAKnot fits pc to the not-a-knot cubic spline through (xs, ys):
// the same interpolant as gonum's interp.NotAKnotCubic, found from the
// spline's slopes s_i, which satisfy a tridiagonal system (solved in
// O(n) by mat.Tridiag, where NotAKnotCubic's banded system goes through a
// dense factorisation):
//
//	h_i·s_{i−1} + 2(h_{i−1}+h_i)·s_i + h_{i−1}·s_{i+1} = 3(h_i·δ_{i−1} + h_{i−1}·δ_i),  0 < i < n−1
//	h_1·s_0 + (h_0+h_1)·s_1 = ((h_0 + 2(h_0+h_1))·h_1·δ_0 + h_0²·δ_1) / (h_0+h_1)
//
// with h_i = x_{i+1} − x_i, δ_i = (y_{i+1} − y_i)/h_i, and the mirror of the
// second line at the right end (the not-a-knot conditions: the third
// derivative is continuous at x_1 and x_{n−2}); pc is then the Hermite
// cubic with those slopes. xs must increase; n ≥ 4.
//
// Reference: C. de Boor, A Practical Guide to Splines (Springer, 1978),
// ch. IV, the not-a-knot end condition in slope form (from memory; checked
// against interp.NotAKnotCubic in TestFitNotAKnot).
func fitNotAKnot(pc *interp.PiecewiseCubic, xs, ys []float64) error {
	n := len(xs)
	if n < 4 || len(ys) != n {
		return fmt.Errorf("propagation: not-a-knot spline needs at least 4 points and as many values, got %d and %d", n, len(ys))
	}
	h := make([]float64, n-1)
	d := make([]float64, n-1)
	for i := range h {
		h[i] = xs[i+1] - xs[i]
		if !(h[i] > 0) {
			return fmt.Errorf("propagation: spline abscissae must increase, got %g after %g", xs[i+1], xs[i])
		}
		d[i] = (ys[i+1] - ys[i]) / h[i]
	}
	dl := make([]float64, n-1) // (i+1, i)
	dg := make([]float64, n)
	du := make([]float64, n-1) // (i, i+1)
	b := mat.NewVecDense(n, nil)
	w := h[0] + h[1]
	dg[0], du[0] = h[1], w
	b.SetVec(0, ((h[0]+2*w)*h[1]*d[0]+h[0]*h[0]*d[1])/w)
	for i := 1; i < n-1; i++ {
		dl[i-1], dg[i], du[i] = h[i], 2*(h[i-1]+h[i]), h[i-1]
		b.SetVec(i, 3*(h[i]*d[i-1]+h[i-1]*d[i]))
	}
	w = h[n-2] + h[n-3]
	dl[n-2], dg[n-1] = w, h[n-3]
	b.SetVec(n-1, (h[n-2]*h[n-2]*d[n-3]+(2*w+h[n-2])*h[n-3]*d[n-2])/w)
	var s mat.VecDense
	if err := mat.NewTridiag(n, dl, dg, du).SolveVecTo(&s, false, b); err != nil {
		return fmt.Errorf("propagation: not-a-knot spline: %w", err)
	}
	slopes := make([]float64, n)
	for i := range slopes {
		slopes[i] = s.AtVec(i)
	}
	pc.FitWithDerivatives(xs, ys, slopes)
	return nil
}
