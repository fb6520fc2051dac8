package thermo

import (
	"fmt"
	"math"
	"strconv"

	"drawsift/engine/errs"
	"drawsift/engine/library"
	"drawsift/engine/warn"
	"drawsift/engine/water"
)

// State is every property of one solution at one concentration and
// temperature. All values are finite.
type State struct {
	MolalityMolPerKg     float64
	MolarityMolPerM3     float64
	MassFraction         float64
	OsmoticPressurePa    float64
	VantHoffPa           float64
	OsmoticCoefficient   float64
	WaterActivity        float64
	OsmolalityOsmolPerKg float64 // ν·m·φ
	LnGamma              float64 // ln γ±; valid when HasGamma
	HasGamma             bool
	DensityKgPerM3       float64
	ViscosityPaS         float64
	DiffusivityM2PerS    float64
	// SolubilityMolPerKg is +Inf for a miscible solute.
	SolubilityMolPerKg float64
	Warnings           []warn.Warning
}

// Evaluate prepares s at tK and returns its State at the given
// concentration. Errors (*errs.InputError) name the field: "concentration" for
// negative, non-finite or beyond-solubility values (the limit is given in
// the request's unit), "temperature_c" outside 0–100 °C. Between the
// model's data limit and the solubility the State carries a warning.
func Evaluate(s *library.Solute, conc float64, u Unit, tK float64) (State, error) {
	x, err := Prepared(s, tK)
	if err != nil {
		return State{}, err
	}
	m, err := x.ToMolality(conc, u)
	if err != nil {
		return State{}, err
	}
	return x.StateAt(m, u)
}

// StateAt returns the State at molality m; u is the unit used to express a
// solubility limit in an error.
func (x *Solution) StateAt(m float64, u Unit) (State, error) {
	if !(m >= 0) || math.IsInf(m, 0) {
		return State{}, &errs.InputError{Field: "concentration", Value: m, Limit: "≥ 0 and finite", Msg: "concentration must be a finite, non-negative number"}
	}
	if m > x.solMolal*(1+1e-9) {
		lim := x.FromMolality(x.solMolal, u)
		return State{}, &errs.InputError{Field: "concentration", Value: x.FromMolality(m, u),
			Limit: trimFloat(lim) + " " + u.String(),
			Msg:   fmt.Sprintf("%s is beyond its solubility at %s °C", x.Solute.ID, trimFloat(x.tC))}
	}
	st := State{MolalityMolPerKg: m, SolubilityMolPerKg: x.solMolal}
	st.Warnings = append(st.Warnings, x.Warnings...)
	if x.bridged(m) {
		st.Warnings = append(st.Warnings, x.bridgeWarning(m))
	} else if m > x.validMolal*(1+1e-9) {
		st.Warnings = append(st.Warnings, warn.New(warn.Extrapolated, x.Solute.ID, "%s: %s mol/kg is above the %s model's data limit of %s mol/kg (extrapolated)",
			x.Solute.ID, trimFloat(m), x.kind, trimFloat(x.validMolal)))
	}
	if x.kind == library.ModelSeawater && m > 0 && x.FromMolality(m, GPerKg) < 10 {
		st.Warnings = append(st.Warnings, warn.New(warn.Extrapolated, "seawater", "seawater: below 10 g/kg, the lower end of the Sharqawy et al. (2010) fit; accuracy about ±2.5 %%"))
	}
	st.MolarityMolPerM3 = x.molarityFromMolality(m)
	st.MassFraction = x.massFractionFromMolality(m)
	st.OsmoticPressurePa = x.OsmoticPressurePa(m)
	st.VantHoffPa = x.VantHoffPa(st.MolarityMolPerM3)
	st.OsmoticCoefficient = x.OsmoticCoefficient(m)
	if x.kind == library.ModelNone || x.kind == library.ModelTable || m > x.capMolal {
		// φ consistent with the reported π.
		if m > 0 {
			st.OsmoticCoefficient = st.OsmoticPressurePa / (x.piPerG * x.nu * m)
		}
	}
	st.OsmolalityOsmolPerKg = x.nu * m * st.OsmoticCoefficient
	st.WaterActivity = math.Exp(-st.OsmolalityOsmolPerKg * water.MolarMassKgPerMol)
	st.LnGamma, st.HasGamma = x.LnActivityCoefficient(m)
	st.DensityKgPerM3 = x.DensityKgPerM3(m)
	st.ViscosityPaS = x.ViscosityPaS(m)
	if w := x.viscosityWarning(st.MassFraction); w != "" {
		st.Warnings = append(st.Warnings, warn.Warning{Code: warn.Extrapolated, Subject: x.Solute.ID, Text: w})
	}
	st.DiffusivityM2PerS = x.DiffusivityM2PerS(m)
	for _, v := range []float64{st.OsmoticPressurePa, st.VantHoffPa, st.OsmoticCoefficient, st.WaterActivity,
		st.DensityKgPerM3, st.ViscosityPaS, st.DiffusivityM2PerS, st.MolarityMolPerM3, st.LnGamma} {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return State{}, &errs.InputError{Field: "concentration", Value: m, Msg: "the models give no finite result here"}
		}
	}
	return st, nil
}

// trimFloat formats v with 4 significant figures, no exponent for
// ordinary magnitudes.
func trimFloat(v float64) string {
	return strconv.FormatFloat(v, 'g', 4, 64)
}

// tempSpan says over which temperatures a fit holds, for notes: "20 °C"
// for a single temperature, else "10–50 °C", each end to 0.1 °C (a fit
// stated in kelvin, 293.15–323.15 K, reads 20–50 °C).
func tempSpan(lo, hi float64) string {
	c := func(v float64) string { return strconv.FormatFloat(math.Round(v*10)/10, 'f', -1, 64) }
	if c(lo) == c(hi) {
		return c(lo) + " °C only"
	}
	return c(lo) + "–" + c(hi) + " °C"
}
