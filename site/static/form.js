// Drawsift page, the scenario form: scenario ↔ form fields, the form's
// menus, ranges and hints from the engine's defaults and limits, the
// checks made before the engine is asked, and field errors shown beside
// their fields.
"use strict";

(function () {
  const P = window.DrawsiftPage;
  const { $, state, h, clear, num, clone, pct, prune } = P;

  // The form's inputs that have a range in the engine's defaults listing:
  // input id → the listing's key, and a scale where the form shows the
  // field in other units (the fraction regeneration_recovery as %, a
  // custom diffusivity in 10⁻⁹ m²/s).
  const INPUT_LIMITS = {
    "temp": { key: "temperature_c" },
    "mem-a": { key: "membrane.a_lmh_per_bar" }, "mem-b": { key: "membrane.b_nacl_lmh" }, "mem-s": { key: "membrane.s_um" },
    "mem-bdraw": { key: "membrane.b_lmh" }, "mem-reft": { key: "membrane.reference_temperature_c" },
    "k-draw": { key: "k_draw_m_per_s" }, "k-feed": { key: "k_feed_m_per_s" },
    "ch-h": { key: "channel.height_mm" }, "ch-w": { key: "channel.width_mm" }, "ch-l": { key: "channel.length_mm" },
    "ch-u": { key: "channel.crossflow_velocity_m_per_s" },
    "feed-ph": { key: "feed.ph" },
    "regen-recovery": { key: "regeneration_recovery", scale: 100, unit: "%" },
    "unc-samples": { key: "uncertainty.samples" }, "seed": { key: "seed" },
    "unc-a": { key: "uncertainty.a_rel_sd" }, "unc-b": { key: "uncertainty.b_rel_sd" }, "unc-s": { key: "uncertainty.s_rel_sd" },
    "unc-pi": { key: "uncertainty.osmotic_rel_sd" }, "unc-d": { key: "uncertainty.diffusivity_rel_sd" },
    "sweep-n": { key: "sweep.points" },
    "cs-mm": { key: "custom_solutes[].molar_mass_g_per_mol" }, "cs-nu": { key: "custom_solutes[].van_t_hoff_factor" },
    "cs-d": { key: "custom_solutes[].diffusivity_m2_per_s", scale: 1e9, unit: "× 10⁻⁹ m²/s" },
    // A measured table's temperature has the scenario temperature's range.
    "cs-table-t": { key: "temperature_c" },
  };

  // setRange sets an input's min, max and step from the engine's range
  // for key (scaled). HTML's min and max are inclusive; an exclusive
  // bound is still the spinner's end, and the checks below (or the
  // engine) refuse the bound itself.
  function setRange(inp, key, scale) {
    const l = P.limit(key), s = scale || 1;
    const set = (attr, v) => { if (v === undefined) inp.removeAttribute(attr); else inp.setAttribute(attr, String(Number((v * s).toPrecision(12)))); };
    set("min", l.min);
    set("max", l.max);
    if (l.integer) inp.setAttribute("step", "1");
  }

  // applyLimits gives every limited input the engine's range and fills the
  // hints that quote a limit or a default (data-limit-of, data-default-of,
  // with data-scale and data-unit for a field shown in other units).
  function applyLimits() {
    for (const id in INPUT_LIMITS) setRange($(id), INPUT_LIMITS[id].key, INPUT_LIMITS[id].scale);
    for (const e of document.querySelectorAll("[data-limit-of]")) {
      e.textContent = P.limitText(e.dataset.limitOf, Number(e.dataset.scale) || 1, e.dataset.unit);
    }
    for (const e of document.querySelectorAll("[data-default-of]")) {
      e.textContent = String(Number((P.dflt(e.dataset.defaultOf) * (Number(e.dataset.scale) || 1)).toPrecision(12)));
    }
    for (const inp of document.querySelectorAll("#weights input[type=range]")) inp.min = String(P.limit("weights").min);
    $("unc-pi").placeholder = P.dflt("uncertainty.osmotic_rel_sd") + " (engine default; " +
      P.dflt("uncertainty.osmotic_rel_sd.van_t_hoff_only") + " for van 't Hoff-only solutes)";
    $("feed-ph").placeholder = String(P.dflt("feed.ph"));
    // A measured table without a temperature is taken at the default one.
    $("cs-table-t").placeholder = String(P.dflt("temperature_c"));
  }

  // basisLimit is the defaults key of the basis value's range for a kind
  // and unit, and the scale from that range's unit to the form's.
  function basisLimit(kind, unit) {
    if (unit === "xfeed") return { key: "basis.multiple_of_feed", scale: 1 };
    if (kind === "osmotic-pressure") return { key: "basis.osmotic_pressure_bar", scale: P.barTo(1, unit) };
    if (kind === "water-flux") return { key: "basis.water_flux_lmh", scale: 1 };
    return { key: "basis.value", scale: 1 };
  }
  function updateBasisLimits() {
    const b = basisLimit($("basis-kind").value, $("basis-unit").value);
    setRange($("basis-value"), b.key, b.scale);
  }

  // fillUnits fills the unit menus from the engine's lists.
  function fillUnits() {
    for (const id of ["feed-unit", "cs-table-unit"]) {
      const sel = clear($(id));
      for (const u of P.defaults().concentration_units) sel.appendChild(h("option", { value: u, text: u }));
    }
    const pu = clear($("u-pressure"));
    for (const u of P.pressureUnits()) pu.appendChild(h("option", { value: u, text: u }));
    pu.value = state.prefs.pressure;
    if (!pu.value) { pu.selectedIndex = 0; state.prefs.pressure = pu.value; }
  }

  // presetLabel puts what tells a membrane preset apart first: the usual
  // short names of the chemistry (TFC, CTA), the qualifier, then A and S,
  // so a narrow menu does not cut it off. The full name is the option's title.
  function presetLabel(m) {
    const short = m.name.replace(/thin-film composite/i, "TFC").replace(/cellulose triacetate/i, "CTA").replace(/\s*FO membrane\s*/i, " ").replace(/\s+/g, " ").trim();
    return short + " — A " + m.a_lmh_per_bar + ", S " + m.s_um + " µm";
  }

  function fillPresets() {
    const fp = clear($("feed-preset"));
    for (const f of state.feeds) fp.appendChild(h("option", { value: "preset:" + f.id, text: f.name, title: f.name }));
    fp.appendChild(h("option", { value: "custom", text: "Custom: a solute at a concentration, with ions" }));
    const mp = clear($("mem-preset"));
    for (const m of state.membranes) mp.appendChild(h("option", { value: m.id, text: presetLabel(m), title: m.name }));
    mp.appendChild(h("option", { value: "custom", text: "Custom A, B, S" }));
    const pick = clear($("feed-solute-pick"));
    for (const s of state.library) pick.appendChild(h("option", { value: s.id, text: s.id + " — " + s.name }));
    const fam = $("lib-family");
    const fams = Array.from(new Set(state.library.map(s => s.family).concat(state.custom.length ? ["custom"] : []))).sort();
    clear(fam).appendChild(h("option", { value: "", text: "all families" }));
    for (const f of fams) fam.appendChild(h("option", { value: f, text: f }));
  }

  function basisUnits(kind) {
    if (kind === "osmotic-pressure") return P.pressureUnits().map(u => [u, u]).concat([["xfeed", "× feed π"]]);
    if (kind === "concentration") return P.defaults().concentration_units.map(u => [u, u]);
    return [["LMH", "LMH"]];
  }
  function setBasisUnits(kind, unit) {
    const sel = clear($("basis-unit"));
    for (const [v, t] of basisUnits(kind)) sel.appendChild(h("option", { value: v, text: t }));
    if (unit) sel.value = unit;
    if (!sel.value) sel.selectedIndex = 0;
    updateBasisLimits();
  }

  // buildWeights makes one slider per objective, in the engine's order.
  function buildWeights() {
    const box = clear($("weights"));
    for (const k of P.objectiveKeys()) {
      const id = "w-" + k;
      const out = h("output", { for: id, id: id + "-out" });
      box.appendChild(h("div", { class: "w" },
        h("label", { for: id, title: P.objSense(k), text: P.objLabel(k) }),
        h("input", { type: "range", id: id, min: "0", max: "1", step: "0.05", "data-key": k, "aria-describedby": id + "-out" }),
        out));
    }
  }

  // buildScoreNorm lists the engine's score normalisations, in words.
  function buildScoreNorm() {
    const D = P.defaults(), sel = clear($("score-norm"));
    const words = { set: "relative to the screened set (min–max)", reference: "against reference values (" + D.score_reference_solute + " at the same basis)" };
    for (const n of D.score_normalisations) sel.appendChild(h("option", { value: n, text: words[n] || n }));
    $("score-norm-hint").textContent = "Relative to the set, the best candidate on a metric gets 1 and the worst 0, so adding or removing a candidate can reorder the others. " +
      "Against reference values, each metric is compared with " + D.score_reference_solute + " brought to the same basis (it scores 0.5; twice as good 0.67), whatever else is screened.";
  }

  // buildRules makes the hazard and Pareto checkboxes: one per flag and
  // objective the engine lists.
  function buildRules() {
    const hz = clear($("hazard-boxes"));
    for (const flag of P.hazardFlags()) {
      hz.appendChild(h("label", { class: "check" }, h("input", { type: "checkbox", id: "hz-" + flag, "data-flag": flag }), P.hazardWords(flag)));
    }
    const po = clear($("pareto-boxes"));
    for (const k of P.objectiveKeys()) {
      po.appendChild(h("label", { class: "check" }, h("input", { type: "checkbox", id: "po-" + k, "data-key": k }), P.objLabel(k)));
    }
  }

  // buildForm makes the parts of the form that follow the engine's
  // defaults; called once they are read.
  function buildForm() {
    fillUnits();
    buildWeights();
    buildScoreNorm();
    buildRules();
    P.buildCustomHazards();
    applyLimits();
  }

  function kMode() { return document.querySelector('input[name="k-mode"]:checked').value; }
  function updateKUI() { $("k-given-box").hidden = kMode() !== "given"; }

  // basisDefault is the engine's basis for a scenario that names none:
  // basis_with_feed for a feed with osmotic pressure, else
  // basis_without_feed (both from the engine's defaults).
  function basisDefault(feed) {
    const pre = feed.preset && state.feeds.find(f => f.id === feed.preset);
    const hasPi = feed.preset ? !!pre && pre.osmotic.method !== "none" : feed.concentration > 0;
    return Object.assign({}, P.defaults()[hasPi ? "basis_with_feed" : "basis_without_feed"]);
  }

  function writeForm(sc) {
    const D = P.defaults();
    const feed = sc.feed || { preset: D.feed_preset };
    $("feed-preset").value = feed.preset ? "preset:" + feed.preset : "custom";
    if (!$("feed-preset").value) $("feed-preset").selectedIndex = 0;
    const pre = feed.preset && state.feeds.find(f => f.id === feed.preset);
    if (pre) {
      $("feed-conc").value = feed.concentration !== undefined ? feed.concentration : (pre.osmotic.concentration || "");
      // A preset without its own unit keeps the menu's first unit.
      $("feed-unit").value = pre.osmotic.unit || D.concentration_units[0];
    } else if (!feed.preset) {
      $("feed-conc").value = feed.concentration !== undefined ? feed.concentration : "";
      // The engine requires a custom feed's unit (it has no default); the
      // form starts from g/L, the unit of a water analysis.
      $("feed-unit").value = feed.unit || "g/L";
    }
    $("feed-solute-pick").value = feed.solute || "NaCl";
    $("feed-ph").value = !feed.preset && feed.ph !== undefined ? feed.ph : "";
    renderIons(feed.ions || []);
    updateFeedUI();

    const mem = sc.membrane || { preset: D.membrane_preset };
    // In a screen, b_lmh is the NaCl B unless b_nacl_lmh is also given;
    // then b_lmh is the B of every draw solute (engine/api, ScreenRequest).
    const naclB = mem.b_nacl_lmh !== undefined ? mem.b_nacl_lmh : mem.b_lmh;
    const drawB = mem.b_nacl_lmh !== undefined ? mem.b_lmh : undefined;
    const presetRec = mem.preset && state.membranes.find(m => m.id === mem.preset);
    let mp = presetRec;
    // A preset with its numbers changed (in a file) is shown as custom so
    // the changes are kept.
    if (mp && ((mem.a_lmh_per_bar !== undefined && mem.a_lmh_per_bar !== mp.a_lmh_per_bar) || (mem.s_um !== undefined && mem.s_um !== mp.s_um) ||
      (naclB !== undefined && naclB !== mp.b_nacl_lmh))) {
      $("mem-a").value = mem.a_lmh_per_bar !== undefined ? mem.a_lmh_per_bar : mp.a_lmh_per_bar;
      $("mem-b").value = naclB !== undefined ? naclB : mp.b_nacl_lmh;
      $("mem-s").value = mem.s_um !== undefined ? mem.s_um : mp.s_um;
      mp = null;
    } else {
      $("mem-a").value = mem.a_lmh_per_bar !== undefined ? mem.a_lmh_per_bar : mp ? mp.a_lmh_per_bar : "";
      $("mem-b").value = naclB !== undefined ? naclB : mp ? mp.b_nacl_lmh : "";
      $("mem-s").value = mem.s_um !== undefined ? mem.s_um : mp ? mp.s_um : "";
    }
    $("mem-preset").value = mp ? mp.id : "custom";
    $("mem-bdraw").value = drawB !== undefined ? drawB : "";
    $("mem-reft").value = mem.reference_temperature_c !== undefined ? mem.reference_temperature_c : "";
    refTPlaceholder();
    $("mem-desc").textContent = mp ? mp.description + " " + (mp.test_conditions || "") : "Your own membrane: A, B (for NaCl) and S as measured in an FO test.";

    const o = sc.orientation || D.orientation;
    for (const r of document.querySelectorAll('input[name="orientation"]')) r.checked = r.value === o;
    $("both-orient").checked = !!(sc.orientations && sc.orientations.length);
    $("temp").value = sc.temperature_c !== undefined ? sc.temperature_c : P.dflt("temperature_c");
    $("osm-model").value = sc.osmotic_model || D.osmotic_model;
    $("score-norm").value = D.score_normalisations.includes(sc.score_normalisation) ? sc.score_normalisation : D.score_normalisations[0];
    const ch = Object.assign({}, D.channel, sc.channel || {});
    $("ch-h").value = ch.height_mm; $("ch-w").value = ch.width_mm; $("ch-l").value = ch.length_mm;
    $("ch-u").value = ch.crossflow_velocity_m_per_s; $("ch-spacer").checked = !!ch.spacer;
    $("ext-cp").checked = sc.external_cp !== false;
    const kGiven = sc.k_draw_m_per_s !== undefined || sc.k_feed_m_per_s !== undefined;
    $("k-mode-given").checked = kGiven;
    $("k-mode-channel").checked = !kGiven;
    $("k-draw").value = sc.k_draw_m_per_s !== undefined ? sc.k_draw_m_per_s : "";
    $("k-feed").value = sc.k_feed_m_per_s !== undefined ? sc.k_feed_m_per_s : "";
    if (kGiven) $("channel-box").open = true;
    updateKUI();
    const hz = (sc.exclude_hazards || []).map(x => String(x).toLowerCase());
    for (const flag of P.hazardFlags()) $("hz-" + flag).checked = hz.includes(flag);
    $("allow-extrap").checked = !!sc.allow_extrapolation;
    $("regen-recovery").value = pct(sc.regeneration_recovery !== undefined ? sc.regeneration_recovery : P.dflt("regeneration_recovery"));
    const po = (sc.pareto_objectives || D.pareto_objectives).map(x => String(x).trim().toLowerCase());
    for (const k of P.objectiveKeys()) $("po-" + k).checked = po.includes(k);

    const b = sc.basis || basisDefault(feed);
    $("basis-kind").value = b.kind;
    if (b.multiple_of_feed !== undefined) { setBasisUnits(b.kind, "xfeed"); $("basis-value").value = b.multiple_of_feed; }
    else { setBasisUnits(b.kind, b.unit || basisUnits(b.kind)[0][0]); $("basis-value").value = b.value !== undefined ? b.value : ""; }

    const w = sc.weights || D.weights;
    for (const k of P.objectiveKeys()) {
      const inp = $("w-" + k);
      inp.value = w[k] || 0;
      $("w-" + k + "-out").textContent = Number(inp.value).toFixed(2);
    }
    const u = sc.uncertainty || {};
    const memRec = presetRec || {};
    // The spreads of A, B and S: the scenario's, else the preset
    // membrane's own, else the engine's defaults for a custom membrane.
    const spread = (k, key) => u[k] !== undefined ? u[k] : memRec[k] !== undefined ? memRec[k] : P.dflt(key);
    $("unc-samples").value = u.samples !== undefined ? u.samples : P.dflt("uncertainty.samples");
    $("unc-a").value = spread("a_rel_sd", "uncertainty.a_rel_sd");
    $("unc-b").value = spread("b_rel_sd", "uncertainty.b_rel_sd");
    $("unc-s").value = spread("s_rel_sd", "uncertainty.s_rel_sd");
    $("unc-pi").value = u.osmotic_rel_sd !== undefined ? u.osmotic_rel_sd : "";
    $("unc-d").value = u.diffusivity_rel_sd !== undefined ? u.diffusivity_rel_sd : P.dflt("uncertainty.diffusivity_rel_sd");
    $("unc-prices").checked = u.prices !== false;
    $("seed").value = sc.seed !== undefined ? sc.seed : P.dflt("seed");
  }

  function updateFeedUI() {
    const v = $("feed-preset").value;
    const custom = v === "custom";
    const pre = !custom && state.feeds.find(f => "preset:" + f.id === v);
    $("feed-ions-box").hidden = !custom;
    $("feed-solute-box").hidden = !(custom || (pre && pre.osmotic.method === "solute"));
    $("feed-unit").disabled = !custom;
    $("feed-solute-row").hidden = !custom;
    $("feed-desc").textContent = pre ? pre.description : "A library solute sets the feed's osmotic pressure; the ions, if any, feed the scaling check.";
  }

  // The inputs of a custom feed ion with a range in the engine's listing.
  const ION_LIMITS = { mg_per_l: "feed.ions[].mg_per_l", molar_mass_g_per_mol: "feed.ions[].molar_mass_g_per_mol" };

  function renderIons(ions) {
    const tb = clear($("feed-ions"));
    ions.forEach((ion, i) => {
      const tr = h("tr", {});
      const cell = (key, type, label) => {
        const inp = h("input", { type: type, value: ion[key] !== undefined ? ion[key] : "", "data-ion": String(i), "data-key": key, "aria-label": label + " of ion " + (i + 1), step: "any" });
        if (ION_LIMITS[key]) setRange(inp, ION_LIMITS[key]);
        return h("td", {}, inp);
      };
      tr.appendChild(cell("symbol", "text", "Symbol"));
      tr.appendChild(cell("charge", "number", "Charge"));
      tr.appendChild(cell("molar_mass_g_per_mol", "number", "Molar mass"));
      tr.appendChild(cell("mg_per_l", "number", "Concentration in mg/L"));
      tr.appendChild(h("td", {}, h("button", { type: "button", class: "small", "aria-label": "Remove ion " + (i + 1), text: "×",
        on: { click: () => { const sc = readForm(); sc.feed.ions.splice(i, 1); renderIons(sc.feed.ions); P.changed(); } } })));
      tb.appendChild(tr);
    });
  }

  function readIons() {
    const rows = {};
    for (const inp of $("feed-ions").querySelectorAll("input")) {
      const i = inp.dataset.ion, k = inp.dataset.key;
      rows[i] = rows[i] || {};
      rows[i][k] = k === "symbol" ? inp.value.trim() : inp.value.trim() === "" ? undefined : Number(inp.value);
    }
    return Object.keys(rows).sort((a, b) => a - b).map(k => rows[k]);
  }

  // readForm returns the scenario the form shows (the request's shape).
  // Every value the form shows is sent, at its default or not, so that a
  // saved scenario reproduces its run under a later engine whose defaults
  // have moved; only the off switches are left out while off (no hazard
  // ticked, extrapolation not allowed), as the contract reads their
  // absence.
  function readForm() {
    const sc = {};
    const fv = $("feed-preset").value;
    if (fv === "custom") {
      sc.feed = { solute: $("feed-solute-pick").value, concentration: num("feed-conc"), unit: $("feed-unit").value };
      const ions = readIons();
      if (ions.length) sc.feed.ions = ions;
      const ph = num("feed-ph");
      if (ph !== undefined) sc.feed.ph = ph;
    } else {
      const id = fv.replace(/^preset:/, "");
      sc.feed = { preset: id };
      const pre = state.feeds.find(f => f.id === id);
      const c = num("feed-conc");
      if (pre && pre.osmotic.method === "solute" && c !== undefined && c !== pre.osmotic.concentration) sc.feed.concentration = c;
    }
    const mp = $("mem-preset").value;
    const drawB = num("mem-bdraw");
    if (mp === "custom") {
      sc.membrane = drawB === undefined ? { a_lmh_per_bar: num("mem-a"), b_lmh: num("mem-b"), s_um: num("mem-s") }
        : { a_lmh_per_bar: num("mem-a"), b_nacl_lmh: num("mem-b"), b_lmh: drawB, s_um: num("mem-s") };
    } else {
      sc.membrane = { preset: mp };
      // b_lmh alone would be read as the NaCl B: state the preset's NaCl B
      // beside it so that b_lmh is the draw solutes' B.
      const m = state.membranes.find(x => x.id === mp);
      if (drawB !== undefined) { sc.membrane.b_nacl_lmh = m ? m.b_nacl_lmh : undefined; sc.membrane.b_lmh = drawB; }
    }
    // The temperature of the membrane's values, and activation energies set
    // in a file (the form does not show them; kept as they are).
    const refT = num("mem-reft");
    if (refT !== undefined) sc.membrane.reference_temperature_c = refT;
    const pm = (state.scenario || {}).membrane || {};
    for (const k of ["a_activation_energy_kj_per_mol", "b_activation_energy_kj_per_mol"]) if (pm[k] !== undefined) sc.membrane[k] = pm[k];
    const o = document.querySelector('input[name="orientation"]:checked').value;
    sc.orientation = o;
    if ($("both-orient").checked) sc.orientations = P.defaults().orientations.filter(x => x !== o);
    sc.temperature_c = num("temp");
    sc.channel = { height_mm: num("ch-h"), width_mm: num("ch-w"), length_mm: num("ch-l"),
      crossflow_velocity_m_per_s: num("ch-u"), spacer: $("ch-spacer").checked };
    sc.external_cp = $("ext-cp").checked;
    if (kMode() === "given") { sc.k_draw_m_per_s = num("k-draw"); sc.k_feed_m_per_s = num("k-feed"); }
    const prev = state.scenario || {};
    sc.candidates = prev.candidates ? prev.candidates.slice() : undefined;
    const kind = $("basis-kind").value, unit = $("basis-unit").value;
    sc.basis = unit === "xfeed" ? { kind: kind, multiple_of_feed: num("basis-value") } : { kind: kind, value: num("basis-value"), unit: unit };
    sc.osmotic_model = $("osm-model").value;
    sc.score_normalisation = $("score-norm").value;
    sc.weights = {};
    for (const k of P.objectiveKeys()) sc.weights[k] = Number($("w-" + k).value);
    sc.uncertainty = { samples: num("unc-samples"), a_rel_sd: num("unc-a"), b_rel_sd: num("unc-b"), s_rel_sd: num("unc-s"),
      diffusivity_rel_sd: num("unc-d"), prices: $("unc-prices").checked };
    const pi = num("unc-pi");
    if (pi !== undefined) sc.uncertainty.osmotic_rel_sd = pi;
    sc.seed = num("seed");
    const hz = P.hazardFlags().filter(f => $("hz-" + f).checked);
    if (hz.length) sc.exclude_hazards = hz;
    if ($("allow-extrap").checked) sc.allow_extrapolation = true;
    const rec = num("regen-recovery");
    sc.regeneration_recovery = rec === undefined ? undefined : rec / 100;
    sc.pareto_objectives = P.objectiveKeys().filter(k => $("po-" + k).checked);
    // A field the form does not show (set in an imported or linked file)
    // is kept as it is.
    if (prev.channel && prev.channel.feed_crossflow_velocity_m_per_s !== undefined) sc.channel.feed_crossflow_velocity_m_per_s = prev.channel.feed_crossflow_velocity_m_per_s;
    // The custom solutes the candidates use, alone or as parts of blends.
    const used = new Set((sc.candidates || []).flatMap(P.candSolutes).map(id => id.toLowerCase()));
    const customs = state.custom.filter(c => used.has(c.id.toLowerCase()));
    if (customs.length) sc.custom_solutes = clone(customs);
    return prune(sc);
  }

  // engineScenario returns the request the engine sees: page-side extras
  // stripped from custom solutes; no robustness unless asked.
  function engineScenario(sc, withUncertainty) {
    const r = clone(sc);
    if (!withUncertainty) delete r.uncertainty;
    delete r.sweep;
    if (r.custom_solutes) {
      r.custom_solutes = r.custom_solutes.map(c => {
        const o = Object.assign({}, c);
        // The measured table travels as the contract's pi_table.
        if (o.osmotic_table) o.pi_table = o.osmotic_table;
        delete o.hazards; delete o.regeneration; delete o.osmotic_table;
        return o;
      });
      if (!r.custom_solutes.length) delete r.custom_solutes;
    }
    return r;
  }

  // refTPlaceholder says what a blank reference temperature means for
  // the chosen membrane.
  function refTPlaceholder() {
    const m = state.membranes.find(x => x.id === $("mem-preset").value);
    $("mem-reft").placeholder = m ? "preset: " + m.reference_temperature_c + " °C" : "the operating temperature";
  }

  // checkForm finds what the engine cannot check for the page before it
  // is asked — empty required numbers, the fields the form shows in its
  // own units or names (the recovery in %, the draw solutes' B, k by
  // side), and the robustness inputs that the live ranking does not send —
  // each against the engine's own limit. It returns the problems found,
  // the first one first.
  function checkForm(sc) {
    const errs = [];
    const custom = sc.membrane && !sc.membrane.preset;
    const drawB = $("mem-bdraw").value.trim() !== "";
    const need = [["temp", "temperature_c", "the temperature is required"], ["basis-value", "basis.value", "a target value is required"]];
    if (custom) need.push(["mem-a", "membrane.a_lmh_per_bar", "A is required"], ["mem-b", drawB ? "membrane.b_nacl_lmh" : "membrane.b_lmh", "B is required"], ["mem-s", "membrane.s_um", "S is required"]);
    if (sc.feed && sc.feed.solute !== undefined) need.push(["feed-conc", "feed.concentration", "a concentration is required"]);
    for (const [id, field, msg] of need) if ($(id).value.trim() === "" || !isFinite(Number($(id).value))) { errs.push({ field: field, message: msg }); break; }
    // check(id, field, what, blankOK): the input's number within the
    // engine's range for its key (INPUT_LIMITS), in the form's units. The
    // limit quoted is the engine's text; for a scaled field, the scaled
    // bounds first.
    const check = (id, field, what, blankOK) => {
      const raw = $(id).value.trim();
      if (raw === "" && blankOK) return;
      const { key, scale, unit } = INPUT_LIMITS[id];
      const v = Number(raw);
      const text = P.limitText(key, scale, unit);
      const lim = scale ? text + " (as the engine takes it: " + P.limitText(key) + ")" : text;
      if (raw === "" || !isFinite(v)) errs.push({ field: field, message: what + " is required", limit: lim });
      else if (!P.inLimit(key, v, scale)) errs.push({ field: field, message: what + " " + v + (unit ? " " + unit : "") + " is outside " + text, limit: lim });
    };
    check("seed", "seed", "the seed", true);
    check("unc-samples", "uncertainty.samples", "the number of samples", true);
    if (sc.feed && !sc.feed.preset) check("feed-ph", "feed.ph", "the pH", true);
    if (drawB) check("mem-bdraw", "membrane.b_draw", "B of the draw solutes", true);
    check("mem-reft", "membrane.reference_temperature_c", "the membrane's reference temperature", true);
    if (kMode() === "given") {
      check("k-draw", "k_draw_m_per_s", "k on the draw side", true);
      check("k-feed", "k_feed_m_per_s", "k on the feed side", true);
      if ($("k-draw").value.trim() === "" && $("k-feed").value.trim() === "") {
        errs.push({ field: "k_draw_m_per_s", message: "give k for at least one side, or choose “from the channel”" });
      }
    }
    check("regen-recovery", "regeneration_recovery", "the water recovered", false);
    check("unc-a", "uncertainty.a_rel_sd", "the relative SD of A", true);
    check("unc-b", "uncertainty.b_rel_sd", "the relative SD of B", true);
    check("unc-s", "uncertainty.s_rel_sd", "the relative SD of S", true);
    check("unc-pi", "uncertainty.osmotic_rel_sd", "the relative SD of π", true);
    check("unc-d", "uncertainty.diffusivity_rel_sd", "the relative SD of the diffusivity", true);
    const po = P.objectiveKeys().filter(k => $("po-" + k).checked).length;
    if (po < 2) errs.push({ field: "pareto_objectives", message: "tick at least two objectives for the Pareto front (" + po + " ticked)", limit: "two or more" });
    return errs;
  }

  // ---- field errors ---------------------------------------------------------------
  const FIELD_INPUT = {
    "feed.ph": "feed-ph", "membrane.b_nacl_lmh": "mem-b", "membrane.b_draw": "mem-bdraw", "k_draw_m_per_s": "k-draw", "k_feed_m_per_s": "k-feed",
    "regeneration_recovery": "regen-recovery", "allow_extrapolation": "allow-extrap", "exclude_hazards": "hazards", "pareto_objectives": "pareto",
    "temperature_c": "temp", "membrane.a_lmh_per_bar": "mem-a", "membrane.b_lmh": "mem-b", "membrane.s_um": "mem-s",
    "membrane.preset": "mem-preset", "feed.preset": "feed-preset", "feed.concentration": "feed-conc", "feed.unit": "feed-unit",
    "feed.solute": "feed-solute-pick", "basis.value": "basis-value", "basis.multiple_of_feed": "basis-value", "basis.unit": "basis-unit",
    "basis.kind": "basis-kind", "channel.height_mm": "ch-h", "channel.width_mm": "ch-w", "channel.length_mm": "ch-l",
    "channel.crossflow_velocity_m_per_s": "ch-u", "uncertainty.samples": "unc-samples", "uncertainty.a_rel_sd": "unc-a",
    "uncertainty.b_rel_sd": "unc-b", "uncertainty.s_rel_sd": "unc-s", "uncertainty.osmotic_rel_sd": "unc-pi",
    "uncertainty.diffusivity_rel_sd": "unc-d", "seed": "seed", "osmotic_model": "osm-model", "score_normalisation": "score-norm",
  };
  function groupOf(field) {
    const f = field || "";
    if (f.startsWith("feed")) return "feed";
    if (f.startsWith("membrane")) return "membrane";
    if (/^(temperature_c|orientation|channel|external_cp|k_|osmotic_model)/.test(f)) return "operation";
    if (f.startsWith("basis")) return "basis";
    if (f.startsWith("weights") || f.startsWith("score_")) return "weights";
    if (/^(uncertainty|seed)/.test(f)) return "uncertainty";
    return "";
  }
  function clearErrors() {
    for (const e of document.querySelectorAll("#scenario-form .field-error")) e.textContent = "";
    for (const e of document.querySelectorAll('#scenario-form [aria-invalid="true"]')) e.removeAttribute("aria-invalid");
    $("run-error").hidden = true;
  }
  // fieldSlot is the data-field name of the message slot beside a field
  // that has its own (the others use their fieldset's slot).
  function fieldSlot(field) {
    let f = field.replace(/\[\d+\].*$/, "");
    // With a draw-solute B given, the engine's b_lmh is that field.
    if (f === "membrane.b_lmh" && $("mem-bdraw").value.trim() !== "") f = "membrane.b_draw";
    if (/^k_(draw|feed)_m_per_s$/.test(f)) f = "k";
    return f;
  }
  function showError(err) {
    const field = err.field || "";
    // The page's own name for the draw-solute B is the contract's b_lmh.
    const own = fieldSlot(field);
    const key = own === "membrane.b_draw" ? own : field;
    const inp = $(FIELD_INPUT[key] || FIELD_INPUT[key.replace(/\[\d+\].*$/, "")] || "");
    // The field as the form labels it, with the contract's name beside it;
    // the limit only where the message does not already give it.
    const contract = field === "membrane.b_draw" ? "membrane.b_lmh" : field;
    const label = inp && document.querySelector('label[for="' + inp.id + '"]');
    const name = label ? label.textContent.trim() + " (" + contract + ")" : contract;
    let text = name + (name ? ": " : "") + err.message;
    const lim = err.limit === undefined || err.limit === null ? "" : Array.isArray(err.limit) ? err.limit.join(", ") : String(err.limit);
    if (lim && !err.message.includes(lim)) text += " (limit: " + lim + ")";
    const g = groupOf(field);
    const slot = (own && document.querySelector('#scenario-form .field-error[data-field="' + own + '"]')) ||
      (g && document.querySelector('#scenario-form .field-error[data-for="' + g + '"]'));
    if (slot) {
      slot.textContent = text;
      for (let d = slot.closest("details"); d; d = d.parentElement && d.parentElement.closest("details")) d.open = true;
    }
    if (inp) inp.setAttribute("aria-invalid", "true");
    $("run-error").textContent = "The screen did not run — " + text + (slot ? " (see the scenario form)" : "");
    $("run-error").hidden = false;
  }

  // showErrors shows each problem beside its field; the summary above the
  // results names the first.
  function showErrors(list) { for (let i = list.length - 1; i >= 0; i--) showError(list[i]); }

  Object.assign(P, { refTPlaceholder,
    setRange, buildForm, basisDefault, updateBasisLimits, fillPresets, setBasisUnits, writeForm, updateFeedUI, updateKUI, renderIons, readIons, readForm,
    engineScenario, checkForm, clearErrors, showError, showErrors,
  });
})();
