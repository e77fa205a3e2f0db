package main

import (
	"bytes"
	"encoding/json"
	"image/png"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

type predictOut struct {
	Audible  int `json:"audible"`
	Stations []struct {
		ID       string           `json:"id"`
		KHz      float64          `json:"khz"`
		Km       float64          `json:"km"`
		GroundDB float64          `json:"ground_dbuvm"`
		SkyDB    *float64         `json:"sky_dbuvm"`
		EDB      float64          `json:"e_dbuvm"`
		MarginDB float64          `json:"margin_db"`
		Audible  bool             `json:"audible"`
		MaskedBy *string          `json:"masked_by"`
		Trap     *json.RawMessage `json:"trap"`
	} `json:"stations"`
}

func predictJSONRun(t *testing.T, args ...string) predictOut {
	t.Helper()
	var stdout, stderr bytes.Buffer
	args = append([]string{"predict", "--json"}, args...)
	if status := run(args, &stdout, &stderr); status != 0 {
		t.Fatalf("run(%q) = %d: %s", args, status, stderr.String())
	}
	var out predictOut
	if err := json.Unmarshal(stdout.Bytes(), &out); err != nil {
		t.Fatalf("run(%q): %v", args, err)
	}
	return out
}

// TestPredictDemoEndToEnd checks the planner on the demo through the CLI
// against facts of the trade (common practice), not against the invented
// numbers: a listener beside a strong local needs a wave trap to hear a
// station a couple of hundred kHz away; night brings in distant stations
// that the day does not; a shore spot hears more by day than a spot on
// dry high ground (sea paths carry the ground wave further, P.368).
func TestPredictDemoEndToEnd(t *testing.T) {
	day := "2025-01-15T00:00:00Z"   // mid-afternoon in the demo region
	night := "2025-01-15T08:30:00Z" // local midnight there
	inland := predictJSONRun(t, "--spot", "inland", "--time", day)
	trapped := false
	for _, s := range inland.Stations {
		if s.Audible && s.MaskedBy != nil && s.Trap != nil && strings.Contains(string(*s.Trap), `"fixes":true`) {
			trapped = true
		}
	}
	if !trapped {
		t.Errorf("inland spot: no station swamped by the local with a trap that cures it")
	}
	dayShore := predictJSONRun(t, "--spot", "shore", "--time", day)
	nightShore := predictJSONRun(t, "--spot", "shore", "--time", night)
	dayHeard := map[string]bool{}
	for _, s := range dayShore.Stations {
		dayHeard[s.ID] = s.Audible
	}
	gained := 0
	for _, s := range nightShore.Stations {
		if s.Audible && !dayHeard[s.ID] && s.Km > 500 && s.SkyDB != nil {
			gained++
		}
	}
	if gained == 0 {
		t.Errorf("shore: no distant station audible at midnight that was not by day")
	}
	upland := predictJSONRun(t, "--spot", "upland", "--time", day)
	if !(dayShore.Audible > upland.Audible) {
		t.Errorf("by day the shore hears %d stations, the dry upland %d; want the shore ahead", dayShore.Audible, upland.Audible)
	}
	for _, s := range dayShore.Stations {
		if s.SkyDB != nil && s.Km > 500 {
			t.Errorf("%s has a sky wave in mid-afternoon", s.ID)
		}
	}
}

// TestPredictStationsCSV: a user's CSV predicts; a bad row is refused
// with its line number and field (issue acceptance).
func TestPredictStationsCSV(t *testing.T) {
	dir := t.TempDir()
	good := filepath.Join(dir, "good.csv")
	os.WriteFile(good, []byte("id,name,khz,kw,lat,lon\nA1,Alpha,909,50,51.0,-1.0\nB2,Bravo,1215,100,52.5,0.5\n"), 0o644)
	bad := filepath.Join(dir, "bad.csv")
	os.WriteFile(bad, []byte("id,name,khz,kw,lat,lon\nA1,Alpha,909,50,51.0,-1.0\nB2,Bravo,5,100,52.5,0.5\n"), 0o644)
	out := predictJSONRun(t, "--stations", good, "--at-lat", "51.5", "--at-lon", "-0.1", "--time", "2025-01-15T12:00:00Z")
	if len(out.Stations) != 2 {
		t.Errorf("good CSV: %d stations predicted, want 2", len(out.Stations))
	}
	var stdout, stderr bytes.Buffer
	status := run([]string{"predict", "--stations", bad, "--at-lat", "51.5", "--at-lon", "-0.1"}, &stdout, &stderr)
	if status != 2 || !strings.Contains(stderr.String(), "line 3") || !strings.Contains(stderr.String(), "khz") {
		t.Errorf("bad CSV: status %d, stderr %q; want 2 and the line and field", status, stderr.String())
	}
}

// TestMapAndSweepRun: "earshot map" writes a real PNG picture; the sweeps
// print their tables; bad flags are usage errors.
func TestMapAndSweepRun(t *testing.T) {
	dir := t.TempDir()
	out := filepath.Join(dir, "m.png")
	var stdout, stderr bytes.Buffer
	if status := run([]string{"map", "--out", out, "--grid", "48", "--time", "2025-01-15T00:00:00Z"}, &stdout, &stderr); status != 0 {
		t.Fatalf("map: %d %s", status, stderr.String())
	}
	f, err := os.Open(out)
	if err != nil {
		t.Fatal(err)
	}
	img, err := png.Decode(f)
	f.Close()
	if err != nil {
		t.Fatalf("map PNG: %v", err)
	}
	colours := map[[3]uint32]bool{}
	b := img.Bounds()
	for y := b.Min.Y; y < b.Max.Y; y += 3 {
		for x := b.Min.X; x < b.Max.X; x += 3 {
			r, g, bl, _ := img.At(x, y).RGBA()
			colours[[3]uint32{r >> 8, g >> 8, bl >> 8}] = true
		}
	}
	if len(colours) < 8 {
		t.Errorf("map picture has %d colours: blank?", len(colours))
	}
	for _, c := range []struct {
		args []string
		want string
	}{
		{[]string{"sweep", "wire", "--lengths", "20,40", "--time", "2025-01-15T00:00:00Z"}, "wire m"},
		{[]string{"sweep", "hours", "--date", "2025-01-15"}, "hour"},
		{[]string{"compare", "--time", "2025-01-15T00:00:00Z"}, "audible"},
	} {
		stdout.Reset()
		stderr.Reset()
		if status := run(c.args, &stdout, &stderr); status != 0 || !strings.Contains(stdout.String(), c.want) {
			t.Errorf("run(%q) = %d, stdout %q, stderr %q", c.args, status, stdout.String(), stderr.String())
		}
	}
	for _, args := range [][]string{
		{"map"},
		{"map", "--out", out, "--show", "colour"},
		{"map", "--out", out, "--grid", "4"},
		{"predict", "--spot", "nowhere"},
		{"predict", "--land-ground", "mud"},
		{"predict", "--at-lat", "95", "--at-lon", "0"},
		{"sweep", "wire", "--lengths", "0"},
		{"sweep", "sideways"},
	} {
		stdout.Reset()
		stderr.Reset()
		if status := run(args, &stdout, &stderr); status != 2 || strings.Count(stderr.String(), "\n") != 1 {
			t.Errorf("run(%q) = %d, stderr %q; want a one-line usage error", args, status, stderr.String())
		}
	}
}
