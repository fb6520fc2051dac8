// Drawsift page, the plots: π vs concentration (one engine batch of
// osmotic requests), solute loss at the basis, the flux–loss trade-off,
// water flux vs concentration in both orientations, and the sweeps; each
// exportable as SVG or PNG.
"use strict";

(function () {
  const P = window.DrawsiftPage;
  const { $, state, S, C, h, clear, fmt, clone, pUnit, pConv, fConv, fLabel } = P;

  function plotted() {
    const res = state.result;
    if (!res) return [];
    const n = state.prefs.plotCount === "all" ? res.candidates.length : Number(state.prefs.plotCount);
    return res.candidates.slice(0, n).map(c => c.solute);
  }
  function colourOf(id) {
    const i = state.result ? state.result.candidates.findIndex(c => c.solute === id) : 0;
    return C.PALETTE[(i < 0 ? 0 : i) % C.PALETTE.length];
  }

  // plotWidth is the width (px) each chart of box is drawn at: the width
  // it is shown at, so its text keeps its size from a 360 px phone up. The
  // grid (app.css) holds columns of at least 22rem (352 px) and 1rem gaps.
  function plotWidth(box, figures) {
    const w = box.clientWidth || ($("results-area").clientWidth - 34);
    const cols = Math.max(1, Math.min(figures, Math.floor((w + 16) / (352 + 16))));
    return Math.round(Math.max(260, Math.min(1600, (w - (cols - 1) * 16) / cols - 18)));
  }

  // figure wraps a plot with its caption and export buttons; the plots of
  // the ranking (all but own ones) go into the printed report.
  function figure(key, svg, note, own) {
    const fig = h("figure", { class: "plot", "data-plot": key });
    fig.appendChild(svg);
    const cap = h("figcaption", {}, h("span", { text: note || "" }));
    const btns = h("span", {});
    btns.appendChild(h("button", { type: "button", class: "small", text: "SVG", "aria-label": "Export “" + svg.querySelector("title").textContent + "” as SVG",
      on: { click: () => S.download("drawsift-" + key + ".svg", C.serialise(svg), "image/svg+xml") } }));
    btns.appendChild(document.createTextNode(" "));
    btns.appendChild(h("button", { type: "button", class: "small", text: "PNG", "aria-label": "Export “" + svg.querySelector("title").textContent + "” as PNG",
      on: { click: () => C.toPNG(svg, 2).then(b => S.download("drawsift-" + key + ".png", b)).catch(e => P.banner(e.message)) } }));
    cap.appendChild(btns);
    fig.appendChild(cap);
    if (!own) state.plots[key] = svg;
    return fig;
  }

  // renderPlots draws the plots of run seq; body data-plots becomes
  // "done-<seq>" (the run's own marker) once they are drawn.
  async function renderPlots(seq) {
    const res = state.result;
    const box = clear($("plots"));
    // The robustness chart (results.js) stays in the report.
    state.plots = state.plots.robustness ? { robustness: state.plots.robustness } : {};
    if (!res || !res.candidates.length) return;
    const W = plotWidth(box, 4);
    state.plotWidth = W;
    const ids = plotted();
    const cmax = Math.max(0.2, Math.min(10, Number(state.prefs.cmax) || 3));
    const tC = state.scenario.temperature_c !== undefined ? state.scenario.temperature_c : P.dflt("temperature_c");
    const pu = pUnit();

    // π vs concentration: real and van 't Hoff, from the osmotic operation.
    const grid = [];
    for (let i = 1; i <= 24; i++) grid.push(cmax * i / 24);
    const batch = [];
    // Library solutes and blends of library solutes come from the engine;
    // custom solutes (the osmotic operation does not take them) below.
    const custom = new Set(state.custom.map(c => c.id));
    const lib = ids.filter(id => P.candSolutes(P.candidate(id)).every(s => !custom.has(s)) && (P.isBlend(P.candidate(id)) || state.library.some(s => s.id === id)));
    // The scenario's allow_extrapolation reaches the osmotic requests too, so
    // the curve covers what the ranking used: without it the engine refuses
    // points past a model's data (and its bridge to the measured saturated
    // solution), and those points are left out.
    const extrap = state.scenario.allow_extrapolation ? { allow_extrapolation: true } : {};
    const what = id => { const c = P.candidate(id); return P.isBlend(c) ? { id: c.id, blend: c.blend } : { solute: id }; };
    for (const id of lib) for (const c of grid) batch.push({ op: "osmotic", body: Object.assign(what(id), { concentration: c, unit: "mol/L", temperature_c: tC }, extrap) });
    const br = await state.engine.call("batch", batch, { memo: true });
    if (seq !== state.runSeq) return;
    const series = [], legendItems = [];
    if (br.ok) {
      lib.forEach((id, j) => {
        const real = [], ideal = [];
        grid.forEach((c, i) => {
          const it = br.data[j * grid.length + i];
          if (it && it.ok) { real.push([c, pConv(it.result.osmotic_pressure_bar)]); ideal.push([c, pConv(it.result.van_t_hoff_bar)]); }
        });
        series.push({ name: id, color: colourOf(id), points: [[0, 0]].concat(real) });
        series.push({ name: id + " (van 't Hoff)", color: colourOf(id), dash: "6 4", points: [[0, 0]].concat(ideal) });
        legendItems.push({ name: id, color: colourOf(id) });
      });
    }
    // A custom solute: π = ν c R T, with R from the engine; its measured
    // table as dots.
    const rLBar = P.gasConstantLBar();
    for (const id of ids.filter(id => !lib.includes(id))) {
      const cs = state.custom.find(c => c.id === id);
      if (!cs) continue;
      const nu = cs.van_t_hoff_factor || 1, T = tC + 273.15;
      series.push({ name: id + " (van 't Hoff)", color: colourOf(id), dash: "6 4", points: [[0, 0], [cmax, pConv(nu * cmax * rLBar * T)]] });
      if (cs.osmotic_table) series.push({ name: id + " (measured, " + cs.osmotic_table.unit + ")", color: colourOf(id), markers: true, points: cs.osmotic_table.points.map(p => [p.concentration, pConv(p.osmotic_pressure_bar)]) });
      legendItems.push({ name: id + " (custom" + (cs.osmotic_table ? "; dots: measured π" : "") + ")", color: colourOf(id), marker: !!cs.osmotic_table });
    }
    legendItems.push({ name: "real", color: "#16202a" }, { name: "van 't Hoff", color: "#16202a", dash: "6 4" });
    box.appendChild(figure("osmotic-pressure", C.line({ width: W, title: "Osmotic pressure vs concentration, " + tC + " °C", xLabel: "draw concentration (mol/L)", yLabel: "π (" + pu + ")",
      series: series, legendItems: legendItems, desc: "Real (solid) and van 't Hoff (dashed) osmotic pressure of the top candidates." }),
      "Real model as in the ranking; points past solubility or the model's data are left out."));

    // SRSF bars at the basis, and the Jw–SRSF trade-off.
    box.appendChild(figure("srsf", C.bars({ width: W, title: "Solute lost per litre of water at the basis", xLabel: "", yLabel: "Js/Jw (g/L)",
      data: res.candidates.map(c => ({ name: c.solute, value: c.specific_reverse_solute_flux_g_per_l, color: colourOf(c.solute) })), format: v => fmt(v, 2),
      desc: "Specific reverse solute flux of each ranked candidate, " + res.orientation + "." }), "Lower is better. " + res.orientation + ", at the basis of comparison."));
    const pts = res.candidates.map(c => ({ name: c.solute, x: c.specific_reverse_solute_flux_g_per_l, y: fConv(c.water_flux_lmh), color: colourOf(c.solute), front: c.pareto_optimal }));
    box.appendChild(figure("tradeoff", C.scatter({ width: W, title: "Water flux vs solute loss", xLabel: "Js/Jw (g/L) — lower is better", yLabel: "Jw (" + fLabel() + ") — higher is better",
      points: pts, desc: "Each ranked candidate; ringed points are Pareto-optimal on " + res.pareto_objectives.join(", ") + "." }),
      "Ringed: Pareto-optimal on " + res.pareto_objectives.map(P.objLabel).join(", ") + "."));

    // Jw vs draw concentration in both orientations: a concentration sweep
    // per candidate (so that progress and cancel work per step).
    const fluxSeries = [], fluxLegend = [];
    const base = P.engineScenario(state.scenario, false);
    base.orientations = P.defaults().orientations.filter(o => o !== base.orientation);
    for (const id of ids) {
      const req = Object.assign(clone(base), { candidates: [P.candidate(id)], sweep: { variable: "concentration", unit: "mol/L", from: cmax / 20, to: cmax, points: 20 } });
      if (!P.candSolutes(P.candidate(id)).some(s => custom.has(s))) delete req.custom_solutes;
      const r = await state.engine.call("screen", req, { memo: true });
      if (seq !== state.runSeq) return;
      if (!r.ok || !r.data.sweep) continue;
      for (const s of r.data.sweep) {
        fluxSeries.push({ name: id + " " + s.orientation, color: colourOf(id), dash: s.orientation === "AL-DS" ? "6 4" : null,
          points: s.points.filter(p => p.water_flux_lmh !== undefined).map(p => [p.x, fConv(p.water_flux_lmh)]) });
      }
      fluxLegend.push({ name: id, color: colourOf(id) });
    }
    fluxLegend.push({ name: "AL-FS (FO mode)", color: "#16202a" }, { name: "AL-DS (PRO mode)", color: "#16202a", dash: "6 4" });
    box.appendChild(figure("water-flux", C.line({ width: W, title: "Water flux vs draw concentration, both orientations", xLabel: "draw concentration (mol/L)", yLabel: "Jw (" + fLabel() + ")",
      series: fluxSeries, legendItems: fluxLegend, desc: "Water flux of the top candidates against bulk draw concentration, FO mode solid, PRO mode dashed." }),
      "Same membrane, feed, channel and temperature as the ranking; points failing a hard limit are left out."));
    document.body.dataset.plots = "done-" + seq;
    P.renderReport();
  }

  // ---- sweeps -------------------------------------------------------------------
  // body data-sweep is running | done | cancelled | failed | waiting.
  let sweepAbort = null;
  async function runSweep() {
    if (sweepAbort) return;
    if (!state.ready || !state.result) {
      $("sweep-status").textContent = "The ranking is still being computed; run the sweep when it is done.";
      document.body.dataset.sweep = "waiting";
      return;
    }
    const variable = $("sweep-var").value, from = Number($("sweep-from").value), to = Number($("sweep-to").value), n = Math.round(Number($("sweep-n").value));
    const ids = plotted();
    sweepAbort = new AbortController();
    $("btn-sweep").disabled = true; $("btn-sweep-cancel").disabled = false;
    $("sweep-progress").value = 0;
    $("sweep-status").textContent = "Sweeping…";
    document.body.dataset.sweep = "running";
    const series = [];
    let failed = null;
    for (let i = 0; i < ids.length; i++) {
      const req = Object.assign(P.engineScenario(state.scenario, false), { candidates: [P.candidate(ids[i])], sweep: { variable: variable, from: from, to: to, points: n } });
      if (variable === "concentration") req.sweep.unit = "mol/L";
      const r = await state.engine.call("screen", req, { signal: sweepAbort.signal });
      if (sweepAbort.signal.aborted || r.cancelled) break;
      if (!r.ok) { failed = r.data.error; break; }
      for (const s of r.data.sweep) if (s.orientation === r.data.orientation) {
        series.push({ name: ids[i], color: colourOf(ids[i]), points: s.points.filter(p => p.water_flux_lmh !== undefined).map(p => [p.x, fConv(p.water_flux_lmh)]) });
      }
      $("sweep-progress").value = (i + 1) / ids.length;
      $("sweep-status").textContent = (i + 1) + " of " + ids.length + " candidates";
    }
    const aborted = sweepAbort.signal.aborted;
    sweepAbort = null;
    $("btn-sweep").disabled = false; $("btn-sweep-cancel").disabled = true;
    if (failed) { $("sweep-status").textContent = "Failed: " + (failed.field ? failed.field + ": " : "") + failed.message; document.body.dataset.sweep = "failed"; return; }
    if (aborted) { $("sweep-status").textContent = "Cancelled."; document.body.dataset.sweep = "cancelled"; return; }
    const names = { concentration: "draw concentration (mol/L)", temperature: "temperature (°C)", s: "structural parameter S (µm)", crossflow: "crossflow velocity (m/s)" };
    state.sweepPlot = { opts: { title: "Water flux vs " + names[variable].replace(/ \(.*/, "") + ", " + state.result.orientation, xLabel: names[variable], yLabel: "Jw (" + fLabel() + ")",
      series: series, xZero: false, desc: "Sweep of " + names[variable] + " for the plotted candidates." },
      note: variable === "concentration" ? "The basis is set aside: every candidate at the same concentration." : "The basis of comparison is re-applied at each point." };
    drawSweep();
    $("sweep-status").textContent = "Done.";
    document.body.dataset.sweep = "done";
    P.renderReport();
  }
  // drawSweep draws the last sweep at the width it is shown.
  function drawSweep() {
    const sp = state.sweepPlot;
    if (!sp) return;
    const box = clear($("sweep-plot"));
    const W = plotWidth(box, 1);
    state.sweepWidth = W;
    box.appendChild(figure("sweep", C.line(Object.assign({ width: W }, sp.opts)), sp.note));
  }
  // refit redraws the charts when the width they are shown at has changed
  // by more than a tenth (a phone turned, a window resized).
  function refit() {
    const off = (w, now) => w && Math.abs(now - w) > 0.1 * w;
    if (state.result && off(state.plotWidth, plotWidth($("plots"), 4))) renderPlots(state.runSeq);
    if (state.sweepPlot && off(state.sweepWidth, plotWidth($("sweep-plot"), 1))) drawSweep();
  }
  function cancelSweep() { if (sweepAbort) sweepAbort.abort(); }

  Object.assign(P, { plotted, colourOf, figure, renderPlots, runSweep, cancelSweep, refit });
})();
