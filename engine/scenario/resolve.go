package scenario

import (
	"drawsift/engine/limits"
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

// Spec is a scenario as a request gives it: the document users save,
// share and rerun (the contract's screen request; engine/api re-exports it
// as ScreenRequest).
// Every field is optional except what the defaults cannot supply; the
// defaults are listed on each field.
type Spec struct {
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
	// Channel sets k from a Sherwood correlation (default DefaultChannel).
	Channel    *ChannelSpec `json:"channel,omitempty"`
	ExternalCP *bool        `json:"external_cp,omitempty"` // default true
	// Candidates: solute IDs or aliases, or blends ({"id", "blend":
	// [{"solute", "mole_fraction" | "mass_fraction"}, …]}); omitted → the
	// whole library plus the custom solutes.
	Candidates    []Candidate    `json:"candidates,omitempty"`
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
	// System rates every candidate at plant scale (a module designed for
	// the target recovery and product flow, its regeneration and costs);
	// the "system" basis ranks by it. Omitted with that basis: defaults.
	System *SystemSpec `json:"system,omitempty"`
	// ScoreNormalisation: "set" (default: min–max over the ranked
	// candidates) or "reference" (each metric against the reference draw,
	// NaCl at the same basis; screen.NormaliseAgainst).
	ScoreNormalisation string `json:"score_normalisation,omitempty"`
}

// FeedSpec is the scenario's feed water.
type FeedSpec struct {
	Preset        string    `json:"preset,omitempty"`
	Solute        string    `json:"solute,omitempty"`
	Concentration *float64  `json:"concentration,omitempty"`
	Unit          string    `json:"unit,omitempty"`
	Ions          []IonSpec `json:"ions,omitempty"`
	PH            *float64  `json:"ph,omitempty"`
	// Mixture: the feed as parts each at its own concentration (instead
	// of solute/concentration); its ions follow from the parts.
	Mixture []MixturePart `json:"mixture,omitempty"`
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
	// Kind: "osmotic-pressure", "concentration", "water-flux", or
	// "system" (draws at equal osmotic pressure, as "osmotic-pressure",
	// ranked by the system's cost per m³ of product).
	Kind           string   `json:"kind"`
	Value          *float64 `json:"value,omitempty"`
	Unit           string   `json:"unit,omitempty"` // bar, kPa, MPa, atm, psi | a concentration unit | LMH
	MultipleOfFeed *float64 `json:"multiple_of_feed,omitempty"`
}

// UncertaintySpec sets the robustness run; omitted numbers take the
// membrane record's scatter (a custom membrane the uncertainty.*_rel_sd
// defaults of engine/limits), the π, D and estimated-B spreads of the same
// table, and prices drawn uniformly within their ranges.
type UncertaintySpec struct {
	Samples          *int     `json:"samples,omitempty"` // default limits.Samples
	ARelSD           *float64 `json:"a_rel_sd,omitempty"`
	BRelSD           *float64 `json:"b_rel_sd,omitempty"`
	SRelSD           *float64 `json:"s_rel_sd,omitempty"`
	OsmoticRelSD     *float64 `json:"osmotic_rel_sd,omitempty"`
	DiffusivityRelSD *float64 `json:"diffusivity_rel_sd,omitempty"`
	// EstimatedBRelSD: per candidate, for a B estimated from NaCl's
	// (default limits.EstimatedBRelSD).
	EstimatedBRelSD *float64 `json:"estimated_b_rel_sd,omitempty"`
	Prices          *bool    `json:"prices,omitempty"`
	// Shard runs one part of the samples (several engines share a run;
	// the robustness-merge operation adds the parts up).
	Shard *ShardSpec `json:"shard,omitempty"`
}

// ShardSpec names one part of a robustness run split into Count parts:
// the samples s with s mod Count = Index.
type ShardSpec struct {
	Index int `json:"index"`
	Count int `json:"count"`
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

// Info is what a response reports about the resolution.
type Info struct {
	Membrane *library.Membrane // the preset, or nil
	Feed     *library.Feed     // the preset, or nil
	BRule    string            // how B was found for the candidates
	// MembraneTemperature says how A and B reached the operating temperature.
	MembraneTemperature string
	KRule               string          // how k was found
	Custom              map[string]bool // IDs of the user-defined solutes
	// SystemBasis: the basis was "system" (resolved as an osmotic-pressure
	// basis; the caller ranks by the system stage).
	SystemBasis bool
}

// Resolve turns a scenario into what engine/screen runs: presets looked
// up and overridden, every default of the range table applied, every
// number checked against its Range, B per candidate and k settled,
// custom solutes built, in SI. Errors are *errs.InputError naming the
// contract's field.
func Resolve(req *Spec) (*screen.Scenario, *Info, error) {
	lib, lerr := library.Default()
	if lerr != nil {
		return nil, nil, fmt.Errorf("solute library: %w", lerr)
	}
	info := &Info{Custom: map[string]bool{}}
	var err error
	sc := &screen.Scenario{Seed: uint64(limits.Seed.Default), AllowExtrapolation: req.AllowExtrapolation}
	if req.Seed != nil {
		// Compared as integers: a uint64 seed does not survive a float64.
		if *req.Seed > uint64(limits.Seed.Max) {
			return nil, nil, errs.Invalid(limits.Seed.Field, float64(*req.Seed), limits.Seed.Text(), "seed = %d is outside %s", *req.Seed, limits.Seed.Text())
		}
		sc.Seed = *req.Seed
	}
	if sc.RegenerationRecovery, err = limits.RegenerationRecovery.Or(req.RegenerationRecovery); err != nil {
		return nil, nil, err
	}
	tK, err := TemperatureK("temperature_c", req.TemperatureC)
	if err != nil {
		return nil, nil, err
	}
	sc.TemperatureK = tK
	if sc.Normalisation, err = ParseScoreNormalisation(req.ScoreNormalisation); err != nil {
		return nil, nil, err
	}
	osm, err := ParseOsmoticModel(req.OsmoticModel)
	if err != nil {
		return nil, nil, err
	}
	sc.VantHoff = osm == VantHoff
	// Orientations.
	o, err := ParseOrientation("orientation", req.Orientation)
	if err != nil {
		return nil, nil, err
	}
	sc.Orientations = []transport.Orientation{o}
	if err := limits.OrientationCount.Check(float64(len(req.Orientations))); err != nil {
		return nil, nil, err
	}
	for i, s := range req.Orientations {
		o2, err := ParseOrientation(fmt.Sprintf("orientations[%d]", i), s)
		if err != nil || s == "" {
			return nil, nil, invalid(fmt.Sprintf("orientations[%d]", i), OrientationNames, "unknown orientation %q", s)
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
		ms = &MembraneSpec{Preset: DefaultMembranePreset}
	}
	mem, err := ResolveMembrane(ms)
	if err != nil {
		return nil, nil, err
	}
	mem.AtTemperature(tK) // reported in the model choices
	info.MembraneTemperature = mem.Temperature.Rule
	info.Membrane = mem.Record
	m := screen.Membrane{ID: mem.Preset(), AMPerSPa: mem.AMPerSPa, SM: mem.SM, B: mem.B,
		ARelSD: mem.ARelSD, BRelSD: mem.BRelSD, SRelSD: mem.SRelSD}
	info.BRule = library.BEstimateRule
	// In a screen, b_lmh alone is the membrane's NaCl B (the base of the
	// estimates); with b_nacl_lmh beside it, B for every candidate.
	if b := mem.BGivenMPerS; b != nil {
		if ms.BNaClLMH == nil {
			m.B = library.SoluteB{NaCl: *b}
			info.BRule = "membrane.b_lmh taken as the NaCl B; " + library.BEstimateRule
		} else {
			m.BDrawMPerS, m.BDrawSet = *b, true
			info.BRule = "membrane.b_lmh used for every candidate"
		}
	} else if !mem.BKnown {
		return nil, nil, invalid("membrane.b_lmh", "≥ 0", "a custom membrane needs b_lmh (its NaCl B)")
	}
	m.UserIonB, m.UserSoluteB = mem.UserIonB, mem.UserB
	sc.Membrane = m
	// Feed.
	feed, rec, e := resolveFeed(req.Feed, tK)
	if e != nil {
		return nil, nil, e
	}
	sc.Feed, info.Feed = feed, rec
	// Mass transfer.
	extCP := req.ExternalCP == nil || *req.ExternalCP
	if sc.Channel, err = ResolveChannel(req.Channel); err != nil {
		return nil, nil, err
	}
	info.KRule = "k from the channel's Sherwood correlation (engine/transport), with each solution's density, viscosity and diffusivity"
	if sc.KDrawMPerS, err = GivenK(&limits.KDraw, req.KDrawMPerS); err != nil {
		return nil, nil, err
	}
	if sc.KFeedMPerS, err = GivenK(&limits.KFeed, req.KFeedMPerS); err != nil {
		return nil, nil, err
	}
	if !extCP {
		sc.KDrawMPerS, sc.KFeedMPerS = math.Inf(1), math.Inf(1)
		info.KRule = "no external concentration polarization (k → ∞)"
	} else if req.KDrawMPerS != nil || req.KFeedMPerS != nil {
		info.KRule = "k as given where given; elsewhere from the channel's Sherwood correlation"
	}
	// Candidates.
	customs := map[string]*library.Solute{}
	var customOrder []*library.Solute
	if err := limits.CustomSoluteCount.Check(float64(len(req.CustomSolutes))); err != nil {
		return nil, nil, err
	}
	if err := limits.CandidateCount.Check(float64(len(req.Candidates))); err != nil {
		return nil, nil, err
	}
	for i, cs := range req.CustomSolutes {
		s, e := customSolute(i, &cs, lib)
		if e != nil {
			return nil, nil, e
		}
		if _, dup := customs[library.Key(s.ID)]; dup {
			return nil, nil, invalid(fmt.Sprintf("custom_solutes[%d].id", i), nil, "custom solute %q is defined twice", s.ID)
		}
		customs[library.Key(s.ID)] = s
		customOrder = append(customOrder, s)
		info.Custom[s.ID] = true
	}
	if req.Candidates == nil {
		sc.Candidates = append(sc.Candidates, lib.All()...)
		sc.Candidates = append(sc.Candidates, customOrder...)
	} else {
		if len(req.Candidates) == 0 {
			return nil, nil, invalid("candidates", "at least one solute", "the candidate list is empty (omit it to screen the whole library)")
		}
		seen := map[*library.Solute]bool{}
		blends := map[string]int{}
		for i, c := range req.Candidates {
			field := fmt.Sprintf("candidates[%d]", i)
			if len(c.Blend) > 0 {
				b, err := ResolveBlend(field, &c, customs)
				if err != nil {
					return nil, nil, err
				}
				k := library.Key(b.ID)
				if j, dup := blends[k]; dup {
					return nil, nil, invalid(field+".id", nil, "blend %q is named twice (candidates %d and %d)", b.ID, j, i)
				}
				if _, clash := lib.Lookup(b.ID); clash || customs[k] != nil {
					return nil, nil, invalid(field+".id", nil, "blend id %q is already a solute's name; choose another", b.ID)
				}
				blends[k] = i
				sc.Candidates = append(sc.Candidates, b)
				continue
			}
			name := c.ID
			s, ok := customs[library.Key(name)]
			if !ok {
				s, ok = lib.Lookup(name)
			}
			if !ok {
				return nil, nil, invalid(field, nil, "unknown solute %q; known: %s", name, strings.Join(lib.IDs(), ", "))
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
	info.SystemBasis = req.Basis != nil && strings.EqualFold(req.Basis.Kind, "system")
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
				return nil, nil, invalid("weights."+k, screen.ObjectiveKeys(), "unknown objective %q", k)
			}
			w := req.Weights[k]
			if err := limits.Weight.CheckAt("weights."+k, w); err != nil {
				return nil, nil, err
			}
			sc.Weights[ob] = w
			sum += w
		}
		if !(sum > 0) {
			return nil, nil, invalid("weights", "at least one weight > 0", "all weights are zero")
		}
	}
	sc.Pareto = screen.DefaultPareto
	if req.ParetoObjectives != nil {
		if len(req.ParetoObjectives) < 2 {
			return nil, nil, invalid("pareto_objectives", "two or more objectives", "the Pareto front needs two or more objectives")
		}
		if err := limits.ParetoCount.Check(float64(len(req.ParetoObjectives))); err != nil {
			return nil, nil, err
		}
		sc.Pareto = nil
		for i, k := range req.ParetoObjectives {
			ob, ok := screen.ParseObjective(k)
			if !ok {
				return nil, nil, invalid(fmt.Sprintf("pareto_objectives[%d]", i), screen.ObjectiveKeys(), "unknown objective %q", k)
			}
			sc.Pareto = append(sc.Pareto, ob)
		}
	}
	if err := limits.ExcludeHazardCount.Check(float64(len(req.ExcludeHazards))); err != nil {
		return nil, nil, err
	}
	for i, h := range req.ExcludeHazards {
		if !library.IsHazardFlag(h) {
			return nil, nil, invalid(fmt.Sprintf("exclude_hazards[%d]", i), library.HazardFlags, "unknown hazard flag %q", h)
		}
	}
	sc.ExcludeHazards = library.UniqueFlags(req.ExcludeHazards)
	// Uncertainty.
	if u := req.Uncertainty; u != nil {
		su := &screen.Uncertainty{Samples: int(limits.Samples.Default), ARelSD: m.ARelSD, BRelSD: m.BRelSD, SRelSD: m.SRelSD,
			DefaultOsmotic: true, DiffusivityRelSD: limits.DiffusivityRelSD.Default, EstimatedBRelSD: limits.EstimatedBRelSD.Default, Prices: true}
		if u.Samples != nil {
			if err := limits.Samples.Check(float64(*u.Samples)); err != nil {
				return nil, nil, err
			}
			su.Samples = *u.Samples
		}
		for _, f := range []struct {
			r   *limits.Range
			v   *float64
			dst *float64
		}{{&limits.ARelSD, u.ARelSD, &su.ARelSD}, {&limits.BRelSD, u.BRelSD, &su.BRelSD}, {&limits.SRelSD, u.SRelSD, &su.SRelSD},
			{&limits.OsmoticRelSD, u.OsmoticRelSD, &su.OsmoticRelSD}, {&limits.DiffusivityRelSD, u.DiffusivityRelSD, &su.DiffusivityRelSD},
			{&limits.EstimatedBRelSD, u.EstimatedBRelSD, &su.EstimatedBRelSD}} {
			if f.v == nil {
				continue
			}
			if err := f.r.Check(*f.v); err != nil {
				return nil, nil, err
			}
			*f.dst = *f.v
		}
		if u.OsmoticRelSD != nil {
			su.DefaultOsmotic = false
		}
		if u.Prices != nil {
			su.Prices = *u.Prices
		}
		if sh := u.Shard; sh != nil {
			if err := limits.RobustnessShards.Check(float64(sh.Count)); err != nil {
				return nil, nil, err
			}
			su.ShardIndex, su.ShardCount = sh.Index, sh.Count
		}
		sc.Uncertainty = su
	}
	return sc, info, nil
}

// MaxChargeImbalance is the largest ion-balance error accepted in a feed's
// ion list, |Σ cation eq − Σ anion eq| / (Σ cation eq + Σ anion eq):
// common practice for water analyses (an analysis outside ±5 % is
// usually rechecked; e.g. the acceptance criteria of APHA Standard
// Methods 1030E, from memory).
const MaxChargeImbalance = 0.05

// customIons checks a custom feed's ions: symbol, charge, molar mass and
// concentration within their ranges, each symbol once, and the list
// electroneutral within MaxChargeImbalance.
func customIons(specs []IonSpec) ([]library.FeedIon, error) {
	if err := limits.FeedIonCount.Check(float64(len(specs))); err != nil {
		return nil, err
	}
	out := make([]library.FeedIon, 0, len(specs))
	seen := map[string]int{}
	for i, ion := range specs {
		field := fmt.Sprintf("feed.ions[%d]", i)
		if ion.Symbol == "" || ion.Charge == 0 {
			return nil, invalid(field, nil, "an ion needs a symbol, a non-zero charge, molar_mass_g_per_mol %s and mg_per_l %s",
				limits.FeedIonMolarMass.Text(), limits.FeedIonMgPerL.Text())
		}
		if err := limits.FeedIonMolarMass.CheckAt(field+".molar_mass_g_per_mol", ion.MolarMassGPerMol); err != nil {
			return nil, err
		}
		if err := limits.FeedIonMgPerL.CheckAt(field+".mg_per_l", ion.MgPerL); err != nil {
			return nil, err
		}
		if z, ok := thermo.KnownIonCharge(ion.Symbol); !ok {
			return nil, errs.InvalidText(field+".symbol", ion.Symbol, thermo.KnownIonSymbols(), "unknown ion %q: the mixed-electrolyte model has no data for it", ion.Symbol)
		} else if z != ion.Charge {
			return nil, errs.Invalid(field+".charge", float64(ion.Charge), fmt.Sprint(z), "%s has charge %d, not %d", ion.Symbol, z, ion.Charge)
		}
		if j, dup := seen[ion.Symbol]; dup {
			return nil, invalid(field+".symbol", nil, "ion %s is listed twice (ions %d and %d)", ion.Symbol, j, i)
		}
		seen[ion.Symbol] = i
		out = append(out, library.FeedIon{Symbol: ion.Symbol, Charge: ion.Charge, MolarMassGPerMol: ion.MolarMassGPerMol, Concentration: ion.MgPerL})
	}
	rec := library.Feed{Ions: out}
	if imb := rec.ChargeImbalance(); math.Abs(imb) > MaxChargeImbalance {
		return nil, errs.Invalid("feed.ions", imb, fmt.Sprintf("±%g (charge imbalance)", MaxChargeImbalance),
			"the ions are not electroneutral: charge imbalance %+.1f %% (cation minus anion equivalents over their sum); at most ±%g %% is accepted", 100*imb, 100*MaxChargeImbalance)
	}
	return out, nil
}

// ionFeed sets f's osmotic pressure from its ion list (mg per litre, or
// per kg when perKg): the ions as one mixture record at their total
// amount, and the ions themselves for the scaling check.
func ionFeed(f *screen.Feed, id, name string, ions []library.FeedIon, perKg bool) error {
	s, err := library.NewComposition(id, name, ions)
	if err != nil {
		return invalid("feed.ions", nil, "%v", err)
	}
	rec := library.Feed{Ions: ions}
	f.Solute, f.Concentration = s, rec.TotalMmol()/1000
	f.Unit = thermo.MolPerL
	if perKg {
		// mol per kg of feed: the mass fraction of the ions converts it.
		f.Unit = thermo.GPerKg
		f.Concentration = rec.TotalMmol() / 1000 * s.MolarMassGPerMol
	}
	f.IonsPerKg = perKg
	f.Ions = rec.IonsAt(-1)
	f.OsmoticMethod = fmt.Sprintf("the mixed-electrolyte model over the feed's %d ions (%.4g mmol of ions per %s)", len(ions), rec.TotalMmol(), map[bool]string{false: "litre", true: "kg"}[perKg])
	return nil
}

// resolveFeed reads the feed: a preset, or a solute with optional ions.
func resolveFeed(fs *FeedSpec, tK float64) (screen.Feed, *library.Feed, error) {
	if fs == nil {
		fs = &FeedSpec{Preset: DefaultFeedPreset}
	}
	var rec *library.Feed
	f := screen.Feed{ID: "custom", PH: limits.FeedPH.Default}
	if fs.Preset != "" {
		r, ok := library.LookupFeed(fs.Preset)
		if !ok {
			all, _ := library.Feeds()
			ids := []string{}
			for _, p := range all {
				ids = append(ids, p.ID)
			}
			return f, nil, invalid("feed.preset", ids, "unknown feed preset %q", fs.Preset)
		}
		if fs.Solute != "" || fs.Ions != nil || fs.Mixture != nil {
			return f, nil, invalid("feed.solute", nil, "give either a feed preset or a custom feed (solute, ions or mixture), not both")
		}
		rec = r
		f.ID, f.PH = r.ID, r.PH
		f.IonsPerKg = r.IonsPerKg()
		switch r.Osmotic.Method {
		case library.FeedOsmoticNone:
			f.OsmoticMethod = "pure water"
		case library.FeedOsmoticSolute:
			s, err := LookupSolute("feed.preset", r.Osmotic.Solute)
			if err != nil {
				return f, nil, err
			}
			u, err := thermo.ParseUnit(r.Osmotic.Unit)
			if err != nil {
				return f, nil, fmt.Errorf("feed preset %s: unit: %w", r.ID, err)
			}
			f.Solute, f.Concentration, f.Unit = s, r.Osmotic.Concentration, u
			if fs.Concentration != nil {
				v, _, err := ParseConcentration("feed", fs.Concentration, r.Osmotic.Unit)
				if err != nil {
					return f, nil, err
				}
				f.Concentration = v
			}
			f.OsmoticMethod = fmt.Sprintf("library solute %s at %g %s", s.ID, f.Concentration, u)
		case library.FeedOsmoticIons:
			if fs.Concentration != nil {
				return f, nil, invalid("feed.concentration", nil, "preset %q sets its osmotic pressure from its ions; use a custom feed to change it", r.ID)
			}
			if err := ionFeed(&f, r.ID, r.Name, r.Ions, r.IonsPerKg()); err != nil {
				return f, nil, err
			}
		case library.FeedOsmoticEquivalentNaCl:
			s, err := LookupSolute("feed.preset", "NaCl")
			if err != nil {
				return f, nil, err
			}
			f.Solute, f.Concentration, f.Unit = s, r.EquivalentNaClMolPerL(), thermo.MolPerL
			f.Surrogate = true
			f.OsmoticMethod = fmt.Sprintf("%s: %.4g mol/L NaCl", library.EquivalentNaClRule, f.Concentration)
			if fs.Concentration != nil {
				return f, nil, invalid("feed.concentration", nil, "preset %q sets its osmotic pressure from its ions; use a custom feed to change it", r.ID)
			}
		}
		salinity := -1.0 // the record's own composition
		if f.Unit == thermo.GPerKg {
			salinity = f.Concentration
		}
		f.Ions = r.IonsAt(salinity)
	} else if fs.Mixture != nil {
		if fs.Solute != "" || fs.Concentration != nil || fs.Ions != nil {
			return f, nil, invalid("feed.mixture", nil, "give either a mixture or a solute (with its ions), not both")
		}
		x, m, _, err := ResolveMixture("feed", fs.Mixture, tK)
		if err != nil {
			return f, nil, err
		}
		s := x.Solute
		f.Solute, f.Concentration, f.Unit = s, m, thermo.MolPerKg
		f.OsmoticMethod = fmt.Sprintf("mixture %s at %.4g mol/kg (%s)", s.ID, m, x.MixturePath())
		c := x.MolarityMolPerM3(m) / 1000
		for _, ion := range s.IonShares() {
			f.Ions = append(f.Ions, library.IonAmount{Symbol: ion.Symbol, Charge: ion.Charge, Mol: c * ion.PerUnit})
		}
	} else if fs.Solute == "" && len(fs.Ions) > 0 {
		// A custom water given by its ions: π from the ions.
		if fs.Concentration != nil {
			return f, nil, invalid("feed.concentration", nil, "a feed given by its ions takes its concentration from them; leave concentration out")
		}
		ions, err := customIons(fs.Ions)
		if err != nil {
			return f, nil, err
		}
		if err := ionFeed(&f, "custom", "custom feed", ions, false); err != nil {
			return f, nil, err
		}
	} else {
		if fs.Solute == "" {
			return f, nil, invalid("feed", nil, "a feed needs a preset, a solute (e.g. {\"solute\": \"seawater\", \"concentration\": 35, \"unit\": \"g/kg\"}) or a mixture")
		}
		s, err := LookupSolute("feed.solute", fs.Solute)
		if err != nil {
			return f, nil, err
		}
		v, u, err := ParseConcentration("feed", fs.Concentration, fs.Unit)
		if err != nil {
			return f, nil, err
		}
		f.Solute, f.Concentration, f.Unit = s, v, u
		f.OsmoticMethod = fmt.Sprintf("library solute %s at %g %s", s.ID, v, u)
		ions, err := customIons(fs.Ions)
		if err != nil {
			return f, nil, err
		}
		for _, ion := range ions {
			f.Ions = append(f.Ions, library.IonAmount{Symbol: ion.Symbol, Charge: ion.Charge, Mol: ion.Concentration / ion.MolarMassGPerMol / 1000})
		}
		if fs.Ions == nil && v > 0 {
			// The solute's own ions at its molarity; seawater: the
			// Reference Composition scaled to its salinity.
			x, err := thermo.Prepared(s, tK)
			if err != nil {
				return f, nil, prefixed("feed", err)
			}
			mm, err := x.ToMolality(v, u)
			if err != nil {
				return f, nil, prefixed("feed", err)
			}
			if s.Osmotic.CompositionFeed != "" && s.Osmotic.Kind == library.ModelMixture {
				if r, ok := library.LookupFeed(s.Osmotic.CompositionFeed); ok && r.ReferenceSalinityGPerKg > 0 {
					f.IonsPerKg = true
					f.Ions = r.IonsAt(x.FromMolality(mm, thermo.GPerKg))
				}
			} else {
				c := x.MolarityMolPerM3(mm) / 1000
				for _, ion := range s.IonShares() {
					f.Ions = append(f.Ions, library.IonAmount{Symbol: ion.Symbol, Charge: ion.Charge, Mol: c * ion.PerUnit})
				}
			}
		}
	}
	if fs.PH != nil {
		if err := limits.FeedPH.Check(*fs.PH); err != nil {
			return f, nil, err
		}
		f.PH = *fs.PH
	}
	return f, rec, nil
}

func resolveBasis(b *BasisSpec, feedHasPi bool) (screen.Basis, error) {
	if b == nil {
		if feedHasPi {
			return screen.Basis{Kind: screen.BasisOsmoticPressure, MultipleOfFeed: limits.BasisMultiple.Default}, nil
		}
		return screen.Basis{Kind: screen.BasisOsmoticPressure, PiPa: limits.BasisPressure.Default * thermo.PascalPerBar}, nil
	}
	kinds := []string{"osmotic-pressure", "concentration", "water-flux", "system"}
	val := func() (float64, error) {
		if b.Value == nil {
			return 0, invalid("basis.value", "> 0", "the basis needs a value")
		}
		v := *b.Value
		if !(v > 0) || math.IsInf(v, 0) {
			return 0, invalid("basis.value", "> 0", "the basis value must be positive and finite (got %g)", v)
		}
		return v, nil
	}
	kind := strings.ToLower(b.Kind)
	if kind == "system" {
		if b.Value == nil && b.MultipleOfFeed == nil {
			return resolveBasis(nil, feedHasPi)
		}
		kind = "osmotic-pressure"
	}
	switch kind {
	case "osmotic-pressure":
		if b.MultipleOfFeed != nil {
			k := *b.MultipleOfFeed
			if b.Value != nil {
				return screen.Basis{}, invalid("basis.multiple_of_feed", nil, "give either value (with unit) or multiple_of_feed, not both")
			}
			if !(k > 1) || math.IsInf(k, 0) {
				return screen.Basis{}, invalid("basis.multiple_of_feed", "> 1", "the multiple of the feed's osmotic pressure must exceed 1 (got %g)", k)
			}
			if err := limits.BasisMultiple.Check(k); err != nil {
				return screen.Basis{}, err
			}
			if !feedHasPi {
				return screen.Basis{}, invalid("basis.multiple_of_feed", nil, "the feed has no osmotic pressure; give the target in bar instead")
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
		f, ok := thermo.ParsePressureUnit(unit)
		if !ok {
			return screen.Basis{}, invalid("basis.unit", thermo.PressureUnitNames(), "unknown pressure unit %q", b.Unit)
		}
		if err := limits.BasisPressure.Check(v * f / thermo.PascalPerBar); err != nil {
			return screen.Basis{}, err
		}
		return screen.Basis{Kind: screen.BasisOsmoticPressure, PiPa: v * f}, nil
	case "concentration":
		v, e := val()
		if e == nil {
			e = limits.BasisValue.Check(v)
		}
		if e != nil {
			return screen.Basis{}, e
		}
		if b.Unit == "" {
			return screen.Basis{}, invalid("basis.unit", thermo.UnitNames(), "a concentration basis needs a unit")
		}
		u, err := thermo.ParseUnit(b.Unit)
		if err != nil {
			return screen.Basis{}, invalid("basis.unit", thermo.UnitNames(), "%v", err)
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
			return screen.Basis{}, invalid("basis.unit", []string{"LMH", "m/s"}, "unknown flux unit %q", b.Unit)
		}
		if err := limits.BasisFlux.Check(v / thermo.MPerSPerLMH); err != nil {
			return screen.Basis{}, err
		}
		return screen.Basis{Kind: screen.BasisWaterFlux, JwMPerS: v}, nil
	}
	return screen.Basis{}, invalid("basis.kind", kinds, "unknown basis kind %q", b.Kind)
}

// customSolute builds a van 't Hoff-only library record from a user's
// definition.
// CustomSolubilityTemperatureC is the temperature a custom solute's single
// solubility value is taken to hold at (the engine uses it unchanged at
// other temperatures, with a warning).
const CustomSolubilityTemperatureC = 25

func customSolute(i int, cs *CustomSolute, lib *library.Library) (*library.Solute, error) {
	field := func(f string) string { return fmt.Sprintf("custom_solutes[%d].%s", i, f) }
	if strings.TrimSpace(cs.ID) == "" {
		return nil, invalid(field("id"), nil, "a custom solute needs an id")
	}
	if err := CheckLabel(field("id"), cs.ID); err != nil {
		return nil, err
	}
	if err := CheckLabel(field("name"), cs.Name); err != nil {
		return nil, err
	}
	if _, clash := lib.Lookup(cs.ID); clash {
		return nil, invalid(field("id"), nil, "%q is already a library solute; choose another id", cs.ID)
	}
	for _, f := range []struct {
		r *limits.Range
		v float64
	}{{&limits.CustomMolarMass, cs.MolarMassGPerMol}, {&limits.CustomDiffusivity, cs.DiffusivityM2PerS}, {&limits.CustomVantHoff, cs.VantHoffFactor}} {
		if err := f.r.CheckAt(fmt.Sprintf(strings.Replace(f.r.Field, "[]", "[%d]", 1), i), f.v); err != nil {
			return nil, err
		}
	}
	if err := limits.HazardFlagCount.CheckAt(field("hazard_flags"), float64(len(cs.HazardFlags))); err != nil {
		return nil, err
	}
	s := &library.Solute{ID: cs.ID, Name: cs.Name, Family: "custom", Formula: cs.ID, MolarMassGPerMol: cs.MolarMassGPerMol,
		HazardFlags: library.UniqueFlags(cs.HazardFlags), Hazards: []string{}, Regeneration: []string{}, Aliases: []string{}}
	if s.Name == "" {
		s.Name = cs.ID + " (user-defined)"
	}
	// Ions: bounded counts and charges, so Σ charge × count (the
	// electroneutrality check) and ν = Σ count cannot overflow or reach
	// absurd values.
	if err := limits.CustomIonEntries.CheckAt(field("ions"), float64(len(cs.Ions))); err != nil {
		return nil, err
	}
	nu := 0
	for j, ion := range cs.Ions {
		f := fmt.Sprintf("custom_solutes[%d].ions[%d]", i, j)
		if err := CheckLabel(f+".symbol", ion.Symbol); err != nil {
			return nil, err
		}
		if err := limits.CustomIonCharge.CheckAt(f+".charge", float64(ion.Charge)); err != nil {
			return nil, err
		}
		if ion.Charge == 0 {
			return nil, errs.Invalid(f+".charge", 0, limits.CustomIonCharge.Text()+", not 0", "an ion needs a non-zero charge")
		}
		if err := limits.CustomIonCount.CheckAt(f+".count", float64(ion.Count)); err != nil {
			return nil, err
		}
		nu += ion.Count
		s.Ions = append(s.Ions, library.Ion{Symbol: ion.Symbol, Charge: ion.Charge, Count: ion.Count})
	}
	if float64(nu) > limits.CustomVantHoff.Max {
		return nil, errs.Invalid(field("ions"), float64(nu), fmt.Sprintf("Σ count ≤ %g", limits.CustomVantHoff.Max),
			"the ions give %d particles per formula unit; at most %g are accepted (as for van_t_hoff_factor)", nu, limits.CustomVantHoff.Max)
	}
	s.Osmotic = library.OsmoticModel{Kind: library.ModelNone, Reason: "user-defined solute: van 't Hoff osmotic pressure only",
		VantHoffNu: cs.VantHoffFactor}
	if t := cs.PiTable; t != nil {
		if _, err := thermo.ParseUnit(t.Unit); err != nil || t.Unit == thermo.OsmolPerKg.String() {
			return nil, invalid(field("pi_table.unit"), []string{"mol/kg", "mol/L", "g/L", "g/kg", "wt%"}, "unknown table unit %q", t.Unit)
		}
		if err := limits.TemperatureC.CheckAt(field("pi_table.temperature_c"), t.TemperatureC); err != nil {
			return nil, err
		}
		if err := limits.PiTablePoints.CheckAt(field("pi_table.points"), float64(len(t.Points))); err != nil {
			return nil, err
		}
		prevC, prevP := 0.0, 0.0
		for j, p := range t.Points {
			if !(p.Concentration > prevC) || !(p.OsmoticPressureBar > prevP) || p.Concentration > limits.Concentration.Max || p.OsmoticPressureBar > limits.BasisPressure.Max {
				return nil, invalid(fmt.Sprintf("custom_solutes[%d].pi_table.points[%d]", i, j), fmt.Sprintf("increasing, positive; concentration %s, osmotic_pressure_bar %s", limits.Concentration.Text(), limits.BasisPressure.Text()),
					"concentration and osmotic pressure must both be positive and increase from point to point (concentration %s, osmotic_pressure_bar %s)", limits.Concentration.Text(), limits.BasisPressure.Text())
			}
			prevC, prevP = p.Concentration, p.OsmoticPressureBar
		}
		s.Osmotic = library.OsmoticModel{Kind: library.ModelTable, Table: t, VantHoffNu: cs.VantHoffFactor}
	}
	switch {
	case cs.Miscible:
		s.Solubility.Miscible = true
	case cs.SolubilityMolPerKg != nil:
		if err := limits.CustomSolubility.CheckAt(field("solubility_mol_per_kg"), *cs.SolubilityMolPerKg); err != nil {
			return nil, err
		}
		s.Solubility.Points = []library.SolubilityPoint{{TemperatureC: CustomSolubilityTemperatureC, MolalityMolPerKg: *cs.SolubilityMolPerKg}}
	default:
		return nil, invalid(field("solubility_mol_per_kg"), limits.CustomSolubility.Text(), "give solubility_mol_per_kg (or miscible: true)")
	}
	s.Diffusivity.D0M2PerS = cs.DiffusivityM2PerS
	if cs.PriceUSDPerKgMin != nil || cs.PriceUSDPerKgMax != nil {
		if cs.PriceUSDPerKgMin == nil || cs.PriceUSDPerKgMax == nil {
			return nil, invalid(field("price_usd_per_kg_max"), nil, "give both price_usd_per_kg_min and price_usd_per_kg_max")
		}
		for _, p := range []struct {
			name string
			v    float64
		}{{"price_usd_per_kg_min", *cs.PriceUSDPerKgMin}, {"price_usd_per_kg_max", *cs.PriceUSDPerKgMax}} {
			if err := limits.CustomPrice.CheckAt(field(p.name), p.v); err != nil {
				return nil, err
			}
		}
		s.Price = &library.Price{USDPerKgMin: *cs.PriceUSDPerKgMin, USDPerKgMax: *cs.PriceUSDPerKgMax}
	}
	src := cs.Source
	if src == "" {
		src = "user-defined (no source given)"
	}
	s.Sources = map[string]string{"record": src}
	if err := s.Validate(); err != nil {
		return nil, invalid(fmt.Sprintf("custom_solutes[%d]", i), nil, "%v", err)
	}
	return s, nil
}

// ResolveSweep checks a sweep and returns it in SI.
func ResolveSweep(sw *SweepSpec) (screen.SweepSpec, error) {
	spec := screen.SweepSpec{From: sw.From, To: sw.To, Points: sw.Points}
	// from and to lie within the range of the variable they stand for.
	if r, ok := sweepRanges[strings.ToLower(sw.Variable)]; ok {
		for _, f := range []struct {
			name string
			v    float64
		}{{"sweep.from", sw.From}, {"sweep.to", sw.To}} {
			if err := r.CheckAt(f.name, f.v); err != nil {
				return spec, err
			}
		}
	}
	switch strings.ToLower(sw.Variable) {
	case "concentration":
		spec.Variable = screen.SweepConcentration
		if sw.Unit == "" {
			return spec, invalid("sweep.unit", thermo.UnitNames(), "a concentration sweep needs a unit")
		}
		u, err := thermo.ParseUnit(sw.Unit)
		if err != nil {
			return spec, invalid("sweep.unit", thermo.UnitNames(), "%v", err)
		}
		spec.Unit = u
	case "temperature":
		spec.Variable = screen.SweepTemperature
		spec.From += thermo.ZeroCelsiusK
		spec.To += thermo.ZeroCelsiusK
	case "s":
		spec.Variable = screen.SweepS
		spec.From *= thermo.MPerUM
		spec.To *= thermo.MPerUM
	case "crossflow":
		spec.Variable = screen.SweepCrossflow
	default:
		return spec, invalid("sweep.variable", []string{"concentration", "temperature", "s", "crossflow"}, "unknown sweep variable %q", sw.Variable)
	}
	return spec, nil
}

// sweepRanges: the range a sweep's from and to are checked against, by
// variable (the same bounds as the input each variable stands for).
var sweepRanges = map[string]*limits.Range{
	"concentration": &limits.Concentration, "temperature": &limits.TemperatureC,
	"s": &limits.MembraneS, "crossflow": &limits.Crossflow,
}

// invalid returns an *errs.InputError on field with its limit.
func invalid(field string, limit any, format string, a ...any) error {
	return errs.InvalidText(field, "", limit, format, a...)
}

// prefixed puts prefix in front of an input error's field.
func prefixed(prefix string, err error) error {
	if ie, ok := err.(*errs.InputError); ok {
		return ie.Prefix(prefix)
	}
	return err
}

// ParseScoreNormalisation reads score_normalisation ("" is "set").
func ParseScoreNormalisation(v string) (screen.ScoreNormalisation, error) {
	switch v {
	case "", "set":
		return screen.NormaliseSet, nil
	case "reference":
		return screen.NormaliseReference, nil
	}
	return 0, &errs.InputError{Field: "score_normalisation", Limit: screen.ScoreNormalisationNames,
		Msg: "score_normalisation must be \"set\" (relative to the screened candidates) or \"reference\" (against NaCl at the same basis)"}
}
