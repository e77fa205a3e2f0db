package main

import (
	"math"
	"strings"
	"testing"
)

// The two example documents of "The TopoJSON Format Specification"
// (topojson/topojson-specification, §1.1 Examples): the same topology
// unquantized and quantized (delta-encoded with a transform).
const (
	specExample = `{"type":"Topology","objects":{"example":{"type":"GeometryCollection","geometries":[
	  {"type":"Point","properties":{"prop0":"value0"},"coordinates":[102,0.5]},
	  {"type":"LineString","properties":{"prop0":"value0","prop1":0},"arcs":[0]},
	  {"type":"Polygon","properties":{"prop0":"value0","prop1":{"this":"that"}},"arcs":[[-2]]}]}},
	  "arcs":[[[102,0],[103,1],[104,0],[105,1]],[[100,0],[101,0],[101,1],[100,1],[100,0]]]}`
	specExampleQuantized = `{"type":"Topology","transform":{"scale":[0.0005000500050005,0.00010001000100010001],"translate":[100,0]},
	  "objects":{"example":{"type":"GeometryCollection","geometries":[
	  {"type":"Point","properties":{"prop0":"value0"},"coordinates":[4000,5000]},
	  {"type":"LineString","properties":{"prop0":"value0","prop1":0},"arcs":[0]},
	  {"type":"Polygon","properties":{"prop0":"value0","prop1":{"this":"that"}},"arcs":[[1]]}]}},
	  "arcs":[[[4000,0],[1999,9999],[2000,-9999],[2000,9999]],[[0,0],[0,9999],[2000,0],[0,-9999],[-2000,0]]]}`
)

// TestSpecExamples decodes both documents of the specification's example.
// Its polygon is arc 1 reversed (index -2, §2.1.3) in the first and arc 1
// quantized in the second; both must give the square
// (100,0) (100,1) (101,1) (101,0) (100,0) written out in the first document.
// Tolerance: one quantization step (the transform's scale), the most that
// rounding to the integer grid can move a position.
func TestSpecExamples(t *testing.T) {
	want := []point{{100, 0}, {100, 1}, {101, 1}, {101, 0}, {100, 0}}
	tol := point{0.0005000500050005, 0.00010001000100010001}
	for _, tc := range []struct{ name, doc string }{{"plain", specExample}, {"quantized", specExampleQuantized}} {
		t.Run(tc.name, func(t *testing.T) {
			rings, err := decodeTopoJSON([]byte(tc.doc), "example")
			if err != nil {
				t.Fatalf("decodeTopoJSON: %v", err)
			}
			if len(rings) != 1 || rings[0].hole {
				t.Fatalf("decodeTopoJSON gave %d rings (%+v), want 1 exterior ring (point and line skipped)", len(rings), rings)
			}
			got := rings[0].pts
			if len(got) != len(want) {
				t.Fatalf("ring = %v, want %v", got, want)
			}
			for i := range want {
				if math.Abs(got[i].lon-want[i].lon) > tol.lon || math.Abs(got[i].lat-want[i].lat) > tol.lat {
					t.Errorf("ring[%d] = %v, want %v ± %v", i, got[i], want[i], tol)
				}
			}
		})
	}
}

// TestStitch: a ring of two arcs, the second reversed, drops the shared
// position (§2.1.3). Expected ring written out by hand.
func TestStitch(t *testing.T) {
	doc := `{"type":"Topology","objects":{"o":{"type":"MultiPolygon","arcs":[[[0,-2]],[[2],[3]]]}},
	  "arcs":[[[0,0],[10,0],[10,10]], [[0,0],[0,10],[10,10]],
	          [[20,20],[20,30],[30,30],[30,20],[20,20]], [[22,22],[24,22],[24,24],[22,22]]]}`
	rings, err := decodeTopoJSON([]byte(doc), "o")
	if err != nil {
		t.Fatal(err)
	}
	want := []point{{0, 0}, {10, 0}, {10, 10}, {0, 10}, {0, 0}}
	if len(rings) != 3 || len(rings[0].pts) != len(want) {
		t.Fatalf("decodeTopoJSON gave %d rings, first %v; want 3, first %v", len(rings), rings[0].pts, want)
	}
	for i, p := range want {
		if rings[0].pts[i] != p {
			t.Errorf("ring 0 [%d] = %v, want %v", i, rings[0].pts[i], p)
		}
	}
	if rings[0].hole || rings[1].hole || !rings[2].hole {
		t.Errorf("holes = %v %v %v, want false false true (second ring of a polygon is a hole, §2.2.5)",
			rings[0].hole, rings[1].hole, rings[2].hole)
	}
}

// TestDecodeErrors: malformed documents give errors naming the member.
func TestDecodeErrors(t *testing.T) {
	cases := []struct{ name, doc, object, want string }{
		{"not JSON", `{`, "o", "topojson"},
		{"not a topology", `{"type":"FeatureCollection"}`, "o", "type"},
		{"missing object", `{"type":"Topology","objects":{},"arcs":[]}`, "land", `"land"`},
		{"short arc", `{"type":"Topology","objects":{},"arcs":[[[0,0]]]}`, "o", "arcs[0]"},
		{"short position", `{"type":"Topology","objects":{},"arcs":[[[0,0],[1]]]}`, "o", "arcs[0][1]"},
		{"bad transform", `{"type":"Topology","transform":{"scale":[1],"translate":[0,0]},"objects":{},"arcs":[]}`, "o", "transform"},
		{"fractional quantized", `{"type":"Topology","transform":{"scale":[1,1],"translate":[0,0]},"objects":{},"arcs":[[[0,0],[0.5,1]]]}`, "o", "integers"},
		{"off the globe", `{"type":"Topology","objects":{},"arcs":[[[0,0],[0,91]]]}`, "o", "arcs[0][1]"},
		{"arc index out of range", `{"type":"Topology","objects":{"o":{"type":"Polygon","arcs":[[5]]}},"arcs":[]}`, "o", "arc index 5"},
		{"arcs do not join", `{"type":"Topology","objects":{"o":{"type":"Polygon","arcs":[[0,1]]}},"arcs":[[[0,0],[1,0]],[[2,0],[0,0]]]}`, "o", "objects.o[0]"},
		{"open ring", `{"type":"Topology","objects":{"o":{"type":"Polygon","arcs":[[0]]}},"arcs":[[[0,0],[1,0],[1,1],[0,1]]]}`, "o", "not closed"},
		{"empty ring", `{"type":"Topology","objects":{"o":{"type":"Polygon","arcs":[[]]}},"arcs":[]}`, "o", "no arcs"},
		{"unknown type", `{"type":"Topology","objects":{"o":{"type":"Circle"}},"arcs":[]}`, "o", `"Circle"`},
		{"bad arcs member", `{"type":"Topology","objects":{"o":{"type":"Polygon","arcs":[0]}},"arcs":[]}`, "o", "objects.o.arcs"},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			_, err := decodeTopoJSON([]byte(tc.doc), tc.object)
			if err == nil || !strings.Contains(err.Error(), tc.want) {
				t.Fatalf("decodeTopoJSON(%s) error = %v, want one mentioning %q", tc.doc, err, tc.want)
			}
		})
	}
}
