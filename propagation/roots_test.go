package propagation

import (
	"math"
	"math/cmplx"
	"testing"
)

// TestModeRootsLimits checks the tracked roots against the limits they are
// tracked from, through the series of methods.md §1.7 [D]:
// t ≈ t⁰ + q/t⁰ − q²/(2t⁰³) for small q, t ≈ t^∞ + 1/q for large q,
// with t⁰ = α′_s e^{−jπ/3}, t^∞ = α_s e^{−jπ/3} (A&S Table 10.13).
func TestModeRootsLimits(t *testing.T) {
	alpha, alphaP := airyZeros(5)
	for _, q := range []complex128{1e-4 - 1e-4i, 1e-3 * cmplx.Exp(-0.3i)} {
		roots, err := modeRoots(q, 5)
		if err != nil {
			t.Fatal(err)
		}
		for s, r := range roots {
			t0 := complex(alphaP[s], 0) * epi3
			want := t0 + q/t0 - q*q/(2*t0*t0*t0)
			if cmplx.Abs(r-want) > 1e-9 {
				t.Errorf("q = %v mode %d: t = %v, small-q series %v", q, s+1, r, want)
			}
		}
	}
	for _, q := range []complex128{1e4 - 1e4i, 3e4 * cmplx.Exp(-1.2i)} {
		roots, err := modeRoots(q, 5)
		if err != nil {
			t.Fatal(err)
		}
		for s, r := range roots {
			want := complex(alpha[s], 0)*epi3 + 1/q
			if cmplx.Abs(r-want) > 1e-7 {
				t.Errorf("q = %v mode %d: t = %v, large-q series %v", q, s+1, r, want)
			}
		}
	}
}

// TestModeRootsSubstitution: for the q of every P.368 ground from 10 kHz
// to 30 MHz, each root satisfies w′ − q·w = 0 (substitution, with the Airy
// functions checked against mpmath in airy_test.go) and no root appears
// twice (a skipped mode would show as a duplicate).
func TestModeRootsSubstitution(t *testing.T) {
	for _, f := range []KHz{10, 100, 300, 1000, 3000, 10000, 30000} {
		for _, g := range GroundTypes() {
			h := mustHomogeneous(t, f, g.Ground)
			if i, j := duplicateRoots(h.roots); i >= 0 {
				t.Errorf("%g kHz %s: modes %d and %d coincide", float64(f), g.Name, i+1, j+1)
			}
			for s, r := range h.roots {
				fv, _, scale := modeEquation(r, h.q)
				if cmplx.Abs(fv) > 1e-9*scale {
					t.Errorf("%g kHz %s mode %d: residual %g of %g", float64(f), g.Name, s+1, cmplx.Abs(fv), scale)
					break
				}
			}
			// Each mode is attenuated (Im t < 0), as a ground wave must be.
			if im := imag(h.roots[0]); !(im < 0) || math.IsNaN(im) {
				t.Errorf("%g kHz %s: least attenuated mode has Im t = %g", float64(f), g.Name, im)
			}
		}
	}
}

// TestDuplicateRoots: the duplicate check finds a planted duplicate.
func TestDuplicateRoots(t *testing.T) {
	roots := []complex128{1 - 1i, 3 - 2i, 5 - 3i, 3 - 2i + 1e-9, 7 - 4i}
	if i, j := duplicateRoots(roots); i != 1 || j != 3 {
		t.Errorf("duplicateRoots = %d, %d, want 1, 3", i, j)
	}
	if i, _ := duplicateRoots(roots[:3]); i != -1 {
		t.Errorf("duplicateRoots found a duplicate in distinct roots")
	}
}
