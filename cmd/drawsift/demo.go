package main

import (
	"fmt"
	"io"
	"text/tabwriter"

	"drawsift/engine/api"
)

// The demo: a teaching lab compares six common draw solutes before an FO
// practical at 25 °C — how far each departs from the van 't Hoff line as it
// gets concentrated. (A scenario of our own; the numbers are the engine's.)
var (
	demoSolutes = []string{"NaCl", "KCl", "MgCl2", "CaCl2", "Na2SO4", "MgSO4"}
	demoConcs   = []float64{0.25, 0.5, 1, 1.5, 2, 3}
)

func runDemo(stdout, stderr io.Writer) int {
	fmt.Fprintln(stdout, "Drawsift demo — osmotic pressure of six draw solutes at 25 °C, real (Pitzer) vs van 't Hoff")
	fmt.Fprintln(stdout, "Screening estimates only: verify with experiments; FO product water needs treatment before use.")
	fmt.Fprintln(stdout)
	tw := tabwriter.NewWriter(stdout, 0, 0, 2, ' ', tabwriter.AlignRight)
	fmt.Fprintln(tw, "solute\tc (mol/L)\tm (mol/kg)\tπ real (bar)\tπ van 't Hoff (bar)\tφ\treal/ideal\t")
	for _, id := range demoSolutes {
		for _, c := range demoConcs {
			c := c
			r, e := api.Osmotic(&api.OsmoticRequest{Solute: id, Concentration: &c, Unit: "mol/L"})
			if e != nil {
				fmt.Fprintf(tw, "%s\t%.2f\t—\t%s\t\t\t\t\n", id, c, shortErr(e))
				continue
			}
			fmt.Fprintf(tw, "%s\t%.2f\t%.3f\t%.1f\t%.1f\t%.3f\t%.3f\t\n", id, c, r.MolalityMolPerKg,
				r.OsmoticPressureBar, r.VantHoffBar, r.OsmoticCoefficient, r.OsmoticPressureBar/r.VantHoffBar)
		}
	}
	if err := tw.Flush(); err != nil {
		fmt.Fprintln(stderr, err)
		return 1
	}
	return 0
}

func shortErr(e *api.Error) string {
	if e.Limit != nil {
		return fmt.Sprintf("beyond limit %v", e.Limit)
	}
	return e.Message
}
