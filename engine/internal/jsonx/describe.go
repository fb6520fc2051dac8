package jsonx

import (
	"bytes"
	"errors"
	"fmt"
	"io"
	"regexp"
	"sort"
	"strings"
)

var (
	unknownFieldRE = regexp.MustCompile(`unknown field "([^"]*)"`)
	typeFieldRE    = regexp.MustCompile(`(?:Go struct field |field )([A-Za-z0-9_.\[\]]+)`)
)

// DecodeStrict decodes exactly one JSON value from b into v: unknown
// fields, trailing data and an empty body are errors. The error names the
// offending field where it can (see FieldOf).
func DecodeStrict(b []byte, v any) error {
	if len(bytes.TrimSpace(b)) == 0 {
		return errors.New("empty request body: a JSON object is expected")
	}
	dec := NewDecoder(bytes.NewReader(b))
	dec.DisallowUnknownFields()
	if err := dec.Decode(v); err != nil {
		if m := unknownFieldRE.FindStringSubmatch(err.Error()); m != nil {
			// The libraries name only the key; find where it sits.
			var doc any
			if Unmarshal(b, &doc) == nil {
				if p, ok := keyPath(doc, m[1], ""); ok {
					return &UnknownFieldError{Path: p}
				}
			}
			return &UnknownFieldError{Path: m[1]}
		}
		return err
	}
	var extra any
	if err := dec.Decode(&extra); err != io.EOF {
		return errors.New("unexpected data after the JSON object")
	}
	return nil
}

// FieldOf extracts the JSON field a decoding error refers to ("" if none)
// and a message fit for a user. Both JSON libraries word their errors
// alike; the field is recovered from the text so that this works with
// either build.
func FieldOf(err error) (field, msg string) {
	var uf *UnknownFieldError
	if errors.As(err, &uf) {
		return uf.Path, fmt.Sprintf("unknown field %q", uf.Path)
	}
	s := err.Error()
	s = strings.TrimPrefix(s, "json: ")
	if m := unknownFieldRE.FindStringSubmatch(s); m != nil {
		return m[1], fmt.Sprintf("unknown field %q", m[1])
	}
	if strings.Contains(s, "cannot unmarshal") {
		if m := typeFieldRE.FindStringSubmatch(s); m != nil {
			f := m[1]
			// Both libraries prefix the Go type name; keep the JSON path.
			if i := strings.Index(f, "."); i >= 0 {
				f = f[i+1:]
			}
			return f, "wrong type: " + s
		}
		return "", "wrong type: " + s
	}
	return "", "malformed JSON: " + s
}

// UnknownFieldError names a field the request type does not have, by its
// full path in the document (e.g. "membrane.s_mm").
type UnknownFieldError struct{ Path string }

func (e *UnknownFieldError) Error() string { return fmt.Sprintf("unknown field %q", e.Path) }

// keyPath finds the first object key equal to key in document order of a
// depth-first walk (objects' keys sorted, for a deterministic answer) and
// returns its path.
func keyPath(v any, key, prefix string) (string, bool) {
	switch t := v.(type) {
	case map[string]any:
		keys := make([]string, 0, len(t))
		for k := range t {
			keys = append(keys, k)
		}
		sort.Strings(keys)
		for _, k := range keys {
			p := k
			if prefix != "" {
				p = prefix + "." + k
			}
			if k == key {
				return p, true
			}
		}
		for _, k := range keys {
			p := k
			if prefix != "" {
				p = prefix + "." + k
			}
			if r, ok := keyPath(t[k], key, p); ok {
				return r, true
			}
		}
	case []any:
		for i, e := range t {
			if r, ok := keyPath(e, key, fmt.Sprintf("%s[%d]", prefix, i)); ok {
				return r, true
			}
		}
	}
	return "", false
}
