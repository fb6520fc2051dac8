package api

import (
	"bytes"
	"context"
	"testing"
)

// AppendDispatch writes the very bytes of Dispatch after what dst holds,
// answers and errors alike, whichever buffer it is given (common practice:
// one contract, one encoding).
func TestAppendDispatchSameBytes(t *testing.T) {
	for _, tc := range []struct{ op, body string }{
		{OpFlux, `{"membrane": {"preset": "tfc-standard"}, "orientation": "AL-FS", "draw": {"solute": "NaCl", "concentration": 1, "unit": "mol/L"}, "feed": {"preset": "seawater"}}`},
		{OpFlux, `{"membrane": {"preset": "tfc-standard"}, "orientation": "AL-DS", "draw": {"solute": "MgCl2", "concentration": 0.5, "unit": "mol/L"}}`},
		{OpOsmotic, `{"solute": "NaCl", "concentration": 2, "unit": "mol/kg"}`},
		{OpScreen, `{}`},
		{OpDefaults, ``},
		{OpSolutes, ``},
		{OpHealth, ``},
		{OpFlux, `{"draw": {"solute": "NaCl", "concentration": -1}}`},
		{OpFlux, `{"draw": `},
		{"no-such-op", `{}`},
	} {
		want, wantErr := Dispatch(context.Background(), tc.op, []byte(tc.body))
		for _, dst := range [][]byte{nil, []byte("kept"), make([]byte, 0, 8), make([]byte, 3, 1<<20)} {
			prefix := bytes.Clone(dst)
			got, gotErr := AppendDispatch(context.Background(), dst, tc.op, []byte(tc.body), nil)
			if !bytes.Equal(got[:len(prefix)], prefix) {
				t.Fatalf("%s %s: the buffer's first %d bytes were not kept", tc.op, tc.body, len(prefix))
			}
			if !bytes.Equal(got[len(prefix):], want) {
				t.Fatalf("%s %s: AppendDispatch wrote\n%.300s\nDispatch wrote\n%.300s", tc.op, tc.body, got[len(prefix):], want)
			}
			if (gotErr == nil) != (wantErr == nil) || gotErr != nil && *gotErr != *wantErr {
				t.Fatalf("%s %s: error %v, Dispatch's %v", tc.op, tc.body, gotErr, wantErr)
			}
		}
	}
}
