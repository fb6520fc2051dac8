package jsonx

import (
	"bytes"
	"errors"
	"fmt"
	"io"
	"sort"
	"strings"
)

// unknownFieldName finds `unknown field "NAME"` in s and returns NAME.
// (Plain string scanning, not regexp: the regexp package would add about
// 90 kB gzip to the page's wasm.)
func unknownFieldName(s string) (string, bool) {
	const key = `unknown field "`
	i := strings.Index(s, key)
	if i < 0 {
		return "", false
	}
	rest := s[i+len(key):]
	j := strings.IndexByte(rest, '"')
	if j < 0 {
		return "", false
	}
	return rest[:j], true
}

// typeFieldName finds "Go struct field X" or "field X" in s and returns
// X, the longest run of letters, digits, '_', '.', '[' and ']'.
func typeFieldName(s string) (string, bool) {
	for _, key := range []string{"Go struct field ", "field "} {
		i := strings.Index(s, key)
		if i < 0 {
			continue
		}
		rest := s[i+len(key):]
		j := 0
		for j < len(rest) {
			c := rest[j]
			if c >= 'a' && c <= 'z' || c >= 'A' && c <= 'Z' || c >= '0' && c <= '9' || c == '_' || c == '.' || c == '[' || c == ']' {
				j++
				continue
			}
			break
		}
		if j > 0 {
			return rest[:j], true
		}
	}
	return "", false
}

// DecodeStrict decodes exactly one JSON value from b into v, strictly and
// alike under both JSON libraries: unknown fields, keys that match a field
// only when case or Unicode folds are ignored ("Candidates", "ſolute"),
// a key repeated in one object, a null or empty body and trailing data are
// errors. The error names the offending field where it can (see FieldOf).
func DecodeStrict(b []byte, v any) error {
	t := bytes.TrimSpace(b)
	if len(t) == 0 {
		return errors.New("empty request body: a JSON object is expected")
	}
	if string(t) == "null" {
		return ErrNull
	}
	if err := checkKeys(t, v); err != nil {
		return err
	}
	dec := NewDecoder(bytes.NewReader(b))
	dec.DisallowUnknownFields()
	if err := dec.Decode(v); err != nil {
		if name, ok := unknownFieldName(err.Error()); ok {
			// The libraries name only the key; find where it sits.
			var doc any
			if Unmarshal(b, &doc) == nil {
				if p, ok := keyPath(doc, name, ""); ok {
					return &UnknownFieldError{Path: p}
				}
			}
			return &UnknownFieldError{Path: name}
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
		return uf.Path, uf.Error()
	}
	var dk *DuplicateKeyError
	if errors.As(err, &dk) {
		return dk.Path, dk.Error()
	}
	if errors.Is(err, ErrNull) {
		return "", err.Error()
	}
	s := err.Error()
	s = strings.TrimPrefix(s, "json: ")
	if name, ok := unknownFieldName(s); ok {
		return name, fmt.Sprintf("unknown field %q", name)
	}
	if strings.Contains(s, "cannot unmarshal") {
		if f, ok := typeFieldName(s); ok {
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
// full path in the document (e.g. "membrane.s_mm"); Hint is the field it
// matches when case is ignored (keys are matched exactly).
type UnknownFieldError struct{ Path, Hint string }

func (e *UnknownFieldError) Error() string {
	if e.Hint != "" {
		return fmt.Sprintf("unknown field %q (keys are matched exactly: did you mean %q?)", e.Path, e.Hint)
	}
	return fmt.Sprintf("unknown field %q", e.Path)
}

// ErrNull is DecodeStrict's error for a body that is JSON null: a request
// must be a JSON object ({} takes every default), never null.
var ErrNull = errors.New("the request is null: a JSON object is expected ({} takes every default)")

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
