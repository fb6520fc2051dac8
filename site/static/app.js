// Drawsift page, the entry: start-up (the engine worker, its defaults,
// presets and library, the first scenario), the live ranking run after
// each edit, the tabs, and the wiring of every control to the page's
// other scripts (core, form, results, plots, library, report, files).
//
// Plain DOM code; every piece of user or file data reaches the page
// through textContent or attribute setters, never as markup.
//
// What the page signals on <body> (tests and tools wait for these, never
// for time): data-engine ready | failed; data-edit, the count of scenario
// edits; data-run done- | error- | invalid-<run>, with data-run-edit the
// edit that run showed; data-plots done-<run> once that run's plots are
// drawn; data-robust and data-sweep (results.js, plots.js); data-solution
// (mixtures.js).
"use strict";

(function () {
  const P = window.DrawsiftPage;
  const { $, state, S } = P;

  // ---- running the engine ------------------------------------------------------
  // setScenario makes sc the page's scenario and stores it: one edit.
  function setScenario(sc) {
    state.scenario = sc;
    S.save(S.KEY_SCENARIO, sc);
    document.body.dataset.edit = String(++state.edits);
  }
  function changed() {
    setScenario(P.readForm());
    scheduleRun();
  }
  const scheduleRun = P.debounce(runScreen, 250);

  // finish marks the end of run seq and the edit it ran. A run that
  // ended without a ranking leaves the results shown stale: dimmed, marked,
  // and withheld from exports and the printed report (stale()).
  function finish(kind, seq, edit) {
    state.stale = kind !== "done" && !!state.result;
    $("results-area").classList.toggle("stale", state.stale);
    $("stale-note").hidden = !state.stale;
    document.body.dataset.stale = String(state.stale);
    document.body.dataset.runEdit = String(edit);
    document.body.dataset.run = kind + "-" + seq;
  }
  // stale reports, for an export or print, whether the results shown
  // belong to an earlier scenario, and says so on the page.
  function stale(what) {
    if (!state.stale) return false;
    P.banner(what + " withheld: the results shown belong to an earlier scenario (the latest edit could not be ranked). Fix the field named in the results first.");
    return true;
  }

  async function runScreen() {
    if (!state.ready) return;
    const sc = state.scenario, edit = state.edits;
    P.clearErrors();
    const pre = P.checkForm(sc);
    if (pre.length) { P.showErrors(pre); finish("invalid", ++state.runSeq, edit); return; }
    const seq = ++state.runSeq;
    const req = P.engineScenario(sc, false), key = JSON.stringify(req);
    // An edit that leaves the ranking's request as it was (an uncertainty,
    // a sweep range) changes nothing the ranking and its plots show (the
    // engine is deterministic): only the robustness figures, once they
    // belong to an earlier edit, and the report. Nothing is redrawn then,
    // and the engine stays free for the work the edit asked for.
    const shown = state.shown;
    if (shown && shown.key === key && !state.stale && document.body.dataset.plots === "done-" + shown.seq) {
      if (state.robustEdit !== edit && state.robust) { state.robust = null; P.renderRobust(); P.renderSources(); }
      P.renderReport();
      shown.seq = seq;
      finish("done", seq, edit);
      document.body.dataset.plots = "done-" + seq;
      P.refreshSolution();
      return;
    }
    const t0 = performance.now();
    $("run-summary").textContent = "Screening…";
    const r = await state.engine.call("screen", req, { memo: true });
    if (!document.body.dataset.firstResultMs) performance.mark("ds:first-answer");
    if (seq !== state.runSeq) return; // a newer run has started
    if (!r.ok) {
      P.showError(r.data.error || { message: "unknown error" });
      $("run-summary").textContent = "No ranking: fix the field named below.";
      finish("error", seq, edit);
      return;
    }
    state.result = r.data;
    state.shown = { key: key, seq: seq };
    // A robustness run's figures stay while they belong to this edit (a
    // run started right after an edit may end before its ranking).
    if (state.robustEdit !== edit) state.robust = null;
    P.renderResult(r.data, r.memo ? r.ms : performance.now() - t0);
    if (!document.body.dataset.firstResultMs) {
      document.body.dataset.firstResultMs = String(Math.round(performance.now()));
      performance.mark("ds:first-result");
    }
    finish("done", seq, edit);
    P.refreshSolution();
    P.renderPlots(seq);
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
    if (name === "solution") P.refreshSolution();
    if (name === "ranking") P.placeSticky();
    if (name === "plots") P.refit();
    if (name === "plant") P.refreshPlant();
  }

  // Starting values the form suggests when the basis kind changes to one
  // for which the engine has no default (it requires a value there): 1 mol/L
  // and 5 LMH, our own choice. For osmotic pressure the engine's default
  // basis is taken (P.basisDefault).
  const BASIS_START = { concentration: 1, "water-flux": 5 };
  // Sweep ranges the form suggests for each variable (our own choice), and
  // the engine's range of the swept field.
  const SWEEP_START = { concentration: [0.25, 3], temperature: [15, 40], s: [100, 1000], crossflow: [0.05, 0.5] };
  const SWEEP_LIMIT = { temperature: "temperature_c", s: "membrane.s_um", crossflow: "channel.crossflow_velocity_m_per_s" };

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
        P.updateFeedUI();
      }
      if (ev.target.id === "mem-preset") {
        const m = state.membranes.find(x => x.id === ev.target.value);
        if (m) { $("mem-a").value = m.a_lmh_per_bar; $("mem-b").value = m.b_nacl_lmh; $("mem-s").value = m.s_um; $("unc-a").value = m.a_rel_sd; $("unc-b").value = m.b_rel_sd; $("unc-s").value = m.s_rel_sd; }
        P.refTPlaceholder();
        $("mem-desc").textContent = m ? m.description + " " + (m.test_conditions || "") : "Your own membrane: A, B (for NaCl) and S as measured in an FO test.";
      }
      if (ev.target.name === "k-mode") P.updateKUI();
      if (ev.target.id === "basis-kind") {
        const kind = ev.target.value;
        if (kind === "osmotic-pressure") {
          const b = P.basisDefault(P.readForm().feed);
          P.setBasisUnits(kind, b.multiple_of_feed !== undefined ? "xfeed" : b.unit);
          $("basis-value").value = b.multiple_of_feed !== undefined ? b.multiple_of_feed : b.value;
        } else {
          P.setBasisUnits(kind);
          $("basis-value").value = BASIS_START[kind];
        }
      }
      if (ev.target.id === "basis-unit") P.updateBasisLimits();
      changed();
    });
    form.addEventListener("submit", ev => { ev.preventDefault(); changed(); runScreen(); });
    $("feed-ion-add").addEventListener("click", () => {
      const ions = P.readIons();
      ions.push({ symbol: "", charge: 1, molar_mass_g_per_mol: undefined, mg_per_l: 0 });
      P.renderIons(ions);
      $("feed-ions").querySelector("tr:last-child input").focus();
    });
    $("btn-demo").addEventListener("click", () => { P.loadDemo().then(d => P.applyScenario(d, "The demo")).catch(e => P.banner(e.message)); });
    $("btn-robust").addEventListener("click", P.runRobust);
    $("btn-robust-cancel").addEventListener("click", P.cancelRobust);
    $("btn-sweep").addEventListener("click", P.runSweep);
    $("btn-sweep-cancel").addEventListener("click", P.cancelSweep);
    $("sweep-var").addEventListener("change", () => {
      const v = $("sweep-var").value;
      $("sweep-from").value = SWEEP_START[v][0]; $("sweep-to").value = SWEEP_START[v][1];
      sweepLimits();
    });
    for (const [id, key] of [["u-pressure", "pressure"], ["u-flux", "flux"], ["u-sflux", "sflux"]]) {
      $(id).value = state.prefs[key];
      $(id).addEventListener("change", () => { state.prefs[key] = $(id).value; S.save(S.KEY_PREFS, state.prefs); if (state.result) { P.renderResult(state.result); P.renderPlots(state.runSeq); } });
    }
    $("plot-count").value = state.prefs.plotCount;
    $("plot-cmax").value = state.prefs.cmax;
    $("plot-count").addEventListener("change", () => { state.prefs.plotCount = $("plot-count").value; S.save(S.KEY_PREFS, state.prefs); P.renderPlots(state.runSeq); });
    $("plot-cmax").addEventListener("change", () => { state.prefs.cmax = Number($("plot-cmax").value) || 3; S.save(S.KEY_PREFS, state.prefs); P.renderPlots(state.runSeq); });
    $("lib-search").addEventListener("input", P.renderLibrary);
    $("lib-family").addEventListener("change", P.renderLibrary);
    $("lib-all").addEventListener("click", () => P.bulkInclude(true));
    $("lib-none").addEventListener("click", () => P.bulkInclude(false));
    $("custom-form").addEventListener("submit", P.addCustom);
    $("btn-export-lib").addEventListener("click", P.exportCustom);
    $("btn-export-scenario").addEventListener("click", P.exportScenario);
    $("file-import").addEventListener("change", ev => { const f = ev.target.files[0]; ev.target.value = ""; if (f) P.importFile(f); });
    $("btn-share").addEventListener("click", () => P.copyShare().catch(e => P.banner(e.message)));
    $("btn-print").addEventListener("click", () => { if (stale("The printed report is")) return; P.renderReport(); window.print(); });
    $("btn-cols-all").addEventListener("click", () => P.showAllColumns());
    window.addEventListener("resize", P.debounce(() => { P.placeSticky(); P.refit(); }, 150));
    $("btn-csv").addEventListener("click", () => { if (!stale("The CSV export is")) P.exportCSV(); });
    $("btn-json").addEventListener("click", () => { if (!stale("The JSON export is")) P.exportJSON(); });
    window.addEventListener("beforeprint", P.renderReport);
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
  // sweepLimits gives the sweep's ends the engine's range of the swept
  // field (none for a concentration: its limit is each solute's own).
  function sweepLimits() {
    const key = SWEEP_LIMIT[$("sweep-var").value];
    for (const id of ["sweep-from", "sweep-to"]) {
      if (key) P.setRange($(id), key);
      else { $(id).removeAttribute("min"); $(id).removeAttribute("max"); }
    }
  }

  // ---- start ------------------------------------------------------------------------
  async function start() {
    $("page-version").textContent = P.VERSION;
    const prefs = S.load(S.KEY_PREFS);
    if (prefs) Object.assign(state.prefs, prefs);
    const custom = S.load(S.KEY_CUSTOM);
    if (Array.isArray(custom)) {
      for (const c of custom) { try { S.check(c, P.SHAPE_CUSTOM, "custom"); state.custom.push(c); } catch (e) { /* skip a damaged entry */ } }
    }
    wire();
    selectTab(state.prefs.tab || "ranking");
    const engine = new window.DrawsiftEngine();
    state.engine = engine;
    engine.onstatus = (s, why) => {
      if (s === "failed") { failed(why); return; }
      P.status(s === "ready" ? "Engine " + engine.version + " ready" : "Restarting the engine…");
    };
    // The engine compiles while the form is built from the listings sent
    // with the page; a call made meanwhile waits for the engine.
    const booted = engine.start().then(() => {
      P.status("Engine " + engine.version + " ready");
      document.body.dataset.engine = "ready";
      performance.mark("ds:engine-ready");
      return true;
    }, e => { failed(e.message); return false; });
    let lists = listingsOff() ? null : await window.DrawsiftEngine.listings();
    const sent = !!lists;
    let init;
    try {
      if (!lists) {
        if (!await booted) return;
        lists = await engineListings();
      }
      P.setDefaults(lists.defaults);
      init = await P.initialScenario();
    } catch (e) {
      P.banner("The page could not start: " + e.message);
      return;
    }
    performance.mark("ds:library-read");
    state.membranes = lists.presets.membranes; state.feeds = lists.presets.feeds; state.library = lists.solutes.solutes;
    for (const c of init.sc.custom_solutes || []) if (!state.custom.some(x => x.id.toLowerCase() === c.id.toLowerCase())) state.custom.push(c);
    P.buildForm();
    sweepLimits();
    state.scenario = init.sc;
    P.fillPresets();
    P.writeForm(init.sc);
    setScenario(P.readForm());
    P.renderLibrary();
    P.buildSolutionPanel();
    P.buildFitPanel();
    P.buildPlantPanel();
    state.ready = true;
    if (init.note) P.offer(...init.note);
    performance.mark("ds:form-built");
    if (await booted) {
      await runScreen();
      if (sent) await checkListings(lists);
      await warmUp();
    }
    registerOffline();
  }

  function failed(why) {
    P.status("Engine failed", true);
    P.banner(why);
    document.body.dataset.engine = "failed";
  }

  // engineListings asks the engine for its defaults, presets and solutes.
  async function engineListings() {
    const [d, pr, so] = await Promise.all(["defaults", "presets", "solutes"].map(op => state.engine.call(op)));
    if (!d.ok) throw new Error("the engine's defaults could not be read");
    if (!pr.ok || !so.ok) throw new Error("the engine's library could not be read");
    return { defaults: d.data, presets: pr.data, solutes: so.data };
  }

  // checkListings compares the listings the page was built from with its
  // engine's own answers (they differ only when a server sends the page
  // of one build with the engine of another under the same version): on a
  // difference the page says so, and after a reload reads them from the
  // engine. Body data-listings: checked | differ | engine (none were sent,
  // or the check failed).
  const LISTINGS_OFF = "drawsift-listings-from-engine";
  function listingsOff() {
    try { return !!sessionStorage.getItem(LISTINGS_OFF); } catch (e) { return false; }
  }
  async function checkListings(sent) {
    let got;
    try { got = await engineListings(); } catch (e) { document.body.dataset.listings = "engine"; return; }
    const same = ["defaults", "presets", "solutes"].every(k => JSON.stringify(got[k]) === JSON.stringify(sent[k]));
    if (!same) {
      try { sessionStorage.setItem(LISTINGS_OFF, "1"); } catch (e) { /* storage off: the banner still says it */ }
      P.banner("The limits and library this page came with differ from its engine's (the server holds two builds of one version). Reload the page: it will read them from the engine.");
    }
    document.body.dataset.listings = same ? "checked" : "differ";
  }

  // registerOffline installs the service worker that keeps this version's
  // files for offline use; it runs once the engine has warmed up after the
  // first ranking, so that its download of every file competes with
  // neither the page's start nor the warm-up.
  function registerOffline() {
    if (!("serviceWorker" in navigator) || !/^https?:$/.test(location.protocol) || document.getElementById("ds-wasm")) return;
    // The offline copy's state, on body data-offline: "ready" once this
    // version's service worker is active (its files cached), "refused"
    // when its install found files of another version.
    const offline = (state, text) => { document.body.dataset.offline = state; $("offline-state").textContent = text; };
    navigator.serviceWorker.onmessage = ev => {
      const m = ev.data || {};
      if (m.type === "offline-refused" && m.version === P.VERSION) offline("refused", " · no offline copy saved: " + m.reason);
    };
    navigator.serviceWorker.register("sw.js?v=" + encodeURIComponent(P.VERSION))
      .then(() => navigator.serviceWorker.ready)
      .then(reg => {
        if (reg.active && new URL(reg.active.scriptURL).searchParams.get("v") === P.VERSION) offline("ready", " · works offline");
      })
      .catch(() => { /* offline support is optional */ });
  }

  // warmUp runs the opening scenario's screen again in the engine while
  // the page is idle after the first result: the browser compiles a
  // WebAssembly function with its optimising tier only once it has run
  // often, and without this the user's first edits would pay for it.
  // Body data-warm: running | done.
  const warmRuns = 24;
  async function warmUp() {
    document.body.dataset.warm = "running";
    await state.engine.warm("screen", P.engineScenario(state.scenario, false), warmRuns);
    document.body.dataset.warm = "done";
  }

  Object.assign(P, { setScenario, changed, scheduleRun, runScreen, selectTab, stale });

  if (document.readyState === "loading") document.addEventListener("DOMContentLoaded", start);
  else start();
})();
