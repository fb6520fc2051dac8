package api

import (
	"context"
	"drawsift/engine/scenario"
	"drawsift/engine/warn"
	"errors"
	"fmt"
	"math"
	"sort"
	"strings"

	"drawsift/engine/errs"
	"drawsift/engine/library"
	"drawsift/engine/screen"
	"drawsift/engine/thermo"
	"drawsift/engine/transport"
)

// ScreenRequest is a scenario: the document users save, share and rerun.
// Every field is optional except what the defaults cannot supply; the
// defaults are listed on each field.
type ScreenRequest struct {
	// Feed: {"preset": ID} (see FeedPresets), or a solute at a
	// concentration with optional ions and pH. Omitted → deionised water.
	Feed *FeedSpec `json:"feed,omitempty"`
	// Membrane: {"preset": ID} or custom a/b/s. In a screen, b_lmh is the
	// membrane's NaCl B unless b_nacl_lmh is also given (then b_lmh is
	// used for every candidate). Omitted → preset "tfc-standard".
	Membrane *MembraneSpec `json:"membrane,omitempty"`
	// Orientation ranks the candidates (default "AL-FS"); Orientations
	// adds others, reported beside it.
	Orientation  string   `json:"orientation,omitempty"`
	Orientations []string `json:"orientations,omitempty"`
	TemperatureC *float64 `json:"temperature_c,omitempty"` // default 25 °C
	KDrawMPerS   *float64 `json:"k_draw_m_per_s,omitempty"`
	KFeedMPerS   *float64 `json:"k_feed_m_per_s,omitempty"`
	// Channel sets k from a Sherwood correlation (default scenario.DefaultChannel).
	Channel    *ChannelSpec `json:"channel,omitempty"`
	ExternalCP *bool        `json:"external_cp,omitempty"` // default true
	// Candidates: solute IDs or aliases; omitted → the whole library plus
	// the custom solutes.
	Candidates    []string       `json:"candidates,omitempty"`
	CustomSolutes []CustomSolute `json:"custom_solutes,omitempty"`
	// Basis of comparison; omitted → 2 × the feed's π, or 28 bar for a
	// solute-free feed.
	Basis        *BasisSpec `json:"basis,omitempty"`
	OsmoticModel string     `json:"osmotic_model,omitempty"` // "real" (default) or "van-t-hoff"
	// Weights by objective key (screen.ObjectiveKeys); omitted →
	// screen.DefaultWeights. Objectives not named weigh 0.
	Weights map[string]float64 `json:"weights,omitempty"`
	// ParetoObjectives: two or more objective keys (default water_flux,
	// specific_reverse_solute_flux, replenishment_cost).
	ParetoObjectives []string `json:"pareto_objectives,omitempty"`
	// ExcludeHazards lists hazard flags whose solutes are excluded.
	ExcludeHazards []string `json:"exclude_hazards,omitempty"`
	// AllowExtrapolation keeps candidates needed above their osmotic
	// model's data (flagged); default false: they are excluded.
	AllowExtrapolation bool `json:"allow_extrapolation,omitempty"`
	// RegenerationRecovery: fraction of the diluted draw's water recovered
	// when re-concentrating (default 0.5).
	RegenerationRecovery *float64 `json:"regeneration_recovery,omitempty"`
	// Uncertainty asks for the robustness run.
	Uncertainty *UncertaintySpec `json:"uncertainty,omitempty"`
	Seed        *uint64          `json:"seed,omitempty"` // default 1
	// Sweep asks for series of every metric against one variable.
	Sweep *SweepSpec `json:"sweep,omitempty"`
}

// FeedSpec is the scenario's feed water.
type FeedSpec struct {
	Preset        string    `json:"preset,omitempty"`
	Solute        string    `json:"solute,omitempty"`
	Concentration *float64  `json:"concentration,omitempty"`
	Unit          string    `json:"unit,omitempty"`
	Ions          []IonSpec `json:"ions,omitempty"`
	PH            *float64  `json:"ph,omitempty"`
}

// IonSpec is one ion of a custom feed.
type IonSpec struct {
	Symbol           string  `json:"symbol"` // e.g. "Ca+2", "SO4-2", "HCO3-"
	Charge           int     `json:"charge"`
	MolarMassGPerMol float64 `json:"molar_mass_g_per_mol"`
	MgPerL           float64 `json:"mg_per_l"`
}

// BasisSpec is the basis of comparison.
type BasisSpec struct {
	Kind           string   `json:"kind"` // "osmotic-pressure", "concentration" or "water-flux"
	Value          *float64 `json:"value,omitempty"`
	Unit           string   `json:"unit,omitempty"` // bar, kPa, MPa, atm, psi | a concentration unit | LMH
	MultipleOfFeed *float64 `json:"multiple_of_feed,omitempty"`
}

// UncertaintySpec sets the robustness run; omitted numbers take the
// membrane record's scatter (custom membranes: 10 %, 30 %, 15 %), 2 % on
// π (10 % for a van 't Hoff-only solute), 5 % on D, and prices drawn
// uniformly within their ranges.
type UncertaintySpec struct {
	Samples          *int     `json:"samples,omitempty"` // default 1000
	ARelSD           *float64 `json:"a_rel_sd,omitempty"`
	BRelSD           *float64 `json:"b_rel_sd,omitempty"`
	SRelSD           *float64 `json:"s_rel_sd,omitempty"`
	OsmoticRelSD     *float64 `json:"osmotic_rel_sd,omitempty"`
	DiffusivityRelSD *float64 `json:"diffusivity_rel_sd,omitempty"`
	// EstimatedBRelSD: per candidate, for a B estimated from NaCl's
	// (default screen.DefaultEstimatedBRelSD).
	EstimatedBRelSD *float64 `json:"estimated_b_rel_sd,omitempty"`
	Prices          *bool    `json:"prices,omitempty"`
}

// SweepSpec asks for series against one variable.
type SweepSpec struct {
	// Variable: "concentration" (in Unit, a concentration unit),
	// "temperature" (°C), "s" (µm) or "crossflow" (m/s).
	Variable string  `json:"variable"`
	From     float64 `json:"from"`
	To       float64 `json:"to"`
	Points   int     `json:"points"`
	Unit     string  `json:"unit,omitempty"`
}

// CustomSolute is a user-defined candidate. With a measured π table
// (pi_table) its osmotic pressure is interpolated monotonically from the
// table; without one it is the van 't Hoff value, flagged as such.
type CustomSolute struct {
	ID                 string      `json:"id"`
	Name               string      `json:"name,omitempty"`
	MolarMassGPerMol   float64     `json:"molar_mass_g_per_mol"`
	Ions               []CustomIon `json:"ions,omitempty"`
	VantHoffFactor     float64     `json:"van_t_hoff_factor,omitempty"` // default Σ ion counts, or 1
	SolubilityMolPerKg *float64    `json:"solubility_mol_per_kg,omitempty"`
	Miscible           bool        `json:"miscible,omitempty"`
	DiffusivityM2PerS  float64     `json:"diffusivity_m2_per_s"`
	PriceUSDPerKgMin   *float64    `json:"price_usd_per_kg_min,omitempty"`
	PriceUSDPerKgMax   *float64    `json:"price_usd_per_kg_max,omitempty"`
	HazardFlags        []string    `json:"hazard_flags,omitempty"`
	Source             string      `json:"source,omitempty"`
	// PiTable is a measured osmotic-pressure table: {"temperature_c",
	// "unit", "points": [{"concentration", "osmotic_pressure_bar"}, …]}.
	PiTable *library.PiTable `json:"pi_table,omitempty"`
}

// CustomIon is one ion of a custom solute.
type CustomIon struct {
	Symbol string `json:"symbol"`
	Charge int    `json:"charge"`
	Count  int    `json:"count"`
}

// ScreenResponse is the ranked screen.
type ScreenResponse struct {
	Candidates             []ScreenCandidate  `json:"candidates"`
	Excluded               []ScreenExcluded   `json:"excluded"`
	Orientation            string             `json:"orientation"`
	Basis                  BasisReport        `json:"basis"`
	FeedOsmoticPressureBar float64            `json:"feed_osmotic_pressure_bar"`
	Weights                map[string]float64 `json:"weights"`
	ParetoObjectives       []string           `json:"pareto_objectives"`
	Robustness             *RobustnessReport  `json:"robustness,omitempty"`
	Sweep                  []SweepSeries      `json:"sweep,omitempty"`
	Warnings               []string           `json:"warnings"`
	Cautions               []string           `json:"cautions"`
	// What reproduces the run.
	Scenario      *ScreenRequest    `json:"scenario"`
	ModelChoices  map[string]string `json:"model_choices"`
	Sources       []Source          `json:"sources"`
	EngineVersion string            `json:"engine_version"`
}

// BasisReport restates the basis as applied.
type BasisReport struct {
	Kind                     string   `json:"kind"`
	TargetOsmoticPressureBar *float64 `json:"target_osmotic_pressure_bar,omitempty"`
	Concentration            *float64 `json:"concentration,omitempty"`
	Unit                     string   `json:"unit,omitempty"`
	TargetWaterFluxLMH       *float64 `json:"target_water_flux_lmh,omitempty"`
}

// RobustnessReport describes the Monte Carlo run.
type RobustnessReport struct {
	Samples       int    `json:"samples"`
	Seed          uint64 `json:"seed"`
	Distributions string `json:"distributions"`
}

// FluxMetrics are the orientation-dependent metrics.
type FluxMetrics struct {
	Orientation                       string         `json:"orientation"`
	WaterFluxLMH                      float64        `json:"water_flux_lmh"`
	ReverseSoluteFluxGMH              float64        `json:"reverse_solute_flux_gmh"`
	ReverseSoluteFluxMmolPerM2H       float64        `json:"reverse_solute_flux_mmol_per_m2_h"`
	SpecificReverseSoluteFluxGPerL    float64        `json:"specific_reverse_solute_flux_g_per_l"`
	SpecificReverseSoluteFluxMmolPerL float64        `json:"specific_reverse_solute_flux_mmol_per_l"`
	FluxEfficiency                    float64        `json:"flux_efficiency"`
	ReplenishmentCostUSDPerM3         *float64       `json:"replenishment_cost_usd_per_m3,omitempty"`
	ReplenishmentCostMinUSDPerM3      *float64       `json:"replenishment_cost_min_usd_per_m3,omitempty"`
	ReplenishmentCostMaxUSDPerM3      *float64       `json:"replenishment_cost_max_usd_per_m3,omitempty"`
	Scaling                           []ScalingIndex `json:"scaling"`
	MaxSaturationIndex                *float64       `json:"max_saturation_index,omitempty"`
	SurfaceIonicStrengthMolPerL       float64        `json:"surface_ionic_strength_mol_per_l"`
	Reason                            string         `json:"reason,omitempty"`
}

// ScalingIndex is one mineral's saturation index at the feed-side surface.
type ScalingIndex struct {
	Mineral         string  `json:"mineral"`
	Formula         string  `json:"formula"`
	SaturationIndex float64 `json:"saturation_index"`
}

// ScreenCandidate is one ranked candidate with every metric.
type ScreenCandidate struct {
	Solute        string             `json:"solute"`
	Name          string             `json:"name"`
	Rank          int                `json:"rank"`
	Score         float64            `json:"score"`
	ParetoOptimal bool               `json:"pareto_optimal"`
	Contributions map[string]float64 `json:"score_contributions"`
	Normalised    map[string]float64 `json:"normalised_metrics"`

	ConcentrationMolPerL                 float64  `json:"concentration_mol_per_l"`
	ConcentrationGPerL                   float64  `json:"concentration_g_per_l"`
	MolalityMolPerKg                     float64  `json:"molality_mol_per_kg"`
	SolubilityMolPerKg                   *float64 `json:"solubility_mol_per_kg,omitempty"`
	SolubilityMarginFraction             float64  `json:"solubility_margin_fraction"`
	OsmoticPressureBar                   float64  `json:"osmotic_pressure_bar"`
	VantHoffBar                          float64  `json:"van_t_hoff_bar"`
	OsmoticPressurePerMolarityBarLPerMol float64  `json:"osmotic_pressure_per_mol_per_l_bar_l_per_mol"`
	VantHoffPerMolarityBarLPerMol        float64  `json:"van_t_hoff_per_mol_per_l_bar_l_per_mol"`
	OsmoticPressurePerMassBarLPerG       float64  `json:"osmotic_pressure_per_g_per_l_bar_l_per_g"`
	VantHoffPerMassBarLPerG              float64  `json:"van_t_hoff_per_g_per_l_bar_l_per_g"`
	FluxMetrics
	ViscosityMPaS                 float64              `json:"viscosity_mpa_s"`
	MinRegenerationEnergyKWhPerM3 float64              `json:"min_regeneration_energy_kwh_per_m3"`
	BLMH                          float64              `json:"b_lmh"`
	BEstimated                    bool                 `json:"b_estimated"`
	PriceUSDPerKgMin              *float64             `json:"price_usd_per_kg_min,omitempty"`
	PriceUSDPerKgMax              *float64             `json:"price_usd_per_kg_max,omitempty"`
	HazardFlags                   []string             `json:"hazard_flags"`
	OtherOrientations             []FluxMetrics        `json:"other_orientations,omitempty"`
	Robustness                    *CandidateRobustness `json:"robustness,omitempty"`
	Warnings                      []string             `json:"warnings"`
}

// CandidateRobustness is the candidate's rank statistics over the samples.
type CandidateRobustness struct {
	ProbabilityFirst float64 `json:"probability_first"`
	ProbabilityTop3  float64 `json:"probability_top3"`
	RankP05          int     `json:"rank_p05"`
	RankMedian       int     `json:"rank_median"`
	RankP95          int     `json:"rank_p95"`
	FailedFraction   float64 `json:"failed_fraction"`
}

// ScreenExcluded is a candidate listed apart.
type ScreenExcluded struct {
	Solute string `json:"solute"`
	Reason string `json:"reason"`
	Detail string `json:"detail"`
}

// SweepSeries is one candidate × orientation across a sweep.
type SweepSeries struct {
	Solute      string       `json:"solute"`
	Orientation string       `json:"orientation"`
	Variable    string       `json:"variable"`
	Unit        string       `json:"unit"`
	Points      []SweepPoint `json:"points"`
}

// SweepPoint is one sweep point: x and the metrics, or the reason.
type SweepPoint struct {
	X                              float64  `json:"x"`
	ConcentrationMolPerL           *float64 `json:"concentration_mol_per_l,omitempty"`
	OsmoticPressureBar             *float64 `json:"osmotic_pressure_bar,omitempty"`
	WaterFluxLMH                   *float64 `json:"water_flux_lmh,omitempty"`
	SpecificReverseSoluteFluxGPerL *float64 `json:"specific_reverse_solute_flux_g_per_l,omitempty"`
	FluxEfficiency                 *float64 `json:"flux_efficiency,omitempty"`
	ReplenishmentCostUSDPerM3      *float64 `json:"replenishment_cost_usd_per_m3,omitempty"`
	ViscosityMPaS                  *float64 `json:"viscosity_mpa_s,omitempty"`
	MinRegenerationEnergyKWhPerM3  *float64 `json:"min_regeneration_energy_kwh_per_m3,omitempty"`
	MaxSaturationIndex             *float64 `json:"max_saturation_index,omitempty"`
	Reason                         string   `json:"reason,omitempty"`
}

// ScreenCautions are shown with every screen.
var ScreenCautions = []string{
	"Screening estimates, not a design: verify with experiments on the actual membrane and waters.",
	"FO product water is not potable without post-treatment and must meet local drinking-water and discharge rules.",
	"Handle each chemical per its safety data sheet (oxidisers, ammonia release on heating, toxicity); defer to local codes and licensed practice.",
}

var pressureUnits = map[string]float64{"bar": 1e5, "kpa": 1e3, "mpa": 1e6, "atm": 101325, "psi": 6894.757293168, "pa": 1}

// pressureUnitNames spell the keys of pressureUnits as people write them.
var pressureUnitNames = []string{"bar", "kPa", "MPa", "atm", "psi", "Pa"}

// Screen ranks the scenario's candidates. progress, if not nil, receives
// (done, total) Monte Carlo samples.
func Screen(ctx context.Context, req *ScreenRequest, progress func(done, total int)) (*ScreenResponse, *Error) {
	sc, info, e := resolveScenario(req)
	if e != nil {
		return nil, e
	}
	lib, _ := library.Default()
	res, err := screen.Run(ctx, sc, lib, progress)
	if err != nil {
		if errors.Is(err, context.Canceled) || errors.Is(err, context.DeadlineExceeded) {
			return nil, &Error{Field: "", Message: "screen cancelled: " + err.Error(), Kind: KindInvalid}
		}
		var ie *errs.InputError
		if errors.As(err, &ie) {
			ae := fromEngine("", err)
			if res != nil && ie.Field == "basis.value" {
				var why []string
				for _, x := range res.Excluded {
					why = append(why, x.Solute.ID+": "+x.Reason)
				}
				ae.Message += " — " + strings.Join(why, "; ")
			}
			return nil, ae
		}
		return nil, fromEngine("", err)
	}
	resp := buildScreenResponse(req, sc, info, res)
	if req.Sweep != nil {
		spec, e := resolveSweep(req.Sweep)
		if e != nil {
			return nil, e
		}
		series, err := screen.Sweep(ctx, sc, lib, spec)
		if err != nil {
			return nil, fromEngine("", err)
		}
		resp.Sweep = sweepSeries(series, req.Sweep)
	}
	return resp, nil
}

// scenarioInfo carries what the response reports about resolution.
type scenarioInfo struct {
	membraneRec *library.Membrane
	feedRec     *library.Feed
	bRule       string
	kRule       string
	custom      map[string]bool
}

func resolveScenario(req *ScreenRequest) (*screen.Scenario, *scenarioInfo, *Error) {
	lib, lerr := library.Default()
	if lerr != nil {
		return nil, nil, &Error{Message: "internal error: solute library", Kind: KindInternal}
	}
	info := &scenarioInfo{custom: map[string]bool{}}
	var err error
	sc := &screen.Scenario{Seed: uint64(scenario.Seed.Default), AllowExtrapolation: req.AllowExtrapolation}
	if req.Seed != nil {
		sc.Seed = *req.Seed
	}
	if sc.RegenerationRecovery, err = scenario.RegenerationRecovery.Or(req.RegenerationRecovery); err != nil {
		return nil, nil, fromEngine("", err)
	}
	tK, err := scenario.TemperatureK("temperature_c", req.TemperatureC)
	if err != nil {
		return nil, nil, fromEngine("", err)
	}
	sc.TemperatureK = tK
	osm, err := scenario.ParseOsmoticModel(req.OsmoticModel)
	if err != nil {
		return nil, nil, fromEngine("", err)
	}
	sc.VantHoff = osm == scenario.VantHoff
	// Orientations.
	o, err := scenario.ParseOrientation("orientation", req.Orientation)
	if err != nil {
		return nil, nil, fromEngine("", err)
	}
	sc.Orientations = []transport.Orientation{o}
	for i, s := range req.Orientations {
		o2, err := scenario.ParseOrientation(fmt.Sprintf("orientations[%d]", i), s)
		if err != nil || s == "" {
			return nil, nil, Invalid(fmt.Sprintf("orientations[%d]", i), scenario.OrientationNames, "unknown orientation %q", s)
		}
		dup := false
		for _, have := range sc.Orientations {
			dup = dup || have == o2
		}
		if !dup {
			sc.Orientations = append(sc.Orientations, o2)
		}
	}
	// Membrane.
	ms := req.Membrane
	if ms == nil {
		ms = &MembraneSpec{Preset: scenario.DefaultMembranePreset}
	}
	mem, err := scenario.ResolveMembrane(ms)
	if err != nil {
		return nil, nil, fromEngine("", err)
	}
	info.membraneRec = mem.Record
	m := screen.Membrane{ID: mem.Preset(), AMPerSPa: mem.AMPerSPa, SM: mem.SM, B: mem.B,
		ARelSD: mem.ARelSD, BRelSD: mem.BRelSD, SRelSD: mem.SRelSD}
	info.bRule = library.BEstimateRule
	// In a screen, b_lmh alone is the membrane's NaCl B (the base of the
	// estimates); with b_nacl_lmh beside it, B for every candidate.
	if b := mem.BGivenMPerS; b != nil {
		if ms.BNaClLMH == nil {
			m.B = library.SoluteB{NaCl: *b}
			info.bRule = "membrane.b_lmh taken as the NaCl B; " + library.BEstimateRule
		} else {
			m.BDrawMPerS, m.BDrawSet = *b, true
			info.bRule = "membrane.b_lmh used for every candidate"
		}
	} else if !mem.BKnown {
		return nil, nil, Invalid("membrane.b_lmh", "≥ 0", "a custom membrane needs b_lmh (its NaCl B)")
	}
	sc.Membrane = m
	// Feed.
	feed, rec, e := resolveFeed(req.Feed, tK)
	if e != nil {
		return nil, nil, e
	}
	sc.Feed, info.feedRec = feed, rec
	// Mass transfer.
	extCP := req.ExternalCP == nil || *req.ExternalCP
	if sc.Channel, err = scenario.ResolveChannel(req.Channel); err != nil {
		return nil, nil, fromEngine("", err)
	}
	info.kRule = "k from the channel's Sherwood correlation (engine/transport), with each solution's density, viscosity and diffusivity"
	if sc.KDrawMPerS, err = scenario.GivenK(&scenario.KDraw, req.KDrawMPerS); err != nil {
		return nil, nil, fromEngine("", err)
	}
	if sc.KFeedMPerS, err = scenario.GivenK(&scenario.KFeed, req.KFeedMPerS); err != nil {
		return nil, nil, fromEngine("", err)
	}
	if !extCP {
		sc.KDrawMPerS, sc.KFeedMPerS = math.Inf(1), math.Inf(1)
		info.kRule = "no external concentration polarization (k → ∞)"
	} else if req.KDrawMPerS != nil || req.KFeedMPerS != nil {
		info.kRule = "k as given where given; elsewhere from the channel's Sherwood correlation"
	}
	// Candidates.
	customs := map[string]*library.Solute{}
	var customOrder []*library.Solute
	for i, cs := range req.CustomSolutes {
		s, e := customSolute(i, &cs, lib)
		if e != nil {
			return nil, nil, e
		}
		if _, dup := customs[library.Key(s.ID)]; dup {
			return nil, nil, Invalid(fmt.Sprintf("custom_solutes[%d].id", i), nil, "custom solute %q is defined twice", s.ID)
		}
		customs[library.Key(s.ID)] = s
		customOrder = append(customOrder, s)
		info.custom[s.ID] = true
	}
	if req.Candidates == nil {
		sc.Candidates = append(sc.Candidates, lib.All()...)
		sc.Candidates = append(sc.Candidates, customOrder...)
	} else {
		if len(req.Candidates) == 0 {
			return nil, nil, Invalid("candidates", "at least one solute", "the candidate list is empty (omit it to screen the whole library)")
		}
		seen := map[*library.Solute]bool{}
		for i, name := range req.Candidates {
			s, ok := customs[library.Key(name)]
			if !ok {
				s, ok = lib.Lookup(name)
			}
			if !ok {
				return nil, nil, Invalid(fmt.Sprintf("candidates[%d]", i), nil, "unknown solute %q; known: %s", name, strings.Join(lib.IDs(), ", "))
			}
			if !seen[s] {
				seen[s] = true
				sc.Candidates = append(sc.Candidates, s)
			}
		}
	}
	// Basis.
	b, e := resolveBasis(req.Basis, sc.Feed.Solute != nil && sc.Feed.Concentration > 0)
	if e != nil {
		return nil, nil, e
	}
	sc.Basis = b
	// Weights and Pareto objectives.
	sc.Weights = screen.DefaultWeights
	if req.Weights != nil {
		sc.Weights = screen.Weights{}
		keys := make([]string, 0, len(req.Weights))
		for k := range req.Weights {
			keys = append(keys, k)
		}
		sort.Strings(keys)
		sum := 0.0
		for _, k := range keys {
			ob, ok := screen.ParseObjective(k)
			if !ok {
				return nil, nil, Invalid("weights."+k, screen.ObjectiveKeys(), "unknown objective %q", k)
			}
			w := req.Weights[k]
			if !(w >= 0) || math.IsInf(w, 0) {
				return nil, nil, Invalid("weights."+k, "≥ 0", "weights must be finite and non-negative (got %g)", w)
			}
			sc.Weights[ob] = w
			sum += w
		}
		if !(sum > 0) {
			return nil, nil, Invalid("weights", "at least one weight > 0", "all weights are zero")
		}
	}
	sc.Pareto = screen.DefaultPareto
	if req.ParetoObjectives != nil {
		if len(req.ParetoObjectives) < 2 {
			return nil, nil, Invalid("pareto_objectives", "two or more objectives", "the Pareto front needs two or more objectives")
		}
		sc.Pareto = nil
		for i, k := range req.ParetoObjectives {
			ob, ok := screen.ParseObjective(k)
			if !ok {
				return nil, nil, Invalid(fmt.Sprintf("pareto_objectives[%d]", i), screen.ObjectiveKeys(), "unknown objective %q", k)
			}
			sc.Pareto = append(sc.Pareto, ob)
		}
	}
	for i, h := range req.ExcludeHazards {
		if !library.IsHazardFlag(h) {
			return nil, nil, Invalid(fmt.Sprintf("exclude_hazards[%d]", i), library.HazardFlags, "unknown hazard flag %q", h)
		}
	}
	sc.ExcludeHazards = req.ExcludeHazards
	// Uncertainty.
	if u := req.Uncertainty; u != nil {
		su := &screen.Uncertainty{Samples: int(scenario.Samples.Default), ARelSD: m.ARelSD, BRelSD: m.BRelSD, SRelSD: m.SRelSD,
			DefaultOsmotic: true, DiffusivityRelSD: scenario.DiffusivityRelSD.Default, EstimatedBRelSD: scenario.EstimatedBRelSD.Default, Prices: true}
		if u.Samples != nil {
			if err := scenario.Samples.Check(float64(*u.Samples)); err != nil {
				return nil, nil, fromEngine("", err)
			}
			su.Samples = *u.Samples
		}
		for _, f := range []struct {
			r   *scenario.Range
			v   *float64
			dst *float64
		}{{&scenario.ARelSD, u.ARelSD, &su.ARelSD}, {&scenario.BRelSD, u.BRelSD, &su.BRelSD}, {&scenario.SRelSD, u.SRelSD, &su.SRelSD},
			{&scenario.OsmoticRelSD, u.OsmoticRelSD, &su.OsmoticRelSD}, {&scenario.DiffusivityRelSD, u.DiffusivityRelSD, &su.DiffusivityRelSD},
			{&scenario.EstimatedBRelSD, u.EstimatedBRelSD, &su.EstimatedBRelSD}} {
			if f.v == nil {
				continue
			}
			if err := f.r.Check(*f.v); err != nil {
				return nil, nil, fromEngine("", err)
			}
			*f.dst = *f.v
		}
		if u.OsmoticRelSD != nil {
			su.DefaultOsmotic = false
		}
		if u.Prices != nil {
			su.Prices = *u.Prices
		}
		sc.Uncertainty = su
	}
	return sc, info, nil
}

// resolveFeed reads the feed: a preset, or a solute with optional ions.
func resolveFeed(fs *FeedSpec, tK float64) (screen.Feed, *library.Feed, *Error) {
	if fs == nil {
		fs = &FeedSpec{Preset: scenario.DefaultFeedPreset}
	}
	var rec *library.Feed
	f := screen.Feed{ID: "custom", PH: scenario.FeedPH.Default}
	if fs.Preset != "" {
		r, ok := library.LookupFeed(fs.Preset)
		if !ok {
			all, _ := library.Feeds()
			ids := []string{}
			for _, p := range all {
				ids = append(ids, p.ID)
			}
			return f, nil, Invalid("feed.preset", ids, "unknown feed preset %q", fs.Preset)
		}
		if fs.Solute != "" || fs.Ions != nil {
			return f, nil, Invalid("feed.solute", nil, "give either a feed preset or a custom feed (solute, ions), not both")
		}
		rec = r
		f.ID, f.PH = r.ID, r.PH
		f.IonsPerKg = r.IonsPerKg()
		switch r.Osmotic.Method {
		case library.FeedOsmoticNone:
			f.OsmoticMethod = "pure water"
		case library.FeedOsmoticSolute:
			s, err := scenario.LookupSolute("feed.preset", r.Osmotic.Solute)
			if err != nil {
				return f, nil, fromEngine("", err)
			}
			u, err := thermo.ParseUnit(r.Osmotic.Unit)
			if err != nil {
				return f, nil, &Error{Message: "internal error: feed preset unit", Kind: KindInternal}
			}
			f.Solute, f.Concentration, f.Unit = s, r.Osmotic.Concentration, u
			if fs.Concentration != nil {
				v, _, err := scenario.ParseConcentration("feed", fs.Concentration, r.Osmotic.Unit)
				if err != nil {
					return f, nil, fromEngine("", err)
				}
				f.Concentration = v
			}
			f.OsmoticMethod = fmt.Sprintf("library solute %s at %g %s", s.ID, f.Concentration, u)
		case library.FeedOsmoticEquivalentNaCl:
			s, err := scenario.LookupSolute("feed.preset", "NaCl")
			if err != nil {
				return f, nil, fromEngine("", err)
			}
			f.Solute, f.Concentration, f.Unit = s, r.EquivalentNaClMolPerL(), thermo.MolPerL
			f.Surrogate = true
			f.OsmoticMethod = fmt.Sprintf("%s: %.4g mol/L NaCl", library.EquivalentNaClRule, f.Concentration)
			if fs.Concentration != nil {
				return f, nil, Invalid("feed.concentration", nil, "preset %q sets its osmotic pressure from its ions; use a custom feed to change it", r.ID)
			}
		}
		salinity := -1.0 // the record's own composition
		if f.Unit == thermo.GPerKg {
			salinity = f.Concentration
		}
		f.Ions = r.IonsAt(salinity)
	} else {
		if fs.Solute == "" {
			return f, nil, Invalid("feed", nil, "a feed needs a preset or a solute (e.g. {\"solute\": \"seawater\", \"concentration\": 35, \"unit\": \"g/kg\"})")
		}
		s, err := scenario.LookupSolute("feed.solute", fs.Solute)
		if err != nil {
			return f, nil, fromEngine("", err)
		}
		v, u, err := scenario.ParseConcentration("feed", fs.Concentration, fs.Unit)
		if err != nil {
			return f, nil, fromEngine("", err)
		}
		f.Solute, f.Concentration, f.Unit = s, v, u
		f.OsmoticMethod = fmt.Sprintf("library solute %s at %g %s", s.ID, v, u)
		for i, ion := range fs.Ions {
			if ion.Symbol == "" || ion.Charge == 0 || !scenario.FeedIonMolarMass.Contains(ion.MolarMassGPerMol) || !scenario.FeedIonMgPerL.Contains(ion.MgPerL) {
				return f, nil, Invalid(fmt.Sprintf("feed.ions[%d]", i), nil, "an ion needs a symbol, a non-zero charge, molar_mass_g_per_mol %s and mg_per_l %s",
					scenario.FeedIonMolarMass.Text(), scenario.FeedIonMgPerL.Text())
			}
			f.Ions = append(f.Ions, library.IonAmount{Symbol: ion.Symbol, Charge: ion.Charge, Mol: ion.MgPerL / ion.MolarMassGPerMol / 1000})
		}
		if fs.Ions == nil && v > 0 {
			// The solute's own ions at its molarity; seawater: the
			// Reference Composition scaled to its salinity.
			x, err := thermo.NewSolution(s, tK)
			if err != nil {
				return f, nil, fromEngine("feed", err)
			}
			mm, err := x.ToMolality(v, u)
			if err != nil {
				return f, nil, fromEngine("feed", err)
			}
			if s.Osmotic.Kind == library.ModelSeawater {
				if r, ok := library.LookupFeed("seawater"); ok && r.ReferenceSalinityGPerKg > 0 {
					f.IonsPerKg = true
					f.Ions = r.IonsAt(x.FromMolality(mm, thermo.GPerKg))
				}
			} else {
				c := x.MolarityMolPerM3(mm) / 1000
				for _, ion := range s.Ions {
					f.Ions = append(f.Ions, library.IonAmount{Symbol: ion.Symbol, Charge: ion.Charge, Mol: c * float64(ion.Count)})
				}
			}
		}
	}
	if fs.PH != nil {
		if err := scenario.FeedPH.Check(*fs.PH); err != nil {
			return f, nil, fromEngine("", err)
		}
		f.PH = *fs.PH
	}
	return f, rec, nil
}

func resolveBasis(b *BasisSpec, feedHasPi bool) (screen.Basis, *Error) {
	if b == nil {
		if feedHasPi {
			return screen.Basis{Kind: screen.BasisOsmoticPressure, MultipleOfFeed: scenario.BasisMultiple.Default}, nil
		}
		return screen.Basis{Kind: screen.BasisOsmoticPressure, PiPa: scenario.BasisPressure.Default * thermo.PascalPerBar}, nil
	}
	kinds := []string{"osmotic-pressure", "concentration", "water-flux"}
	val := func() (float64, *Error) {
		if b.Value == nil {
			return 0, Invalid("basis.value", "> 0", "the basis needs a value")
		}
		v := *b.Value
		if !(v > 0) || math.IsInf(v, 0) {
			return 0, Invalid("basis.value", "> 0", "the basis value must be positive and finite (got %g)", v)
		}
		return v, nil
	}
	switch strings.ToLower(b.Kind) {
	case "osmotic-pressure":
		if b.MultipleOfFeed != nil {
			k := *b.MultipleOfFeed
			if b.Value != nil {
				return screen.Basis{}, Invalid("basis.multiple_of_feed", nil, "give either value (with unit) or multiple_of_feed, not both")
			}
			if !(k > 1) || math.IsInf(k, 0) {
				return screen.Basis{}, Invalid("basis.multiple_of_feed", "> 1", "the multiple of the feed's osmotic pressure must exceed 1 (got %g)", k)
			}
			if !feedHasPi {
				return screen.Basis{}, Invalid("basis.multiple_of_feed", nil, "the feed has no osmotic pressure; give the target in bar instead")
			}
			return screen.Basis{Kind: screen.BasisOsmoticPressure, MultipleOfFeed: k}, nil
		}
		v, e := val()
		if e != nil {
			return screen.Basis{}, e
		}
		unit := b.Unit
		if unit == "" {
			unit = "bar"
		}
		f, ok := pressureUnits[strings.ToLower(unit)]
		if !ok {
			return screen.Basis{}, Invalid("basis.unit", pressureUnitNames, "unknown pressure unit %q", b.Unit)
		}
		return screen.Basis{Kind: screen.BasisOsmoticPressure, PiPa: v * f}, nil
	case "concentration":
		v, e := val()
		if e != nil {
			return screen.Basis{}, e
		}
		if b.Unit == "" {
			return screen.Basis{}, Invalid("basis.unit", thermo.UnitNames(), "a concentration basis needs a unit")
		}
		u, err := thermo.ParseUnit(b.Unit)
		if err != nil {
			return screen.Basis{}, Invalid("basis.unit", thermo.UnitNames(), "%v", err)
		}
		return screen.Basis{Kind: screen.BasisConcentration, Concentration: v, Unit: u}, nil
	case "water-flux":
		v, e := val()
		if e != nil {
			return screen.Basis{}, e
		}
		switch strings.ToLower(b.Unit) {
		case "", "lmh":
			v *= thermo.MPerSPerLMH
		case "m/s":
		default:
			return screen.Basis{}, Invalid("basis.unit", []string{"LMH", "m/s"}, "unknown flux unit %q", b.Unit)
		}
		if !(v < 1e-3) {
			return screen.Basis{}, Invalid("basis.value", "< 3600 LMH", "the target water flux is beyond any FO membrane")
		}
		return screen.Basis{Kind: screen.BasisWaterFlux, JwMPerS: v}, nil
	}
	return screen.Basis{}, Invalid("basis.kind", kinds, "unknown basis kind %q", b.Kind)
}

// customSolute builds a van 't Hoff-only library record from a user's
// definition.
func customSolute(i int, cs *CustomSolute, lib *library.Library) (*library.Solute, *Error) {
	field := func(f string) string { return fmt.Sprintf("custom_solutes[%d].%s", i, f) }
	if strings.TrimSpace(cs.ID) == "" {
		return nil, Invalid(field("id"), nil, "a custom solute needs an id")
	}
	if _, clash := lib.Lookup(cs.ID); clash {
		return nil, Invalid(field("id"), nil, "%q is already a library solute; choose another id", cs.ID)
	}
	if !(cs.MolarMassGPerMol > 0 && cs.MolarMassGPerMol < 1e7) {
		return nil, Invalid(field("molar_mass_g_per_mol"), "> 0", "a positive molar mass is required")
	}
	if !(cs.DiffusivityM2PerS > 0 && cs.DiffusivityM2PerS < 1e-8) {
		return nil, Invalid(field("diffusivity_m2_per_s"), "(0, 1e-8) m²/s", "a diffusion coefficient in (0, 1e-8) m²/s is required")
	}
	s := &library.Solute{ID: cs.ID, Name: cs.Name, Family: "custom", Formula: cs.ID, MolarMassGPerMol: cs.MolarMassGPerMol,
		HazardFlags: cs.HazardFlags, Hazards: []string{}, Regeneration: []string{}, Aliases: []string{}}
	if s.Name == "" {
		s.Name = cs.ID + " (user-defined)"
	}
	for _, ion := range cs.Ions {
		s.Ions = append(s.Ions, library.Ion{Symbol: ion.Symbol, Charge: ion.Charge, Count: ion.Count})
	}
	s.Osmotic = library.OsmoticModel{Kind: library.ModelNone, Reason: "user-defined solute: van 't Hoff osmotic pressure only",
		VantHoffNu: cs.VantHoffFactor}
	if cs.VantHoffFactor < 0 || cs.VantHoffFactor > 10 {
		return nil, Invalid(field("van_t_hoff_factor"), "0–10", "van_t_hoff_factor = %g is outside 0–10", cs.VantHoffFactor)
	}
	if t := cs.PiTable; t != nil {
		if _, err := thermo.ParseUnit(t.Unit); err != nil || t.Unit == thermo.OsmolPerKg.String() {
			return nil, Invalid(field("pi_table.unit"), []string{"mol/kg", "mol/L", "g/L", "g/kg", "wt%"}, "unknown table unit %q", t.Unit)
		}
		if !(t.TemperatureC >= thermo.MinTemperatureC && t.TemperatureC <= thermo.MaxTemperatureC) {
			return nil, Invalid(field("pi_table.temperature_c"), "0–100 °C", "table temperature %g °C is outside 0–100 °C", t.TemperatureC)
		}
		if len(t.Points) < 2 || len(t.Points) > 1000 {
			return nil, Invalid(field("pi_table.points"), "2–1000 points", "a measured table needs 2 to 1000 points")
		}
		prevC, prevP := 0.0, 0.0
		for j, p := range t.Points {
			if !(p.Concentration > prevC) || !(p.OsmoticPressureBar > prevP) || math.IsInf(p.Concentration, 0) || p.OsmoticPressureBar > 1e4 {
				return nil, Invalid(fmt.Sprintf("custom_solutes[%d].pi_table.points[%d]", i, j), "increasing, positive",
					"concentration and osmotic pressure must both be positive and increase from point to point")
			}
			prevC, prevP = p.Concentration, p.OsmoticPressureBar
		}
		s.Osmotic = library.OsmoticModel{Kind: library.ModelTable, Table: t, VantHoffNu: cs.VantHoffFactor}
	}
	switch {
	case cs.Miscible:
		s.Solubility.Miscible = true
	case cs.SolubilityMolPerKg != nil && *cs.SolubilityMolPerKg > 0:
		s.Solubility.Points = []library.SolubilityPoint{{TemperatureC: 25, MolalityMolPerKg: *cs.SolubilityMolPerKg}}
	default:
		return nil, Invalid(field("solubility_mol_per_kg"), "> 0", "give solubility_mol_per_kg (or miscible: true)")
	}
	s.Diffusivity.D0M2PerS = cs.DiffusivityM2PerS
	if cs.PriceUSDPerKgMin != nil || cs.PriceUSDPerKgMax != nil {
		if cs.PriceUSDPerKgMin == nil || cs.PriceUSDPerKgMax == nil {
			return nil, Invalid(field("price_usd_per_kg_max"), nil, "give both price_usd_per_kg_min and price_usd_per_kg_max")
		}
		s.Price = &library.Price{USDPerKgMin: *cs.PriceUSDPerKgMin, USDPerKgMax: *cs.PriceUSDPerKgMax}
	}
	src := cs.Source
	if src == "" {
		src = "user-defined (no source given)"
	}
	s.Sources = map[string]string{"record": src}
	if err := s.Validate(); err != nil {
		return nil, Invalid(fmt.Sprintf("custom_solutes[%d]", i), nil, "%v", err)
	}
	return s, nil
}

func resolveSweep(sw *SweepSpec) (screen.SweepSpec, *Error) {
	spec := screen.SweepSpec{From: sw.From, To: sw.To, Points: sw.Points}
	switch strings.ToLower(sw.Variable) {
	case "concentration":
		spec.Variable = screen.SweepConcentration
		if sw.Unit == "" {
			return spec, Invalid("sweep.unit", thermo.UnitNames(), "a concentration sweep needs a unit")
		}
		u, err := thermo.ParseUnit(sw.Unit)
		if err != nil {
			return spec, Invalid("sweep.unit", thermo.UnitNames(), "%v", err)
		}
		spec.Unit = u
	case "temperature":
		spec.Variable = screen.SweepTemperature
		spec.From += thermo.ZeroCelsiusK
		spec.To += thermo.ZeroCelsiusK
	case "s":
		spec.Variable = screen.SweepS
		spec.From *= 1e-6
		spec.To *= 1e-6
	case "crossflow":
		spec.Variable = screen.SweepCrossflow
	default:
		return spec, Invalid("sweep.variable", []string{"concentration", "temperature", "s", "crossflow"}, "unknown sweep variable %q", sw.Variable)
	}
	return spec, nil
}

func sweepSeries(series []screen.SweepSeries, sw *SweepSpec) []SweepSeries {
	unit := map[string]string{"temperature": "°C", "s": "µm", "crossflow": "m/s"}[strings.ToLower(sw.Variable)]
	if unit == "" {
		unit = sw.Unit
	}
	out := make([]SweepSeries, len(series))
	for i, s := range series {
		o := SweepSeries{Solute: s.Solute.ID, Orientation: s.Orientation.String(), Variable: strings.ToLower(sw.Variable), Unit: unit,
			Points: make([]SweepPoint, len(s.Points))}
		for j, p := range s.Points {
			x := sw.From + (sw.To-sw.From)*float64(j)/float64(len(s.Points)-1)
			q := SweepPoint{X: x, Reason: p.Reason}
			if m := p.Metrics; m != nil {
				q.ConcentrationMolPerL = ptr(m.MolarityMolPerM3 / 1000)
				q.OsmoticPressureBar = ptr(m.PiPa / thermo.PascalPerBar)
				q.WaterFluxLMH = ptr(screen.LMH(m.JwMPerS))
				q.SpecificReverseSoluteFluxGPerL = ptr(m.SRSFKgPerM3)
				q.FluxEfficiency = ptr(m.FluxEfficiency)
				if m.HasCost {
					q.ReplenishmentCostUSDPerM3 = ptr(m.CostMidUSDPerM3())
				}
				q.ViscosityMPaS = ptr(m.ViscosityPaS * 1e3)
				q.MinRegenerationEnergyKWhPerM3 = ptr(screen.KWhPerM3(m.RegenJPerM3))
				if m.Scaling.Any {
					q.MaxSaturationIndex = ptr(m.Scaling.Max)
				}
			}
			o.Points[j] = q
		}
		out[i] = o
	}
	return out
}

func ptr(v float64) *float64 { return &v }

func fluxMetrics(m *screen.Metrics) FluxMetrics {
	f := FluxMetrics{
		Orientation:                       m.Orientation.String(),
		WaterFluxLMH:                      screen.LMH(m.JwMPerS),
		ReverseSoluteFluxMmolPerM2H:       m.JsMolPerM2S * 3600 * 1e3,
		SpecificReverseSoluteFluxGPerL:    m.SRSFKgPerM3,
		SpecificReverseSoluteFluxMmolPerL: m.SRSFMolPerM3,
		FluxEfficiency:                    m.FluxEfficiency,
		SurfaceIonicStrengthMolPerL:       m.Scaling.IonicStrengthMolPerL,
		Scaling:                           []ScalingIndex{},
	}
	if m.MolarityMolPerM3 > 0 {
		f.ReverseSoluteFluxGMH = m.JsMolPerM2S * 3600 * (m.MassConcKgPerM3 / m.MolarityMolPerM3) * 1e3
	}
	if m.HasCost {
		f.ReplenishmentCostUSDPerM3 = ptr(m.CostMidUSDPerM3())
		f.ReplenishmentCostMinUSDPerM3 = ptr(m.CostMinUSDPerM3)
		f.ReplenishmentCostMaxUSDPerM3 = ptr(m.CostMaxUSDPerM3)
	}
	for k := screen.Mineral(0); k < screen.NumMinerals; k++ {
		if m.Scaling.Has[k] {
			f.Scaling = append(f.Scaling, ScalingIndex{Mineral: k.Name(), Formula: k.Formula(), SaturationIndex: m.Scaling.SI[k]})
		}
	}
	if m.Scaling.Any {
		f.MaxSaturationIndex = ptr(m.Scaling.Max)
	}
	return f
}

func buildScreenResponse(req *ScreenRequest, sc *screen.Scenario, info *scenarioInfo, res *screen.Result) *ScreenResponse {
	resp := &ScreenResponse{
		Orientation:            sc.Orientations[0].String(),
		FeedOsmoticPressureBar: res.FeedPiPa / thermo.PascalPerBar,
		Weights:                map[string]float64{},
		Warnings:               warn.Strings(res.Warnings),
		Cautions:               ScreenCautions,
		Scenario:               req,
		EngineVersion:          EngineVersion,
		Candidates:             []ScreenCandidate{},
		Excluded:               []ScreenExcluded{},
	}
	for o := screen.Objective(0); o < screen.NumObjectives; o++ {
		resp.Weights[o.Key()] = sc.Weights[o]
	}
	for _, o := range sc.Pareto {
		resp.ParetoObjectives = append(resp.ParetoObjectives, o.Key())
	}
	switch sc.Basis.Kind {
	case screen.BasisOsmoticPressure:
		resp.Basis = BasisReport{Kind: "osmotic-pressure", TargetOsmoticPressureBar: ptr(res.TargetPiPa / thermo.PascalPerBar)}
	case screen.BasisConcentration:
		resp.Basis = BasisReport{Kind: "concentration", Concentration: ptr(sc.Basis.Concentration), Unit: sc.Basis.Unit.String()}
	case screen.BasisWaterFlux:
		resp.Basis = BasisReport{Kind: "water-flux", TargetWaterFluxLMH: ptr(screen.LMH(sc.Basis.JwMPerS))}
	}
	kinds := map[string]bool{}
	for _, r := range res.Ranked {
		m := &r.Metrics
		c := ScreenCandidate{
			Solute: r.Solute.ID, Name: r.Solute.Name, Rank: r.Rank, Score: r.Score, ParetoOptimal: r.Pareto,
			Contributions: map[string]float64{}, Normalised: map[string]float64{},
			ConcentrationMolPerL:          m.MolarityMolPerM3 / 1000,
			ConcentrationGPerL:            m.MassConcKgPerM3,
			MolalityMolPerKg:              m.MolalityMolPerKg,
			SolubilityMarginFraction:      m.SolubilityMargin,
			OsmoticPressureBar:            m.PiPa / thermo.PascalPerBar,
			VantHoffBar:                   m.VantHoffPa / thermo.PascalPerBar,
			FluxMetrics:                   fluxMetrics(m),
			ViscosityMPaS:                 m.ViscosityPaS * 1e3,
			MinRegenerationEnergyKWhPerM3: screen.KWhPerM3(m.RegenJPerM3),
			BLMH:                          r.BMPerS / thermo.MPerSPerLMH,
			BEstimated:                    r.BEstimated,
			HazardFlags:                   append([]string{}, r.Solute.HazardFlags...),
			Warnings:                      warn.Strings(r.Warnings),
		}
		if !math.IsInf(m.SolubilityMolPerKg, 1) {
			c.SolubilityMolPerKg = ptr(m.SolubilityMolPerKg)
		}
		if m.MolarityMolPerM3 > 0 {
			cL := m.MolarityMolPerM3 / 1000
			c.OsmoticPressurePerMolarityBarLPerMol = c.OsmoticPressureBar / cL
			c.VantHoffPerMolarityBarLPerMol = c.VantHoffBar / cL
			c.OsmoticPressurePerMassBarLPerG = c.OsmoticPressureBar / m.MassConcKgPerM3
			c.VantHoffPerMassBarLPerG = c.VantHoffBar / m.MassConcKgPerM3
		}
		if r.HasPrice {
			c.PriceUSDPerKgMin, c.PriceUSDPerKgMax = ptr(r.PriceMin), ptr(r.PriceMax)
		}
		for o := screen.Objective(0); o < screen.NumObjectives; o++ {
			if sc.Weights[o] > 0 {
				c.Contributions[o.Key()] = r.Contributions[o]
			}
			c.Normalised[o.Key()] = r.Normalised[o]
		}
		for _, oo := range r.Other {
			if oo.Metrics == nil {
				c.OtherOrientations = append(c.OtherOrientations, FluxMetrics{Orientation: oo.Orientation.String(), Reason: oo.Reason, Scaling: []ScalingIndex{}})
				continue
			}
			c.OtherOrientations = append(c.OtherOrientations, fluxMetrics(oo.Metrics))
		}
		if rb := r.Robustness; rb != nil {
			c.Robustness = &CandidateRobustness{ProbabilityFirst: rb.PFirst, ProbabilityTop3: rb.PTop3,
				RankP05: rb.RankP05, RankMedian: rb.RankMedian, RankP95: rb.RankP95, FailedFraction: rb.FailedFraction}
		}
		resp.Candidates = append(resp.Candidates, c)
		kinds[r.Solute.Osmotic.Kind] = true
	}
	for _, x := range res.Excluded {
		resp.Excluded = append(resp.Excluded, ScreenExcluded{Solute: x.Solute.ID, Reason: x.Reason, Detail: x.Detail})
	}
	if u := sc.Uncertainty; u != nil && res.Samples > 0 {
		resp.Robustness = &RobustnessReport{Samples: res.Samples, Seed: sc.Seed, Distributions: fmt.Sprintf(
			"log-normal factors with median 1 (σ_ln = √ln(1+rsd²)): A %.3g, B %.3g, S %.3g (one draw per sample, shared by all candidates), "+
				"π per candidate %s, D per candidate %.3g, estimated B per candidate %.3g (on top of the shared B); prices %s; "+
				"PCG stream (math/rand/v2) seeded with the scenario seed, gonum stat/distuv; rank quantiles empirical",
			u.ARelSD, u.BRelSD, u.SRelSD, osmoticSDText(u), u.DiffusivityRelSD, u.EstimatedBRelSD, priceText(u.Prices))}
	}
	model := "real (non-ideal) osmotic pressure"
	if sc.VantHoff {
		model = "van 't Hoff (ideal dilute) osmotic pressure, π = ν c R T"
	}
	resp.ModelChoices = map[string]string{
		"osmotic_model":       model,
		"flux_model":          "water and reverse solute flux with ICP in the support and ECP on both faces (engine/transport); interface concentrations from the exponential profiles, π from the real model",
		"solute_permeability": info.bRule,
		"mass_transfer":       info.kRule,
		"feed_osmotic":        sc.Feed.OsmoticMethod,
		"scaling":             screen.ScalingMethod,
		"regeneration_energy": fmt.Sprintf("minimum (reversible) work to recover %.0f %% of the diluted draw's water: W/V = (1/r)∫₀ʳ π dr′, π = −(RT/V̄w) ln aw along the re-concentration", 100*sc.RegenerationRecovery),
		"replenishment_cost":  "specific reverse solute flux (g/L = kg/m³) × bulk price (USD/kg) = USD per m³ of product water; the price range carried through as min–max, the mid value scored",
		"normalisation":       "min–max per objective over the ranked candidates, 1 = best; score = Σ weight × normalised value / Σ weights",
		"pareto":              "non-dominated set on the chosen objectives (unknown values count as worst)",
		"validity":            map[bool]string{false: "candidates needed above their osmotic model's data limit are excluded", true: "candidates above their osmotic model's data limit are kept and flagged"}[sc.AllowExtrapolation],
		"json_library":        "see health operation",
	}
	delete(resp.ModelChoices, "json_library")
	resp.Sources = append(resp.Sources, fluxSources...)
	kk := make([]string, 0, len(kinds))
	for k := range kinds {
		kk = append(kk, k)
	}
	sort.Strings(kk)
	if !sc.VantHoff {
		for _, k := range kk {
			resp.Sources = append(resp.Sources, modelSources[k]...)
		}
	}
	resp.Sources = append(resp.Sources, commonSources...)
	resp.Sources = append(resp.Sources,
		Source{Field: "screen.protocol", Reference: "Achilli, Cath & Childress (2010) J. Membr. Sci. 364:233 (draw-solute screening: flux, reverse salt flux, replenishment cost)"},
		Source{Field: "screen.srsf", Reference: "Phillip, Yong & Elimelech (2010) Environ. Sci. Technol. 44:5170 (Js/Jw = B/(A·ν·R·T) for van 't Hoff draws)"},
		Source{Field: "screen.regeneration_energy", Reference: "Elimelech & Phillip (2011) Science 333:712 (minimum energy of separation)"},
		Source{Field: "screen.scaling.activity", Reference: "Davies (1962) Ion Association (Davies equation)"},
		Source{Field: "screen.scaling.ksp", Reference: "Ball & Nordstrom (1991) USGS Open-File Report 91-183 (WATEQ4F); Parkhurst & Appelo (2013) PHREEQC version 3, USGS Techniques and Methods 6-A43"},
	)
	if r := info.membraneRec; r != nil {
		resp.Sources = append(resp.Sources, sortedSources("membrane."+r.ID, r.Sources)...)
	}
	if r := info.feedRec; r != nil {
		resp.Sources = append(resp.Sources, sortedSources("feed."+r.ID, r.Sources)...)
	}
	for _, r := range res.Ranked {
		resp.Sources = append(resp.Sources, soluteSources(r.Solute)...)
	}
	return resp
}

func osmoticSDText(u *screen.Uncertainty) string {
	if u.DefaultOsmotic {
		return fmt.Sprintf("%.3g (%.3g for van 't Hoff-only records)", screen.DefaultOsmoticRelSD, screen.DefaultVantHoffRelSD)
	}
	return fmt.Sprintf("%.3g", u.OsmoticRelSD)
}

func priceText(p bool) string {
	if p {
		return "uniform within each solute's range"
	}
	return "held at the mid price"
}

func sortedSources(prefix string, m map[string]string) []Source {
	keys := make([]string, 0, len(m))
	for k := range m {
		keys = append(keys, k)
	}
	sort.Strings(keys)
	out := make([]Source, 0, len(keys))
	for _, k := range keys {
		out = append(out, Source{Field: prefix + "." + k, Reference: m[k]})
	}
	return out
}
