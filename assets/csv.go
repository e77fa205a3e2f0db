package assets

import (
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"strconv"
	"strings"
	"unicode/utf8"

	"earshot/propagation"
	"earshot/receiver/plan"
)

// Columns of a station list: the required ones, then the optional ones.
var (
	csvRequired = []string{"id", "name", "khz", "kw", "lat", "lon"}
	csvOptional = []string{"kw_night", "height_deg"}
)

// ParseStationsCSV reads a station list: a header row naming the columns
// id, name, khz, kw, lat, lon and optionally kw_night and height_deg, in
// any order, then one station per row (see README.md). file names the
// list in errors. Every error is an *Error naming file, line (the header is
// line 1) and column, e.g.
//
//	stations.csv: line 4: khz: must be between 100 and 30000 kHz, got 5
//
// Values follow the scenario format's rules (ids unique ignoring case,
// kw is the day power, an empty kw_night cell means as by day, an empty
// height_deg cell a short monopole). On error no stations are returned.
func ParseStationsCSV(r io.Reader, file string) ([]plan.Station, error) {
	cr := csv.NewReader(r)
	cr.TrimLeadingSpace = true
	cr.ReuseRecord = false
	header, err := cr.Read()
	if err == io.EOF {
		return nil, &Error{File: file, Line: 1, Msg: "empty file; want a header row " + strings.Join(csvRequired, ",")}
	}
	if err != nil {
		return nil, csvErr(file, err)
	}
	col := map[string]int{}
	for i, h := range header {
		if i == 0 {
			h = strings.TrimPrefix(h, "\ufeff") // a byte-order mark some spreadsheets write
		}
		h = strings.TrimSpace(h)
		if !utf8.ValidString(h) {
			return nil, &Error{File: file, Line: 1, Msg: fmt.Sprintf("column %d: header is not valid UTF-8 text", i+1)}
		}
		known := false
		for _, k := range append(append([]string(nil), csvRequired...), csvOptional...) {
			known = known || h == k
		}
		if !known {
			return nil, &Error{File: file, Line: 1, Msg: fmt.Sprintf("unknown column %q (allowed: %s)", h,
				strings.Join(append(append([]string(nil), csvRequired...), csvOptional...), ", "))}
		}
		if _, dup := col[h]; dup {
			return nil, &Error{File: file, Line: 1, Msg: fmt.Sprintf("column %q given more than once", h)}
		}
		col[h] = i
	}
	for _, k := range csvRequired {
		if _, ok := col[k]; !ok {
			return nil, &Error{File: file, Line: 1, Msg: fmt.Sprintf("missing column %q (required: %s)", k, strings.Join(csvRequired, ", "))}
		}
	}
	var out []plan.Station
	firstLine := map[string]int{}
	for {
		rec, err := cr.Read()
		if err == io.EOF {
			break
		}
		if err != nil {
			return nil, csvErr(file, err)
		}
		line, _ := cr.FieldPos(0)
		st, e := csvStation(rec, col)
		if e != nil {
			e.File, e.Line = file, line
			return nil, e
		}
		key := strings.ToLower(st.ID)
		if first, dup := firstLine[key]; dup {
			return nil, &Error{File: file, Line: line, Path: "id", Msg: fmt.Sprintf("duplicate id %q (first on line %d; ids are compared ignoring case)", st.ID, first)}
		}
		firstLine[key] = line
		out = append(out, st)
	}
	if len(out) == 0 {
		return nil, &Error{File: file, Line: 2, Msg: "no stations; want one station per line after the header"}
	}
	return out, nil
}

// csvErr turns an encoding/csv error into an *Error.
func csvErr(file string, err error) *Error {
	var pe *csv.ParseError
	if errors.As(err, &pe) {
		if errors.Is(pe.Err, csv.ErrFieldCount) {
			return &Error{File: file, Line: pe.StartLine, Msg: "the number of fields differs from the header's"}
		}
		return &Error{File: file, Line: pe.Line, Msg: fmt.Sprintf("column %d: %v", pe.Column, pe.Err), Err: pe.Err}
	}
	return &Error{File: file, Msg: "cannot read", Err: err}
}

// csvStation reads one row; the error names the column (File and Line are
// set by the caller).
func csvStation(rec []string, col map[string]int) (plan.Station, *Error) {
	cell := func(name string) (string, bool) {
		i, ok := col[name]
		if !ok {
			return "", false
		}
		return strings.TrimSpace(rec[i]), true
	}
	num := func(name string) (float64, *Error) {
		s, _ := cell(name)
		if s == "" {
			return 0, &Error{Path: name, Msg: "must not be empty"}
		}
		v, err := strconv.ParseFloat(s, 64)
		if err != nil {
			return 0, &Error{Path: name, Msg: fmt.Sprintf("must be a number, got %q", s)}
		}
		return v, nil
	}
	for name, i := range col {
		if !utf8.ValidString(rec[i]) {
			return plan.Station{}, &Error{Path: name, Msg: "not valid UTF-8 text"}
		}
	}
	id, _ := cell("id")
	if e := checkStationID(id); e != nil {
		return plan.Station{}, e
	}
	name, _ := cell("name")
	var st plan.Station
	st.ID, st.Name = id, name
	khz, e := num("khz")
	if e != nil {
		return st, e
	}
	if e := checkKHz(khz); e != nil {
		return st, e
	}
	kw, e := num("kw")
	if e != nil {
		return st, e
	}
	if e := checkKW("kw", kw); e != nil {
		return st, e
	}
	lat, e := num("lat")
	if e != nil {
		return st, e
	}
	lon, e := num("lon")
	if e != nil {
		return st, e
	}
	if e := checkLatLon(lat, lon); e != nil {
		return st, e
	}
	st.KHz, st.KWDay = propagation.KHz(khz), kw
	var err error
	if st.Place, err = propagation.NewPlace(lat, lon); err != nil {
		return st, &Error{Path: "lat", Err: err} // unreachable: checked above
	}
	if s, ok := cell("kw_night"); ok && s != "" {
		v, e := num("kw_night")
		if e != nil {
			return st, e
		}
		if e := checkKW("kw_night", v); e != nil {
			e.Msg += " (leave the cell empty for the day power)"
			return st, e
		}
		st.KWNight = v
	}
	if s, ok := cell("height_deg"); ok && s != "" {
		v, e := num("height_deg")
		if e != nil {
			return st, e
		}
		if e := checkHeightDeg(v); e != nil {
			return st, e
		}
		st.HeightDeg = v
	}
	return st, nil
}
