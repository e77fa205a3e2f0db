package main

import (
	"bytes"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"

	"earshot/assets/internal/maskfile"
)

// TestRun calls the command as go generate would, with a small package laid
// out as npm pack unpacks it (package.json beside the data file).
func TestRun(t *testing.T) {
	dir := t.TempDir()
	pkg := filepath.Join(dir, "package")
	if err := os.Mkdir(pkg, 0o755); err != nil {
		t.Fatal(err)
	}
	write := func(name, text string) {
		if err := os.WriteFile(filepath.Join(pkg, name), []byte(text), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	write("package.json", `{"name":"tiny-atlas","version":"1.2.3"}`)
	// One 10°×10° square, clockwise, quantized to whole degrees.
	write("land-tiny.json", `{"type":"Topology","transform":{"scale":[1,1],"translate":[0,0]},
	  "objects":{"land":{"type":"GeometryCollection","geometries":[{"type":"Polygon","arcs":[[0]]}]}},
	  "arcs":[[[0,0],[0,10],[10,0],[0,-10],[-10,0]]]}`)
	out := filepath.Join(dir, "mask.bin")
	in := filepath.Join(pkg, "land-tiny.json")

	cases := []struct {
		name   string
		args   []string
		code   int
		stdout string // regexp
		stderr string // regexp
	}{
		{"help", []string{"-h"}, 0, `^$`, `-cpd`},
		{"no flags", nil, 2, `^$`, `^genmask: -in and -out are required`},
		{"bad flag", []string{"-nope"}, 2, `^$`, `flag provided but not defined`},
		{"missing file", []string{"-in", filepath.Join(dir, "none.json"), "-out", out}, 1, `^$`, `^genmask: open .*none.json`},
		{"wrong object", []string{"-in", in, "-object", "countries", "-out", out}, 1, `^$`, `objects has no member "countries"`},
		{"bad cpd", []string{"-in", in, "-cpd", "0", "-out", out}, 1, `^$`, `cellsPerDeg`},
		{"ok", []string{"-in", in, "-cpd", "2", "-out", out}, 0,
			`^genmask: land-tiny.json: 1 rings \(0 holes, 0 polar\), 4 vertices → 360×720 cells of 0.5°`, `^$`},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			var stdout, stderr bytes.Buffer
			code := run(tc.args, &stdout, &stderr)
			if code != tc.code || !regexp.MustCompile(tc.stdout).MatchString(stdout.String()) ||
				!regexp.MustCompile(tc.stderr).MatchString(stderr.String()) {
				t.Fatalf("run(%q) = %d\nstdout %q (want /%s/)\nstderr %q (want /%s/)\nwant code %d",
					tc.args, code, stdout.String(), tc.stdout, stderr.String(), tc.stderr, tc.code)
			}
		})
	}

	data, err := os.ReadFile(out)
	if err != nil {
		t.Fatal(err)
	}
	g, err := maskfile.Decode(data)
	if err != nil {
		t.Fatal(err)
	}
	if want := "tiny-atlas@1.2.3 land-tiny.json object land sha256:"; !strings.HasPrefix(g.Source, want) {
		t.Errorf("source = %q, want prefix %q", g.Source, want)
	}
	if n := count(g); n != 20*20 { // 10° × 10° at 2 cells per degree
		t.Errorf("land cells = %d, want 400", n)
	}
}
