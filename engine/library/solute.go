// Package library holds Drawsift's solute, membrane and feed records: their
// types, the embedded data set, validation and look-up by ID or alias.
//
// Every number in a record carries its provenance in the record's Sources
// map: a key names a field path (for example "osmotic_model" or
// "solubility") and covers every number below it; the value is the
// published source, "common practice" or "from memory".
package library

import (
	"math"
	"strings"
)

// zeroCelsiusK is 0 °C in kelvin (exact, by the definition of the
// Celsius scale); thermo.ZeroCelsiusK is the same constant above this
// package.
const zeroCelsiusK = 273.15

// Solute is one draw (or feed) solute as stored in data/solutes.json.
type Solute struct {
	ID      string   `json:"id"`      // usual formula, e.g. "NaCl", "(NH4)2SO4"
	Name    string   `json:"name"`    // common name, e.g. "sodium chloride"
	Aliases []string `json:"aliases"` // other accepted names, matched case-insensitively
	// Family groups solutes for filtering: chloride, sulfate, nitrate,
	// bicarbonate, bromide, organic-salt, non-electrolyte, seawater, custom.
	Family           string  `json:"family"`
	Formula          string  `json:"formula"`
	MolarMassGPerMol float64 `json:"molar_mass_g_per_mol"`
	// Ions lists the dissociated species; empty for a non-electrolyte.
	Ions []Ion `json:"ions,omitempty"`

	Osmotic     OsmoticModel    `json:"osmotic_model"`
	Density     *DensityModel   `json:"density,omitempty"`
	Viscosity   *ViscosityModel `json:"viscosity,omitempty"`
	Solubility  Solubility      `json:"solubility"`
	Diffusivity Diffusivity     `json:"diffusivity"`
	Price       *Price          `json:"price,omitempty"`

	Hazards      []string `json:"hazards"`      // plain-language notes
	HazardFlags  []string `json:"hazard_flags"` // machine flags, from HazardFlags
	Regeneration []string `json:"regeneration"` // routes, e.g. "reverse osmosis", "membrane distillation"
	Notes        string   `json:"notes,omitempty"`

	// Sources maps a field path to where its numbers come from.
	Sources map[string]string `json:"sources"`

	// Components are a blend's parts (NewBlend); empty for a library record.
	Components []Component `json:"components,omitempty"`
	// composition: the ions per formula unit of a mixture record or blend
	// (IonShares); nil for a single solute.
	composition []IonShare `json:"-"`
}

// HazardFlags are the machine-readable hazard flags a record may carry
// and a scenario may exclude.
var HazardFlags = []string{"oxidizer", "toxic", "corrosive", "ammonia-release", "nutrient", "scaling", "irritant", "flammable-decomposition"}

// IsHazardFlag reports whether f is one of HazardFlags (case-insensitive).
func IsHazardFlag(f string) bool {
	for _, h := range HazardFlags {
		if strings.EqualFold(h, f) {
			return true
		}
	}
	return false
}

// UniqueFlags returns flags without repeats (compared by Key), in their
// first order; nil stays nil. Linear: one Key and one map look-up each.
func UniqueFlags(flags []string) []string {
	if flags == nil {
		return nil
	}
	out := make([]string, 0, len(flags))
	seen := make(map[string]bool, len(flags))
	for _, f := range flags {
		if k := Key(f); !seen[k] {
			seen[k] = true
			out = append(out, f)
		}
	}
	return out
}

// Ion is one dissociated species of a salt.
type Ion struct {
	Symbol string `json:"symbol"` // e.g. "Na+", "SO4-2"
	Charge int    `json:"charge"`
	Count  int    `json:"count"` // per formula unit
	// DiffusivityM2PerS is the limiting ionic diffusion coefficient at 25 °C.
	DiffusivityM2PerS float64 `json:"diffusivity_m2_per_s"`
}

// Model kinds for OsmoticModel.Kind.
const (
	ModelPitzer        = "pitzer"         // Pitzer single-electrolyte equations
	ModelPhiPolynomial = "phi-polynomial" // φ = 1 + Σ a_i m^i (non-electrolytes)
	ModelNorrish       = "norrish"        // a_w = x_w exp(−K x_s²) (non-electrolytes)
	ModelSeawater      = "seawater"       // Sharqawy et al. 2010 φ correlation
	ModelTable         = "table"          // measured π(c) table, monotone interpolation
	ModelNone          = "none"           // no trustworthy model: van 't Hoff only, flagged
)

// OsmoticModel selects and parameterises the osmotic-coefficient model.
type OsmoticModel struct {
	Kind string `json:"kind"`

	// Pitzer parameters at 25 °C in the plain convention (not PM73's 4/3 one).
	Beta0  float64 `json:"beta0,omitempty"`
	Beta1  float64 `json:"beta1,omitempty"`
	Beta2  float64 `json:"beta2,omitempty"`
	CPhi   float64 `json:"c_phi,omitempty"`
	Alpha1 float64 `json:"alpha1,omitempty"` // 2.0; 1.4 for 2-2 salts
	Alpha2 float64 `json:"alpha2,omitempty"` // 12 for 2-2 salts, else unused

	// Coefficients a_1, a_2, … of φ = 1 + Σ a_i m^i (phi-polynomial).
	PhiCoefficients []float64 `json:"phi_coefficients,omitempty"`
	// NorrishK is K of the Norrish equation (norrish).
	NorrishK float64 `json:"norrish_k,omitempty"`

	// Table holds measured points (table).
	Table *PiTable `json:"table,omitempty"`

	// MaxMolalityMolPerKg is the upper limit of the data the model was
	// fitted to; above it (and below solubility) results carry a warning.
	MaxMolalityMolPerKg float64 `json:"max_molality_mol_per_kg,omitempty"`

	// Temperature describes how the parameters vary with temperature; nil
	// means 25 °C data only (results away from 25 °C carry a warning).
	Temperature *TemperatureFit `json:"temperature,omitempty"`

	// Reason explains a ModelNone record.
	Reason string `json:"reason,omitempty"`
	// CompositionFeed names the feed record whose ion list is this mixture
	// solute's composition (ModelMixture records: seawater's Reference
	// Composition).
	CompositionFeed string `json:"composition_feed,omitempty"`
	// VantHoffNu is the van 't Hoff factor to use when Ions is empty or the
	// model is "none" (e.g. 2 for NH4HCO3). Zero means derived from Ions.
	VantHoffNu float64 `json:"vant_hoff_nu,omitempty"`
}

// Temperature-fit kinds.
const (
	// TempLinear: p(T) = p(25 °C) + (∂p/∂T)(T − 298.15 K).
	TempLinear = "linear"
	// TempQuadratic: p(T) = q0·T² + q1·T + q2, T in K (de Lima & Pitzer 1983 form).
	TempQuadratic = "quadratic"
	// TempHolmesMesmer: p(T) = a1 + a2(1/T − 1/Tr) + a3 ln(T/Tr) + a4(T − Tr)
	// + a5(T² − Tr²) + a6 ln(T − 260), Tr = 298.15 K (Holmes & Mesmer 1983).
	TempHolmesMesmer = "holmes-mesmer"
)

// TemperatureFit holds the temperature dependence of Pitzer parameters.
type TemperatureFit struct {
	Kind string `json:"kind"`
	// linear: first derivatives at 25 °C, K⁻¹.
	DBeta0DT float64 `json:"dbeta0_dt,omitempty"`
	DBeta1DT float64 `json:"dbeta1_dt,omitempty"`
	DBeta2DT float64 `json:"dbeta2_dt,omitempty"`
	DCPhiDT  float64 `json:"dc_phi_dt,omitempty"`
	// quadratic (3 coefficients) or holmes-mesmer (6 coefficients).
	Beta0Coeffs []float64 `json:"beta0_coeffs,omitempty"`
	Beta1Coeffs []float64 `json:"beta1_coeffs,omitempty"`
	CPhiCoeffs  []float64 `json:"c_phi_coeffs,omitempty"`
	// The temperature range of the fit's data, °C; outside it results
	// carry a warning.
	MinC float64 `json:"min_c"`
	MaxC float64 `json:"max_c"`
	// MaxMolalityMolPerKg limits the fit's molality range if lower than the
	// 25 °C model's.
	MaxMolalityMolPerKg float64 `json:"max_molality_mol_per_kg,omitempty"`
}

// PiTable is a measured osmotic-pressure table at one temperature.
type PiTable struct {
	TemperatureC float64 `json:"temperature_c"`
	// Unit of the concentrations: mol/kg, mol/L, g/L, g/kg or wt%.
	Unit   string    `json:"unit"`
	Points []PiPoint `json:"points"`
}

// PiPoint is one measured (concentration, π) pair.
type PiPoint struct {
	Concentration      float64 `json:"concentration"`
	OsmoticPressureBar float64 `json:"osmotic_pressure_bar"`
}

// Density-model kinds.
const (
	// DensityLaliberteCooper: Laliberté & Cooper (2004), J. Chem. Eng. Data
	// 49:1141, apparent density of the solute
	//	ρ_app = (c0·w + c1)·exp(1e-6·(t + c4)²) / (w + c2 + c3·t)
	// with w the solute mass fraction and t in °C; 1/ρ = (1−w)/ρ_w + w/ρ_app.
	DensityLaliberteCooper = "laliberte-cooper-2004"
	// DensityApparentMolarVolume: V_φ = v0 + v1·m (cm³/mol), m in mol/kg.
	DensityApparentMolarVolume = "apparent-molar-volume"
)

// DensityModel gives the solution density.
type DensityModel struct {
	Kind string  `json:"kind"`
	C0   float64 `json:"c0,omitempty"`
	C1   float64 `json:"c1,omitempty"`
	C2   float64 `json:"c2,omitempty"`
	C3   float64 `json:"c3,omitempty"`
	C4   float64 `json:"c4,omitempty"`
	// apparent-molar-volume coefficients, cm³/mol and cm³ kg/mol².
	V0CM3PerMol float64 `json:"v0_cm3_per_mol,omitempty"`
	V1          float64 `json:"v1,omitempty"`
	// Validity of the fit.
	MaxMassFraction float64 `json:"max_mass_fraction,omitempty"`
	MinC            float64 `json:"min_c"`
	MaxC            float64 `json:"max_c"`
}

// Viscosity-model kinds.
const (
	// ViscosityLaliberte2007: Laliberté (2007), J. Chem. Eng. Data 52:321,
	//	η_s = exp[(v1·(1−w_w)^v2 + v3)/(v4·t + 1)] / (v5·(1−w_w)^v6 + 1)  (mPa·s)
	//	ln η = w_w·ln η_w + w_s·ln η_s
	ViscosityLaliberte2007 = "laliberte-2007"
	// ViscosityRelativeTable: relative viscosity η/η_w against mass fraction
	// at one temperature, assumed independent of temperature (flagged).
	ViscosityRelativeTable = "relative-table"
)

// ViscosityModel gives the solution viscosity.
type ViscosityModel struct {
	Kind string  `json:"kind"`
	V1   float64 `json:"v1,omitempty"`
	V2   float64 `json:"v2,omitempty"`
	V3   float64 `json:"v3,omitempty"`
	V4   float64 `json:"v4,omitempty"`
	V5   float64 `json:"v5,omitempty"`
	V6   float64 `json:"v6,omitempty"`
	// relative-table points.
	Points []RelViscosityPoint `json:"points,omitempty"`
	// Validity of the fit.
	MaxMassFraction float64 `json:"max_mass_fraction,omitempty"`
	MinC            float64 `json:"min_c"`
	MaxC            float64 `json:"max_c"`
}

// RelViscosityPoint is one (mass fraction, η/η_w) pair.
type RelViscosityPoint struct {
	MassFraction      float64 `json:"mass_fraction"`
	RelativeViscosity float64 `json:"relative_viscosity"`
}

// Solubility gives the saturation molality against temperature.
type Solubility struct {
	SolidPhase string            `json:"solid_phase,omitempty"` // e.g. "Na2SO4·10H2O"
	Points     []SolubilityPoint `json:"points"`
	// Miscible marks solutes with no solubility limit in the range (glycerol).
	Miscible bool `json:"miscible,omitempty"`
	// Minerals names the solids (lower-case mineral names of the
	// mixed-electrolyte model's set) whose saturation limits this solute
	// in a mixture: a blend or an ion composition reaches its solubility
	// where the first of them does.
	Minerals []string `json:"minerals,omitempty"`
	// SaturatedWaterActivity is the measured water activity of the
	// saturated solution against temperature, where it is published.
	SaturatedWaterActivity *SaturatedWaterActivity `json:"saturated_water_activity,omitempty"`
}

// SaturatedWaterActivity is the equilibrium relative humidity over the
// saturated solution (its water activity) in the form of the CRC
// Handbook's table of constant-humidity solutions (A. Wexler, after
// Greenspan 1977 and Wexler & Seinfeld 1991):
//
//	a_w,sat(T) = (A/100) · exp(B/T),   T in kelvin, MinC ≤ T − 273.15 ≤ MaxC
//
// UncertaintyPercentRH is the stated accuracy in percent relative humidity.
type SaturatedWaterActivity struct {
	APercent             float64 `json:"a_percent"`
	BK                   float64 `json:"b_k"`
	MinC                 float64 `json:"min_c"`
	MaxC                 float64 `json:"max_c"`
	UncertaintyPercentRH float64 `json:"uncertainty_percent_rh"`
}

// At returns the saturated solution's water activity at tC °C, and false
// outside the measured temperature range.
func (a *SaturatedWaterActivity) At(tC float64) (float64, bool) {
	if a == nil || tC < a.MinC || tC > a.MaxC {
		return 0, false
	}
	return a.APercent / 100 * math.Exp(a.BK/(tC+zeroCelsiusK)), true
}

// SolubilityPoint is the saturation molality at one temperature.
type SolubilityPoint struct {
	TemperatureC     float64 `json:"temperature_c"`
	MolalityMolPerKg float64 `json:"molality_mol_per_kg"`
}

// Diffusivity gives the solute's binary (Fick) diffusion coefficient.
type Diffusivity struct {
	// D0M2PerS is the infinite-dilution value at 25 °C (Nernst–Hartley for
	// salts).
	D0M2PerS float64 `json:"d0_m2_per_s"`
	// Points are finite-concentration values at 25 °C, molar basis; between
	// them D is interpolated, beyond them held at the end value.
	Points []DiffusivityPoint `json:"points,omitempty"`
}

// DiffusivityPoint is D at one molarity, 25 °C.
type DiffusivityPoint struct {
	MolarityMolPerL float64 `json:"molarity_mol_per_l"`
	DM2PerS         float64 `json:"d_m2_per_s"`
}

// Price is a bulk-price range for the solute.
type Price struct {
	USDPerKgMin float64 `json:"usd_per_kg_min"`
	USDPerKgMax float64 `json:"usd_per_kg_max"`
	Year        int     `json:"year"`
	Grade       string  `json:"grade,omitempty"` // e.g. "technical, bulk"
}
