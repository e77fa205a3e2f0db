package propagation

import "fmt"

// InputError reports an invalid physical input. Field names the parameter
// (as the user knows it), so a user interface can highlight it.
type InputError struct {
	Field string  // parameter name, e.g. "distance"
	Value float64 // the value given
	Unit  string  // unit of Value, e.g. "km"; may be empty
	Want  string  // the allowed range, e.g. "> 0"
}

func (e *InputError) Error() string {
	u := ""
	if e.Unit != "" {
		u = " " + e.Unit
	}
	return fmt.Sprintf("propagation: %s must be %s%s, got %g", e.Field, e.Want, u, e.Value)
}

// Warning describes a valid input outside the range over which the model has
// been validated. The result is still returned.
type Warning struct {
	Field   string
	Message string
}

func (w Warning) String() string { return w.Field + ": " + w.Message }

// Validated and accepted ranges of the ground-wave model.
const (
	// MinKHz and MaxKHz bound the accepted frequency; outside it is an error.
	MinKHz = 1.0
	MaxKHz = 100000.0
	// MinValidKHz and MaxValidKHz bound the validated frequency range
	// (the range of the Rec. ITU-R P.368 curves); outside it a warning.
	MinValidKHz = 10.0
	MaxValidKHz = 30000.0
	// MaxDistKm is the largest accepted distance (half the circumference,
	// beyond which the short great circle is the other way round).
	MaxDistKm = 20000.0
	// MinValidKm and MaxValidKm bound the validated distance range.
	MinValidKm = 0.1
	MaxValidKm = 5000.0
)

// checkFinite returns an InputError if v is NaN or infinite.
func checkFinite(field string, v float64, unit string) error {
	if v != v || v > 1e308 || v < -1e308 {
		return &InputError{Field: field, Value: v, Unit: unit, Want: "a finite number"}
	}
	return nil
}

// ValidateKHz checks a frequency and returns warnings when it lies outside
// the validated range.
func ValidateKHz(f KHz) ([]Warning, error) {
	v := float64(f)
	if err := checkFinite("frequency", v, "kHz"); err != nil {
		return nil, err
	}
	if v < MinKHz || v > MaxKHz {
		return nil, &InputError{Field: "frequency", Value: v, Unit: "kHz",
			Want: fmt.Sprintf("between %g and %g", MinKHz, MaxKHz)}
	}
	if v < MinValidKHz || v > MaxValidKHz {
		return []Warning{{Field: "frequency", Message: fmt.Sprintf(
			"%g kHz is outside the validated %g–%g kHz range", v, MinValidKHz, MaxValidKHz)}}, nil
	}
	return nil, nil
}

// ValidateDistanceKm checks a path length along the ground and returns
// warnings when it lies outside the validated range.
func ValidateDistanceKm(distKm float64) ([]Warning, error) {
	if err := checkFinite("distance", distKm, "km"); err != nil {
		return nil, err
	}
	if distKm <= 0 || distKm > MaxDistKm {
		return nil, &InputError{Field: "distance", Value: distKm, Unit: "km",
			Want: fmt.Sprintf("> 0 and <= %g", MaxDistKm)}
	}
	if distKm < MinValidKm || distKm > MaxValidKm {
		return []Warning{{Field: "distance", Message: fmt.Sprintf(
			"%g km is outside the validated %g–%g km range", distKm, MinValidKm, MaxValidKm)}}, nil
	}
	return nil, nil
}

// ValidatePowerKW checks a transmitter power.
func ValidatePowerKW(powerKW float64) error {
	if err := checkFinite("power", powerKW, "kW"); err != nil {
		return err
	}
	if powerKW <= 0 || powerKW > 1e5 {
		return &InputError{Field: "power", Value: powerKW, Unit: "kW", Want: "> 0 and <= 100000"}
	}
	return nil
}
