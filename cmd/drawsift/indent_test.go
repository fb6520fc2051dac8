package main

import (
	"bytes"
	"context"
	"encoding/json"
	"strings"
	"testing"

	"drawsift/engine/api"
)

// The indenting writer prints what encoding/json.Indent prints for the
// whole document, however the document is cut into writes: strings with
// escaped quotes, brackets and commas inside them, empty objects and
// arrays, nesting.
func TestIndentWriterAsJSONIndent(t *testing.T) {
	doc := []byte(`{"a":[],"b":{},"c":[{"d":"x\"y]}{,:","e":[1,2,{"f":null}]},true],"g":"\\","h":{"i":{"j":[[]]}}}`)
	var want bytes.Buffer
	if err := json.Indent(&want, doc, "", "  "); err != nil {
		t.Fatal(err)
	}
	for _, cut := range []int{1, 2, 3, 7, len(doc)} {
		var got bytes.Buffer
		x := &indentWriter{w: &got}
		for i := 0; i < len(doc); i += cut {
			x.Write(doc[i:min(i+cut, len(doc))])
		}
		if got.String() != want.String() {
			t.Errorf("writes of %d bytes:\n%s\nwant\n%s", cut, got.String(), want.String())
		}
	}
}

// drawsift screen with a sweep streams its JSON: the same text as the
// buffered answer rendered, and the same error for a refused sweep.
func TestScreenSweepStreamedCLI(t *testing.T) {
	for _, body := range []string{
		`{"candidates": ["NaCl", "MgCl2", "KCl"], "sweep": {"variable": "temperature", "from": 10, "to": 40, "points": 4}}`,
		`{"sweep": {"variable": "concentration", "from": 0.1, "to": 2, "unit": "mol/L", "points": 1000}}`,
	} {
		var out, errb bytes.Buffer
		code := runOp(api.OpScreen, nil, strings.NewReader(body), &out, &errb)
		resp, e := api.Dispatch(context.Background(), api.OpScreen, []byte(body))
		var want bytes.Buffer
		wantCode := 0
		if e != nil {
			want.Write(resp)
			want.WriteByte('\n')
			wantCode = 2
		} else if err := render(&want, api.OpScreen, "json", resp); err != nil {
			t.Fatal(err)
		}
		if code != wantCode || out.String() != want.String() {
			t.Errorf("%s: exit %d (want %d), %d bytes printed, buffered %d; stderr %s", body, code, wantCode, out.Len(), want.Len(), errb.String())
		}
	}
}
