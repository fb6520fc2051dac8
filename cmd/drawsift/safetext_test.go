package main

import (
	"bytes"
	"context"
	"encoding/csv"
	"strings"
	"testing"

	"drawsift/engine/api"
)

// Cells a spreadsheet would run as formulas are neutralised with a
// leading quote (OWASP, "CSV Injection"); numbers, negative ones too,
// stay numbers.
func TestCSVCellFormulaInjection(t *testing.T) {
	for _, tc := range []struct{ in, want string }{
		{`=HYPERLINK("http://example.invalid","x")`, `'=HYPERLINK("http://example.invalid","x")`},
		{"+1+1", "'+1+1"}, {"-2+3", "'-2+3"}, {"@SUM(A1)", "'@SUM(A1)"},
		{"\t=1", "'\t=1"}, {"\r=1", "'\r=1"}, {"-", "'-"},
		{"-0.25", "-0.25"}, {"+3e-4", "+3e-4"}, {"-1.5e+06", "-1.5e+06"}, {"12", "12"}, {"NaCl", "NaCl"}, {"", ""},
	} {
		if got := csvCell(tc.in); got != tc.want {
			t.Errorf("csvCell(%q) = %q, want %q", tc.in, got, tc.want)
		}
	}
}

// evilID is a custom solute id that a spreadsheet would run as a formula.
const evilID = `=HYPERLINK("http://example.invalid","open")`

func evilScreen() string {
	return `{"candidates":["NaCl",` + jsonString(evilID) + `],"custom_solutes":[{"id":` + jsonString(evilID) +
		`,"name":"@evil","molar_mass_g_per_mol":100,"diffusivity_m2_per_s":1e-9,"solubility_mol_per_kg":5,"source":"-1+cmd"}]}`
}

func jsonString(s string) string { return `"` + strings.ReplaceAll(s, `"`, `\"`) + `"` }

// The CLI's screen CSV (and its batch CSV) never starts a text cell with a
// formula character, and keeps numeric cells numeric.
func TestCLICSVNeutralisesFormulaCells(t *testing.T) {
	for _, stdin := range []string{evilScreen(), "[" + evilScreen() + "," + `{"candidates":["NaCl"],"@x":1}` + "]"} {
		code, out, errOut := runCLI(t, stdin, "screen", "--format", "csv")
		if code != 0 && code != 2 {
			t.Fatalf("exit %d: %s", code, errOut)
		}
		recs, err := csv.NewReader(strings.NewReader(out)).ReadAll()
		if err != nil {
			// The key/value blocks have rows of different lengths.
			r := csv.NewReader(strings.NewReader(out))
			r.FieldsPerRecord = -1
			if recs, err = r.ReadAll(); err != nil {
				t.Fatal(err)
			}
		}
		sawID, sawNumber := false, false
		for _, rec := range recs {
			for _, c := range rec {
				if c == "'"+evilID {
					sawID = true
				}
				if c != "" && strings.ContainsRune("=+-@\t\r", rune(c[0])) {
					if !isNumber(c) {
						t.Errorf("formula cell %q", c)
					}
					sawNumber = sawNumber || c[0] == '-'
				}
			}
		}
		if !sawID {
			t.Errorf("the custom id is not in the CSV as quoted text: %.600s", out)
		}
		_ = sawNumber // negative numbers may or may not occur; those that do were left numeric above
	}
	// The generic key/value CSV (flux) too: an unknown key echoed in an error is JSON, not CSV,
	// so check the writer directly.
	var b bytes.Buffer
	if err := writeCSV(&b, []pair{{"=cmd", "-0.5"}, {"x", "@y"}}); err != nil {
		t.Fatal(err)
	}
	if got := b.String(); got != "'=cmd,x\n-0.5,'@y\n" {
		t.Errorf("key/value CSV: %q", got)
	}
}

func isNumber(s string) bool { return csvCell(s) == s }

// --format table strips control characters (an ESC sequence would drive
// the terminal) and bidi/zero-width format characters from text cells,
// also from a response a --remote server sent.
func TestTableStripsControlCharacters(t *testing.T) {
	resp, e := api.Dispatch(context.Background(), api.OpScreen, []byte(`{"candidates":["NaCl","quiet"],"custom_solutes":[{"id":"quiet","molar_mass_g_per_mol":100,"diffusivity_m2_per_s":1e-9,"solubility_mol_per_kg":5}]}`))
	if e != nil {
		t.Fatal(e)
	}
	evil := bytes.ReplaceAll(resp, []byte("quiet"), []byte(`\u001b[2J\u001b]0;owned\u0007qu\u202eiet\u200b\r\n`))
	if bytes.Equal(evil, resp) {
		t.Fatal("name not found in the response")
	}
	osm, e := api.Dispatch(context.Background(), api.OpOsmotic, []byte(`{"solute":"NaCl","concentration":1,"unit":"mol/kg"}`))
	if e != nil {
		t.Fatal(e)
	}
	osmEvil := bytes.Replace(osm, []byte(`"sodium chloride"`), []byte(`"\u001b[31mred\u009b"`), 1)
	for _, c := range []struct {
		op   string
		resp []byte
	}{{"screen", evil}, {"osmotic", osmEvil}, {"presets", []byte(`{"note":"a\u001b[1mb","engine_version":"x"}`)}} {
		var b bytes.Buffer
		if err := render(&b, c.op, "table", c.resp); err != nil {
			t.Fatalf("%s: %v", c.op, err)
		}
		if want := map[string]string{"screen": "ownedquiet", "osmotic": "[31mred"}[c.op]; want != "" && !strings.Contains(b.String(), want) {
			t.Errorf("%s table lacks %q: %q", c.op, want, b.String())
		}
		for _, r := range b.String() {
			if r != '\n' && (r < 0x20 || r == 0x7f || r >= 0x80 && r < 0xa0 || r == 0x202e || r == 0x200b) {
				t.Errorf("%s table holds %U: %q", c.op, r, b.String())
				break
			}
		}
	}
}
