// Drawsift page, mixtures: the blend builder (blends join the scenario's
// candidates as {id, blend}), the list of the scenario's blends, and the
// solution panel — every property of one solute or blend at a chosen
// concentration from the engine's osmotic operation (ions, activity
// coefficients, saturation indices) with its π curve, a blend's beside its
// parts'.
//
// What the page signals on <body>: data-solution done- | error- |
// idle-<n>, n counting the panel's requests (tests wait for it).
"use strict";

(function () {
  const P = window.DrawsiftPage;
  const { $, state, S, C, h, clear, fmt, pUnit, pConv } = P;

  // At most this many parts (the engine's own bound on a blend).
  const MAX_PARTS = 12;
  // Starting parts of a new blend: NaCl with a little MgCl2, a blend
  // published draw studies try to cut reverse flux with (our own choice
  // of example).
  const START_PARTS = [{ solute: "NaCl", share: 9 }, { solute: "MgCl2", share: 1 }];

  // ---- which solutes a blend may hold --------------------------------------
  // A part is a single solute: not seawater or another mixture (the engine
  // refuses those), a library solute or one of the user's custom solutes.
  function partChoices() {
    const lib = state.library.filter(s => !(s.osmotic_model && ["mixture", "seawater"].includes(s.osmotic_model.kind)) && s.family !== "blend")
      .map(s => s.id);
    return { library: lib, custom: state.custom.map(c => c.id) };
  }
  function partSelect(value, idx) {
    const sel = h("select", { "aria-label": "Solute of part " + (idx + 1), "data-part": "solute" });
    const ch = partChoices();
    const group = (label, ids) => {
      if (!ids.length) return;
      const g = h("optgroup", { label: label });
      for (const id of ids) g.appendChild(h("option", { value: id, text: id }));
      sel.appendChild(g);
    };
    group("Library", ch.library);
    group("My custom solutes", ch.custom);
    sel.value = value;
    if (sel.value !== value && sel.options.length) sel.selectedIndex = 0;
    return sel;
  }

  // ---- the builder -------------------------------------------------------------
  function renderParts(parts) {
    const tb = clear($("blend-parts"));
    parts.forEach((p, i) => {
      const share = h("input", { type: "number", step: "any", min: "0", inputmode: "decimal", "aria-label": "Share of part " + (i + 1), "data-part": "share" });
      share.value = p.share === undefined ? "" : String(p.share);
      const rm = h("button", { type: "button", class: "small", text: "Remove", "aria-label": "Remove part " + (i + 1),
        on: { click: () => { const ps = readParts(); ps.splice(i, 1); renderParts(ps); } } });
      rm.disabled = parts.length <= 2;
      tb.appendChild(h("tr", {}, h("td", {}, partSelect(p.solute, i)), h("td", {}, share), h("td", {}, rm)));
    });
    $("blend-part-add").disabled = parts.length >= MAX_PARTS;
  }
  function readParts() {
    return Array.from($("blend-parts").rows).map(tr => {
      const raw = tr.querySelector('[data-part="share"]').value.trim();
      return { solute: tr.querySelector('[data-part="solute"]').value, share: raw === "" ? undefined : Number(raw) };
    });
  }
  // trim3 formats a ratio the way the engine names blends: 3 significant
  // figures, no trailing zeros.
  function trim3(v) { return String(Number(v.toPrecision(3))); }
  // blendFrom checks the builder's parts and returns the candidate; it
  // throws a message naming the part at fault.
  function blendFrom(parts, byMass, name) {
    if (parts.length < 2) throw new Error("A blend needs two or more parts.");
    if (parts.length > MAX_PARTS) throw new Error("A blend has at most " + MAX_PARTS + " parts.");
    const seen = new Set();
    parts.forEach((p, i) => {
      if (!p.solute) throw new Error("Part " + (i + 1) + ": choose a solute.");
      const k = p.solute.toLowerCase();
      if (seen.has(k)) throw new Error("Part " + (i + 1) + ": " + p.solute + " is listed twice; give each solute once.");
      seen.add(k);
      if (p.share === undefined || !isFinite(p.share) || !(p.share > 0)) throw new Error("Part " + (i + 1) + " (" + p.solute + "): the share must be a number above 0.");
    });
    const sum = parts.reduce((a, p) => a + p.share, 0), lo = Math.min(...parts.map(p => p.share));
    const key = byMass ? "mass_fraction" : "mole_fraction";
    const blend = parts.map(p => ({ solute: p.solute, [key]: p.share / sum }));
    const id = name || parts.map(p => p.solute).join("+") + " " + parts.map(p => trim3(p.share / lo)).join(":") + (byMass ? " by mass" : "");
    if (id.length > 60) throw new Error("Name: at most 60 characters (this one has " + id.length + "); give a shorter name.");
    if (P.solute(id)) throw new Error("Name: “" + id + "” is already a solute's name; give the blend another.");
    if ((state.scenario.candidates || []).some(c => P.candId(c).toLowerCase() === id.toLowerCase())) throw new Error("Name: “" + id + "” is already a candidate of this screen.");
    return { id: id, blend: blend };
  }
  async function addBlend(ev) {
    ev.preventDefault();
    const err = $("blend-error");
    err.textContent = "";
    let b;
    try {
      b = blendFrom(readParts(), document.querySelector('input[name="blend-by"]:checked').value === "mass", $("blend-id").value.trim());
    } catch (e) { err.textContent = e.message; return; }
    // The engine checks the parts before the blend joins the scenario
    // (a part it cannot mix is refused here, not in the ranking).
    if (!customParts(b).length) {
      const r = await state.engine.call("osmotic", { id: b.id, blend: b.blend, concentration: 0.1, unit: "mol/kg", temperature_c: temperature() });
      if (!r.ok) { const e = r.data.error || {}; err.textContent = "Not added: " + (e.field ? e.field + ": " : "") + e.message; return; }
    }
    const sc = state.scenario;
    sc.candidates = (sc.candidates || []).concat([b]);
    P.setScenario(P.readForm());
    $("blend-id").value = "";
    renderBlends();
    fillPicks();
    P.status("Added the blend “" + b.id + "” to the screen.");
    P.scheduleRun();
  }
  function customParts(b) { return b.blend.filter(p => state.custom.some(c => c.id.toLowerCase() === p.solute.toLowerCase())); }
  // blendText says what a blend holds: "0.9 NaCl + 0.1 MgCl2 by mole".
  function blendText(b) {
    const byMass = b.blend[0].mass_fraction !== undefined;
    return b.blend.map(p => trim3(byMass ? p.mass_fraction : p.mole_fraction) + " " + p.solute).join(" + ") + (byMass ? " by mass" : " by mole");
  }

  // ---- the scenario's blends ---------------------------------------------------
  function renderBlends() {
    const ul = clear($("blend-list"));
    const blends = (state.scenario && state.scenario.candidates || []).filter(P.isBlend);
    if (!blends.length) ul.appendChild(h("li", { class: "hint", text: "None yet: build one below." }));
    for (const b of blends) {
      ul.appendChild(h("li", { "data-blend": b.id }, h("strong", { text: b.id }), " — ", blendText(b), " ",
        h("button", { type: "button", class: "small", text: "Properties", "aria-label": "Show the properties of " + b.id, on: { click: () => showSolution(b.id) } }), " ",
        h("button", { type: "button", class: "small", text: "Remove", "aria-label": "Remove " + b.id + " from the screen", on: { click: () => removeBlend(b.id) } })));
    }
  }
  function removeBlend(id) {
    const sc = state.scenario;
    sc.candidates = (sc.candidates || []).filter(c => P.candId(c) !== id);
    P.setScenario(P.readForm());
    renderBlends();
    fillPicks();
    P.scheduleRun();
  }

  // ---- the solution panel ----------------------------------------------------------
  function temperature() {
    const t = state.scenario && state.scenario.temperature_c;
    return t !== undefined ? t : P.dflt("temperature_c");
  }
  function fillPicks() {
    const sel = $("sol-pick"), keep = sel.value || (state.prefs.solution || {}).pick;
    clear(sel);
    const blends = (state.scenario && state.scenario.candidates || []).filter(P.isBlend);
    if (blends.length) {
      const g = h("optgroup", { label: "Blends of this screen" });
      for (const b of blends) g.appendChild(h("option", { value: "blend:" + b.id, text: b.id }));
      sel.appendChild(g);
    }
    const g = h("optgroup", { label: "Library" });
    for (const s of state.library) g.appendChild(h("option", { value: "solute:" + s.id, text: s.id + " — " + s.name }));
    sel.appendChild(g);
    sel.value = keep || "solute:NaCl";
    if (!sel.value && sel.options.length) sel.selectedIndex = 0;
  }
  function buildSolutionPanel() {
    const u = clear($("sol-unit"));
    for (const x of P.defaults().concentration_units) u.appendChild(h("option", { value: x, text: x }));
    const pref = Object.assign({ conc: 1, unit: "mol/L" }, state.prefs.solution);
    fillPicks();
    $("sol-conc").value = String(pref.conc);
    $("sol-unit").value = pref.unit;
    for (const id of ["sol-pick", "sol-unit"]) $(id).addEventListener("change", solutionEdited);
    $("sol-conc").addEventListener("input", P.debounce(solutionEdited, 250));
    renderParts(START_PARTS);
    renderBlends();
    $("blend-form").addEventListener("submit", addBlend);
    $("blend-part-add").addEventListener("click", () => {
      const ps = readParts();
      const used = new Set(ps.map(p => p.solute));
      ps.push({ solute: partChoices().library.find(id => !used.has(id)) || "", share: 1 });
      renderParts(ps);
      $("blend-parts").querySelector("tr:last-child select").focus();
    });
  }
  function solutionEdited() {
    state.prefs.solution = { pick: $("sol-pick").value, conc: Number($("sol-conc").value), unit: $("sol-unit").value };
    S.save(S.KEY_PREFS, state.prefs);
    refreshSolution(true);
  }
  function showSolution(id) {
    fillPicks();
    $("sol-pick").value = "blend:" + id;
    P.selectTab("solution", true);
    solutionEdited();
  }

  // request is the osmotic request of the panel's choice at (conc, unit),
  // or null with a reason.
  function request(pick, conc, unit) {
    const base = { concentration: conc, unit: unit, temperature_c: temperature() };
    if (state.scenario.allow_extrapolation) base.allow_extrapolation = true;
    if (pick.startsWith("blend:")) {
      const b = P.candidate(pick.slice(6));
      if (!P.isBlend(b)) return { why: "That blend is no longer in the screen; choose another solution." };
      if (customParts(b).length) return { why: b.id + " holds custom solutes (" + customParts(b).map(p => p.solute).join(", ") + "): the ranking handles them, but this panel computes library solutes only." };
      return { body: Object.assign({ id: b.id, blend: b.blend }, base), blend: b };
    }
    return { body: Object.assign({ solute: pick.slice(7) }, base) };
  }

  let solSeq = 0, lastKey = "";
  function signal(kind) { document.body.dataset.solution = kind + "-" + solSeq; }
  // refreshSolution computes the panel when it is shown (or force) and
  // its request changed since the last time.
  async function refreshSolution(force) {
    if (!state.ready || $("panel-solution").hidden && !force) return;
    const pick = $("sol-pick").value, conc = Number($("sol-conc").value), unit = $("sol-unit").value;
    const rq = request(pick, conc, unit);
    const key = JSON.stringify(rq.body || rq.why);
    if (key === lastKey && !force) return;
    lastKey = key;
    const seq = ++solSeq;
    const errBox = $("sol-error");
    errBox.hidden = true;
    $("sol-note").textContent = "";
    if (rq.why) {
      $("sol-note").textContent = rq.why;
      $("sol-result").hidden = true;
      clear($("sol-plot"));
      signal("idle");
      return;
    }
    if (!(conc > 0) || !isFinite(conc)) {
      showSolError({ field: "concentration", message: "a concentration above 0 is required" });
      signal("error");
      return;
    }
    const r = await state.engine.call("osmotic", rq.body);
    if (seq !== solSeq) return;
    if (!r.ok) {
      showSolError(r.data.error || { message: "unknown error" });
      clear($("sol-plot"));
      signal("error");
      return;
    }
    renderSolution(r.data);
    await plotSolution(rq, seq);
    if (seq !== solSeq) return;
    signal("done");
  }
  function showSolError(e) {
    const box = $("sol-error");
    box.textContent = (e.field ? e.field + ": " : "") + e.message + (e.limit ? " (limit: " + e.limit + ")" : "");
    box.hidden = false;
    $("sol-result").hidden = true;
  }

  // satMark is the saturation state of an index in words and a symbol.
  function satMark(si) {
    if (si > 0) return { cls: "over", sym: "▲", text: "supersaturated" };
    if (si > -0.3) return { cls: "near", sym: "●", text: "near saturation" };
    return { cls: "under", sym: "", text: "undersaturated" };
  }
  // siCell is a table cell holding an index with its state in words for
  // screen readers and a symbol for the eye.
  function siCell(si) {
    if (si === undefined || !isFinite(si)) return h("td", { class: "sat-none", text: "—" });
    const m = satMark(si);
    return h("td", { class: "sat " + m.cls, "data-si": String(si), title: m.text }, fmt(si, 2),
      m.sym ? h("span", { "aria-hidden": "true", text: " " + m.sym }) : null, h("span", { class: "visually-hidden", text: " (" + m.text + ")" }));
  }

  function renderSolution(d) {
    $("sol-result").hidden = false;
    const dl = clear($("sol-props"));
    const add = (k, v, key) => { dl.appendChild(h("dt", { text: k })); dl.appendChild(h("dd", { "data-key": key || null, text: v })); };
    add("Solution", d.solute + " — " + d.name);
    add("Model", d.model, "model");
    add("Temperature", fmt(d.temperature_c) + " °C");
    add("Osmotic pressure", fmt(pConv(d.osmotic_pressure_bar)) + " " + pUnit() + " (van 't Hoff " + fmt(pConv(d.van_t_hoff_bar)) + " " + pUnit() + ")", "osmotic_pressure_bar");
    add("Osmotic coefficient φ", fmt(d.osmotic_coefficient, 4), "osmotic_coefficient");
    add("Water activity", fmt(d.water_activity, 4), "water_activity");
    add("Concentration", fmt(d.molality_mol_per_kg) + " mol/kg · " + fmt(d.molarity_mol_per_l) + " mol/L · " + fmt(d.mass_concentration_g_per_l) + " g/L · " + fmt(d.mass_fraction_wt_percent) + " wt%");
    add("Osmolality", fmt(d.osmolality_osmol_per_kg) + " osmol/kg");
    add("Ionic strength", fmt(d.ionic_strength_mol_per_kg) + " mol/kg", "ionic_strength_mol_per_kg");
    add("Density", fmt(d.density_kg_per_m3, 1) + " kg/m³", "density_kg_per_m3");
    add("Viscosity", fmt(d.viscosity_mpa_s) + " mPa·s", "viscosity_mpa_s");
    add("Diffusivity", fmt(d.diffusivity_m2_per_s * 1e9) + " × 10⁻⁹ m²/s");
    if (d.mean_activity_coefficient !== undefined) add("Mean activity coefficient γ±", fmt(d.mean_activity_coefficient, 4));
    if (d.ph !== undefined) add("pH (carbonate system)", fmt(d.ph, 2));
    add("Solubility", d.solubility_mol_per_kg !== undefined ? fmt(d.solubility_mol_per_kg) + " mol/kg" : "miscible");

    const comps = d.components || [];
    $("sol-parts-box").hidden = !comps.length;
    table($("sol-parts"), ["Part", "Mole fraction", "mol/kg", "mol/L", "g/L"],
      comps.map(c => [h("th", { scope: "row", text: c.solute }), h("td", { text: fmt(c.mole_fraction, 4) }), h("td", { text: fmt(c.molality_mol_per_kg) }),
        h("td", { text: fmt(c.molarity_mol_per_l) }), h("td", { text: fmt(c.mass_concentration_g_per_l) })]));
    table($("sol-ions"), ["Ion", "Charge", "Molality (mol/kg)", "Activity coefficient γ"],
      (d.ions || []).map(i => [h("th", { scope: "row", text: i.ion }), h("td", { text: (i.charge > 0 ? "+" : "") + i.charge }),
        h("td", { text: fmt(i.molality_mol_per_kg, 4) }), h("td", { text: i.activity_coefficient === null ? "— (no ion-level model)" : fmt(i.activity_coefficient, 4) })]),
      "No ions: a neutral solute.");
    const si = Object.keys(d.saturation_indices || {}).map(k => [k, d.saturation_indices[k]]).sort((a, b) => b[1] - a[1]);
    table($("sol-si"), ["Mineral", "SI (log units)", "State"],
      si.map(([k, v]) => { const m = satMark(v); return [h("th", { scope: "row", text: k }), siCell(v), h("td", { class: "sat " + m.cls, text: m.text })]; }),
      "No mineral has all its ions in this solution.");
    const wl = clear($("sol-warnings"));
    for (const w of d.warnings || []) wl.appendChild(h("li", { text: w }));
    if (!wl.children.length) wl.appendChild(h("li", { text: "None." }));
  }
  function table(t, heads, rows, empty) {
    const hd = clear(t.tHead), tb = clear(t.tBodies[0]);
    hd.appendChild(h("tr", {}, ...heads.map(x => h("th", { scope: "col", text: x }))));
    for (const r of rows) tb.appendChild(h("tr", {}, ...r));
    if (!rows.length && empty) tb.appendChild(h("tr", {}, h("td", { colspan: String(heads.length), text: empty })));
  }

  // plotSolution draws π against total concentration (mol/L): a solute's
  // real and van 't Hoff curves, or a blend's beside each of its parts
  // alone at the same total.
  async function plotSolution(rq, seq) {
    const box = clear($("sol-plot"));
    const cmax = Math.max(0.2, Math.min(10, Number(state.prefs.cmax) || 3));
    const grid = [];
    for (let i = 1; i <= 24; i++) grid.push(cmax * i / 24);
    const base = Object.assign({}, rq.body, { unit: "mol/L" });
    const curves = [{ name: rq.blend ? rq.blend.id : rq.body.solute, body: c => Object.assign({}, base, { concentration: c }) }];
    if (rq.blend) for (const p of rq.blend.blend) curves.push({ name: p.solute + " alone", body: c => ({ solute: p.solute, concentration: c, unit: "mol/L", temperature_c: base.temperature_c, allow_extrapolation: base.allow_extrapolation }) });
    const batch = [];
    for (const cv of curves) for (const c of grid) batch.push({ op: "osmotic", body: P.prune(cv.body(c)) });
    const br = await state.engine.call("batch", batch);
    if (seq !== solSeq || !br.ok) return;
    const series = [], legend = [];
    curves.forEach((cv, j) => {
      const colour = C.PALETTE[j % C.PALETTE.length], real = [], ideal = [];
      grid.forEach((c, i) => {
        const it = br.data[j * grid.length + i];
        if (it && it.ok) { real.push([c, pConv(it.result.osmotic_pressure_bar)]); ideal.push([c, pConv(it.result.van_t_hoff_bar)]); }
      });
      series.push({ name: cv.name, color: colour, dash: j ? "2 3" : null, points: [[0, 0]].concat(real) });
      if (j === 0) series.push({ name: cv.name + " (van 't Hoff)", color: colour, dash: "6 4", points: [[0, 0]].concat(ideal) });
      legend.push({ name: cv.name, color: colour });
    });
    legend.push({ name: rq.blend ? "solid: the blend; dashed: its van 't Hoff line; dotted: each part alone" : "solid: real; dashed: van 't Hoff", color: "#16202a" });
    const tC = base.temperature_c;
    box.appendChild(P.figure("solution-pi", C.line({ title: "Osmotic pressure vs total concentration, " + tC + " °C", xLabel: "total concentration (mol/L)", yLabel: "π (" + pUnit() + ")",
      series: series, legendItems: legend, desc: rq.blend ? "The blend's osmotic pressure beside each part's alone at the same total molarity." : "Real and van 't Hoff osmotic pressure." }),
      "Points past solubility or past the model's data are left out (the scenario's “keep candidates beyond their data” reaches them).", true));
  }

  Object.assign(P, { buildSolutionPanel, renderBlends, fillPicks, refreshSolution, siCell, satMark, blendText });
})();
