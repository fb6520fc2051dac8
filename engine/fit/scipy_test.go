package fit

import (
	"encoding/csv"
	"os"
	"strconv"
	"testing"

	"drawsift/engine/scenario"
)

// TestSciPyLeastSquares fits the data sets of testdata/fit_scipy.csv and
// compares with an independent SciPy fit of the same data
// (scipy.optimize.least_squares on its own implementation of the flux
// equations; testdata/fit_scipy.py, versions in the CSV header): values
// to 1e-4 relative, standard errors to 5 % (issue 13's check).
func TestSciPyLeastSquares(t *testing.T) {
	fh, err := os.Open("../../testdata/fit_scipy.csv")
	if err != nil {
		t.Fatal(err)
	}
	defer fh.Close()
	rd := csv.NewReader(fh)
	rd.Comment = '#'
	recs, err := rd.ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	col := map[string]int{}
	for i, h := range recs[0] {
		col[h] = i
	}
	num := func(r []string, c string) float64 {
		v, err := strconv.ParseFloat(r[col[c]], 64)
		if err != nil {
			t.Fatalf("%s: %v", c, err)
		}
		return v
	}
	data := map[string][]Row{}
	want := map[string]map[string][2]float64{}
	var order []string
	for _, r := range recs[1:] {
		set := r[col["set"]]
		switch r[col["kind"]] {
		case "data":
			if data[set] == nil {
				order = append(order, set)
			}
			row := Row{Orientation: r[col["orientation"]], TemperatureC: ptr(25),
				Draw:       &scenario.Concentration{Solute: "NaCl", Concentration: ptr(num(r, "draw_mol_per_l")), Unit: "mol/L"},
				KDrawMPerS: ptr(num(r, "k_m_per_s")), KFeedMPerS: ptr(num(r, "k_m_per_s")), DiffusivityM2PerS: ptr(num(r, "d_m2_per_s")),
				WaterFluxLMH: ptr(num(r, "water_flux_lmh")), ReverseSoluteFluxGMH: ptr(num(r, "reverse_solute_flux_gmh"))}
			if c := num(r, "feed_mol_per_l"); c > 0 {
				row.Feed = &scenario.Concentration{Solute: "NaCl", Concentration: ptr(c), Unit: "mol/L"}
			}
			data[set] = append(data[set], row)
		case "fit":
			if want[set] == nil {
				want[set] = map[string][2]float64{}
			}
			want[set][r[col["parameter"]]] = [2]float64{num(r, "value"), num(r, "standard_error")}
		}
	}
	if len(order) < 2 {
		t.Fatalf("%d data sets", len(order))
	}
	for _, set := range order {
		res := runFit(t, &Spec{Data: data[set], OsmoticModel: "van-t-hoff"})
		for j, name := range ParamNames {
			w, e := want[set][name], res.Params[j]
			if !e.HasInterval {
				t.Fatalf("%s %s: no standard error", set, name)
			}
			if d := relErr(e.Value, w[0]); d > 1e-4 {
				t.Errorf("%s %s = %.8g, SciPy %.8g (rel %.2g)", set, name, e.Value, w[0], d)
			}
			if d := relErr(e.SE, w[1]); d > 0.05 {
				t.Errorf("%s SE(%s) = %.6g, SciPy %.6g (rel %.2g)", set, name, e.SE, w[1], d)
			}
			t.Logf("%s %s = %.8g ± %.4g (SciPy %.8g ± %.4g)", set, name, e.Value, e.SE, w[0], w[1])
		}
	}
}
