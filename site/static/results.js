// Drawsift page, the results: the ranked table (sortable, with each
// metric's share of the score), the solutes left out, the warnings, and
// the robustness run with its table.
"use strict";

(function () {
  const P = window.DrawsiftPage;
  const { $, state, h, clear, fmt, pUnit, pConv, fConv, fLabel, sfLabel, sfValue } = P;

  // ---- trust marks -------------------------------------------------------------
  // The engine lists, per ranked row, what makes it less certain (trust:
  // [{code, text}]); the page shows one symbol per code, its words as the
  // text equivalent, and a legend of the codes present beside the table.
  // Symbols are display only; an unknown code shows "?" with its text.
  const TRUST_SYMBOLS = {
    "van-t-hoff": "ν", "ideal-model": "ι", extrapolated: "↗", bridged: "≈", "temperature-25c": "θ", "b-estimated": "β",
    blend: "⊕", custom: "✎", solubility: "◐", crossing: "⇄", "no-price": "¤",
  };
  // The glossary's words for every code (the engine's own text is shown
  // beside each row; these describe the codes before a run shows them).
  const TRUST_WORDS = {
    "van-t-hoff": "van 't Hoff only: the library has no non-ideal osmotic model for this solute.",
    "ideal-model": "The ideal osmotic model (π = νcRT) was chosen for the whole screen.",
    extrapolated: "Used past its model's data or fit range (concentration or temperature): extrapolated.",
    bridged: "Between the model's data limit and the measured saturated solution: interpolated.",
    "temperature-25c": "25 °C data used at another temperature.",
    "b-estimated": "Solute permeability B estimated from the membrane's NaCl value by diffusivity, not measured.",
    blend: "A blend transported as one solute at its fixed ratio.",
    custom: "A custom solute: its data were entered by the user.",
    solubility: "Near or past its solubility somewhere in the module.",
    crossing: "Feed solute crosses into the draw, or water flows back: flux ratios leave their usual range.",
    "no-price": "No price on record: scored as the worst on replenishment cost.",
  };
  function trustSymbol(code) { return TRUST_SYMBOLS[code] || "?"; }
  // trustMarks is the row's marks as inline symbols, each with its words.
  function trustMarks(c) {
    const marks = c.trust || [];
    if (!marks.length) return null;
    const box = h("span", { class: "trust", "data-trust": marks.map(m => m.code).join(" ") });
    for (const m of marks) {
      box.appendChild(h("span", { class: "trust-mark", "data-code": m.code, title: m.text, "aria-hidden": "true", text: trustSymbol(m.code) }));
    }
    box.appendChild(h("span", { class: "visually-hidden", text: " (read with care: " + marks.map(m => m.text).join("; ") + ")" }));
    return box;
  }
  // trustLegend lists each code the rows carry, once, in the engine's order.
  function trustLegend(res) {
    const seen = new Map();
    for (const c of res.candidates) for (const m of c.trust || []) if (!seen.has(m.code)) seen.set(m.code, m.text);
    return Array.from(seen, ([code, text]) => ({ code, text }));
  }
  function renderTrustLegend(res) {
    const lg = clear($("trust-legend"));
    const marks = trustLegend(res);
    if (!marks.length) { lg.appendChild(h("p", { text: "Trust marks: none — every row is computed from measured data within its range." })); return; }
    lg.appendChild(h("p", { class: "legend-h", text: "Trust marks beside a solute: read that row with care (its notes under Warnings give the detail)." }));
    const ul = h("ul", {});
    for (const m of marks) ul.appendChild(h("li", { "data-code": m.code }, h("span", { class: "trust-mark", "aria-hidden": "true", text: trustSymbol(m.code) }), " " + m.text));
    lg.appendChild(ul);
  }

  // columns lists the ranked table's columns: key, heading, unit, value
  // and the definition shown as the heading's tooltip and in the glossary.
  // Solute and score are always shown (and stay in view while the table
  // scrolls sideways); the user may hide any other (state.prefs.hiddenColumns,
  // kept in this browser's storage).
  const ALWAYS = ["solute", "score"];
  const ORI_WORDS = { "AL-FS": "active layer facing the feed (FO mode)", "AL-DS": "active layer facing the draw (PRO mode)" };
  function columns() {
    const res = state.result;
    const other = res && res.candidates.length && res.candidates[0].other_orientations;
    const jwDef = o => "Water flux through the membrane with the " + (ORI_WORDS[o] || o) + ", internal polarisation in the support and external polarisation on both faces counted; higher is better.";
    const cols = [
      { key: "rank", label: "Rank", unit: "", get: c => c.rank, fmt: v => String(v), def: "Position by score, 1 = best." },
      { key: "solute", label: "Solute", unit: "", get: c => c.solute, text: true,
        def: "The draw solute or blend (library ID). ◆ marks the Pareto front; boxed symbols are trust marks (see the legend under the table)." },
      { key: "score", label: "Score", unit: res.score_normalisation === "reference" ? "0–1, vs " + (res.score_reference ? res.score_reference.solute : "reference") : "0–1, within set", get: c => c.score, fmt: v => v.toFixed(3), def: scoreDef() },
      { key: "concentration_mol_per_l", label: "Draw conc.", unit: "mol/L", get: c => c.concentration_mol_per_l,
        def: "Concentration of the bulk draw that meets the basis of comparison, in moles of solute (formula units) per litre of solution." },
      { key: "concentration_g_per_l", label: "Draw conc.", unit: "g/L", get: c => c.concentration_g_per_l, def: "The same concentration in grams of solute per litre of solution." },
      { key: "osmotic_pressure_bar", label: "π real", unit: pUnit(), get: c => pConv(c.osmotic_pressure_bar),
        def: "Osmotic pressure of the bulk draw from the solute's non-ideal model (Pitzer, a fitted or a measured model; van 't Hoff where the library has none)." },
      { key: "van_t_hoff_bar", label: "π ideal", unit: pUnit(), get: c => pConv(c.van_t_hoff_bar),
        def: "van 't Hoff osmotic pressure π = ν c R T at the same concentration: the ideal dilute limit, for comparison with π real." },
      { key: "water_flux_lmh", label: "Jw " + res.orientation, unit: fLabel(), get: c => fConv(c.water_flux_lmh), def: jwDef(res.orientation) + " The ranking uses this orientation." },
    ];
    if (other) for (let i = 0; i < other.length; i++) {
      cols.push({ key: "other_" + i, label: "Jw " + other[i].orientation, unit: fLabel(), def: jwDef(other[i].orientation) + " Reported only; not scored.",
        get: c => c.other_orientations && c.other_orientations[i] && !c.other_orientations[i].reason ? fConv(c.other_orientations[i].water_flux_lmh) : NaN });
    }
    cols.push(
      { key: "reverse_solute_flux", label: "Js", unit: sfLabel(), get: sfValue, def: "Reverse solute flux: draw solute lost into the feed per square metre of membrane and hour." },
      { key: "specific_reverse_solute_flux_g_per_l", label: "Js/Jw", unit: "g/L", get: c => c.specific_reverse_solute_flux_g_per_l,
        def: "Specific reverse solute flux: grams of draw solute lost per litre of water drawn; lower is better." },
      { key: "replenishment_cost_usd_per_m3", label: "Replenishment", unit: "USD/m³", get: c => c.replenishment_cost_usd_per_m3,
        def: "Cost of replacing the draw solute lost to the feed: Js/Jw × the bulk price (mid of its range), per cubic metre of water drawn." },
      { key: "min_regeneration_energy_kwh_per_m3", label: "Regen. energy (min.)", unit: "kWh/m³", get: c => c.min_regeneration_energy_kwh_per_m3,
        def: "Minimum (reversible) work to re-concentrate the diluted draw, per cubic metre of product water at the set recovery; a real process needs several times more." },
      { key: "viscosity_mpa_s", label: "Viscosity", unit: "mPa·s", get: c => c.viscosity_mpa_s, def: "Dynamic viscosity of the bulk draw: higher means more pumping energy and stronger polarisation." },
      { key: "solubility_margin_fraction", label: "Solubility margin", unit: "%", get: c => 100 * c.solubility_margin_fraction, fmt: v => v.toFixed(0),
        def: "1 − m/m_sat: how far the draw's molality lies below its solubility at the operating temperature (100 % for a miscible solute)." },
      { key: "max_saturation_index", label: "Max. sat. index", unit: "log SI", get: c => c.max_saturation_index,
        def: "Highest saturation index, log₁₀(ion activity product / solubility product), of any mineral at the feed-side membrane face; above 0 that mineral can form scale." },
      { key: "flux_efficiency", label: "Flux efficiency", unit: "%", get: c => 100 * c.flux_efficiency, fmt: v => v.toFixed(1),
        def: "Water flux ÷ (A × the bulk osmotic pressure difference): the share of the ideal flux left after polarisation." },
    );
    return cols;
  }
  // scoreBasisText says what the score is relative to.
  function scoreBasisText() {
    const res = state.result;
    if (res && res.score_normalisation === "reference") {
      return "Scores are set-independent: each metric is scaled against fixed reference values (" + (res.model_choices && res.model_choices.normalisation || "see Sources & model") + "), so adding or removing a candidate does not change another's score.";
    }
    return "Scores are relative to the screened set: each metric is scaled min–max over the candidates ranked here, so adding or removing a candidate can reorder the others. Choose “reference values” under Weights for a set-independent score.";
  }
  function scoreDef() {
    return "Weighted mean of the normalised metrics, 0–1, 1 = best; the bar shows each metric's share. " + P.scoreBasisText();
  }
  // shownColumns are the columns the user keeps (solute and score always).
  function shownColumns() {
    const hidden = new Set(state.prefs.hiddenColumns || []);
    return columns().filter(c => ALWAYS.includes(c.key) || !hidden.has(c.key));
  }
  // renderChooser lists a check box per column; a change is stored and
  // redraws the table.
  function renderChooser() {
    const box = clear($("col-boxes"));
    const hidden = new Set(state.prefs.hiddenColumns || []);
    for (const c of columns()) {
      const id = "col-" + c.key;
      const cb = h("input", { type: "checkbox", id: id, "data-key": c.key, checked: !hidden.has(c.key) || ALWAYS.includes(c.key), disabled: ALWAYS.includes(c.key),
        on: { change: e => setColumn(c.key, e.target.checked) } });
      box.appendChild(h("label", { class: "check", for: id, title: c.def }, cb, c.label + (c.unit ? " (" + c.unit + ")" : "")));
    }
  }
  function setColumn(key, shown) {
    const hidden = new Set(state.prefs.hiddenColumns || []);
    if (shown) hidden.delete(key); else hidden.add(key);
    state.prefs.hiddenColumns = Array.from(hidden);
    P.S.save(P.S.KEY_PREFS, state.prefs);
    renderTable();
    P.renderReport();
  }
  function showAllColumns() {
    state.prefs.hiddenColumns = [];
    P.S.save(P.S.KEY_PREFS, state.prefs);
    renderChooser();
    renderTable();
    P.renderReport();
  }
  // renderGlossary defines every column, the Pareto mark and the trust marks.
  function renderGlossary() {
    const dl = clear($("glossary-list"));
    for (const c of columns()) {
      dl.appendChild(h("dt", { "data-key": c.key, text: c.label + (c.unit ? " (" + c.unit + ")" : "") }));
      dl.appendChild(h("dd", { text: c.def }));
    }
    dl.appendChild(h("dt", { text: "◆" }));
    dl.appendChild(h("dd", { text: paretoText() }));
    for (const code in TRUST_SYMBOLS) {
      dl.appendChild(h("dt", { "data-code": code }, h("span", { class: "trust-mark", "aria-hidden": "true", text: TRUST_SYMBOLS[code] }), h("span", { class: "visually-hidden", text: "trust mark " + code })));
      dl.appendChild(h("dd", { text: TRUST_WORDS[code] }));
    }
  }
  function paretoText() {
    const objs = (state.result && state.result.pareto_objectives || []).map(P.objLabel);
    return "On the Pareto front: no other ranked candidate is at least as good on every one of " + (objs.length ? objs.join(", ") : "the chosen objectives") +
      " and better on one. The front does not depend on the weights; the score does.";
  }
  // sticky keeps solute and score in view while the table scrolls
  // sideways: each sticky column is offset by the widths before it.
  function placeSticky() {
    const t = $("ranking");
    const head = t.tHead && t.tHead.rows[0];
    if (!head || !t.offsetParent) return; // hidden: placed when its tab is shown
    let left = 0;
    const keys = Array.from(head.cells).map(th => th.dataset.key);
    for (let i = 0; i < keys.length && (keys[i] === "rank" || ALWAYS.includes(keys[i])); i++) {
      const w = head.cells[i].getBoundingClientRect().width;
      for (const r of t.rows) {
        const cell = r.cells[i];
        if (!cell) continue;
        cell.classList.add("stick");
        cell.style.left = left + "px";
      }
      left += w;
    }
  }

  function renderResult(res, ms) {
    const b = res.basis;
    let basis = b.kind === "osmotic-pressure" ? "equal osmotic pressure " + fmt(pConv(b.target_osmotic_pressure_bar)) + " " + pUnit()
      : b.kind === "concentration" ? "equal concentration " + fmt(b.concentration) + " " + b.unit
        : "equal water flux " + fmt(fConv(b.target_water_flux_lmh)) + " " + fLabel();
    const ori = res.orientation === "AL-FS" ? "FO mode (AL-FS)" : "PRO mode (AL-DS)";
    state.basisText = basis;
    $("run-summary").textContent = "Ranked " + res.candidates.length + " of " + (res.candidates.length + res.excluded.length) +
      " candidates at " + basis + "; " + ori + "; feed π " + fmt(pConv(res.feed_osmotic_pressure_bar)) + " " + pUnit() +
      (ms ? "; computed in " + Math.round(ms) + " ms." : ".");
    renderChooser();
    renderGlossary();
    renderTable();
    renderScaling(res);
    const ex = clear($("excluded"));
    if (!res.excluded.length) ex.appendChild(h("li", { text: "None: every candidate passed the hard limits." }));
    for (const x of res.excluded) ex.appendChild(h("li", { "data-solute": x.solute }, h("strong", { text: x.solute }), " — ", h("span", { class: "reason", text: x.reason }), x.detail ? ": " + x.detail : ""));
    // General warnings first; each candidate's own notes folded under it.
    const wl = clear($("warnings"));
    for (const w of res.warnings) wl.appendChild(h("li", { text: w }));
    for (const c of res.candidates) {
      const ws = (c.warnings || []).map(w => w.startsWith(c.solute + ": ") ? w.slice(c.solute.length + 2) : w);
      if (!ws.length) continue;
      const ul = h("ul", {});
      for (const w of ws) ul.appendChild(h("li", { text: w }));
      wl.appendChild(h("li", {}, h("details", {}, h("summary", { text: c.solute + " — " + ws.length + (ws.length === 1 ? " note" : " notes") }), ul)));
    }
    if (!wl.children.length) wl.appendChild(h("li", { text: "None." }));
    renderRobust();
    P.renderSources();
    P.renderReport();
  }

  function renderTable() {
    const res = state.result;
    if (!res) return;
    const cols = shownColumns();
    const thead = clear($("ranking").tHead);
    const tr = h("tr", {});
    for (const c of cols) {
      const sorted = state.sort && state.sort.key === c.key;
      const th = h("th", { scope: "col", "data-key": c.key, "aria-sort": sorted ? (state.sort.dir > 0 ? "ascending" : "descending") : null });
      th.appendChild(h("button", { type: "button", "data-key": c.key, title: c.def, on: { click: () => sortBy(c.key) } },
        c.label, c.unit ? h("span", { class: "unit", text: "(" + c.unit + ")" }) : null));
      tr.appendChild(th);
    }
    thead.appendChild(tr);
    let rows = res.candidates.slice();
    if (state.sort) {
      const col = columns().find(c => c.key === state.sort.key);
      if (col) rows.sort((a, b) => {
        const x = col.get(a), y = col.get(b);
        if (col.text) return state.sort.dir * String(x).localeCompare(String(y));
        const fx = isFinite(x) ? x : Infinity, fy = isFinite(y) ? y : Infinity;
        return state.sort.dir * (fx - fy);
      });
    }
    const tb = clear($("ranking").tBodies[0]);
    for (const c of rows) {
      const row = h("tr", { "data-solute": c.solute, "data-rank": String(c.rank), "data-score": String(c.score), class: c.pareto_optimal ? "pareto" : null });
      for (const col of cols) {
        const v = col.get(c);
        if (col.key === "solute") {
          row.appendChild(h("th", { scope: "row", title: c.name + (c.pareto_optimal ? " — on the Pareto front" : "") }, c.solute,
            c.pareto_optimal ? h("span", { class: "pareto-mark", title: "on the Pareto front", "aria-hidden": "true", text: " ◆" }) : null,
            c.pareto_optimal ? h("span", { class: "visually-hidden", text: " (on the Pareto front)" }) : null, trustMarks(c)));
        } else if (col.key === "score") {
          const td = h("td", { class: "score" }, v.toFixed(3));
          const bar = h("div", { class: "bar", role: "img", "aria-label": contribText(c) });
          for (const k of P.objectiveKeys()) {
            const part = (c.score_contributions || {})[k];
            if (!part) continue;
            const s = h("span", { title: P.objLabel(k) + ": " + part.toFixed(3) });
            s.style.width = (100 * part) + "%";
            s.style.background = P.objColour(k);
            bar.appendChild(s);
          }
          td.appendChild(bar);
          row.appendChild(td);
        } else {
          row.appendChild(h("td", { text: col.fmt ? (isFinite(v) ? col.fmt(v) : "—") : fmt(v) }));
        }
      }
      tb.appendChild(row);
    }
    renderTrustLegend(res);
    $("pareto-key").textContent = "◆ " + paretoText();
    $("score-note").textContent = P.scoreBasisText();
    placeSticky();
    const lg = clear($("contrib-legend"));
    for (const k of P.objectiveKeys()) {
      if (!(res.weights[k] > 0)) continue;
      const i = h("i", {});
      i.style.background = P.objColour(k);
      lg.appendChild(h("span", {}, i, P.objLabel(k) + " (weight " + res.weights[k].toFixed(2) + ")"));
    }
  }
  function contribText(c) {
    return "Score " + c.score.toFixed(3) + ": " + Object.keys(c.score_contributions || {}).map(k => P.objLabel(k) + " " + c.score_contributions[k].toFixed(3)).join(", ");
  }
  function sortBy(key) {
    if (state.sort && state.sort.key === key) state.sort.dir = -state.sort.dir;
    else state.sort = { key: key, dir: key === "solute" || key === "rank" ? 1 : -1 };
    renderTable();
    const btn = $("ranking").querySelector('thead button[data-key="' + CSS.escape(key) + '"]');
    if (btn) btn.focus();
  }

  // ---- mineral saturation ---------------------------------------------------------
  // Minerals within SCALING_SHOWN log units of saturation in the bulk feed
  // or at any candidate's feed-side face are shown (our own cut: further
  // below, a mineral cannot form scale however the ranking varies).
  const SCALING_SHOWN = -2;
  // renderScaling fills the saturation table: the bulk feed's indices
  // (feed_saturation_indices) and each ranked candidate's at the feed-side
  // membrane face (its scaling list), in rank order.
  function renderScaling(res) {
    const t = $("scaling-table");
    const head = clear(t.tHead), body = clear(t.tBodies[0]);
    const bulk = res.feed_saturation_indices || {};
    const rows = [{ label: "Feed, bulk", solute: "", si: bulk }].concat(res.candidates.map(c => {
      const si = {};
      for (const s of c.scaling || []) si[s.mineral] = s.saturation_index;
      return { label: c.solute + " — feed-side face", solute: c.solute, si: si };
    }));
    const top = {};
    for (const r of rows) for (const k in r.si) if (isFinite(r.si[k])) top[k] = Math.max(top[k] === undefined ? -Infinity : top[k], r.si[k]);
    const minerals = Object.keys(top).filter(k => top[k] >= SCALING_SHOWN).sort((a, b) => top[b] - top[a]);
    if (!minerals.length) {
      body.appendChild(h("tr", {}, h("td", { text: Object.keys(top).length ? "No mineral comes within " + -SCALING_SHOWN + " log units of saturation." : "The feed and the draws share no mineral's ions." })));
      return;
    }
    head.appendChild(h("tr", {}, h("th", { scope: "col", text: "Where" }), ...minerals.map(k => h("th", { scope: "col", text: k }))));
    for (const r of rows) {
      body.appendChild(h("tr", { "data-solute": r.solute || null, "data-where": r.solute ? "face" : "bulk" },
        h("th", { scope: "row", text: r.label }), ...minerals.map(k => P.siCell(r.si[k]))));
    }
  }

  // ---- robustness -------------------------------------------------------------
  // body data-robust is running | done | cancelled | error; data-robust-
  // progress counts the progress reports of the current run.
  let robustAbort = null;

  // robustWorkerCount: the engines a robustness run is split between, one
  // per core the browser reports, at most 4 (each holds its own copy of
  // the engine's memory); state.robustWorkers, when set, overrides it.
  function robustWorkerCount() {
    return state.robustWorkers || Math.max(1, Math.min(4, navigator.hardwareConcurrency || 1));
  }
  // robustEngines returns n started engines: the page's own and helpers
  // on the same compiled module, started on first use and kept. A helper
  // that cannot start is left out (the run is split fewer ways).
  async function robustEngines(n) {
    state.helpers = state.helpers || [];
    while (state.helpers.length < n - 1) {
      const e = new window.DrawsiftEngine();
      state.helpers.push(e.start().then(() => e, () => null));
    }
    const started = await Promise.all(state.helpers.slice(0, n - 1));
    return [state.engine, ...started.filter(e => e && !e.broken)];
  }

  // robustCall runs the robustness screen sc: on one engine as it is, or
  // split into one part per engine (uncertainty.shard) and the parts added
  // up by the engine's robustness-merge (the same answer, byte for byte,
  // as one engine's). Progress is the mean of the parts'.
  async function robustCall(sc, signal, onProgress) {
    const engines = await robustEngines(Math.min(robustWorkerCount(), sc.uncertainty.samples));
    document.body.dataset.robustWorkers = String(engines.length);
    if (engines.length === 1) return state.engine.call("screen", sc, { signal, onProgress });
    const frac = engines.map(() => 0);
    const parts = await Promise.all(engines.map((e, i) => {
      const part = Object.assign({}, sc, { uncertainty: Object.assign({}, sc.uncertainty, { shard: { index: i, count: engines.length } }) });
      return e.call("screen", part, { signal, onProgress: f => { frac[i] = f; onProgress(frac.reduce((a, b) => a + b, 0) / frac.length); } });
    }));
    const bad = parts.find(r => r.cancelled) || parts.find(r => !r.ok);
    if (bad || signal.aborted) return bad || { ok: false, cancelled: true, data: { error: { field: "", message: "cancelled" } } };
    // The merge needs of each part only what tells the parts apart and
    // their counts; its figures then go into the first part's answer.
    const slim = d => ({ scenario: d.scenario, engine_version: d.engine_version, robustness: d.robustness,
      candidates: d.candidates.map(c => ({ solute: c.solute, robustness: c.robustness })) });
    const m = await state.engine.call("robustness-merge", { parts: parts.map(r => slim(r.data)) });
    if (!m.ok) return m;
    const out = parts[0].data;
    out.scenario = m.data.scenario;
    out.robustness = m.data.robustness;
    out.candidates.forEach((c, k) => { c.robustness = m.data.candidates[k].robustness; });
    return { ok: true, data: out };
  }

  async function runRobust() {
    if (!state.ready || robustAbort) return;
    // The ranking of an edit still waiting for it first: it is then shown
    // for the scenario sampled, and its work is not left to land on a
    // core the samples use.
    P.scheduleRun.flush();
    P.clearErrors();
    const pre = P.checkForm(state.scenario);
    if (pre.length) { P.showErrors(pre); return; }
    const sc = P.engineScenario(state.scenario, true), edit = state.edits;
    if (!sc.uncertainty) sc.uncertainty = {};
    if (!sc.uncertainty.samples) sc.uncertainty.samples = P.dflt("uncertainty.samples");
    robustAbort = new AbortController();
    $("btn-robust").disabled = true; $("btn-robust-cancel").disabled = false;
    $("robust-progress").value = 0;
    $("robust-status").textContent = "Running " + sc.uncertainty.samples + " samples…";
    let reports = 0;
    document.body.dataset.robustProgress = "0";
    document.body.dataset.robust = "running";
    const t0 = performance.now();
    const r = await robustCall(sc, robustAbort.signal, f => {
      $("robust-progress").value = f; $("robust-status").textContent = Math.round(100 * f) + " % of " + sc.uncertainty.samples + " samples";
      document.body.dataset.robustProgress = String(++reports);
    });
    const aborted = robustAbort.signal.aborted;
    robustAbort = null;
    $("btn-robust").disabled = false; $("btn-robust-cancel").disabled = true;
    if (aborted || r.cancelled) {
      $("robust-status").textContent = "Cancelled.";
      $("robust-progress").value = 0;
      document.body.dataset.robust = "cancelled";
      return;
    }
    if (!r.ok) {
      P.showError(r.data.error);
      $("robust-status").textContent = "Failed.";
      document.body.dataset.robust = "error";
      return;
    }
    const ms = performance.now() - t0, workers = Number(document.body.dataset.robustWorkers);
    document.body.dataset.robustMs = String(ms);
    $("robust-progress").value = 1;
    $("robust-status").textContent = "Done: " + r.data.robustness.samples + " samples in " + (ms / 1000).toFixed(1) + " s" +
      (workers > 1 ? " on " + workers + " workers" : "") + " (seed " + r.data.robustness.seed + ").";
    state.robust = r.data;
    state.robustEdit = edit;
    renderRobust();
    P.renderSources();
    P.renderReport();
    document.body.dataset.robust = "done";
  }
  function cancelRobust() { if (robustAbort) robustAbort.abort(); }

  function renderRobust() {
    const t = $("robust-table");
    const head = clear(t.tHead), body = clear(t.tBodies[0] || t.appendChild(h("tbody")));
    const r = state.robust;
    $("robust-note").textContent = "";
    if (!r) {
      body.appendChild(h("tr", {}, h("td", { colspan: "7", text: "Not run yet for this scenario. “Run robustness” samples the uncertainties set in the scenario form." })));
      return;
    }
    head.appendChild(h("tr", {}, ...["Solute", "Nominal rank", "P(first)", "P(top 3)", "Rank, 5th percentile", "Median rank", "Rank, 95th percentile", "Samples failing a limit"].map(s => h("th", { scope: "col", text: s }))));
    for (const c of r.candidates) {
      const q = c.robustness || {};
      body.appendChild(h("tr", { "data-solute": c.solute },
        h("th", { scope: "row", text: c.solute }), h("td", { text: String(c.rank) }),
        h("td", { text: (100 * q.probability_first).toFixed(1) + " %" }), h("td", { text: (100 * q.probability_top3).toFixed(1) + " %" }),
        h("td", { text: String(q.rank_p05) }), h("td", { text: String(q.rank_median) }), h("td", { text: String(q.rank_p95) }),
        h("td", { text: (100 * q.failed_fraction).toFixed(1) + " %" })));
    }
    t.caption.textContent = "Ranks over " + r.robustness.samples + " Monte Carlo samples (seed " + r.robustness.seed + ").";
    $("robust-note").textContent = "Sampling: " + r.robustness.distributions + ".";
    drawRobustChart();
  }
  // drawRobustChart shows each candidate's rank interval (5th–95th
  // percentile), median and nominal rank, with P(top 3) beside it.
  function drawRobustChart() {
    const box = clear($("robust-chart"));
    const r = state.robust;
    delete state.plots.robustness;
    if (!r) return;
    const n = r.candidates.length;
    const W = Math.round(Math.max(260, Math.min(900, (box.clientWidth || $("results-area").clientWidth - 34) - 18)));
    const items = r.candidates.map(c => { const q = c.robustness || {}; return { name: c.solute, lo: q.rank_p05, mid: q.rank_median, hi: q.rank_p95, mark: c.rank,
      note: "P(top 3) " + (100 * q.probability_top3).toFixed(0) + " %", color: P.colourOf(c.solute) }; });
    const svg = P.C.intervals({ width: W, title: "Rank over " + r.robustness.samples + " samples", xLabel: "rank (1 = best)", from: 1, to: n, items: items,
      markLabel: "nominal rank", desc: "For each candidate, the 5th to 95th percentile of its rank over the Monte Carlo samples, its median and its nominal rank, with the probability of a top-3 place." });
    box.appendChild(P.figure("robustness", svg, "Bar: ranks from the 5th to the 95th percentile; dot: median; diamond: nominal rank. A short bar near 1 is a robust choice."));
  }

  Object.assign(P, { scoreBasisText, trustSymbol, trustLegend, columns, shownColumns, showAllColumns, placeSticky, renderResult, renderTable, renderScaling, runRobust, cancelRobust, renderRobust, robustWorkerCount, robustCall });
})();
