package propagation

import (
	"fmt"
	"math/cmplx"
	"sort"
	"strings"
)

// Ground describes homogeneous ground by its electrical constants.
type Ground struct {
	SigmaSPerM float64 // conductivity σ, S/m
	EpsR       float64 // relative permittivity εr
}

// Validate returns an error naming the field at fault if σ ≤ 0, εr < 1 or
// either is not finite.
func (g Ground) Validate() error {
	if err := checkFinite("sigma", g.SigmaSPerM, "S/m"); err != nil {
		return err
	}
	if err := checkFinite("epsr", g.EpsR, ""); err != nil {
		return err
	}
	if g.SigmaSPerM <= 0 || g.SigmaSPerM > 1e3 {
		return &InputError{Field: "sigma", Value: g.SigmaSPerM, Unit: "S/m", Want: "> 0 and <= 1000"}
	}
	if g.EpsR < 1 || g.EpsR > 1e3 {
		return &InputError{Field: "epsr", Value: g.EpsR, Want: ">= 1 and <= 1000"}
	}
	return nil
}

func (g Ground) String() string { return fmt.Sprintf("σ=%g S/m εr=%g", g.SigmaSPerM, g.EpsR) }

// ComplexPermittivity returns the complex relative permittivity of the
// ground at frequency f, for the time convention e^{+jωt}:
//
//	ε' = εr − j·60·λ·σ        (λ in m, σ in S/m; 60λσ = σ/(ω ε0))
//
// Reference: Norton (1936); ITU-R P.527.
func (g Ground) ComplexPermittivity(f KHz) complex128 {
	return complex(g.EpsR, -60*f.WavelengthMetres()*g.SigmaSPerM)
}

// SurfaceImpedance returns the normalised surface impedance for vertical
// polarisation:
//
//	Δ = √(ε' − 1) / ε'
//
// Reference: J. R. Wait, Electromagnetic Waves in Stratified Media (1962);
// K. A. Norton, Proc. IRE 25 (1937).
func (g Ground) SurfaceImpedance(f KHz) complex128 {
	e := g.ComplexPermittivity(f)
	return cmplx.Sqrt(e-1) / e
}

// GroundType is a named ground with its constants and a description.
type GroundType struct {
	Name        string
	Description string
	Ground
}

// groundTypes are the standard grounds of the Rec. ITU-R P.368 curve
// figures (Figs. 1–11). The constants are the usual ones for those figures
// (from memory; the Recommendation's table was not available to check).
var groundTypes = []GroundType{
	{"sea-low-salinity", "sea water, low salinity", Ground{1, 80}},
	{"sea", "sea water, average salinity", Ground{5, 70}},
	{"fresh-water", "fresh water", Ground{3e-3, 80}},
	{"land-good", "land (σ 30 mS/m)", Ground{3e-2, 40}},
	{"wet", "wet ground", Ground{1e-2, 30}},
	{"land", "land (σ 3 mS/m)", Ground{3e-3, 22}},
	{"medium-dry", "medium dry ground", Ground{1e-3, 15}},
	{"dry", "dry ground", Ground{3e-4, 7}},
	{"very-dry", "very dry ground", Ground{1e-4, 3}},
	{"ice-1c", "fresh-water ice at −1 °C", Ground{3e-5, 3}},
	{"ice-10c", "fresh-water ice at −10 °C", Ground{1e-5, 3}},
}

// GroundTypes returns the named standard grounds, in the order of the
// P.368 figures.
func GroundTypes() []GroundType {
	return append([]GroundType(nil), groundTypes...)
}

// GroundByName returns the standard ground with the given name
// (case-insensitive).
func GroundByName(name string) (GroundType, error) {
	for _, g := range groundTypes {
		if strings.EqualFold(g.Name, name) {
			return g, nil
		}
	}
	names := make([]string, len(groundTypes))
	for i, g := range groundTypes {
		names[i] = g.Name
	}
	sort.Strings(names)
	return GroundType{}, fmt.Errorf("propagation: unknown ground %q (known: %s)", name, strings.Join(names, ", "))
}
