package main

import (
	"bytes"
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// TestCLIFitCSV: drawsift fit --csv reads the measurements from a CSV file
// (units in the header), takes its options from -f, and a bad cell is the
// contract's error naming the row and field, exit status 2. The data are
// the published mesh-TFC points (Membranes 11(2):153 (2021), Appendix C).
func TestCLIFitCSV(t *testing.T) {
	dir := t.TempDir()
	csv := filepath.Join(dir, "data.csv")
	os.WriteFile(csv, []byte("orientation;draw_solute;draw_concentration (M);feed_solute;feed_concentration (mmol/L);temperature_c;water_flux_lmh;reverse_solute_flux_gmh\n"+
		"AL-DS;NaCl;0,5;NaCl;10;25;15,82;4,54\nAL-FS;NaCl;0,5;NaCl;10;25;8,51;2,74\nAL-DS;NaCl;2;NaCl;500;25;8,07;\nAL-FS;NaCl;2;NaCl;500;25;7,35;\n"), 0o644)
	opts := filepath.Join(dir, "opts.json")
	os.WriteFile(opts, []byte(`{"external_cp": false, "parameters": ["a", "b", "s"]}`), 0o644)
	var out, errb bytes.Buffer
	if code := run([]string{"fit", "--csv", csv, "-f", opts}, strings.NewReader(""), &out, &errb); code != 0 {
		t.Fatalf("exit %d: %s %s", code, out.String(), errb.String())
	}
	var resp struct {
		S struct {
			Value float64 `json:"value"`
		} `json:"s_um"`
		Membrane map[string]float64 `json:"membrane"`
	}
	if err := json.Unmarshal(out.Bytes(), &resp); err != nil {
		t.Fatal(err)
	}
	if !(resp.S.Value > 500 && resp.S.Value < 2000) || resp.Membrane["s_um"] != resp.S.Value {
		t.Errorf("S = %g, membrane %v", resp.S.Value, resp.Membrane)
	}
	// A table export works too.
	out.Reset()
	if code := run([]string{"fit", "--csv", csv, "-f", opts, "--format", "table"}, strings.NewReader(""), &out, &errb); code != 0 || !strings.Contains(out.String(), "a_lmh_per_bar.value") {
		t.Errorf("table: exit %d: %s", code, out.String())
	}
	os.WriteFile(csv, []byte("orientation,draw_solute,draw_concentration_mol_per_l,water_flux_lmh\nAL-FS,NaCl,0.5,8.5\nAL-FS,NaCl,1,abc\n"), 0o644)
	out.Reset()
	if code := run([]string{"fit", "--csv", csv}, strings.NewReader(""), &out, &errb); code != 2 || !strings.Contains(out.String(), `"field":"data[1].water_flux_lmh"`) {
		t.Errorf("bad cell: exit %d: %s", code, out.String())
	}
}
