package transport

import (
	"math"
	"strconv"
	"testing"

	"drawsift/engine/internal/reftable"
)

// TestSciPyCrossSolve compares Solve with an independent implementation of
// the same equations solved by scipy.optimize.brentq (testdata/flux_scipy.py;
// Python and SciPy versions in the CSV header): both orientations, with and
// without external CP, B = 0 to 2 LMH, two S, ΔP from −3 to 40 bar
// (reverse flow included), van 't Hoff and non-linear π, and pure-water,
// same-solute and different-solute feeds. Jw and the solute fluxes must
// agree to 1e-6 relative (the script's root is good to ~1e-15).
func TestSciPyCrossSolve(t *testing.T) {
	head, rows, err := reftable.Read("../../testdata/flux_scipy.csv")
	if err != nil {
		t.Fatal(err)
	}
	if len(rows) < 1000 {
		t.Fatalf("only %d rows", len(rows))
	}
	law := func(model string, nu float64) OsmoticFunc {
		if model == "linear" {
			return vantHoff(nu)
		}
		return nonlinear(nu)
	}
	worstJw, worstJs := 0.0, 0.0
	for n, row := range rows {
		num := func(col string) float64 {
			i, ok := head[col]
			if !ok {
				t.Fatalf("no column %q", col)
			}
			v, err := strconv.ParseFloat(row[i], 64)
			if err != nil {
				t.Fatalf("row %d %s: %v", n, col, err)
			}
			return v
		}
		ori, err := ParseOrientation(row[head["orientation"]])
		if err != nil {
			t.Fatal(err)
		}
		k := num("k_m_per_s")
		in := &Input{AMPerSPa: num("a_m_per_s_pa"), SM: num("s_m"), Orientation: ori, DeltaPPa: num("delta_p_pa"),
			KDrawMPerS: k, KFeedMPerS: k,
			Species: []Species{{DrawBulkMolPerM3: num("draw_c_mol_m3"), FeedBulkMolPerM3: num("feed_same_c_mol_m3"),
				BMPerS: num("draw_b_m_per_s"), DM2PerS: num("draw_d_m2_per_s"), Pi: law(row[head["draw_model"]], num("draw_nu"))}}}
		if row[head["feed_kind"]] == "other" {
			in.Species = append(in.Species, Species{FeedBulkMolPerM3: num("other_feed_c_mol_m3"),
				BMPerS: num("other_b_m_per_s"), DM2PerS: num("other_d_m2_per_s"), Pi: law(row[head["other_model"]], num("other_nu"))})
		}
		r, err := Solve(in)
		if err != nil {
			t.Fatalf("row %d: %v", n, err)
		}
		jw, js := num("jw_m_per_s"), num("js_mol_per_m2_s")
		// Fluxes that vanish (B = 0) are compared absolutely at a scale far
		// below any measurable flux.
		if !closeTo(r.JwMPerS, jw, 1e-6, 1e-15) {
			t.Errorf("row %d: Jw = %.10g, SciPy %.10g", n, r.JwMPerS, jw)
		}
		if !closeTo(r.JsMolPerM2S, js, 1e-6, 1e-15) {
			t.Errorf("row %d: Js = %.10g, SciPy %.10g", n, r.JsMolPerM2S, js)
		}
		if len(in.Species) == 2 {
			if no := num("n_other_mol_per_m2_s"); !closeTo(r.Species[1].FluxMolPerM2S, no, 1e-6, 1e-15) {
				t.Errorf("row %d: N_feed = %.10g, SciPy %.10g", n, r.Species[1].FluxMolPerM2S, no)
			}
		}
		worstJw = math.Max(worstJw, math.Abs(r.JwMPerS-jw)/math.Abs(jw))
		if js != 0 {
			worstJs = math.Max(worstJs, math.Abs(r.JsMolPerM2S-js)/math.Abs(js))
		}
	}
	t.Logf("%d rows: worst relative difference Jw %.2g, Js %.2g", len(rows), worstJw, worstJs)
}
