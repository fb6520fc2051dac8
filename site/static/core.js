// Drawsift page, shared core: the page's state, small DOM and number
// helpers, display units, and the engine's defaults and limits. The other
// page scripts (form, results, plots, library, report, files, app) add
// their functions to the same namespace, window.DrawsiftPage, and call
// each other through it.
//
// Every default and every limit the form shows or checks is the engine's,
// read once at start-up with the `defaults` operation (engine/api
// Defaults); this file keeps only display words and colours, keyed by the
// names the engine reports.
"use strict";

(function () {
  const $ = id => document.getElementById(id);
  const VERSION = document.querySelector('meta[name="drawsift-engine-version"]').content;

  // ---- display words, keyed by the engine's names ----------------------------
  // The objectives' keys, order and direction (higher or lower is better)
  // come from the engine; these are only the words and colours shown for
  // them. A key without words shows the key itself.
  const OBJ_LABELS = {
    water_flux: "Water flux", specific_reverse_solute_flux: "Solute lost per litre (Js/Jw)", replenishment_cost: "Replenishment cost",
    regeneration_energy: "Regeneration energy", viscosity: "Viscosity", solubility_margin: "Solubility margin", scaling: "Scaling risk",
    flux_efficiency: "Flux efficiency", mass_concentration: "Mass of draw per litre",
  };
  const OBJ_COLOURS = {
    water_flux: "#1d4f91", specific_reverse_solute_flux: "#b5462a", replenishment_cost: "#a86b00", regeneration_energy: "#7a4a9e",
    viscosity: "#08737f", solubility_margin: "#2d7a3e", scaling: "#6b4f3a", flux_efficiency: "#b0306a", mass_concentration: "#4d5b69",
  };
  const OTHER_COLOUR = "#16202a";
  // Words the form shows for the engine's hazard flags (exclude_hazards).
  const HAZARD_WORDS = {
    oxidizer: "oxidiser", toxic: "toxic", corrosive: "corrosive", "ammonia-release": "releases ammonia",
    nutrient: "nutrient (feeds growth)", scaling: "forms scale", irritant: "irritant",
    "flammable-decomposition": "flammable when decomposed",
  };
  // Display-only water-flux units (the engine reports LMH):
  // 1 LMH = 1e-3 m / 3600 s = 1/3.6 µm/s; 1 GFD = 3.785411784 L / 0.09290304 m² / 24 h = 1.69766 LMH.
  const FLUX = { LMH: 1, "um/s": 1 / 3.6, GFD: 1 / 1.69766 };
  const FLUX_LABEL = { LMH: "LMH", "um/s": "µm/s", GFD: "GFD" };
  // The order pressure units appear in menus; the units and their factors
  // are the engine's (pressure_units_pa), any others follow these.
  const PRESSURE_ORDER = ["bar", "atm", "MPa", "psi", "kPa"];

  // ---- state ----------------------------------------------------------------
  // edits counts changes of the scenario; each finished run records the
  // count it ran with (body data-run-edit), so that "the page shows the
  // latest edit" is an event the page signals, not a guess.
  const state = {
    scenario: null, custom: [], prefs: { pressure: "bar", flux: "LMH", sflux: "gMH", plotCount: "5", cmax: 3, tab: "ranking" },
    library: [], membranes: [], feeds: [], result: null, robust: null, runSeq: 0, sort: null, current: null,
    engine: null, ready: false, plots: {}, sweep: null, defaults: null, edits: 0, stale: false, basisText: "", customRemoved: new Set(),
  };

  // ---- small helpers --------------------------------------------------------
  function h(tag, attrs) {
    const e = document.createElement(tag);
    if (attrs) for (const k in attrs) {
      const v = attrs[k];
      if (v === undefined || v === null || v === false) continue;
      if (k === "text") e.textContent = v;
      else if (k === "on") for (const ev in v) e.addEventListener(ev, v[ev]);
      else e.setAttribute(k, v === true ? "" : v);
    }
    for (let i = 2; i < arguments.length; i++) {
      const c = arguments[i];
      if (c === null || c === undefined) continue;
      e.appendChild(typeof c === "string" ? document.createTextNode(c) : c);
    }
    return e;
  }
  function clear(e) { while (e.firstChild) e.removeChild(e.firstChild); return e; }
  function num(id) {
    const v = $(id).value.trim();
    return v === "" ? undefined : Number(v);
  }
  function fmt(v, digits) {
    if (v === undefined || v === null || !isFinite(v)) return "—";
    const a = Math.abs(v);
    if (a !== 0 && (a >= 1e5 || a < 1e-3)) return v.toExponential(2);
    const d = digits !== undefined ? digits : a >= 100 ? 1 : a >= 10 ? 2 : 3;
    return v.toFixed(d);
  }
  function clone(o) { return JSON.parse(JSON.stringify(o)); }
  // debounce returns fn called ms after the last of a burst of calls;
  // its flush() calls a pending one now.
  function debounce(fn, ms) {
    let t = 0;
    const d = function () { clearTimeout(t); t = setTimeout(() => { t = 0; fn(); }, ms); };
    d.flush = () => { if (t) { clearTimeout(t); t = 0; fn(); } };
    return d;
  }
  // pct shows a fraction as a percentage without binary noise (0.57 → 57).
  function pct(f) { return Number((100 * f).toPrecision(12)); }
  // prune drops undefined values (an empty field means "not given").
  function prune(o) {
    if (Array.isArray(o)) return o.map(prune);
    if (o && typeof o === "object") {
      const r = {};
      for (const k in o) if (o[k] !== undefined) r[k] = prune(o[k]);
      return r;
    }
    return o;
  }
  function status(msg, bad) {
    const e = $("engine-status");
    e.textContent = msg;
    e.classList.toggle("bad", !!bad);
  }
  function banner(msg) {
    const b = $("banner");
    b.textContent = msg || "";
    b.hidden = !msg;
  }
  // A screen candidate is a solute ID (a string) or a blend, {id, blend:
  // [{solute, mole_fraction | mass_fraction}]}; candId is its name.
  function candId(c) { return typeof c === "string" ? c : c.id; }
  // candidate is the scenario's entry named id (a blend's object, else id).
  function candidate(id) {
    return (state.scenario && state.scenario.candidates || []).find(c => candId(c) === id) || id;
  }
  function isBlend(c) { return c !== null && typeof c === "object" && Array.isArray(c.blend); }
  // candSolutes lists the solute IDs a candidate uses: itself, or a blend's parts.
  function candSolutes(c) { return isBlend(c) ? c.blend.map(p => p.solute) : [c]; }
  function solute(id) {
    const k = String(id).toLowerCase();
    return state.library.find(s => s.id.toLowerCase() === k) || state.custom.find(s => s.id.toLowerCase() === k);
  }

  // ---- the engine's defaults and limits --------------------------------------------
  // setDefaults keeps the engine's `defaults` answer; it throws if a part
  // the page needs is missing (an engine older than the page).
  function setDefaults(d) {
    for (const k of ["limits", "weights", "objectives", "pareto_objectives", "channel", "hazard_flags", "pressure_units_pa", "concentration_units",
      "basis_with_feed", "basis_without_feed", "osmotic_models", "osmotic_model_aliases", "score_normalisations", "score_reference_solute"]) {
      if (!d || d[k] === undefined) throw new Error("the engine's defaults lack " + k);
    }
    if (!(d.pressure_units_pa.bar > 0) || !(d.gas_constant_j_per_mol_k > 0)) throw new Error("the engine's defaults lack the bar or the gas constant");
    state.defaults = d;
  }
  function defaults() { return state.defaults; }
  // limit is the engine's range for a key of its defaults listing
  // ("temperature_c", "uncertainty.samples", "basis.osmotic_pressure_bar").
  function limit(key) {
    const l = state.defaults.limits[key];
    if (!l) throw new Error("the engine reports no limit for " + key);
    return l;
  }
  // dflt is the engine's default for a key (undefined when it has none).
  function dflt(key) { return limit(key).default; }
  // bound prints a number the way the engine's limit texts do (1e-8, not 1e-08).
  function bound(v) { return String(Number(v.toPrecision(12))); }
  // limitText is the limit of key in the engine's words; with a scale (a
  // field the form shows in other units, e.g. a fraction as %), the same
  // bounds scaled and followed by unit.
  function limitText(key, scale, unit) {
    const l = limit(key);
    if (!scale || scale === 1) return l.text;
    const lo = l.min !== undefined ? bound(l.min * scale) : null, hi = l.max !== undefined ? bound(l.max * scale) : null;
    const a = l.min_exclusive ? "> " : "≥ ", b = l.max_exclusive ? "< " : "≤ ";
    let s = hi === null ? a + lo : lo === null ? b + hi : !l.min_exclusive && !l.max_exclusive ? lo + "–" + hi : a + lo + " and " + b + hi;
    if (l.integer) s += " (whole number)";
    return unit ? s + " " + unit : s;
  }
  // inLimit reports whether v (in the form's units, scale × the engine's)
  // lies within the engine's range for key.
  function inLimit(key, v, scale) {
    const l = limit(key), s = scale || 1;
    if (!isFinite(v)) return false;
    if (l.min !== undefined && (l.min_exclusive ? !(v > l.min * s) : !(v >= l.min * s))) return false;
    if (l.max !== undefined && (l.max_exclusive ? !(v < l.max * s) : !(v <= l.max * s))) return false;
    return !l.integer || Number.isInteger(v);
  }
  function objectiveKeys() { return state.defaults.objectives.map(o => o.key); }
  function objLabel(k) { return OBJ_LABELS[k] || k; }
  function objColour(k) { return OBJ_COLOURS[k] || OTHER_COLOUR; }
  function objSense(k) {
    const o = state.defaults.objectives.find(o => o.key === k);
    return o && o.maximise ? "higher is better" : "lower is better";
  }
  function hazardFlags() { return state.defaults.hazard_flags; }
  function hazardWords(f) { return HAZARD_WORDS[f] || f; }
  // pressureUnits lists the engine's pressure units in menu order.
  function pressureUnits() {
    const all = Object.keys(state.defaults.pressure_units_pa);
    return PRESSURE_ORDER.filter(u => all.includes(u)).concat(all.filter(u => !PRESSURE_ORDER.includes(u)).sort());
  }
  // barTo converts a pressure in bar to unit, with the engine's factors.
  function barTo(bar, unit) {
    const pa = state.defaults.pressure_units_pa;
    return bar * pa.bar / pa[unit];
  }
  // gasConstantLBar is R in L·bar/(mol·K): R in J/(mol·K) = Pa·m³/(mol·K),
  // × 1000 L/m³, ÷ the engine's Pa per bar.
  function gasConstantLBar() {
    const d = state.defaults;
    return d.gas_constant_j_per_mol_k * 1000 / d.pressure_units_pa.bar;
  }

  // ---- display units --------------------------------------------------------
  function pUnit() { return state.prefs.pressure; }
  function pConv(bar) { return barTo(bar, pUnit()); }
  function fConv(lmh) { return lmh * FLUX[state.prefs.flux]; }
  function fLabel() { return FLUX_LABEL[state.prefs.flux]; }
  function sfLabel() { return state.prefs.sflux === "gMH" ? "gMH" : "mmol m⁻² h⁻¹"; }
  function sfValue(c) { return state.prefs.sflux === "gMH" ? c.reverse_solute_flux_gmh : c.reverse_solute_flux_mmol_per_m2_h; }

  window.DrawsiftPage = {
    $, VERSION, state, S: window.DrawsiftStore, C: window.DrawsiftCharts,
    h, clear, num, fmt, clone, debounce, pct, prune, status, banner, solute, candId, candidate, isBlend, candSolutes,
    setDefaults, defaults, limit, dflt, limitText, inLimit, objectiveKeys, objLabel, objColour, objSense,
    hazardFlags, hazardWords, pressureUnits, barTo, gasConstantLBar,
    pUnit, pConv, fConv, fLabel, sfLabel, sfValue,
  };
})();
