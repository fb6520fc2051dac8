package main

import (
	"bytes"
	"encoding/json"
	"fmt"
	"io"
	"sort"
	"strings"
	"text/tabwriter"

	"drawsift/engine/api"
)

// osmoticLists are the osmotic response's fields that are lists or maps:
// printed as their own blocks, not flattened into the property list.
var osmoticLists = []string{"ions", "components", "saturation_indices", "sources", "warnings", "cautions"}

// renderOsmotic writes an osmotic response as a property list (every
// scalar field, in the response's order) followed by the ions (molality,
// activity coefficient), a blend's components and the saturation indices
// — as aligned text for "table", as CSV blocks separated by a blank row
// for "csv" (the first two rows keep the one-header, one-value shape).
func renderOsmotic(w io.Writer, format string, resp []byte) error {
	var r api.OsmoticResponse
	if err := json.Unmarshal(resp, &r); err != nil {
		return err
	}
	kv, err := flatten(resp)
	if err != nil {
		return err
	}
	props := kv[:0:0]
	for _, p := range kv {
		if !isListField(p.key) {
			props = append(props, p)
		}
	}
	if format == "csv" {
		return osmoticCSV(w, props, &r)
	}
	plainStrings(&r)
	for i := range props {
		props[i] = pair{plainText(props[i].key), plainText(props[i].val)}
	}
	return osmoticTable(w, props, &r)
}

func isListField(key string) bool {
	for _, f := range osmoticLists {
		if key == f || strings.HasPrefix(key, f+"[") || strings.HasPrefix(key, f+".") {
			return true
		}
	}
	return false
}

// minerals returns the saturation indices' minerals, highest SI first
// (then by name), so that the scaling risks lead.
func minerals(si map[string]float64) []string {
	keys := make([]string, 0, len(si))
	for k := range si {
		keys = append(keys, k)
	}
	sort.Slice(keys, func(i, j int) bool {
		if si[keys[i]] != si[keys[j]] {
			return si[keys[i]] > si[keys[j]]
		}
		return keys[i] < keys[j]
	})
	return keys
}

// siState says in words what a saturation index means (never only a sign).
func siState(si float64) string {
	if si > 0 {
		return "supersaturated (may scale)"
	}
	return "undersaturated"
}

func gamma(g *float64) string {
	if g == nil {
		return "—"
	}
	return num(*g)
}

func osmoticTable(w io.Writer, props []pair, r *api.OsmoticResponse) error {
	var b bytes.Buffer
	tw := tabwriter.NewWriter(&b, 0, 0, 2, ' ', 0)
	for _, p := range props {
		fmt.Fprintf(tw, "%s\t%s\n", p.key, p.val)
	}
	if err := tw.Flush(); err != nil {
		return err
	}
	if len(r.Ions) > 0 {
		rows := make([][]string, len(r.Ions))
		for i, ion := range r.Ions {
			rows[i] = []string{ion.Ion, fmt.Sprintf("%+d", ion.Charge), num(ion.MolalityMolPerKg), gamma(ion.ActivityCoefficient)}
		}
		if err := tableSection(&b, "ions", []string{"ion", "charge", "molality (mol/kg)", "activity coefficient γ"}, rows); err != nil {
			return err
		}
	}
	if len(r.Components) > 0 {
		rows := make([][]string, len(r.Components))
		for i, c := range r.Components {
			rows[i] = []string{c.Solute, num(c.MoleFraction), num(c.MolalityMolPerKg), num(c.MolarityMolPerL), num(c.MassConcentrationGPerL)}
		}
		if err := tableSection(&b, "components", []string{"solute", "mole fraction", "molality (mol/kg)", "molarity (mol/L)", "mass concentration (g/L)"}, rows); err != nil {
			return err
		}
	}
	fmt.Fprintln(&b, "\nsaturation indices (SI = log10 IAP/Ksp):")
	if len(r.SaturationIndices) == 0 {
		fmt.Fprintln(&b, "  none: no mineral of the engine's set has all its ions in this solution")
	} else {
		tw = tabwriter.NewWriter(&b, 0, 0, 2, ' ', 0)
		fmt.Fprintln(tw, "  mineral\tSI\tstate")
		for _, m := range minerals(r.SaturationIndices) {
			si := r.SaturationIndices[m]
			fmt.Fprintf(tw, "  %s\t%.3f\t%s\n", m, si, siState(si))
		}
		if err := tw.Flush(); err != nil {
			return err
		}
	}
	for _, l := range []struct {
		title string
		lines []string
	}{{"warnings", r.Warnings}, {"cautions", r.Cautions}} {
		if len(l.lines) > 0 {
			fmt.Fprintf(&b, "\n%s:\n", l.title)
			for _, s := range l.lines {
				fmt.Fprintf(&b, "  %s\n", s)
			}
		}
	}
	_, err := w.Write(b.Bytes())
	return err
}

func osmoticCSV(w io.Writer, props []pair, r *api.OsmoticResponse) error {
	cw := newCSV(w)
	writeKV(cw, props)
	cw.Write([]string{})
	cw.Write([]string{"ion", "charge", "molality (mol/kg)", "activity coefficient"})
	for _, ion := range r.Ions {
		g := ""
		if ion.ActivityCoefficient != nil {
			g = num(*ion.ActivityCoefficient)
		}
		cw.Write([]string{ion.Ion, fmt.Sprint(ion.Charge), num(ion.MolalityMolPerKg), g})
	}
	if len(r.Components) > 0 {
		cw.Write([]string{})
		cw.Write([]string{"component", "mole fraction", "molality (mol/kg)", "molarity (mol/L)", "mass concentration (g/L)"})
		for _, c := range r.Components {
			cw.Write([]string{c.Solute, num(c.MoleFraction), num(c.MolalityMolPerKg), num(c.MolarityMolPerL), num(c.MassConcentrationGPerL)})
		}
	}
	cw.Write([]string{})
	cw.Write([]string{"mineral", "saturation index (log10 IAP/Ksp)"})
	for _, m := range minerals(r.SaturationIndices) {
		cw.Write([]string{m, num(r.SaturationIndices[m])})
	}
	if len(r.Warnings)+len(r.Cautions) > 0 {
		cw.Write([]string{})
		for _, s := range r.Warnings {
			cw.Write([]string{"warning", s})
		}
		for _, s := range r.Cautions {
			cw.Write([]string{"caution", s})
		}
	}
	cw.Flush()
	return cw.Error()
}

// tableSection writes a titled, indented, aligned table to b.
func tableSection(b *bytes.Buffer, title string, header []string, rows [][]string) error {
	fmt.Fprintf(b, "\n%s:\n", title)
	tw := tabwriter.NewWriter(b, 0, 0, 2, ' ', 0)
	fmt.Fprintf(tw, "  %s\n", strings.Join(header, "\t"))
	for _, r := range rows {
		fmt.Fprintf(tw, "  %s\n", strings.Join(r, "\t"))
	}
	return tw.Flush()
}
