package main

import (
	"bytes"
	"encoding/csv"
	"fmt"
	"strings"
	"testing"
)

// The demo screen renders as CSV with one row per candidate and a unit in
// every numeric header, and as a terminal table.
func TestScreenDemoCSVAndTable(t *testing.T) {
	var out, errb bytes.Buffer
	if code := run([]string{"screen", "--demo", "--format", "csv"}, strings.NewReader(""), &out, &errb); code != 0 {
		t.Fatalf("exit %d: %s %s", code, out.String(), errb.String())
	}
	r := csv.NewReader(&out)
	r.FieldsPerRecord = -1
	rows, err := r.ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	head := rows[0]
	for _, h := range head {
		if strings.Contains(h, "flux") || strings.Contains(h, "cost") || strings.Contains(h, "concentration") {
			if !strings.Contains(h, "(") {
				t.Errorf("header %q has no unit", h)
			}
		}
	}
	n := 0
	for _, row := range rows[1:] {
		if len(row) == len(head) {
			n++
		}
	}
	if n != 13 { // 13 candidates in the demo: ranked plus excluded
		t.Errorf("%d candidate rows, want 13", n)
	}
	if !strings.Contains(out.String(), "") || !bytes.Contains([]byte(strings.Join(rows[len(rows)-1], ",")), []byte("caution")) {
		t.Error("CSV lacks the cautions record")
	}
	out.Reset()
	if code := run([]string{"screen", "--demo", "--format", "table"}, strings.NewReader(""), &out, &errb); code != 0 {
		t.Fatalf("table exit %d", code)
	}
	if !strings.Contains(out.String(), "NaCl") || !strings.Contains(out.String(), "excluded:") {
		t.Errorf("table:\n%s", out.String())
	}
}

func TestScreenCLIError(t *testing.T) {
	var out, errb bytes.Buffer
	code := run([]string{"screen"}, strings.NewReader(`{"candidates": []}`), &out, &errb)
	if code != 2 || !strings.Contains(out.String(), `"field":"candidates"`) {
		t.Errorf("exit %d, out %s", code, out.String())
	}
}

// drawsift robustness-merge adds the parts of a split robustness run into
// the unsplit run's answer (the same JSON as drawsift screen prints), and
// its table is the screen's.
func TestCLIRobustnessMerge(t *testing.T) {
	req := func(shard string) string {
		return `{"feed": {"preset": "seawater"}, "candidates": ["NaCl", "MgCl2", "KCl"], "uncertainty": {"samples": 120` + shard + `}}`
	}
	code, whole, errOut := runCLI(t, req(""), "screen", "--format", "json")
	if code != 0 {
		t.Fatalf("screen: %d %s", code, errOut)
	}
	var parts []string
	for i := 0; i < 2; i++ {
		code, out, errOut := runCLI(t, req(fmt.Sprintf(`, "shard": {"index": %d, "count": 2}`, i)), "screen", "--format", "json")
		if code != 0 {
			t.Fatalf("part %d: %d %s", i, code, errOut)
		}
		parts = append(parts, out)
	}
	body := `{"parts": [` + parts[1] + `,` + parts[0] + `]}`
	code, merged, errOut := runCLI(t, body, "robustness-merge", "--format", "json")
	if code != 0 || merged != whole {
		t.Fatalf("robustness-merge: %d %s\n%s\nwant\n%s", code, errOut, merged, whole)
	}
	if code, out, _ := runCLI(t, body, "robustness-merge", "--format", "table"); code != 0 || !strings.Contains(out, "robustness: 120 Monte Carlo samples") {
		t.Errorf("table: %d\n%s", code, out)
	}
	if code, out, _ := runCLI(t, `{"parts": [`+parts[0]+`]}`, "robustness-merge"); code != 2 || !strings.Contains(out, `"field":"parts"`) {
		t.Errorf("one of two parts: %d %s", code, out)
	}
}
