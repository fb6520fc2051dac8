// Drawsift page, files and links: the scenario's shape (checked field by
// field on every import, link and stored entry), scenario and custom-
// solute files, CSV and JSON exports of the results, share links, the
// demo, and the scenario the page opens with.
"use strict";

(function () {
  const P = window.DrawsiftPage;
  const { state, S } = P;

  // ---- the demo -----------------------------------------------------------
  // demo.json, our own scenario: a coastal teaching lab compares twelve
  // common draw solutes against seawater on a moderately permeable
  // thin-film composite membrane, at equal bulk osmotic pressure (60 bar, a
  // little over twice seawater's). The single-file bundle carries it
  // inline; the served page fetches it.
  async function loadDemo() {
    const inline = document.getElementById("ds-demo");
    if (inline) return JSON.parse(inline.textContent);
    const r = await fetch("demo.json");
    if (!r.ok) throw new Error("the demo scenario could not be loaded (" + r.status + ")");
    return r.json();
  }

  // ---- the scenario's shape (for imports, links and storage) ---------------
  const num_ = "number", str_ = "string", bool_ = "boolean";
  const SHAPE_CUSTOM = {
    object: {
      id: str_, name: str_, molar_mass_g_per_mol: num_, van_t_hoff_factor: num_, solubility_mol_per_kg: num_, miscible: bool_,
      diffusivity_m2_per_s: num_, price_usd_per_kg_min: num_, price_usd_per_kg_max: num_, hazard_flags: ["array", str_], source: str_,
      ions: ["array", { object: { symbol: str_, charge: "integer", count: "integer" }, required: ["symbol", "charge", "count"] }],
      // Page-side extras, kept with the solute and stripped before the engine sees it.
      hazards: ["array", str_], regeneration: ["array", str_],
      osmotic_table: { object: { unit: str_, temperature_c: num_, points: ["array", { object: { concentration: num_, osmotic_pressure_bar: num_ }, required: ["concentration", "osmotic_pressure_bar"] }] }, required: ["unit", "points"] },
    },
    required: ["id", "molar_mass_g_per_mol", "diffusivity_m2_per_s"], hint: true,
  };
  // A blend candidate: {id, blend: [{solute, mole_fraction | mass_fraction}]}.
  const SHAPE_BLEND = {
    object: { id: str_, blend: ["array", { object: { solute: str_, mole_fraction: num_, mass_fraction: num_ }, required: ["solute"], hint: true }] },
    required: ["id", "blend"], hint: true,
  };
  // oneOf accepts one of the names the engine lists under key of its defaults.
  const oneOf = key => v => P.defaults()[key].includes(v) ? "" : "must be " + P.defaults()[key].map(x => "\"" + x + "\"").join(" or ");
  const SHAPE_SCENARIO = {
    object: {
      feed: { object: { preset: str_, solute: str_, concentration: num_, unit: str_, ph: num_,
        ions: ["array", { object: { symbol: str_, charge: "integer", molar_mass_g_per_mol: num_, mg_per_l: num_ }, required: ["symbol", "charge", "molar_mass_g_per_mol", "mg_per_l"] }] }, hint: true },
      membrane: { object: { preset: str_, a_lmh_per_bar: num_, b_lmh: num_, b_nacl_lmh: num_, s_um: num_, reference_temperature_c: num_,
        a_activation_energy_kj_per_mol: num_, b_activation_energy_kj_per_mol: num_ }, hint: true },
      orientation: oneOf("orientations"),
      orientations: ["array", oneOf("orientations")],
      temperature_c: num_, k_draw_m_per_s: num_, k_feed_m_per_s: num_,
      channel: { object: { height_mm: num_, width_mm: num_, length_mm: num_, crossflow_velocity_m_per_s: num_, spacer: bool_, feed_crossflow_velocity_m_per_s: num_ }, hint: true },
      external_cp: bool_,
      candidates: ["array", { anyOf: [str_, SHAPE_BLEND] }],
      custom_solutes: ["array", SHAPE_CUSTOM],
      basis: { object: { kind: v => ["osmotic-pressure", "concentration", "water-flux"].includes(v) ? "" : "must be osmotic-pressure, concentration or water-flux", value: num_, unit: str_, multiple_of_feed: num_ }, required: ["kind"], hint: true },
      score_normalisation: oneOf("score_normalisations"),
      osmotic_model: v => P.defaults().osmotic_models.includes(v) || P.defaults().osmotic_model_aliases[v] ? "" : oneOf("osmotic_models")(v),
      weights: v => {
        if (v === null || typeof v !== "object" || Array.isArray(v)) return "must be an object of weights";
        for (const k in v) {
          if (!P.objectiveKeys().includes(k)) return "has an unknown objective \"" + k + "\"";
          if (typeof v[k] !== "number" || !(v[k] >= 0) || !isFinite(v[k])) return "." + k + " must be a non-negative number";
        }
        return "";
      },
      pareto_objectives: ["array", str_], exclude_hazards: ["array", str_], allow_extrapolation: bool_, regeneration_recovery: num_,
      uncertainty: { object: { samples: "integer", a_rel_sd: num_, b_rel_sd: num_, s_rel_sd: num_, osmotic_rel_sd: num_, diffusivity_rel_sd: num_, prices: bool_ }, hint: true },
      seed: "integer",
      sweep: "any",
    },
    hint: true,
  };

  // ---- files, links, storage -------------------------------------------------------
  function exportScenario() {
    S.download("drawsift-scenario.json", JSON.stringify(state.scenario, null, 2) + "\n");
  }
  function exportCustom() {
    S.download("drawsift-custom-solutes.json", JSON.stringify({ drawsift_custom_solutes: state.custom }, null, 2) + "\n");
  }
  // rankingCSV is a result as CSV text for a spreadsheet: a header block
  // (what, engine, cautions, score basis, the scenario as JSON), the one
  // table of candidates — ranked, then those left out — with the same
  // columns as `drawsift screen --format csv` (cmd/drawsift/screen_render.go),
  // then the trust codes, model choices, warnings and sources, each block
  // after a blank line. Numbers keep 6 significant digits (the CLI's %g),
  // so no binary noise (59.99999999993226) reaches the sheet. Text cells a
  // spreadsheet would run as a formula (=, +, -, @, tab or CR first) get a
  // leading quote (OWASP, "CSV Injection"): a custom solute named
  // "=HYPERLINK(…)" stays text. Numbers stay numbers.
  // csvCell quotes one CSV cell; a text starting with =, +, -, @, a tab
  // or a CR gets a leading ' (OWASP "CSV Injection"), a number is left alone.
  function csvCell(s) {
    s = String(s);
    if (/^[=+\-@\t\r]/.test(s) && !/^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/.test(s)) s = "'" + s;
    return /[",\n\r]/.test(s) ? '"' + s.replace(/"/g, '""') + '"' : s;
  }
  const n6 = v => v === undefined || v === null || !isFinite(v) ? "" : String(Number(Number(v).toPrecision(6)));
  const CSV_COLUMNS = [
    ["rank", c => String(c.rank)], ["solute", c => c.solute], ["score (0-1)", c => n6(c.score)], ["pareto_optimal", c => String(!!c.pareto_optimal)],
    ["orientation", c => c.orientation], ["concentration (mol/L)", c => n6(c.concentration_mol_per_l)], ["concentration (g/L)", c => n6(c.concentration_g_per_l)],
    ["molality (mol/kg)", c => n6(c.molality_mol_per_kg)], ["solubility (mol/kg)", c => n6(c.solubility_mol_per_kg)],
    ["solubility margin (fraction)", c => n6(c.solubility_margin_fraction)], ["osmotic pressure (bar)", c => n6(c.osmotic_pressure_bar)],
    ["van 't Hoff (bar)", c => n6(c.van_t_hoff_bar)], ["osmotic pressure per mol/L (bar L/mol)", c => n6(c.osmotic_pressure_per_mol_per_l_bar_l_per_mol)],
    ["van 't Hoff per mol/L (bar L/mol)", c => n6(c.van_t_hoff_per_mol_per_l_bar_l_per_mol)], ["osmotic pressure per g/L (bar L/g)", c => n6(c.osmotic_pressure_per_g_per_l_bar_l_per_g)],
    ["van 't Hoff per g/L (bar L/g)", c => n6(c.van_t_hoff_per_g_per_l_bar_l_per_g)], ["water flux (LMH)", c => n6(c.water_flux_lmh)],
    ["flux efficiency (fraction)", c => n6(c.flux_efficiency)], ["reverse solute flux (g/m2/h)", c => n6(c.reverse_solute_flux_gmh)],
    ["reverse solute flux (mmol/m2/h)", c => n6(c.reverse_solute_flux_mmol_per_m2_h)], ["specific reverse solute flux (g/L)", c => n6(c.specific_reverse_solute_flux_g_per_l)],
    ["replenishment cost (USD/m3)", c => n6(c.replenishment_cost_usd_per_m3)], ["replenishment cost min (USD/m3)", c => n6(c.replenishment_cost_min_usd_per_m3)],
    ["replenishment cost max (USD/m3)", c => n6(c.replenishment_cost_max_usd_per_m3)], ["viscosity (mPa s)", c => n6(c.viscosity_mpa_s)],
    ["min regeneration energy (kWh/m3)", c => n6(c.min_regeneration_energy_kwh_per_m3)], ["max saturation index (log10)", c => n6(c.max_saturation_index)],
    ["max saturation index mineral", c => { const s = (c.scaling || []).slice().sort((a, b) => b.saturation_index - a.saturation_index); return s.length ? s[0].mineral : ""; }],
    ["feed-face saturation indices (mineral=log10 SI)", c => (c.scaling || []).slice().sort((a, b) => b.saturation_index - a.saturation_index || (a.mineral < b.mineral ? -1 : 1)).map(s => s.mineral + "=" + s.saturation_index.toFixed(2)).join("; ")],
    ["B (LMH)", c => n6(c.b_lmh)], ["B estimated", c => String(!!c.b_estimated)], ["trust", c => (c.trust || []).map(m => m.code).join("; ")],
    ["hazard flags", c => (c.hazard_flags || []).join("; ")],
    ["P(first) (fraction)", c => c.robustness ? n6(c.robustness.probability_first) : ""], ["P(top 3) (fraction)", c => c.robustness ? n6(c.robustness.probability_top3) : ""],
    ["rank 5-95 % interval", c => c.robustness ? c.robustness.rank_p05 + "-" + c.robustness.rank_p95 : ""],
    // The plant-scale columns: empty unless the screen carried a system object or basis.
    ["system cost (USD/m3)", c => c.system ? n6(c.system.cost_usd_per_m3) : ""], ["system make-up (g/m3)", c => c.system ? n6(c.system.make_up_g_per_m3) : ""],
    ["system energy (kWh/m3)", c => c.system ? n6(c.system.energy_kwh_per_m3) : ""], ["system heat (kWh/m3)", c => c.system ? n6(c.system.heat_kwh_per_m3) : ""],
    ["system area (m2 per m3/day)", c => c.system ? n6(c.system.area_m2_per_m3_per_day) : ""],
    ["system regeneration route", c => c.system ? c.system.regeneration_route : (c.system_reason || "")], ["excluded reason", () => ""],
  ];
  function rankingCSV(res) {
    const q = csvCell;
    const lines = [];
    const row = cells => lines.push(cells.map(q).join(","));
    row(["Drawsift screening result", "exported " + new Date().toISOString().replace("T", " ").slice(0, 16) + " UTC"]);
    row(["engine_version", res.engine_version]);
    for (const c of res.cautions || []) row(["caution", c]);
    row(["score_normalisation", res.score_normalisation || "set"]);
    row(["score", P.scoreBasisText()]);
    row(["basis", state.basisText || (res.basis && res.basis.kind) || ""]);
    row(["scenario (JSON)", JSON.stringify(res.scenario)]);
    lines.push("");
    row(CSV_COLUMNS.map(c => c[0]));
    for (const c of res.candidates) row(CSV_COLUMNS.map(col => col[1](c)));
    for (const x of res.excluded) row(CSV_COLUMNS.map(col => col[0] === "solute" ? x.solute : col[0] === "excluded reason" ? x.reason + (x.detail ? ": " + x.detail : "") : ""));
    lines.push("");
    row(["trust code", "meaning"]);
    for (const m of P.trustLegend(res)) row([m.code, m.text]);
    lines.push("");
    for (const k of Object.keys(res.model_choices || {}).sort()) row(["model choice: " + k, res.model_choices[k]]);
    for (const k of Object.keys(res.feed_saturation_indices || {}).sort()) row(["feed (bulk) saturation index: " + k, n6(res.feed_saturation_indices[k])]);
    for (const w of res.warnings || []) row(["warning", w]);
    for (const c of res.candidates) for (const w of c.warnings || []) row(["warning: " + c.solute, w]);
    for (const s of res.sources || []) row(["source: " + s.field, s.reference]);
    // A byte-order mark: spreadsheets then read the file as UTF-8 (π, ³, °C).
    return "\ufeff" + lines.join("\r\n") + "\r\n";
  }
  function exportCSV() {
    const res = state.robust || state.result;
    if (!res) return;
    S.download("drawsift-ranking.csv", rankingCSV(res), "text/csv;charset=utf-8");
  }
  function exportJSON() {
    const res = state.robust || state.result;
    if (res) S.download("drawsift-result.json", JSON.stringify(res, null, 2) + "\n");
  }

  // validateScenario checks an imported or linked scenario; throws a
  // message naming the field.
  function validateScenario(o) {
    S.check(o, SHAPE_SCENARIO, "");
    return o;
  }

  // ---- nothing the user made is lost: backups and undo ------------------------
  // KEY_BACKUP holds the scenario a replace (the demo, an import, a share
  // link, an undo) pushed aside; the undo bar restores it in one step.
  const KEY_BACKUP = "drawsift.scenario.backup.v1";
  // offer shows the undo bar: what happened and one action.
  function offer(text, label, action) {
    P.$("undo-text").textContent = text;
    const b = P.$("btn-undo");
    b.textContent = label;
    b.onclick = () => { P.$("undo").hidden = true; action(); };
    P.$("undo").hidden = false;
  }
  function keepBackup(prev, what) {
    if (!prev) return;
    S.save(KEY_BACKUP, prev);
    offer(what + " replaced your scenario; the previous one is kept.", "Restore the previous scenario", restoreBackup);
  }
  async function restoreBackup() {
    const b = S.load(KEY_BACKUP);
    try {
      validateScenario(b);
      await applyScenario(b, "The restored scenario");
    } catch (e) {
      P.banner("The previous scenario could not be restored: " + e.message);
    }
  }
  // saveCustom stores the custom solutes, merged item by item with what
  // another tab may have stored meanwhile (its additions kept, this tab's
  // removals honoured).
  function saveCustom() {
    mergeCustom(S.load(S.KEY_CUSTOM));
    S.save(S.KEY_CUSTOM, state.custom);
  }
  function mergeCustom(stored) {
    if (!Array.isArray(stored)) return false;
    let added = false;
    for (const c of stored) {
      const k = String(c && c.id).toLowerCase();
      if (state.customRemoved.has(k) || state.custom.some(x => x.id.toLowerCase() === k)) continue;
      try { S.check(c, SHAPE_CUSTOM, "custom"); } catch (e) { continue; }
      state.custom.push(c);
      added = true;
    }
    return added;
  }
  // Another tab stored its custom solutes: take its additions.
  window.addEventListener("storage", ev => {
    if (ev.key !== S.KEY_CUSTOM || !state.ready) return;
    let v = null;
    try { v = JSON.parse(ev.newValue); } catch (e) { return; }
    if (mergeCustom(v)) { P.fillPresets(); P.renderLibrary(); }
  });

  // applyScenario replaces the scenario (and adds its custom solutes to
  // the user's library) once the engine accepts it; the one it replaces is
  // kept for undo.
  async function applyScenario(sc, origin) {
    const r = await state.engine.call("screen", P.engineScenario(sc, false));
    if (!r.ok) {
      const e = r.data.error || {};
      // A scenario whose candidates all fail a hard limit is still a scenario.
      if (!(e.field === "basis.value" && /no candidate/.test(e.message))) {
        throw new Error(origin + " was not loaded: " + (e.field ? e.field + ": " : "") + e.message);
      }
    }
    for (const c of sc.custom_solutes || []) {
      if (!state.custom.some(x => x.id.toLowerCase() === c.id.toLowerCase())) state.custom.push(c);
    }
    saveCustom();
    keepBackup(state.scenario, origin);
    P.setScenario(sc);
    P.fillPresets();
    P.writeForm(sc);
    P.renderLibrary();
    P.renderBlends();
    P.fillPicks();
    state.sort = null;
    await P.runScreen();
  }

  async function importFile(file) {
    P.banner("");
    try {
      const o = await S.readJSONFile(file);
      if (o && typeof o === "object" && !Array.isArray(o) && "drawsift_custom_solutes" in o) {
        S.check(o, { object: { drawsift_custom_solutes: ["array", SHAPE_CUSTOM] }, required: ["drawsift_custom_solutes"] }, "");
        const list = o.drawsift_custom_solutes;
        for (const c of list) if (state.library.some(s => s.id.toLowerCase() === c.id.toLowerCase())) throw new S.ShapeError("drawsift_custom_solutes", "“" + c.id + "” is already a library solute");
        let added = 0;
        for (const c of list) if (!state.custom.some(x => x.id.toLowerCase() === c.id.toLowerCase())) { state.custom.push(c); added++; }
        saveCustom();
        P.fillPresets(); P.writeForm(state.scenario); P.renderLibrary();
        P.banner("");
        P.$("engine-status").textContent = "Added " + added + " custom solute(s) from “" + file.name + "”.";
        return;
      }
      validateScenario(o);
      await applyScenario(o, "“" + file.name + "”");
      P.status("Loaded “" + file.name + "”.");
    } catch (e) {
      P.banner("Nothing was changed. " + (e instanceof S.ShapeError ? "“" + file.name + "” is not a Drawsift scenario: " : "") + e.message);
    }
  }

  async function copyShare() {
    const frag = await S.encodeShare(state.scenario);
    const url = location.href.replace(/#.*$/, "") + "#s=" + frag;
    history.replaceState(null, "", "#s=" + frag);
    // A link to a page opened from a file names that file on this
    // computer: it opens only where the same file sits at the same place.
    const local = location.protocol === "file:";
    if (local) P.banner("This page was opened from a file, so the link points to that file on this computer: it opens the scenario only where the same drawsift.html sits at the same place. To share, send the file with the link, or export the scenario file.");
    try {
      await navigator.clipboard.writeText(url);
      P.status("Share link copied (" + url.length + " characters" + (local ? "; works only beside this file" : "") + ").");
    } catch (e) {
      P.status("Share link is in the address bar" + (local ? " (works only beside this file)" : "") + ".");
    }
    document.body.dataset.share = local ? "file" : "web";
  }

  // ---- the scenario the page opens with: a share link's, else the stored
  // one, else the demo ------------------------------------------------------------------
  async function initialScenario() {
    const m = /^#s=(.+)$/.exec(location.hash);
    const saved = S.load(S.KEY_SCENARIO);
    if (m) {
      try {
        const sc = validateScenario(await S.decodeShare(m[1]));
        // The link's scenario is shown; the one saved here is kept.
        if (saved && JSON.stringify(saved) !== JSON.stringify(sc)) {
          S.save(KEY_BACKUP, saved);
          return { sc: sc, from: "link", note: ["The share link's scenario is shown; the one you had saved here is kept.", "Restore my saved scenario", restoreBackup] };
        }
        return { sc: sc, from: "link" };
      } catch (e) {
        P.banner("The share link could not be read (" + e.message + "); your last scenario is shown instead.");
      }
    }
    if (saved) {
      try {
        return { sc: validateScenario(saved), from: "storage" };
      } catch (e) {
        // Never silently replaced: kept aside, said, and downloadable.
        S.save(KEY_BACKUP, saved);
        return { sc: validateScenario(await loadDemo()), from: "demo",
          note: ["Your saved scenario could not be read (" + e.message + "); the demo is shown and the saved one is kept.",
            "Save the unreadable scenario as a file", () => S.download("drawsift-unreadable-scenario.json", JSON.stringify(saved, null, 2) + "\n")] };
      }
    }
    return { sc: validateScenario(await loadDemo()), from: "demo" };
  }

  Object.assign(P, { SHAPE_CUSTOM, saveCustom, offer, loadDemo, exportScenario, exportCustom, exportCSV, rankingCSV, exportJSON, csvCell, applyScenario, importFile, copyShare, initialScenario });
})();
