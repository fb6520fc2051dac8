package jsonx

import (
	"fmt"
	"reflect"
	"strconv"
	"strings"
	"sync"
	"unicode/utf16"
	"unicode/utf8"
)

// Strict key checks made before decoding, the same under both JSON
// libraries (encoding/json matches keys case-insensitively, Unicode folds
// included, and both keep the last of repeated keys):
//
//   - every object's keys are distinct (after unescaping);
//   - a key of a struct matches one of its fields' JSON names exactly.
//
// The check walks the document once beside the target type; maps, any
// and raw values get the duplicate check only (a raw body is checked
// again when it is decoded in its turn). Malformed
// JSON is left to the decoder, which words its errors.

// DuplicateKeyError names a key given twice in one object, by its path.
type DuplicateKeyError struct{ Path string }

func (e *DuplicateKeyError) Error() string {
	return fmt.Sprintf("duplicate key %q: each key may appear once in an object", e.Path)
}

// maxStrictDepth bounds the walk's nesting; deeper documents are left to
// the decoder (which refuses them against every request type).
const maxStrictDepth = 512

type unmarshaler interface{ UnmarshalJSON([]byte) error }

var unmarshalerType = reflect.TypeOf((*unmarshaler)(nil)).Elem()

type scanner struct {
	b    []byte
	i    int
	err  error // the first strictness error found
	bad  bool  // malformed JSON: leave it to the decoder
	path []seg // where the walk is; turned into text only for an error
}

// seg is one step of a path: an object key, or a list index (key "").
type seg struct {
	key string
	idx int
}

// pathText writes the path as FieldOf names fields: "l[1].x".
func (s *scanner) pathText() string {
	var b strings.Builder
	for _, p := range s.path {
		if p.key == "" {
			b.WriteByte('[')
			b.WriteString(strconv.Itoa(p.idx))
			b.WriteByte(']')
			continue
		}
		if b.Len() > 0 {
			b.WriteByte('.')
		}
		b.WriteString(p.key)
	}
	return b.String()
}

// fieldCache holds each struct type's JSON names (fieldsOf), built once.
var fieldCache sync.Map // reflect.Type → map[string]reflect.Type

// checkKeys returns a *DuplicateKeyError or *UnknownFieldError for the
// first offending key of b against v's type, or nil.
func checkKeys(b []byte, v any) error {
	s := &scanner{b: b}
	t := reflect.TypeOf(v)
	s.value(t, 0)
	if s.bad {
		return nil
	}
	return s.err
}

func (s *scanner) ws() {
	for s.i < len(s.b) {
		switch s.b[s.i] {
		case ' ', '\t', '\n', '\r':
			s.i++
		default:
			return
		}
	}
}

func (s *scanner) stop() bool { return s.err != nil || s.bad }

// deref strips pointers; nil for a non-struct type whose decoding is its
// own (a raw value). A struct with its own UnmarshalJSON is walked as its
// fields: ours (scenario.Candidate: a string or the struct's object) read
// an object exactly so, and the check then names the full path.
func deref(t reflect.Type) reflect.Type {
	for t != nil {
		if t.Kind() != reflect.Struct && t.Kind() != reflect.Pointer &&
			(t.Implements(unmarshalerType) || reflect.PointerTo(t).Implements(unmarshalerType)) {
			return nil
		}
		if t.Kind() != reflect.Pointer {
			return t
		}
		t = t.Elem()
	}
	return nil
}

func (s *scanner) value(t reflect.Type, depth int) {
	if depth > maxStrictDepth {
		s.bad = true
		return
	}
	t = deref(t)
	s.ws()
	if s.i >= len(s.b) {
		s.bad = true
		return
	}
	switch s.b[s.i] {
	case '{':
		s.object(t, depth)
	case '[':
		var et reflect.Type
		if t != nil && (t.Kind() == reflect.Slice || t.Kind() == reflect.Array) {
			et = t.Elem()
		}
		s.i++
		s.ws()
		if s.i < len(s.b) && s.b[s.i] == ']' {
			s.i++
			return
		}
		for n := 0; !s.stop(); n++ {
			s.path = append(s.path, seg{idx: n})
			s.value(et, depth+1)
			s.path = s.path[:len(s.path)-1]
			if s.stop() {
				return
			}
			if !s.more(']') {
				return
			}
		}
	case '"':
		if _, ok := s.str(); !ok {
			s.bad = true
		}
	default: // number, true, false, null
		for s.i < len(s.b) {
			c := s.b[s.i]
			if c == ',' || c == '}' || c == ']' || c == ' ' || c == '\t' || c == '\n' || c == '\r' {
				return
			}
			s.i++
		}
	}
}

// fieldsOf maps a struct's JSON names to their types, embedded structs
// without a tag flattened, as both decoders read them.
func fieldsOf(t reflect.Type, out map[string]reflect.Type) {
	for i := 0; i < t.NumField(); i++ {
		f := t.Field(i)
		tag, hasTag := f.Tag.Lookup("json")
		name, _, _ := strings.Cut(tag, ",")
		if name == "-" && tag == "-" {
			continue
		}
		if f.Anonymous && name == "" {
			ft := f.Type
			if ft.Kind() == reflect.Pointer {
				ft = ft.Elem()
			}
			if ft.Kind() == reflect.Struct {
				fieldsOf(ft, out)
				continue
			}
		}
		if !f.IsExported() {
			continue
		}
		if !hasTag || name == "" {
			name = f.Name
		}
		if _, dup := out[name]; !dup {
			out[name] = f.Type
		}
	}
}

func (s *scanner) object(t reflect.Type, depth int) {
	var fields map[string]reflect.Type
	var elem reflect.Type
	if t != nil {
		switch t.Kind() {
		case reflect.Struct:
			if f, ok := fieldCache.Load(t); ok {
				fields = f.(map[string]reflect.Type)
			} else {
				fields = map[string]reflect.Type{}
				fieldsOf(t, fields)
				fieldCache.Store(t, fields)
			}
		case reflect.Map:
			elem = t.Elem()
		}
	}
	s.i++ // '{'
	var keys []string
	var seen map[string]bool
	s.ws()
	if s.i < len(s.b) && s.b[s.i] == '}' {
		s.i++
		return
	}
	for !s.stop() {
		s.ws()
		if s.i >= len(s.b) || s.b[s.i] != '"' {
			s.bad = true
			return
		}
		k, ok := s.str()
		if !ok {
			s.bad = true
			return
		}
		s.path = append(s.path, seg{key: k})
		// Duplicates: a short list for small objects, a set past 8 keys.
		dup := false
		if seen != nil {
			dup = seen[k]
			seen[k] = true
		} else {
			for _, q := range keys {
				dup = dup || q == k
			}
			keys = append(keys, k)
			if len(keys) > 8 {
				seen = make(map[string]bool, 16)
				for _, q := range keys {
					seen[q] = true
				}
			}
		}
		if dup {
			s.err = &DuplicateKeyError{Path: s.pathText()}
			return
		}
		vt := elem
		if fields != nil {
			ft, ok := fields[k]
			if !ok {
				s.err = &UnknownFieldError{Path: s.pathText(), Hint: foldHint(k, fields)}
				return
			}
			vt = ft
		}
		s.ws()
		if s.i >= len(s.b) || s.b[s.i] != ':' {
			s.bad = true
			return
		}
		s.i++
		s.value(vt, depth+1)
		if s.stop() {
			return
		}
		s.path = s.path[:len(s.path)-1]
		if !s.more('}') {
			return
		}
	}
}

// more reads what follows a member of an array or object: a comma (true:
// another member follows) or the closing bracket (false); anything else,
// or the end of the input, marks the document bad (false).
func (s *scanner) more(closing byte) bool {
	s.ws()
	switch {
	case s.i >= len(s.b):
		s.bad = true
	case s.b[s.i] == closing:
		s.i++
	case s.b[s.i] == ',':
		s.i++
		return true
	default:
		s.bad = true
	}
	return false
}

// foldHint names the field a key matches only when case is folded.
func foldHint(k string, fields map[string]reflect.Type) string {
	for name := range fields {
		if strings.EqualFold(name, k) {
			return name
		}
	}
	return ""
}

// str reads a JSON string at s.i and returns it unescaped.
func (s *scanner) str() (string, bool) {
	s.i++ // opening quote
	start := s.i
	simple := true
	for s.i < len(s.b) {
		c := s.b[s.i]
		if c == '"' {
			break
		}
		if c == '\\' {
			simple = false
			s.i++
		}
		s.i++
	}
	if s.i >= len(s.b) {
		return "", false
	}
	raw := s.b[start:s.i]
	s.i++ // closing quote
	if simple {
		return string(raw), true
	}
	var out strings.Builder
	for j := 0; j < len(raw); j++ {
		c := raw[j]
		if c != '\\' {
			out.WriteByte(c)
			continue
		}
		j++
		if j >= len(raw) {
			return "", false
		}
		switch raw[j] {
		case '"', '\\', '/':
			out.WriteByte(raw[j])
		case 'b':
			out.WriteByte('\b')
		case 'f':
			out.WriteByte('\f')
		case 'n':
			out.WriteByte('\n')
		case 'r':
			out.WriteByte('\r')
		case 't':
			out.WriteByte('\t')
		case 'u':
			r, n, ok := hex4(raw[j+1:])
			if !ok {
				return "", false
			}
			j += n
			if utf16.IsSurrogate(r) {
				if j+2 < len(raw) && raw[j+1] == '\\' && raw[j+2] == 'u' {
					if r2, n2, ok := hex4(raw[j+3:]); ok {
						if d := utf16.DecodeRune(r, r2); d != utf8.RuneError {
							out.WriteRune(d)
							j += 2 + n2
							continue
						}
					}
				}
				r = utf8.RuneError
			}
			out.WriteRune(r)
		default:
			return "", false
		}
	}
	return out.String(), true
}

// hex4 reads 4 hex digits (after "\u"): the rune and 4.
func hex4(b []byte) (rune, int, bool) {
	if len(b) < 4 {
		return 0, 0, false
	}
	v, err := strconv.ParseUint(string(b[:4]), 16, 32)
	if err != nil {
		return 0, 0, false
	}
	return rune(v), 4, true
}
