package api

import (
	"bytes"
	"context"
	"encoding/json"
	"fmt"
	"strings"
	"testing"
)

// shardBody is a robustness screen (seawater feed, 8 candidates, 301
// samples) as one request or as part index of count.
func shardBody(index, count int) string {
	shard := ""
	if count > 0 {
		shard = fmt.Sprintf(`, "shard": {"index": %d, "count": %d}`, index, count)
	}
	return `{"feed": {"preset": "seawater"}, "candidates": ["NaCl","MgCl2","KCl","CaCl2","Na2SO4","NH4Cl","glucose","MgSO4"],
		"basis": {"kind": "osmotic-pressure", "multiple_of_feed": 2}, "uncertainty": {"samples": 301` + shard + `}, "seed": 11}`
}

func dispatchBytes(t *testing.T, op, body string) []byte {
	t.Helper()
	out, e := Dispatch(context.Background(), op, []byte(body))
	if e != nil {
		t.Fatalf("%s: %v", op, e)
	}
	return out
}

// The parts of a split robustness run, merged in any order, give the
// bytes of the unsplit run's answer (the counts add; the figures follow
// from the counts alone).
func TestRobustnessMergeIdentical(t *testing.T) {
	whole := dispatchBytes(t, OpScreen, shardBody(0, 0))
	for _, count := range []int{2, 3} {
		parts := make([]json.RawMessage, count)
		for i := range parts {
			parts[i] = dispatchBytes(t, OpScreen, shardBody(i, count))
		}
		// Reversed order: the merge does not depend on it.
		for i, j := 0, len(parts)-1; i < j; i, j = i+1, j-1 {
			parts[i], parts[j] = parts[j], parts[i]
		}
		body, _ := json.Marshal(map[string]any{"parts": parts})
		got := dispatchBytes(t, OpRobustnessMerge, string(body))
		if !bytes.Equal(got, whole) {
			t.Errorf("%d parts merged differ from the whole run:\n%s\nwant\n%s", count, got, whole)
		}
	}
	var r ScreenResponse
	if err := json.Unmarshal(whole, &r); err != nil {
		t.Fatal(err)
	}
	for _, c := range r.Candidates {
		sum := 0
		for _, n := range c.Robustness.RankCounts {
			sum += n
		}
		if len(c.Robustness.RankCounts) != len(r.Candidates)+1 || sum != 301 {
			t.Errorf("%s: rank counts %v, want %d entries adding to 301", c.Solute, c.Robustness.RankCounts, len(r.Candidates)+1)
		}
	}
}

// A merge of parts that are not every part of one run, each once, is
// refused naming the part.
func TestRobustnessMergeRefused(t *testing.T) {
	p0 := dispatchBytes(t, OpScreen, shardBody(0, 2))
	p1 := dispatchBytes(t, OpScreen, shardBody(1, 2))
	whole := dispatchBytes(t, OpScreen, shardBody(0, 0))
	other := dispatchBytes(t, OpScreen, strings.Replace(shardBody(1, 2), `"seed": 11`, `"seed": 12`, 1))
	var edited ScreenResponse
	if err := json.Unmarshal(p1, &edited); err != nil {
		t.Fatal(err)
	}
	edited.Candidates[2].Robustness.RankCounts[0]++ // counts that no longer add to the part's samples
	bumped, _ := json.Marshal(&edited)
	for _, tc := range []struct {
		name  string
		parts []json.RawMessage
		field string
	}{
		{"counts edited", []json.RawMessage{p0, bumped}, "parts[1].candidates[2].robustness.rank_counts"},
		{"none", nil, "parts"},
		{"one of two", []json.RawMessage{p0}, "parts"},
		{"twice the same", []json.RawMessage{p0, p0}, "parts[1].robustness.shard.index"},
		{"not split", []json.RawMessage{whole, p1}, "parts[0].robustness.shard"},
		{"another run", []json.RawMessage{p0, other}, "parts[1]"},
	} {
		body, _ := json.Marshal(map[string]any{"parts": tc.parts})
		out, e := Dispatch(context.Background(), OpRobustnessMerge, body)
		if e == nil || e.Kind != KindInvalid || e.Field != tc.field {
			t.Errorf("%s: %v (%s), want an error on %s", tc.name, e, out, tc.field)
		}
	}
}
