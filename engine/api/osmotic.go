package api

import (
	"math"

	"drawsift/engine/limits"

	"drawsift/engine/library"
	"drawsift/engine/scenario"
	"drawsift/engine/thermo"
	"drawsift/engine/warn"
)

// Concentration is how a concentration travels: a solute, a value and a unit.
type Concentration = scenario.Concentration

// OsmoticRequest asks for the osmotic properties of one solution: a
// solute at a concentration, or a mixture of parts each at its own
// concentration.
type OsmoticRequest struct {
	Solute        string        `json:"solute,omitempty"`
	Concentration *float64      `json:"concentration,omitempty"`
	Unit          string        `json:"unit,omitempty"`
	Mixture       []MixturePart `json:"mixture,omitempty"`
	// Blend takes the solute's place: parts at fixed fractions at the total
	// concentration given; ID names it.
	ID           string      `json:"id,omitempty"`
	Blend        []BlendPart `json:"blend,omitempty"`
	TemperatureC *float64    `json:"temperature_c,omitempty"` // default 25 °C
	// PH speciates the carbonate system when the solution holds HCO3- or
	// CO3-2 (omitted: the composition's own pH, or a closed system).
	PH *float64 `json:"ph,omitempty"`
	// AllowExtrapolation computes past the osmotic model's data (flagged);
	// default false: refused with the limit (scenario.CheckDataRange).
	AllowExtrapolation bool `json:"allow_extrapolation,omitempty"`
}

// IonResult is one ion of the solution.
type IonResult struct {
	Ion              string  `json:"ion"`
	Charge           int     `json:"charge"`
	MolalityMolPerKg float64 `json:"molality_mol_per_kg"`
	// ActivityCoefficient is the single-ion γ of the Pitzer equations
	// (null where the solute's model gives none).
	ActivityCoefficient *float64 `json:"activity_coefficient"`
}

// ComponentResult is one part of a blend in the solution.
type ComponentResult struct {
	Solute                 string  `json:"solute"`
	MoleFraction           float64 `json:"mole_fraction"`
	MolalityMolPerKg       float64 `json:"molality_mol_per_kg"`
	MolarityMolPerL        float64 `json:"molarity_mol_per_l"`
	MassConcentrationGPerL float64 `json:"mass_concentration_g_per_l"`
}

// OsmoticResponse holds every property of the solution.
type OsmoticResponse struct {
	Solute                  string   `json:"solute"`
	Name                    string   `json:"name"`
	Model                   string   `json:"model"`
	TemperatureC            float64  `json:"temperature_c"`
	OsmoticPressureBar      float64  `json:"osmotic_pressure_bar"`
	VantHoffBar             float64  `json:"van_t_hoff_bar"`
	OsmoticCoefficient      float64  `json:"osmotic_coefficient"`
	WaterActivity           float64  `json:"water_activity"`
	MeanActivityCoefficient *float64 `json:"mean_activity_coefficient,omitempty"`
	MolalityMolPerKg        float64  `json:"molality_mol_per_kg"`
	MolarityMolPerL         float64  `json:"molarity_mol_per_l"`
	MassConcentrationGPerL  float64  `json:"mass_concentration_g_per_l"`
	MassFractionPercent     float64  `json:"mass_fraction_wt_percent"`
	OsmolalityOsmolPerKg    float64  `json:"osmolality_osmol_per_kg"`
	DensityKgPerM3          float64  `json:"density_kg_per_m3"`
	ViscosityMPaS           float64  `json:"viscosity_mpa_s"`
	DiffusivityM2PerS       float64  `json:"diffusivity_m2_per_s"`
	VantHoffFactor          float64  `json:"van_t_hoff_factor"`
	// Ion-level results: every ion with its molality and activity
	// coefficient, the ionic strength, and log10(IAP/Ksp) of each mineral
	// whose ions are present, keyed by lower-case mineral name.
	IonicStrengthMolPerKg float64 `json:"ionic_strength_mol_per_kg"`
	// PH of the carbonate system where the solution holds carbonate (the
	// request's, the composition's, or the closed system's).
	PH                *float64           `json:"ph,omitempty"`
	Ions              []IonResult        `json:"ions"`
	SaturationIndices map[string]float64 `json:"saturation_indices"`
	// Components lists a blend's parts (omitted for a single solute).
	Components []ComponentResult `json:"components,omitempty"`
	// SolubilityMolPerKg is omitted for a miscible solute.
	SolubilityMolPerKg *float64 `json:"solubility_mol_per_kg,omitempty"`
	Warnings           []string `json:"warnings"`
	Sources            []Source `json:"sources"`
	// Cautions are the usual ones (ScreenCautions), with every answer.
	Cautions      []string `json:"cautions"`
	EngineVersion string   `json:"engine_version"`
}

// modelSources names the published sources of each model kind.
var modelSources = map[string][]Source{
	library.ModelPitzer: {
		{Field: "model", Reference: "Pitzer (1973) J. Phys. Chem. 77:268; Pitzer & Mayorga (1973) J. Phys. Chem. 77:2300; Pitzer (1991) Activity Coefficients in Electrolyte Solutions, ch. 3"},
		{Field: "model.A_phi", Reference: "Møller (1988) Geochim. Cosmochim. Acta 52:821, eq. 13"},
	},
	library.ModelSeawater: {{Field: "model", Reference: "Sharqawy, Lienhard & Zubair (2010) Desalination and Water Treatment 16:354 (osmotic coefficient, density, viscosity)"}},
	library.ModelNorrish:  {{Field: "model", Reference: "Norrish (1966) J. Food Technol. 1:25 (a_w = x_w exp(−K x_s²))"}},
	library.ModelTable:    {{Field: "model", Reference: "measured osmotic-pressure table, monotone cubic interpolation (Fritsch & Butland 1984)"}},
	library.ModelNone:     {{Field: "model", Reference: "van 't Hoff (1887): no trustworthy non-ideal model for this solute"}},
	thermo.PathPitzerMixture: {
		{Field: "model", Reference: "Harvie, Møller & Weare (1984) Geochim. Cosmochim. Acta 48:723 (mixed-electrolyte Pitzer model); Pitzer (1991) Activity Coefficients in Electrolyte Solutions, ch. 3; Pitzer (1975) J. Solution Chem. 4:249 (unsymmetrical mixing)"},
		{Field: "model.A_phi", Reference: "Møller (1988) Geochim. Cosmochim. Acta 52:821, eq. 13"},
	},
	thermo.PathZSR: {{Field: "model", Reference: "Zdanovskii–Stokes–Robinson rule: Stokes & Robinson (1966) J. Phys. Chem. 70:2126, over the parts' binary models"}},
}

var commonSources = []Source{
	{Field: "osmotic_pressure", Reference: "π = −(RT/V̄w)·ln aw, ln aw = −φ·ν·m·Mw (IUPAC Gold Book, osmotic coefficient)"},
	{Field: "water", Reference: "pure-water density, viscosity: engine/water (Kell 1975; IAPWS 2008 viscosity)"},
}

// Osmotic computes the osmotic properties of one solution.
func Osmotic(req *OsmoticRequest) (*OsmoticResponse, *Error) {
	tK, err := scenario.TemperatureK("temperature_c", req.TemperatureC)
	if err != nil {
		return nil, fromEngine("", err)
	}
	x, m, u, err := osmoticSolution(req, tK)
	if err != nil {
		return nil, fromEngine("", err)
	}
	st, err := x.StateAt(m, u)
	if err != nil {
		return nil, fromEngine("", err)
	}
	if err := scenario.CheckDataRange("", x, m, u, req.AllowExtrapolation); err != nil {
		return nil, fromEngine("", err)
	}
	pH := math.NaN()
	if req.PH != nil {
		if err := limits.FeedPH.CheckAt("ph", *req.PH); err != nil {
			return nil, fromEngine("", err)
		}
		pH = *req.PH
	}
	ionic, err := x.IonsAt(m, pH)
	if err != nil {
		return nil, fromEngine("", err)
	}
	return osmoticResponse(x.Solute, x, st, ionic, tK), nil
}

// osmoticSolution prepares the request's solution: a solute or a blend at
// a concentration, or a mixture.
func osmoticSolution(req *OsmoticRequest, tK float64) (*thermo.Solution, float64, thermo.Unit, error) {
	return scenario.PrepareSolution("", &Concentration{Solute: req.Solute, Concentration: req.Concentration, Unit: req.Unit,
		Mixture: req.Mixture, ID: req.ID, Blend: req.Blend}, tK)
}

// modelName is the response's model: the osmotic path of a mixture, else
// the solute's model kind.
func modelName(x *thermo.Solution) string {
	if p := x.MixturePath(); p != "" {
		return p
	}
	return x.Kind()
}

func osmoticResponse(s *library.Solute, x *thermo.Solution, st thermo.State, ionic thermo.IonicState, tK float64) *OsmoticResponse {
	r := &OsmoticResponse{
		Solute: s.ID, Name: s.Name, Model: modelName(x),
		TemperatureC:           tK - thermo.ZeroCelsiusK,
		OsmoticPressureBar:     st.OsmoticPressurePa / thermo.PascalPerBar,
		VantHoffBar:            st.VantHoffPa / thermo.PascalPerBar,
		OsmoticCoefficient:     st.OsmoticCoefficient,
		WaterActivity:          st.WaterActivity,
		MolalityMolPerKg:       st.MolalityMolPerKg,
		MolarityMolPerL:        st.MolarityMolPerM3 / 1000,
		MassConcentrationGPerL: st.MolarityMolPerM3 * x.MolarMassKgPerMol(),
		MassFractionPercent:    100 * st.MassFraction,
		OsmolalityOsmolPerKg:   st.OsmolalityOsmolPerKg,
		DensityKgPerM3:         st.DensityKgPerM3,
		ViscosityMPaS:          st.ViscosityPaS * thermo.MPaSPerPaS,
		DiffusivityM2PerS:      st.DiffusivityM2PerS,
		VantHoffFactor:         x.Nu(),
		Warnings:               warn.Strings(append(st.Warnings, ionic.Warnings...)),
		EngineVersion:          EngineVersion,
		Cautions:               ScreenCautions,
		IonicStrengthMolPerKg:  ionic.IonicStrengthMolPerKg,
		Ions:                   []IonResult{},
		SaturationIndices:      map[string]float64{},
	}
	for _, ion := range ionic.Ions {
		ir := IonResult{Ion: ion.Symbol, Charge: ion.Charge, MolalityMolPerKg: ion.MolalityMolPerKg}
		if ion.HasGamma {
			g := math.Exp(ion.LnGamma)
			ir.ActivityCoefficient = &g
		}
		r.Ions = append(r.Ions, ir)
	}
	if ionic.HasPH {
		ph := ionic.PH
		r.PH = &ph
	}
	for _, sat := range ionic.Saturation {
		r.SaturationIndices[sat.Mineral] = sat.SI
	}
	parts, fr := x.Parts()
	for k, p := range parts {
		mk := fr[k] * st.MolalityMolPerKg
		ck := fr[k] * st.MolarityMolPerM3 / 1000
		r.Components = append(r.Components, ComponentResult{Solute: p.Solute.ID, MoleFraction: fr[k], MolalityMolPerKg: mk,
			MolarityMolPerL: ck, MassConcentrationGPerL: ck * p.Solute.MolarMassGPerMol})
	}
	if st.HasGamma {
		g := math.Exp(st.LnGamma)
		r.MeanActivityCoefficient = &g
	}
	if !math.IsInf(st.SolubilityMolPerKg, 0) {
		sol := st.SolubilityMolPerKg
		r.SolubilityMolPerKg = &sol
	}
	r.Sources = append(r.Sources, modelSources[r.Model]...)
	for _, p := range parts {
		r.Sources = append(r.Sources, soluteSources(p.Solute)...)
	}
	r.Sources = append(r.Sources, commonSources...)
	r.Sources = append(r.Sources, soluteSources(s)...)
	return r
}

// SolutesResponse lists the library with its sources.
type SolutesResponse struct {
	Solutes       []*library.Solute `json:"solutes"`
	EngineVersion string            `json:"engine_version"`
}

// Solutes returns the embedded solute library.
func Solutes() (*SolutesResponse, *Error) {
	lib, err := library.Default()
	if err != nil {
		return nil, &Error{Message: "internal error: solute library", Kind: KindInternal}
	}
	return &SolutesResponse{Solutes: lib.All(), EngineVersion: EngineVersion}, nil
}

// PresetsResponse lists the membrane and feed presets with their sources.
type PresetsResponse struct {
	Membranes     []*library.Membrane `json:"membranes"`
	Feeds         []*library.Feed     `json:"feeds"`
	EngineVersion string              `json:"engine_version"`
}

// Presets returns the embedded membrane and feed presets.
func Presets() (*PresetsResponse, *Error) {
	ms, err := library.Membranes()
	if err != nil {
		return nil, &Error{Message: "internal error", Kind: KindInternal, detail: "membrane presets: " + err.Error()}
	}
	fs, err := library.Feeds()
	if err != nil {
		return nil, &Error{Message: "internal error", Kind: KindInternal, detail: "feed presets: " + err.Error()}
	}
	return &PresetsResponse{Membranes: ms, Feeds: fs, EngineVersion: EngineVersion}, nil
}
