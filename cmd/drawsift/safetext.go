package main

import (
	"encoding/csv"
	"io"
	"reflect"
	"strconv"
	"strings"
	"unicode"
)

// csvWriter is csv.Writer with every text cell neutralised against
// formula injection (OWASP, "CSV Injection"): a cell a spreadsheet would
// read as a formula — starting with =, +, -, @, a tab or a carriage
// return — gets a leading single quote, so "=HYPERLINK(…)" in a custom
// solute's id stays text. Numbers stay numbers: a cell that parses as a
// number ("-0.25", "+3e-4") is written unchanged.
type csvWriter struct{ *csv.Writer }

func newCSV(w io.Writer) *csvWriter { return &csvWriter{csv.NewWriter(w)} }

// Write writes one record, its cells neutralised (csvCell).
func (c *csvWriter) Write(rec []string) error {
	out := rec
	for i, s := range rec {
		if t := csvCell(s); t != s {
			if &out[0] == &rec[0] {
				out = append([]string(nil), rec...)
			}
			out[i] = t
		}
	}
	return c.Writer.Write(out)
}

// csvCell returns s safe as a spreadsheet cell.
func csvCell(s string) string {
	if s == "" {
		return s
	}
	switch s[0] {
	case '=', '+', '-', '@', '\t', '\r':
		if _, err := strconv.ParseFloat(s, 64); err == nil && s[0] != '\t' && s[0] != '\r' {
			return s // a number, not a formula
		}
		return "'" + s
	}
	return s
}

// plainText drops control characters (ESC sequences, NUL, …; a tab or a
// line break would also break the table's columns) and Unicode format
// characters (bidirectional overrides, zero-width characters) from a text
// cell of --format table, so what a terminal shows is what the text says.
func plainText(s string) string {
	clean := true
	for _, r := range s {
		if unicode.IsControl(r) || unicode.Is(unicode.Cf, r) {
			clean = false
			break
		}
	}
	if clean {
		return s
	}
	return strings.Map(func(r rune) rune {
		if unicode.IsControl(r) || unicode.Is(unicode.Cf, r) {
			return -1
		}
		return r
	}, s)
}

// plainStrings applies plainText to every string reachable from v (a
// pointer to a decoded response): struct fields, slices, and map values
// and keys.
func plainStrings(v any) { plainValue(reflect.ValueOf(v)) }

func plainValue(v reflect.Value) {
	switch v.Kind() {
	case reflect.Pointer, reflect.Interface:
		if !v.IsNil() {
			if v.Kind() == reflect.Interface {
				if e := v.Elem(); e.Kind() == reflect.String && v.CanSet() {
					v.Set(reflect.ValueOf(plainText(e.String())))
				}
				return
			}
			plainValue(v.Elem())
		}
	case reflect.String:
		if v.CanSet() {
			v.SetString(plainText(v.String()))
		}
	case reflect.Struct:
		for i := 0; i < v.NumField(); i++ {
			if v.Type().Field(i).IsExported() {
				plainValue(v.Field(i))
			}
		}
	case reflect.Slice, reflect.Array:
		for i := 0; i < v.Len(); i++ {
			plainValue(v.Index(i))
		}
	case reflect.Map:
		if v.IsNil() || v.Type().Key().Kind() != reflect.String {
			return
		}
		for _, k := range v.MapKeys() {
			val := v.MapIndex(k)
			nv := reflect.New(val.Type()).Elem()
			nv.Set(val)
			plainValue(nv)
			nk := plainText(k.String())
			v.SetMapIndex(k, reflect.Value{})
			v.SetMapIndex(reflect.ValueOf(nk).Convert(k.Type()), nv)
		}
	}
}
