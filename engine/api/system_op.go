//go:build !nofit

package api

import (
	"context"
	"sort"
	"strings"
	"sync"

	"drawsift/engine/library"
	"drawsift/engine/regen"
	"drawsift/engine/scenario"
	"drawsift/engine/screen"
)

// systemTolerance is the module integrator's tolerance in the system
// stage: looser than a module request's default (1e-9); the design then
// meets the recovery to 1e-5 relative (module.Design's tolerance is 100×
// the integrator's) — far inside the prices' own uncertainty — in about
// two thirds of the time.
const systemTolerance = 1e-7

// systemOutcome is one candidate's system rating, or why there is none.
type systemOutcome struct {
	m      *SystemMetrics
	reason string
}

// systemStage rates every ranked candidate at plant scale (SystemMetrics)
// and, for the "system" basis, ranks them by cost per m³; those it cannot
// rate move to excluded with the reason. Candidates are rated on every
// core the request may use (screen.Cores); each is independent, so the
// result does not depend on the order.
func systemStage(ctx context.Context, req *ScreenRequest, info *scenario.Info, resp *ScreenResponse, progress func(done, total int)) *Error {
	sys, err := scenario.ResolveSystem(req.System)
	if err != nil {
		return fromEngine("", err)
	}
	feed := ModuleStream{}
	if f := req.Feed; f != nil {
		if len(f.Ions) > 0 {
			return &Error{Field: "feed.ions", Message: "the system stage takes a feed by preset, solute or mixture, not by a list of ions", Limit: "a preset, a solute or a mixture", Kind: KindInvalid}
		}
		feed.Concentration = scenario.Concentration{Preset: f.Preset, Solute: f.Solute, Concentration: f.Concentration, Unit: f.Unit, Mixture: f.Mixture}
	}
	productLPerH := sys.ProductM3PerDay * 1000 / 24
	feedLPerH := productLPerH / sys.Recovery
	drawLPerH := feedLPerH * sys.DrawToFeedFlowRatio
	feed.FlowLPerH = &feedLPerH
	// A screen's b_lmh is the membrane's NaCl B (unless b_nacl_lmh is
	// also given); a module's is the draw solute's own.
	mem := &MembraneSpec{Preset: scenario.DefaultMembranePreset}
	if req.Membrane != nil {
		m := *req.Membrane
		if m.BNaClLMH == nil && m.BLMH != nil {
			m.BNaClLMH, m.BLMH = m.BLMH, nil
		}
		mem = &m
	}
	blends := map[string][]scenario.BlendPart{}
	for _, c := range req.Candidates {
		if len(c.Blend) > 0 {
			blends[c.ID] = c.Blend
		}
	}
	tol, points := systemTolerance, 2.0
	rate := func(c *ScreenCandidate) systemOutcome {
		if info.Custom[c.Solute] {
			return systemOutcome{reason: "a custom solute is not rated at plant scale (the module takes library solutes and blends)"}
		}
		price, ok := sys.DrawUSDPerKg[library.Key(c.Solute)]
		if !ok {
			if c.PriceUSDPerKgMin == nil || c.PriceUSDPerKgMax == nil {
				return systemOutcome{reason: "no price on record: give system.prices.draw_usd_per_kg"}
			}
			price = (*c.PriceUSDPerKgMin + *c.PriceUSDPerKgMax) / 2
		}
		m := c.MolalityMolPerKg
		draw := &ModuleStream{Concentration: scenario.Concentration{Solute: c.Solute, Concentration: &m, Unit: "mol/kg"}, FlowLPerH: &drawLPerH}
		if b := blends[c.Solute]; b != nil {
			draw.Concentration = scenario.Concentration{ID: c.Solute, Blend: b, Concentration: &m, Unit: "mol/kg"}
		}
		rec := sys.Recovery
		mreq := &ModuleRequest{Membrane: mem, Orientation: resp.Orientation, Draw: draw, Feed: &feed, TemperatureC: req.TemperatureC,
			KDrawMPerS: req.KDrawMPerS, KFeedMPerS: req.KFeedMPerS, Channel: req.Channel, ExternalCP: req.ExternalCP,
			OsmoticModel: req.OsmoticModel, AllowExtrapolation: req.AllowExtrapolation, Flow: sys.Flow,
			Target: &ModuleTarget{Recovery: &rec}, ProfilePoints: &points, Tolerance: &tol, Regeneration: regenSpecOf(req.System)}
		r, e := Module(ctx, mreq)
		if e != nil {
			return systemOutcome{reason: e.Message}
		}
		var best *SystemMetrics
		for i := range r.Regeneration {
			g := &r.Regeneration[i]
			if g.Route != r.RegenerationBest {
				continue
			}
			best = &SystemMetrics{RegenerationRoute: g.Route, RegenerationLossGPerM3: g.DrawLossGPerM3,
				ElectricKWhPerM3: g.ElectricKWhPerM3, HeatKWhPerM3: g.HeatKWhPerM3, EnergyKWhPerM3: g.EquivalentWorkKWhPerM3}
		}
		if best == nil || r.DrawMakeUpGPerM3 == nil {
			return systemOutcome{reason: "no regeneration route can re-concentrate the leaving draw at this duty"}
		}
		s := best
		s.AreaM2, s.AreaM2PerM3PerDay = r.AreaM2, r.AreaM2/sys.ProductM3PerDay
		s.AverageWaterFluxLMH, s.RecoveryCap = r.AverageWaterFluxLMH, r.RecoveryCap
		s.DrawOutConcentrationMolPerL, s.DrawOutOsmoticPressureBar = r.DrawOut.ConcentrationMolPerL, r.DrawOut.OsmoticPressureBar
		s.MakeUpGPerM3 = *r.DrawMakeUpGPerM3
		s.ReverseSoluteLossGPerM3 = s.MakeUpGPerM3 - s.RegenerationLossGPerM3
		if rm := r.RegenerationMinimum; rm != nil {
			s.MinimumKWhPerM3 = rm.KWhPerM3Water
		}
		s.DrawPriceUSDPerKg = price
		s.MakeUpCostUSDPerM3 = s.MakeUpGPerM3 / 1000 * price
		s.EnergyCostUSDPerM3 = s.ElectricKWhPerM3*sys.ElectricityUSDPerKWh + s.HeatKWhPerM3*sys.HeatUSDPerKWh
		s.MembraneCostUSDPerM3 = r.AreaM2 * sys.MembraneUSDPerM2 / (sys.MembraneLifeYears * 365 * sys.ProductM3PerDay)
		s.CostUSDPerM3 = s.MakeUpCostUSDPerM3 + s.EnergyCostUSDPerM3 + s.MembraneCostUSDPerM3
		s.CouponRank = c.Rank
		return systemOutcome{m: s}
	}

	n := len(resp.Candidates)
	out := make([]systemOutcome, n)
	var (
		wg   sync.WaitGroup
		mu   sync.Mutex
		next int
		done int
	)
	for w := 0; w < min(screen.Cores(ctx), n); w++ {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for {
				mu.Lock()
				i := next
				next++
				mu.Unlock()
				if i >= n || ctx.Err() != nil {
					return
				}
				out[i] = rate(&resp.Candidates[i])
				mu.Lock()
				done++
				if progress != nil {
					progress(done, n)
				}
				mu.Unlock()
			}
		}()
	}
	wg.Wait()
	if err := ctx.Err(); err != nil {
		return &Error{Message: "screen cancelled: " + err.Error(), Kind: KindInvalid}
	}

	rep := &SystemReport{Recovery: sys.Recovery, ProductM3PerDay: sys.ProductM3PerDay, FeedInflowM3PerDay: feedLPerH * 24 / 1000,
		DrawInflowM3PerDay: drawLPerH * 24 / 1000, DrawToFeedFlowRatio: sys.DrawToFeedFlowRatio, Flow: sys.Flow,
		ElectricityUSDPerKWh: sys.ElectricityUSDPerKWh, HeatUSDPerKWh: sys.HeatUSDPerKWh, MembraneUSDPerM2: sys.MembraneUSDPerM2,
		MembraneLifeYears: sys.MembraneLifeYears, Ranked: info.SystemBasis, Tolerance: systemTolerance, Method: systemMethod}
	resp.System = rep
	for i := range out {
		if out[i].m != nil {
			rep.Rated++
		}
	}
	if !info.SystemBasis {
		for i := range resp.Candidates {
			resp.Candidates[i].System = out[i].m
			resp.Candidates[i].SystemReason = out[i].reason
		}
		return nil
	}
	// Rank by cost: the rated candidates, cheapest first (equal costs by
	// energy, then by the coupon rank); the rest are excluded.
	kept := resp.Candidates[:0:0]
	for i, c := range resp.Candidates {
		if out[i].m == nil {
			resp.Excluded = append(resp.Excluded, ScreenExcluded{Solute: c.Solute, Reason: "not rated at plant scale", Detail: out[i].reason})
			continue
		}
		c.System = out[i].m
		kept = append(kept, c)
	}
	sort.SliceStable(kept, func(a, b int) bool {
		x, y := kept[a].System, kept[b].System
		if x.CostUSDPerM3 != y.CostUSDPerM3 {
			return x.CostUSDPerM3 < y.CostUSDPerM3
		}
		if x.EnergyKWhPerM3 != y.EnergyKWhPerM3 {
			return x.EnergyKWhPerM3 < y.EnergyKWhPerM3
		}
		return x.CouponRank < y.CouponRank
	})
	for i := range kept {
		kept[i].Rank = i + 1
		kept[i].Score = 1
		if c := kept[i].System.CostUSDPerM3; c > 0 {
			kept[i].Score = kept[0].System.CostUSDPerM3 / c
		}
	}
	resp.Candidates = kept
	if len(kept) == 0 {
		var why []string
		for _, x := range resp.Excluded {
			why = append(why, x.Solute+": "+x.Detail)
		}
		return &Error{Field: "system.recovery", Message: "no candidate can be rated at plant scale (lower the recovery, or raise the basis): " + strings.Join(why, "; "),
			Limit: "a recovery some candidate reaches", Kind: KindInvalid}
	}
	return nil
}

// regenSpecOf is the system's regeneration object, or nil.
func regenSpecOf(s *scenario.SystemSpec) *regen.Spec {
	if s == nil {
		return nil
	}
	return s.Regeneration
}
