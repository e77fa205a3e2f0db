// Package assets holds earshot's embedded data — the invented demo
// scenario and the world land/sea mask — and the loaders that validate
// scenario files (JSON) and station lists (CSV) into the planner's types.
// The file formats are described in README.md beside this file.
package assets

import _ "embed"

//go:embed demo.json
var demoJSON []byte

// DemoFile is the name the embedded demo scenario has in error messages.
const DemoFile = "demo.json"

// Demo returns the embedded demo scenario: an invented archipelago in the
// open South Pacific with invented stations (see README.md). Each call
// returns a fresh copy.
func Demo() (*Scenario, error) { return ParseScenario(demoJSON, DemoFile) }

// DemoJSON returns a copy of the embedded demo scenario file, e.g. as a
// starting point for a user's own scenario.
func DemoJSON() []byte { return append([]byte(nil), demoJSON...) }
