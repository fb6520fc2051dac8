package main

import (
	"bytes"
	"encoding/json"
	"strings"
	"testing"
)

// TestCLIBadInput: named bad inputs to the CLI. A request error prints the
// contract's error object on standard output, naming the exact field, with
// exit status 2; in a batch it is the failing scenario's line.
func TestCLIBadInput(t *testing.T) {
	osm := `{"solute":"NaCl","concentration":1,"unit":"mol/kg"}`
	flux := `{"membrane":{"a_lmh_per_bar":1,"b_lmh":0.3,"s_um":500},"orientation":"AL-FS","draw":{"solute":"NaCl","concentration":1,"unit":"mol/L"}}`
	with := func(s, old, new string) string {
		if !strings.Contains(s, old) {
			t.Fatalf("%q not in %s", old, s)
		}
		return strings.Replace(s, old, new, 1)
	}
	for _, tc := range []struct {
		name  string
		args  []string
		stdin string
		field string
		line  int // for a batch: the output line holding the error (-1: single)
	}{
		{"osmotic malformed JSON", []string{"osmotic"}, `{"solute":"NaCl",`, "", -1},
		{"osmotic empty input", []string{"osmotic"}, "", "", -1},
		{"osmotic wrong type", []string{"osmotic"}, with(osm, `1,`, `[1],`), "concentration", -1},
		{"osmotic unknown solute", []string{"osmotic"}, with(osm, "NaCl", "NaCI"), "solute", -1},
		{"osmotic NaN", []string{"osmotic"}, with(osm, `1,`, `NaN,`), "", -1},
		{"osmotic negative", []string{"osmotic"}, with(osm, `1,`, `-1,`), "concentration", -1},
		{"osmotic unknown unit", []string{"osmotic"}, with(osm, "mol/kg", "mol/ft3"), "unit", -1},
		{"osmotic unknown field", []string{"osmotic"}, with(osm, `"unit"`, `"temp":25,"unit"`), "temp", -1},
		{"osmotic deeply nested", []string{"osmotic"}, `{"solute":` + strings.Repeat("[", 50000) + strings.Repeat("]", 50000) + `}`, "", -1},
		{"flux unknown orientation", []string{"flux"}, with(flux, "AL-FS", "FS-AL"), "orientation", -1},
		{"flux missing draw", []string{"flux", "--format", "csv"}, with(flux, `,"draw":{"solute":"NaCl","concentration":1,"unit":"mol/L"}`, ``), "draw", -1},
		{"flux huge S", []string{"flux"}, with(flux, `"s_um":500`, `"s_um":5e8`), "membrane.s_um", -1},
		{"screen unknown candidate", []string{"screen"}, `{"candidates":["Unobtainium"]}`, "candidates[0]", -1},
		{"screen batch malformed element", []string{"screen"}, `[{"candidates":["NaCl"]}, {"candidates": ]`, "[1]", -1},
		{"screen batch empty array", []string{"screen"}, `[ ]`, "[0]", -1},
		{"screen batch trailing data", []string{"screen"}, `[{"candidates":["NaCl"]}] {}`, "", -1},
		{"screen NDJSON malformed line", []string{"screen"}, `{"candidates":["NaCl"]}` + "\n" + `{"candidates":` + "\n", "", 1},
		{"screen NDJSON unknown field", []string{"screen"}, `{"candidates":["NaCl"]}` + "\n" + `{"candidatez":["NaCl"]}` + "\n", "candidatez", 1},
		{"screen array wrong type", []string{"screen"}, `[{"candidates":"NaCl"}]`, "candidates", 0},
	} {
		t.Run(tc.name, func(t *testing.T) {
			code, out, errOut := runCLI(t, tc.stdin, tc.args...)
			if code != 2 {
				t.Fatalf("exit %d, want 2 (stderr %q, stdout %.200s)", code, errOut, out)
			}
			lines := strings.Split(strings.TrimSpace(out), "\n")
			var e struct {
				Index *int `json:"index"`
				Error *struct {
					Field   string `json:"field"`
					Message string `json:"message"`
					Limit   any    `json:"limit"`
				} `json:"error"`
				Result json.RawMessage `json:"result"`
			}
			text := lines[0]
			if tc.line >= 0 {
				if tc.line >= len(lines) {
					t.Fatalf("no output line %d: %s", tc.line, out)
				}
				text = lines[tc.line]
			} else if len(lines) != 1 {
				t.Fatalf("want one error object, got %d lines: %.300s", len(lines), out)
			}
			dec := json.NewDecoder(strings.NewReader(text))
			dec.DisallowUnknownFields()
			if err := dec.Decode(&e); err != nil || e.Error == nil || e.Error.Message == "" {
				t.Fatalf("not the contract's error object (%v): %s", err, text)
			}
			if e.Error.Field != tc.field {
				t.Errorf("field %q, want %q (message %q)", e.Error.Field, tc.field, e.Error.Message)
			}
			if tc.line >= 0 && (e.Index == nil || *e.Index != tc.line) {
				t.Errorf("batch line %d: index %v", tc.line, e.Index)
			}
		})
	}
}

// TestCLIBadFlags: misuse of the batch and serve flags is a usage error
// (exit 1) naming the flag.
func TestCLIBadFlags(t *testing.T) {
	batch := `[{"candidates":["NaCl"]},{"candidates":["KCl"]}]`
	for _, tc := range []struct {
		name  string
		args  []string
		stdin string
		want  string
	}{
		{"remote not a URL", []string{"screen", "--remote", "127.0.0.1:8080"}, batch, "--remote"},
		{"remote bad scheme", []string{"screen", "--remote", "ftp://host/"}, batch, "--remote"},
		{"concurrency too high", []string{"screen", "--concurrency", "100000"}, batch, "--concurrency"},
		{"concurrency negative", []string{"screen", "--concurrency", "-2"}, batch, "--concurrency"},
		{"retries too many", []string{"screen", "--retries", "99"}, batch, "--retries"},
		{"timeout zero", []string{"screen", "--timeout", "0s"}, batch, "--timeout"},
		{"table for a batch", []string{"screen", "--format", "table"}, batch, "--format table"},
		{"concurrency not a number", []string{"screen", "--concurrency", "many"}, batch, "-concurrency"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			code, out, errOut := runCLI(t, tc.stdin, tc.args...)
			if code != 1 {
				t.Errorf("exit %d, want 1 (stdout %.200s)", code, out)
			}
			if !strings.Contains(errOut, tc.want) {
				t.Errorf("stderr should name %s: %q", tc.want, errOut)
			}
		})
	}
}

// TestCLINonFiniteInputs: the inputs of issue #15 item 3 that once printed
// "json: unsupported value: +Inf" (exit 1) are refused as bad input (exit 2)
// with the contract's error naming the field and its limit.
func TestCLINonFiniteInputs(t *testing.T) {
	custom := func(extra string) string {
		return `{"candidates":["X"],"custom_solutes":[{"id":"X","molar_mass_g_per_mol":100,"diffusivity_m2_per_s":1e-9,"solubility_mol_per_kg":5` + extra + `}]}`
	}
	for _, tc := range []struct{ name, stdin, field, limit string }{
		{"sweep to 1e308", `{"candidates":["NaCl"],"sweep":{"variable":"concentration","from":0.1,"to":1e308,"points":3,"unit":"mol/L"}}`, "sweep.to", "0–100000"},
		{"custom price 1e308", custom(`,"price_usd_per_kg_min":1e308,"price_usd_per_kg_max":1e308`), "custom_solutes[0].price_usd_per_kg_min", "0–1000000 USD/kg"},
		{"ion molar mass 5e-324", `{"candidates":["NaCl"],"feed":{"ions":[{"symbol":"Na+","charge":1,"molar_mass_g_per_mol":5e-324,"mg_per_l":1000},{"symbol":"Cl-","charge":-1,"molar_mass_g_per_mol":35.45,"mg_per_l":1542}]}}`, "feed.ions[0].molar_mass_g_per_mol", "1–10000 g/mol"},
		{"custom molar mass 1e-320", strings.Replace(custom(""), `"molar_mass_g_per_mol":100`, `"molar_mass_g_per_mol":1e-320`, 1), "custom_solutes[0].molar_mass_g_per_mol", "≥ 1 and < 10000000 g/mol"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			code, out, errOut := runCLI(t, tc.stdin, "screen", "--format", "json")
			if code != 2 || strings.Contains(errOut+out, "unsupported value") {
				t.Fatalf("exit %d, want 2 (stderr %q, stdout %.200s)", code, errOut, out)
			}
			var e struct {
				Error struct {
					Field, Message string
					Limit          any
				} `json:"error"`
			}
			if err := json.Unmarshal([]byte(strings.TrimSpace(out)), &e); err != nil {
				t.Fatalf("not the contract's error object (%v): %s", err, out)
			}
			if e.Error.Field != tc.field || e.Error.Limit != tc.limit {
				t.Errorf("field %q limit %v, want %q %q (%s)", e.Error.Field, e.Error.Limit, tc.field, tc.limit, e.Error.Message)
			}
		})
	}
}

// TestCLIHelp: drawsift help lists every command; each command's -h and
// help COMMAND print its usage (with request fields, units and defaults
// for the request commands) and exit 0; a mistyped command says what to
// type; solutes and presets print tables, or JSON with --json.
func TestCLIHelp(t *testing.T) {
	call := func(args ...string) (string, string, int) {
		var out, errb bytes.Buffer
		code := run(args, strings.NewReader(""), &out, &errb)
		return out.String(), errb.String(), code
	}
	list, _, code := call("help")
	if code != 0 {
		t.Fatalf("help exits %d", code)
	}
	for _, c := range commands {
		if !strings.Contains(list, "\n  "+c.name+" ") {
			t.Errorf("help lacks %s:\n%s", c.name, list)
		}
		args := []string{c.name, "--help"}
		if c.name == "help" {
			args = []string{"help", "help"}
		}
		out, _, code := call(args...)
		if code != 0 || !strings.HasPrefix(out, "usage: drawsift "+c.name) {
			t.Errorf("%v: exit %d, %q", args, code, out[:min(len(out), 80)])
		}
		if c.name != "serve" && c.name != "bundle" && c.name != "help" {
			if h, _, _ := call("help", c.name); h != out {
				t.Errorf("help %s differs from %s --help", c.name, c.name)
			}
		}
	}
	scr, _, _ := call("screen", "-h")
	for _, want := range []string{"temperature_c", "[°C]; default 25", "basis.value (osmotic-pressure)", "[bar]", "score_normalisation", "--demo", "example:"} {
		if !strings.Contains(scr, want) {
			t.Errorf("screen -h lacks %q", want)
		}
	}
	if b, _, _ := call("bundle", "-h"); strings.Contains(b, "`") || !strings.Contains(b, "-wasm PATH") {
		t.Errorf("bundle -h is garbled:\n%s", b)
	}
	_, msg, code := call("scren")
	if code != 1 || !strings.Contains(msg, "Did you mean screen?") || !strings.Contains(msg, "drawsift help") {
		t.Errorf("a mistyped command: exit %d, %q", code, msg)
	}
	sol, _, code := call("solutes")
	if code != 0 || !strings.Contains(sol, "NaCl") || !strings.Contains(sol, "van 't Hoff only") {
		t.Errorf("solutes: exit %d\n%s", code, sol)
	}
	js, _, _ := call("solutes", "--json")
	var lib struct {
		Solutes []struct {
			ID string `json:"id"`
		} `json:"solutes"`
	}
	if err := json.Unmarshal([]byte(js), &lib); err != nil || len(lib.Solutes) < 10 {
		t.Errorf("solutes --json: %v, %d solutes", err, len(lib.Solutes))
	}
	pre, _, code := call("presets")
	if code != 0 || !strings.Contains(pre, "tfc-standard") || !strings.Contains(pre, "seawater") {
		t.Errorf("presets: exit %d\n%s", code, pre)
	}
	if _, msg, code := call("presets", "--yaml"); code != 1 || !strings.Contains(msg, "drawsift presets --json") {
		t.Errorf("presets --yaml: exit %d, %q", code, msg)
	}
}
