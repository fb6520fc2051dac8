package api

import (
	"fmt"
	"math"
	"reflect"
	"strings"
)

// nonFinitePath walks a response as its JSON encoding would and returns the
// JSON path of the first NaN or ±Inf ("candidates[3].water_flux_lmh"), or
// "" when every number is finite. Dispatch calls it only when encoding
// fails, so a good response costs nothing extra.
func nonFinitePath(v any) string {
	p, _ := walkFinite(reflect.ValueOf(v), "", 0)
	return p
}

func walkFinite(v reflect.Value, path string, depth int) (string, bool) {
	if depth > 64 || !v.IsValid() {
		return "", false
	}
	switch v.Kind() {
	case reflect.Float32, reflect.Float64:
		if f := v.Float(); math.IsNaN(f) || math.IsInf(f, 0) {
			if path == "" {
				path = "(response)"
			}
			return path, true
		}
	case reflect.Pointer, reflect.Interface:
		if !v.IsNil() {
			return walkFinite(v.Elem(), path, depth+1)
		}
	case reflect.Slice, reflect.Array:
		if v.Kind() == reflect.Slice && v.Type().Elem().Kind() == reflect.Uint8 {
			return "", false // bytes, raw JSON
		}
		for i := 0; i < v.Len(); i++ {
			if p, ok := walkFinite(v.Index(i), fmt.Sprintf("%s[%d]", path, i), depth+1); ok {
				return p, true
			}
		}
	case reflect.Map:
		it := v.MapRange()
		for it.Next() {
			if p, ok := walkFinite(it.Value(), joinPath(path, fmt.Sprint(it.Key().Interface())), depth+1); ok {
				return p, true
			}
		}
	case reflect.Struct:
		t := v.Type()
		for i := 0; i < t.NumField(); i++ {
			f := t.Field(i)
			if !f.IsExported() {
				continue
			}
			name := f.Name
			if tag, ok := f.Tag.Lookup("json"); ok {
				n, _, _ := strings.Cut(tag, ",")
				if n == "-" {
					continue
				}
				if n != "" {
					name = n
				}
			}
			if f.Anonymous && f.Tag.Get("json") == "" {
				name = ""
			}
			p := path
			if name != "" {
				p = joinPath(path, name)
			}
			if p, ok := walkFinite(v.Field(i), p, depth+1); ok {
				return p, true
			}
		}
	}
	return "", false
}

func joinPath(a, b string) string {
	if a == "" {
		return b
	}
	return a + "." + b
}

// nonFiniteError is the contract's error for a response that holds a
// non-finite number: the inputs lie where the models cannot give a finite
// answer. It names the result field; the request's own fields passed
// their ranges.
func nonFiniteError(path, detail string) *Error {
	return &Error{Field: "", Kind: KindInvalid, detail: detail,
		Message: fmt.Sprintf("the result %s is not a finite number for these inputs: they lie beyond what the models can represent; move the inputs toward their usual ranges (see the defaults operation)", path),
		Limit:   "every result finite"}
}
