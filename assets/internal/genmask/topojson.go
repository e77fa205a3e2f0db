package main

import (
	"encoding/json"
	"fmt"
	"math"
)

// Reference for this file: "The TopoJSON Format Specification" (M. Bostock
// and C. Metcalf, topojson/topojson-specification), §2.1.2 Transform, §2.1.3
// Arcs (delta encoding, ones'-complement arc indexes, dropping the shared
// first position of each following arc), §2.2.5 Polygon (first ring
// exterior, others holes), §2.2.6 MultiPolygon, §2.2.7 Geometry Collection.

// coordSlackDeg is how far past ±180° / ±90° a decoded position may fall
// before it is rejected: quantized positions x·scale + translate carry
// floating-point rounding of order 1e-13°, far below this.
const coordSlackDeg = 1e-9

// point is a longitude/latitude pair in degrees.
type point struct{ lon, lat float64 }

// ring is one closed ring of a polygon: pts[0] == pts[len(pts)-1].
type ring struct {
	pts  []point
	hole bool   // an interior ring (§2.2.5)
	name string // where it came from, for error messages
}

type topoTransform struct {
	Scale     []float64 `json:"scale"`
	Translate []float64 `json:"translate"`
}

type topology struct {
	Type      string                     `json:"type"`
	Transform *topoTransform             `json:"transform"`
	Arcs      [][][]float64              `json:"arcs"`
	Objects   map[string]json.RawMessage `json:"objects"`
}

type topoGeometry struct {
	Type       *string           `json:"type"`
	Arcs       json.RawMessage   `json:"arcs"`
	Geometries []json.RawMessage `json:"geometries"`
}

// decodeTopoJSON returns the polygon rings of the named object of a TopoJSON
// topology, in degrees, with every arc decoded and stitched. Points and lines
// enclose no area and are skipped, and so are rings of fewer than 4
// positions. Errors name the member at fault.
func decodeTopoJSON(data []byte, object string) ([]ring, error) {
	var t topology
	if err := json.Unmarshal(data, &t); err != nil {
		return nil, fmt.Errorf("topojson: %w", err)
	}
	if t.Type != "Topology" {
		return nil, fmt.Errorf("topojson: type must be \"Topology\", got %q", t.Type)
	}
	arcs, err := decodeArcs(t.Arcs, t.Transform)
	if err != nil {
		return nil, err
	}
	raw, ok := t.Objects[object]
	if !ok {
		names := make([]string, 0, len(t.Objects))
		for k := range t.Objects {
			names = append(names, k)
		}
		return nil, fmt.Errorf("topojson: objects has no member %q (has %q)", object, names)
	}
	var rings []ring
	if err := collectRings(raw, "objects."+object, arcs, &rings); err != nil {
		return nil, err
	}
	return rings, nil
}

// decodeArcs turns the arcs member into absolute positions (§2.1.2, §2.1.3).
func decodeArcs(in [][][]float64, tf *topoTransform) ([][]point, error) {
	if tf != nil && (len(tf.Scale) != 2 || len(tf.Translate) != 2) {
		return nil, fmt.Errorf("topojson: transform: scale and translate must have 2 elements, got %d and %d",
			len(tf.Scale), len(tf.Translate))
	}
	out := make([][]point, len(in))
	for i, arc := range in {
		if len(arc) < 2 {
			return nil, fmt.Errorf("topojson: arcs[%d]: an arc needs at least 2 positions, got %d", i, len(arc))
		}
		pts := make([]point, len(arc))
		var x, y float64 // running sums of the quantized deltas
		for j, pos := range arc {
			if len(pos) < 2 {
				return nil, fmt.Errorf("topojson: arcs[%d][%d]: a position needs at least 2 numbers, got %d", i, j, len(pos))
			}
			if tf == nil {
				pts[j] = point{pos[0], pos[1]}
			} else {
				if pos[0] != math.Trunc(pos[0]) || pos[1] != math.Trunc(pos[1]) {
					return nil, fmt.Errorf("topojson: arcs[%d][%d]: quantized position %v must be integers", i, j, pos[:2])
				}
				x += pos[0]
				y += pos[1]
				pts[j] = point{x*tf.Scale[0] + tf.Translate[0], y*tf.Scale[1] + tf.Translate[1]}
			}
			p := pts[j]
			if !(math.Abs(p.lon) <= 180+coordSlackDeg && math.Abs(p.lat) <= 90+coordSlackDeg) {
				return nil, fmt.Errorf("topojson: arcs[%d][%d]: position (%g, %g) is outside lon [-180, 180], lat [-90, 90]",
					i, j, p.lon, p.lat)
			}
			// Quantization can land a hair outside the range; pull it back.
			pts[j] = point{max(-180, min(180, p.lon)), max(-90, min(90, p.lat))}
		}
		out[i] = pts
	}
	return out, nil
}

// collectRings walks a geometry object and appends its polygon rings.
func collectRings(raw json.RawMessage, where string, arcs [][]point, rings *[]ring) error {
	var g topoGeometry
	if err := json.Unmarshal(raw, &g); err != nil {
		return fmt.Errorf("topojson: %s: %w", where, err)
	}
	if g.Type == nil { // a null geometry: allowed, holds nothing
		return nil
	}
	switch *g.Type {
	case "GeometryCollection":
		for i, sub := range g.Geometries {
			if err := collectRings(sub, fmt.Sprintf("%s.geometries[%d]", where, i), arcs, rings); err != nil {
				return err
			}
		}
	case "Polygon":
		var poly [][]int
		if err := json.Unmarshal(g.Arcs, &poly); err != nil {
			return fmt.Errorf("topojson: %s.arcs: %w", where, err)
		}
		return appendPolygon(poly, where, arcs, rings)
	case "MultiPolygon":
		var multi [][][]int
		if err := json.Unmarshal(g.Arcs, &multi); err != nil {
			return fmt.Errorf("topojson: %s.arcs: %w", where, err)
		}
		for i, poly := range multi {
			if err := appendPolygon(poly, fmt.Sprintf("%s.arcs[%d]", where, i), arcs, rings); err != nil {
				return err
			}
		}
	case "Point", "MultiPoint", "LineString", "MultiLineString":
		// Enclose no area: nothing to fill (§2.2.1–2.2.4).
	default:
		return fmt.Errorf("topojson: %s: unknown geometry type %q", where, *g.Type)
	}
	return nil
}

func appendPolygon(poly [][]int, where string, arcs [][]point, rings *[]ring) error {
	for k, idx := range poly {
		name := fmt.Sprintf("%s[%d]", where, k)
		pts, err := stitch(idx, arcs, name)
		if err != nil {
			return err
		}
		if len(pts) < 4 {
			continue // zero area
		}
		*rings = append(*rings, ring{pts: pts, hole: k > 0, name: name})
	}
	return nil
}

// stitch joins arcs into one closed ring (§2.1.3): a negative index ~i is arc
// i reversed, and each arc after the first starts where the previous ended.
func stitch(idx []int, arcs [][]point, name string) ([]point, error) {
	if len(idx) == 0 {
		return nil, fmt.Errorf("topojson: %s: ring has no arcs", name)
	}
	var pts []point
	for n, i := range idx {
		rev := i < 0
		if rev {
			i = ^i
		}
		if i >= len(arcs) {
			return nil, fmt.Errorf("topojson: %s: arc index %d out of range [0, %d)", name, idx[n], len(arcs))
		}
		a := arcs[i]
		for j := range a {
			p := a[j]
			if rev {
				p = a[len(a)-1-j]
			}
			if j == 0 && len(pts) > 0 {
				if p != pts[len(pts)-1] {
					return nil, fmt.Errorf("topojson: %s: arc %d starts at %v, not at the previous arc's end %v",
						name, idx[n], p, pts[len(pts)-1])
				}
				continue
			}
			pts = append(pts, p)
		}
	}
	if pts[0] != pts[len(pts)-1] {
		return nil, fmt.Errorf("topojson: %s: ring of %d positions is not closed (first %v ≠ last %v)",
			name, len(pts), pts[0], pts[len(pts)-1])
	}
	// Fewer than 4 positions (a LinearRing's minimum in GeoJSON, RFC 7946
	// §3.1.6) encloses no area: quantization collapses a few islets so.
	// The caller drops such rings.
	return pts, nil
}
