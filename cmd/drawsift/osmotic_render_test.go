package main

import (
	"bytes"
	"encoding/csv"
	"encoding/json"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"drawsift/engine/api"
)

// mixtureRequest: 1 mol/kg NaCl with 0.5 mol/kg MgCl2, a blend of two
// library salts (our own example).
const mixtureRequest = `{"mixture": [{"solute": "NaCl", "concentration": 1.0, "unit": "mol/kg"},
	{"solute": "MgCl2", "concentration": 0.5, "unit": "mol/kg"}]}`

// cli runs the CLI and fails the test on a non-zero exit.
func cli(t *testing.T, stdin string, args ...string) string {
	t.Helper()
	var out, errb bytes.Buffer
	if code := run(args, strings.NewReader(stdin), &out, &errb); code != 0 {
		t.Fatalf("drawsift %v: exit %d: %s %s", args, code, out.String(), errb.String())
	}
	return out.String()
}

// osmoticJSON is the engine's answer to the request, as --format json prints it.
func osmoticJSON(t *testing.T, req string) api.OsmoticResponse {
	t.Helper()
	var r api.OsmoticResponse
	if err := json.Unmarshal([]byte(cli(t, req, "osmotic", "--format", "json")), &r); err != nil {
		t.Fatal(err)
	}
	return r
}

// block returns the lines of the table's block that follows heading, up
// to the next blank line.
func block(t *testing.T, out, heading string) []string {
	t.Helper()
	i := strings.Index(out, "\n"+heading+"\n")
	if i < 0 {
		t.Fatalf("no %q block in:\n%s", heading, out)
	}
	rest := out[i+len(heading)+2:]
	if j := strings.Index(rest, "\n\n"); j >= 0 {
		rest = rest[:j]
	}
	return strings.Split(strings.TrimRight(rest, "\n"), "\n")
}

func closeTo(t *testing.T, what, text string, want float64) {
	t.Helper()
	got, err := strconv.ParseFloat(text, 64)
	if err != nil || !(got == want || (want != 0 && abs(got/want-1) < 1e-5)) {
		t.Errorf("%s = %q, want %.6g", what, text, want)
	}
}

func abs(x float64) float64 {
	if x < 0 {
		return -x
	}
	return x
}

// The terminal table of a mixture lists every ion with its molality and
// activity coefficient and every component of the blend, with the same
// numbers as the JSON response, and says what the saturation indices are.
func TestOsmoticTableMixture(t *testing.T) {
	want := osmoticJSON(t, mixtureRequest)
	if len(want.Ions) != 3 || len(want.Components) != 2 {
		t.Fatalf("the engine reports %d ions and %d components for NaCl + MgCl2", len(want.Ions), len(want.Components))
	}
	out := cli(t, mixtureRequest, "osmotic", "--format", "table")
	if strings.Contains(out, "ions[0]") || strings.Contains(out, "components[0]") {
		t.Errorf("ions or components are flattened into the property list:\n%s", out)
	}
	if !regexp.MustCompile(`(?m)^osmotic_pressure_bar +\S+$`).MatchString(out) || !strings.Contains(out, "ionic_strength_mol_per_kg") {
		t.Errorf("the property list lacks π or the ionic strength:\n%s", out)
	}
	ions := block(t, out, "ions:")
	if len(ions) != 1+len(want.Ions) || !strings.Contains(ions[0], "molality (mol/kg)") || !strings.Contains(ions[0], "γ") {
		t.Fatalf("ions block:\n%s", strings.Join(ions, "\n"))
	}
	for i, ion := range want.Ions {
		f := strings.Fields(ions[1+i])
		if len(f) != 4 || f[0] != ion.Ion {
			t.Errorf("ion row %q, want %s", ions[1+i], ion.Ion)
			continue
		}
		closeTo(t, ion.Ion+" molality", f[2], ion.MolalityMolPerKg)
		closeTo(t, ion.Ion+" γ", f[3], *ion.ActivityCoefficient)
	}
	comps := block(t, out, "components:")
	if len(comps) != 1+len(want.Components) {
		t.Fatalf("components block:\n%s", strings.Join(comps, "\n"))
	}
	for i, c := range want.Components {
		f := strings.Fields(comps[1+i])
		if len(f) != 5 || f[0] != c.Solute {
			t.Errorf("component row %q, want %s", comps[1+i], c.Solute)
			continue
		}
		closeTo(t, c.Solute+" mole fraction", f[1], c.MoleFraction)
		closeTo(t, c.Solute+" molality", f[2], c.MolalityMolPerKg)
	}
	si := block(t, out, "saturation indices (SI = log10 IAP/Ksp):")
	if len(want.SaturationIndices) == 0 {
		if len(si) != 1 || !strings.Contains(si[0], "none") {
			t.Errorf("no saturation indices, but the block reads:\n%s", strings.Join(si, "\n"))
		}
	} else if len(si) != 1+len(want.SaturationIndices) {
		t.Errorf("%d saturation indices, block:\n%s", len(want.SaturationIndices), strings.Join(si, "\n"))
	}
	// A single solute has no components block.
	if out := cli(t, `{"solute": "NaCl", "concentration": 1, "unit": "mol/kg"}`, "osmotic", "--format", "table"); strings.Contains(out, "components:") {
		t.Errorf("a single solute prints components:\n%s", out)
	}
}

// The CSV of a mixture keeps the one-header, one-value rows of the
// properties, then the ions, components and saturation indices as blocks.
func TestOsmoticCSVMixture(t *testing.T) {
	want := osmoticJSON(t, mixtureRequest)
	r := csv.NewReader(strings.NewReader(cli(t, mixtureRequest, "osmotic", "--format", "csv")))
	r.FieldsPerRecord = -1
	rows, err := r.ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	if len(rows[0]) != len(rows[1]) || rows[0][0] != "solute" || rows[1][0] != want.Solute {
		t.Fatalf("property rows %v / %v", rows[0], rows[1])
	}
	for _, h := range rows[0] {
		if strings.HasPrefix(h, "ions") || strings.HasPrefix(h, "components") {
			t.Errorf("property header %q belongs in its own block", h)
		}
	}
	find := func(head string) int {
		for i, row := range rows {
			if len(row) > 0 && row[0] == head {
				return i
			}
		}
		t.Fatalf("no block headed %q", head)
		return -1
	}
	i := find("ion")
	if rows[i][3] != "activity coefficient" {
		t.Errorf("ion block header %v", rows[i])
	}
	for k, ion := range want.Ions {
		row := rows[i+1+k]
		if row[0] != ion.Ion || row[1] != strconv.Itoa(ion.Charge) {
			t.Errorf("ion row %v, want %s", row, ion.Ion)
			continue
		}
		closeTo(t, ion.Ion+" molality", row[2], ion.MolalityMolPerKg)
		closeTo(t, ion.Ion+" γ", row[3], *ion.ActivityCoefficient)
	}
	j := find("component")
	for k, c := range want.Components {
		if row := rows[j+1+k]; row[0] != c.Solute {
			t.Errorf("component row %v, want %s", row, c.Solute)
		} else {
			closeTo(t, c.Solute+" molarity", row[3], c.MolarityMolPerL)
		}
	}
	find("mineral")
}

// The saturation indices print highest first, each with its state in
// words, and the CSV holds every one. The engine's mineral set is being
// extended, so the response here is built by hand: an osmotic response
// with two minerals, one supersaturated.
func TestOsmoticSaturationIndicesRender(t *testing.T) {
	var resp map[string]any
	if err := json.Unmarshal([]byte(cli(t, mixtureRequest, "osmotic", "--format", "json")), &resp); err != nil {
		t.Fatal(err)
	}
	resp["saturation_indices"] = map[string]float64{"halite": -1.25, "gypsum": 0.31}
	body, _ := json.Marshal(resp)
	var out bytes.Buffer
	if err := render(&out, "osmotic", "table", body); err != nil {
		t.Fatal(err)
	}
	si := block(t, out.String(), "saturation indices (SI = log10 IAP/Ksp):")
	if len(si) != 3 {
		t.Fatalf("block:\n%s", strings.Join(si, "\n"))
	}
	if f := strings.Fields(si[1]); f[0] != "gypsum" || f[1] != "0.310" || !strings.Contains(si[1], "supersaturated") {
		t.Errorf("first row %q, want gypsum 0.310 supersaturated", si[1])
	}
	if f := strings.Fields(si[2]); f[0] != "halite" || f[1] != "-1.250" || !strings.Contains(si[2], "undersaturated") {
		t.Errorf("second row %q, want halite -1.250 undersaturated", si[2])
	}
	out.Reset()
	if err := render(&out, "osmotic", "csv", body); err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(out.String(), "\ngypsum,0.31\nhalite,-1.25\n") {
		t.Errorf("CSV saturation block missing:\n%s", out.String())
	}
}

// blendScreen: seawater against NaCl, MgCl2 and a three-part blend whose
// ID is longer than the table's solute column.
const blendID = "NaCl+MgCl2+Na2SO4 blend 8:1:1"

const blendScreen = `{"feed": {"preset": "seawater"}, "candidates": ["NaCl", "MgCl2",
	{"id": "` + blendID + `", "blend": [{"solute": "NaCl", "mole_fraction": 0.8},
	{"solute": "MgCl2", "mole_fraction": 0.1}, {"solute": "Na2SO4", "mole_fraction": 0.1}]}]}`

// The screen table ranks a blend candidate, cuts its long ID with a
// footnote that gives it whole, and shows each candidate's highest
// feed-face saturation index with its mineral; the CSV carries the full
// ID and every feed-face index.
func TestScreenTableBlendCandidate(t *testing.T) {
	var resp api.ScreenResponse
	if err := json.Unmarshal([]byte(cli(t, blendScreen, "screen", "--format", "json")), &resp); err != nil {
		t.Fatal(err)
	}
	var blend *api.ScreenCandidate
	for i := range resp.Candidates {
		if resp.Candidates[i].Solute == blendID {
			blend = &resp.Candidates[i]
		}
	}
	if blend == nil || blend.MaxSaturationIndex == nil || len(blend.Scaling) == 0 {
		t.Fatalf("the engine did not rank the blend with scaling indices: %+v", resp.Candidates)
	}
	out := cli(t, blendScreen, "screen", "--format", "table")
	row := regexp.MustCompile(`(?m)^ *` + strconv.Itoa(blend.Rank) + `  +(\S.*?… \[1\]) .*$`).FindStringSubmatch(out)
	if row == nil {
		t.Fatalf("no cut blend row ranked %d:\n%s", blend.Rank, out)
	}
	if !strings.HasPrefix(blendID, strings.TrimSuffix(row[1], "… [1]")) {
		t.Errorf("cut ID %q is not the start of %q", row[1], blendID)
	}
	if !strings.Contains(out, "\n[1] "+blendID+"\n") {
		t.Errorf("no footnote with the full ID:\n%s", out)
	}
	mineral := maxMineral(blend.Scaling)
	if want := mineral + " " + strconv.FormatFloat(*blend.MaxSaturationIndex, 'f', 2, 64); !strings.Contains(row[0], want) {
		t.Errorf("blend row %q lacks max SI %q", row[0], want)
	}
	if strings.Contains(out, "feed (bulk) saturation") != (len(bulkSI(t, blendScreen)) > 0) {
		t.Errorf("the bulk feed line does not follow the response:\n%s", out)
	}

	r := csv.NewReader(strings.NewReader(cli(t, blendScreen, "screen", "--format", "csv")))
	r.FieldsPerRecord = -1
	rows, err := r.ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	col := -1
	for i, h := range rows[0] {
		if strings.HasPrefix(h, "feed-face saturation indices") {
			col = i
		}
	}
	if col < 0 {
		t.Fatalf("CSV header lacks the feed-face indices: %v", rows[0])
	}
	found := false
	for _, row := range rows[1:] {
		if len(row) == len(rows[0]) && row[1] == blendID {
			found = true
			for _, s := range blend.Scaling {
				if !strings.Contains(row[col], s.Mineral+"=") {
					t.Errorf("CSV indices %q lack %s", row[col], s.Mineral)
				}
			}
		}
	}
	if !found {
		t.Errorf("no CSV row with the full blend ID %q", blendID)
	}
}

func bulkSI(t *testing.T, req string) map[string]float64 {
	var r struct {
		FeedSaturationIndices map[string]float64 `json:"feed_saturation_indices"`
	}
	if err := json.Unmarshal([]byte(cli(t, req, "screen", "--format", "json")), &r); err != nil {
		t.Fatal(err)
	}
	return r.FeedSaturationIndices
}

// The bulk feed's saturation indices (feed_saturation_indices, being added
// to the engine) print above the table and in the CSV record when present;
// the response here carries a hand-made set.
func TestScreenBulkFeedSaturationRender(t *testing.T) {
	var resp map[string]any
	if err := json.Unmarshal([]byte(cli(t, blendScreen, "screen", "--format", "json")), &resp); err != nil {
		t.Fatal(err)
	}
	resp["feed_saturation_indices"] = map[string]float64{"calcite": 0.42, "gypsum": -0.61}
	body, _ := json.Marshal(resp)
	var out bytes.Buffer
	if err := render(&out, "screen", "table", body); err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(out.String(), "feed (bulk) saturation indices, log10 IAP/Ksp: calcite 0.42; gypsum -0.61\n") {
		t.Errorf("table lacks the bulk feed line:\n%s", out.String())
	}
	out.Reset()
	if err := render(&out, "screen", "csv", body); err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(out.String(), "feed (bulk) saturation index: calcite,0.42\nfeed (bulk) saturation index: gypsum,-0.61\n") {
		t.Errorf("CSV lacks the bulk feed records:\n%s", out.String())
	}
}
