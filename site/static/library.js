// Drawsift page, the library panel: the solute list with search and
// family filter, which solutes the screen includes, each solute's data and
// sources, and the user's own custom solutes.
"use strict";

(function () {
  const P = window.DrawsiftPage;
  const { $, state, S, h, clear, num, prune } = P;

  function renderLibrary() {
    const q = $("lib-search").value.trim().toLowerCase(), fam = $("lib-family").value;
    const list = clear($("lib-list"));
    const all = state.library.concat(state.custom.map(c => Object.assign({ family: "custom", name: c.name || c.id + " (user-defined)", custom: true }, c)));
    const shown = all.filter(s => (!fam || s.family === fam) &&
      (!q || s.id.toLowerCase().includes(q) || (s.name || "").toLowerCase().includes(q) || (s.aliases || []).some(a => a.toLowerCase().includes(q))));
    // The library's boxes tick single solutes; blends are listed apart (mixtures.js).
    const cands = new Set((state.scenario.candidates || []).filter(x => !P.isBlend(x)).map(x => x.toLowerCase()));
    for (const s of shown) {
      const id = "inc-" + s.id.replace(/[^A-Za-z0-9]/g, "_");
      const li = h("li", { class: state.current === s.id ? "current" : null, "data-solute": s.id });
      const cb = h("input", { type: "checkbox", id: id, "aria-label": "Include " + s.id + " in the screen" });
      cb.checked = cands.has(s.id.toLowerCase());
      cb.addEventListener("change", () => toggleCandidate(s.id, cb.checked));
      li.appendChild(cb);
      li.appendChild(h("button", { type: "button", "aria-label": "Show data for " + s.id, on: { click: () => { state.current = s.id; renderLibrary(); showSolute(s); } } },
        s.id, " ", h("span", { class: "fam", text: s.family })));
      list.appendChild(li);
    }
    $("lib-count").textContent = shown.length + " of " + all.length + " solutes shown; " + cands.size + " included in the screen.";
  }
  function toggleCandidate(id, on) {
    const sc = state.scenario;
    const list = (sc.candidates || []).filter(x => P.isBlend(x) || x.toLowerCase() !== id.toLowerCase());
    if (on) list.push(id);
    sc.candidates = list;
    P.setScenario(P.readForm());
    $("lib-count").textContent = $("lib-count").textContent.replace(/\d+ included/, list.filter(x => !P.isBlend(x)).length + " included");
    P.scheduleRun();
  }
  function bulkInclude(on) {
    const ids = Array.from($("lib-list").querySelectorAll("li")).map(li => li.dataset.solute);
    const sc = state.scenario;
    const set = new Map((sc.candidates || []).map(x => [P.candId(x).toLowerCase(), x]));
    for (const id of ids) {
      const k = id.toLowerCase();
      if (on && !set.has(k)) set.set(k, id);
      else if (!on && !P.isBlend(set.get(k))) set.delete(k);
    }
    sc.candidates = Array.from(set.values());
    P.setScenario(P.readForm());
    renderLibrary();
    P.scheduleRun();
  }
  function showSolute(s) {
    const d = clear($("lib-detail"));
    d.appendChild(h("h3", { text: s.id + " — " + (s.name || "user-defined solute") }));
    const dl = h("dl", {});
    const add = (k, v) => { if (v !== undefined && v !== null && v !== "") { dl.appendChild(h("dt", { text: k })); dl.appendChild(h("dd", { text: String(v) })); } };
    add("Family", s.family);
    add("Molar mass", s.molar_mass_g_per_mol + " g/mol");
    if (s.osmotic_model) add("Osmotic model", s.osmotic_model.kind + (s.osmotic_model.max_molality_mol_per_kg ? ", data to " + s.osmotic_model.max_molality_mol_per_kg + " mol/kg" : "") + (s.osmotic_model.reason ? " — " + s.osmotic_model.reason : ""));
    if (s.custom) add("Osmotic model", s.osmotic_table
      ? "measured π table of " + s.osmotic_table.points.length + " points, interpolated monotonically in the ranking"
      : "van 't Hoff in the ranking (user-defined solute without a measured table)");
    if (s.ions && s.ions.length) add("Ions", s.ions.map(i => i.count + " × " + i.symbol).join(", "));
    if (s.solubility) add("Solubility", s.solubility.miscible ? "miscible" : (s.solubility.points || []).map(p => p.molality_mol_per_kg + " mol/kg at " + p.temperature_c + " °C").join("; "));
    if (s.solubility_mol_per_kg !== undefined) add("Solubility", s.solubility_mol_per_kg + " mol/kg at 25 °C");
    if (s.diffusivity) add("Diffusivity at infinite dilution", (s.diffusivity.d0_m2_per_s * 1e9).toFixed(3) + " × 10⁻⁹ m²/s");
    if (s.diffusivity_m2_per_s) add("Diffusivity", (s.diffusivity_m2_per_s * 1e9).toFixed(3) + " × 10⁻⁹ m²/s");
    if (s.price) add("Price", s.price.usd_per_kg_min + "–" + s.price.usd_per_kg_max + " USD/kg (" + (s.price.grade || "") + ", " + (s.price.year || "") + ")");
    if (s.price_usd_per_kg_min !== undefined) add("Price", s.price_usd_per_kg_min + "–" + s.price_usd_per_kg_max + " USD/kg");
    add("Regeneration routes", (s.regeneration || []).join(", "));
    add("Notes", s.notes);
    d.appendChild(dl);
    if ((s.hazards && s.hazards.length) || (s.hazard_flags && s.hazard_flags.length)) {
      d.appendChild(h("h4", { text: "Hazards" }));
      const p = h("p", {});
      for (const f of s.hazard_flags || []) p.appendChild(h("span", { class: "tag", text: f }));
      d.appendChild(p);
      const ul = h("ul", {});
      for (const x of s.hazards || []) ul.appendChild(h("li", { text: x }));
      d.appendChild(ul);
    }
    d.appendChild(h("h4", { text: "Sources" }));
    const src = h("ul", {});
    const m = s.sources || (s.source ? { record: s.source } : {});
    for (const k of Object.keys(m).sort()) src.appendChild(h("li", {}, h("strong", { text: k + ": " }), m[k]));
    d.appendChild(src);
    if (s.custom) d.appendChild(h("button", { type: "button", class: "small", text: "Remove " + s.id + " from my library", on: { click: () => removeCustom(s.id) } }));
  }

  // ---- custom solutes -------------------------------------------------------------------
  // parseTable reads pasted "concentration, π" lines; the number of points
  // is the engine's range for a measured table.
  // decimal reads a number written with a decimal point or comma ("0,5").
  function decimal(str) {
    const t = String(str).trim().replace(/\s+/g, "");
    if (t === "") return undefined;
    return /^[+-]?\d*,\d+([eE][+-]?\d+)?$/.test(t) ? Number(t.replace(",", ".")) : /,/.test(t) ? NaN : Number(t);
  }
  // numIn is a form field's number (decimal comma accepted).
  function numIn(id) { return decimal($(id).value); }
  // mosmToBar converts a measured osmolality to π: ln a_w = −M_w·Σνmφ
  // (osmolality in osmol/kg), π = −(RT/V̄_w) ln a_w = R·T·ρ_w·osmolality —
  // the engine's own definition of π (engine/thermo). ρ_w(t) by Kell
  // (1975) J. Chem. Eng. Data 20:97 (coefficients from memory; within
  // 5 ppm of IAPWS-95 at 25 °C, python3-iapws); R from the engine.
  function waterDensity(t) {
    return (999.83952 + 16.945176 * t - 7.9870401e-3 * t * t - 46.170461e-6 * t ** 3 + 105.56302e-9 * t ** 4 - 280.54253e-12 * t ** 5) / (1 + 16.879850e-3 * t);
  }
  function mosmToBar(mosm, tC) {
    const D = P.defaults();
    return D.gas_constant_j_per_mol_k * (tC + 273.15) * waterDensity(tC) * mosm / 1000 / D.pressure_units_pa.bar;
  }
  // splitPair splits a table line in two: at ";" or a tab; else at the
  // comma when decimals use points or the comma is followed by a space
  // ("0.5, 24"); else at spaces, commas then being decimal commas
  // ("0,5 24"); else at the comma ("1,24").
  function splitPair(line) {
    if (/[;\t]/.test(line)) return line.split(/\s*[;\t]\s*/);
    if (/\./.test(line) || /,\s/.test(line)) return line.split(/\s*,\s*/);
    if (/\s/.test(line)) return line.split(/\s+/);
    return line.split(",");
  }
  function parseTable(text, col, tC) {
    const pts = [];
    const lines = text.split(/\r?\n/);
    for (let i = 0; i < lines.length; i++) {
      const line = lines[i].replace(/#.*/, "").trim();
      if (!line) continue;
      // Separated by ";", tabs or spaces, a comma may be a decimal comma;
      // else the comma separates the two numbers.
      const parts = splitPair(line).filter(Boolean);
      if (parts.length !== 2) throw new Error("line " + (i + 1) + ": expected two numbers (concentration, " + (col === "mosm" ? "osmolality" : "π") + "), got “" + line.slice(0, 40) + "”");
      const c = decimal(parts[0]), v = decimal(parts[1]);
      if (col === "mosm" && !(v > 0 && isFinite(v))) throw new Error("line " + (i + 1) + ": numbers must be finite and > 0");
      const p = col === "mosm" ? mosmToBar(v, tC) : v;
      if (!isFinite(c) || !isFinite(p) || c <= 0 || p <= 0) throw new Error("line " + (i + 1) + ": numbers must be finite and > 0");
      // The engine's own bounds on a table's concentrations and pressures.
      if (!P.inLimit("concentration", c)) throw new Error("line " + (i + 1) + ": concentration " + c + " is outside " + P.limitText("concentration"));
      if (!P.inLimit("basis.osmotic_pressure_bar", p)) throw new Error("line " + (i + 1) + ": π " + p + " bar is outside " + P.limitText("basis.osmotic_pressure_bar"));
      if (pts.length && c <= pts[pts.length - 1].concentration) throw new Error("line " + (i + 1) + ": concentrations must increase");
      if (pts.length && p <= pts[pts.length - 1].osmotic_pressure_bar) throw new Error("line " + (i + 1) + ": osmotic pressure must increase with concentration");
      pts.push({ concentration: c, osmotic_pressure_bar: p });
    }
    const key = "custom_solutes[].pi_table.points";
    if (pts.length && !P.inLimit(key, pts.length)) throw new Error("the table has " + pts.length + (pts.length === 1 ? " point" : " points") + "; a table takes " + P.limitText(key));
    return pts;
  }
  // within throws "what: … (limit)" unless the number v lies in the
  // engine's range for key (in the form's units, scale × the engine's).
  function within(what, v, key, scale, unit) {
    if (v === undefined || !P.inLimit(key, v, scale)) throw new Error(what + ": " + (v === undefined ? "a number is required" : v + " is outside") + " " + P.limitText(key, scale, unit));
  }
  function addCustom(ev) {
    ev.preventDefault();
    const err = $("cs-error");
    err.textContent = "";
    try {
      const id = $("cs-id").value.trim();
      if (!/^[A-Za-z0-9()+\-_.·]{1,40}$/.test(id)) throw new Error("Identifier: use letters, digits and ( ) + - _ . only (at most 40)");
      if (P.solute(id)) throw new Error("Identifier: “" + id + "” is already in the library or your custom solutes");
      const num = numIn;
      const mm = num("cs-mm");
      within("Molar mass", mm, "custom_solutes[].molar_mass_g_per_mol");
      const nu = num("cs-nu");
      within("Particles per formula unit", nu, "custom_solutes[].van_t_hoff_factor");
      const d = num("cs-d");
      within("Diffusivity", d, "custom_solutes[].diffusivity_m2_per_s", 1e9, "× 10⁻⁹ m²/s");
      const cs = { id: id, name: $("cs-name").value.trim() || undefined, molar_mass_g_per_mol: mm, van_t_hoff_factor: nu, diffusivity_m2_per_s: d * 1e-9 };
      const sol = num("cs-sol");
      if (sol === undefined) cs.miscible = true;
      else if (sol > 0) cs.solubility_mol_per_kg = sol;
      else throw new Error("Solubility: a positive number, or blank for a miscible solute");
      const pmin = num("cs-pmin"), pmax = num("cs-pmax");
      if ((pmin === undefined) !== (pmax === undefined)) throw new Error("Price: give both ends of the range, or neither");
      if (pmin !== undefined) {
        if (!(pmin >= 0 && pmax >= pmin)) throw new Error("Price: 0 ≤ from ≤ to");
        cs.price_usd_per_kg_min = pmin; cs.price_usd_per_kg_max = pmax;
      }
      const t = $("cs-table").value.trim();
      if (t) {
        const tt = num("cs-table-t");
        if (tt !== undefined) within("Table temperature", tt, "temperature_c");
        const pts = parseTable(t, $("cs-table-col").value, tt !== undefined ? tt : P.dflt("temperature_c"));
        cs.osmotic_table = { unit: $("cs-table-unit").value, temperature_c: tt !== undefined ? tt : P.dflt("temperature_c"), points: pts };
      }
      const flags = P.hazardFlags().filter(f => $("cs-hz-" + f).checked);
      if (flags.length) cs.hazard_flags = flags;
      const hz = $("cs-hazards").value.split(/\n/).map(s => s.trim()).filter(Boolean);
      if (hz.length) cs.hazards = hz;
      const rg = $("cs-regen").value.split(",").map(s => s.trim()).filter(Boolean);
      if (rg.length) cs.regeneration = rg;
      cs.source = $("cs-source").value.trim() || "user-defined (no source given)";
      state.custom.push(prune(cs));
      state.customRemoved.delete(id.toLowerCase());
      P.saveCustom();
      $("custom-form").reset();
      P.fillPresets();
      P.writeForm(state.scenario);
      toggleCandidate(id, true);
      state.current = id;
      renderLibrary();
      showSolute(Object.assign({ family: "custom", custom: true }, cs));
    } catch (e) {
      err.textContent = e.message;
    }
  }
  function removeCustom(id) {
    // A blend that holds the solute would lose a part: say so instead.
    const users = (state.scenario.candidates || []).filter(c => P.isBlend(c) && c.blend.some(p => p.solute.toLowerCase() === id.toLowerCase()));
    if (users.length) {
      $("lib-detail").appendChild(h("p", { class: "field-error", role: "alert", text: id + " is a part of " + users.map(P.candId).join(", ") + "; remove that blend from the screen first." }));
      return;
    }
    state.custom = state.custom.filter(c => c.id !== id);
    state.customRemoved.add(id.toLowerCase());
    P.saveCustom();
    toggleCandidate(id, false);
    clear($("lib-detail")).appendChild(h("p", { class: "hint", text: id + " was removed from your library." }));
    renderLibrary();
  }

  // buildCustomHazards makes a check box per engine hazard flag in the
  // custom-solute form.
  function buildCustomHazards() {
    const box = clear($("cs-hz-boxes"));
    for (const f of P.hazardFlags()) box.appendChild(h("label", { class: "check" }, h("input", { type: "checkbox", id: "cs-hz-" + f, "data-flag": f }), P.hazardWords(f)));
  }

  Object.assign(P, { renderLibrary, toggleCandidate, bulkInclude, addCustom, buildCustomHazards, decimal, mosmToBar });
})();
