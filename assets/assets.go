// Package assets holds earshot's embedded data (the invented demo scenario)
// and the loaders that validate it into propagation types.
package assets

import (
	_ "embed"
	"encoding/json"
	"fmt"
	"math"

	"earshot/propagation"
)

//go:embed demo.json
var demoJSON []byte

// Station is a demo transmitter.
type Station struct {
	ID        string  `json:"id"`
	Name      string  `json:"name"`
	KHz       float64 `json:"khz"`
	KW        float64 `json:"kw"`
	HeightDeg float64 `json:"height_deg"` // electrical height of the mast, degrees
	Lat       float64 `json:"lat"`
	Lon       float64 `json:"lon"`
}

// Place is a named point.
type Place struct {
	Name string  `json:"name"`
	Lat  float64 `json:"lat"`
	Lon  float64 `json:"lon"`
}

// Scenario is a listener and the transmitters around them.
type Scenario struct {
	Name         string    `json:"name"`
	Note         string    `json:"note"`
	Listener     Place     `json:"listener"`
	Transmitters []Station `json:"transmitters"`
}

// Demo returns the embedded, invented demo scenario.
func Demo() (*Scenario, error) { return ParseScenario(demoJSON) }

// ParseScenario decodes and validates a scenario; errors name the field.
func ParseScenario(data []byte) (*Scenario, error) {
	var s Scenario
	if err := json.Unmarshal(data, &s); err != nil {
		return nil, fmt.Errorf("assets: scenario: %w", err)
	}
	if err := checkPlace("listener", s.Listener); err != nil {
		return nil, err
	}
	if len(s.Transmitters) == 0 {
		return nil, fmt.Errorf("assets: scenario has no transmitters")
	}
	for i, t := range s.Transmitters {
		where := fmt.Sprintf("transmitters[%d] (%s)", i, t.ID)
		if t.ID == "" {
			return nil, fmt.Errorf("assets: %s: id must not be empty", where)
		}
		if _, err := (propagation.Transmitter{Freq: propagation.KHz(t.KHz), PowerKW: t.KW}).Validate(); err != nil {
			return nil, fmt.Errorf("assets: %s: %w", where, err)
		}
		if _, err := propagation.MonopoleGainDB(t.HeightDeg, 0); err != nil {
			return nil, fmt.Errorf("assets: %s: %w", where, err)
		}
		if err := checkPlace(where, Place{Lat: t.Lat, Lon: t.Lon}); err != nil {
			return nil, err
		}
	}
	return &s, nil
}

func checkPlace(where string, p Place) error {
	if math.IsNaN(p.Lat) || p.Lat < -90 || p.Lat > 90 {
		return fmt.Errorf("assets: %s: lat must be between -90 and 90 degrees, got %g", where, p.Lat)
	}
	if math.IsNaN(p.Lon) || p.Lon < -180 || p.Lon > 180 {
		return fmt.Errorf("assets: %s: lon must be between -180 and 180 degrees, got %g", where, p.Lon)
	}
	return nil
}
