package api

import (
	"math"

	"drawsift/engine/library"
	"drawsift/engine/scenario"
	"drawsift/engine/thermo"
	"drawsift/engine/warn"
)

// Concentration is how a concentration travels: a solute, a value and a unit.
type Concentration = scenario.Concentration

// OsmoticRequest asks for the osmotic properties of one solution.
type OsmoticRequest struct {
	Solute        string   `json:"solute"`
	Concentration *float64 `json:"concentration"`
	Unit          string   `json:"unit"`
	TemperatureC  *float64 `json:"temperature_c,omitempty"` // default 25 °C
	// AllowExtrapolation computes past the osmotic model's data (flagged);
	// default false: refused with the limit (scenario.CheckDataRange).
	AllowExtrapolation bool `json:"allow_extrapolation,omitempty"`
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
	// SolubilityMolPerKg is omitted for a miscible solute.
	SolubilityMolPerKg *float64 `json:"solubility_mol_per_kg,omitempty"`
	Warnings           []string `json:"warnings"`
	Sources            []Source `json:"sources"`
	EngineVersion      string   `json:"engine_version"`
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
}

var commonSources = []Source{
	{Field: "osmotic_pressure", Reference: "π = −(RT/V̄w)·ln aw, ln aw = −φ·ν·m·Mw (IUPAC Gold Book, osmotic coefficient)"},
	{Field: "water", Reference: "pure-water density, viscosity: engine/water (Kell 1975; IAPWS 2008 viscosity)"},
}

// Osmotic computes the osmotic properties of one solution.
func Osmotic(req *OsmoticRequest) (*OsmoticResponse, *Error) {
	s, err := scenario.LookupSolute("solute", req.Solute)
	if err != nil {
		return nil, fromEngine("", err)
	}
	tK, err := scenario.TemperatureK("temperature_c", req.TemperatureC)
	if err != nil {
		return nil, fromEngine("", err)
	}
	v, u, err := scenario.ParseConcentration("", req.Concentration, req.Unit)
	if err != nil {
		return nil, fromEngine("", err)
	}
	x, err := thermo.NewSolution(s, tK)
	if err != nil {
		return nil, fromEngine("", err)
	}
	m, err := x.ToMolality(v, u)
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
	return osmoticResponse(s, x, st, tK), nil
}

func osmoticResponse(s *library.Solute, x *thermo.Solution, st thermo.State, tK float64) *OsmoticResponse {
	r := &OsmoticResponse{
		Solute: s.ID, Name: s.Name, Model: s.Osmotic.Kind,
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
		Warnings:               warn.Strings(st.Warnings),
		EngineVersion:          EngineVersion,
	}
	if st.HasGamma {
		g := math.Exp(st.LnGamma)
		r.MeanActivityCoefficient = &g
	}
	if !math.IsInf(st.SolubilityMolPerKg, 0) {
		sol := st.SolubilityMolPerKg
		r.SolubilityMolPerKg = &sol
	}
	r.Sources = append(r.Sources, modelSources[s.Osmotic.Kind]...)
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
