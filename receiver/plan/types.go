// Package plan answers the listener's question for a whole scenario: at
// this spot, with this rig, at this time, which transmitters are heard,
// which mask others, what trap would cure it — and the same over a map,
// across wire lengths and through the hours. It is UI-free and shared by
// the command line and the app.
package plan

import (
	"earshot/propagation"
	"earshot/receiver"
)

// Station is a transmitter of a scenario.
type Station struct {
	ID, Name string
	KHz      propagation.KHz
	KWDay    float64 // carrier power by day, kW
	KWNight  float64 // carrier power at night, kW (0: same as by day)
	Place    propagation.Place
	// HeightDeg is the mast's electrical height in degrees (0: a short
	// monopole); it sets the vertical-pattern gain toward the horizon
	// (ground wave) and toward the sky wave's take-off angle.
	HeightDeg float64
}

// Spot is a named listening place.
type Spot struct {
	Name  string
	Place propagation.Place
}

// Region is an area of given ground that overrides the land/sea mask.
type Region struct {
	Name   string
	Ground propagation.Ground
	// Polygon is a closed ring of (lat, lon) vertices in degrees; the last
	// vertex joins the first.
	Polygon [][2]float64
}

// World is where the stations and the listener are: the stations and the
// ground everywhere.
type World struct {
	Stations []Station
	// Ground returns the ground at a point (regions over a land/sea mask).
	Ground propagation.GroundMap
}

// Config holds what a prediction needs besides the world and the spot.
type Config struct {
	Rig receiver.RigSpec
}
