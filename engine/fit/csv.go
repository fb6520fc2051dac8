package fit

import (
	"encoding/csv"
	"fmt"
	"io"
	"sort"
	"strconv"
	"strings"

	"drawsift/engine/errs"
	"drawsift/engine/limits"
	"drawsift/engine/scenario"
	"drawsift/engine/thermo"
)

// CSV columns: a stem and, for quantities, a unit — written as a suffix
// (water_flux_lmh, draw_concentration_mol_per_l) or in brackets
// ("draw_concentration (M)", "water_flux [L/m2/h]"). Every column must be
// known (a typo is an error, never a silently ignored column).
type csvColumn struct {
	stem string
	// units maps accepted unit spellings (lower case, spaces removed) to
	// the factor into the row's unit; nil for a text column.
	units map[string]float64
	// conc: the unit is a concentration unit (thermo.ParseScaledUnit).
	conc bool
}

var (
	lmhUnits = map[string]float64{"lmh": 1, "l/m2/h": 1, "l/m²/h": 1, "l/(m2h)": 1, "l/(m2·h)": 1, "lm-2h-1": 1, "l/m2h": 1, "kg/m2/h": 1}
	gmhUnits = map[string]float64{"gmh": 1, "g/m2/h": 1, "g/m²/h": 1, "g/(m2h)": 1, "gm-2h-1": 1, "g/m2h": 1}
	csvCols  = []csvColumn{
		{stem: "orientation"},
		{stem: "draw_solute"},
		{stem: "draw_concentration", conc: true},
		{stem: "feed_solute"},
		{stem: "feed_concentration", conc: true},
		{stem: "temperature", units: map[string]float64{"c": 1, "°c": 1, "degc": 1}},
		{stem: "water_flux", units: lmhUnits},
		{stem: "reverse_solute_flux", units: gmhUnits},
		{stem: "water_flux_sd", units: lmhUnits},
		{stem: "reverse_solute_flux_sd", units: gmhUnits},
		{stem: "k_draw", units: map[string]float64{"m/s": 1, "m_per_s": 1, "ms-1": 1}},
		{stem: "k_feed", units: map[string]float64{"m/s": 1, "m_per_s": 1, "ms-1": 1}},
		{stem: "diffusivity", units: map[string]float64{"m2/s": 1, "m²/s": 1, "m2_per_s": 1, "m2s-1": 1}},
		{stem: "delta_p", units: map[string]float64{"bar": 1}},
		{stem: "b_feed", units: map[string]float64{"lmh": 1}},
	}
)

// ContractColumns are the CSV header's names in the contract's spelling.
var ContractColumns = []string{"orientation", "draw_solute", "draw_concentration_mol_per_l", "feed_solute", "feed_concentration_mol_per_l",
	"temperature_c", "water_flux_lmh", "reverse_solute_flux_gmh", "k_draw_m_per_s", "k_feed_m_per_s"}

// header is one parsed column: which stem and its unit.
type header struct {
	col   *csvColumn
	name  string
	scale float64
	unit  thermo.Unit
}

// parseHeader reads one header cell.
func parseHeader(cell string) (*header, error) {
	raw := strings.TrimSpace(strings.TrimPrefix(cell, "\ufeff"))
	name, unit := raw, ""
	if i := strings.IndexAny(raw, "(["); i > 0 {
		name, unit = strings.TrimSpace(raw[:i]), strings.Trim(strings.TrimSpace(raw[i:]), "()[] ")
		if unit == "" {
			return nil, fmt.Errorf("column %q: empty unit in brackets", raw)
		}
	}
	name = strings.ReplaceAll(strings.ToLower(name), " ", "_")
	// Longest stem first, so water_flux_sd is not read as water_flux + "sd".
	var best *csvColumn
	for i := range csvCols {
		c := &csvCols[i]
		if (name == c.stem || strings.HasPrefix(name, c.stem+"_")) && (best == nil || len(c.stem) > len(best.stem)) {
			best = c
		}
	}
	if best == nil {
		return nil, fmt.Errorf("unknown column %q (the columns are %s)", raw, strings.Join(ContractColumns, ", "))
	}
	if name != best.stem {
		if unit != "" {
			return nil, fmt.Errorf("column %q gives its unit twice", raw)
		}
		unit = strings.ReplaceAll(name[len(best.stem)+1:], "_per_", "/")
		if best.conc && unit == "m" {
			return nil, fmt.Errorf("column %q: the unit \"m\" is ambiguous in a lower-case header (molar or molal?): write mol_per_l or mol_per_kg, or \"(M)\"", raw)
		}
	}
	h := &header{col: best, name: raw, scale: 1}
	switch {
	case best.conc:
		if unit == "" {
			return nil, fmt.Errorf("column %q needs a unit (e.g. %s_mol_per_l or \"%s (mmol/L)\")", raw, best.stem, best.stem)
		}
		u, scale, err := thermo.ParseScaledUnit(unit)
		if err != nil {
			return nil, fmt.Errorf("column %q: %v", raw, err)
		}
		h.unit, h.scale = u, scale
	case best.units != nil:
		if unit == "" {
			return nil, fmt.Errorf("column %q needs a unit", raw)
		}
		f, ok := best.units[strings.ToLower(strings.ReplaceAll(unit, " ", ""))]
		if !ok {
			names := make([]string, 0, len(best.units))
			for k := range best.units {
				names = append(names, k)
			}
			sort.Strings(names)
			return nil, fmt.Errorf("column %q: unit %q not accepted (one of %s)", raw, unit, strings.Join(names, ", "))
		}
		h.scale = f
	case unit != "":
		return nil, fmt.Errorf("column %q takes no unit", raw)
	}
	return h, nil
}

// ParseCSV reads rows from CSV text with units in the header. The
// separator is a comma, or a semicolon or tab when the header line holds
// one; a decimal comma is accepted only with a semicolon or tab
// separator (where it is unambiguous) and never together with a decimal
// point or a thousands separator. Lines starting with # and blank lines
// are skipped. Errors name the row (data[i], as in the JSON form) and the
// CSV line.
func ParseCSV(text string) ([]Row, error) {
	text = strings.TrimPrefix(text, "\ufeff")
	first := text
	for {
		line, rest, _ := strings.Cut(first, "\n")
		if t := strings.TrimSpace(line); t != "" && !strings.HasPrefix(t, "#") {
			first = line
			break
		}
		if rest == "" {
			return nil, errs.InvalidText("csv", "", nil, "the CSV text has no header line")
		}
		first = rest
	}
	sep := ','
	switch {
	case strings.Contains(first, ";"):
		sep = ';'
	case strings.Contains(first, "\t"):
		sep = '\t'
	}
	rd := csv.NewReader(strings.NewReader(text))
	rd.Comma, rd.Comment, rd.FieldsPerRecord, rd.TrimLeadingSpace = sep, '#', -1, true
	var heads []*header
	var rows []Row
	seen := map[string]bool{}
	for {
		rec, err := rd.Read()
		if err == io.EOF {
			break
		}
		line, _ := rd.FieldPos(0)
		if err != nil {
			return nil, errs.InvalidText("csv", "", nil, "CSV line %d: %v", line, err)
		}
		if len(rec) == 1 && strings.TrimSpace(rec[0]) == "" {
			continue
		}
		if heads == nil {
			for _, cell := range rec {
				h, err := parseHeader(cell)
				if err != nil {
					return nil, errs.InvalidText("csv", cell, ContractColumns, "CSV line %d: %v", line, err)
				}
				if seen[h.col.stem] {
					return nil, errs.InvalidText("csv", cell, nil, "CSV line %d: column %s appears twice", line, h.col.stem)
				}
				seen[h.col.stem] = true
				heads = append(heads, h)
			}
			for _, need := range []string{"orientation", "draw_solute", "draw_concentration", "water_flux"} {
				if !seen[need] {
					return nil, errs.InvalidText("csv", "", ContractColumns, "CSV line %d: the header has no %s column", line, need)
				}
			}
			continue
		}
		i := len(rows)
		if err := limits.FitRows.Check(float64(i + 1)); err != nil {
			return nil, err
		}
		if len(rec) != len(heads) {
			hint := ""
			if sep == ',' && len(rec) > len(heads) {
				hint = ": a decimal comma in a comma-separated file cannot be read unambiguously; use a decimal point, or separate the columns with semicolons"
			}
			return nil, errs.Invalid(fmt.Sprintf("data[%d]", i), float64(len(rec)), fmt.Sprintf("%d fields", len(heads)),
				"CSV line %d has %d fields, the header %d%s", line, len(rec), len(heads), hint)
		}
		r, err := csvRow(rec, heads, sep, line, i)
		if err != nil {
			return nil, err
		}
		rows = append(rows, *r)
	}
	if heads == nil {
		return nil, errs.InvalidText("csv", "", nil, "the CSV text has no header line")
	}
	if len(rows) == 0 {
		return nil, errs.InvalidText("csv", "", nil, "the CSV text has a header but no data rows")
	}
	return rows, nil
}

// csvNumber reads one numeric cell.
func csvNumber(cell string, sep rune) (float64, error) {
	s := strings.TrimSpace(cell)
	if strings.Contains(s, ",") {
		if sep == ',' {
			return 0, fmt.Errorf("%q has a comma in a comma-separated file (ambiguous: use a decimal point)", cell)
		}
		if strings.Contains(s, ".") || strings.Count(s, ",") > 1 {
			return 0, fmt.Errorf("%q mixes separators: write the number with one decimal mark and no thousands separator", cell)
		}
		s = strings.Replace(s, ",", ".", 1)
	}
	if strings.ContainsAny(s, " '_") {
		return 0, fmt.Errorf("%q: no spaces or digit group separators in numbers", cell)
	}
	v, err := strconv.ParseFloat(s, 64)
	if err != nil {
		return 0, fmt.Errorf("%q is not a number", cell)
	}
	return v, nil
}

// csvRow reads one data line.
func csvRow(rec []string, heads []*header, sep rune, line, i int) (*Row, error) {
	r := &Row{line: line}
	var drawSolute, feedSolute string
	var drawC, feedC *float64
	var drawU, feedU thermo.Unit
	feedGiven := false
	for c, h := range heads {
		cell := strings.TrimSpace(rec[c])
		field := csvField(h.col.stem)
		if h.col.units == nil && !h.col.conc {
			switch h.col.stem {
			case "orientation":
				r.Orientation = cell
			case "draw_solute":
				drawSolute = cell
			case "feed_solute":
				feedSolute = cell
				feedGiven = feedGiven || cell != ""
			}
			continue
		}
		if cell == "" {
			continue
		}
		v, err := csvNumber(cell, sep)
		if err != nil {
			return nil, errs.InvalidText(fmt.Sprintf("data[%d].%s", i, field), cell, nil, "CSV line %d, column %s: %v", line, h.name, err)
		}
		v *= h.scale
		p := &v
		switch h.col.stem {
		case "draw_concentration":
			drawC, drawU = p, h.unit
		case "feed_concentration":
			feedC, feedU = p, h.unit
			feedGiven = true
		case "temperature":
			r.TemperatureC = p
		case "water_flux":
			r.WaterFluxLMH = p
		case "reverse_solute_flux":
			r.ReverseSoluteFluxGMH = p
		case "water_flux_sd":
			r.WaterFluxSDLMH = p
		case "reverse_solute_flux_sd":
			r.ReverseSoluteFluxSDGMH = p
		case "k_draw":
			r.KDrawMPerS = p
		case "k_feed":
			r.KFeedMPerS = p
		case "diffusivity":
			r.DiffusivityM2PerS = p
		case "delta_p":
			r.DeltaPBar = p
		case "b_feed":
			r.BFeedLMH = p
		}
	}
	r.Draw = &scenario.Concentration{Solute: drawSolute, Concentration: drawC, Unit: drawU.String()}
	if feedGiven {
		if feedSolute == "" {
			feedSolute = drawSolute
		}
		if feedC == nil {
			return nil, errs.InvalidText(fmt.Sprintf("data[%d].feed.concentration", i), "", nil, "CSV line %d: a feed solute without a feed concentration", line)
		}
		r.Feed = &scenario.Concentration{Solute: feedSolute, Concentration: feedC, Unit: feedU.String()}
	}
	return r, nil
}

// csvField is the JSON field a CSV column fills.
func csvField(stem string) string {
	switch stem {
	case "draw_concentration":
		return "draw.concentration"
	case "feed_concentration":
		return "feed.concentration"
	case "temperature":
		return "temperature_c"
	case "water_flux":
		return "water_flux_lmh"
	case "reverse_solute_flux":
		return "reverse_solute_flux_gmh"
	case "water_flux_sd":
		return "water_flux_sd_lmh"
	case "reverse_solute_flux_sd":
		return "reverse_solute_flux_sd_gmh"
	case "k_draw", "k_feed":
		return stem + "_m_per_s"
	case "diffusivity":
		return "diffusivity_m2_per_s"
	case "delta_p":
		return "delta_p_bar"
	case "b_feed":
		return "b_feed_lmh"
	}
	return stem
}
