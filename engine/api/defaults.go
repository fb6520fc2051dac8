package api

import (
	"context"
	"fmt"
	"io"
	"math"

	"drawsift/engine/errs"
	"drawsift/engine/internal/jsonx"
	"drawsift/engine/limits"
	"drawsift/engine/scenario"
	"drawsift/engine/screen"
	"drawsift/engine/thermo"
)

// LimitReport is one numeric input's accepted range and default, in the
// unit its field names. Min and Max are absent when unbounded.
type LimitReport struct {
	Field        string   `json:"field"`
	Unit         string   `json:"unit,omitempty"`
	Min          *float64 `json:"min,omitempty"`
	Max          *float64 `json:"max,omitempty"`
	MinExclusive bool     `json:"min_exclusive"`
	MaxExclusive bool     `json:"max_exclusive"`
	Integer      bool     `json:"integer"`
	Default      *float64 `json:"default,omitempty"`
	Text         string   `json:"text"`
	Why          string   `json:"why,omitempty"`
}

// ObjectiveReport is one objective of the score and the Pareto front.
type ObjectiveReport struct {
	Key      string `json:"key"`
	Unit     string `json:"unit"`
	Maximise bool   `json:"maximise"`
}

// DefaultsResponse is the engine's defaults and limits: what the page
// shows before the user changes anything and checks beside each field.
// No front end keeps a copy of any of these numbers.
type DefaultsResponse struct {
	// Limits by key (the contract field, or a key of its own where
	// several ranges share a field, e.g. basis.osmotic_pressure_bar).
	Limits           map[string]LimitReport `json:"limits"`
	Weights          map[string]float64     `json:"weights"`
	Objectives       []ObjectiveReport      `json:"objectives"`
	ParetoObjectives []string               `json:"pareto_objectives"`
	Channel          ChannelSpec            `json:"channel"`
	MembranePreset   string                 `json:"membrane_preset"`
	FeedPreset       string                 `json:"feed_preset"`
	Orientation      string                 `json:"orientation"`
	Orientations     []string               `json:"orientations"`
	OsmoticModel     string                 `json:"osmotic_model"`
	OsmoticModels    []string               `json:"osmotic_models"`
	// ScoreNormalisations: the accepted score_normalisation values, the
	// default first; ScoreReferenceSolute is the "reference" draw.
	ScoreNormalisations  []string `json:"score_normalisations"`
	ScoreReferenceSolute string   `json:"score_reference_solute"`
	// OsmoticModelAliases: other accepted spellings → the model's name.
	OsmoticModelAliases map[string]string `json:"osmotic_model_aliases"`
	// The basis a scenario without one gets: a multiple of the feed's π
	// when the feed has one, else a fixed π.
	BasisWithFeed       BasisSpec          `json:"basis_with_feed"`
	BasisWithoutFeed    BasisSpec          `json:"basis_without_feed"`
	HazardFlags         []string           `json:"hazard_flags"`
	ConcentrationUnits  []string           `json:"concentration_units"`
	PressureUnitsPa     map[string]float64 `json:"pressure_units_pa"`
	GasConstantJPerMolK float64            `json:"gas_constant_j_per_mol_k"`
	BatchMaxRequests    int                `json:"batch_max_requests"`
	// The work budgets: ranked candidates × robustness samples, and
	// candidates × orientations × sweep points.
	RobustnessMaxWork int    `json:"robustness_max_work"`
	SweepMaxWork      int    `json:"sweep_max_work"`
	EngineVersion     string `json:"engine_version"`
}

// Defaults reports the engine's defaults and limits (scenario.Defaults).
func Defaults() *DefaultsResponse {
	t := scenario.Defaults()
	r := &DefaultsResponse{
		Limits: map[string]LimitReport{}, Weights: map[string]float64{},
		Channel:        scenario.DefaultChannel(),
		MembranePreset: t.MembranePreset, FeedPreset: t.FeedPreset,
		Orientation: t.Orientation, Orientations: t.Orientations,
		OsmoticModel: t.OsmoticModel, OsmoticModels: t.OsmoticModels,
		ScoreNormalisations: screen.ScoreNormalisationNames, ScoreReferenceSolute: screen.ReferenceSolute, OsmoticModelAliases: scenario.OsmoticModelAliases,
		BasisWithFeed:       BasisSpec{Kind: "osmotic-pressure", MultipleOfFeed: ptr(limits.BasisMultiple.Default)},
		BasisWithoutFeed:    BasisSpec{Kind: "osmotic-pressure", Value: ptr(limits.BasisPressure.Default), Unit: limits.BasisPressure.Unit},
		HazardFlags:         t.HazardFlags,
		ConcentrationUnits:  thermo.UnitNames()[:thermo.OsmolPerKg],
		PressureUnitsPa:     map[string]float64{},
		GasConstantJPerMolK: thermo.GasConstant,
		BatchMaxRequests:    MaxBatch,
		RobustnessMaxWork:   screen.MaxRobustWork,
		SweepMaxWork:        screen.MaxSweepWork,
		EngineVersion:       EngineVersion,
	}
	for _, g := range t.Ranges {
		l := LimitReport{Field: g.Field, Unit: g.Unit, MinExclusive: g.MinOpen, MaxExclusive: g.MaxOpen, Integer: g.Integer,
			Text: g.Text(), Why: g.Why}
		if !math.IsInf(g.Min, 0) {
			l.Min = ptr(g.Min)
		}
		if !math.IsInf(g.Max, 0) {
			l.Max = ptr(g.Max)
		}
		if g.HasDefault {
			l.Default = ptr(g.Default)
		}
		r.Limits[g.ID()] = l
	}
	for o := screen.Objective(0); o < screen.NumObjectives; o++ {
		r.Weights[o.Key()] = t.Weights[o]
		r.Objectives = append(r.Objectives, ObjectiveReport{Key: o.Key(), Unit: o.Unit(), Maximise: o.Maximise()})
	}
	for _, o := range t.ParetoObjectives {
		r.ParetoObjectives = append(r.ParetoObjectives, o.Key())
	}
	for _, name := range thermo.PressureUnitNames() {
		r.PressureUnitsPa[name], _ = thermo.ParsePressureUnit(name)
	}
	return r
}

// MaxBatch bounds a batch: the page's plots need a few thousand points at
// most, and a batch runs in one call.
const MaxBatch = 20000

// BatchItem is one operation of a batch.
type BatchItem struct {
	Op   string           `json:"op"`
	Body jsonx.RawMessage `json:"body"`
}

// BatchResult is one answer of a batch: the response, or the error object.
type BatchResult struct {
	OK     bool             `json:"ok"`
	Result jsonx.RawMessage `json:"result"`
}

// Batch runs a list of osmotic and flux requests in one call; one failure
// does not stop the rest (its answer is the error object, ok false).
// progress, if not nil, receives (done, total) after each item. A ctx
// that ends before the first item is answered stops the batch with its
// error; one that ends later makes that item and every one after it
// answer ok false with the same error, so the items already answered are
// kept (BatchStream has written them by then).
func Batch(ctx context.Context, items []BatchItem, progress func(done, total int)) ([]BatchResult, *Error) {
	res := make([]BatchResult, 0, min(len(items), MaxBatch))
	if e := batchEach(ctx, items, progress, func(_ int, r BatchResult) error {
		res = append(res, r)
		return nil
	}); e != nil {
		return nil, e
	}
	return res, nil
}

// batchEach runs the items in order and hands each answer to emit as soon
// as it is ready; see Batch. An error from emit (a client gone) stops it.
func batchEach(ctx context.Context, items []BatchItem, progress func(done, total int), emit func(int, BatchResult) error) *Error {
	if len(items) > MaxBatch {
		return Invalid("batch", MaxBatch, "a batch holds at most %d requests (got %d)", MaxBatch, len(items))
	}
	var stopped []byte // the error object of the ctx that ended
	for i, it := range items {
		var r BatchResult
		switch {
		case stopped != nil:
			r = BatchResult{Result: stopped}
		case ctx.Err() != nil:
			e := fromEngine("", ctx.Err())
			if i == 0 {
				return e
			}
			stopped = encodeError(e)
			r = BatchResult{Result: stopped}
		case it.Op != OpOsmotic && it.Op != OpFlux:
			e := Invalid(fmt.Sprintf("batch[%d].op", i), []string{OpOsmotic, OpFlux}, "a batch runs osmotic and flux requests only (got %q)", it.Op)
			r = BatchResult{Result: encodeError(e)}
		default:
			out, e := DispatchProgress(ctx, it.Op, it.Body, nil)
			r = BatchResult{OK: e == nil, Result: out}
		}
		if err := emit(i, r); err != nil {
			return &Error{Field: "batch", Message: "writing the answer: " + err.Error(), Kind: KindInvalid}
		}
		if progress != nil {
			progress(i+1, len(items))
		}
	}
	return nil
}

// BatchStream answers a batch request exactly as Dispatch(ctx, OpBatch,
// body) does — the same bytes — but writes the array to w one answer at a
// time, so that a host holds one answer in memory, never the whole batch.
// Until the first answer is written it returns any error (started false,
// nothing written) for the host to answer with the error's status; once
// started, the array is always closed, and an error means w failed.
func BatchStream(ctx context.Context, body []byte, w io.Writer, progress func(done, total int)) (started bool, e *Error) {
	var items []BatchItem
	if e = decode(body, &items); e != nil {
		e.Field = errs.Join("batch", e.Field)
		return false, e
	}
	sw := &stickyWriter{w: w}
	write := sw.write
	e = batchEach(ctx, items, progress, func(i int, r BatchResult) error {
		b, err := jsonx.Marshal(r)
		if err != nil {
			b = encodeError(&Error{Message: "internal error", Kind: KindInternal, detail: "marshal: " + err.Error()})
			b, _ = jsonx.Marshal(BatchResult{Result: b})
		}
		sep := []byte{','}
		if !started {
			started, sep = true, []byte{'['}
		}
		write(sep, b)
		return sw.err
	})
	switch {
	case e != nil && !started:
		return false, e
	case !started:
		write([]byte("[]"))
	default:
		write([]byte{']'})
	}
	if sw.err != nil {
		return true, &Error{Field: "batch", Message: "writing the answer: " + sw.err.Error(), Kind: KindInvalid}
	}
	return true, nil
}
