// Package limits is the engine's one table of defaults and limits: every
// numeric input of every operation is a Range here, in the unit its
// contract field names, with its default and the reason for its bounds.
// The engine's validation calls Range.Check (engine/scenario for requests,
// engine/screen for its own invariants), so an error's limit text is the
// table's; the defaults operation lists the table, so the page shows and
// checks the same numbers.
package limits

import (
	"math"
	"strconv"
	"strings"

	"drawsift/engine/errs"
	"drawsift/engine/thermo"
)

// Range is the accepted interval of one numeric input, in the unit its
// contract field names, with its default. Every range of every operation
// is a Range in this file, checked by its Check method and listed by the
// defaults operation, so the page, the CLI, the HTTP API and the engine's
// own validation read the same numbers.
type Range struct {
	Field string // contract path ("membrane.a_lmh_per_bar"); "[]" marks a list index
	// Key names the range in the defaults listing when several ranges
	// share a field (the basis value in bar or in LMH); "" → Field.
	Key  string
	Unit string // as printed after the numbers; "" for dimensionless
	Min  float64
	Max  float64 // +Inf for no upper bound
	// MinOpen, MaxOpen make a bound exclusive.
	MinOpen, MaxOpen bool
	Integer          bool
	// Count marks a range on the number of entries of a list (not a
	// number the request writes), e.g. "custom_solutes[].hazard_flags".
	Count bool
	// Default applies when the field is omitted (HasDefault).
	Default    float64
	HasDefault bool
	// Why says where the bounds come from.
	Why string
}

// ID is the range's key in the defaults listing.
func (r *Range) ID() string {
	if r.Key != "" {
		return r.Key
	}
	return r.Field
}

// Contains reports whether v lies in the range. Every input must be a
// finite number: NaN and ±Inf lie in no range.
func (r *Range) Contains(v float64) bool {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return false
	}
	if r.MinOpen && !(v > r.Min) || !r.MinOpen && !(v >= r.Min) {
		return false
	}
	if r.MaxOpen && !(v < r.Max) || !r.MaxOpen && !(v <= r.Max) {
		return false
	}
	return !r.Integer || v == math.Trunc(v)
}

// Text is the limit as the contract's errors state it: "0–100 °C",
// "> 0 and ≤ 20 m/s", "≥ 0 LMH".
func (r *Range) Text() string {
	lo, hi := num(r.Min), num(r.Max)
	if r.Count {
		// A list's length: "at most 32 entries", "2–1000 entries".
		if r.Min == 0 {
			return "at most " + hi + " entries"
		}
		return lo + "–" + hi + " entries"
	}
	var s string
	switch {
	case math.IsInf(r.Max, 1) && r.MinOpen:
		s = "> " + lo
	case math.IsInf(r.Max, 1):
		s = "≥ " + lo
	case !r.MinOpen && !r.MaxOpen:
		s = lo + "–" + hi
	default:
		a, b := "≥ ", "≤ "
		if r.MinOpen {
			a = "> "
		}
		if r.MaxOpen {
			b = "< "
		}
		s = a + lo + " and " + b + hi
	}
	if r.Integer {
		s += " (whole number)"
	}
	if r.Unit != "" {
		s += " " + r.Unit
	}
	return s
}

// Check returns nil if v is in range, else an *errs.InputError on the
// range's field.
func (r *Range) Check(v float64) error { return r.CheckAt(r.Field, v) }

// CheckAt is Check for an indexed instance of the field
// ("custom_solutes[2].molar_mass_g_per_mol").
func (r *Range) CheckAt(field string, v float64) error {
	if r.Contains(v) {
		return nil
	}
	name := field[strings.LastIndexByte(field, '.')+1:]
	if r.Count {
		return errs.Invalid(field, v, r.Text(), "%s has %s entries; %s are accepted", name, num(v), r.Text())
	}
	return errs.Invalid(field, v, r.Text(), "%s = %s is outside %s", name, num(v), r.Text())
}

// Or returns the default when p is nil, else *p checked against the range.
func (r *Range) Or(p *float64) (float64, error) {
	if p == nil {
		return r.Default, nil
	}
	return *p, r.Check(*p)
}

// Required returns *p checked against the range, or an error naming the
// field when the value is missing.
func (r *Range) Required(p *float64) (float64, error) {
	if p == nil {
		return 0, errs.InvalidText(r.Field, "", r.Text(), "%s is required (%s)", r.Field, r.Text())
	}
	return *p, r.Check(*p)
}

// num prints a bound the way people write it: 1e-8, not 1e-08.
func num(v float64) string {
	if math.IsInf(v, 0) || math.IsNaN(v) {
		return strconv.FormatFloat(v, 'g', -1, 64)
	}
	if v == math.Trunc(v) && math.Abs(v) < 1e16 {
		return strconv.FormatFloat(v, 'f', -1, 64) // whole numbers in full
	}
	s := strconv.FormatFloat(v, 'g', -1, 64)
	s = strings.Replace(s, "e-0", "e-", 1)
	return strings.Replace(s, "e+0", "e+", 1)
}

// MaxConcentration bounds every concentration a request gives, in any of
// the accepted units (mol/kg, mol/L, g/L, g/kg, wt%, osmol/kg): no aqueous
// solution comes near 10⁵ in any of them (the most soluble salts hold a few
// thousand g/L), so a larger value is a unit slip, and every derived
// quantity stays finite.
const MaxConcentration = 1e5

// Bounds that catch unit slips rather than judge a membrane or a cell:
// each is far beyond anything reported for forward osmosis (common
// practice), so a value past it is almost surely in the wrong unit
// (A in m s⁻¹ Pa⁻¹, S in m, a channel in µm).
var (
	TemperatureC = Range{Field: "temperature_c", Unit: "°C", Min: thermo.MinTemperatureC, Max: thermo.MaxTemperatureC,
		Default: 25, HasDefault: true, Why: "liquid water at atmospheric pressure; the water-property fits of engine/water"}
	MembraneA = Range{Field: "membrane.a_lmh_per_bar", Unit: "LMH/bar", Min: 1e-3, Max: 100, Why: "unit-slip guard"}
	MembraneB = Range{Field: "membrane.b_lmh", Unit: "LMH", Min: 0, Max: 100, Why: "unit-slip guard"}
	// MembraneBNaCl is the membrane's NaCl B, the base of estimates.
	MembraneBNaCl = Range{Field: "membrane.b_nacl_lmh", Unit: "LMH", Min: 0, Max: 100, Why: "unit-slip guard"}
	MembraneS     = Range{Field: "membrane.s_um", Unit: "µm", Min: 1, Max: 1e5, Why: "unit-slip guard"}
	// MembraneRefT is the temperature A and B were measured at (omitted for
	// a custom membrane: the operating temperature, no correction).
	MembraneRefT = Range{Field: "membrane.reference_temperature_c", Unit: "°C", Min: thermo.MinTemperatureC, Max: thermo.MaxTemperatureC,
		Why: "the engine's temperature range"}
	// MembraneEA and MembraneEB are activation energies of water and solute
	// permeation that replace the default temperature rules.
	MembraneEA  = Range{Field: "membrane.a_activation_energy_kj_per_mol", Unit: "kJ/mol", Min: 0, Max: 100, Why: "activation energies of permeation through polymer membranes lie far below 100 kJ/mol"}
	MembraneEB  = Range{Field: "membrane.b_activation_energy_kj_per_mol", Unit: "kJ/mol", Min: 0, Max: 100, Why: "activation energies of permeation through polymer membranes lie far below 100 kJ/mol"}
	FeedB       = Range{Field: "b_feed_lmh", Unit: "LMH", Min: 0, Max: 100, Why: "unit-slip guard"}
	KDraw       = Range{Field: "k_draw_m_per_s", Unit: "m/s", Min: 1e-8, Max: 1, Why: "unit-slip guard"}
	KFeed       = Range{Field: "k_feed_m_per_s", Unit: "m/s", Min: 1e-8, Max: 1, Why: "unit-slip guard"}
	Diffusivity = Range{Field: "diffusivity_m2_per_s", Unit: "m²/s", Min: 1e-12, Max: 1e-7, Why: "unit-slip guard"}
	DeltaP      = Range{Field: "delta_p_bar", Unit: "bar", Min: -1000, Max: 1000, HasDefault: true, Why: "unit-slip guard"}

	// The default channel is a bench-scale flat-sheet FO cell with an
	// empty channel at 0.25 m/s crossflow (common practice for lab FO
	// tests; the 0.25 m/s of the standard protocol, Cath et al. 2013, is
	// from memory).
	ChannelHeight = Range{Field: "channel.height_mm", Unit: "mm", Min: 0, MinOpen: true, Max: 1e4, Default: 2, HasDefault: true, Why: "unit-slip guard"}
	ChannelWidth  = Range{Field: "channel.width_mm", Unit: "mm", Min: 0, MinOpen: true, Max: 1e4, Default: 26, HasDefault: true, Why: "unit-slip guard"}
	ChannelLength = Range{Field: "channel.length_mm", Unit: "mm", Min: 0, MinOpen: true, Max: 1e6, Default: 77, HasDefault: true, Why: "unit-slip guard"}
	Crossflow     = Range{Field: "channel.crossflow_velocity_m_per_s", Unit: "m/s", Min: 0, MinOpen: true, Max: 20, Default: 0.25, HasDefault: true, Why: "unit-slip guard"}
	FeedCrossflow = Range{Field: "channel.feed_crossflow_velocity_m_per_s", Unit: "m/s", Min: 0, MinOpen: true, Max: 20, Why: "unit-slip guard; omitted → the draw side's"}

	FeedPH = Range{Field: "feed.ph", Min: 0, Max: 14, Default: 7, HasDefault: true, Why: "the pH scale of dilute aqueous solutions"}
	// FeedIonMgPerL bounds one custom feed ion.
	FeedIonMgPerL = Range{Field: "feed.ions[].mg_per_l", Unit: "mg/L", Min: 0, Max: 1e6, Why: "a litre holds at most about 10⁶ mg of anything dissolved"}
	// FeedIonMolarMass: the lightest ion, H⁺, is 1.008 g/mol (IUPAC
	// standard atomic weight of hydrogen, common practice).
	FeedIonMolarMass = Range{Field: "feed.ions[].molar_mass_g_per_mol", Unit: "g/mol", Min: 1, Max: 1e4, Why: "no ion is lighter than H⁺ (1.008 g/mol); unit-slip guard"}

	// RegenerationRecovery: the fraction of the diluted draw's water
	// recovered as product when re-concentrating (0.5 by default, our own
	// choice; 0.95 keeps the minimum-energy integral away from the
	// solubility of every library solute, common practice).
	RegenerationRecovery = Range{Field: "regeneration_recovery", Min: 0, MinOpen: true, Max: 0.95, Default: 0.5, HasDefault: true,
		Why: "a fraction; above 0.95 the re-concentrated draw nears solubility"}
	// Seed: a whole number up to 2⁵³ − 1, the largest that survives a
	// round trip through a JavaScript number (the page, saved scenarios).
	Seed = Range{Field: "seed", Min: 0, Max: 1<<53 - 1, Integer: true, Default: 1, HasDefault: true, Why: "a whole number a JavaScript number holds exactly"}

	// Basis.
	BasisValue = Range{Field: "basis.value", Min: 0, MinOpen: true, Max: MaxConcentration, Why: "a positive target, within any solution's concentration"}
	// BasisMultiple is the target as a multiple of the feed's π; 2 is the
	// default basis for a feed with osmotic pressure (our own choice: a
	// draw twice the feed's π keeps a useful driving force along a module).
	BasisMultiple = Range{Field: "basis.multiple_of_feed", Min: 1, MinOpen: true, Max: 1e3, Default: 2, HasDefault: true,
		Why: "the draw must exceed the feed's π"}
	// BasisPressure is the equal-π basis for a solute-free feed: 28 bar,
	// the equal osmotic pressure of Achilli, Cath & Childress (2010) J.
	// Membr. Sci. 364:233 (2.8 MPa; from memory).
	BasisPressure = Range{Field: "basis.value", Key: "basis.osmotic_pressure_bar", Unit: "bar", Min: 0, MinOpen: true, Max: 1e4, Default: 28, HasDefault: true,
		Why: "positive; 10⁴ bar is beyond any solution"}
	BasisFlux = Range{Field: "basis.value", Key: "basis.water_flux_lmh", Unit: "LMH", Min: 0, MinOpen: true, Max: 3600, MaxOpen: true, Why: "beyond any FO membrane"}
	// Weight: relative weights; 10⁶ bounds their ratio far beyond any
	// useful one and keeps their sum finite (our own choice).
	Weight = Range{Field: "weights", Min: 0, Max: 1e6, Why: "non-negative relative weights; a sum that stays finite"}

	// Robustness (Monte Carlo). The spreads' defaults are engine/screen's
	// (each names its source there); a preset membrane brings its own A, B
	// and S scatter, a custom one takes the defaults below.
	Samples = Range{Field: "uncertainty.samples", Min: 1, Max: 100000, Integer: true, Default: 1000, HasDefault: true,
		Why: "10⁵ samples bound a request's time"}
	// RobustnessShards: the parts a robustness run may be split into
	// (uncertainty.shard.count), one per Web Worker or API request; 64 is
	// our own bound (more parts than cores gain nothing).
	RobustnessShards = Range{Field: "uncertainty.shard.count", Min: 1, Max: 64, Integer: true,
		Why: "the parts of one robustness run (our own bound)"}
	ARelSD = Range{Field: "uncertainty.a_rel_sd", Min: 0, Max: 2, Default: 0.10, HasDefault: true,
		Why: "relative SD; custom-membrane default 10 % (common practice, from memory)"}
	BRelSD = Range{Field: "uncertainty.b_rel_sd", Min: 0, Max: 2, Default: 0.30, HasDefault: true,
		Why: "relative SD; custom-membrane default 30 % (common practice, from memory)"}
	SRelSD = Range{Field: "uncertainty.s_rel_sd", Min: 0, Max: 2, Default: 0.15, HasDefault: true,
		Why: "relative SD; custom-membrane default 15 % (common practice, from memory)"}
	// OsmoticRelSD: 2 % on π for a fitted model within its data (the
	// Pitzer sets reproduce the CRC Handbook's activity coefficients to
	// about 1–2 %, see engine/thermo's tests; common practice), and
	// VantHoffOsmoticRelSD, 10 %, for a record with no non-ideal model
	// (common practice, from memory): the defaults when a scenario does not
	// name osmotic_rel_sd.
	OsmoticRelSD         = Range{Field: "uncertainty.osmotic_rel_sd", Min: 0, Max: 2, Default: 0.02, HasDefault: true, Why: "relative SD of each candidate's π model"}
	VantHoffOsmoticRelSD = Range{Field: "uncertainty.osmotic_rel_sd", Key: "uncertainty.osmotic_rel_sd.van_t_hoff_only", Min: 0, Max: 2, Default: 0.10, HasDefault: true,
		Why: "the default for a solute with no non-ideal model (van 't Hoff only)"}
	// DiffusivityRelSD: 5 % on D (common practice, from memory).
	DiffusivityRelSD = Range{Field: "uncertainty.diffusivity_rel_sd", Min: 0, Max: 2, Default: 0.05, HasDefault: true, Why: "relative SD of each candidate's D"}
	// EstimatedBRelSD: the spread of a B scaled from NaCl's by diffusivity,
	// an order-of-magnitude estimate taken as good to about a factor of two
	// (common practice, from memory), drawn per candidate.
	EstimatedBRelSD = Range{Field: "uncertainty.estimated_b_rel_sd", Min: 0, Max: 2, Default: 1.0, HasDefault: true, Why: "relative SD of an estimated B, per candidate"}

	// Concentration: any solution's concentration, in the request's unit
	// (draw.concentration, feed.concentration, …); its solubility is checked
	// against the solute's record.
	Concentration = Range{Field: "concentration", Min: 0, Max: MaxConcentration, Why: "non-negative, a unit-slip guard beyond any solution in every accepted unit; each solute's solubility is checked in the request's unit"}

	// Sweeps.
	SweepPoints = Range{Field: "sweep.points", Min: 2, Max: 1000, Integer: true, Why: "a series of 2–1000 points"}

	// Custom solutes.
	CustomMolarMass   = Range{Field: "custom_solutes[].molar_mass_g_per_mol", Unit: "g/mol", Min: 1, Max: 1e7, MaxOpen: true, Why: "nothing is lighter than hydrogen (1.008 g/mol); unit-slip guard"}
	CustomDiffusivity = Range{Field: "custom_solutes[].diffusivity_m2_per_s", Unit: "m²/s", Min: 0, MinOpen: true, Max: 1e-8, MaxOpen: true, Why: "unit-slip guard"}
	CustomVantHoff    = Range{Field: "custom_solutes[].van_t_hoff_factor", Min: 0, Max: 10, Why: "particles per formula unit; 0 → Σ ion counts, or 1"}
	CustomSolubility  = Range{Field: "custom_solutes[].solubility_mol_per_kg", Unit: "mol/kg", Min: 0, MinOpen: true, Max: 1e3, Why: "positive; 10³ mol/kg is beyond any solute"}
	CustomPrice       = Range{Field: "custom_solutes[].price_usd_per_kg_min", Key: "custom_solutes[].price_usd_per_kg", Unit: "USD/kg", Min: 0, Max: 1e6, Why: "non-negative; unit-slip guard"}
	PiTablePoints     = Range{Field: "custom_solutes[].pi_table.points", Min: 2, Max: 1000, Integer: true, Count: true, Why: "a table of 2–1000 points"}

	// Custom ions: no aqueous ion carries more than a few charges (P₃O₁₀⁵⁻
	// has five) and no formula unit more than a handful of one ion, so
	// ±10 and 10 are unit-slip guards that keep Σ charge × count and
	// ν = Σ count small integers (common practice).
	CustomIonCharge  = Range{Field: "custom_solutes[].ions[].charge", Min: -10, Max: 10, Integer: true, Why: "a whole charge, non-zero; unit-slip guard"}
	CustomIonCount   = Range{Field: "custom_solutes[].ions[].count", Min: 1, Max: 10, Integer: true, Why: "ions of one kind per formula unit"}
	CustomIonEntries = Range{Field: "custom_solutes[].ions", Min: 0, Max: 10, Integer: true, Count: true, Why: "ion kinds per formula unit"}

	// Hazard lists: only len(library.HazardFlags) (8) flags exist, so 32
	// entries leave room for repeats (dropped) while bounding the work of
	// matching them (our own choice).
	// Fit (engine/fit): the measured fluxes, their uncertainties, the
	// confidence level and the bootstrap's size.
	FitRows            = Range{Field: "data", Min: 1, Max: 1000, Integer: true, Count: true, Why: "rows of one characterisation; bounds the work of a fit"}
	FitWaterFlux       = Range{Field: "data[].water_flux_lmh", Unit: "LMH", Min: 0, MinOpen: true, Max: 1000, Why: "a measured forward water flux: positive, and beyond any FO membrane past 1000 LMH"}
	FitReverseFlux     = Range{Field: "data[].reverse_solute_flux_gmh", Unit: "gMH", Min: 0, MinOpen: true, Max: 1e5, Why: "a measured reverse solute flux: positive (omit the field when not measured); unit-slip guard"}
	FitWaterFluxSD     = Range{Field: "data[].water_flux_sd_lmh", Unit: "LMH", Min: 0, MinOpen: true, Max: 1000, Why: "a standard uncertainty: positive"}
	FitReverseFluxSD   = Range{Field: "data[].reverse_solute_flux_sd_gmh", Unit: "gMH", Min: 0, MinOpen: true, Max: 1e5, Why: "a standard uncertainty: positive"}
	FitRelError        = Range{Field: "measurement_error.water_flux_relative", Min: 0, Max: 1, Default: 0.05, HasDefault: true, Why: "relative standard uncertainty of each flux; equal relative weights make the sum of squared relative errors (Tiraferri et al. 2013)"}
	FitAbsWaterFlux    = Range{Field: "measurement_error.water_flux_lmh", Unit: "LMH", Min: 0, Max: 100, Default: 0, HasDefault: true, Why: "an absolute floor of each water flux's uncertainty"}
	FitAbsReverseFlux  = Range{Field: "measurement_error.reverse_solute_flux_gmh", Unit: "gMH", Min: 0, Max: 1e4, Default: 0, HasDefault: true, Why: "an absolute floor of each reverse solute flux's uncertainty"}
	FitConfidence      = Range{Field: "confidence", Min: 0.5, Max: 0.999, Default: 0.95, HasDefault: true, Why: "the confidence level of the intervals"}
	FitBootstrapSample = Range{Field: "bootstrap.samples", Min: 10, Max: 10000, Integer: true, Default: 1000, HasDefault: true, Why: "resamples; the work budget also caps samples × measured fluxes"}

	// System (the screen's system stage): the plant's target, the flows
	// and the prices of its cost per m³.
	SystemRecovery      = Range{Field: "system.recovery", Min: 0, MinOpen: true, Max: 0.95, Default: 0.3, HasDefault: true, Why: "product over feed inflow; 0.3 by default is within the osmotic cap of seawater against a draw at twice its π (our own choice)"}
	SystemProduct       = Range{Field: "system.product_m3_per_day", Unit: "m³/day", Min: 0, MinOpen: true, Max: 1e7, Default: 100, HasDefault: true, Why: "product water per day; 10⁷ m³/day is past the largest plant (unit-slip guard); 100 by default (our own choice)"}
	SystemDrawRatio     = Range{Field: "system.draw_to_feed_flow_ratio", Min: 0.05, Max: 20, Default: 1, HasDefault: true, Why: "draw inflow over feed inflow (our own choice of default: equal flows)"}
	SystemElectricity   = Range{Field: "system.prices.electricity_usd_per_kwh", Unit: "USD/kWh", Min: 0, Max: 10, Default: 0.10, HasDefault: true, Why: "industrial electricity, 0.05–0.15 USD/kWh in many markets (from memory)"}
	SystemHeat          = Range{Field: "system.prices.heat_usd_per_kwh", Unit: "USD/kWh", Min: 0, Max: 10, Default: 0.02, HasDefault: true, Why: "low-grade heat per kWh of heat; 0 for waste heat (from memory)"}
	SystemMembranePrice = Range{Field: "system.prices.membrane_usd_per_m2", Unit: "USD/m²", Min: 0, Max: 10000, Default: 30, HasDefault: true, Why: "installed FO membrane per m² of area (from memory, order of magnitude)"}
	SystemMembraneLife  = Range{Field: "system.prices.membrane_life_years", Unit: "years", Min: 0.1, Max: 50, Default: 5, HasDefault: true, Why: "membrane replacement interval (from memory: 3–7 years in desalination)"}
	SystemDrawPrice     = Range{Field: "system.prices.draw_usd_per_kg[]", Unit: "USD/kg", Min: 0, Max: 1e6, Why: "a draw solute's price; omitted: the middle of the library's price range"}

	// Regeneration routes (engine/regen): the parameters of each route's
	// energy model, under the request's "regeneration" object.
	RegenPumpEfficiency  = Range{Field: "regeneration.pump_efficiency", Min: 0.1, Max: 1, Default: 0.8, HasDefault: true, Why: "high-pressure pump and motor, wire to water; large RO pumps reach about 0.8 (from memory)"}
	RegenERDEfficiency   = Range{Field: "regeneration.erd_efficiency", Min: 0, Max: 0.99, Default: 0.95, HasDefault: true, Why: "fraction of the concentrate's pressure energy an energy-recovery device returns; isobaric exchangers 0.95–0.98 (from memory); 0 for none"}
	RegenPressureMargin  = Range{Field: "regeneration.pressure_margin_bar", Unit: "bar", Min: 0, Max: 50, Default: 5, HasDefault: true, Why: "net driving pressure left at a membrane route's concentrate end over its osmotic pressure (common practice: a few bar)"}
	RegenROMaxPressure   = Range{Field: "regeneration.ro_max_pressure_bar", Unit: "bar", Min: 5, Max: 400, Default: 82.7, HasDefault: true, Why: "pressure rating of standard seawater RO elements, 1200 psi (from memory)"}
	RegenROHighPressure  = Range{Field: "regeneration.ro_high_max_pressure_bar", Unit: "bar", Min: 5, Max: 400, Default: 120, HasDefault: true, Why: "high-pressure RO elements, about 120 bar (from memory; Davenport et al. 2018, Environ. Sci. Technol. Lett. 5:467, argue for higher)"}
	RegenNFMaxPressure   = Range{Field: "regeneration.nf_max_pressure_bar", Unit: "bar", Min: 2, Max: 400, Default: 41, HasDefault: true, Why: "pressure rating of NF elements, 600 psi (from memory)"}
	RegenRORejection     = Range{Field: "regeneration.ro_rejection", Min: 0, Max: 1, MaxOpen: true, Default: 0.995, HasDefault: true, Why: "observed rejection of an electrolyte draw by seawater RO; elements are specified at 99.6–99.8 % NaCl (from memory)"}
	RegenRejectionEntry  = Range{Field: "regeneration.ro_rejection_by_solute[]", Key: "regeneration.rejection_by_solute[]", Min: 0, Max: 1, MaxOpen: true, Why: "a rejection: a fraction below 1"}
	RegenStripC          = Range{Field: "regeneration.thermal_strip_temperature_c", Unit: "°C", Min: 30, Max: 150, Default: 60, HasDefault: true, Why: "column temperature of a thermolytic draw's stripping; NH3–CO2 salts decompose from about 35 °C, 60 °C is usual (common practice)"}
	RegenDecomposition   = Range{Field: "regeneration.thermal_decomposition_kj_per_mol", Unit: "kJ/mol", Min: 0, Max: 1000, Default: 100, HasDefault: true, Why: "heat to strip one mole of the thermolytic draw as gases; ≈ 99 kJ/mol for NH4HCO3(aq) → NH3(g) + CO2(g) + H2O(l) from standard enthalpies of formation (from memory)"}
	RegenHeatRecovery    = Range{Field: "regeneration.heat_recovery", Min: 0, Max: 0.99, Default: 0.9, HasDefault: true, Why: "effectiveness of the heat exchange between a thermal route's hot product and its cold inflow (from memory)"}
	RegenThermalHeat     = Range{Field: "regeneration.thermal_heat_kwh_per_m3", Unit: "kWh/m³", Min: 0, MinOpen: true, Max: 5000, Why: "a measured or published heat of the thermal route per m³ of product, replacing the model's (optional)"}
	RegenThermalElectric = Range{Field: "regeneration.thermal_electric_kwh_per_m3", Unit: "kWh/m³", Min: 0, Max: 100, Default: 0.3, HasDefault: true, Why: "pumps and fans of a stripping column per m³ of product (from memory, order of magnitude)"}
	RegenCarnotFraction  = Range{Field: "regeneration.heat_to_work_carnot_fraction", Min: 0, MinOpen: true, Max: 1, Default: 0.5, HasDefault: true, Why: "work a heat engine between the heat source and the ambient would make, as a fraction of Carnot's; 0.4–0.6 at low temperature lifts (from memory)"}
	RegenMDGOR           = Range{Field: "regeneration.md_gained_output_ratio", Min: 0.1, Max: 30, Default: 3, HasDefault: true, Why: "latent heat of the distillate over the heat supplied; 1–6 for MD with heat recovery (from memory)"}
	RegenMDHotC          = Range{Field: "regeneration.md_hot_temperature_c", Unit: "°C", Min: 30, Max: 100, Default: 70, HasDefault: true, Why: "MD feed temperature at the hot inlet (common practice: 60–80 °C)"}
	RegenMDElectric      = Range{Field: "regeneration.md_electric_kwh_per_m3", Unit: "kWh/m³", Min: 0, Max: 100, Default: 0.5, HasDefault: true, Why: "MD circulation pumps per m³ of distillate (from memory, order of magnitude)"}

	// Module (engine/module): the streams' inflows, the area or the
	// design target, the channels' pressure drops, the profile and the
	// integrator's tolerance.
	ModuleDrawFlow  = Range{Field: "draw.flow_l_per_h", Unit: "L/h", Min: 0, MinOpen: true, Max: 1e9, Why: "a stream's inflow: positive; 10⁹ L/h is past the largest desalination plant (unit-slip guard)"}
	ModuleFeedFlow  = Range{Field: "feed.flow_l_per_h", Unit: "L/h", Min: 0, MinOpen: true, Max: 1e9, Why: "a stream's inflow: positive; 10⁹ L/h is past the largest desalination plant (unit-slip guard)"}
	ModuleArea      = Range{Field: "area_m2", Unit: "m²", Min: 0, MinOpen: true, Max: 1e6, Why: "membrane area: positive; 10⁶ m² is past any FO train (unit-slip guard)"}
	ModuleRecovery  = Range{Field: "target.recovery", Min: 0, MinOpen: true, Max: 1, MaxOpen: true, Why: "permeate over feed inflow: a fraction; the osmotic-equilibrium cap lowers the top"}
	ModulePermeate  = Range{Field: "target.permeate_l_per_h", Unit: "L/h", Min: 0, MinOpen: true, Max: 1e9, Why: "positive, and below the feed's inflow times the recovery cap"}
	ModuleDrawDrop  = Range{Field: "draw_pressure_drop_bar_per_m2", Unit: "bar/m²", Min: 0, Max: 10, Default: 0, HasDefault: true, Why: "a channel's pressure loss per m² of membrane; spiral-wound elements lose well under 0.1 bar/m² (common practice)"}
	ModuleFeedDrop  = Range{Field: "feed_pressure_drop_bar_per_m2", Unit: "bar/m²", Min: 0, Max: 10, Default: 0, HasDefault: true, Why: "a channel's pressure loss per m² of membrane; spiral-wound elements lose well under 0.1 bar/m² (common practice)"}
	ModulePoints    = Range{Field: "profile_points", Min: 2, Max: 1001, Integer: true, Default: 41, HasDefault: true, Why: "points of the profiles along the area; bounds the response"}
	ModuleTolerance = Range{Field: "tolerance", Min: 1e-12, Max: 1e-4, Default: 1e-9, HasDefault: true, Why: "relative tolerance of the module's integrator (Dormand–Prince 5(4) error control)"}

	// Lists a request may give: each bounded so that the work and the
	// memory of resolving a request stay bounded whatever its length (our
	// own choices, far above any real scenario's).
	//
	// CustomSoluteCount: a user's own library of custom solutes; with the
	// 29 library records a whole-library robustness run still takes
	// 30,000 samples within the screen's work budget.
	CustomSoluteCount = Range{Field: "custom_solutes", Min: 0, Max: 100, Integer: true, Count: true, Why: "a user's own solutes screened beside the library"}
	// CandidateCount: named solutes (repeats dropped) and blends.
	CandidateCount = Range{Field: "candidates", Min: 0, Max: 200, Integer: true, Count: true, Why: "the library, the custom solutes and blends of them"}
	// OrientationCount: two orientations exist; repeats are dropped.
	OrientationCount = Range{Field: "orientations", Min: 0, Max: 4, Integer: true, Count: true, Why: "AL-FS and AL-DS; repeats are dropped"}
	// ParetoCount: the objectives of the Pareto front (at least two).
	ParetoCount = Range{Field: "pareto_objectives", Min: 2, Max: 16, Integer: true, Count: true, Why: "two or more of the score's objectives"}
	// FeedIonCount: a water analysis; the mixed-electrolyte model knows
	// 20 ions and each may be listed once.
	FeedIonCount = Range{Field: "feed.ions", Min: 0, Max: 32, Integer: true, Count: true, Why: "each ion the mixture model knows, once"}
	// MixtureParts and BlendParts: the parts of a mixture (an osmotic,
	// flux or feed request at concentrations) and of a screen blend (at
	// fractions).
	MixtureParts = Range{Field: "mixture", Min: 1, Max: 12, Integer: true, Count: true, Why: "solutes of one solution"}
	BlendParts   = Range{Field: "candidates[].blend", Min: 2, Max: 12, Integer: true, Count: true, Why: "solutes of one blend"}

	HazardFlagCount    = Range{Field: "custom_solutes[].hazard_flags", Min: 0, Max: 32, Integer: true, Count: true, Why: "a list of known hazard flags; repeats are dropped"}
	ExcludeHazardCount = Range{Field: "exclude_hazards", Min: 0, Max: 32, Integer: true, Count: true, Why: "a list of known hazard flags; repeats are dropped"}
)

// Lookup returns the range of a contract field (the first listed, where
// several share it), or nil. List indices do not matter:
// "custom_solutes[2].molar_mass_g_per_mol" finds
// "custom_solutes[].molar_mass_g_per_mol".
func Lookup(field string) *Range {
	var b strings.Builder
	skip := false
	for _, c := range field {
		switch {
		case c == '[':
			skip = true
			b.WriteRune(c)
		case c == ']':
			skip = false
			b.WriteRune(c)
		case !skip:
			b.WriteRune(c)
		}
	}
	key := b.String()
	for _, r := range Ranges() {
		if r.Field == key {
			return r
		}
	}
	return nil
}

// Ranges lists every range, in the order the defaults operation reports
// them.
func Ranges() []*Range {
	return []*Range{
		&TemperatureC, &MembraneA, &MembraneB, &MembraneBNaCl, &MembraneS, &MembraneRefT, &MembraneEA, &MembraneEB, &FeedB, &KDraw, &KFeed, &Diffusivity, &DeltaP,
		&ChannelHeight, &ChannelWidth, &ChannelLength, &Crossflow, &FeedCrossflow,
		&FeedPH, &FeedIonMgPerL, &FeedIonMolarMass, &RegenerationRecovery, &Seed,
		&BasisValue, &BasisMultiple, &BasisPressure, &BasisFlux, &Weight,
		&Samples, &RobustnessShards, &ARelSD, &BRelSD, &SRelSD, &OsmoticRelSD, &VantHoffOsmoticRelSD, &DiffusivityRelSD, &EstimatedBRelSD,
		&Concentration, &SweepPoints, &CustomMolarMass, &CustomDiffusivity, &CustomVantHoff, &CustomSolubility, &CustomPrice, &PiTablePoints,
		&HazardFlagCount, &ExcludeHazardCount, &CustomIonCharge, &CustomIonCount, &CustomIonEntries,
		&FitRows, &FitWaterFlux, &FitReverseFlux, &FitWaterFluxSD, &FitReverseFluxSD, &FitRelError, &FitAbsWaterFlux, &FitAbsReverseFlux, &FitConfidence, &FitBootstrapSample,
		&ModuleDrawFlow, &ModuleFeedFlow, &ModuleArea, &ModuleRecovery, &ModulePermeate, &ModuleDrawDrop, &ModuleFeedDrop, &ModulePoints, &ModuleTolerance,
		&RegenPumpEfficiency, &RegenERDEfficiency, &RegenPressureMargin, &RegenROMaxPressure, &RegenROHighPressure, &RegenNFMaxPressure, &RegenRORejection, &RegenRejectionEntry,
		&RegenStripC, &RegenDecomposition, &RegenHeatRecovery, &RegenThermalHeat, &RegenThermalElectric, &RegenCarnotFraction, &RegenMDGOR, &RegenMDHotC, &RegenMDElectric,
		&SystemRecovery, &SystemProduct, &SystemDrawRatio, &SystemElectricity, &SystemHeat, &SystemMembranePrice, &SystemMembraneLife, &SystemDrawPrice,
		&CustomSoluteCount, &CandidateCount, &OrientationCount, &ParetoCount, &FeedIonCount, &MixtureParts, &BlendParts,
	}
}
