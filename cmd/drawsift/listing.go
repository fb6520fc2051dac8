package main

import (
	"context"
	"fmt"
	"io"
	"math"
	"strings"
	"text/tabwriter"

	"drawsift/engine/api"
	"drawsift/engine/library"
)

// runList is `drawsift solutes` and `drawsift presets`: a table, or with
// --json the API's answer (GET /v1/solutes, GET /v1/presets).
func runList(op string, args []string, stdout, stderr io.Writer) int {
	asJSON := false
	for _, a := range args {
		switch a {
		case "--json", "-json":
			asJSON = true
		default:
			fmt.Fprintf(stderr, "drawsift %s: unknown argument %q; type drawsift %s for the table or drawsift %s --json for the JSON\n", op, a, op, op)
			return 1
		}
	}
	out, e := api.Dispatch(context.Background(), op, nil)
	if e != nil {
		stdout.Write(out)
		fmt.Fprintln(stdout)
		return 2
	}
	if asJSON {
		if err := render(stdout, op, "json", out); err != nil {
			fmt.Fprintf(stderr, "drawsift %s: %v\n", op, err)
			return 1
		}
		return 0
	}
	tw := tabwriter.NewWriter(stdout, 0, 0, 2, ' ', 0)
	if op == api.OpSolutes {
		r, _ := api.Solutes()
		fmt.Fprintln(tw, "id\tname\tfamily\tM (g/mol)\tosmotic model\tsolubility (mol/kg)\thazard flags")
		for _, s := range r.Solutes {
			fmt.Fprintf(tw, "%s\t%s\t%s\t%.2f\t%s\t%s\t%s\n", s.ID, plainText(s.Name), s.Family, s.MolarMassGPerMol, modelWords(s), solubilityText(s), strings.Join(s.HazardFlags, ", "))
		}
		tw.Flush()
		fmt.Fprintf(stdout, "%d solutes. Use an id in \"candidates\", \"solute\" or \"draw\"; drawsift solutes --json gives each record with its sources.\n", len(r.Solutes))
		return 0
	}
	r, _ := api.Presets()
	fmt.Fprintln(tw, "membrane\tname\tA (LMH/bar)\tB NaCl (LMH)\tS (µm)\ttested at (°C)")
	for _, m := range r.Membranes {
		fmt.Fprintf(tw, "%s\t%s\t%g\t%g\t%g\t%g\n", m.ID, plainText(m.Name), m.ALMHPerBar, m.BNaClLMH, m.SUM, m.ReferenceTemperatureC)
	}
	tw.Flush()
	fmt.Fprintln(stdout)
	tw = tabwriter.NewWriter(stdout, 0, 0, 2, ' ', 0)
	fmt.Fprintln(tw, "feed\tname\tosmotic pressure from\tpH")
	for _, f := range r.Feeds {
		fmt.Fprintf(tw, "%s\t%s\t%s\t%g\n", f.ID, plainText(f.Name), f.Osmotic.Method, f.PH)
	}
	tw.Flush()
	fmt.Fprintln(stdout, "Use an id as {\"preset\": ID} in \"membrane\" or \"feed\"; drawsift presets --json gives the records with their sources.")
	return 0
}

func modelWords(s *library.Solute) string {
	if s.Osmotic.Kind == library.ModelNone {
		return "van 't Hoff only"
	}
	return s.Osmotic.Kind
}

// solubilityText is the solubility point nearest 25 °C.
func solubilityText(s *library.Solute) string {
	if s.Solubility.Miscible {
		return "miscible"
	}
	best := -1
	for i, p := range s.Solubility.Points {
		if best < 0 || math.Abs(p.TemperatureC-25) < math.Abs(s.Solubility.Points[best].TemperatureC-25) {
			best = i
		}
	}
	if best < 0 {
		return "—"
	}
	p := s.Solubility.Points[best]
	return fmt.Sprintf("%.3g at %g °C", p.MolalityMolPerKg, p.TemperatureC)
}
