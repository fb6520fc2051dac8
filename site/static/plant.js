// Drawsift page: the Plant tab — one draw along a module, counter-current
// beside co-current (the module operation, on the scenario's membrane,
// feed, orientation, temperature and channel), the regeneration routes of
// the leaving draw, and the candidates ranked for a plant (the screen's
// system basis). Both run on the on-demand full engine (P.fullEngine).
//
// What the page signals on <body>: data-plant done- | error-<n> (each
// module run), data-system done- | error-<n> (each plant ranking) and
// data-system-progress (the ranking's progress reports).
(function () {
  const P = window.DrawsiftPage;
  const { $, state, C, h, clear, fmt } = P;

  let plantSeq = 0, systemSeq = 0, lastPlant = null, lastSystem = null, touched = false;

  // The system inputs and their engine ranges (the form shows recovery
  // in %).
  const SYS = [["sys-recovery", "system.recovery", 100], ["sys-product", "system.product_m3_per_day", 1], ["sys-elec", "system.prices.electricity_usd_per_kwh", 1],
    ["sys-heat", "system.prices.heat_usd_per_kwh", 1], ["sys-mem", "system.prices.membrane_usd_per_m2", 1], ["sys-life", "system.prices.membrane_life_years", 1]];

  function buildPlantPanel() {
    const sel = clear($("pl-draw"));
    for (const s of state.library) sel.appendChild(h("option", { value: s.id, text: s.id + " — " + s.name }));
    for (const [id, key, scale] of SYS) {
      const l = P.limit(key);
      $(id).value = String(Number((l.default * scale).toPrecision(12)));
      $(id).title = P.limitText(key, scale);
    }
    for (const id of ["pl-draw", "pl-conc"]) $(id).addEventListener("change", () => { touched = true; });
    $("btn-plant").addEventListener("click", runPlant);
    $("btn-system").addEventListener("click", runSystem);
    refreshPlant();
  }

  // refreshPlant proposes the screen's leader at its basis concentration
  // until the user picks a draw.
  function refreshPlant() {
    if (touched) return;
    const top = state.result && state.result.candidates && state.result.candidates[0];
    const id = top && state.library.some(s => s.id === top.solute) ? top.solute : "NaCl";
    $("pl-draw").value = id;
    if (top && top.solute === id) $("pl-conc").value = String(Number(top.concentration_mol_per_l.toPrecision(6)));
    else if (!$("pl-conc").value) $("pl-conc").value = "1";
  }

  // common is what a module request takes from the scenario.
  function common() {
    const sc = state.scenario || {};
    const b = {};
    for (const k of ["membrane", "orientation", "temperature_c", "k_draw_m_per_s", "k_feed_m_per_s", "channel", "external_cp", "osmotic_model", "allow_extrapolation"]) {
      if (sc[k] !== undefined) b[k] = P.clone(sc[k]);
    }
    // A screen's b_lmh is the membrane's NaCl B; a module's is the draw's own.
    if (b.membrane && b.membrane.b_lmh !== undefined && b.membrane.b_nacl_lmh === undefined) {
      b.membrane.b_nacl_lmh = b.membrane.b_lmh;
      delete b.membrane.b_lmh;
    }
    return b;
  }
  function feedOf(qf) {
    const f = (state.scenario && state.scenario.feed) || {};
    if (f.ions && f.ions.length) throw { field: "feed", message: "the module takes a feed by preset, solute or mixture; this scenario's feed is a list of ions" };
    const out = { flow_l_per_h: qf };
    for (const k of ["preset", "solute", "concentration", "unit", "mixture"]) if (f[k] !== undefined) out[k] = P.clone(f[k]);
    return out;
  }

  function requests() {
    const base = common();
    const v = P.num("pl-value");
    base.draw = { solute: $("pl-draw").value, concentration: P.num("pl-conc"), unit: "mol/L", flow_l_per_h: P.num("pl-qd") };
    base.feed = feedOf(P.num("pl-qf"));
    if ($("pl-mode").value === "area") base.area_m2 = v;
    else base.target = { recovery: v === undefined ? undefined : v / 100 };
    base.profile_points = 41;
    const counter = Object.assign(P.clone(base), { flow: "counter" }), co = Object.assign(P.clone(base), { flow: "co" });
    return { counter, co };
  }

  async function engine(status) {
    try {
      return await P.fullEngine(status);
    } catch (e) {
      return { error: e };
    }
  }

  async function runPlant() {
    const id = ++plantSeq;
    $("plant-error").hidden = true;
    let rq;
    try {
      rq = requests();
    } catch (e) {
      return plantFail(id, e);
    }
    $("btn-plant").disabled = true;
    $("plant-status").textContent = "running the module…";
    const eng = await engine("plant-status");
    if (eng.error) { $("btn-plant").disabled = false; return plantFail(id, { message: eng.error.message }); }
    const out = {};
    for (const fl of ["counter", "co"]) out[fl] = await eng.call("module", rq[fl]);
    $("btn-plant").disabled = false;
    if (id !== plantSeq) return;
    if (!out.counter.ok && !out.co.ok) return plantFail(id, out.counter.data.error || { message: "unknown error" });
    const res = { counter: out.counter.ok ? out.counter.data : null, co: out.co.ok ? out.co.data : null,
      errors: { counter: out.counter.ok ? null : out.counter.data.error, co: out.co.ok ? null : out.co.data.error } };
    lastPlant = { requests: rq, responses: res };
    $("plant-status").textContent = "";
    renderPlant(res);
    document.body.dataset.plant = "done-" + id;
  }
  function plantFail(id, e) {
    const box = $("plant-error");
    box.textContent = (e.field ? e.field + ": " : "") + e.message + (e.limit ? " (limit: " + e.limit + ")" : "");
    box.hidden = false;
    $("plant-result").hidden = true;
    $("plant-status").textContent = "";
    document.body.dataset.plant = "error-" + id;
  }

  function table(t, heads, rows) {
    const hd = clear(t.tHead), tb = clear(t.tBodies[0]);
    hd.appendChild(h("tr", {}, ...heads.map(x => h("th", { scope: "col", text: x }))));
    for (const r of rows) tb.appendChild(h("tr", {}, ...r.map((c, i) => h(i ? "td" : "th", i ? { text: c } : { scope: "row", text: c }))));
    return tb;
  }

  function renderPlant(res) {
    $("plant-result").hidden = false;
    const cols = ["counter", "co"];
    const cell = (fl, f) => res[fl] ? f(res[fl]) : (res.errors[fl] ? res.errors[fl].message : "—");
    const rows = [
      ["Area (m²)", r => fmt(r.area_m2)],
      ["Permeate (L/h)", r => fmt(r.permeate_l_per_h)],
      ["Recovery (%)", r => fmt(100 * r.recovery)],
      ["Recovery cap (%)", r => fmt(100 * r.recovery_cap) + " (" + r.recovery_cap_pinch + ")"],
      ["Average water flux (LMH)", r => fmt(r.average_water_flux_lmh)],
      ["Draw out (mol/L)", r => fmt(r.draw_out.concentration_mol_per_l)],
      ["Draw out π (bar)", r => fmt(r.draw_out.osmotic_pressure_bar)],
      ["Feed out π (bar)", r => fmt(r.feed_out.osmotic_pressure_bar)],
      ["Draw lost (g per L of permeate)", r => fmt(r.draw_loss_g_per_l_permeate)],
      ["Best regeneration route", r => r.regeneration_best || "none feasible"],
      ["Draw make-up (g/m³ of product)", r => r.draw_make_up_g_per_m3 === undefined ? "—" : fmt(r.draw_make_up_g_per_m3)],
      ["Reversible minimum (kWh/m³)", r => r.regeneration_minimum ? fmt(r.regeneration_minimum.kwh_per_m3_water) : "—"],
      ["Solver", r => r.solver.method + ", " + r.solver.integrations + " integrations"],
    ];
    const tb = table($("plant-summary"), ["", "counter-current", "co-current"], rows.map(([name, f]) => [name].concat(cols.map(fl => cell(fl, f)))));
    tb.rows[1].dataset.counter = res.counter ? String(res.counter.permeate_l_per_h) : "";
    tb.rows[1].dataset.co = res.co ? String(res.co.permeate_l_per_h) : "";
    plots(res);
    const r = res.counter || res.co;
    const rt = table($("plant-regen"), ["route", "feasible", "electricity (kWh/m³)", "heat (kWh/m³)", "equivalent work (kWh/m³)", "× minimum", "pressure (bar)", "draw lost (g/m³)", "note"],
      (r.regeneration || []).map(g => g.applicable
        ? [g.label, g.feasible ? "yes" : "no", fmt(g.electric_kwh_per_m3), fmt(g.heat_kwh_per_m3), fmt(g.equivalent_work_kwh_per_m3), fmt(g.ratio_to_minimum, 2),
          g.pressure_bar ? fmt(g.pressure_bar) : "—", fmt(g.draw_loss_g_per_m3), g.reason || ""]
        : [g.label, "n/a", "", "", "", "", "", "", g.reason || ""]));
    Array.from(rt.rows).forEach((tr, i) => { tr.dataset.route = r.regeneration[i].route; });
    const wl = clear($("plant-warnings"));
    for (const w of r.warnings) wl.appendChild(h("li", { text: w }));
    for (const c of r.cautions || []) wl.appendChild(h("li", { text: c }));
  }

  // plots: concentrations, π and the local flux along the area, counter
  // (solid) beside co (dashed).
  function plots(res) {
    const box = clear($("plant-plots"));
    const col = C.PALETTE;
    const along = (key) => {
      const series = [];
      for (const [fl, dash] of [["counter", null], ["co", "6 4"]]) {
        const r = res[fl];
        if (!r) continue;
        const x = r.profiles.area_m2;
        for (const [j, side] of [[0, "draw"], [1, "feed"]]) {
          if (!key[side]) continue;
          series.push({ name: side + ", " + fl + "-current", color: col[j], dash: dash, points: x.map((a, i) => [a, r.profiles[key[side]][i]]) });
        }
      }
      return series;
    };
    box.appendChild(P.figure("plant-concentration", C.line({ title: "Concentration along the module", xLabel: "area from the feed inlet (m²)", yLabel: "mol/L",
      series: along({ draw: "draw_concentration_mol_per_l", feed: "feed_concentration_mol_per_l" }),
      desc: "Each stream's concentration along the membrane area, counter-current solid, co-current dashed." }), "solid: counter-current; dashed: co-current", true));
    box.appendChild(P.figure("plant-pi", C.line({ title: "Osmotic pressure along the module", xLabel: "area from the feed inlet (m²)", yLabel: "π (bar)",
      series: along({ draw: "draw_osmotic_pressure_bar", feed: "feed_osmotic_pressure_bar" }),
      desc: "Each stream's osmotic pressure along the membrane area." }), "solid: counter-current; dashed: co-current", true));
    const flux = [];
    for (const [fl, dash] of [["counter", null], ["co", "6 4"]]) {
      const r = res[fl];
      if (r) flux.push({ name: fl + "-current", color: col[2], dash: dash, points: r.profiles.area_m2.map((a, i) => [a, r.profiles.water_flux_lmh[i]]) });
    }
    box.appendChild(P.figure("plant-flux", C.line({ title: "Local water flux along the module", xLabel: "area from the feed inlet (m²)", yLabel: "Jw (LMH)",
      series: flux, desc: "The local water flux along the membrane area." }), "", true));
  }

  // ---- the plant ranking -----------------------------------------------------------
  function systemRequest() {
    const sc = P.clone(state.scenario || {});
    delete sc.uncertainty;
    delete sc.sweep;
    const b = sc.basis;
    sc.basis = { kind: "system" };
    if (b && b.kind === "osmotic-pressure") {
      if (b.multiple_of_feed !== undefined) sc.basis.multiple_of_feed = b.multiple_of_feed;
      else if (b.value !== undefined) { sc.basis.value = b.value; if (b.unit) sc.basis.unit = b.unit; }
    }
    const v = id => P.num(id);
    const rec = v("sys-recovery");
    sc.system = { recovery: rec === undefined ? undefined : rec / 100, product_m3_per_day: v("sys-product"),
      prices: { electricity_usd_per_kwh: v("sys-elec"), heat_usd_per_kwh: v("sys-heat"), membrane_usd_per_m2: v("sys-mem"), membrane_life_years: v("sys-life") } };
    return sc;
  }

  async function runSystem() {
    const id = ++systemSeq;
    $("system-error").hidden = true;
    const body = systemRequest();
    $("btn-system").disabled = true;
    $("system-status").textContent = "designing a module for every candidate…";
    const eng = await engine("system-status");
    if (eng.error) { $("btn-system").disabled = false; return systemFail(id, { message: eng.error.message }); }
    let reports = 0;
    $("system-progress").value = 0;
    document.body.dataset.systemProgress = "0";
    const r = await eng.call("screen", body, { onProgress: f => {
      $("system-progress").value = f;
      $("system-status").textContent = Math.round(100 * f) + " % of the candidates rated";
      document.body.dataset.systemProgress = String(++reports);
    } });
    $("btn-system").disabled = false;
    if (id !== systemSeq) return;
    if (!r.ok) return systemFail(id, r.data.error || { message: "unknown error" });
    lastSystem = { request: body, response: r.data };
    $("system-status").textContent = "";
    renderSystem(r.data);
    document.body.dataset.system = "done-" + id;
  }
  function systemFail(id, e) {
    const box = $("system-error");
    box.textContent = (e.field ? e.field + ": " : "") + e.message + (e.limit ? " (limit: " + e.limit + ")" : "");
    box.hidden = false;
    $("system-result").hidden = true;
    $("system-status").textContent = "";
    document.body.dataset.system = "error-" + id;
  }

  function renderSystem(d) {
    $("system-result").hidden = false;
    const s = d.system;
    $("system-plant").textContent = fmt(s.product_m3_per_day) + " m³/day of product at " + fmt(100 * s.recovery) + " % recovery, " + s.flow +
      "-current, draws at " + fmt(d.basis.target_osmotic_pressure_bar) + " bar; " + s.rated + " rated. How: " + s.method + ".";
    const tb = table($("system-table"), ["#", "solute", "cost (USD/m³)", "make-up (USD/m³)", "energy (USD/m³)", "membrane (USD/m³)", "make-up (g/m³)",
      "energy (kWh/m³)", "route", "area (m² per m³/day)", "coupon #"],
    d.candidates.map(c => {
      const m = c.system;
      return [String(c.rank), c.solute, fmt(m.cost_usd_per_m3), fmt(m.make_up_cost_usd_per_m3), fmt(m.energy_cost_usd_per_m3), fmt(m.membrane_cost_usd_per_m3),
        fmt(m.make_up_g_per_m3), fmt(m.energy_kwh_per_m3), m.regeneration_route, fmt(m.area_m2_per_m3_per_day), String(m.coupon_rank)];
    }));
    Array.from(tb.rows).forEach((tr, i) => { tr.dataset.solute = d.candidates[i].solute; tr.dataset.cost = String(d.candidates[i].system.cost_usd_per_m3); });
    const ex = clear($("system-excluded"));
    for (const x of d.excluded) ex.appendChild(h("li", { text: x.solute + " — " + x.reason + ": " + x.detail }));
  }

  Object.assign(P, { buildPlantPanel, refreshPlant, plantLast: () => lastPlant, systemLast: () => lastSystem });
})();
