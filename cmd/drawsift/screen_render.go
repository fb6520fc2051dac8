package main

import (
	"bytes"
	_ "embed"
	"encoding/json"
	"fmt"
	"io"
	"sort"
	"strconv"
	"strings"
	"text/tabwriter"

	"drawsift/engine/api"
)

// demoScenario is the scenario of `drawsift screen --demo`: a small field
// station treating brackish well water with a thin-film composite FO
// membrane in a spacer-filled module at 22 °C, choosing among common draw
// solutes at an equal 25 bar, toxic solutes excluded. A scenario of our
// own; the numbers are the engine's.
//
//go:embed demo_scenario.json
var demoScenario []byte

// screenColumns are the CSV columns: header (with unit) and value.
var screenColumns = []struct {
	head string
	val  func(c *api.ScreenCandidate) string
}{
	{"rank", func(c *api.ScreenCandidate) string { return strconv.Itoa(c.Rank) }},
	{"solute", func(c *api.ScreenCandidate) string { return c.Solute }},
	{"score (0-1)", func(c *api.ScreenCandidate) string { return num(c.Score) }},
	{"pareto_optimal", func(c *api.ScreenCandidate) string { return strconv.FormatBool(c.ParetoOptimal) }},
	{"orientation", func(c *api.ScreenCandidate) string { return c.Orientation }},
	{"concentration (mol/L)", func(c *api.ScreenCandidate) string { return num(c.ConcentrationMolPerL) }},
	{"concentration (g/L)", func(c *api.ScreenCandidate) string { return num(c.ConcentrationGPerL) }},
	{"molality (mol/kg)", func(c *api.ScreenCandidate) string { return num(c.MolalityMolPerKg) }},
	{"solubility (mol/kg)", func(c *api.ScreenCandidate) string { return optNum(c.SolubilityMolPerKg) }},
	{"solubility margin (fraction)", func(c *api.ScreenCandidate) string { return num(c.SolubilityMarginFraction) }},
	{"osmotic pressure (bar)", func(c *api.ScreenCandidate) string { return num(c.OsmoticPressureBar) }},
	{"van 't Hoff (bar)", func(c *api.ScreenCandidate) string { return num(c.VantHoffBar) }},
	{"osmotic pressure per mol/L (bar L/mol)", func(c *api.ScreenCandidate) string { return num(c.OsmoticPressurePerMolarityBarLPerMol) }},
	{"van 't Hoff per mol/L (bar L/mol)", func(c *api.ScreenCandidate) string { return num(c.VantHoffPerMolarityBarLPerMol) }},
	{"osmotic pressure per g/L (bar L/g)", func(c *api.ScreenCandidate) string { return num(c.OsmoticPressurePerMassBarLPerG) }},
	{"van 't Hoff per g/L (bar L/g)", func(c *api.ScreenCandidate) string { return num(c.VantHoffPerMassBarLPerG) }},
	{"water flux (LMH)", func(c *api.ScreenCandidate) string { return num(c.WaterFluxLMH) }},
	{"flux efficiency (fraction)", func(c *api.ScreenCandidate) string { return num(c.FluxEfficiency) }},
	{"reverse solute flux (g/m2/h)", func(c *api.ScreenCandidate) string { return num(c.ReverseSoluteFluxGMH) }},
	{"reverse solute flux (mmol/m2/h)", func(c *api.ScreenCandidate) string { return num(c.ReverseSoluteFluxMmolPerM2H) }},
	{"specific reverse solute flux (g/L)", func(c *api.ScreenCandidate) string { return num(c.SpecificReverseSoluteFluxGPerL) }},
	{"replenishment cost (USD/m3)", func(c *api.ScreenCandidate) string { return optNum(c.ReplenishmentCostUSDPerM3) }},
	{"replenishment cost min (USD/m3)", func(c *api.ScreenCandidate) string { return optNum(c.ReplenishmentCostMinUSDPerM3) }},
	{"replenishment cost max (USD/m3)", func(c *api.ScreenCandidate) string { return optNum(c.ReplenishmentCostMaxUSDPerM3) }},
	{"viscosity (mPa s)", func(c *api.ScreenCandidate) string { return num(c.ViscosityMPaS) }},
	{"min regeneration energy (kWh/m3)", func(c *api.ScreenCandidate) string { return num(c.MinRegenerationEnergyKWhPerM3) }},
	{"max saturation index (log10)", func(c *api.ScreenCandidate) string { return optNum(c.MaxSaturationIndex) }},
	{"max saturation index mineral", func(c *api.ScreenCandidate) string { return maxMineral(c.Scaling) }},
	{"feed-face saturation indices (mineral=log10 SI)", func(c *api.ScreenCandidate) string { return scalingText(c.Scaling, "=") }},
	{"B (LMH)", func(c *api.ScreenCandidate) string { return num(c.BLMH) }},
	{"B estimated", func(c *api.ScreenCandidate) string { return strconv.FormatBool(c.BEstimated) }},
	{"trust", func(c *api.ScreenCandidate) string { return trustCodes(c.Trust) }},
	{"hazard flags", func(c *api.ScreenCandidate) string { return strings.Join(c.HazardFlags, "; ") }},
	{"P(first) (fraction)", func(c *api.ScreenCandidate) string {
		if c.Robustness == nil {
			return ""
		}
		return num(c.Robustness.ProbabilityFirst)
	}},
	{"P(top 3) (fraction)", func(c *api.ScreenCandidate) string {
		if c.Robustness == nil {
			return ""
		}
		return num(c.Robustness.ProbabilityTop3)
	}},
	{"rank 5-95 % interval", func(c *api.ScreenCandidate) string {
		if c.Robustness == nil {
			return ""
		}
		return fmt.Sprintf("%d-%d", c.Robustness.RankP05, c.Robustness.RankP95)
	}},
	{"system cost (USD/m3)", sysNum(func(m *api.SystemMetrics) float64 { return m.CostUSDPerM3 })},
	{"system make-up (g/m3)", sysNum(func(m *api.SystemMetrics) float64 { return m.MakeUpGPerM3 })},
	{"system energy (kWh/m3)", sysNum(func(m *api.SystemMetrics) float64 { return m.EnergyKWhPerM3 })},
	{"system heat (kWh/m3)", sysNum(func(m *api.SystemMetrics) float64 { return m.HeatKWhPerM3 })},
	{"system area (m2 per m3/day)", sysNum(func(m *api.SystemMetrics) float64 { return m.AreaM2PerM3PerDay })},
	{"system regeneration route", func(c *api.ScreenCandidate) string {
		if c.System == nil {
			return c.SystemReason
		}
		return c.System.RegenerationRoute
	}},
	{"excluded reason", func(c *api.ScreenCandidate) string { return "" }},
}

// sysNum is a system-metric column: empty when the row was not rated at
// plant scale.
func sysNum(f func(*api.SystemMetrics) float64) func(*api.ScreenCandidate) string {
	return func(c *api.ScreenCandidate) string {
		if c.System == nil {
			return ""
		}
		return num(f(c.System))
	}
}

// trustCodes joins a row's trust codes ("van-t-hoff; b-estimated").
func trustCodes(ms []api.TrustMark) string {
	codes := make([]string, len(ms))
	for i, m := range ms {
		codes[i] = m.Code
	}
	return strings.Join(codes, "; ")
}

// trustLegend lists each trust code the rows carry with its text, once.
func trustLegend(cs []api.ScreenCandidate) []api.TrustMark {
	var out []api.TrustMark
	seen := map[string]bool{}
	for _, c := range cs {
		for _, m := range c.Trust {
			if !seen[m.Code] {
				seen[m.Code] = true
				out = append(out, m)
			}
		}
	}
	return out
}

func num(v float64) string { return strconv.FormatFloat(v, 'g', 6, 64) }

func optNum(v *float64) string {
	if v == nil {
		return ""
	}
	return num(*v)
}

// renderScreen writes a screen response as CSV (one row per candidate,
// units in the header, the excluded after the ranked, then the
// reproducibility record) or as a compact terminal table.
func renderScreen(w io.Writer, format string, resp []byte) error {
	var r api.ScreenResponse
	if err := json.Unmarshal(resp, &r); err != nil {
		return err
	}
	// The bulk feed's saturation indices, when the engine reports them.
	var bulk struct {
		FeedSaturationIndices map[string]float64 `json:"feed_saturation_indices"`
	}
	if err := json.Unmarshal(resp, &bulk); err != nil {
		return err
	}
	if format == "csv" {
		return screenCSV(w, &r, bulk.FeedSaturationIndices)
	}
	plainStrings(&r)
	return screenTable(w, &r, bulk.FeedSaturationIndices)
}

// maxMineral names the mineral with the highest saturation index.
func maxMineral(sc []api.ScalingIndex) string {
	best := -1
	for i, s := range sc {
		if best < 0 || s.SaturationIndex > sc[best].SaturationIndex {
			best = i
		}
	}
	if best < 0 {
		return ""
	}
	return sc[best].Mineral
}

// scalingText lists the saturation indices, highest first, as
// "mineral<sep>SI" joined by "; ".
func scalingText(sc []api.ScalingIndex, sep string) string {
	m := make(map[string]float64, len(sc))
	for _, s := range sc {
		m[s.Mineral] = s.SaturationIndex
	}
	return siList(m, sep)
}

func siList(si map[string]float64, sep string) string {
	var parts []string
	for _, k := range minerals(si) {
		parts = append(parts, k+sep+strconv.FormatFloat(si[k], 'f', 2, 64))
	}
	return strings.Join(parts, "; ")
}

// tableIDLen is the longest candidate ID the terminal table prints in
// full; a longer one (a blend's, say) is cut and footnoted with its full ID.
const tableIDLen = 22

func screenCSV(w io.Writer, r *api.ScreenResponse, bulk map[string]float64) error {
	cw := newCSV(w)
	head := make([]string, len(screenColumns))
	for i, c := range screenColumns {
		head[i] = c.head
	}
	if err := cw.Write(head); err != nil {
		return err
	}
	for i := range r.Candidates {
		row := make([]string, len(screenColumns))
		for j, c := range screenColumns {
			row[j] = c.val(&r.Candidates[i])
		}
		cw.Write(row)
	}
	for _, x := range r.Excluded {
		row := make([]string, len(screenColumns))
		row[1] = x.Solute
		row[len(row)-1] = x.Reason + ": " + x.Detail
		cw.Write(row)
	}
	// Reproducibility record, below a blank row.
	cw.Write([]string{})
	scen, _ := json.Marshal(r.Scenario)
	cw.Write([]string{"engine_version", r.EngineVersion})
	cw.Write([]string{"score_normalisation", r.ScoreNormalisation})
	if ref := r.ScoreReference; ref != nil {
		cw.Write([]string{"score reference", fmt.Sprintf("%s at %s mol/L: %s", ref.Solute, num(ref.ConcentrationMolPerL), r.ModelChoices["normalisation"])})
	}
	for _, k := range minerals(bulk) {
		cw.Write([]string{"feed (bulk) saturation index: " + k, num(bulk[k])})
	}
	cw.Write([]string{"scenario (JSON)", string(scen)})
	keys := make([]string, 0, len(r.ModelChoices))
	for k := range r.ModelChoices {
		keys = append(keys, k)
	}
	sort.Strings(keys)
	for _, k := range keys {
		cw.Write([]string{"model choice: " + k, r.ModelChoices[k]})
	}
	for _, s := range r.Sources {
		cw.Write([]string{"source: " + s.Field, s.Reference})
	}
	for _, m := range trustLegend(r.Candidates) {
		cw.Write([]string{"trust: " + m.Code, m.Text})
	}
	for _, w := range r.Warnings {
		cw.Write([]string{"warning", w})
	}
	for _, c := range r.Candidates {
		for _, w := range c.Warnings {
			cw.Write([]string{"warning: " + c.Solute, w})
		}
	}
	for _, c := range r.Cautions {
		cw.Write([]string{"caution", c})
	}
	cw.Flush()
	return cw.Error()
}

func screenTable(w io.Writer, r *api.ScreenResponse, bulk map[string]float64) error {
	var b bytes.Buffer
	fmt.Fprintf(&b, "Drawsift screen — %s, basis %s", r.Orientation, basisText(&r.Basis))
	fmt.Fprintf(&b, ", feed π %.3g bar\n", r.FeedOsmoticPressureBar)
	if len(bulk) > 0 {
		fmt.Fprintf(&b, "feed (bulk) saturation indices, log10 IAP/Ksp: %s\n", siList(bulk, " "))
	}
	tw := tabwriter.NewWriter(&b, 0, 0, 2, ' ', tabwriter.AlignRight)
	rob := r.Robustness != nil
	head := "#\tsolute\tscore\tc mol/L\tJw LMH\tSRSF g/L\tcost USD/m³\tE kWh/m³\tη mPa·s\tmax SI (feed face)\tPareto\t"
	var notes []string
	if rob {
		head += "P(1st)\tP(top3)\trank 5–95 %\t"
	}
	fmt.Fprintln(tw, head)
	for _, c := range r.Candidates {
		cost, si, par := "—", "—", ""
		if c.ReplenishmentCostUSDPerM3 != nil {
			cost = fmt.Sprintf("%.3g", *c.ReplenishmentCostUSDPerM3)
		}
		if c.MaxSaturationIndex != nil {
			si = fmt.Sprintf("%s %.2f", maxMineral(c.Scaling), *c.MaxSaturationIndex)
			if *c.MaxSaturationIndex > 0 {
				si += " over"
			}
		}
		if c.ParetoOptimal {
			par = "*"
		}
		id := c.Solute
		if r := []rune(id); len(r) > tableIDLen {
			notes = append(notes, id)
			id = fmt.Sprintf("%s… [%d]", string(r[:tableIDLen-5]), len(notes))
		}
		line := fmt.Sprintf("%d\t%s\t%.3f\t%.3f\t%.2f\t%.3g\t%s\t%.3f\t%.2f\t%s\t%s\t", c.Rank, id, c.Score,
			c.ConcentrationMolPerL, c.WaterFluxLMH, c.SpecificReverseSoluteFluxGPerL, cost, c.MinRegenerationEnergyKWhPerM3, c.ViscosityMPaS, si, par)
		if rob && c.Robustness != nil {
			line += fmt.Sprintf("%.2f\t%.2f\t%d–%d\t", c.Robustness.ProbabilityFirst, c.Robustness.ProbabilityTop3, c.Robustness.RankP05, c.Robustness.RankP95)
		}
		fmt.Fprintln(tw, line)
	}
	if err := tw.Flush(); err != nil {
		return err
	}
	for i, id := range notes {
		fmt.Fprintf(&b, "[%d] %s\n", i+1, id)
	}
	if err := systemTable(&b, r); err != nil {
		return err
	}
	if lg := trustLegend(r.Candidates); len(lg) > 0 {
		fmt.Fprintln(&b, "trust marks (rows to read with care):")
		for _, c := range r.Candidates {
			if len(c.Trust) > 0 {
				fmt.Fprintf(&b, "  %s: %s\n", c.Solute, trustCodes(c.Trust))
			}
		}
		for _, m := range lg {
			fmt.Fprintf(&b, "  %s = %s\n", m.Code, m.Text)
		}
	}
	if r.ScoreReference != nil {
		fmt.Fprintf(&b, "score: each metric against the reference draw %s at the same basis (%.3g mol/L; it scores 0.5), independent of the other candidates\n", r.ScoreReference.Solute, r.ScoreReference.ConcentrationMolPerL)
	} else {
		fmt.Fprintln(&b, "score: relative to the screened set (min–max per metric): adding or removing candidates can reorder the others; \"score_normalisation\": \"reference\" scores against NaCl at the same basis")
	}
	fmt.Fprintln(&b, "max SI: the highest saturation index (log10 IAP/Ksp) at the feed-side membrane face and its mineral; \"over\": supersaturated, may scale")
	if rob {
		fmt.Fprintf(&b, "robustness: %d Monte Carlo samples, seed %d\n", r.Robustness.Samples, r.Robustness.Seed)
	}
	if len(r.Excluded) > 0 {
		fmt.Fprintln(&b, "excluded:")
		for _, x := range r.Excluded {
			fmt.Fprintf(&b, "  %s — %s: %s\n", x.Solute, x.Reason, x.Detail)
		}
	}
	if n := countWarnings(r); n > 0 {
		fmt.Fprintln(&b, "warnings:")
		for _, w := range r.Warnings {
			fmt.Fprintf(&b, "  %s\n", w)
		}
		for _, c := range r.Candidates {
			for _, w := range c.Warnings {
				fmt.Fprintf(&b, "  [%s] %s\n", c.Solute, w)
			}
		}
	}
	for _, c := range r.Cautions {
		fmt.Fprintln(&b, "! "+c)
	}
	fmt.Fprintf(&b, "engine %s; full record (scenario, model choices, sources): --format json\n", r.EngineVersion)
	_, err := w.Write(b.Bytes())
	return err
}

// countWarnings counts the screen's warnings and its candidates'.
func countWarnings(r *api.ScreenResponse) int {
	n := len(r.Warnings)
	for _, c := range r.Candidates {
		n += len(c.Warnings)
	}
	return n
}

func basisText(b *api.BasisReport) string {
	switch {
	case b.Kind == "system" && b.TargetOsmoticPressureBar != nil:
		return fmt.Sprintf("system (draws at equal π %.3g bar, ranked by cost per m³)", *b.TargetOsmoticPressureBar)
	case b.TargetOsmoticPressureBar != nil:
		return fmt.Sprintf("equal π %.3g bar", *b.TargetOsmoticPressureBar)
	case b.Concentration != nil:
		return fmt.Sprintf("equal concentration %g %s", *b.Concentration, b.Unit)
	case b.TargetWaterFluxLMH != nil:
		return fmt.Sprintf("equal water flux %.3g LMH", *b.TargetWaterFluxLMH)
	}
	return b.Kind
}

// systemTable writes the plant-scale rating of a screen with a system
// object or basis: the plant, then one row per rated candidate.
func systemTable(b *bytes.Buffer, r *api.ScreenResponse) error {
	sy := r.System
	if sy == nil {
		return nil
	}
	fmt.Fprintf(b, "\nplant scale: %.4g m³/day of product at recovery %.3g (%s-current, draw/feed flow %.3g); %d rated; electricity %.3g USD/kWh, heat %.3g USD/kWh, membrane %.4g USD/m² over %.3g years\n",
		sy.ProductM3PerDay, sy.Recovery, sy.Flow, sy.DrawToFeedFlowRatio, sy.Rated, sy.ElectricityUSDPerKWh, sy.HeatUSDPerKWh, sy.MembraneUSDPerM2, sy.MembraneLifeYears)
	tw := tabwriter.NewWriter(b, 0, 0, 2, ' ', tabwriter.AlignRight)
	fmt.Fprintln(tw, "#\tsolute\tcost USD/m³\tmake-up USD/m³\tenergy USD/m³\tmembrane USD/m³\tmake-up g/m³\tE kWh/m³\theat kWh/m³\troute\tm² per m³/d\tcoupon #\t")
	for _, c := range r.Candidates {
		s := c.System
		if s == nil {
			fmt.Fprintf(tw, "%d\t%s\t—\t\t\t\t\t\t\t%s\t\t\t\n", c.Rank, c.Solute, c.SystemReason)
			continue
		}
		fmt.Fprintf(tw, "%d\t%s\t%.3g\t%.3g\t%.3g\t%.3g\t%.4g\t%.3g\t%.3g\t%s\t%.3g\t%d\t\n", c.Rank, c.Solute, s.CostUSDPerM3, s.MakeUpCostUSDPerM3,
			s.EnergyCostUSDPerM3, s.MembraneCostUSDPerM3, s.MakeUpGPerM3, s.EnergyKWhPerM3, s.HeatKWhPerM3, s.RegenerationRoute, s.AreaM2PerM3PerDay, s.CouponRank)
	}
	if err := tw.Flush(); err != nil {
		return err
	}
	fmt.Fprintln(b, "E: the regeneration route's electricity plus its heat as equivalent work; "+sy.Method)
	return nil
}
