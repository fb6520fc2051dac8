// Drawsift page, the sources tab and the printable report: what
// reproduces the run (engine version, model choices, the request), the
// sources, and the report that prints in place of the page.
"use strict";

(function () {
  const P = window.DrawsiftPage;
  const { $, state, h, clear, fmt, pct, pUnit, pConv } = P;

  function renderSources() {
    const res = state.robust || state.result;
    if (!res) return;
    const dl = clear($("repro"));
    const add = (k, v) => { dl.appendChild(h("dt", { text: k })); dl.appendChild(h("dd", { text: v })); };
    add("Engine version", res.engine_version);
    for (const k of Object.keys(res.model_choices || {}).sort()) add(k.replace(/_/g, " "), res.model_choices[k]);
    if (res.robustness) add("robustness", res.robustness.samples + " samples, seed " + res.robustness.seed + "; " + res.robustness.distributions);
    add("Scenario (request)", JSON.stringify(res.scenario));
    const ol = clear($("sources"));
    for (const s of res.sources || []) ol.appendChild(h("li", {}, h("strong", { text: s.field + ": " }), s.reference));
  }

  function renderReport() {
    const res = state.result;
    if (!res) return;
    // Stale results (the latest edit could not be ranked) are not reported.
    $("report").classList.toggle("stale", !!state.stale);
    $("rp-meta").textContent = "";
    if (state.stale) {
      for (const id of ["rp-inputs", "rp-models", "rp-results", "rp-plots", "rp-sources"]) clear($(id));
      $("rp-meta").textContent = "No report: the latest scenario could not be ranked, and the results on screen belong to an earlier one. Fix the field the page names, then print again.";
      return;
    }
    $("rp-meta").textContent = "Engine " + res.engine_version + " · made " + new Date().toISOString().replace("T", " ").slice(0, 16) + " UTC · every number computed in the browser.";
    const cu = clear($("rp-cautions"));
    for (const li of document.querySelectorAll("#cautions li")) cu.appendChild(h("li", { text: li.textContent }));
    const inp = clear($("rp-inputs"));
    const row = (k, v) => inp.appendChild(h("tr", {}, h("th", { scope: "row", text: k }), h("td", { text: v })));
    // A part the scenario leaves out is the engine's default.
    const D = P.defaults();
    const sc = Object.assign({ feed: { preset: D.feed_preset }, membrane: { preset: D.membrane_preset }, temperature_c: P.dflt("temperature_c") }, state.scenario);
    sc.channel = Object.assign({}, D.channel, state.scenario.channel);
    const feed = sc.feed.preset ? (state.feeds.find(f => f.id === sc.feed.preset) || {}).name || sc.feed.preset : sc.feed.solute + " at " + sc.feed.concentration + " " + sc.feed.unit;
    row("Feed", feed + (sc.feed.concentration !== undefined && sc.feed.preset ? " (" + sc.feed.concentration + ")" : "") +
      (!sc.feed.preset ? "; pH " + (sc.feed.ph !== undefined ? sc.feed.ph : P.dflt("feed.ph") + " (default)") : "") + "; π " + fmt(pConv(res.feed_osmotic_pressure_bar)) + " " + pUnit());
    const mem = sc.membrane;
    const m = mem.preset ? state.membranes.find(x => x.id === mem.preset) : null;
    const drawB = mem.b_nacl_lmh !== undefined ? mem.b_lmh : undefined;
    row("Membrane", m ? m.name + " — A " + m.a_lmh_per_bar + " LMH/bar, B(NaCl) " + m.b_nacl_lmh + " LMH, S " + m.s_um + " µm" :
      "custom — A " + mem.a_lmh_per_bar + " LMH/bar, B(NaCl) " + (mem.b_nacl_lmh !== undefined ? mem.b_nacl_lmh : mem.b_lmh) + " LMH, S " + mem.s_um + " µm");
    row("Membrane temperature", (res.model_choices || {}).membrane_temperature || "");
    row("B of the draw solutes", drawB !== undefined ? drawB + " LMH, used for every candidate" : "estimated per solute from B(NaCl) (flagged in the results)");
    row("Orientation", res.orientation === "AL-FS" ? "FO mode (AL-FS)" : "PRO mode (AL-DS)");
    row("Temperature", sc.temperature_c + " °C");
    row("Channel", sc.external_cp === false ? "no external concentration polarisation" :
      sc.channel.height_mm + " × " + sc.channel.width_mm + " × " + sc.channel.length_mm + " mm, " + sc.channel.crossflow_velocity_m_per_s + " m/s" + (sc.channel.spacer ? ", spacer" : ""));
    const kText = (v, side) => side + " " + (v !== undefined ? v + " m/s (given)" : "from the channel");
    row("Mass transfer", sc.external_cp === false ? "not counted" : sc.k_draw_m_per_s === undefined && sc.k_feed_m_per_s === undefined ? "k from the channel (Sherwood correlation)" :
      "k " + kText(sc.k_draw_m_per_s, "draw side") + "; " + kText(sc.k_feed_m_per_s, "feed side"));
    row("Basis of comparison", state.basisText || "");
    row("Candidates", (sc.candidates || []).map(c => P.isBlend(c) ? c.id + " (" + P.blendText(c) + ")" : c).join(", "));
    row("Score", P.scoreBasisText());
    row("Weights", Object.keys(res.weights).filter(k => res.weights[k] > 0).map(k => P.objLabel(k) + " " + res.weights[k]).join(", "));
    row("Osmotic model", sc.osmotic_model || P.defaults().osmotic_model);
    row("Solutes excluded by hazard", (sc.exclude_hazards || []).length ? sc.exclude_hazards.join(", ") : "none");
    row("Candidates needed beyond their model's data", sc.allow_extrapolation ? "kept (flagged)" : "left out");
    row("Water recovered when re-concentrating the draw", pct(sc.regeneration_recovery !== undefined ? sc.regeneration_recovery : P.dflt("regeneration_recovery")) + " %");
    row("Pareto front on", (res.pareto_objectives || []).map(P.objLabel).join(", "));
    if (state.robust) row("Uncertainty", state.robust.robustness.samples + " samples, seed " + state.robust.robustness.seed);
    const mo = clear($("rp-models"));
    for (const k of Object.keys(res.model_choices || {}).sort()) mo.appendChild(h("li", {}, h("strong", { text: k.replace(/_/g, " ") + ": " }), res.model_choices[k]));
    const rr = clear($("rp-results"));
    const t = $("ranking").cloneNode(true);
    t.removeAttribute("id");
    // The on-screen caption tells how to sort: the report says what it is.
    t.caption.textContent = "Ranked candidates at " + (state.basisText || "the basis") + ". " + P.scoreBasisText();
    for (const b of t.querySelectorAll("thead button")) b.replaceWith(...Array.from(b.childNodes));
    for (const b of t.querySelectorAll(".bar")) b.remove();
    for (const c of t.querySelectorAll(".stick")) { c.classList.remove("stick"); c.style.left = ""; }
    rr.appendChild(t);
    const tl = $("trust-legend").cloneNode(true);
    tl.removeAttribute("id");
    rr.appendChild(tl);
    rr.appendChild(h("h3", { text: "Mineral saturation of the feed" }));
    const sat = $("scaling-table").cloneNode(true);
    sat.removeAttribute("id");
    rr.appendChild(sat);
    rr.appendChild(h("p", { text: $("scaling-hint").textContent + " " + document.querySelector(".sat-legend").textContent }));
    rr.appendChild(h("h3", { text: "Left out" }));
    const ex = $("excluded").cloneNode(true);
    ex.removeAttribute("id");
    rr.appendChild(ex);
    if (state.robust) {
      rr.appendChild(h("h3", { text: "Robustness" }));
      const rt = $("robust-table").cloneNode(true);
      rt.removeAttribute("id");
      rr.appendChild(rt);
    }
    rr.appendChild(h("h3", { text: "Warnings" }));
    rr.appendChild(groupedWarnings(res));
    const pl = clear($("rp-plots"));
    for (const k in state.plots) {
      const svg = state.plots[k].cloneNode(true);
      pl.appendChild(h("figure", {}, svg));
    }
    const so = clear($("rp-sources"));
    for (const s of (state.robust || res).sources || []) so.appendChild(h("li", {}, h("strong", { text: s.field + ": " }), s.reference));
  }

  // groupedWarnings lists the screen's warnings, then each candidate note
  // once with the candidates it concerns: notes that differ only in their
  // numbers are one entry (numbers shown as "…"; each solute's values are
  // in the page's notes and the JSON export).
  function groupedWarnings(res) {
    const ul = h("ul", { class: "warnings rp-warnings" });
    for (const w of res.warnings || []) ul.appendChild(h("li", { text: w }));
    const groups = new Map();
    for (const c of res.candidates) {
      const id = c.solute;
      for (const w0 of c.warnings || []) {
        let w = w0.startsWith(id + ": ") ? w0.slice(id.length + 2) : w0.startsWith(id + " ") ? w0.slice(id.length + 1) : w0;
        w = w.split(id).join("the solute");
        const key = w.replace(/-?\d+(\.\d+)?(e[+-]?\d+)?/gi, "…");
        if (!groups.has(key)) groups.set(key, { texts: new Set(), ids: [] });
        const g = groups.get(key);
        g.texts.add(w);
        if (!g.ids.includes(id)) g.ids.push(id);
      }
    }
    for (const [key, g] of groups) {
      const text = g.texts.size === 1 ? g.texts.values().next().value : key;
      ul.appendChild(h("li", {}, text + " — ", h("strong", { text: g.ids.length === res.candidates.length && g.ids.length > 1 ? "every ranked candidate" : g.ids.join(", ") })));
    }
    if (!ul.children.length) ul.appendChild(h("li", { text: "None." }));
    return ul;
  }

  Object.assign(P, { renderSources, renderReport, groupedWarnings });
})();
