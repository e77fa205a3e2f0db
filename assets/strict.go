package assets

import (
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"reflect"
	"strconv"
	"strings"
	"unicode/utf8"
)

var scenarioType = reflect.TypeFor[Scenario]()

// checkStrictJSON checks that data is one JSON value of the shape of Go
// type t as encoding/json would store it, but strictly: object keys must
// match a field's JSON name exactly, once each; required fields (tag
// `scenario:"required"`) must be present; null is refused; numbers must fit
// their field (finite float64, whole int); fixed-size arrays must have
// their exact length; nothing may follow the value. The error's Path is the
// JSON path of the fault (File is left empty).
func checkStrictJSON(data []byte, t reflect.Type) *Error {
	if !utf8.Valid(data) {
		i := 0
		for i < len(data) {
			r, n := utf8.DecodeRune(data[i:])
			if r == utf8.RuneError && n <= 1 {
				break
			}
			i += n
		}
		line, col := lineCol(data, i)
		return &Error{Line: line, Msg: fmt.Sprintf("column %d: not valid UTF-8 text", col)}
	}
	dec := json.NewDecoder(bytes.NewReader(data))
	dec.UseNumber()
	c := &checker{dec: dec, data: data}
	tok, e := c.token()
	if e != nil {
		if e.Msg == "unexpected end of file" {
			e.Msg = "empty file; want a JSON object"
		}
		return e
	}
	if e := c.value(tok, t, ""); e != nil {
		return e
	}
	end := int(dec.InputOffset())
	if _, err := dec.Token(); err != io.EOF {
		if err != nil {
			return c.syntax(err)
		}
		for end < len(data) && strings.IndexByte(" \t\r\n", data[end]) >= 0 {
			end++
		}
		line, col := lineCol(data, end)
		return &Error{Line: line, Msg: fmt.Sprintf("column %d: unexpected data after the top-level object", col)}
	}
	return nil
}

type checker struct {
	dec  *json.Decoder
	data []byte
}

// lineCol returns the 1-based line and column (in bytes) of offset off.
func lineCol(data []byte, off int) (line, col int) {
	off = min(max(off, 0), len(data))
	before := data[:off]
	line = 1 + bytes.Count(before, []byte{'\n'})
	col = off - (bytes.LastIndexByte(before, '\n') + 1) + 1
	return line, col
}

func (c *checker) syntax(err error) *Error {
	var se *json.SyntaxError
	if errors.As(err, &se) {
		line, col := lineCol(c.data, int(se.Offset))
		return &Error{Line: line, Msg: fmt.Sprintf("column %d: invalid JSON: %s", col, strings.TrimPrefix(se.Error(), "json: "))}
	}
	if errors.Is(err, io.EOF) || errors.Is(err, io.ErrUnexpectedEOF) {
		line, _ := lineCol(c.data, len(c.data))
		return &Error{Line: line, Msg: "unexpected end of file"}
	}
	return &Error{Msg: "invalid JSON", Err: err}
}

func (c *checker) token() (json.Token, *Error) {
	tok, err := c.dec.Token()
	if err != nil {
		return nil, c.syntax(err)
	}
	return tok, nil
}

func join(path, key string) string {
	if path == "" {
		return key
	}
	return path + "." + key
}

// kindOf describes a token for an error message.
func kindOf(tok json.Token) string {
	switch v := tok.(type) {
	case json.Delim:
		if v == '{' {
			return "an object"
		}
		return "an array"
	case string:
		return "a string"
	case json.Number:
		return "a number"
	case bool:
		return "a boolean"
	}
	return "null"
}

type fieldInfo struct {
	name     string
	typ      reflect.Type
	required bool
}

// fieldsOf lists the JSON fields of struct type t in declaration order.
func fieldsOf(t reflect.Type) []fieldInfo {
	var out []fieldInfo
	for i := range t.NumField() {
		f := t.Field(i)
		name, _, _ := strings.Cut(f.Tag.Get("json"), ",")
		if name == "-" || !f.IsExported() {
			continue
		}
		if name == "" {
			name = f.Name
		}
		out = append(out, fieldInfo{name, f.Type, f.Tag.Get("scenario") == "required"})
	}
	return out
}

var latLonType = reflect.TypeFor[[2]float64]()

// value checks the value that starts with tok against type t.
func (c *checker) value(tok json.Token, t reflect.Type, path string) *Error {
	if tok == nil {
		return &Error{Path: path, Msg: "must not be null (leave the field out instead)"}
	}
	if t.Kind() == reflect.Pointer {
		t = t.Elem()
	}
	want := func(what string) *Error {
		return &Error{Path: path, Msg: fmt.Sprintf("must be %s, got %s", what, kindOf(tok))}
	}
	switch t.Kind() {
	case reflect.Struct:
		if tok != json.Delim('{') {
			return want("an object")
		}
		fields := fieldsOf(t)
		seen := map[string]bool{}
		for c.dec.More() {
			ktok, e := c.token()
			if e != nil {
				return e
			}
			key, _ := ktok.(string) // the decoder only yields string keys
			var f *fieldInfo
			for i := range fields {
				if fields[i].name == key {
					f = &fields[i]
				}
			}
			if f == nil {
				names := make([]string, len(fields))
				for i, fi := range fields {
					names[i] = fi.name
				}
				return &Error{Path: path, Msg: fmt.Sprintf("unknown field %q (allowed: %s)", key, strings.Join(names, ", "))}
			}
			if seen[key] {
				return &Error{Path: join(path, key), Msg: "given more than once"}
			}
			seen[key] = true
			vtok, e := c.token()
			if e != nil {
				return e
			}
			if e := c.value(vtok, f.typ, join(path, key)); e != nil {
				return e
			}
		}
		if _, e := c.token(); e != nil { // '}'
			return e
		}
		for _, f := range fields {
			if f.required && !seen[f.name] {
				return &Error{Path: join(path, f.name), Msg: "missing (required)"}
			}
		}
		return nil
	case reflect.Slice, reflect.Array:
		if tok != json.Delim('[') {
			if t == latLonType {
				return want("a [lat, lon] pair")
			}
			return want("an array")
		}
		n := 0
		for c.dec.More() {
			if t.Kind() == reflect.Array && n >= t.Len() {
				break
			}
			etok, e := c.token()
			if e != nil {
				return e
			}
			if e := c.value(etok, t.Elem(), fmt.Sprintf("%s[%d]", path, n)); e != nil {
				return e
			}
			n++
		}
		if t.Kind() == reflect.Array && (n != t.Len() || c.dec.More()) {
			what := fmt.Sprintf("exactly %d elements", t.Len())
			if t == latLonType {
				what = "a [lat, lon] pair"
			}
			got := fmt.Sprintf("%d elements", n)
			if c.dec.More() {
				got = "more"
			}
			return &Error{Path: path, Msg: fmt.Sprintf("must be %s, got %s", what, got)}
		}
		if _, e := c.token(); e != nil { // ']'
			return e
		}
		return nil
	case reflect.String:
		if _, ok := tok.(string); !ok {
			return want("a string")
		}
		return nil
	case reflect.Float64:
		num, ok := tok.(json.Number)
		if !ok {
			return want("a number")
		}
		if _, err := strconv.ParseFloat(string(num), 64); err != nil {
			return &Error{Path: path, Msg: fmt.Sprintf("must be a finite number, got %s", num)}
		}
		return nil
	case reflect.Int:
		num, ok := tok.(json.Number)
		if !ok {
			return want("a whole number")
		}
		if _, err := strconv.ParseInt(string(num), 10, 0); err != nil {
			return &Error{Path: path, Msg: fmt.Sprintf("must be a whole number (no decimal point or exponent), got %s", num)}
		}
		return nil
	}
	panic(fmt.Sprintf("assets: checkStrictJSON: unsupported type %v", t))
}
