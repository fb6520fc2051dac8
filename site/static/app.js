// Drawsift page: the scenario form, the ranking, the plots, the library,
// the user's saved work and the printable report. Plain DOM code; every
// piece of user or file data reaches the page through textContent or
// attribute setters, never as markup.
"use strict";

(function () {
  const S = window.DrawsiftStore, C = window.DrawsiftCharts;
  const $ = id => document.getElementById(id);
  const VERSION = document.querySelector('meta[name="drawsift-engine-version"]').content;

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
  const DEFAULT_WEIGHTS = { water_flux: 0.25, specific_reverse_solute_flux: 0.2, replenishment_cost: 0.15, regeneration_energy: 0.1,
    viscosity: 0.1, solubility_margin: 0.1, scaling: 0.1, flux_efficiency: 0, mass_concentration: 0 };

  const OBJECTIVES = [
    ["water_flux", "Water flux", "higher is better"],
    ["specific_reverse_solute_flux", "Solute lost per litre (Js/Jw)", "lower is better"],
    ["replenishment_cost", "Replenishment cost", "lower is better"],
    ["regeneration_energy", "Regeneration energy", "lower is better"],
    ["viscosity", "Viscosity", "lower is better"],
    ["solubility_margin", "Solubility margin", "higher is better"],
    ["scaling", "Scaling risk", "lower is better"],
    ["flux_efficiency", "Flux efficiency", "higher is better"],
    ["mass_concentration", "Mass of draw per litre", "lower is better"],
  ];
  const OBJ_COLOURS = {
    water_flux: "#1d4f91", specific_reverse_solute_flux: "#b5462a", replenishment_cost: "#a86b00", regeneration_energy: "#7a4a9e",
    viscosity: "#08737f", solubility_margin: "#2d7a3e", scaling: "#6b4f3a", flux_efficiency: "#b0306a", mass_concentration: "#4d5b69",
  };
  // Hazard flags the engine accepts in exclude_hazards (engine/api), with
  // the words the form shows for them.
  const HAZARDS = [
    ["oxidizer", "oxidiser"], ["toxic", "toxic"], ["corrosive", "corrosive"], ["ammonia-release", "releases ammonia"],
    ["nutrient", "nutrient (feeds growth)"], ["scaling", "forms scale"], ["irritant", "irritant"],
    ["flammable-decomposition", "flammable when decomposed"],
  ];
  // The engine's defaults for fields the form omits when they hold them
  // (screen.DefaultPareto; regeneration_recovery 0.5).
  const DEFAULT_PARETO = ["water_flux", "specific_reverse_solute_flux", "replenishment_cost"];
  const DEFAULT_RECOVERY_PCT = 50;
  const DEFAULT_CHANNEL = { height_mm: 2, width_mm: 26, length_mm: 77, crossflow_velocity_m_per_s: 0.25, spacer: false };
  const PRESSURE = { bar: 1, atm: 1 / 1.01325, MPa: 0.1, psi: 14.503773773 };
  const FLUX = { LMH: 1, "um/s": 1 / 3.6, GFD: 1 / 1.69766 }; // 1 GFD = 3.785411784 L / 0.09290304 m² / 24 h
  const FLUX_LABEL = { LMH: "LMH", "um/s": "µm/s", GFD: "GFD" };
  const R_BAR_L = 0.0831446261815324; // gas constant, L·bar/(mol·K) (CODATA 2018, exact SI value)

  // ---- state ----------------------------------------------------------------
  const state = {
    scenario: null, custom: [], prefs: { pressure: "bar", flux: "LMH", sflux: "gMH", plotCount: "5", cmax: 3, tab: "ranking" },
    library: [], membranes: [], feeds: [], result: null, robust: null, runSeq: 0, sort: null, current: null,
    engine: null, ready: false, plots: {}, sweep: null,
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
  function debounce(fn, ms) {
    let t = 0;
    return function () { clearTimeout(t); t = setTimeout(fn, ms); };
  }
  function pUnit() { return state.prefs.pressure; }
  function pConv(bar) { return bar * PRESSURE[pUnit()]; }
  function fConv(lmh) { return lmh * FLUX[state.prefs.flux]; }
  function fLabel() { return FLUX_LABEL[state.prefs.flux]; }
  function sfLabel() { return state.prefs.sflux === "gMH" ? "gMH" : "mmol m⁻² h⁻¹"; }
  function sfValue(c) { return state.prefs.sflux === "gMH" ? c.reverse_solute_flux_gmh : c.reverse_solute_flux_mmol_per_m2_h; }
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
  function solute(id) {
    const k = String(id).toLowerCase();
    return state.library.find(s => s.id.toLowerCase() === k) || state.custom.find(s => s.id.toLowerCase() === k);
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
  const SHAPE_SCENARIO = {
    object: {
      feed: { object: { preset: str_, solute: str_, concentration: num_, unit: str_, ph: num_,
        ions: ["array", { object: { symbol: str_, charge: "integer", molar_mass_g_per_mol: num_, mg_per_l: num_ }, required: ["symbol", "charge", "molar_mass_g_per_mol", "mg_per_l"] }] }, hint: true },
      membrane: { object: { preset: str_, a_lmh_per_bar: num_, b_lmh: num_, b_nacl_lmh: num_, s_um: num_ }, hint: true },
      orientation: v => ["AL-FS", "AL-DS"].includes(v) ? "" : "must be \"AL-FS\" or \"AL-DS\"",
      orientations: ["array", v => ["AL-FS", "AL-DS"].includes(v) ? "" : "must be \"AL-FS\" or \"AL-DS\""],
      temperature_c: num_, k_draw_m_per_s: num_, k_feed_m_per_s: num_,
      channel: { object: { height_mm: num_, width_mm: num_, length_mm: num_, crossflow_velocity_m_per_s: num_, spacer: bool_, feed_crossflow_velocity_m_per_s: num_ }, hint: true },
      external_cp: bool_,
      candidates: ["array", str_],
      custom_solutes: ["array", SHAPE_CUSTOM],
      basis: { object: { kind: v => ["osmotic-pressure", "concentration", "water-flux"].includes(v) ? "" : "must be osmotic-pressure, concentration or water-flux", value: num_, unit: str_, multiple_of_feed: num_ }, required: ["kind"], hint: true },
      osmotic_model: v => ["real", "van-t-hoff"].includes(v) ? "" : "must be \"real\" or \"van-t-hoff\"",
      weights: v => {
        if (v === null || typeof v !== "object" || Array.isArray(v)) return "must be an object of weights";
        for (const k in v) {
          if (!OBJECTIVES.some(o => o[0] === k)) return "has an unknown objective \"" + k + "\"";
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

  // ---- the form ----------------------------------------------------------------
  function fillPresets() {
    const fp = clear($("feed-preset"));
    for (const f of state.feeds) fp.appendChild(h("option", { value: "preset:" + f.id, text: f.name }));
    fp.appendChild(h("option", { value: "custom", text: "Custom: a solute at a concentration, with ions" }));
    const mp = clear($("mem-preset"));
    for (const m of state.membranes) mp.appendChild(h("option", { value: m.id, text: m.name }));
    mp.appendChild(h("option", { value: "custom", text: "Custom A, B, S" }));
    const pick = clear($("feed-solute-pick"));
    for (const s of state.library) pick.appendChild(h("option", { value: s.id, text: s.id + " — " + s.name }));
    const fam = $("lib-family");
    const fams = Array.from(new Set(state.library.map(s => s.family).concat(state.custom.length ? ["custom"] : []))).sort();
    clear(fam).appendChild(h("option", { value: "", text: "all families" }));
    for (const f of fams) fam.appendChild(h("option", { value: f, text: f }));
  }

  function basisUnits(kind) {
    if (kind === "osmotic-pressure") return [["bar", "bar"], ["atm", "atm"], ["MPa", "MPa"], ["psi", "psi"], ["kPa", "kPa"], ["xfeed", "× feed π"]];
    if (kind === "concentration") return [["mol/L", "mol/L"], ["mol/kg", "mol/kg"], ["g/L", "g/L"], ["g/kg", "g/kg"], ["wt%", "wt%"]];
    return [["LMH", "LMH"]];
  }
  function setBasisUnits(kind, unit) {
    const sel = clear($("basis-unit"));
    for (const [v, t] of basisUnits(kind)) sel.appendChild(h("option", { value: v, text: t }));
    if (unit) sel.value = unit;
    if (!sel.value) sel.selectedIndex = 0;
  }

  function buildWeights() {
    const box = clear($("weights"));
    for (const [k, label, sense] of OBJECTIVES) {
      const id = "w-" + k;
      const out = h("output", { for: id, id: id + "-out" });
      box.appendChild(h("div", { class: "w" },
        h("label", { for: id, title: sense, text: label }),
        h("input", { type: "range", id: id, min: "0", max: "1", step: "0.05", "data-key": k, "aria-describedby": id + "-out" }),
        out));
    }
  }

  // buildRules makes the hazard and Pareto checkboxes.
  function buildRules() {
    const hz = clear($("hazard-boxes"));
    for (const [flag, text] of HAZARDS) {
      hz.appendChild(h("label", { class: "check" }, h("input", { type: "checkbox", id: "hz-" + flag, "data-flag": flag }), text));
    }
    const po = clear($("pareto-boxes"));
    for (const [k, text] of OBJECTIVES) {
      po.appendChild(h("label", { class: "check" }, h("input", { type: "checkbox", id: "po-" + k, "data-key": k }), text));
    }
  }
  // pct shows a fraction as a percentage without binary noise (0.57 → 57).
  function pct(f) { return Number((100 * f).toPrecision(12)); }
  function kMode() { return document.querySelector('input[name="k-mode"]:checked').value; }
  function updateKUI() { $("k-given-box").hidden = kMode() !== "given"; }

  function writeForm(sc) {
    const feed = sc.feed || { preset: "deionised-water" };
    $("feed-preset").value = feed.preset ? "preset:" + feed.preset : "custom";
    if (!$("feed-preset").value) $("feed-preset").selectedIndex = 0;
    const pre = feed.preset && state.feeds.find(f => f.id === feed.preset);
    if (pre) {
      $("feed-conc").value = feed.concentration !== undefined ? feed.concentration : (pre.osmotic.concentration || "");
      $("feed-unit").value = pre.osmotic.unit || "g/kg";
    } else if (!feed.preset) {
      $("feed-conc").value = feed.concentration !== undefined ? feed.concentration : "";
      $("feed-unit").value = feed.unit || "g/L";
    }
    $("feed-solute-pick").value = feed.solute || "NaCl";
    $("feed-ph").value = !feed.preset && feed.ph !== undefined ? feed.ph : "";
    renderIons(feed.ions || []);
    updateFeedUI();

    const mem = sc.membrane || { preset: "tfc-standard" };
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
    $("mem-desc").textContent = mp ? mp.description + " " + (mp.test_conditions || "") : "Your own membrane: A, B (for NaCl) and S as measured in an FO test.";

    const o = sc.orientation || "AL-FS";
    for (const r of document.querySelectorAll('input[name="orientation"]')) r.checked = r.value === o;
    $("both-orient").checked = !!(sc.orientations && sc.orientations.length);
    $("temp").value = sc.temperature_c !== undefined ? sc.temperature_c : 25;
    $("osm-model").value = sc.osmotic_model || "real";
    const ch = Object.assign({}, DEFAULT_CHANNEL, sc.channel || {});
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
    for (const [flag] of HAZARDS) $("hz-" + flag).checked = hz.includes(flag);
    $("allow-extrap").checked = !!sc.allow_extrapolation;
    $("regen-recovery").value = sc.regeneration_recovery !== undefined ? pct(sc.regeneration_recovery) : DEFAULT_RECOVERY_PCT;
    const po = (sc.pareto_objectives || DEFAULT_PARETO).map(x => String(x).trim().toLowerCase());
    for (const [k] of OBJECTIVES) $("po-" + k).checked = po.includes(k);

    const b = sc.basis || { kind: "osmotic-pressure", multiple_of_feed: 2 };
    $("basis-kind").value = b.kind;
    if (b.multiple_of_feed !== undefined) { setBasisUnits(b.kind, "xfeed"); $("basis-value").value = b.multiple_of_feed; }
    else { setBasisUnits(b.kind, b.unit || (b.kind === "water-flux" ? "LMH" : b.kind === "concentration" ? "mol/L" : "bar")); $("basis-value").value = b.value !== undefined ? b.value : ""; }

    const w = sc.weights || DEFAULT_WEIGHTS;
    for (const [k] of OBJECTIVES) {
      const inp = $("w-" + k);
      inp.value = w[k] || 0;
      $("w-" + k + "-out").textContent = Number(inp.value).toFixed(2);
    }
    const u = sc.uncertainty || {};
    const memRec = presetRec || {};
    $("unc-samples").value = u.samples !== undefined ? u.samples : 1000;
    $("unc-a").value = u.a_rel_sd !== undefined ? u.a_rel_sd : memRec.a_rel_sd !== undefined ? memRec.a_rel_sd : 0.1;
    $("unc-b").value = u.b_rel_sd !== undefined ? u.b_rel_sd : memRec.b_rel_sd !== undefined ? memRec.b_rel_sd : 0.3;
    $("unc-s").value = u.s_rel_sd !== undefined ? u.s_rel_sd : memRec.s_rel_sd !== undefined ? memRec.s_rel_sd : 0.15;
    $("unc-pi").value = u.osmotic_rel_sd !== undefined ? u.osmotic_rel_sd : "";
    $("unc-pi").placeholder = "0.02 (0.10 if ideal only)";
    $("unc-d").value = u.diffusivity_rel_sd !== undefined ? u.diffusivity_rel_sd : 0.05;
    $("unc-prices").checked = u.prices !== false;
    $("seed").value = sc.seed !== undefined ? sc.seed : 1;
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

  function renderIons(ions) {
    const tb = clear($("feed-ions"));
    ions.forEach((ion, i) => {
      const tr = h("tr", {});
      const cell = (key, type, label) => h("td", {}, h("input", { type: type, value: ion[key] !== undefined ? ion[key] : "", "data-ion": String(i), "data-key": key, "aria-label": label + " of ion " + (i + 1), step: "any" }));
      tr.appendChild(cell("symbol", "text", "Symbol"));
      tr.appendChild(cell("charge", "number", "Charge"));
      tr.appendChild(cell("molar_mass_g_per_mol", "number", "Molar mass"));
      tr.appendChild(cell("mg_per_l", "number", "Concentration in mg/L"));
      tr.appendChild(h("td", {}, h("button", { type: "button", class: "small", "aria-label": "Remove ion " + (i + 1), text: "×",
        on: { click: () => { const sc = readForm(); sc.feed.ions.splice(i, 1); renderIons(sc.feed.ions); changed(); } } })));
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
    const o = document.querySelector('input[name="orientation"]:checked').value;
    sc.orientation = o;
    if ($("both-orient").checked) sc.orientations = [o === "AL-FS" ? "AL-DS" : "AL-FS"];
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
    sc.weights = {};
    for (const [k] of OBJECTIVES) sc.weights[k] = Number($("w-" + k).value);
    sc.uncertainty = { samples: num("unc-samples"), a_rel_sd: num("unc-a"), b_rel_sd: num("unc-b"), s_rel_sd: num("unc-s"),
      diffusivity_rel_sd: num("unc-d"), prices: $("unc-prices").checked };
    const pi = num("unc-pi");
    if (pi !== undefined) sc.uncertainty.osmotic_rel_sd = pi;
    sc.seed = num("seed");
    // Screening rules: each is omitted while it holds the engine's default.
    const hz = HAZARDS.map(x => x[0]).filter(f => $("hz-" + f).checked);
    if (hz.length) sc.exclude_hazards = hz;
    if ($("allow-extrap").checked) sc.allow_extrapolation = true;
    const rec = num("regen-recovery");
    if (rec !== DEFAULT_RECOVERY_PCT) sc.regeneration_recovery = rec === undefined ? undefined : rec / 100;
    const po = OBJECTIVES.map(o => o[0]).filter(k => $("po-" + k).checked);
    if (!(po.length === DEFAULT_PARETO.length && DEFAULT_PARETO.every(k => po.includes(k)))) sc.pareto_objectives = po;
    // A field the form does not show (set in an imported or linked file)
    // is kept as it is.
    if (prev.channel && prev.channel.feed_crossflow_velocity_m_per_s !== undefined) sc.channel.feed_crossflow_velocity_m_per_s = prev.channel.feed_crossflow_velocity_m_per_s;
    const customs = state.custom.filter(c => (sc.candidates || []).some(id => id.toLowerCase() === c.id.toLowerCase()));
    if (customs.length) sc.custom_solutes = clone(customs);
    return prune(sc);
  }

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

  // checkForm finds empty required numbers and values out of the form's
  // ranges before the engine is asked; it returns the problems found, the
  // first one first.
  function checkForm(sc) {
    const errs = [];
    const custom = sc.membrane && !sc.membrane.preset;
    const drawB = $("mem-bdraw").value.trim() !== "";
    const need = [["temp", "temperature_c", "the temperature is required"], ["basis-value", "basis.value", "a target value is required"]];
    if (custom) need.push(["mem-a", "membrane.a_lmh_per_bar", "A is required"], ["mem-b", drawB ? "membrane.b_nacl_lmh" : "membrane.b_lmh", "B is required"], ["mem-s", "membrane.s_um", "S is required"]);
    if (sc.feed && sc.feed.solute !== undefined) need.push(["feed-conc", "feed.concentration", "a concentration is required"]);
    for (const [id, field, msg] of need) if ($(id).value.trim() === "" || !isFinite(Number($(id).value))) { errs.push({ field: field, message: msg }); break; }
    for (const [id, field] of [["seed", "seed"], ["unc-samples", "uncertainty.samples"]]) {
      const v = $(id).value.trim();
      if (v !== "" && !(Number.isInteger(Number(v)) && Number(v) >= 0)) { errs.push({ field: field, message: "must be a whole number ≥ 0" }); break; }
    }
    // range(id, field, lo, hi, blankOK, what): one number within [lo, hi].
    const range = (id, field, lo, hi, blankOK, what) => {
      const raw = $(id).value.trim();
      if (raw === "" && blankOK) return;
      const v = Number(raw);
      if (raw === "" || !isFinite(v)) errs.push({ field: field, message: what + " is required", limit: lo + "–" + hi });
      else if (!(v >= lo && v <= hi)) errs.push({ field: field, message: what + " " + v + " is outside " + lo + "–" + hi, limit: lo + "–" + hi });
    };
    if (sc.feed && !sc.feed.preset) range("feed-ph", "feed.ph", 0, 14, true, "the pH");
    if (drawB) {
      const v = Number($("mem-bdraw").value);
      if (!(v > 0 && v <= 100)) errs.push({ field: "membrane.b_draw", message: "B of the draw solutes must be above 0 and at most 100 LMH (or blank)", limit: "0 < B ≤ 100 LMH" });
    }
    if (kMode() === "given") {
      range("k-draw", "k_draw_m_per_s", 1e-8, 1, true, "k on the draw side");
      range("k-feed", "k_feed_m_per_s", 1e-8, 1, true, "k on the feed side");
      if ($("k-draw").value.trim() === "" && $("k-feed").value.trim() === "") {
        errs.push({ field: "k_draw_m_per_s", message: "give k for at least one side, or choose “from the channel”" });
      }
    }
    range("regen-recovery", "regeneration_recovery", 5, 95, false, "the water recovered (%)");
    const po = OBJECTIVES.filter(o => $("po-" + o[0]).checked).length;
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
    "uncertainty.diffusivity_rel_sd": "unc-d", "seed": "seed", "osmotic_model": "osm-model",
  };
  function groupOf(field) {
    const f = field || "";
    if (f.startsWith("feed")) return "feed";
    if (f.startsWith("membrane")) return "membrane";
    if (/^(temperature_c|orientation|channel|external_cp|k_|osmotic_model)/.test(f)) return "operation";
    if (f.startsWith("basis")) return "basis";
    if (f.startsWith("weights")) return "weights";
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
    let text = (field === "membrane.b_draw" ? "membrane.b_lmh" : field) + (field ? ": " : "") + err.message;
    if (err.limit !== undefined && err.limit !== null) text += " (limit: " + (Array.isArray(err.limit) ? err.limit.join(", ") : err.limit) + ")";
    const own = fieldSlot(field);
    const g = groupOf(field);
    const slot = (own && document.querySelector('#scenario-form .field-error[data-field="' + own + '"]')) ||
      (g && document.querySelector('#scenario-form .field-error[data-for="' + g + '"]'));
    if (slot) {
      slot.textContent = text;
      for (let d = slot.closest("details"); d; d = d.parentElement && d.parentElement.closest("details")) d.open = true;
    }
    const key = own === "membrane.b_draw" ? own : field;
    const inp = $(FIELD_INPUT[key] || FIELD_INPUT[key.replace(/\[\d+\].*$/, "")] || "");
    if (inp) inp.setAttribute("aria-invalid", "true");
    $("run-error").textContent = "The screen did not run — " + text + (slot ? " (see the scenario form)" : "");
    $("run-error").hidden = false;
  }

  // showErrors shows each problem beside its field; the summary above the
  // results names the first.
  function showErrors(list) { for (let i = list.length - 1; i >= 0; i--) showError(list[i]); }

  // ---- running the engine ------------------------------------------------------
  function changed() {
    const sc = readForm();
    state.scenario = sc;
    S.save(S.KEY_SCENARIO, sc);
    scheduleRun();
  }
  const scheduleRun = debounce(runScreen, 250);

  async function runScreen() {
    if (!state.ready) return;
    const sc = state.scenario;
    clearErrors();
    const pre = checkForm(sc);
    if (pre.length) { showErrors(pre); document.body.dataset.run = "invalid-" + (++state.runSeq); return; }
    const seq = ++state.runSeq;
    const t0 = performance.now();
    $("run-summary").textContent = "Screening…";
    const r = await state.engine.call("screen", engineScenario(sc, false));
    if (seq !== state.runSeq) return; // a newer run has started
    if (!r.ok) {
      showError(r.data.error || { message: "unknown error" });
      $("run-summary").textContent = "No ranking: fix the field named below.";
      document.body.dataset.run = "error-" + seq;
      return;
    }
    state.result = r.data;
    state.robust = null;
    renderResult(r.data, performance.now() - t0);
    if (!document.body.dataset.firstResultMs) document.body.dataset.firstResultMs = String(Math.round(performance.now()));
    document.body.dataset.run = "done-" + seq;
    renderPlots(seq);
  }

  // ---- results ------------------------------------------------------------------
  function columns() {
    const other = state.result && state.result.candidates.length && state.result.candidates[0].other_orientations;
    const cols = [
      { key: "rank", label: "Rank", unit: "", get: c => c.rank, fmt: v => String(v) },
      { key: "solute", label: "Solute", unit: "", get: c => c.solute, text: true },
      { key: "score", label: "Score", unit: "0–1", get: c => c.score, fmt: v => v.toFixed(3) },
      { key: "concentration_mol_per_l", label: "Draw conc.", unit: "mol/L", get: c => c.concentration_mol_per_l },
      { key: "concentration_g_per_l", label: "Draw conc.", unit: "g/L", get: c => c.concentration_g_per_l },
      { key: "osmotic_pressure_bar", label: "π real", unit: pUnit(), get: c => pConv(c.osmotic_pressure_bar) },
      { key: "van_t_hoff_bar", label: "π ideal", title: "van 't Hoff osmotic pressure, π = ν c R T", unit: pUnit(), get: c => pConv(c.van_t_hoff_bar) },
      { key: "water_flux_lmh", label: "Jw " + state.result.orientation, unit: fLabel(), get: c => fConv(c.water_flux_lmh) },
    ];
    if (other) for (let i = 0; i < other.length; i++) {
      cols.push({ key: "other_" + i, label: "Jw " + other[i].orientation, unit: fLabel(),
        get: c => c.other_orientations && c.other_orientations[i] && !c.other_orientations[i].reason ? fConv(c.other_orientations[i].water_flux_lmh) : NaN });
    }
    cols.push(
      { key: "reverse_solute_flux", label: "Js", unit: sfLabel(), get: sfValue },
      { key: "specific_reverse_solute_flux_g_per_l", label: "Js/Jw", unit: "g/L", get: c => c.specific_reverse_solute_flux_g_per_l },
      { key: "replenishment_cost_usd_per_m3", label: "Replenishment", unit: "USD/m³", get: c => c.replenishment_cost_usd_per_m3 },
      { key: "min_regeneration_energy_kwh_per_m3", label: "Regen. energy (min.)", unit: "kWh/m³", get: c => c.min_regeneration_energy_kwh_per_m3 },
      { key: "viscosity_mpa_s", label: "Viscosity", unit: "mPa·s", get: c => c.viscosity_mpa_s },
      { key: "solubility_margin_fraction", label: "Solubility margin", unit: "%", get: c => 100 * c.solubility_margin_fraction, fmt: v => v.toFixed(0) },
      { key: "max_saturation_index", label: "Max. sat. index", unit: "log SI", get: c => c.max_saturation_index },
      { key: "flux_efficiency", label: "Flux efficiency", unit: "%", get: c => 100 * c.flux_efficiency, fmt: v => v.toFixed(1) },
    );
    return cols;
  }

  function renderResult(res, ms) {
    const b = res.basis;
    let basis = b.kind === "osmotic-pressure" ? "equal osmotic pressure " + fmt(pConv(b.target_osmotic_pressure_bar)) + " " + pUnit()
      : b.kind === "concentration" ? "equal concentration " + fmt(b.concentration) + " " + b.unit
        : "equal water flux " + fmt(fConv(b.target_water_flux_lmh)) + " " + fLabel();
    const ori = res.orientation === "AL-FS" ? "FO mode (AL-FS)" : "PRO mode (AL-DS)";
    $("run-summary").textContent = "Ranked " + res.candidates.length + " of " + (res.candidates.length + res.excluded.length) +
      " candidates at " + basis + "; " + ori + "; feed π " + fmt(pConv(res.feed_osmotic_pressure_bar)) + " " + pUnit() +
      (ms ? "; computed in " + Math.round(ms) + " ms." : ".");
    renderTable();
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
    renderSources();
    renderReport();
  }

  function renderTable() {
    const res = state.result;
    if (!res) return;
    const cols = columns();
    const thead = clear($("ranking").tHead);
    const tr = h("tr", {});
    for (const c of cols) {
      const sorted = state.sort && state.sort.key === c.key;
      const th = h("th", { scope: "col", "aria-sort": sorted ? (state.sort.dir > 0 ? "ascending" : "descending") : null });
      th.appendChild(h("button", { type: "button", "data-key": c.key, title: c.title || null, on: { click: () => sortBy(c.key) } },
        c.label, c.unit ? h("span", { class: "unit", text: "(" + c.unit + ")" }) : null));
      tr.appendChild(th);
    }
    thead.appendChild(tr);
    let rows = res.candidates.slice();
    if (state.sort) {
      const col = cols.find(c => c.key === state.sort.key);
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
          row.appendChild(h("th", { scope: "row", title: c.name + (c.pareto_optimal ? " — on the Pareto front" : "") }, c.solute));
        } else if (col.key === "score") {
          const td = h("td", { class: "score" }, v.toFixed(3));
          const bar = h("div", { class: "bar", role: "img", "aria-label": contribText(c) });
          for (const [k] of OBJECTIVES) {
            const part = (c.score_contributions || {})[k];
            if (!part) continue;
            const s = h("span", { title: label(k) + ": " + part.toFixed(3) });
            s.style.width = (100 * part) + "%";
            s.style.background = OBJ_COLOURS[k];
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
    const lg = clear($("contrib-legend"));
    for (const [k, lab] of OBJECTIVES) {
      if (!(res.weights[k] > 0)) continue;
      const i = h("i", {});
      i.style.background = OBJ_COLOURS[k];
      lg.appendChild(h("span", {}, i, lab + " (weight " + res.weights[k].toFixed(2) + ")"));
    }
  }
  function label(k) { const o = OBJECTIVES.find(o => o[0] === k); return o ? o[1] : k; }
  function contribText(c) {
    return "Score " + c.score.toFixed(3) + ": " + Object.keys(c.score_contributions || {}).map(k => label(k) + " " + c.score_contributions[k].toFixed(3)).join(", ");
  }
  function sortBy(key) {
    if (state.sort && state.sort.key === key) state.sort.dir = -state.sort.dir;
    else state.sort = { key: key, dir: key === "solute" || key === "rank" ? 1 : -1 };
    renderTable();
    const btn = $("ranking").querySelector('thead button[data-key="' + CSS.escape(key) + '"]');
    if (btn) btn.focus();
  }

  // ---- robustness -------------------------------------------------------------
  let robustAbort = null;
  async function runRobust() {
    if (!state.ready || robustAbort) return;
    clearErrors();
    const pre = checkForm(state.scenario);
    if (pre.length) { showErrors(pre); return; }
    const sc = engineScenario(state.scenario, true);
    if (!sc.uncertainty) sc.uncertainty = {};
    if (!sc.uncertainty.samples) sc.uncertainty.samples = 1000;
    robustAbort = new AbortController();
    $("btn-robust").disabled = true; $("btn-robust-cancel").disabled = false;
    $("robust-progress").value = 0;
    $("robust-status").textContent = "Running " + sc.uncertainty.samples + " samples…";
    document.body.dataset.robust = "running";
    const t0 = performance.now();
    const r = await state.engine.call("screen", sc, {
      signal: robustAbort.signal,
      onProgress: f => { $("robust-progress").value = f; $("robust-status").textContent = Math.round(100 * f) + " % of " + sc.uncertainty.samples + " samples"; },
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
      showError(r.data.error);
      $("robust-status").textContent = "Failed.";
      document.body.dataset.robust = "error";
      return;
    }
    $("robust-progress").value = 1;
    $("robust-status").textContent = "Done: " + r.data.robustness.samples + " samples in " + ((performance.now() - t0) / 1000).toFixed(1) + " s (seed " + r.data.robustness.seed + ").";
    state.robust = r.data;
    renderRobust();
    renderSources();
    renderReport();
    document.body.dataset.robust = "done";
  }

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
  }

  // ---- plots ---------------------------------------------------------------------
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

  function figure(key, svg, note) {
    const fig = h("figure", { class: "plot", "data-plot": key });
    fig.appendChild(svg);
    const cap = h("figcaption", {}, h("span", { text: note || "" }));
    const btns = h("span", {});
    btns.appendChild(h("button", { type: "button", class: "small", text: "SVG", "aria-label": "Export “" + svg.querySelector("title").textContent + "” as SVG",
      on: { click: () => S.download("drawsift-" + key + ".svg", C.serialise(svg), "image/svg+xml") } }));
    btns.appendChild(document.createTextNode(" "));
    btns.appendChild(h("button", { type: "button", class: "small", text: "PNG", "aria-label": "Export “" + svg.querySelector("title").textContent + "” as PNG",
      on: { click: () => C.toPNG(svg, 2).then(b => S.download("drawsift-" + key + ".png", b)).catch(e => banner(e.message)) } }));
    cap.appendChild(btns);
    fig.appendChild(cap);
    state.plots[key] = svg;
    return fig;
  }

  async function renderPlots(seq) {
    const res = state.result;
    const box = clear($("plots"));
    state.plots = {};
    if (!res || !res.candidates.length) return;
    const ids = plotted();
    const cmax = Math.max(0.2, Math.min(10, Number(state.prefs.cmax) || 3));
    const tC = state.scenario.temperature_c !== undefined ? state.scenario.temperature_c : 25;
    const pu = pUnit();

    // π vs concentration: real and van 't Hoff, from the osmotic operation.
    const grid = [];
    for (let i = 1; i <= 24; i++) grid.push(cmax * i / 24);
    const batch = [];
    const lib = ids.filter(id => state.library.some(s => s.id === id));
    for (const id of lib) for (const c of grid) batch.push({ op: "osmotic", body: { solute: id, concentration: c, unit: "mol/L", temperature_c: tC } });
    const br = await state.engine.call("batch", batch);
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
    for (const id of ids.filter(id => !lib.includes(id))) {
      const cs = state.custom.find(c => c.id === id);
      if (!cs) continue;
      const nu = cs.van_t_hoff_factor || 1, T = tC + 273.15;
      series.push({ name: id + " (van 't Hoff)", color: colourOf(id), dash: "6 4", points: [[0, 0], [cmax, pConv(nu * cmax * R_BAR_L * T)]] });
      if (cs.osmotic_table) series.push({ name: id + " (measured, " + cs.osmotic_table.unit + ")", color: colourOf(id), markers: true, points: cs.osmotic_table.points.map(p => [p.concentration, pConv(p.osmotic_pressure_bar)]) });
      legendItems.push({ name: id + " (custom" + (cs.osmotic_table ? "; dots: measured π" : "") + ")", color: colourOf(id), marker: !!cs.osmotic_table });
    }
    legendItems.push({ name: "solid: real; dashed: van 't Hoff", color: "#16202a" });
    box.appendChild(figure("osmotic-pressure", C.line({ title: "Osmotic pressure vs concentration, " + tC + " °C", xLabel: "draw concentration (mol/L)", yLabel: "π (" + pu + ")",
      series: series, legendItems: legendItems, desc: "Real (solid) and van 't Hoff (dashed) osmotic pressure of the top candidates." }),
      "Real model as in the ranking; points past solubility or the model's data are left out."));

    // SRSF bars at the basis, and the Jw–SRSF trade-off.
    box.appendChild(figure("srsf", C.bars({ title: "Solute lost per litre of water at the basis", xLabel: "", yLabel: "Js/Jw (g/L)",
      data: res.candidates.map(c => ({ name: c.solute, value: c.specific_reverse_solute_flux_g_per_l, color: colourOf(c.solute) })), format: v => fmt(v, 2),
      desc: "Specific reverse solute flux of each ranked candidate, " + res.orientation + "." }), "Lower is better. " + res.orientation + ", at the basis of comparison."));
    const pts = res.candidates.map(c => ({ name: c.solute, x: c.specific_reverse_solute_flux_g_per_l, y: fConv(c.water_flux_lmh), color: colourOf(c.solute), front: c.pareto_optimal }));
    box.appendChild(figure("tradeoff", C.scatter({ title: "Water flux vs solute loss", xLabel: "Js/Jw (g/L) — lower is better", yLabel: "Jw (" + fLabel() + ") — higher is better",
      points: pts, desc: "Each ranked candidate; ringed points are Pareto-optimal on " + res.pareto_objectives.join(", ") + "." }),
      "Ringed: Pareto-optimal on " + res.pareto_objectives.map(label).join(", ") + "."));

    // Jw vs draw concentration in both orientations: a concentration sweep
    // per candidate (so that progress and cancel work per step).
    const fluxSeries = [], fluxLegend = [];
    const base = engineScenario(state.scenario, false);
    base.orientations = [base.orientation === "AL-FS" ? "AL-DS" : "AL-FS"];
    for (const id of ids) {
      const req = Object.assign(clone(base), { candidates: [id], sweep: { variable: "concentration", unit: "mol/L", from: cmax / 20, to: cmax, points: 20 } });
      if (!state.custom.some(c => c.id === id)) delete req.custom_solutes;
      const r = await state.engine.call("screen", req);
      if (seq !== state.runSeq) return;
      if (!r.ok || !r.data.sweep) continue;
      for (const s of r.data.sweep) {
        fluxSeries.push({ name: id + " " + s.orientation, color: colourOf(id), dash: s.orientation === "AL-DS" ? "6 4" : null,
          points: s.points.filter(p => p.water_flux_lmh !== undefined).map(p => [p.x, fConv(p.water_flux_lmh)]) });
      }
      fluxLegend.push({ name: id, color: colourOf(id) });
    }
    fluxLegend.push({ name: "solid: AL-FS (FO mode); dashed: AL-DS (PRO mode)", color: "#16202a" });
    box.appendChild(figure("water-flux", C.line({ title: "Water flux vs draw concentration, both orientations", xLabel: "draw concentration (mol/L)", yLabel: "Jw (" + fLabel() + ")",
      series: fluxSeries, legendItems: fluxLegend, desc: "Water flux of the top candidates against bulk draw concentration, FO mode solid, PRO mode dashed." }),
      "Same membrane, feed, channel and temperature as the ranking; points failing a hard limit are left out."));
    document.body.dataset.plots = "done-" + seq;
    renderReport();
  }

  // ---- sweeps -------------------------------------------------------------------
  let sweepAbort = null;
  async function runSweep() {
    if (sweepAbort) return;
    if (!state.ready || !state.result) {
      $("sweep-status").textContent = "The ranking is still being computed; run the sweep when it is done.";
      return;
    }
    const variable = $("sweep-var").value, from = Number($("sweep-from").value), to = Number($("sweep-to").value), n = Math.round(Number($("sweep-n").value));
    const ids = plotted();
    sweepAbort = new AbortController();
    $("btn-sweep").disabled = true; $("btn-sweep-cancel").disabled = false;
    $("sweep-progress").value = 0;
    $("sweep-status").textContent = "Sweeping…";
    const series = [];
    let failed = null;
    for (let i = 0; i < ids.length; i++) {
      const req = Object.assign(engineScenario(state.scenario, false), { candidates: [ids[i]], sweep: { variable: variable, from: from, to: to, points: n } });
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
    if (failed) { $("sweep-status").textContent = "Failed: " + (failed.field ? failed.field + ": " : "") + failed.message; return; }
    if (aborted) { $("sweep-status").textContent = "Cancelled."; return; }
    const names = { concentration: "draw concentration (mol/L)", temperature: "temperature (°C)", s: "structural parameter S (µm)", crossflow: "crossflow velocity (m/s)" };
    const box = clear($("sweep-plot"));
    box.appendChild(figure("sweep", C.line({ title: "Water flux vs " + names[variable].replace(/ \(.*/, "") + ", " + state.result.orientation, xLabel: names[variable], yLabel: "Jw (" + fLabel() + ")",
      series: series, xZero: false, desc: "Sweep of " + names[variable] + " for the plotted candidates." }), variable === "concentration" ? "The basis is set aside: every candidate at the same concentration." : "The basis of comparison is re-applied at each point."));
    $("sweep-status").textContent = "Done.";
    renderReport();
  }

  // ---- library -----------------------------------------------------------------------
  function renderLibrary() {
    const q = $("lib-search").value.trim().toLowerCase(), fam = $("lib-family").value;
    const list = clear($("lib-list"));
    const all = state.library.concat(state.custom.map(c => Object.assign({ family: "custom", name: c.name || c.id + " (user-defined)", custom: true }, c)));
    const shown = all.filter(s => (!fam || s.family === fam) &&
      (!q || s.id.toLowerCase().includes(q) || (s.name || "").toLowerCase().includes(q) || (s.aliases || []).some(a => a.toLowerCase().includes(q))));
    const cands = new Set((state.scenario.candidates || []).map(x => x.toLowerCase()));
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
    const list = (sc.candidates || []).filter(x => x.toLowerCase() !== id.toLowerCase());
    if (on) list.push(id);
    sc.candidates = list;
    state.scenario = readForm();
    S.save(S.KEY_SCENARIO, state.scenario);
    $("lib-count").textContent = $("lib-count").textContent.replace(/\d+ included/, list.length + " included");
    scheduleRun();
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
  function parseTable(text) {
    const pts = [];
    const lines = text.split(/\r?\n/);
    for (let i = 0; i < lines.length; i++) {
      const line = lines[i].replace(/#.*/, "").trim();
      if (!line) continue;
      const parts = line.split(/[\s,;\t]+/).filter(Boolean);
      if (parts.length !== 2) throw new Error("line " + (i + 1) + ": expected two numbers (concentration, π), got “" + line.slice(0, 40) + "”");
      const c = Number(parts[0]), p = Number(parts[1]);
      if (!isFinite(c) || !isFinite(p) || c <= 0 || p <= 0) throw new Error("line " + (i + 1) + ": numbers must be finite and > 0");
      if (pts.length && c <= pts[pts.length - 1].concentration) throw new Error("line " + (i + 1) + ": concentrations must increase");
      if (pts.length && p <= pts[pts.length - 1].osmotic_pressure_bar) throw new Error("line " + (i + 1) + ": osmotic pressure must increase with concentration");
      pts.push({ concentration: c, osmotic_pressure_bar: p });
    }
    if (pts.length === 1) throw new Error("a table needs at least two points");
    return pts;
  }
  function addCustom(ev) {
    ev.preventDefault();
    const err = $("cs-error");
    err.textContent = "";
    try {
      const id = $("cs-id").value.trim();
      if (!/^[A-Za-z0-9()+\-_.·]{1,40}$/.test(id)) throw new Error("Identifier: use letters, digits and ( ) + - _ . only (at most 40)");
      if (solute(id)) throw new Error("Identifier: “" + id + "” is already in the library or your custom solutes");
      const mm = num("cs-mm");
      if (!(mm > 0)) throw new Error("Molar mass: a positive number is required");
      const nu = num("cs-nu");
      if (!(nu >= 1 && nu <= 10)) throw new Error("Particles per formula unit: between 1 and 10");
      const d = num("cs-d");
      if (!(d > 0 && d < 10)) throw new Error("Diffusivity: between 0 and 10 × 10⁻⁹ m²/s");
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
        const pts = parseTable(t);
        cs.osmotic_table = { unit: $("cs-table-unit").value, temperature_c: num("cs-table-t") !== undefined ? num("cs-table-t") : 25, points: pts };
      }
      const hz = $("cs-hazards").value.split(/\n/).map(s => s.trim()).filter(Boolean);
      if (hz.length) cs.hazards = hz;
      const rg = $("cs-regen").value.split(",").map(s => s.trim()).filter(Boolean);
      if (rg.length) cs.regeneration = rg;
      cs.source = $("cs-source").value.trim() || "user-defined (no source given)";
      state.custom.push(prune(cs));
      S.save(S.KEY_CUSTOM, state.custom);
      $("custom-form").reset();
      fillPresets();
      writeForm(state.scenario);
      toggleCandidate(id, true);
      state.current = id;
      renderLibrary();
      showSolute(Object.assign({ family: "custom", custom: true }, cs));
    } catch (e) {
      err.textContent = e.message;
    }
  }
  function removeCustom(id) {
    state.custom = state.custom.filter(c => c.id !== id);
    S.save(S.KEY_CUSTOM, state.custom);
    toggleCandidate(id, false);
    clear($("lib-detail")).appendChild(h("p", { class: "hint", text: id + " was removed from your library." }));
    renderLibrary();
  }

  // ---- sources and report ------------------------------------------------------
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
    $("rp-meta").textContent = "Engine " + res.engine_version + " · made " + new Date().toISOString().replace("T", " ").slice(0, 16) + " UTC · every number computed in the browser.";
    const cu = clear($("rp-cautions"));
    for (const li of document.querySelectorAll("#cautions li")) cu.appendChild(h("li", { text: li.textContent }));
    const inp = clear($("rp-inputs"));
    const row = (k, v) => inp.appendChild(h("tr", {}, h("th", { scope: "row", text: k }), h("td", { text: v })));
    const sc = state.scenario;
    const feed = sc.feed.preset ? (state.feeds.find(f => f.id === sc.feed.preset) || {}).name || sc.feed.preset : sc.feed.solute + " at " + sc.feed.concentration + " " + sc.feed.unit;
    row("Feed", feed + (sc.feed.concentration !== undefined && sc.feed.preset ? " (" + sc.feed.concentration + ")" : "") +
      (!sc.feed.preset ? "; pH " + (sc.feed.ph !== undefined ? sc.feed.ph : "7 (default)") : "") + "; π " + fmt(pConv(res.feed_osmotic_pressure_bar)) + " " + pUnit());
    const mem = sc.membrane;
    const m = mem.preset ? state.membranes.find(x => x.id === mem.preset) : null;
    const drawB = mem.b_nacl_lmh !== undefined ? mem.b_lmh : undefined;
    row("Membrane", m ? m.name + " — A " + m.a_lmh_per_bar + " LMH/bar, B(NaCl) " + m.b_nacl_lmh + " LMH, S " + m.s_um + " µm" :
      "custom — A " + mem.a_lmh_per_bar + " LMH/bar, B(NaCl) " + (mem.b_nacl_lmh !== undefined ? mem.b_nacl_lmh : mem.b_lmh) + " LMH, S " + mem.s_um + " µm");
    row("B of the draw solutes", drawB !== undefined ? drawB + " LMH, used for every candidate" : "estimated per solute from B(NaCl) (flagged in the results)");
    row("Orientation", res.orientation === "AL-FS" ? "FO mode (AL-FS)" : "PRO mode (AL-DS)");
    row("Temperature", sc.temperature_c + " °C");
    row("Channel", sc.external_cp === false ? "no external concentration polarisation" :
      sc.channel.height_mm + " × " + sc.channel.width_mm + " × " + sc.channel.length_mm + " mm, " + sc.channel.crossflow_velocity_m_per_s + " m/s" + (sc.channel.spacer ? ", spacer" : ""));
    const kText = (v, side) => side + " " + (v !== undefined ? v + " m/s (given)" : "from the channel");
    row("Mass transfer", sc.external_cp === false ? "not counted" : sc.k_draw_m_per_s === undefined && sc.k_feed_m_per_s === undefined ? "k from the channel (Sherwood correlation)" :
      "k " + kText(sc.k_draw_m_per_s, "draw side") + "; " + kText(sc.k_feed_m_per_s, "feed side"));
    row("Basis of comparison", $("run-summary").textContent.replace(/^Ranked [^a]+ at /, "").split(";")[0]);
    row("Candidates", (sc.candidates || []).join(", "));
    row("Weights", Object.keys(res.weights).filter(k => res.weights[k] > 0).map(k => label(k) + " " + res.weights[k]).join(", "));
    row("Osmotic model", sc.osmotic_model || "real");
    row("Solutes excluded by hazard", (sc.exclude_hazards || []).length ? sc.exclude_hazards.join(", ") : "none");
    row("Candidates needed beyond their model's data", sc.allow_extrapolation ? "kept (flagged)" : "left out");
    row("Water recovered when re-concentrating the draw", pct(sc.regeneration_recovery !== undefined ? sc.regeneration_recovery : DEFAULT_RECOVERY_PCT / 100) + " %");
    row("Pareto front on", (res.pareto_objectives || []).map(label).join(", "));
    if (state.robust) row("Uncertainty", state.robust.robustness.samples + " samples, seed " + state.robust.robustness.seed);
    const mo = clear($("rp-models"));
    for (const k of Object.keys(res.model_choices || {}).sort()) mo.appendChild(h("li", {}, h("strong", { text: k.replace(/_/g, " ") + ": " }), res.model_choices[k]));
    const rr = clear($("rp-results"));
    const t = $("ranking").cloneNode(true);
    t.removeAttribute("id");
    for (const b of t.querySelectorAll("thead button")) b.replaceWith(...Array.from(b.childNodes));
    for (const b of t.querySelectorAll(".bar")) b.remove();
    rr.appendChild(t);
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
    const wn = $("warnings").cloneNode(true);
    wn.removeAttribute("id");
    for (const d of wn.querySelectorAll("details")) d.open = true;
    rr.appendChild(wn);
    const pl = clear($("rp-plots"));
    for (const k in state.plots) {
      const svg = state.plots[k].cloneNode(true);
      pl.appendChild(h("figure", {}, svg));
    }
    const so = clear($("rp-sources"));
    for (const s of (state.robust || res).sources || []) so.appendChild(h("li", {}, h("strong", { text: s.field + ": " }), s.reference));
  }

  // ---- files, links, storage -------------------------------------------------------
  function exportScenario() {
    S.download("drawsift-scenario.json", JSON.stringify(state.scenario, null, 2) + "\n");
  }
  function exportCustom() {
    S.download("drawsift-custom-solutes.json", JSON.stringify({ drawsift_custom_solutes: state.custom }, null, 2) + "\n");
  }
  function exportCSV() {
    const res = state.result;
    if (!res) return;
    const cols = columns();
    const q = s => /[",\n]/.test(s) ? '"' + s.replace(/"/g, '""') + '"' : s;
    const lines = [cols.map(c => q(c.label + (c.unit ? " (" + c.unit + ")" : ""))).join(",")];
    for (const c of res.candidates) lines.push(cols.map(col => { const v = col.get(c); return col.text ? q(String(v)) : isFinite(v) ? String(v) : ""; }).join(","));
    lines.push("");
    lines.push("excluded solute,reason,detail");
    for (const x of res.excluded) lines.push([x.solute, x.reason, x.detail || ""].map(q).join(","));
    S.download("drawsift-ranking.csv", lines.join("\n") + "\n", "text/csv");
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

  // applyScenario replaces the scenario (and adds its custom solutes to
  // the user's library) once the engine accepts it.
  async function applyScenario(sc, origin) {
    const r = await state.engine.call("screen", engineScenario(sc, false));
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
    S.save(S.KEY_CUSTOM, state.custom);
    state.scenario = sc;
    S.save(S.KEY_SCENARIO, sc);
    fillPresets();
    writeForm(sc);
    renderLibrary();
    state.sort = null;
    await runScreen();
  }

  async function importFile(file) {
    banner("");
    try {
      const o = await S.readJSONFile(file);
      if (o && typeof o === "object" && !Array.isArray(o) && "drawsift_custom_solutes" in o) {
        S.check(o, { object: { drawsift_custom_solutes: ["array", SHAPE_CUSTOM] }, required: ["drawsift_custom_solutes"] }, "");
        const list = o.drawsift_custom_solutes;
        for (const c of list) if (state.library.some(s => s.id.toLowerCase() === c.id.toLowerCase())) throw new S.ShapeError("drawsift_custom_solutes", "“" + c.id + "” is already a library solute");
        let added = 0;
        for (const c of list) if (!state.custom.some(x => x.id.toLowerCase() === c.id.toLowerCase())) { state.custom.push(c); added++; }
        S.save(S.KEY_CUSTOM, state.custom);
        fillPresets(); writeForm(state.scenario); renderLibrary();
        banner("");
        $("engine-status").textContent = "Added " + added + " custom solute(s) from “" + file.name + "”.";
        return;
      }
      validateScenario(o);
      await applyScenario(o, "“" + file.name + "”");
      status("Loaded “" + file.name + "”.");
    } catch (e) {
      banner("Nothing was changed. " + (e instanceof S.ShapeError ? "“" + file.name + "” is not a Drawsift scenario: " : "") + e.message);
    }
  }

  async function copyShare() {
    const frag = await S.encodeShare(state.scenario);
    const url = location.href.replace(/#.*$/, "") + "#s=" + frag;
    history.replaceState(null, "", "#s=" + frag);
    try {
      await navigator.clipboard.writeText(url);
      status("Share link copied (" + url.length + " characters).");
    } catch (e) {
      status("Share link is in the address bar.");
    }
  }

  // ---- tabs ---------------------------------------------------------------------------
  function selectTab(name, focus) {
    for (const t of document.querySelectorAll('[role="tab"]')) {
      const on = t.id === "tab-" + name;
      t.setAttribute("aria-selected", String(on));
      t.tabIndex = on ? 0 : -1;
      $(t.getAttribute("aria-controls")).hidden = !on;
      if (on && focus) t.focus();
    }
    state.prefs.tab = name;
    S.save(S.KEY_PREFS, state.prefs);
  }

  // ---- wiring -------------------------------------------------------------------------
  function wire() {
    const form = $("scenario-form");
    form.addEventListener("input", ev => {
      if (ev.target.type === "range") $(ev.target.id + "-out").textContent = Number(ev.target.value).toFixed(2);
      if (["mem-a", "mem-b", "mem-s"].includes(ev.target.id) && $("mem-preset").value !== "custom") $("mem-preset").value = "custom";
      changed();
    });
    form.addEventListener("change", ev => {
      if (ev.target.id === "feed-preset") {
        const pre = state.feeds.find(f => "preset:" + f.id === ev.target.value);
        if (pre && pre.osmotic.method === "solute") { $("feed-conc").value = pre.osmotic.concentration; $("feed-unit").value = pre.osmotic.unit; }
        if (ev.target.value === "custom" && $("feed-conc").value === "") { $("feed-conc").value = 0; }
        updateFeedUI();
      }
      if (ev.target.id === "mem-preset") {
        const m = state.membranes.find(x => x.id === ev.target.value);
        if (m) { $("mem-a").value = m.a_lmh_per_bar; $("mem-b").value = m.b_nacl_lmh; $("mem-s").value = m.s_um; $("unc-a").value = m.a_rel_sd; $("unc-b").value = m.b_rel_sd; $("unc-s").value = m.s_rel_sd; }
        $("mem-desc").textContent = m ? m.description + " " + (m.test_conditions || "") : "Your own membrane: A, B (for NaCl) and S as measured in an FO test.";
      }
      if (ev.target.name === "k-mode") updateKUI();
      if (ev.target.id === "basis-kind") {
        setBasisUnits(ev.target.value);
        $("basis-value").value = { "osmotic-pressure": 60, concentration: 1, "water-flux": 5 }[ev.target.value];
      }
      changed();
    });
    form.addEventListener("submit", ev => { ev.preventDefault(); changed(); runScreen(); });
    $("feed-ion-add").addEventListener("click", () => {
      const ions = readIons();
      ions.push({ symbol: "", charge: 1, molar_mass_g_per_mol: undefined, mg_per_l: 0 });
      renderIons(ions);
      $("feed-ions").querySelector("tr:last-child input").focus();
    });
    $("btn-demo").addEventListener("click", () => { loadDemo().then(d => applyScenario(d, "The demo")).catch(e => banner(e.message)); });
    $("btn-robust").addEventListener("click", runRobust);
    $("btn-robust-cancel").addEventListener("click", () => robustAbort && robustAbort.abort());
    $("btn-sweep").addEventListener("click", runSweep);
    $("btn-sweep-cancel").addEventListener("click", () => sweepAbort && sweepAbort.abort());
    $("sweep-var").addEventListener("change", () => {
      const v = { concentration: [0.25, 3], temperature: [15, 40], s: [100, 1000], crossflow: [0.05, 0.5] }[$("sweep-var").value];
      $("sweep-from").value = v[0]; $("sweep-to").value = v[1];
    });
    for (const [id, key] of [["u-pressure", "pressure"], ["u-flux", "flux"], ["u-sflux", "sflux"]]) {
      $(id).value = state.prefs[key];
      $(id).addEventListener("change", () => { state.prefs[key] = $(id).value; S.save(S.KEY_PREFS, state.prefs); if (state.result) { renderResult(state.result); renderPlots(state.runSeq); } });
    }
    $("plot-count").value = state.prefs.plotCount;
    $("plot-cmax").value = state.prefs.cmax;
    $("plot-count").addEventListener("change", () => { state.prefs.plotCount = $("plot-count").value; S.save(S.KEY_PREFS, state.prefs); renderPlots(state.runSeq); });
    $("plot-cmax").addEventListener("change", () => { state.prefs.cmax = Number($("plot-cmax").value) || 3; S.save(S.KEY_PREFS, state.prefs); renderPlots(state.runSeq); });
    $("lib-search").addEventListener("input", renderLibrary);
    $("lib-family").addEventListener("change", renderLibrary);
    $("lib-all").addEventListener("click", () => bulkInclude(true));
    $("lib-none").addEventListener("click", () => bulkInclude(false));
    $("custom-form").addEventListener("submit", addCustom);
    $("btn-export-lib").addEventListener("click", exportCustom);
    $("btn-export-scenario").addEventListener("click", exportScenario);
    $("file-import").addEventListener("change", ev => { const f = ev.target.files[0]; ev.target.value = ""; if (f) importFile(f); });
    $("btn-share").addEventListener("click", () => copyShare().catch(e => banner(e.message)));
    $("btn-print").addEventListener("click", () => { renderReport(); window.print(); });
    $("btn-csv").addEventListener("click", exportCSV);
    $("btn-json").addEventListener("click", exportJSON);
    window.addEventListener("beforeprint", renderReport);
    const tabs = Array.from(document.querySelectorAll('[role="tab"]'));
    tabs.forEach((t, i) => {
      t.addEventListener("click", () => selectTab(t.id.slice(4)));
      t.addEventListener("keydown", ev => {
        let j = null;
        if (ev.key === "ArrowRight") j = (i + 1) % tabs.length;
        if (ev.key === "ArrowLeft") j = (i - 1 + tabs.length) % tabs.length;
        if (ev.key === "Home") j = 0;
        if (ev.key === "End") j = tabs.length - 1;
        if (j !== null) { ev.preventDefault(); selectTab(tabs[j].id.slice(4), true); }
      });
    });
  }
  function bulkInclude(on) {
    const ids = Array.from($("lib-list").querySelectorAll("li")).map(li => li.dataset.solute);
    const sc = state.scenario;
    const set = new Map((sc.candidates || []).map(x => [x.toLowerCase(), x]));
    for (const id of ids) { if (on) set.set(id.toLowerCase(), id); else set.delete(id.toLowerCase()); }
    sc.candidates = Array.from(set.values());
    state.scenario = readForm();
    S.save(S.KEY_SCENARIO, state.scenario);
    renderLibrary();
    scheduleRun();
  }

  // ---- start ------------------------------------------------------------------------
  async function initialScenario() {
    const m = /^#s=(.+)$/.exec(location.hash);
    if (m) {
      try {
        return { sc: validateScenario(await S.decodeShare(m[1])), from: "link" };
      } catch (e) {
        banner("The share link could not be read (" + e.message + "); your last scenario is shown instead.");
      }
    }
    const saved = S.load(S.KEY_SCENARIO);
    if (saved) {
      try { return { sc: validateScenario(saved), from: "storage" }; } catch (e) { /* an old or damaged entry: fall back to the demo */ }
    }
    return { sc: validateScenario(await loadDemo()), from: "demo" };
  }

  async function start() {
    $("page-version").textContent = VERSION;
    const prefs = S.load(S.KEY_PREFS);
    if (prefs) Object.assign(state.prefs, prefs);
    const custom = S.load(S.KEY_CUSTOM);
    if (Array.isArray(custom)) {
      for (const c of custom) { try { S.check(c, SHAPE_CUSTOM, "custom"); state.custom.push(c); } catch (e) { /* skip a damaged entry */ } }
    }
    buildWeights();
    buildRules();
    wire();
    selectTab(state.prefs.tab || "ranking");
    if ("serviceWorker" in navigator && /^https?:$/.test(location.protocol) && !document.getElementById("ds-wasm")) {
      navigator.serviceWorker.register("sw.js?v=" + encodeURIComponent(VERSION)).catch(() => { /* offline support is optional */ });
    }
    const engine = new window.DrawsiftEngine();
    state.engine = engine;
    engine.onstatus = s => status(s === "ready" ? "Engine " + engine.version + " ready" : "Restarting the engine…");
    try {
      await engine.start();
    } catch (e) {
      status("Engine failed", true);
      banner(e.message);
      document.body.dataset.engine = "failed";
      return;
    }
    status("Engine " + engine.version + " ready");
    document.body.dataset.engine = "ready";
    const [pr, so, init] = await Promise.all([engine.call("presets"), engine.call("solutes"), initialScenario()]);
    if (!pr.ok || !so.ok) { banner("The engine's library could not be read."); return; }
    state.membranes = pr.data.membranes; state.feeds = pr.data.feeds; state.library = so.data.solutes;
    for (const c of init.sc.custom_solutes || []) if (!state.custom.some(x => x.id.toLowerCase() === c.id.toLowerCase())) state.custom.push(c);
    state.scenario = init.sc;
    fillPresets();
    writeForm(init.sc);
    state.scenario = readForm();
    S.save(S.KEY_SCENARIO, state.scenario);
    renderLibrary();
    state.ready = true;
    await runScreen();
  }

  if (document.readyState === "loading") document.addEventListener("DOMContentLoaded", start);
  else start();
})();
