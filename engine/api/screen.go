package api

import (
	"context"
	"errors"
	"fmt"
	"math"
	"sort"
	"strings"

	"drawsift/engine/errs"
	"drawsift/engine/library"
	"drawsift/engine/scenario"
	"drawsift/engine/screen"
	"drawsift/engine/thermo"
	"drawsift/engine/warn"
)

// ScreenResponse is the ranked screen.
type ScreenResponse struct {
	Candidates             []ScreenCandidate `json:"candidates"`
	Excluded               []ScreenExcluded  `json:"excluded"`
	Orientation            string            `json:"orientation"`
	Basis                  BasisReport       `json:"basis"`
	FeedOsmoticPressureBar float64           `json:"feed_osmotic_pressure_bar"`
	// FeedSaturationIndices: log10(IAP/Ksp) of each mineral in the bulk
	// feed, keyed by lower-case mineral name.
	FeedSaturationIndices map[string]float64 `json:"feed_saturation_indices"`
	Weights               map[string]float64 `json:"weights"`
	ParetoObjectives      []string           `json:"pareto_objectives"`
	Robustness            *RobustnessReport  `json:"robustness,omitempty"`
	// System restates the plant of the system stage (a "system" object or
	// basis).
	System   *SystemReport `json:"system,omitempty"`
	Warnings []string      `json:"warnings"`
	Cautions []string      `json:"cautions"`
	// ScoreNormalisation is how the metrics were scaled: "set" (min–max
	// over the ranked candidates) or "reference" (against ScoreReference).
	ScoreNormalisation string          `json:"score_normalisation"`
	ScoreReference     *ScoreReference `json:"score_reference,omitempty"`
	// What reproduces the run.
	Scenario      *ScreenRequest    `json:"scenario"`
	ModelChoices  map[string]string `json:"model_choices"`
	Sources       []Source          `json:"sources"`
	EngineVersion string            `json:"engine_version"`
	// Sweep comes last, so that ScreenStream can write it one series at a
	// time after the rest (the same bytes as one encoding).
	Sweep []SweepSeries `json:"sweep,omitempty"`
}

// BasisReport restates the basis as applied.
type BasisReport struct {
	Kind                     string   `json:"kind"`
	TargetOsmoticPressureBar *float64 `json:"target_osmotic_pressure_bar,omitempty"`
	Concentration            *float64 `json:"concentration,omitempty"`
	Unit                     string   `json:"unit,omitempty"`
	TargetWaterFluxLMH       *float64 `json:"target_water_flux_lmh,omitempty"`
}

// ScoreReference is the reference draw the "reference" normalisation
// scores against: its concentration at the basis and its value of every
// objective (in the objective's unit, as in the defaults' objectives).
type ScoreReference struct {
	Solute               string             `json:"solute"`
	ConcentrationMolPerL float64            `json:"concentration_mol_per_l"`
	Values               map[string]float64 `json:"values"`
}

// RobustnessReport describes the Monte Carlo run.
type RobustnessReport struct {
	Samples       int    `json:"samples"` // the samples this run evaluated
	Seed          uint64 `json:"seed"`
	Distributions string `json:"distributions"`
	// Shard: this run is one part of a run split by uncertainty.shard
	// (its figures are over its own samples); robustness-merge adds the
	// parts into the whole run's answer.
	Shard *RobustnessShard `json:"shard,omitempty"`
}

// RobustnessShard names the part a sharded run evaluated.
type RobustnessShard struct {
	Index int `json:"index"`
	Count int `json:"count"`
	// SamplesAll is the whole run's number of samples (uncertainty.samples).
	SamplesAll int `json:"samples_all"`
}

// FluxMetrics are the orientation-dependent metrics.
type FluxMetrics struct {
	Orientation                       string  `json:"orientation"`
	WaterFluxLMH                      float64 `json:"water_flux_lmh"`
	ReverseSoluteFluxGMH              float64 `json:"reverse_solute_flux_gmh"`
	ReverseSoluteFluxMmolPerM2H       float64 `json:"reverse_solute_flux_mmol_per_m2_h"`
	SpecificReverseSoluteFluxGPerL    float64 `json:"specific_reverse_solute_flux_g_per_l"`
	SpecificReverseSoluteFluxMmolPerL float64 `json:"specific_reverse_solute_flux_mmol_per_l"`
	// The SRSF above is net (net_draw_loss_g_per_l: species by identity, a
	// shared ion partly comes back); the gross value counts the one-way
	// flux toward the feed, and the feed gain the feed's own species
	// entering the draw, per litre of water.
	NetDrawLossGPerL             float64        `json:"net_draw_loss_g_per_l"`
	GrossDrawLossGPerL           float64        `json:"gross_draw_loss_g_per_l"`
	FeedGainGPerL                float64        `json:"feed_gain_g_per_l"`
	FluxEfficiency               float64        `json:"flux_efficiency"`
	ReplenishmentCostUSDPerM3    *float64       `json:"replenishment_cost_usd_per_m3,omitempty"`
	ReplenishmentCostMinUSDPerM3 *float64       `json:"replenishment_cost_min_usd_per_m3,omitempty"`
	ReplenishmentCostMaxUSDPerM3 *float64       `json:"replenishment_cost_max_usd_per_m3,omitempty"`
	Scaling                      []ScalingIndex `json:"scaling"`
	MaxSaturationIndex           *float64       `json:"max_saturation_index,omitempty"`
	SurfaceIonicStrengthMolPerL  float64        `json:"surface_ionic_strength_mol_per_l"`
	Reason                       string         `json:"reason,omitempty"`
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
	// Trust marks what makes the row less certain than a row computed
	// from measured data within its range (empty when nothing does).
	Trust []TrustMark `json:"trust"`
	// System is the candidate at plant scale (a "system" object or
	// basis); SystemReason says why it could not be rated.
	System       *SystemMetrics `json:"system,omitempty"`
	SystemReason string         `json:"system_reason,omitempty"`
}

// TrustMark is one reason to trust a ranked row less: a stable code and
// the words a person reads (the row's warnings give the detail).
type TrustMark struct {
	Code string `json:"code"`
	Text string `json:"text"`
}

// trustTexts are the trust codes and their texts, in the order rows list them.
var trustTexts = [...]TrustMark{
	{"van-t-hoff", "van 't Hoff only: no non-ideal osmotic model on record for this solute"},
	{"ideal-model", "ideal osmotic model (π = νcRT) chosen for the whole screen"},
	{"extrapolated", "used past its model's data or fit range (extrapolated)"},
	{"bridged", "between the model's data limit and the measured saturated solution (interpolated)"},
	{"temperature-25c", "25 °C data used at another temperature"},
	{"b-estimated", "solute permeability B estimated from the membrane's NaCl value"},
	{"blend", "blend transported as one solute at its fixed ratio"},
	{"custom", "custom solute: data entered by the user"},
	{"solubility", "near or past its solubility somewhere in the module"},
	{"crossing", "feed solute crosses into the draw or water flows back: flux ratios leave their usual range"},
	{"no-price", "no price on record: scored worst on replenishment cost"},
}

// TrustCodes lists every trust code with its text, in order.
func TrustCodes() []TrustMark { return append([]TrustMark(nil), trustTexts[:]...) }

// trustMarks gives the row's marks: from its record, its B and the codes
// of its warnings (one pass).
func trustMarks(r *screen.Ranked, vantHoff bool) []TrustMark {
	var has [len(trustTexts)]bool
	has[0] = r.Solute.Osmotic.Kind == library.ModelNone
	has[1] = vantHoff
	has[5] = r.BEstimated
	has[6] = r.Solute.IsBlend()
	has[7] = r.Solute.Family == "custom"
	has[10] = !r.HasPrice
	for _, w := range r.Warnings {
		switch w.Code {
		case warn.NoModel:
			has[0] = true
		case warn.Extrapolated:
			has[2] = true
		case warn.Bridged:
			has[3] = true
		case warn.Temperature25C:
			has[4] = true
		case warn.Solubility:
			has[8] = true
		case warn.FeedToDraw, warn.ReverseFlow:
			has[9] = true
		}
	}
	out := []TrustMark{}
	for i, h := range has {
		if h {
			out = append(out, trustTexts[i])
		}
	}
	return out
}

// CandidateRobustness is the candidate's rank statistics over the samples.
type CandidateRobustness struct {
	ProbabilityFirst float64 `json:"probability_first"`
	ProbabilityTop3  float64 `json:"probability_top3"`
	RankP05          int     `json:"rank_p05"`
	RankMedian       int     `json:"rank_median"`
	RankP95          int     `json:"rank_p95"`
	FailedFraction   float64 `json:"failed_fraction"`
	// RankCounts[r-1] counts the samples in which it ranked r; the last
	// entry (one past the ranked candidates) those in which it failed.
	RankCounts []int `json:"rank_counts"`
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

// ScreenCautions are shown with every screen, flux and osmotic answer.
var ScreenCautions = []string{
	"Screening estimates, not a design: verify with experiments on the actual membrane and waters.",
	"FO product water is not potable without post-treatment and must meet local drinking-water and discharge rules.",
	"Handle each chemical per its safety data sheet (oxidisers, ammonia release on heating, toxicity); defer to local codes and licensed practice.",
}

// The scenario document's types (engine/scenario), under the contract's names.
type (
	ScreenRequest   = scenario.Spec
	FeedSpec        = scenario.FeedSpec
	IonSpec         = scenario.IonSpec
	BasisSpec       = scenario.BasisSpec
	UncertaintySpec = scenario.UncertaintySpec
	SweepSpec       = scenario.SweepSpec
	CustomSolute    = scenario.CustomSolute
	CustomIon       = scenario.CustomIon
	Candidate       = scenario.Candidate
	BlendPart       = scenario.BlendPart
	MixturePart     = scenario.MixturePart
)

// Screen ranks the scenario's candidates. progress, if not nil, receives
// (done, total) Monte Carlo samples.
func Screen(ctx context.Context, req *ScreenRequest, progress func(done, total int)) (*ScreenResponse, *Error) {
	resp, sc, e := screenRanked(ctx, req, progress)
	if e != nil {
		return nil, e
	}
	if req.Sweep != nil {
		spec, err := scenario.ResolveSweep(req.Sweep)
		if err != nil {
			return nil, fromEngine("", err)
		}
		lib, _ := library.Default()
		series, err := screen.Sweep(ctx, sc, lib, spec)
		if err != nil {
			return nil, fromEngine("", err)
		}
		resp.Sweep = sweepSeries(series, req.Sweep)
	}
	return resp, nil
}

// screenRanked is a screen without its sweep: the ranking, the system
// stage, and the resolved scenario the sweep runs on.
func screenRanked(ctx context.Context, req *ScreenRequest, progress func(done, total int)) (*ScreenResponse, *screen.Scenario, *Error) {
	sc, info, err := scenario.Resolve(req)
	if err != nil {
		return nil, nil, fromEngine("", err)
	}
	lib, _ := library.Default()
	res, err := screen.Run(ctx, sc, lib, progress)
	if err != nil {
		if errors.Is(err, context.DeadlineExceeded) {
			return nil, nil, deadlineError()
		}
		if errors.Is(err, context.Canceled) {
			return nil, nil, &Error{Field: "", Message: "screen cancelled: " + err.Error(), Kind: KindInvalid}
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
			return nil, nil, ae
		}
		return nil, nil, fromEngine("", err)
	}
	resp := buildScreenResponse(req, sc, info, res)
	if info.SystemBasis || req.System != nil {
		if info.SystemBasis {
			resp.Basis.Kind = "system"
		}
		if e := systemStage(ctx, req, info, resp, progress); e != nil {
			return nil, nil, e
		}
	}
	return resp, sc, nil
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
				q.ViscosityMPaS = ptr(m.ViscosityPaS * thermo.MPaSPerPaS)
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
		ReverseSoluteFluxMmolPerM2H:       m.JsMolPerM2S * thermo.MmolPerM2HPerMolPerM2S,
		SpecificReverseSoluteFluxGPerL:    m.SRSFKgPerM3,
		SpecificReverseSoluteFluxMmolPerL: m.SRSFMolPerM3,
		NetDrawLossGPerL:                  m.SRSFKgPerM3,
		GrossDrawLossGPerL:                m.GrossSRSFKgPerM3,
		FeedGainGPerL:                     m.FeedGainKgPerM3,
		FluxEfficiency:                    m.FluxEfficiency,
		SurfaceIonicStrengthMolPerL:       m.Scaling.IonicStrengthMolPerL,
		Scaling:                           []ScalingIndex{},
	}
	if m.MolarityMolPerM3 > 0 {
		f.ReverseSoluteFluxGMH = m.JsMolPerM2S * (m.MassConcKgPerM3 / m.MolarityMolPerM3) * thermo.GPerM2HPerKgPerM2S
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

func buildScreenResponse(req *ScreenRequest, sc *screen.Scenario, info *scenario.Info, res *screen.Result) *ScreenResponse {
	resp := &ScreenResponse{
		Orientation:            sc.Orientations[0].String(),
		FeedOsmoticPressureBar: res.FeedPiPa / thermo.PascalPerBar,
		FeedSaturationIndices:  map[string]float64{},
		Weights:                map[string]float64{},
		Warnings:               warn.Strings(res.Warnings),
		Cautions:               ScreenCautions,
		Scenario:               req,
		EngineVersion:          EngineVersion,
		Candidates:             []ScreenCandidate{},
		Excluded:               []ScreenExcluded{},
	}
	resp.ScoreNormalisation = screen.ScoreNormalisationNames[sc.Normalisation]
	if ref := res.Reference; ref != nil {
		sr := &ScoreReference{Solute: ref.Solute.ID, ConcentrationMolPerL: ref.Metrics.MolarityMolPerM3 / 1000, Values: map[string]float64{}}
		for o := screen.Objective(0); o < screen.NumObjectives; o++ {
			if ref.Known[o] {
				sr.Values[o.Key()] = ref.Values[o]
			}
		}
		resp.ScoreReference = sr
	}
	for k := screen.Mineral(0); k < screen.NumMinerals; k++ {
		if res.FeedScaling.Has[k] {
			resp.FeedSaturationIndices[k.Name()] = res.FeedScaling.SI[k]
		}
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
			ViscosityMPaS:                 m.ViscosityPaS * thermo.MPaSPerPaS,
			MinRegenerationEnergyKWhPerM3: screen.KWhPerM3(m.RegenJPerM3),
			BLMH:                          r.BMPerS / thermo.MPerSPerLMH,
			BEstimated:                    r.BEstimated,
			HazardFlags:                   append([]string{}, r.Solute.HazardFlags...),
			Warnings:                      warn.Strings(r.Warnings),
			Trust:                         trustMarks(&r, sc.VantHoff),
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
			c.Robustness = candidateRobustness(rb)
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
		if u.ShardCount > 1 {
			resp.Robustness.Shard = &RobustnessShard{Index: u.ShardIndex, Count: u.ShardCount, SamplesAll: u.Samples}
		}
	}
	model := "real (non-ideal) osmotic pressure"
	if sc.VantHoff {
		model = "van 't Hoff (ideal dilute) osmotic pressure, π = ν c R T"
	}
	resp.ModelChoices = map[string]string{
		"osmotic_model":        model,
		"flux_model":           "water and reverse solute flux with ICP in the support and ECP on both faces (engine/transport); interface concentrations from the exponential profiles, π from the real model",
		"solute_permeability":  info.BRule,
		"membrane_temperature": info.MembraneTemperature,
		"mass_transfer":        info.KRule,
		"feed_osmotic":         sc.Feed.OsmoticMethod,
		"scaling":              screen.ScalingMethod,
		"regeneration_energy":  fmt.Sprintf("minimum (reversible) work to recover %.0f %% of the diluted draw's water: W/V = (1/r)∫₀ʳ π dr′, π = −(RT/V̄w) ln aw along the re-concentration", 100*sc.RegenerationRecovery),
		"replenishment_cost":   "specific reverse solute flux (g/L = kg/m³) × bulk price (USD/kg) = USD per m³ of product water; the price range carried through as min–max, the mid value scored",
		"normalisation":        normalisationText(res),
		"pareto":               "non-dominated set on the chosen objectives (unknown values count as worst)",
		"validity":             map[bool]string{false: "candidates needed above their osmotic model's data limit are excluded", true: "candidates above their osmotic model's data limit are kept and flagged"}[sc.AllowExtrapolation],
		"json_library":         "see health operation",
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
	if r := info.Membrane; r != nil {
		resp.Sources = append(resp.Sources, membraneSources(r)...)
	}
	if r := info.Feed; r != nil {
		resp.Sources = append(resp.Sources, sortedSources("feed."+r.ID, r.Sources)...)
	}
	for _, r := range res.Ranked {
		resp.Sources = append(resp.Sources, soluteSources(r.Solute)...)
	}
	return resp
}

func normalisationText(res *screen.Result) string {
	if res.Reference != nil {
		return "against the reference draw " + screen.ReferenceSolute + " at the same basis (set-independent): " + screen.ReferenceFormula
	}
	return "min–max per objective over the ranked candidates (relative to the screened set), 1 = best; score = Σ weight × normalised value / Σ weights"
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
