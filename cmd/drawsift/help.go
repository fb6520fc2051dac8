package main

import (
	"fmt"
	"io"
	"sort"
	"strings"
	"text/tabwriter"

	"drawsift/engine/api"
)

// field is one request field in a command's help: its JSON path, what it
// is, and — for a numeric field — the key of its range in the engine's
// defaults (its unit, default and limits are printed from there).
type field struct {
	path, what, limit string
}

// command is one subcommand's help.
type command struct {
	name, summary, usage, about string
	flags                       []string // "-x VALUE   meaning"
	fields                      []field
	example                     string
}

var opFlags = []string{
	"-f FILE            read the request from FILE instead of standard input",
	"--format FORMAT    json (default), csv or table",
	"-h, --help         this help",
}

var commands = []command{
	{name: "osmotic", summary: "osmotic pressure and properties of one solution",
		usage: "drawsift osmotic [-f FILE] [--format json|csv|table] < request.json",
		about: "One solute, blend or ion mixture at one concentration and temperature: π (real and van 't Hoff), osmotic coefficient, water activity, density, viscosity, diffusivity, ions and saturation indices.",
		flags: opFlags,
		fields: []field{
			{"solute", "library ID or alias (drawsift solutes), or", ""},
			{"id + blend", "a blend: [{\"solute\", \"mole_fraction\" | \"mass_fraction\"}, …], or", ""},
			{"mixture", "ions or salts with their own amounts", ""},
			{"concentration", "amount of solute (required with solute or blend)", "concentration"},
			{"unit", "mol/L (M), mmol/L (mM), mol/kg, g/L, mg/L, g/kg, wt%, mOsm/kg …", ""},
			{"temperature_c", "temperature", "temperature_c"},
			{"ph", "pH for the carbonate species (default: the composition's own)", ""},
			{"allow_extrapolation", "true: answer past the model's data (flagged) instead of refusing", ""},
		},
		example: `echo '{"solute": "NaCl", "concentration": 1, "unit": "mol/L", "temperature_c": 25}' | drawsift osmotic --format table`},
	{name: "flux", summary: "water and reverse solute flux through an FO membrane",
		usage: "drawsift flux [-f FILE] [--format json|csv|table] < request.json",
		about: "One draw against one feed on one membrane: Jw, Js, the interface concentrations (ICP and ECP) and the solver's statistics.",
		flags: opFlags,
		fields: []field{
			{"membrane.preset", "membrane preset ID (drawsift presets), or give a_lmh_per_bar, b_lmh, s_um", ""},
			{"membrane.a_lmh_per_bar", "water permeability A", "membrane.a_lmh_per_bar"},
			{"membrane.b_lmh", "draw-solute permeability B", "membrane.b_lmh"},
			{"membrane.s_um", "structural parameter S", "membrane.s_um"},
			{"orientation", "AL-FS (FO mode) or AL-DS (PRO mode)", ""},
			{"draw", "{\"solute\" | \"blend\", \"concentration\", \"unit\"} (required)", ""},
			{"feed", "{\"preset\"} or {\"solute\", \"concentration\", \"unit\"}; omitted: deionised water", ""},
			{"temperature_c", "temperature", "temperature_c"},
			{"k_draw_m_per_s", "draw-side mass-transfer coefficient (default: from the channel)", "k_draw_m_per_s"},
			{"k_feed_m_per_s", "feed-side mass-transfer coefficient (default: from the channel)", "k_feed_m_per_s"},
			{"channel.crossflow_velocity_m_per_s", "crossflow velocity", "channel.crossflow_velocity_m_per_s"},
			{"external_cp", "false: no external concentration polarisation (default true)", ""},
			{"delta_p_bar", "hydraulic pressure on the draw side", "delta_p_bar"},
			{"osmotic_model", "real (default) or van-t-hoff", ""},
		},
		example: `echo '{"membrane": {"preset": "tfc-standard"}, "orientation": "AL-FS", "draw": {"solute": "NaCl", "concentration": 1, "unit": "mol/L"}, "feed": {"preset": "seawater"}}' | drawsift flux --format table`},
	{name: "screen", summary: "rank candidate draw solutes for a scenario",
		usage: "drawsift screen [-f FILE | --demo] [--format json|csv|table] [--remote URL] [--concurrency N] [--retries N]",
		about: "Brings every candidate to the basis of comparison, computes its metrics, scores them with the weights, marks the Pareto front and lists the candidates left out with their reason. A JSON array or NDJSON of scenarios is a batch (one result per line).",
		flags: append([]string{
			"--demo             screen the built-in demo scenario (a brackish-water field station)",
			"--remote URL       send the scenarios to the HTTP API at URL instead of computing here",
			"--concurrency N    scenarios in flight at once (default 4 with --remote, else the CPUs)",
			"--retries N        retries per scenario on a network error or 5xx (with --remote; default 3)",
		}, opFlags...),
		fields: []field{
			{"feed", "{\"preset\"} (drawsift presets), {\"solute\", \"concentration\", \"unit\"} or {\"ions\": […]}", ""},
			{"feed.ph", "feed pH", "feed.ph"},
			{"membrane", "{\"preset\"} or {\"a_lmh_per_bar\", \"b_nacl_lmh\", \"s_um\"}", ""},
			{"orientation", "AL-FS (default, FO mode) or AL-DS (PRO mode); orientations: others to report", ""},
			{"temperature_c", "temperature", "temperature_c"},
			{"candidates", "solute IDs and blends {\"id\", \"blend\": […]}; omitted: the whole library", ""},
			{"custom_solutes", "your own solutes: id, molar_mass_g_per_mol, diffusivity_m2_per_s, ions or van_t_hoff_factor, pi_table …", ""},
			{"basis", "{\"kind\": \"osmotic-pressure\" | \"concentration\" | \"water-flux\", \"value\", \"unit\"} or {\"kind\", \"multiple_of_feed\"}; default 2 × the feed's π", ""},
			{"basis.value (osmotic-pressure)", "target bulk π", "basis.osmotic_pressure_bar"},
			{"basis.value (water-flux)", "target water flux", "basis.water_flux_lmh"},
			{"weights", "{objective: weight}; objectives: " + strings.Join(objectiveKeys(), ", "), "weights"},
			{"score_normalisation", "set (default: min–max over the screened candidates) or reference (against NaCl at the same basis)", ""},
			{"pareto_objectives", "two or more objectives for the Pareto front", ""},
			{"exclude_hazards", "hazard flags whose solutes are left out", "exclude_hazards"},
			{"allow_extrapolation", "true: keep candidates needed past their model's data (flagged)", ""},
			{"regeneration_recovery", "fraction of the diluted draw's water recovered when re-concentrating", "regeneration_recovery"},
			{"osmotic_model", "real (default) or van-t-hoff", ""},
			{"uncertainty.samples", "Monte Carlo samples of the robustness run (0: none)", "uncertainty.samples"},
			{"seed", "seed of the robustness run", "seed"},
			{"sweep", "{\"variable\": temperature | concentration | s | crossflow, \"from\", \"to\", \"points\"}", "sweep.points"},
		},
		example: "drawsift screen --demo --format table\ndrawsift screen -f scenario.json --format csv > ranking.csv"},
	{name: "batch", summary: "run many osmotic and flux requests in one call",
		usage:   "drawsift batch [-f FILE] [--format json] < requests.json",
		about:   "A JSON array of {\"op\": \"osmotic\" | \"flux\", \"body\": {…}}; the answers in the same order, each {\"ok\", \"result\" | \"error\"}.",
		flags:   opFlags,
		example: `echo '[{"op": "osmotic", "body": {"solute": "KCl", "concentration": 1, "unit": "mol/L"}}]' | drawsift batch`},
	{name: "fit", summary: "fit a membrane's A, B and S to measured fluxes",
		usage: "drawsift fit --csv data.csv [-f options.json] [--format json|csv|table]\ndrawsift fit [-f FILE] [--format json|csv|table] < request.json",
		about: "Weighted least squares of A, B and S (any of them; the others fixed from membrane) through the same flux model as drawsift flux, with confidence intervals, correlations, residuals, warnings where the data cannot pin a parameter down, and a membrane object ready for a scenario. With --csv the measurements come from a CSV file whose header names the columns and their units; the request (-f, optional) then gives only the options.",
		flags: append([]string{
			"--csv FILE         the measurements as CSV (units in the header)",
		}, opFlags...),
		fields: []field{
			{"data", "measurements: [{\"orientation\", \"draw\", \"feed\", \"temperature_c\", \"water_flux_lmh\", \"reverse_solute_flux_gmh\" …}]", "data"},
			{"data[].water_flux_lmh", "measured water flux (required)", "data[].water_flux_lmh"},
			{"data[].reverse_solute_flux_gmh", "measured reverse solute flux (optional)", "data[].reverse_solute_flux_gmh"},
			{"data[].k_draw_m_per_s, k_feed_m_per_s", "the cell's mass-transfer coefficients (default: from the channel)", ""},
			{"parameters", "which of a, b, s to fit (default all three)", ""},
			{"membrane", "fixed values and starting values: a_lmh_per_bar, b_lmh, s_um", ""},
			{"osmotic_model", "real (default) or van-t-hoff", ""},
			{"confidence", "confidence level of the intervals", "confidence"},
			{"measurement_error.water_flux_relative", "relative standard uncertainty of each flux", "measurement_error.water_flux_relative"},
			{"bootstrap.samples", "residual-bootstrap resamples (omitted: none)", "bootstrap.samples"},
		},
		example: "drawsift fit --csv fluxes.csv --format table"},
	{name: "module", summary: "rate or design a module: flows, concentrations and flux along the area",
		usage: "drawsift module [-f FILE] [--format json|csv|table] < request.json",
		about: "Steady plug flow of the draw and the feed along a membrane area, co- or counter-current, with the local fluxes of drawsift flux (ICP, ECP, reverse and forward solute flux). Give area_m2 to rate a module, or target {\"recovery\"} or {\"permeate_l_per_h\"} to find the area; every answer gives the osmotic-equilibrium cap on recovery, the outlets, the solute exchanged and profiles along the area.",
		flags: opFlags,
		fields: []field{
			{"draw, feed", "as in flux, each with flow_l_per_h (the feed may be a preset)", "draw.flow_l_per_h"},
			{"flow", "counter (default) or co", ""},
			{"area_m2", "membrane area to rate", "area_m2"},
			{"target.recovery", "design: permeate over feed inflow", "target.recovery"},
			{"target.permeate_l_per_h", "design: product water flow", "target.permeate_l_per_h"},
			{"draw_pressure_drop_bar_per_m2", "the draw channel's pressure loss per m²", "draw_pressure_drop_bar_per_m2"},
			{"feed_pressure_drop_bar_per_m2", "the feed channel's pressure loss per m²", "feed_pressure_drop_bar_per_m2"},
			{"profile_points", "points of the profiles along the area", "profile_points"},
			{"tolerance", "relative tolerance of the integrator", "tolerance"},
			{"membrane, orientation, temperature_c, osmotic_model, k_draw_m_per_s, k_feed_m_per_s, channel", "as in flux", ""},
		},
		example: `echo '{"membrane": {"preset": "tfc-standard"}, "orientation": "AL-FS", "draw": {"solute": "NaCl", "concentration": 1, "unit": "mol/L", "flow_l_per_h": 40}, "feed": {"preset": "seawater", "flow_l_per_h": 80}, "target": {"recovery": 0.2}}' | drawsift module --format table`},
	{name: "robustness-merge", summary: "add up the parts of a robustness run split between machines",
		usage:   "drawsift robustness-merge [-f FILE] [--format json|csv|table] < parts.json",
		about:   "A screen's robustness run can be split into parts (\"uncertainty\": {\"shard\": {\"index\": i, \"count\": n}}), each run anywhere; {\"parts\": [answer, …]} with every part's screen answer, once each, gives the answer of the unsplit run, byte for byte. Parts of different screens are refused.",
		flags:   opFlags,
		example: "drawsift robustness-merge -f parts.json --format table"},
	{name: "solutes", summary: "list the solute library",
		usage:   "drawsift solutes [--json]",
		about:   "One line per solute: ID, name, family, molar mass, osmotic model, solubility at 25 °C and hazard flags. --json prints the full records (the API's GET /v1/solutes).",
		flags:   []string{"--json             the full library as JSON", "-h, --help         this help"},
		example: "drawsift solutes\ndrawsift solutes --json"},
	{name: "presets", summary: "list the membrane and feed presets",
		usage:   "drawsift presets [--json]",
		about:   "The membrane presets (A, B for NaCl, S and the test temperature) and the feed presets (osmotic method, pH). --json prints the full records with their sources (the API's GET /v1/presets).",
		flags:   []string{"--json             the presets as JSON", "-h, --help         this help"},
		example: "drawsift presets"},
	{name: "defaults", summary: "print the engine's defaults and limits",
		usage:   "drawsift defaults",
		about:   "Every field's default, unit and limits, the objectives, units and names the engine accepts (the API's GET /v1/defaults), as JSON.",
		example: "drawsift defaults"},
	{name: "serve", summary: "serve the JSON API at /v1/ and the page at /",
		usage: "drawsift serve [--addr 127.0.0.1:8080] [--wasm PATH] [--cors ORIGIN] [--max-body BYTES]",
		about: "Run drawsift serve -h for its flags.", example: "drawsift serve --addr 127.0.0.1:8080"},
	{name: "bundle", summary: "write the single-file offline page",
		usage: "drawsift bundle -o FILE.html [--wasm PATH] [--wasm-exec PATH]",
		about: "Run drawsift bundle -h for its flags.", example: "make wasm && drawsift bundle -o drawsift.html"},
	{name: "demo", summary: "print the built-in demo table",
		usage:   "drawsift demo",
		about:   "Osmotic pressure of six draw solutes at 25 °C from 0.25 to 3 mol/L, real (Pitzer) against van 't Hoff: a first look at how far each departs from the ideal line.",
		flags:   []string{"-h, --help         this help"},
		example: "drawsift demo"},
	{name: "version", summary: "print the engine version", usage: "drawsift version", example: "drawsift version"},
	{name: "help", summary: "this list, or one command's help", usage: "drawsift help [COMMAND]", example: "drawsift help screen"},
}

func objectiveKeys() []string {
	var out []string
	for _, o := range api.Defaults().Objectives {
		out = append(out, o.Key)
	}
	return out
}

func findCommand(name string) *command {
	for i := range commands {
		if commands[i].name == name {
			return &commands[i]
		}
	}
	return nil
}

// printUsage lists every command.
func printUsage(w io.Writer) {
	fmt.Fprintln(w, "usage: drawsift <command> [flags]")
	fmt.Fprintln(w)
	fmt.Fprintln(w, "commands:")
	for _, c := range commands {
		fmt.Fprintf(w, "  %-9s %s\n", c.name, c.summary)
	}
	fmt.Fprintln(w)
	fmt.Fprintln(w, "Requests are the API's JSON, read from standard input or -f FILE; a request error is printed")
	fmt.Fprintln(w, "as the contract's error object with exit status 2. drawsift help COMMAND (or drawsift COMMAND -h)")
	fmt.Fprintln(w, "lists a command's flags and request fields with units and defaults, and an example.")
	fmt.Fprintln(w)
	fmt.Fprintln(w, "Screening estimates, not a design; FO product water needs treatment and must meet local rules.")
}

// printHelp prints one command's help: usage, what it does, flags, the
// request's fields with unit, default and limits (from the engine's
// defaults), and an example.
func printHelp(w io.Writer, c *command) {
	fmt.Fprintf(w, "usage: %s\n\n", c.usage)
	fmt.Fprintln(w, strings.ToUpper(c.summary[:1])+c.summary[1:]+".")
	if c.about != "" {
		fmt.Fprintln(w, c.about)
	}
	if len(c.flags) > 0 {
		fmt.Fprintln(w, "\nflags:")
		for _, f := range c.flags {
			fmt.Fprintln(w, "  "+f)
		}
	}
	if len(c.fields) > 0 {
		lim := api.Defaults().Limits
		fmt.Fprintln(w, "\nrequest fields (JSON):")
		tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
		for _, f := range c.fields {
			extra := ""
			if l, ok := lim[f.limit]; ok {
				if l.Unit != "" {
					extra += " [" + l.Unit + "]"
				}
				if l.Default != nil {
					extra += fmt.Sprintf("; default %g", *l.Default)
				}
				extra += "; " + l.Text
			}
			fmt.Fprintf(tw, "  %s\t%s%s\n", f.path, f.what, extra)
		}
		tw.Flush()
	}
	if c.example != "" {
		fmt.Fprintln(w, "\nexample:")
		for _, l := range strings.Split(c.example, "\n") {
			fmt.Fprintln(w, "  "+l)
		}
	}
}

// wantsHelp reports whether args ask for help.
func wantsHelp(args []string) bool {
	for _, a := range args {
		if a == "-h" || a == "-help" || a == "--help" {
			return true
		}
	}
	return false
}

// suggest names the commands closest to a mistyped one.
func suggest(name string) string {
	var near []string
	for _, c := range commands {
		if strings.HasPrefix(c.name, name) || strings.HasPrefix(name, c.name) || editDistance(name, c.name) <= 2 {
			near = append(near, c.name)
		}
	}
	sort.Strings(near)
	if len(near) == 0 {
		return ""
	}
	return "Did you mean " + strings.Join(near, " or ") + "? "
}

func editDistance(a, b string) int {
	prev := make([]int, len(b)+1)
	for j := range prev {
		prev[j] = j
	}
	for i := 1; i <= len(a); i++ {
		cur := make([]int, len(b)+1)
		cur[0] = i
		for j := 1; j <= len(b); j++ {
			cost := 1
			if a[i-1] == b[j-1] {
				cost = 0
			}
			cur[j] = min(prev[j]+1, cur[j-1]+1, prev[j-1]+cost)
		}
		prev = cur
	}
	return prev[len(b)]
}
