package maskfile

import (
	"bytes"
	"compress/zlib"
	"encoding/binary"
	"math/rand/v2"
	"strings"
	"testing"
)

// synthetic builds a grid of cpd cells per degree whose cells are set by f.
func synthetic(t testing.TB, cpd int, f func(r, c int) bool) *Grid {
	t.Helper()
	g, err := NewGrid(cpd)
	if err != nil {
		t.Fatal(err)
	}
	for r := range g.Rows {
		for c := range g.Cols {
			g.Set(r, c, f(r, c))
		}
	}
	return g
}

// TestRoundTrip: Decode(Encode(g)) gives back every cell and the source text.
// The reference is the grid itself (an identity), on patterns chosen to hit
// every branch of the run coding: rows that start or end with land, single
// cells, full rows, and runs longer than one uvarint byte (≥ 128).
func TestRoundTrip(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2)) // seeded: the same masks every run
	cases := []struct {
		name string
		cpd  int
		f    func(r, c int) bool
	}{
		{"all sea", 1, func(r, c int) bool { return false }},
		{"all land", 1, func(r, c int) bool { return true }},
		{"checkerboard", 1, func(r, c int) bool { return (r+c)%2 == 0 }},
		{"first and last column", 2, func(r, c int) bool { return c == 0 || c == 719 }},
		{"long runs", 3, func(r, c int) bool { return c >= 200 && c < 900 }},
		{"one cell", 2, func(r, c int) bool { return r == 17 && c == 300 }},
		{"random 30% land", 2, func(r, c int) bool { return rng.Float64() < 0.3 }},
		{"random blobs", 3, func(r, c int) bool { return (r/7+c/11+r*c/97)%5 == 0 }},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			g := synthetic(t, tc.cpd, tc.f)
			g.Source = "synthetic " + tc.name + " ✓"
			enc, err := Encode(g)
			if err != nil {
				t.Fatalf("Encode: %v", err)
			}
			h, err := Decode(enc)
			if err != nil {
				t.Fatalf("Decode(Encode(g)): %v", err)
			}
			if h.Rows != g.Rows || h.Cols != g.Cols || h.CellsPerDeg != g.CellsPerDeg || h.Source != g.Source {
				t.Fatalf("Decode(Encode(g)) header = %d×%d cpd %d %q, want %d×%d cpd %d %q",
					h.Rows, h.Cols, h.CellsPerDeg, h.Source, g.Rows, g.Cols, g.CellsPerDeg, g.Source)
			}
			for r := range g.Rows {
				for c := range g.Cols {
					if h.Get(r, c) != g.Get(r, c) {
						t.Fatalf("Decode(Encode(g)).Get(%d, %d) = %v, want %v", r, c, h.Get(r, c), g.Get(r, c))
					}
				}
			}
			if !h.Equal(g) {
				t.Fatal("Decode(Encode(g)).Equal(g) = false with equal cells: padding bits differ")
			}
		})
	}
}

// TestRuns: SetRun and XorRun touch exactly [a, b), across word boundaries.
// Reference: the same runs applied cell by cell.
func TestRuns(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 4))
	g, _ := NewGrid(1)
	want := make([]bool, g.Cols)
	for range 2000 {
		a := rng.IntN(g.Cols + 1)
		b := a + rng.IntN(g.Cols+1-a)
		xor := rng.IntN(2) == 0
		if xor {
			g.XorRun(5, a, b)
		} else {
			g.SetRun(5, a, b)
		}
		for c := a; c < b; c++ {
			if xor {
				want[c] = !want[c]
			} else {
				want[c] = true
			}
		}
	}
	for c, w := range want {
		if g.Get(5, c) != w {
			t.Fatalf("after random runs, Get(5, %d) = %v, want %v", c, g.Get(5, c), w)
		}
	}
	for _, r := range []int{4, 6} {
		if n := g.CountRow(r); n != 0 {
			t.Errorf("CountRow(%d) = %d after runs on row 5 only, want 0", r, n)
		}
	}
}

// header returns a valid header for cpd 1 and the given source.
func header(cpd uint64, source string) []byte {
	b := []byte("ELMK\x01")
	b = binary.AppendUvarint(b, cpd)
	b = binary.AppendUvarint(b, uint64(len(source)))
	return append(b, source...)
}

// zbody compresses raw run bytes as Encode does.
func zbody(raw []byte) []byte {
	var buf bytes.Buffer
	w := zlib.NewWriter(&buf)
	w.Write(raw)
	w.Close()
	return buf.Bytes()
}

// rows returns n copies of one all-sea row of a cpd-1 grid (360 cells).
func seaRows(n int) []byte {
	var b []byte
	for range n {
		b = binary.AppendUvarint(b, 360)
	}
	return b
}

// TestDecodeErrors: each kind of damage gives an error that names the part of
// the file at fault, and never a panic.
func TestDecodeErrors(t *testing.T) {
	good := append(header(1, "x"), zbody(seaRows(180))...)
	if _, err := Decode(good); err != nil {
		t.Fatalf("Decode(valid all-sea file) = %v, want nil", err)
	}
	corrupt := bytes.Clone(good)
	corrupt[len(corrupt)-1] ^= 0xff // the Adler-32 check (RFC 1950 §2.2)
	cases := []struct {
		name, want string
		data       []byte
	}{
		{"empty", "magic", nil},
		{"wrong magic", "magic", []byte("PNG\x00\x01")},
		{"wrong version", "version", []byte("ELMK\x02")},
		{"no cpd", "cellsPerDeg", []byte("ELMK\x01")},
		{"cpd 0", "cellsPerDeg", header(0, "")},
		{"cpd too big", "cellsPerDeg", header(MaxCellsPerDeg+1, "")},
		{"source past end", "source length", append([]byte("ELMK\x01\x01\x05"), "ab"...)},
		{"source not UTF-8", "UTF-8", append(header(1, "\xff"), zbody(seaRows(180))...)},
		{"no body", "body", header(1, "")},
		{"bad checksum", "body", corrupt},
		{"too few rows", "row 179", append(header(1, ""), zbody(seaRows(179))...)},
		{"trailing runs", "trailing", append(header(1, ""), zbody(seaRows(181))...)},
		{"runs overflow row", "row 0", append(header(1, ""), zbody(append([]byte{200, 1, 200, 1}, seaRows(179)...))...)},
		{"zero run mid-row", "zero-length", append(header(1, ""), zbody(append([]byte{10, 0}, seaRows(180)...))...)},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			g, err := Decode(tc.data)
			if err == nil || !strings.Contains(err.Error(), tc.want) {
				t.Fatalf("Decode(%s) = %v, %v; want an error mentioning %q", tc.name, g, err, tc.want)
			}
		})
	}
}

// TestNewGridErrors: the cell count is validated with the field named.
func TestNewGridErrors(t *testing.T) {
	for _, cpd := range []int{0, -1, MaxCellsPerDeg + 1} {
		if _, err := NewGrid(cpd); err == nil || !strings.Contains(err.Error(), "cellsPerDeg") {
			t.Errorf("NewGrid(%d) error = %v, want one naming cellsPerDeg", cpd, err)
		}
	}
}

// FuzzDecode: no input makes Decode panic, and whatever it accepts encodes
// back to a file that decodes to the same grid.
func FuzzDecode(f *testing.F) {
	f.Add(append(header(1, "x"), zbody(seaRows(180))...))
	f.Add([]byte("ELMK\x01\x01\x00"))
	f.Fuzz(func(t *testing.T, data []byte) {
		g, err := Decode(data)
		if err != nil {
			return
		}
		enc, err := Encode(g)
		if err != nil {
			t.Fatalf("Encode(Decode(data)): %v", err)
		}
		h, err := Decode(enc)
		if err != nil || !h.Equal(g) {
			t.Fatalf("Decode(Encode(Decode(data))) = %v, equal %v", err, err == nil && h.Equal(g))
		}
	})
}
