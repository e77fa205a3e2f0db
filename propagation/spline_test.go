package propagation

import (
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/interp"
)

// TestFitNotAKnot: the tridiagonal fit gives gonum's interp.NotAKnotCubic
// (the reference library's implementation of the same spline) to 1e-9
// relative, on uneven random grids and on a smooth curve, at and between
// the knots.
func TestFitNotAKnot(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	for _, n := range []int{4, 5, 9, 40, 190} {
		xs := make([]float64, n)
		ys := make([]float64, n)
		x := -3.0
		for i := range xs {
			x += 0.05 + rng.Float64()
			xs[i] = x
			ys[i] = math.Sin(x) + 0.3*rng.NormFloat64()
		}
		var want interp.NotAKnotCubic
		if err := want.Fit(xs, ys); err != nil {
			t.Fatal(err)
		}
		var got interp.PiecewiseCubic
		if err := fitNotAKnot(&got, xs, ys); err != nil {
			t.Fatal(err)
		}
		for k := 0; k <= 10*(n-1); k++ {
			u := xs[0] + (xs[n-1]-xs[0])*float64(k)/float64(10*(n-1))
			g, w := got.Predict(u), want.Predict(u)
			if math.Abs(g-w) > 1e-9*math.Max(1, math.Abs(w)) {
				t.Errorf("n=%d x=%g: tridiagonal %.12g, NotAKnotCubic %.12g", n, u, g, w)
				break
			}
		}
	}
	var pc interp.PiecewiseCubic
	if err := fitNotAKnot(&pc, []float64{0, 1, 2}, []float64{0, 1, 4}); err == nil {
		t.Error("3 points: no error")
	}
	if err := fitNotAKnot(&pc, []float64{0, 1, 1, 2}, []float64{0, 1, 1, 4}); err == nil {
		t.Error("repeated abscissa: no error")
	}
}

func BenchmarkFitNotAKnot(b *testing.B) {
	xs := make([]float64, 190)
	ys := make([]float64, 190)
	for i := range xs {
		xs[i] = float64(i) * 0.06
		ys[i] = math.Sin(xs[i])
	}
	b.Run("tridiagonal", func(b *testing.B) {
		var pc interp.PiecewiseCubic
		for b.Loop() {
			if err := fitNotAKnot(&pc, xs, ys); err != nil {
				b.Fatal(err)
			}
		}
	})
	b.Run("gonum-NotAKnotCubic", func(b *testing.B) {
		var nak interp.NotAKnotCubic
		for b.Loop() {
			if err := nak.Fit(xs, ys); err != nil {
				b.Fatal(err)
			}
		}
	})
}
