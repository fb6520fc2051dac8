package api

import (
	"bytes"
	"context"
	"errors"
	"math"
	"runtime"
	"strings"
	"testing"

	"drawsift/engine/internal/jsonx"
)

// TestScreenStreamSameBytes: the streamed screen is byte for byte the
// answer Dispatch gives, for every sweep variable, with one candidate and
// with more candidates than a block, and without a sweep; an error found
// before the answer starts is Dispatch's error, with nothing written.
func TestScreenStreamSameBytes(t *testing.T) {
	for _, body := range []string{
		`{"candidates": ["NaCl", "MgCl2", "KCl", "Na2SO4", "glucose"], "orientations": ["AL-DS"], "sweep": {"variable": "concentration", "from": 0.1, "to": 2, "unit": "mol/L", "points": 7}}`,
		`{"feed": {"preset": "seawater"}, "candidates": ["NaCl", "MgCl2", "CaCl2"], "sweep": {"variable": "temperature", "from": 10, "to": 40, "points": 4}}`,
		`{"candidates": ["NaCl"], "sweep": {"variable": "s", "from": 100, "to": 900, "points": 5}}`,
		`{"candidates": ["NaCl", "KCl", "MgSO4"], "sweep": {"variable": "crossflow", "from": 0.05, "to": 0.5, "points": 3}}`,
		`{"candidates": ["NaCl", "KCl"]}`,
		`{"feed": {"preset": "seawater"}, "candidates": ["NaCl", "MgCl2"], "basis": {"kind": "system"}, "sweep": {"variable": "concentration", "from": 0.5, "to": 2, "unit": "mol/L", "points": 3}}`,
	} {
		want, e := Dispatch(context.Background(), OpScreen, []byte(body))
		if e != nil {
			t.Fatalf("%s: %s", body, e.Message)
		}
		var buf bytes.Buffer
		started, e := ScreenStream(context.Background(), []byte(body), &buf, nil)
		if e != nil || !started {
			t.Fatalf("%s: started %v, %v", body, started, e)
		}
		if !bytes.Equal(buf.Bytes(), want) {
			i := 0
			for i < len(want) && i < buf.Len() && want[i] == buf.Bytes()[i] {
				i++
			}
			t.Errorf("%s: streamed %d bytes, Dispatch %d; first difference at %d: %.80q vs %.80q", body, buf.Len(), len(want), i, buf.Bytes()[i:], want[i:])
		}
	}
	for _, body := range []string{
		`{"sweep": {"variable": "concentration", "from": 0.1, "to": 2, "unit": "mol/L", "points": 1000}}`, // past the work budget
		`{"candidates": ["NaCl"], "sweep": {"variable": "temperature", "from": 10, "to": 140, "points": 4}}`,
		`{"candidates": ["NaCl"], "sweep": {"variable": "depth", "from": 1, "to": 2, "points": 4}}`,
		`{"candidates": ["NoSuchSalt"]}`,
	} {
		_, want := Dispatch(context.Background(), OpScreen, []byte(body))
		var buf bytes.Buffer
		started, e := ScreenStream(context.Background(), []byte(body), &buf, nil)
		if want == nil || e == nil || started || buf.Len() > 0 || e.Field != want.Field || e.Message != want.Message {
			t.Errorf("%s: streamed started %v, %d bytes, %v; Dispatch %v", body, started, buf.Len(), e, want)
		}
	}
}

// A writer that fails ends the stream with the write error.
func TestScreenStreamWriteError(t *testing.T) {
	body := `{"candidates": ["NaCl", "MgCl2", "KCl"], "sweep": {"variable": "concentration", "from": 0.1, "to": 2, "unit": "mol/L", "points": 5}}`
	started, e := ScreenStream(context.Background(), []byte(body), failWriter{}, nil)
	if !started || e == nil || e.Field != "sweep" {
		t.Errorf("started %v, error %v", started, e)
	}
}

type failWriter struct{}

func (failWriter) Write([]byte) (int, error) { return 0, errors.New("gone") }

// A request cancelled once the answer has started is still a complete
// answer: the blocks not yet computed carry the reason at every point.
func TestScreenStreamCancelledMidway(t *testing.T) {
	body := `{"candidates": ["NaCl", "MgCl2", "KCl", "Na2SO4", "CaCl2"], "orientations": ["AL-FS"], "sweep": {"variable": "concentration", "from": 0.1, "to": 2, "unit": "mol/L", "points": 4}}`
	ctx, cancel := context.WithCancel(context.Background())
	defer cancel()
	w := &cancelWriter{cancel: cancel}
	started, e := ScreenStream(WithCores(ctx, 2), []byte(body), w, nil)
	if !started || e != nil {
		t.Fatalf("started %v, %v", started, e)
	}
	var r ScreenResponse
	if err := jsonx.Unmarshal(w.buf.Bytes(), &r); err != nil {
		t.Fatalf("not JSON: %v", err)
	}
	if len(r.Sweep) != 5 {
		t.Fatalf("%d series", len(r.Sweep))
	}
	// The first block (one candidate a core, at most the 2 of WithCores)
	// is computed before the first write.
	block := min(runtime.GOMAXPROCS(0), 2)
	for i, s := range r.Sweep {
		computed := s.Points[0].WaterFluxLMH != nil
		if i < block && !computed || i >= block && (computed || !strings.HasPrefix(s.Points[0].Reason, "not computed: ")) || len(s.Points) != 4 || math.Abs(s.Points[3].X-2) > 1e-12 {
			t.Errorf("series %d (%s): %+v", i, s.Solute, s.Points[0])
		}
	}
}

// cancelWriter cancels the request on the first write.
type cancelWriter struct {
	buf    bytes.Buffer
	cancel func()
}

func (c *cancelWriter) Write(p []byte) (int, error) {
	c.cancel()
	return c.buf.Write(p)
}
