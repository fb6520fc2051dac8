package api

import (
	"context"
	"errors"
	"fmt"
	"strings"
	"testing"

	"drawsift/engine/library"
	"drawsift/engine/limits"
	"drawsift/engine/screen"
)

// list repeats one JSON element n times.
func list(elem string, n int) string {
	return "[" + strings.TrimSuffix(strings.Repeat(elem+",", n), ",") + "]"
}

// customs is n distinct minimal custom solutes.
func customs(n int) string {
	parts := make([]string, n)
	for i := range parts {
		parts[i] = fmt.Sprintf(`{"id":"C%d","molar_mass_g_per_mol":100,"diffusivity_m2_per_s":1e-9,"solubility_mol_per_kg":5}`, i)
	}
	return "[" + strings.Join(parts, ",") + "]"
}

// Every list a request may give is bounded by a Count range of
// engine/limits (issue #15 item 2: 11,000 custom solutes once reached
// 705 MB): one past the limit is refused on the list's field with the
// table's limit text, the limit itself is accepted.
func TestRequestListsBounded(t *testing.T) {
	blend := func(n int) string {
		return `{"id":"B","blend":` + list(`{"solute":"NaCl","mole_fraction":0.01}`, n) + `}`
	}
	for _, tc := range []struct {
		op, over, at string
		r            *limits.Range
		field        string
	}{
		{OpScreen, `{"custom_solutes":` + customs(101) + `}`, `{"candidates":["C0"],"custom_solutes":` + customs(100) + `}`, &limits.CustomSoluteCount, "custom_solutes"},
		{OpScreen, `{"candidates":` + list(`"NaCl"`, 201) + `}`, `{"candidates":` + list(`"NaCl"`, 200) + `}`, &limits.CandidateCount, "candidates"},
		{OpScreen, `{"candidates":["NaCl"],"orientations":` + list(`"AL-DS"`, 5) + `}`, `{"candidates":["NaCl"],"orientations":` + list(`"AL-DS"`, 4) + `}`, &limits.OrientationCount, "orientations"},
		{OpScreen, `{"candidates":["NaCl","KCl"],"pareto_objectives":` + list(`"water_flux"`, 17) + `}`, `{"candidates":["NaCl","KCl"],"pareto_objectives":` + list(`"water_flux"`, 16) + `}`, &limits.ParetoCount, "pareto_objectives"},
		{OpScreen, `{"candidates":["NaCl"],"feed":{"ions":` + list(`{"symbol":"Na+","charge":1,"molar_mass_g_per_mol":22.99,"mg_per_l":100}`, 33) + `}}`, "", &limits.FeedIonCount, "feed.ions"},
		{OpOsmotic, `{"mixture":` + list(`{"solute":"NaCl","concentration":0.01,"unit":"mol/kg"}`, 13) + `}`, "", &limits.MixtureParts, "mixture"},
		{OpScreen, `{"candidates":[` + blend(13) + `]}`, "", &limits.BlendParts, "candidates[0].blend"},
	} {
		_, e := Dispatch(context.Background(), tc.op, []byte(tc.over))
		if e == nil || e.Kind != KindInvalid || e.Field != tc.field || e.Limit != tc.r.Text() {
			t.Errorf("%s over its limit: %+v, want an invalid-input error on %s with limit %q", tc.field, e, tc.field, tc.r.Text())
			continue
		}
		if !strings.Contains(e.Message, tc.r.Text()) {
			t.Errorf("%s: message %q does not state %q", tc.field, e.Message, tc.r.Text())
		}
		if tc.at == "" {
			continue
		}
		if _, e := Dispatch(context.Background(), tc.op, []byte(tc.at)); e != nil {
			t.Errorf("%s at its limit: %v", tc.field, e)
		}
	}
}

// A sweep is bounded by candidates × orientations × points
// (screen.MaxSweepWork; issue #15 item 2: a 174-byte request once
// returned 22 MB): past it the error is on sweep.points and says how many
// points the scenario allows; at that many it runs.
func TestSweepWorkBudget(t *testing.T) {
	lib, _ := library.Default()
	n := len(lib.All()) // the whole library (the error states the count)
	sweep := func(points int) string {
		return fmt.Sprintf(`{"orientations":["AL-DS"],"sweep":{"variable":"concentration","from":0.1,"to":1,"points":%d,"unit":"mol/L"}}`, points)
	}
	_, e := Dispatch(context.Background(), OpScreen, []byte(sweep(1000)))
	allowed := screen.MaxSweepWork / (n * 2)
	want := fmt.Sprintf("≤ %d for %d candidates × 2 orientations", allowed, n)
	if e == nil || e.Field != "sweep.points" || !strings.Contains(fmt.Sprint(e.Limit), want) {
		t.Fatalf("a whole-library sweep of 1000 points in two orientations: %+v, want sweep.points with limit %q", e, want)
	}
	if _, e := Dispatch(context.Background(), OpScreen, []byte(sweep(allowed))); e != nil {
		t.Errorf("%d points (the allowed number): %v", allowed, e)
	}
}

// A cancelled context stops a screen, a sweep and a batch at the next
// check, whatever their size, with the context's error.
func TestCancelledStopsEveryLongLoop(t *testing.T) {
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	for _, tc := range []struct{ op, body string }{
		{OpScreen, `{}`},
		{OpScreen, `{"uncertainty":{"samples":1000}}`},
		{OpScreen, `{"sweep":{"variable":"temperature","from":10,"to":40,"points":100}}`},
		{OpBatch, list(batchOsm, 100)},
	} {
		if _, e := Dispatch(ctx, tc.op, []byte(tc.body)); e == nil || !strings.Contains(e.Message, "cancel") {
			t.Errorf("%s %.60s under a cancelled context: %+v, want a cancelled error", tc.op, tc.body, e)
		}
	}
	// Past a deadline the same stop is the timeout error.
	dctx := newExpiring()
	dctx.expire()
	if _, e := Dispatch(dctx, OpScreen, []byte(`{}`)); e == nil || e.Field != "deadline" || e.Kind != KindTimeout {
		t.Errorf("screen past its deadline: %+v, want field deadline, kind timeout", e)
	}
	if !errors.Is(dctx.Err(), context.DeadlineExceeded) {
		t.Fatal("the test context does not report its deadline")
	}
}
