// Package maskfile is the storage format of earshot's land/sea mask: a
// regular latitude/longitude grid of one bit per cell, written as per-row run
// lengths and compressed with zlib. The generator (assets/internal/genmask)
// writes it and package assets reads it; keeping both directions here means
// the format is defined in one place.
//
// # Grid
//
// The grid has CellsPerDeg cells per degree in both directions, so
// Rows = 180·CellsPerDeg and Cols = 360·CellsPerDeg. Row 0 is the southernmost
// row and column 0 the westernmost column; cell (r, c) covers
//
//	latitude  [-90 + r/CellsPerDeg, -90 + (r+1)/CellsPerDeg)  degrees
//	longitude [-180 + c/CellsPerDeg, -180 + (c+1)/CellsPerDeg) degrees
//
// and holds the value of the surface at its centre.
//
// # Byte layout
//
//	magic      4 bytes  "ELMK"
//	version    1 byte   1
//	cpd        uvarint  cells per degree, 1..MaxCellsPerDeg
//	srcLen     uvarint  length of the provenance text, ≤ MaxSourceLen
//	source     srcLen bytes of UTF-8 provenance text
//	body       zlib stream (RFC 1950, with its Adler-32 check) of, for each
//	           row from south to north, the uvarint run lengths of that row,
//	           alternating sea, land, sea, … and starting with sea; only the
//	           first run of a row may be 0 (a row that starts with land); the
//	           runs of a row add up to Cols.
//
// uvarint is the unsigned LEB128 integer of encoding/binary.PutUvarint.
// Reference: RFC 1950 (ZLIB Compressed Data Format Specification, 1996) for
// the body container; the Go standard library's encoding/binary for uvarint.
package maskfile

import (
	"bytes"
	"compress/zlib"
	"encoding/binary"
	"errors"
	"fmt"
	"io"
	"math/bits"
	"unicode/utf8"
)

// Limits of the format, chosen so a corrupt header cannot request an
// unbounded allocation: 120 cells per degree (0.5′, ≈ 0.93 km) is already
// 43 200 × 21 600 cells = 117 MB of bits.
const (
	MaxCellsPerDeg = 120
	MaxSourceLen   = 4096
	magic          = "ELMK"
	version        = 1
)

// Grid is a world lat/lon grid of one bit per cell (true = land). Each row
// is padded to a whole number of 64-bit words.
type Grid struct {
	CellsPerDeg int      // cells per degree, both axes
	Rows, Cols  int      // 180·CellsPerDeg, 360·CellsPerDeg
	Stride      int      // 64-bit words per row
	Words       []uint64 // Rows·Stride words; bit c%64 of Words[r·Stride+c/64] is cell (r, c)
	Source      string   // provenance text stored with the grid
}

// NewGrid returns an all-sea grid with cellsPerDeg cells per degree, or an
// error naming the field when cellsPerDeg is outside 1..MaxCellsPerDeg.
func NewGrid(cellsPerDeg int) (*Grid, error) {
	if cellsPerDeg < 1 || cellsPerDeg > MaxCellsPerDeg {
		return nil, fmt.Errorf("maskfile: cellsPerDeg must be in 1..%d, got %d", MaxCellsPerDeg, cellsPerDeg)
	}
	rows, cols := 180*cellsPerDeg, 360*cellsPerDeg
	stride := (cols + 63) / 64
	return &Grid{
		CellsPerDeg: cellsPerDeg,
		Rows:        rows,
		Cols:        cols,
		Stride:      stride,
		Words:       make([]uint64, rows*stride),
	}, nil
}

// Get reports cell (r, c). It panics with an index error when r or c is out
// of range (a programmer error).
func (g *Grid) Get(r, c int) bool {
	if uint(c) >= uint(g.Cols) {
		panic(fmt.Sprintf("maskfile: column %d out of range [0, %d)", c, g.Cols))
	}
	return g.Words[r*g.Stride+c>>6]>>(uint(c)&63)&1 != 0
}

// Set sets cell (r, c) to land (true) or sea (false). Out-of-range indexes
// panic as in Get.
func (g *Grid) Set(r, c int, land bool) {
	if uint(c) >= uint(g.Cols) {
		panic(fmt.Sprintf("maskfile: column %d out of range [0, %d)", c, g.Cols))
	}
	i, m := r*g.Stride+c>>6, uint64(1)<<(uint(c)&63)
	if land {
		g.Words[i] |= m
	} else {
		g.Words[i] &^= m
	}
}

// XorRun flips cells [a, b) of row r. It panics unless 0 ≤ a ≤ b ≤ Cols and
// 0 ≤ r < Rows (a programmer error).
func (g *Grid) XorRun(r, a, b int) { g.applyRun(r, a, b, true) }

// SetRun sets cells [a, b) of row r to land; panics as XorRun.
func (g *Grid) SetRun(r, a, b int) { g.applyRun(r, a, b, false) }

func (g *Grid) applyRun(r, a, b int, flip bool) {
	if r < 0 || r >= g.Rows || a < 0 || a > b || b > g.Cols {
		panic(fmt.Sprintf("maskfile: run row %d [%d, %d) outside %d×%d grid", r, a, b, g.Rows, g.Cols))
	}
	if a == b {
		return
	}
	row := g.Words[r*g.Stride : (r+1)*g.Stride]
	wa, wb := a>>6, (b-1)>>6
	ma := ^uint64(0) << (uint(a) & 63)          // bits a%64.. of word wa
	mb := ^uint64(0) >> (63 - (uint(b-1) & 63)) // bits ..(b-1)%64 of word wb
	apply := func(i int, m uint64) {
		if flip {
			row[i] ^= m
		} else {
			row[i] |= m
		}
	}
	if wa == wb {
		apply(wa, ma&mb)
		return
	}
	apply(wa, ma)
	for i := wa + 1; i < wb; i++ {
		apply(i, ^uint64(0))
	}
	apply(wb, mb)
}

// CountRow returns the number of land cells in row r.
func (g *Grid) CountRow(r int) int {
	n := 0
	for _, w := range g.Words[r*g.Stride : (r+1)*g.Stride] {
		n += bits.OnesCount64(w)
	}
	return n
}

// Equal reports whether g and h have the same shape and cells (the Source
// text is not compared).
func (g *Grid) Equal(h *Grid) bool {
	if g.CellsPerDeg != h.CellsPerDeg || len(g.Words) != len(h.Words) {
		return false
	}
	for i, w := range g.Words {
		if w != h.Words[i] {
			return false
		}
	}
	return true
}

// Encode writes g in the format described in the package comment.
func Encode(g *Grid) ([]byte, error) {
	if g.Rows != 180*g.CellsPerDeg || g.Cols != 360*g.CellsPerDeg || len(g.Words) != g.Rows*g.Stride || g.Stride != (g.Cols+63)/64 {
		return nil, fmt.Errorf("maskfile: grid shape %d×%d (stride %d, %d words) does not match cellsPerDeg %d",
			g.Rows, g.Cols, g.Stride, len(g.Words), g.CellsPerDeg)
	}
	if err := checkSource(g.Source); err != nil {
		return nil, err
	}
	var out bytes.Buffer
	out.WriteString(magic)
	out.WriteByte(version)
	out.Write(binary.AppendUvarint(nil, uint64(g.CellsPerDeg)))
	out.Write(binary.AppendUvarint(nil, uint64(len(g.Source))))
	out.WriteString(g.Source)

	zw, err := zlib.NewWriterLevel(&out, zlib.BestCompression)
	if err != nil {
		return nil, err
	}
	var body []byte
	for r := range g.Rows {
		body = appendRowRuns(body[:0], g, r)
		if _, err := zw.Write(body); err != nil {
			return nil, err
		}
	}
	if err := zw.Close(); err != nil {
		return nil, err
	}
	return out.Bytes(), nil
}

// appendRowRuns appends the uvarint run lengths of row r to dst.
func appendRowRuns(dst []byte, g *Grid, r int) []byte {
	state, start := false, 0 // runs start with sea
	for c := range g.Cols {
		if g.Get(r, c) != state {
			dst = binary.AppendUvarint(dst, uint64(c-start))
			state, start = !state, c
		}
	}
	return binary.AppendUvarint(dst, uint64(g.Cols-start))
}

// Decode reads a grid written by Encode. Every malformed header field, run or
// checksum gives an error naming it; Decode never panics on bad data.
func Decode(data []byte) (*Grid, error) {
	if len(data) < len(magic)+1 || string(data[:len(magic)]) != magic {
		return nil, errors.New("maskfile: magic: not a land mask (want \"ELMK\")")
	}
	p := data[len(magic):]
	if p[0] != version {
		return nil, fmt.Errorf("maskfile: version: got %d, want %d", p[0], version)
	}
	p = p[1:]
	cpd, n := binary.Uvarint(p)
	if n <= 0 {
		return nil, errors.New("maskfile: cellsPerDeg: truncated or overlong uvarint")
	}
	if cpd < 1 || cpd > MaxCellsPerDeg {
		return nil, fmt.Errorf("maskfile: cellsPerDeg must be in 1..%d, got %d", MaxCellsPerDeg, cpd)
	}
	p = p[n:]
	srcLen, n := binary.Uvarint(p)
	if n <= 0 {
		return nil, errors.New("maskfile: source length: truncated or overlong uvarint")
	}
	p = p[n:]
	if srcLen > MaxSourceLen || srcLen > uint64(len(p)) {
		return nil, fmt.Errorf("maskfile: source length %d exceeds limit %d or remaining %d bytes", srcLen, MaxSourceLen, len(p))
	}
	source := string(p[:srcLen])
	if err := checkSource(source); err != nil {
		return nil, err
	}
	p = p[srcLen:]

	g, err := NewGrid(int(cpd))
	if err != nil {
		return nil, err
	}
	g.Source = source

	zr, err := zlib.NewReader(bytes.NewReader(p))
	if err != nil {
		return nil, fmt.Errorf("maskfile: body: %w", err)
	}
	// A row needs at most Cols+1 runs of at most 3 bytes each (Cols < 2^21),
	// which bounds the body before it is read.
	limit := int64(g.Rows) * int64(g.Cols+1) * 3
	body, err := io.ReadAll(io.LimitReader(zr, limit+1))
	if err != nil {
		return nil, fmt.Errorf("maskfile: body: %w", err)
	}
	if int64(len(body)) > limit {
		return nil, fmt.Errorf("maskfile: body: longer than the %d-byte limit for %d×%d cells", limit, g.Rows, g.Cols)
	}
	if err := zr.Close(); err != nil {
		return nil, fmt.Errorf("maskfile: body: %w", err)
	}

	for r := range g.Rows {
		c, land, first := 0, false, true
		for c < g.Cols {
			run, n := binary.Uvarint(body)
			if n <= 0 {
				return nil, fmt.Errorf("maskfile: row %d: run at column %d truncated or overlong", r, c)
			}
			body = body[n:]
			if run == 0 && !first {
				return nil, fmt.Errorf("maskfile: row %d: zero-length run at column %d", r, c)
			}
			if run > uint64(g.Cols-c) {
				return nil, fmt.Errorf("maskfile: row %d: runs add up to more than cols = %d", r, g.Cols)
			}
			if land {
				g.SetRun(r, c, c+int(run))
			}
			c += int(run)
			land, first = !land, false
		}
	}
	if len(body) != 0 {
		return nil, fmt.Errorf("maskfile: body: %d trailing bytes after row %d", len(body), g.Rows-1)
	}
	return g, nil
}

func checkSource(s string) error {
	if len(s) > MaxSourceLen {
		return fmt.Errorf("maskfile: source text is %d bytes, limit %d", len(s), MaxSourceLen)
	}
	if !utf8.ValidString(s) {
		return errors.New("maskfile: source text is not valid UTF-8")
	}
	return nil
}
