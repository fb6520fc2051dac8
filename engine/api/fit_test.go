//go:build !nofit

package api

import (
	"context"
	"encoding/json"
	"strings"
	"testing"
)

// The published mesh-TFC points (Membranes 11(2):153 (2021), Appendix C),
// as a JSON fit request.
const fitBody = `{"data": [
 {"orientation": "AL-DS", "draw": {"solute": "NaCl", "concentration": 0.5, "unit": "mol/L"}, "feed": {"solute": "NaCl", "concentration": 10, "unit": "mmol/L"}, "temperature_c": 25, "water_flux_lmh": 15.82, "reverse_solute_flux_gmh": 4.54},
 {"orientation": "AL-FS", "draw": {"solute": "NaCl", "concentration": 0.5, "unit": "mol/L"}, "feed": {"solute": "NaCl", "concentration": 10, "unit": "mmol/L"}, "temperature_c": 25, "water_flux_lmh": 8.51, "reverse_solute_flux_gmh": 2.74},
 {"orientation": "AL-DS", "draw": {"solute": "NaCl", "concentration": 2, "unit": "mol/L"}, "feed": {"solute": "NaCl", "concentration": 0.5, "unit": "mol/L"}, "temperature_c": 25, "water_flux_lmh": 8.07},
 {"orientation": "AL-FS", "draw": {"solute": "NaCl", "concentration": 2, "unit": "mol/L"}, "feed": {"solute": "NaCl", "concentration": 0.5, "unit": "mol/L"}, "temperature_c": 25, "water_flux_lmh": 7.35}],
 "external_cp": false, "confidence": 0.95}`

// TestFitOperation: the fit operation through Dispatch answers with the
// contract's names, and its membrane object is a valid flux request's
// membrane that reproduces the fitted fluxes (Membranes 2021 data).
func TestFitOperation(t *testing.T) {
	out, e := Dispatch(context.Background(), OpFit, []byte(fitBody))
	if e != nil {
		t.Fatal(e)
	}
	var resp map[string]any
	if err := json.Unmarshal(out, &resp); err != nil {
		t.Fatal(err)
	}
	for _, k := range []string{"a_lmh_per_bar", "b_lmh", "s_um"} {
		est, ok := resp[k].(map[string]any)
		if !ok {
			t.Fatalf("no %s", k)
		}
		for _, f := range []string{"value", "ci_low", "ci_high", "standard_error"} {
			if _, ok := est[f].(float64); !ok {
				t.Errorf("%s.%s missing", k, f)
			}
		}
	}
	for _, k := range []string{"correlation", "residuals", "warnings", "solver", "membrane", "goodness_of_fit"} {
		if resp[k] == nil {
			t.Errorf("no %s", k)
		}
	}
	var fr FitResponse
	if err := json.Unmarshal(out, &fr); err != nil {
		t.Fatal(err)
	}
	// The membrane object drives the flux operation to the fitted flux.
	mem, _ := json.Marshal(fr.Membrane)
	flux := `{"membrane": ` + string(mem) + `, "orientation": "AL-DS", "external_cp": false, "temperature_c": 25,
	  "draw": {"solute": "NaCl", "concentration": 0.5, "unit": "mol/L"}, "feed": {"solute": "NaCl", "concentration": 10, "unit": "mmol/L"}}`
	fo, fe := Dispatch(context.Background(), OpFlux, []byte(flux))
	if fe != nil {
		t.Fatal(fe)
	}
	var f FluxResponse
	json.Unmarshal(fo, &f)
	if got, want := f.WaterFluxLMH, fr.Residuals[0].WaterFluxLMH.Fitted; !(abs(got-want) < 1e-9*want) {
		t.Errorf("flux with the fitted membrane %.10g, fit says %.10g", got, want)
	}
	// A fixed parameter is reported as fixed, without an interval.
	out, e = Dispatch(context.Background(), OpFit, []byte(strings.Replace(fitBody, `"confidence": 0.95`, `"parameters": ["s"], "membrane": {"a_lmh_per_bar": 2.56, "b_lmh": 0.63}`, 1)))
	if e != nil {
		t.Fatal(e)
	}
	var fixed FitResponse
	json.Unmarshal(out, &fixed)
	if !fixed.ALMHPerBar.Fixed || fixed.ALMHPerBar.CILow != nil || fixed.SUM.CILow == nil {
		t.Errorf("fixed A reported as %+v, S as %+v", fixed.ALMHPerBar, fixed.SUM)
	}
}

func abs(x float64) float64 {
	if x < 0 {
		return -x
	}
	return x
}

// TestFitErrors: bad input names the row and field in the contract's
// error (issue 13).
func TestFitErrors(t *testing.T) {
	for body, field := range map[string]string{
		strings.Replace(fitBody, `"water_flux_lmh": 7.35`, `"water_flux_lmh": -7.35`, 1):                     "data[3].water_flux_lmh",
		strings.Replace(fitBody, `"water_flux_lmh": 8.07`, `"water_flux_lmh": 8.07, "water_flux": 1`, 1):     "data[2].water_flux",
		`{"data": [], "csv": "orientation,draw_solute\n"}`:                                                   "csv",
		`{"csv": "orientation,draw_solute,draw_concentration_mol_per_l,water_flux_lmh\nAL-FS,NaCl,0.5,x\n"}`: "data[0].water_flux_lmh",
	} {
		out, e := Dispatch(context.Background(), OpFit, []byte(body))
		if e == nil || e.Field != field || e.Kind != KindInvalid {
			t.Errorf("%s: error %v, want field %s", body[:min(60, len(body))], e, field)
		}
		if strings.Contains(string(out), "NaN") || strings.Contains(string(out), "Inf") {
			t.Errorf("non-finite in %s", out)
		}
	}
}
