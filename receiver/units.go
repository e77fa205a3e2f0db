package receiver

import (
	"fmt"
	"math"
	"sort"
	"strings"

	"earshot/propagation"
)

// Physical constants (exact SI 2019 values where defined).
const (
	Mu0                = 1.25663706212e-6 // vacuum permeability, H/m (CODATA 2018)
	Eps0               = 8.8541878128e-12 // vacuum permittivity, F/m (CODATA 2018)
	Boltzmann          = 1.380649e-23     // J/K, exact
	ElectronCharge     = 1.602176634e-19  // C, exact
	CopperConductivity = 5.8e7            // S/m, annealed copper (IACS 100 % = 5.80e7 S/m)
	// RoomTempK is the temperature at which diodes are modelled (300 K).
	RoomTempK = 300.0
)

// KHz is the frequency type shared with package propagation.
type KHz = propagation.KHz

// InputError is the typed invalid-input error shared with package
// propagation: it names the field, the value, the unit and the limit.
type InputError = propagation.InputError

// inputErr builds an InputError.
func inputErr(field string, v float64, unit, want string) error {
	return &InputError{Field: field, Value: v, Unit: unit, Want: want}
}

// finite reports whether v is neither NaN nor infinite.
func finite(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }

// omega returns the angular frequency 2πf in rad/s.
func omega(f KHz) float64 { return 2 * math.Pi * f.Hz() }

// byName returns the item whose name (nameOf) equals name, ignoring case,
// or an error listing the known names of that kind.
func byName[T any](kind, name string, items []T, nameOf func(T) string) (T, error) {
	var names []string
	for _, it := range items {
		if strings.EqualFold(nameOf(it), name) {
			return it, nil
		}
		names = append(names, nameOf(it))
	}
	sort.Strings(names)
	var zero T
	return zero, fmt.Errorf("receiver: unknown %s %q (known: %s)", kind, name, strings.Join(names, ", "))
}
