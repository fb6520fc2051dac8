package jsonx

import (
	"strings"
	"testing"
)

type inner struct {
	X float64 `json:"x"`
}

type outer struct {
	A  string  `json:"a"`
	In inner   `json:"in"`
	L  []inner `json:"l"`
}

// Decoding errors name the offending field by its JSON path, with either
// JSON library (run also with -tags stdjson).
func TestFieldOf(t *testing.T) {
	for _, tc := range []struct{ body, field string }{
		{`{"a":1}`, "a"},
		{`{"in":{"x":"s"}}`, "in.x"},
		{`{"zz":1}`, "zz"},
		{`{"in":{"q":1}}`, "in.q"},
		{`{"l":[{"x":1},{"y":2}]}`, "l[1].y"},
		{`{"in":{"x":1e999}}`, "in.x"},
		{`{"a":"x"`, ""},
		{`{} {}`, ""},
		{``, ""},
	} {
		var o outer
		err := DecodeStrict([]byte(tc.body), &o)
		if err == nil {
			t.Errorf("%s: accepted", tc.body)
			continue
		}
		if f, _ := FieldOf(err); f != tc.field {
			t.Errorf("%s: field %q, want %q (%v)", tc.body, f, tc.field, err)
		}
	}
}

// Strict means the same under both JSON libraries (run also with -tags
// stdjson): a repeated key, a key matching a field only when case or a
// Unicode fold is ignored, and a null body are refused, naming the path.
func TestDecodeStrictRefusesLooseKeys(t *testing.T) {
	type withMap struct {
		M map[string]float64 `json:"m"`
		R RawMessage         `json:"r"`
	}
	for _, tc := range []struct {
		body, field, msg string
		v                any
	}{
		{`{"a":"x","a":"y"}`, "a", "duplicate key", &outer{}},
		{`{"a":"x","\u0061":"y"}`, "a", "duplicate key", &outer{}}, // the same key, escaped
		{`{"in":{"x":1,"x":2}}`, "in.x", "duplicate key", &outer{}},
		{`{"l":[{"x":1},{"x":1,"x":2}]}`, "l[1].x", "duplicate key", &outer{}},
		{`{"m":{"k":1,"k":2}}`, "m.k", "duplicate key", &withMap{}},
		{`{"r":{"k":1,"k":2}}`, "r.k", "duplicate key", &withMap{}},
		{`{"m":{"a":1,"b":2,"c":3,"d":4,"e":5,"f":6,"g":7,"h":8,"i":9,"j":10,"c":11}}`, "m.c", "duplicate key", &withMap{}},
		{`{"A":"x"}`, "A", `did you mean "a"`, &outer{}},
		{`{"In":{"x":1}}`, "In", `did you mean "in"`, &outer{}},
		{`{"in":{"X":1}}`, "in.X", `did you mean "x"`, &outer{}},
		{`{"ſ":1}`, "ſ", "unknown field", &struct {
			S int `json:"s"`
		}{}},
		{"null", "", "null", &outer{}},
		{" null\n", "", "null", &[]outer{}},
	} {
		err := DecodeStrict([]byte(tc.body), tc.v)
		if err == nil {
			t.Errorf("%s: accepted", tc.body)
			continue
		}
		f, msg := FieldOf(err)
		if f != tc.field || !strings.Contains(msg, tc.msg) {
			t.Errorf("%s: field %q message %q, want %q containing %q", tc.body, f, msg, tc.field, tc.msg)
		}
	}
	// Exact keys, escaped or not, and repeated keys in different objects
	// are fine; nested nulls stay "omitted".
	for _, body := range []string{`{"a":"x","in":{"x":1},"l":[{"x":1},{"x":2}]}`, `{"\u0061":"x"}`, `{"in":null,"a":"\"}{"}`, `{"l":[]}`} {
		var o outer
		if err := DecodeStrict([]byte(body), &o); err != nil {
			t.Errorf("%s: %v", body, err)
		}
	}
	var m withMap
	if err := DecodeStrict([]byte(`{"m":{"K":1,"k":2}}`), &m); err != nil || m.M["K"] != 1 || m.M["k"] != 2 {
		t.Errorf("map keys differing in case: %v %v", err, m.M)
	}
}

// BenchmarkDecodeStrict: a 100-element document, with the strict key
// pass (DecodeStrict) and the library's decoder alone, to show the pass's
// cost.
func BenchmarkDecodeStrict(b *testing.B) {
	var sb strings.Builder
	sb.WriteString(`{"a":"x","in":{"x":1},"l":[`)
	for i := 0; i < 100; i++ {
		if i > 0 {
			sb.WriteByte(',')
		}
		sb.WriteString(`{"x":1.5}`)
	}
	sb.WriteString(`]}`)
	doc := []byte(sb.String())
	b.Run("strict", func(b *testing.B) {
		for b.Loop() {
			var o outer
			if err := DecodeStrict(doc, &o); err != nil {
				b.Fatal(err)
			}
		}
	})
	b.Run("decoder-only", func(b *testing.B) {
		for b.Loop() {
			var o outer
			if err := Unmarshal(doc, &o); err != nil {
				b.Fatal(err)
			}
		}
	})
}
