package main

import (
	"encoding/csv"
	"encoding/json"
	"fmt"
	"io"
	"strconv"
	"text/tabwriter"

	"drawsift/engine/api"
)

// moduleColumns are the profile columns of the module's table and CSV.
var moduleColumns = []string{"area_m2", "draw_flow_l_per_h", "feed_flow_l_per_h", "draw_concentration_mol_per_l", "feed_concentration_mol_per_l",
	"draw_osmotic_pressure_bar", "feed_osmotic_pressure_bar", "water_flux_lmh", "delta_p_bar"}

// renderModule writes a module response: for "csv" the profiles, one row
// per point along the area; for "table" the summary, the outlets, the
// profiles and the warnings and cautions as aligned text.
func renderModule(w io.Writer, format string, resp []byte) error {
	var r api.ModuleResponse
	if err := json.Unmarshal(resp, &r); err != nil {
		return err
	}
	p := &r.Profiles
	cols := [][]float64{p.AreaM2, p.DrawFlowLPerH, p.FeedFlowLPerH, p.DrawConcentrationMolPerL, p.FeedConcentrationMolPerL,
		p.DrawOsmoticPressureBar, p.FeedOsmoticPressureBar, p.WaterFluxLMH, p.DeltaPBar}
	if format == "csv" {
		cw := csv.NewWriter(w)
		cw.Write(moduleColumns)
		for i := range p.AreaM2 {
			row := make([]string, len(cols))
			for j, c := range cols {
				row[j] = strconv.FormatFloat(c[i], 'g', 10, 64)
			}
			cw.Write(row)
		}
		cw.Flush()
		return cw.Error()
	}
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	fmt.Fprintf(tw, "%s module (%s, %s)\n", r.Flow, r.Mode, r.Orientation)
	fmt.Fprintf(tw, "area\t%.4g m²\n", r.AreaM2)
	fmt.Fprintf(tw, "permeate\t%.4g L/h\n", r.PermeateLPerH)
	fmt.Fprintf(tw, "recovery\t%.4g (cap %.4g, %s pinch)\n", r.Recovery, r.RecoveryCap, r.RecoveryCapPinch)
	fmt.Fprintf(tw, "average water flux\t%.4g LMH\n", r.AverageWaterFluxLMH)
	fmt.Fprintf(tw, "draw solute lost\t%.4g mol/h (%.4g g/h, %.4g g per L of permeate)\n", r.ReverseSoluteMolPerH, r.ReverseSoluteGPerH, r.DrawLossGPerLPermeate)
	if m := r.RegenerationMinimum; m != nil {
		fmt.Fprintf(tw, "regeneration minimum\t%.4g kWh per m³ of water removed (%.4g per m³ of diluted draw; %.3g of its water, concentrate π %.4g bar)\n",
			m.KWhPerM3Water, m.KWhPerM3DilutedDraw, m.WaterRecovery, m.ConcentratePiBar)
	}
	fmt.Fprintln(tw, "\nstream\tflow (L/h)\tconcentration (mol/L)\tπ (bar)")
	for _, s := range []struct {
		name string
		s    api.ModuleStreamReport
	}{{"draw in", r.DrawIn}, {"draw out", r.DrawOut}, {"feed in", r.FeedIn}, {"feed out", r.FeedOut}} {
		fmt.Fprintf(tw, "%s\t%.5g\t%.5g\t%.4g\n", s.name, s.s.FlowLPerH, s.s.ConcentrationMolPerL, s.s.OsmoticPressureBar)
	}
	if len(r.Regeneration) > 0 {
		fmt.Fprintln(tw, "\nregeneration route\tfeasible\telectric (kWh/m³)\theat (kWh/m³)\tequivalent work (kWh/m³)\t× minimum\tpressure (bar)\tdraw lost (g/m³)\tnote")
		for _, g := range r.Regeneration {
			if !g.Applicable {
				fmt.Fprintf(tw, "%s\tn/a\t\t\t\t\t\t\t%s\n", g.Route, g.Reason)
				continue
			}
			pressure := ""
			if g.PressureBar > 0 {
				pressure = fmt.Sprintf("%.4g", g.PressureBar)
			}
			fmt.Fprintf(tw, "%s\t%s\t%.4g\t%.4g\t%.4g\t%.3g\t%s\t%.4g\t%s\n", g.Route, yesNo(g.Feasible), g.ElectricKWhPerM3, g.HeatKWhPerM3,
				g.EquivalentWorkKWhPerM3, g.RatioToMinimum, pressure, g.DrawLossGPerM3, g.Reason)
		}
		if r.RegenerationBest != "" && r.DrawMakeUpGPerM3 != nil {
			fmt.Fprintf(tw, "best route\t%s; draw make-up %.4g g per m³ of product (reverse flux and the route's loss)\n", r.RegenerationBest, *r.DrawMakeUpGPerM3)
		}
	}
	fmt.Fprintln(tw)
	for j, c := range moduleColumns {
		if j > 0 {
			fmt.Fprint(tw, "\t")
		}
		fmt.Fprint(tw, c)
	}
	fmt.Fprintln(tw)
	for i := range p.AreaM2 {
		for j, c := range cols {
			if j > 0 {
				fmt.Fprint(tw, "\t")
			}
			fmt.Fprintf(tw, "%.5g", c[i])
		}
		fmt.Fprintln(tw)
	}
	fmt.Fprintf(tw, "\nsolver\t%s, %d integrations, %d flux solves, boundary residual %.2g\n", r.Solver.Method, r.Solver.Integrations, r.Solver.FluxSolves, r.Solver.BoundaryResidual)
	for _, s := range r.Warnings {
		fmt.Fprintf(tw, "warning\t%s\n", plainText(s))
	}
	for _, s := range r.Cautions {
		fmt.Fprintf(tw, "caution\t%s\n", plainText(s))
	}
	return tw.Flush()
}

func yesNo(b bool) string {
	if b {
		return "yes"
	}
	return "no"
}
