package jsonx

import (
	"bytes"
	"errors"
	"fmt"
	"io"
	"regexp"
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
