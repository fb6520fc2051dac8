package jsonx

import "testing"

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
