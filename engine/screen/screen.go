// Package screen ranks candidate draw solutes for a forward-osmosis
// scenario: it brings each candidate to the scenario's basis of comparison
// (equal bulk osmotic pressure, equal concentration or equal water flux),
// computes every metric behind a defensible choice (concentration and its
// margin to solubility, real and van 't Hoff osmotic pressure, water and
// reverse solute flux with ICP and ECP from package transport, specific
// reverse solute flux and replenishment cost, viscosity, the minimum
// energy to re-concentrate the diluted draw, hazard flags and a scaling
// check), then normalises the metrics, scores them with the user's
// weights, marks the Pareto front, lists the candidates that fail a hard
// limit apart with their reason, and measures how robust the ranking is
// with a Monte Carlo run over the stated uncertainties.
//
// Everything inside is SI (Pa, m/s, mol/m³, kg/m³, J/m³); names carry the
// unit. The package knows no JSON: engine/api maps the contract to
// Scenario and back.
package screen

import (
	"fmt"
	"math"
	"strings"

	"drawsift/engine/errs"
	"drawsift/engine/library"
	"drawsift/engine/limits"
	"drawsift/engine/thermo"
	"drawsift/engine/transport"
)

// Objective is one metric that can be weighted in the score or used as an
// axis of the Pareto front.
type Objective int

// Objectives. The key is the name used in requests ("weights",
// "pareto_objectives").
const (
	ObjWaterFlux         Objective = iota // water flux, maximised
	ObjSRSF                               // specific reverse solute flux (g/L), minimised
	ObjReplenishment                      // replenishment cost (USD/m³, mid price), minimised
	ObjRegeneration                       // minimum re-concentration energy (kWh/m³), minimised
	ObjViscosity                          // draw viscosity (mPa·s), minimised
	ObjSolubilityMargin                   // 1 − m/m_sat, maximised
	ObjScaling                            // max(0, highest saturation index), minimised
	ObjFluxEfficiency                     // Jw / (A·Δπ_bulk), maximised
	ObjMassConcentration                  // draw mass concentration (g/L), minimised
	NumObjectives
)

type objectiveInfo struct {
	Key      string
	Unit     string
	Maximise bool
	// Resolution is the smallest spread that Normalise stretches over the
	// whole 0–1 range: RelRes of the column's largest magnitude for
	// ratio-scale metrics, AbsRes in the metric's unit otherwise. Screening
	// estimates are not more accurate than about 10 % (common practice),
	// so closer values should not decide a ranking on their own.
	RelRes, AbsRes float64
}

var objectives = [NumObjectives]objectiveInfo{
	ObjWaterFlux:         {"water_flux", "LMH", true, 0.1, 0},
	ObjSRSF:              {"specific_reverse_solute_flux", "g/L", false, 0.1, 0},
	ObjReplenishment:     {"replenishment_cost", "USD/m3", false, 0.1, 0},
	ObjRegeneration:      {"regeneration_energy", "kWh/m3", false, 0.1, 0},
	ObjViscosity:         {"viscosity", "mPa s", false, 0.1, 0},
	ObjSolubilityMargin:  {"solubility_margin", "fraction", true, 0, 0.1},
	ObjScaling:           {"scaling", "saturation index", false, 0, 0.5},
	ObjFluxEfficiency:    {"flux_efficiency", "fraction", true, 0, 0.1},
	ObjMassConcentration: {"mass_concentration", "g/L", false, 0.1, 0},
}

// Key returns the objective's request name.
func (o Objective) Key() string { return objectives[o].Key }

// Unit returns the unit of the objective's value as reported.
func (o Objective) Unit() string { return objectives[o].Unit }

// Maximise reports whether larger is better.
func (o Objective) Maximise() bool { return objectives[o].Maximise }

// ParseObjective finds an objective by its key.
func ParseObjective(key string) (Objective, bool) {
	k := strings.ToLower(strings.TrimSpace(key))
	for i, o := range objectives {
		if o.Key == k {
			return Objective(i), true
		}
	}
	return 0, false
}

// ObjectiveKeys lists the objective keys in order.
func ObjectiveKeys() []string {
	out := make([]string, NumObjectives)
	for i, o := range objectives {
		out[i] = o.Key
	}
	return out
}

// Weights holds one non-negative weight per objective.
type Weights [NumObjectives]float64

// DefaultWeights: water flux 0.25, specific reverse solute flux 0.20,
// replenishment cost 0.15, regeneration energy 0.10, viscosity 0.10,
// solubility margin 0.10, scaling 0.10; flux efficiency and mass
// concentration 0 (they are reported, and flux efficiency is already
// inside the water flux). Our own choice, in the spirit of the criteria
// of Achilli, Cath & Childress (2010) J. Membr. Sci. 364:233 (flux, reverse
// salt flux, replenishment cost, re-concentration).
var DefaultWeights = Weights{
	ObjWaterFlux: 0.25, ObjSRSF: 0.20, ObjReplenishment: 0.15, ObjRegeneration: 0.10,
	ObjViscosity: 0.10, ObjSolubilityMargin: 0.10, ObjScaling: 0.10,
}

// DefaultPareto are the default Pareto objectives.
var DefaultPareto = []Objective{ObjWaterFlux, ObjSRSF, ObjReplenishment}

// BasisKind is the basis of comparison.
type BasisKind int

// Bases of comparison.
const (
	BasisOsmoticPressure BasisKind = iota // equal bulk osmotic pressure
	BasisConcentration                    // equal concentration in a unit (mol/L, g/L, …)
	BasisWaterFlux                        // equal water flux
)

// Basis is the basis of comparison and its target.
type Basis struct {
	Kind BasisKind
	// PiPa is the target bulk osmotic pressure, used when MultipleOfFeed
	// is zero.
	PiPa float64
	// MultipleOfFeed sets the target to this multiple of the feed's π.
	MultipleOfFeed float64
	// Concentration and Unit: equal concentration.
	Concentration float64
	Unit          thermo.Unit
	// JwMPerS: equal water flux (in the ranking orientation).
	JwMPerS float64
}

// Feed is the resolved feed water.
type Feed struct {
	ID string // preset ID, or "custom"
	// Solute carries the feed's osmotic pressure; nil for pure water.
	Solute        *library.Solute
	Concentration float64
	Unit          thermo.Unit
	// OsmoticMethod describes how π was set (for the reproducibility record).
	OsmoticMethod string
	// Surrogate marks a Solute that only stands in for a mixed feed's
	// osmotic pressure (an equivalent NaCl): it is then always a species of
	// its own, never merged with a candidate of the same ID, so a NaCl draw
	// is not credited with a forward flux of salt the feed does not hold.
	Surrogate bool
	// Ions at bulk, in mol per litre of feed (per kg when IonsPerKg).
	Ions      []library.IonAmount
	IonsPerKg bool
	PH        float64
}

// Membrane holds the membrane in SI.
type Membrane struct {
	ID       string // preset ID or "custom"
	AMPerSPa float64
	SM       float64
	// B is the NaCl B and the measured B by solute (m/s); other solutes'
	// B is estimated (library.BEstimateRule).
	B library.SoluteB
	// BDrawMPerS, when BDrawSet, is used as B for every candidate (zero
	// allowed: an ideal, solute-tight membrane).
	BDrawMPerS float64
	BDrawSet   bool
	// UserIonB and UserSoluteB: the request's B by ion symbol and by
	// solute ID (m/s), before every estimate.
	UserIonB, UserSoluteB map[string]float64
	// Relative standard deviations for the robustness run.
	ARelSD, BRelSD, SRelSD float64
}

// Uncertainty describes the Monte Carlo robustness run.
type Uncertainty struct {
	Samples int
	// Relative standard deviations (log-normal factors with median 1).
	ARelSD, BRelSD, SRelSD float64
	OsmoticRelSD           float64 // of each candidate's π model
	// DefaultOsmotic replaces OsmoticRelSD by each candidate's default
	// (DefaultOsmoticRelSD, or DefaultVantHoffRelSD for a record without
	// a non-ideal model).
	DefaultOsmotic   bool
	DiffusivityRelSD float64 // of each candidate's D
	// EstimatedBRelSD is drawn per candidate, on top of the membrane's
	// shared B factor, for a B estimated from NaCl's (not measured): the
	// estimate's own error reorders candidates, the membrane's does not.
	EstimatedBRelSD float64
	// Prices: draw each price uniformly within its range.
	Prices bool
	// Shard splits the run between several engines (the page's Web
	// Workers, several API requests): this run evaluates only the samples
	// s with s mod ShardCount = ShardIndex, every sample still drawn in
	// the stream's order, and MergeRobustness adds the parts' rank counts
	// into the figures of the whole run. ShardCount 0 or 1: every sample.
	ShardIndex, ShardCount int
}

// The default spreads of the robustness run are the defaults of their
// ranges in engine/limits (each with its source there).
var (
	DefaultEstimatedBRelSD  = limits.EstimatedBRelSD.Default
	DefaultOsmoticRelSD     = limits.OsmoticRelSD.Default
	DefaultVantHoffRelSD    = limits.VantHoffOsmoticRelSD.Default
	DefaultDiffusivityRelSD = limits.DiffusivityRelSD.Default
)

// Scenario is everything a screen needs, resolved and in SI.
type Scenario struct {
	Feed         Feed
	Membrane     Membrane
	Orientations []transport.Orientation // [0] is ranked; the rest reported
	TemperatureK float64
	// KDrawMPerS, KFeedMPerS: given mass-transfer coefficients; 0 means
	// from Channel; +Inf means no external CP on that side.
	KDrawMPerS, KFeedMPerS float64
	Channel                transport.Channel
	Candidates             []*library.Solute
	Basis                  Basis
	VantHoff               bool // osmotic model "van-t-hoff" instead of "real"
	Weights                Weights
	Pareto                 []Objective
	ExcludeHazards         []string
	// AllowExtrapolation keeps candidates needed above their osmotic
	// model's data limit (flagged); otherwise they are excluded.
	AllowExtrapolation bool
	// RegenerationRecovery is the fraction of the diluted draw's water
	// recovered as product when it is re-concentrated (default 0.5).
	RegenerationRecovery float64
	Uncertainty          *Uncertainty
	Seed                 uint64
	// Normalisation: NormaliseSet (default) or NormaliseReference.
	Normalisation ScoreNormalisation
}

// inputErr builds the *errs.InputError of a scenario the screen cannot
// run; field uses the contract's names.
func inputErr(field string, limit any, format string, a ...any) *errs.InputError {
	return &errs.InputError{Field: field, Limit: limit, Msg: fmt.Sprintf(format, a...)}
}

// validate checks the resolved scenario.
func (sc *Scenario) validate() error {
	if len(sc.Candidates) == 0 {
		return inputErr("candidates", "at least one solute", "the candidate list is empty")
	}
	if len(sc.Orientations) == 0 {
		return inputErr("orientation", []string{"AL-FS", "AL-DS"}, "no orientation")
	}
	if err := limits.TemperatureC.Check(sc.TemperatureK - thermo.ZeroCelsiusK); err != nil {
		return err
	}
	m := sc.Membrane
	if !(m.AMPerSPa > 0) || !(m.SM > 0) || !(m.B.NaCl >= 0) || math.IsInf(m.AMPerSPa+m.SM+m.B.NaCl, 0) {
		return inputErr("membrane", nil, "A and S must be positive and B non-negative")
	}
	sum := 0.0
	for i, w := range sc.Weights {
		if err := limits.Weight.CheckAt("weights."+Objective(i).Key(), w); err != nil {
			return err
		}
		sum += w
	}
	if !(sum > 0) {
		return inputErr("weights", "at least one weight > 0", "all weights are zero")
	}
	if err := limits.RegenerationRecovery.Check(sc.RegenerationRecovery); err != nil {
		return err
	}
	b := sc.Basis
	switch b.Kind {
	case BasisOsmoticPressure:
		if b.MultipleOfFeed == 0 {
			if err := limits.BasisPressure.Check(b.PiPa / thermo.PascalPerBar); err != nil {
				return err
			}
		} else if err := limits.BasisMultiple.Check(b.MultipleOfFeed); err != nil {
			return err
		}
	case BasisConcentration:
		if err := limits.BasisValue.Check(b.Concentration); err != nil {
			return err
		}
	case BasisWaterFlux:
		if err := limits.BasisFlux.Check(b.JwMPerS / thermo.MPerSPerLMH); err != nil {
			return err
		}
	default:
		return inputErr("basis.kind", []string{"osmotic-pressure", "concentration", "water-flux"}, "unknown basis")
	}
	if u := sc.Uncertainty; u != nil {
		// Zero samples means no robustness run.
		if u.Samples != 0 {
			if err := limits.Samples.Check(float64(u.Samples)); err != nil {
				return err
			}
		}
		if u.ShardCount != 0 {
			if err := limits.RobustnessShards.Check(float64(u.ShardCount)); err != nil {
				return err
			}
			if u.ShardCount > max(1, u.Samples) {
				return inputErr("uncertainty.shard.count", fmt.Sprintf("≤ uncertainty.samples (%d)", u.Samples), "more parts than samples")
			}
		}
		if u.ShardIndex < 0 || u.ShardIndex >= max(1, u.ShardCount) {
			return inputErr("uncertainty.shard.index", fmt.Sprintf("0–%d (whole number, below uncertainty.shard.count)", max(1, u.ShardCount)-1), "no such part")
		}
		for _, f := range []struct {
			r *limits.Range
			v float64
		}{{&limits.ARelSD, u.ARelSD}, {&limits.BRelSD, u.BRelSD}, {&limits.SRelSD, u.SRelSD}, {&limits.OsmoticRelSD, u.OsmoticRelSD},
			{&limits.DiffusivityRelSD, u.DiffusivityRelSD}, {&limits.EstimatedBRelSD, u.EstimatedBRelSD}} {
			if err := f.r.Check(f.v); err != nil {
				return err
			}
		}
	}
	return nil
}
