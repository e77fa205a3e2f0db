// Command genmask makes earshot's embedded land/sea mask (assets/landmask.bin)
// from a TopoJSON file of land polygons, such as land-50m.json of the npm
// package world-atlas (Natural Earth land, public domain).
//
// Usage (run by `go generate ./assets/...`, see assets/landmask.go):
//
//	genmask -in world-atlas/package/land-50m.json [-object land] [-cpd 20] [-source TEXT] -out landmask.bin
//
// It decodes the TopoJSON itself (topojson.go), fills every ring with the
// even-odd rule by scanlines through the cell centres (raster.go), and writes
// the grid in the format of package maskfile. The provenance stored in the
// file is -source, or else "NAME@VERSION FILE object OBJECT sha256:HEX" read
// from the package.json beside -in.
package main

import (
	"crypto/sha256"
	"encoding/json"
	"errors"
	"flag"
	"fmt"
	"io"
	"os"
	"path/filepath"

	"earshot/assets/internal/maskfile"
)

func main() { os.Exit(run(os.Args[1:], os.Stdout, os.Stderr)) }

// envHint names the environment variable that the go:generate line in
// assets/landmask.go reads the unpacked npm package's folder from.
const envHint = "EARSHOT_WORLD_ATLAS"

func run(args []string, stdout, stderr io.Writer) int {
	fs := flag.NewFlagSet("genmask", flag.ContinueOnError)
	fs.SetOutput(stderr)
	in := fs.String("in", "", "TopoJSON file of land polygons (required)")
	object := fs.String("object", "land", "name of the TopoJSON object to fill")
	cpd := fs.Int("cpd", 20, fmt.Sprintf("grid cells per degree, 1..%d", maskfile.MaxCellsPerDeg))
	source := fs.String("source", "", "provenance text to store (default: from package.json beside -in)")
	out := fs.String("out", "", "mask file to write (required)")
	if err := fs.Parse(args); err != nil {
		if errors.Is(err, flag.ErrHelp) {
			return 0
		}
		return 2
	}
	if *in == "" || *out == "" || fs.NArg() != 0 {
		fmt.Fprintln(stderr, "genmask: -in and -out are required and no arguments are taken")
		return 2
	}
	if err := generate(*in, *object, *cpd, *source, *out, stdout); err != nil {
		fmt.Fprintln(stderr, "genmask:", err)
		return 1
	}
	return 0
}

func generate(in, object string, cpd int, source, out string, stdout io.Writer) error {
	data, err := os.ReadFile(in)
	if err != nil {
		if os.Getenv(envHint) == "" {
			return fmt.Errorf("%w (is %s set to the unpacked world-atlas package? see assets/README.md)", err, envHint)
		}
		return err
	}
	if source == "" {
		if source, err = provenance(in, object, data); err != nil {
			return err
		}
	}
	g, st, err := build(data, object, cpd)
	if err != nil {
		return err
	}
	g.Source = source
	enc, err := maskfile.Encode(g)
	if err != nil {
		return err
	}
	if err := os.WriteFile(out, enc, 0o644); err != nil {
		return err
	}
	fmt.Fprintf(stdout, "genmask: %s: %d rings (%d holes, %d polar), %d vertices → %d×%d cells of %g°, land %.2f%% of the sphere; %d bytes of bits → %d bytes in %s\n",
		filepath.Base(in), st.rings, st.holes, st.polar, st.vertices, g.Rows, g.Cols, 1/float64(cpd),
		100*st.landFraction, len(g.Words)*8, len(enc), out)
	return nil
}

// build decodes a TopoJSON document and rasterizes the named object.
func build(data []byte, object string, cpd int) (*maskfile.Grid, rasterStats, error) {
	rings, err := decodeTopoJSON(data, object)
	if err != nil {
		return nil, rasterStats{}, err
	}
	return rasterize(rings, cpd)
}

// provenance names the npm package, file, object and content hash of the
// input, from the package.json that npm pack puts beside the data files.
func provenance(in, object string, data []byte) (string, error) {
	pj, err := os.ReadFile(filepath.Join(filepath.Dir(in), "package.json"))
	if err != nil {
		return "", fmt.Errorf("-source is empty and %w", err)
	}
	var meta struct{ Name, Version string }
	if err := json.Unmarshal(pj, &meta); err != nil || meta.Name == "" || meta.Version == "" {
		return "", fmt.Errorf("-source is empty and package.json beside %s has no name and version", in)
	}
	return fmt.Sprintf("%s@%s %s object %s sha256:%x", meta.Name, meta.Version, filepath.Base(in), object, sha256.Sum256(data)), nil
}
