package screen

import (
	"context"
	"errors"
	"fmt"
	"math"
	"strconv"
	"strings"

	"drawsift/engine/errs"
	"drawsift/engine/library"
	"drawsift/engine/thermo"
	"drawsift/engine/transport"
	"drawsift/engine/warn"
)

// Ranked is one candidate that passed every hard limit.
type Ranked struct {
	Solute *library.Solute
	Rank   int // 1 = best
	Score  float64
	// Contributions: weight·normalised value/Σweights per objective; they
	// sum to Score.
	Contributions [NumObjectives]float64
	Normalised    [NumObjectives]float64
	Values        [NumObjectives]float64
	Known         [NumObjectives]bool
	Pareto        bool
	Metrics       Metrics // in the ranking orientation
	// Other holds the other requested orientations, at the same draw
	// concentration.
	Other      []OtherOrientation
	BMPerS     float64
	BEstimated bool
	HasPrice   bool
	PriceMin   float64
	PriceMax   float64
	Robustness *Robustness
	Warnings   []warn.Warning

	ci int // index of the candidate in the prepared env
}

// OtherOrientation is a candidate's result in a non-ranking orientation.
type OtherOrientation struct {
	Orientation transport.Orientation
	Metrics     *Metrics // nil when Reason is set
	Reason      string
}

// Excluded is a candidate listed apart with its reason.
type Excluded struct {
	Solute *library.Solute
	Reason string // one of the Reason… constants
	Detail string
}

// Result is a complete screen.
type Result struct {
	Ranked   []Ranked
	Excluded []Excluded
	Warnings []warn.Warning
	FeedPiPa float64
	// TargetPiPa is the basis osmotic pressure (osmotic-pressure basis).
	TargetPiPa float64
	// Samples is the number of Monte Carlo samples run (0 without a
	// robustness run).
	Samples int
	// FeedScaling holds the saturation indices of the bulk feed.
	FeedScaling Scaling
	// Reference is the reference draw at the basis (NormaliseReference).
	Reference *Reference
}

// ErrNoCandidate means no candidate could be ranked: every one failed a
// hard limit. The Result still lists them in Excluded.
var ErrNoCandidate = errors.New("no candidate passes the hard limits")

// Run screens the scenario: each candidate is brought to the basis,
// evaluated, normalised, scored and ranked; failures are listed apart;
// with sc.Uncertainty the Monte Carlo robustness run follows, calling
// progress(done, total) as it goes and stopping when ctx is cancelled.
//
// Errors: *errs.InputError for a scenario that cannot run (field named);
// an *errs.InputError on "basis.value" when no candidate can reach the basis
// target (the Result is returned too, with every exclusion); ctx.Err()
// when cancelled.
func Run(ctx context.Context, sc *Scenario, lib *library.Library, progress func(done, total int)) (*Result, error) {
	e, err := prepare(ctx, sc, lib)
	if err != nil {
		return nil, err
	}
	res := &Result{FeedPiPa: e.feedPiPa, TargetPiPa: e.targetPi, FeedScaling: e.feedScaling}
	res.Warnings = append(res.Warnings, e.warnings...)
	ori := sc.Orientations[0]
	var scratch transport.Result
	for i := range e.cands {
		if err := ctx.Err(); err != nil {
			return nil, err
		}
		c := &e.cands[i]
		var m Metrics
		if ex := e.evaluate(c, ori, &nominal, &m, &scratch); ex != nil {
			res.Excluded = append(res.Excluded, Excluded{Solute: c.sol, Reason: ex.reason, Detail: ex.detail})
			continue
		}
		r := Ranked{ci: i, Solute: c.sol, Metrics: m, BMPerS: c.bMPerS, BEstimated: c.bEstimated,
			HasPrice: c.hasPrice, PriceMin: c.priceMin, PriceMax: c.priceMax}
		r.Warnings = make([]warn.Warning, 0, len(c.warnings)+len(m.Warnings)+4)
		r.Warnings = append(r.Warnings, c.warnings...)
		r.Warnings = append(r.Warnings, m.Warnings...)
		r.Warnings = metricWarnings(r.Warnings, c, &m)
		for _, o := range sc.Orientations[1:] {
			oo := OtherOrientation{Orientation: o}
			var mo Metrics
			if ex := e.metricsAt(c, o, m.MolalityMolPerKg, &nominal, &mo, &scratch); ex != nil {
				oo.Reason = ex.Error()
			} else {
				oo.Metrics = &mo
			}
			r.Other = append(r.Other, oo)
		}
		for o := Objective(0); o < NumObjectives; o++ {
			r.Values[o], r.Known[o] = m.Objective(o)
		}
		res.Ranked = append(res.Ranked, r)
	}
	if len(res.Ranked) == 0 {
		field := "candidates"
		switch sc.Basis.Kind {
		case BasisOsmoticPressure, BasisWaterFlux, BasisConcentration:
			field = "basis.value"
		}
		return res, &errs.InputError{Field: field, Msg: fmt.Sprintf("%v: no candidate can be evaluated at this basis (see excluded)", ErrNoCandidate)}
	}
	if sc.Normalisation == NormaliseReference {
		if res.Reference, err = referenceDraw(ctx, sc, lib); err != nil {
			return nil, err
		}
	}
	rankRows(res.Ranked, sc, res.Reference)
	if u := sc.Uncertainty; u != nil && u.Samples > 0 {
		if err := e.robustness(ctx, res, progress); err != nil {
			return nil, err
		}
	}
	return res, nil
}

// rankRows normalises, scores, orders and marks the Pareto front.
func rankRows(rows []Ranked, sc *Scenario, ref *Reference) {
	w, pareto := &sc.Weights, sc.Pareto
	n := len(rows)
	vals := make([][NumObjectives]float64, n)
	known := make([][NumObjectives]bool, n)
	norm := make([][NumObjectives]float64, n)
	for i := range rows {
		vals[i], known[i] = rows[i].Values, rows[i].Known
	}
	normaliseRows(sc.Normalisation, ref, vals, known, norm)
	front := ParetoFront(vals, known, pareto)
	scores := make([]float64, n)
	names := make([]string, n)
	for i := range rows {
		rows[i].Normalised = norm[i]
		rows[i].Score = Score(&norm[i], w, &rows[i].Contributions)
		rows[i].Pareto = front[i]
		scores[i], names[i] = rows[i].Score, rows[i].Solute.ID
	}
	idx := make([]int, n)
	for i := range idx {
		idx[i] = i
	}
	order(idx, scores, names)
	sorted := make([]Ranked, n)
	for k, i := range idx {
		sorted[k] = rows[i]
		sorted[k].Rank = k + 1
	}
	copy(rows, sorted)
}

// referenceDraw evaluates the reference draw (ReferenceSolute) at the
// scenario's basis, membrane, feed and ranking orientation, with the
// nominal values; an *errs.InputError on "score_normalisation" when it
// cannot be evaluated there.
func referenceDraw(ctx context.Context, sc *Scenario, lib *library.Library) (*Reference, error) {
	s, ok := lib.Lookup(ReferenceSolute)
	if !ok {
		return nil, inputErr("score_normalisation", ScoreNormalisationNames, "the reference draw %s is not in the library", ReferenceSolute)
	}
	rs := *sc
	rs.Candidates, rs.Uncertainty, rs.ExcludeHazards, rs.Orientations = []*library.Solute{s}, nil, nil, sc.Orientations[:1]
	e, err := prepare(ctx, &rs, lib)
	if err != nil {
		return nil, err
	}
	ref := &Reference{Solute: s}
	var scratch transport.Result
	if ex := e.evaluate(&e.cands[0], rs.Orientations[0], &nominal, &ref.Metrics, &scratch); ex != nil {
		return nil, inputErr("score_normalisation", `"set"`, "the reference draw %s cannot be evaluated at this basis (%s: %s); score against the set instead (\"set\")",
			ReferenceSolute, ex.reason, ex.detail)
	}
	for o := Objective(0); o < NumObjectives; o++ {
		ref.Values[o], ref.Known[o] = ref.Metrics.Objective(o)
	}
	return ref, nil
}

// metricWarnings appends to w the notes on a candidate's results worth a
// second look. It runs for every candidate of every screen: the common
// notes are joined by hand rather than through fmt.
func metricWarnings(w []warn.Warning, c *candidate, m *Metrics) []warn.Warning {
	id := c.sol.ID
	x := c.x
	if from, _, ok := x.BridgeMolPerKg(); ok && m.MolalityMolPerKg > from*(1+1e-9) {
		w = append(w, warn.New(warn.Bridged, id, "%s: %.4g mol/kg is above the osmotic model's data limit of %.4g mol/kg; π is interpolated to the measured saturated solution",
			c.sol.ID, m.MolalityMolPerKg, from))
	} else if m.MolalityMolPerKg > x.ValidMolPerKg()*(1+1e-9) {
		w = append(w, warn.New(warn.Extrapolated, id, "%s: %.4g mol/kg is above the osmotic model's data limit of %.4g mol/kg (extrapolated)",
			c.sol.ID, m.MolalityMolPerKg, x.ValidMolPerKg()))
	}
	if mf, ok := x.MolalityFromMolarity(m.FeedFaceDrawMolPerM3); !ok || mf > x.SolubilityMolPerKg() {
		w = append(w, warn.Warning{Code: warn.Solubility, Subject: id, Text: id + " exceeds its solubility at the feed-side face of the active layer"})
	}
	if m.Scaling.Any && m.Scaling.Max > 0 {
		for k := Mineral(0); k < NumMinerals; k++ {
			if m.Scaling.Has[k] && m.Scaling.SI[k] > 0 {
				w = append(w, warn.Warning{Code: warn.Scaling, Subject: id,
					Text: id + ": " + k.Name() + " supersaturated at the feed-side membrane surface (SI " + strconv.FormatFloat(m.Scaling.SI[k], 'f', 2, 64) + ")"})
			}
		}
	}
	if m.Scaling.Has[Hydroxyapatite] && m.Scaling.IonicStrengthMolPerL > 0.5 {
		w = append(w, warn.New(warn.Extrapolated, id, "%s: ionic strength %.2g mol/L at the feed-side surface is beyond the Davies equation's range; the hydroxyapatite index is indicative", c.sol.ID, m.Scaling.IonicStrengthMolPerL))
	}
	if m.SolubilityMargin < 0.1 && !math.IsInf(m.SolubilityMolPerKg, 1) {
		w = append(w, warn.Warning{Code: warn.Solubility, Subject: id, Text: id + ": within 10 % of its solubility"})
	}
	if len(c.sol.HazardFlags) > 0 {
		w = append(w, warn.Warning{Code: warn.ModelNote, Subject: id, Text: id + ": handle per its safety data sheet (flagged: " + strings.Join(c.sol.HazardFlags, ", ") + ")"})
	}
	return w
}

// KWhPerM3 converts J/m³ to kWh/m³ (by thermo.JPerKWh).
func KWhPerM3(j float64) float64 { return j / thermo.JPerKWh }

// LMH converts m/s to L m⁻² h⁻¹ (by thermo.MPerSPerLMH).
func LMH(v float64) float64 { return v / thermo.MPerSPerLMH }
