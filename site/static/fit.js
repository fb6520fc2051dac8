// Drawsift page: the Fit tab — A, B and S fitted to the user's measured
// fluxes through the engine's fit operation: CSV pasted or imported, the
// parameters with their intervals, goodness of fit, correlations,
// warnings, parity and residual plots; the fitted membrane goes into the
// scenario (with undo), the report out as JSON or CSV.
//
// What the page signals on <body>: data-fit done- | error- | cancelled-<n>
// (each fit request) and data-fit-progress (bootstrap progress reports).
(function () {
  const P = window.DrawsiftPage;
  const { $, state, S, C, h, clear, fmt } = P;

  // The user's fit inputs are kept in the browser between visits.
  const KEY_FIT = "drawsift.fit.v1";
  // The published example: Membranes 11(2):153 (2021), Appendix C, mesh-TFC
  // membrane (the library's tfc-mesh record), 25 °C assumed.
  const EXAMPLE = "orientation,draw_solute,draw_concentration_mol_per_l,feed_solute,feed_concentration_mol_per_l,temperature_c,water_flux_lmh,reverse_solute_flux_gmh\n" +
    "AL-DS,NaCl,0.5,NaCl,0.01,25,15.82,4.54\nAL-FS,NaCl,0.5,NaCl,0.01,25,8.51,2.74\nAL-DS,NaCl,2,NaCl,0.5,25,8.07,\nAL-FS,NaCl,2,NaCl,0.5,25,7.35,\n";
  const LABELS = { a: ["A", "a_lmh_per_bar", "LMH/bar"], b: ["B", "b_lmh", "LMH"], s: ["S", "s_um", "µm"] };

  let seq = 0, abort = null, last = null, fitEng = null;
  // fitEngine starts the full engine (drawsift-fit.wasm, with the fit and
  // module operations) in its own worker the first time the Fit or the
  // Plant tab needs it: the page's own engine leaves them out to stay
  // inside its download budget. status names the element that says so.
  function fitEngine(status) {
    if (!fitEng) {
      const e = new window.DrawsiftEngine("drawsift-fit.wasm");
      $(status || "fit-status").textContent = "loading the full engine…";
      fitEng = e.start().then(() => e, err => { fitEng = null; throw err; });
    }
    return fitEng;
  }
  function signal(kind) { document.body.dataset.fit = kind + "-" + seq; }

  function prefs() {
    return { csv: $("fit-csv").value, a: $("fit-pa").checked, b: $("fit-pb").checked, s: $("fit-ps").checked,
      model: $("fit-model").value, ecp: $("fit-ecp").checked, boot: $("fit-boot").checked, n: $("fit-boot-n").value };
  }
  function savePrefs() { S.save(KEY_FIT, prefs()); }

  function buildFitPanel() {
    const p = S.load(KEY_FIT);
    if (p && typeof p === "object") {
      if (typeof p.csv === "string") $("fit-csv").value = p.csv;
      for (const k of ["a", "b", "s"]) if (typeof p[k] === "boolean") $("fit-p" + k).checked = p[k];
      if (p.model === "real" || p.model === "van-t-hoff") $("fit-model").value = p.model;
      if (typeof p.ecp === "boolean") $("fit-ecp").checked = p.ecp;
      if (typeof p.boot === "boolean") $("fit-boot").checked = p.boot;
      if (p.n !== undefined && isFinite(Number(p.n))) $("fit-boot-n").value = p.n;
    }
    const lim = P.limit("bootstrap.samples");
    if (lim) { $("fit-boot-n").min = lim.min; $("fit-boot-n").max = lim.max; }
    for (const id of ["fit-pa", "fit-pb", "fit-ps", "fit-model", "fit-ecp", "fit-boot", "fit-boot-n"]) $(id).addEventListener("change", savePrefs);
    $("fit-csv").addEventListener("input", P.debounce(savePrefs, 300));
    $("fit-file").addEventListener("change", ev => {
      const f = ev.target.files[0];
      ev.target.value = "";
      if (!f) return;
      f.text().then(t => { keepText(); $("fit-csv").value = t; savePrefs(); }, e => P.banner("The file could not be read: " + e.message));
    });
    $("btn-fit-example").addEventListener("click", () => { keepText(); $("fit-csv").value = EXAMPLE; $("fit-ecp").checked = false; savePrefs(); });
    $("btn-fit").addEventListener("click", runFit);
    $("btn-fit-cancel").addEventListener("click", () => { if (abort) abort.abort(); });
    $("btn-fit-use").addEventListener("click", useMembrane);
    $("btn-fit-json").addEventListener("click", () => { if (last) S.download("drawsift-fit.json", JSON.stringify(last, null, 2) + "\n"); });
    $("btn-fit-csvout").addEventListener("click", () => { if (last) S.download("drawsift-fit.csv", reportCSV(last.response), "text/csv"); });
  }
  // keepText offers back measurements that an import or the example replaced.
  function keepText() {
    const old = $("fit-csv").value;
    if (!old.trim()) return;
    P.offer("The fit's measurements were replaced; the previous ones are kept.", "Restore the previous measurements", () => { $("fit-csv").value = old; savePrefs(); });
  }

  // request builds the fit request; unticked parameters keep the
  // scenario membrane's values (the draw solute's B if set, else NaCl's).
  function request() {
    const params = ["a", "b", "s"].filter(k => $("fit-p" + k).checked);
    const body = { csv: $("fit-csv").value, parameters: params, osmotic_model: $("fit-model").value, confidence: 0.95 };
    if (!$("fit-ecp").checked) body.external_cp = false;
    else if (state.scenario && state.scenario.channel) body.channel = state.scenario.channel;
    const mem = {};
    const b = P.num("mem-bdraw") !== undefined ? P.num("mem-bdraw") : P.num("mem-b");
    const fixed = { a: ["a_lmh_per_bar", P.num("mem-a")], b: ["b_lmh", b], s: ["s_um", P.num("mem-s")] };
    for (const k of ["a", "b", "s"]) if (!params.includes(k) && fixed[k][1] !== undefined) mem[fixed[k][0]] = fixed[k][1];
    if (Object.keys(mem).length) body.membrane = mem;
    if ($("fit-boot").checked) body.bootstrap = { samples: Number($("fit-boot-n").value), seed: 1 };
    return body;
  }

  async function runFit() {
    const id = ++seq;
    $("fit-error").hidden = true;
    const body = request();
    if (!body.csv.trim()) { showError({ field: "csv", message: "paste or import the measurements first" }); signal("error"); return; }
    abort = new AbortController();
    $("btn-fit").disabled = true; $("btn-fit-cancel").disabled = !body.bootstrap;
    $("fit-progress").value = 0;
    $("fit-status").textContent = "fitting…";
    let reports = 0;
    document.body.dataset.fitProgress = "0";
    let eng;
    try {
      eng = await fitEngine();
    } catch (e) {
      abort = null;
      $("btn-fit").disabled = false; $("btn-fit-cancel").disabled = true;
      $("fit-status").textContent = "";
      showError({ field: "", message: e.message });
      signal("error");
      return;
    }
    const r = await eng.call("fit", body, { signal: abort.signal, onProgress: f => {
      $("fit-progress").value = f; $("fit-status").textContent = Math.round(100 * f) + " % of " + body.bootstrap.samples + " resamples";
      document.body.dataset.fitProgress = String(++reports);
    } });
    abort = null;
    $("btn-fit").disabled = false; $("btn-fit-cancel").disabled = true;
    if (id !== seq) return;
    if (!r.ok) {
      $("fit-status").textContent = r.cancelled ? "cancelled" : "";
      if (!r.cancelled) showError(r.data.error || { message: "unknown error" });
      signal(r.cancelled ? "cancelled" : "error");
      return;
    }
    $("fit-progress").value = 1;
    $("fit-status").textContent = "fitted: " + r.data.solver.status + ", " + r.data.solver.iterations + " iterations";
    last = { request: body, response: r.data, engine_version: r.data.engine_version };
    render(r.data);
    signal("done");
  }
  function showError(e) {
    const box = $("fit-error");
    box.textContent = (e.field ? e.field + ": " : "") + e.message + (e.limit ? " (limit: " + e.limit + ")" : "");
    box.hidden = false;
    $("fit-result").hidden = true;
  }

  function table(t, heads, rows) {
    const hd = clear(t.tHead), tb = clear(t.tBodies[0]);
    hd.appendChild(h("tr", {}, ...heads.map(x => h("th", { scope: "col", text: x }))));
    for (const r of rows) tb.appendChild(h("tr", {}, ...r.map((c, i) => h(i ? "td" : "th", i ? { text: c } : { scope: "row", text: c }))));
  }

  function render(d) {
    $("fit-result").hidden = false;
    const pct = Math.round(100 * d.confidence);
    const boot = !!d.bootstrap;
    const heads = ["parameter", "value", pct + " % low", pct + " % high", "standard error"].concat(boot ? ["bootstrap low", "bootstrap high"] : []);
    const rows = ["a", "b", "s"].map(k => {
      const e = d[LABELS[k][1]], name = LABELS[k][0] + " (" + LABELS[k][2] + ")";
      if (e.fixed) return [name, fmt(e.value) + " (fixed)", "—", "—", "—"].concat(boot ? ["—", "—"] : []);
      const row = [name, fmt(e.value), fmt(e.ci_low), fmt(e.ci_high), fmt(e.standard_error)];
      return boot ? row.concat([fmt(e.bootstrap && e.bootstrap.ci_low), fmt(e.bootstrap && e.bootstrap.ci_high)]) : row;
    });
    table($("fit-params"), heads, rows);
    // Each row carries the exact numbers for tools and tests.
    Array.from($("fit-params").tBodies[0].rows).forEach((tr, i) => {
      const e = d[LABELS["abs"[i]][1]];
      tr.dataset.param = "abs"[i];
      tr.dataset.value = String(e.value);
      if (e.ci_low !== undefined) { tr.dataset.ciLow = String(e.ci_low); tr.dataset.ciHigh = String(e.ci_high); }
    });
    const g = d.goodness_of_fit, dl = clear($("fit-goodness"));
    const add = (k, v) => { dl.appendChild(h("dt", { text: k })); dl.appendChild(h("dd", { text: v })); };
    add("Measured fluxes", g.observations + " (" + g.degrees_of_freedom + " degrees of freedom)");
    add("Reduced chi-square", fmt(g.reduced_chi_square));
    add("RMSE water flux", fmt(g.rmse_water_flux_lmh) + " LMH");
    if (g.rmse_reverse_solute_flux_gmh !== undefined) add("RMSE reverse solute flux", fmt(g.rmse_reverse_solute_flux_gmh) + " gMH");
    add("Solver", d.solver.method + ": " + d.solver.status + ", " + d.solver.iterations + " iterations, gradient " + fmt(d.solver.gradient_norm));
    if (boot) add("Bootstrap", d.bootstrap.samples + " resamples (seed " + d.bootstrap.seed + ", " + d.bootstrap.failed + " failed)");
    const names = d.correlation.parameters.map(k => LABELS[k][0]);
    table($("fit-corr"), [""].concat(names), d.correlation.matrix.map((row, i) => [names[i]].concat(row.map(v => fmt(v, 3)))));
    const wl = clear($("fit-warnings"));
    for (const w of d.warnings) wl.appendChild(h("li", { text: w }));
    if (!d.warnings.length) wl.appendChild(h("li", { text: "none" }));
    table($("fit-resid"), ["row", "orientation", "Jw measured (LMH)", "Jw fitted", "Js measured (gMH)", "Js fitted"], d.residuals.map(r => [
      String(r.row), r.orientation, fmt(r.water_flux_lmh.measured), fmt(r.water_flux_lmh.fitted),
      r.reverse_solute_flux_gmh.measured === undefined ? "—" : fmt(r.reverse_solute_flux_gmh.measured), fmt(r.reverse_solute_flux_gmh.fitted)]));
    plot(d);
  }

  function plot(d) {
    const box = clear($("fit-plot"));
    const col = C.PALETTE;
    const jw = d.residuals.map(r => ({ x: r.water_flux_lmh.measured, y: r.water_flux_lmh.fitted, color: r.orientation === "AL-FS" ? col[0] : col[1] }));
    box.appendChild(P.figure("fit-parity-jw", C.parity({ title: "Water flux: fitted vs measured", xLabel: "measured Jw (LMH)", yLabel: "fitted Jw (LMH)",
      desc: "Each test's fitted water flux against the measured one; on the dashed line they agree.", points: jw,
      series: [{ name: "AL-FS", color: col[0] }, { name: "AL-DS", color: col[1] }] }), "", true));
    const js = d.residuals.filter(r => r.reverse_solute_flux_gmh.measured !== undefined)
      .map(r => ({ x: r.reverse_solute_flux_gmh.measured, y: r.reverse_solute_flux_gmh.fitted, color: r.orientation === "AL-FS" ? col[0] : col[1] }));
    if (js.length) {
      box.appendChild(P.figure("fit-parity-js", C.parity({ title: "Reverse solute flux: fitted vs measured", xLabel: "measured Js (gMH)", yLabel: "fitted Js (gMH)",
        desc: "Each test's fitted reverse solute flux against the measured one.", points: js,
        series: [{ name: "AL-FS", color: col[0] }, { name: "AL-DS", color: col[1] }] }), "", true));
    }
    const bars = [];
    for (const r of d.residuals) {
      bars.push({ name: "Jw " + r.row, value: r.water_flux_lmh.weighted_residual, color: col[0] });
      if (r.reverse_solute_flux_gmh.weighted_residual !== undefined) bars.push({ name: "Js " + r.row, value: r.reverse_solute_flux_gmh.weighted_residual, color: col[2] });
    }
    box.appendChild(P.figure("fit-residuals", C.bars({ title: "Weighted residuals (fitted − measured) / uncertainty", xLabel: "", yLabel: "weighted residual",
      desc: "One bar per measured flux.", data: bars, format: v => fmt(v, 2) }), "", true));
  }

  // useMembrane puts the fitted membrane into the scenario (the previous
  // scenario kept for undo) and reruns the screen.
  async function useMembrane() {
    if (!last || !state.scenario) return;
    const sc = P.clone(state.scenario);
    sc.membrane = P.clone(last.response.membrane);
    try {
      await P.applyScenario(sc, "The fitted membrane");
    } catch (e) {
      P.banner(e.message);
    }
  }

  // reportCSV: the parameters, then the measured and fitted fluxes.
  function reportCSV(d) {
    const q = P.csvCell;
    const lines = ["parameter,unit,value,fixed,ci_low,ci_high,standard_error"];
    for (const k of ["a", "b", "s"]) {
      const e = d[LABELS[k][1]];
      lines.push([LABELS[k][1], LABELS[k][2], e.value, e.fixed ? "yes" : "no", e.ci_low, e.ci_high, e.standard_error].map(v => v === undefined ? "" : q(v)).join(","));
    }
    lines.push("");
    lines.push("row,orientation,water_flux_lmh_measured,water_flux_lmh_fitted,reverse_solute_flux_gmh_measured,reverse_solute_flux_gmh_fitted");
    for (const r of d.residuals) {
      lines.push([r.row, r.orientation, r.water_flux_lmh.measured, r.water_flux_lmh.fitted, r.reverse_solute_flux_gmh.measured, r.reverse_solute_flux_gmh.fitted]
        .map(v => v === undefined ? "" : q(v)).join(","));
    }
    lines.push("");
    for (const w of d.warnings) lines.push(q("warning: " + w));
    return lines.join("\n") + "\n";
  }

  // fitLast is the last fit (request and response), for tools and tests.
  // fullEngine is the same on-demand engine for the Plant tab.
  Object.assign(P, { buildFitPanel, fitLast: () => last, fullEngine: fitEngine });
})();
