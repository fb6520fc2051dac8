// Drawsift charts: small, dependency-free SVG plots.
//
// Every chart is plain SVG built with DOM calls (never from strings), with
// its styling in presentation attributes, so that an exported .svg file
// looks exactly like the chart on screen and prints crisply at any size.
// Each chart carries <title> and <desc> for screen readers.
"use strict";

(function () {
  const NS = "http://www.w3.org/2000/svg";

  // Series colours: our own set, chosen to stay apart for the common
  // colour-vision deficiencies and to read on white in daylight.
  const PALETTE = ["#1d4f91", "#b5462a", "#2d7a3e", "#7a4a9e", "#a86b00", "#08737f", "#6b4f3a", "#b0306a", "#4d5b69", "#5f8a00"];
  const INK = "#16202a", GRID = "#d9d6cc", MUTED = "#55606b";
  const FONT = "system-ui, -apple-system, 'Segoe UI', Roboto, 'Noto Sans', sans-serif";

  function el(name, attrs, parent) {
    const e = document.createElementNS(NS, name);
    if (attrs) for (const k in attrs) if (attrs[k] !== undefined && attrs[k] !== null) e.setAttribute(k, String(attrs[k]));
    if (parent) parent.appendChild(e);
    return e;
  }
  function text(parent, x, y, s, attrs) {
    const t = el("text", Object.assign({ x: x, y: y, fill: INK, "font-family": FONT, "font-size": 12 }, attrs || {}), parent);
    t.textContent = s;
    return t;
  }

  // niceTicks returns round tick values covering [lo, hi] (1-2-5 steps).
  function niceTicks(lo, hi, n) {
    if (!(hi > lo)) { hi = lo + 1; }
    const raw = (hi - lo) / Math.max(1, n || 5);
    const mag = Math.pow(10, Math.floor(Math.log10(raw)));
    const f = raw / mag;
    const step = (f < 1.5 ? 1 : f < 3.5 ? 2 : f < 7.5 ? 5 : 10) * mag;
    const start = Math.floor(lo / step + 1e-9) * step, end = Math.ceil(hi / step - 1e-9) * step;
    const out = [];
    for (let v = start; v <= end + step * 1e-6; v += step) out.push(Math.abs(v) < step * 1e-9 ? 0 : v);
    return { ticks: out, lo: start, hi: end, step: step };
  }
  function fmtTick(v, step) {
    const d = Math.max(0, -Math.floor(Math.log10(step) + 1e-9));
    return v.toFixed(Math.min(d, 6));
  }

  // frame draws the plot area, axes, grid and labels and returns scales.
  function frame(svg, o, xr, yr) {
    const W = o.width || 560, H = o.height || 360;
    const m = { l: 62, r: 14, t: 34, b: o.categorical ? 64 : 48 };
    const pw = W - m.l - m.r, ph = H - m.t - m.b;
    const xt = niceTicks(xr[0], xr[1], 6), yt = niceTicks(yr[0], yr[1], 5);
    const sx = v => m.l + (v - xt.lo) / (xt.hi - xt.lo) * pw;
    const sy = v => m.t + ph - (v - yt.lo) / (yt.hi - yt.lo) * ph;
    el("rect", { x: 0, y: 0, width: W, height: H, fill: "#ffffff" }, svg);
    text(svg, 8, 20, o.title, { "font-size": 15, "font-weight": 600 });
    const g = el("g", { "aria-hidden": "true" }, svg);
    for (const v of yt.ticks) {
      el("line", { x1: m.l, x2: m.l + pw, y1: sy(v), y2: sy(v), stroke: GRID, "stroke-width": 1 }, g);
      text(g, m.l - 6, sy(v) + 4, fmtTick(v, yt.step), { "text-anchor": "end", fill: MUTED, "font-size": 12 });
    }
    if (!o.categorical) {
      for (const v of xt.ticks) {
        el("line", { x1: sx(v), x2: sx(v), y1: m.t, y2: m.t + ph, stroke: GRID, "stroke-width": 1 }, g);
        text(g, sx(v), m.t + ph + 17, fmtTick(v, xt.step), { "text-anchor": "middle", fill: MUTED, "font-size": 12 });
      }
    }
    el("rect", { x: m.l, y: m.t, width: pw, height: ph, fill: "none", stroke: INK, "stroke-width": 1 }, g);
    text(svg, m.l + pw / 2, H - 8, o.xLabel, { "text-anchor": "middle", "font-size": 13 });
    const yl = text(svg, 0, 0, o.yLabel, { "text-anchor": "middle", "font-size": 13, transform: "translate(16," + (m.t + ph / 2) + ") rotate(-90)" });
    yl.setAttribute("x", 0);
    return { sx, sy, m, pw, ph, W, H, xt, yt };
  }

  function root(o) {
    const W = o.width || 560, H = o.height || 360;
    const svg = el("svg", { xmlns: NS, viewBox: "0 0 " + W + " " + H, width: W, height: H, role: "img", class: "chart" });
    const id = "c" + Math.random().toString(36).slice(2, 9);
    svg.setAttribute("aria-labelledby", id + "t " + id + "d");
    el("title", { id: id + "t" }, svg).textContent = o.title;
    el("desc", { id: id + "d" }, svg).textContent = o.desc || "";
    return svg;
  }

  function extent(vals, padZero) {
    let lo = Infinity, hi = -Infinity;
    for (const v of vals) if (isFinite(v)) { if (v < lo) lo = v; if (v > hi) hi = v; }
    if (!isFinite(lo)) return [0, 1];
    if (padZero) lo = Math.min(0, lo);
    if (hi === lo) hi = lo + (Math.abs(lo) || 1);
    return [lo, hi];
  }

  function legend(svg, f, items) {
    // Legend inside the top-left of the plot area, one row per series.
    const g = el("g", {}, svg);
    let y = f.m.t + 14;
    const x = f.m.l + 10;
    const w = Math.min(f.pw - 12, 28 + 6.6 * Math.max(...items.map(i => i.name.length)));
    el("rect", { x: x - 6, y: f.m.t + 4, width: w, height: items.length * 16 + 6, fill: "#ffffff", "fill-opacity": 0.92, stroke: GRID }, g);
    for (const it of items) {
      if (it.bar) el("rect", { x: x, y: y - 8, width: 16, height: 9, fill: it.color }, g);
      else el("line", { x1: x, x2: x + 16, y1: y - 4, y2: y - 4, stroke: it.color, "stroke-width": 2.2, "stroke-dasharray": it.dash || null }, g);
      if (it.marker) el("circle", { cx: x + 8, cy: y - 4, r: 3.5, fill: it.color }, g);
      text(g, x + 22, y, it.name, { "font-size": 12 });
      y += 16;
    }
  }

  // line draws series [{name, color, dash, points: [[x, y], ...]}].
  function line(o) {
    const svg = root(o);
    const xs = [], ys = [];
    for (const s of o.series) for (const p of s.points) { xs.push(p[0]); ys.push(p[1]); }
    const f = frame(svg, o, extent(xs, o.xZero !== false), extent(ys, o.yZero !== false));
    const clip = "k" + Math.random().toString(36).slice(2, 8);
    const cp = el("clipPath", { id: clip }, el("defs", {}, svg));
    el("rect", { x: f.m.l, y: f.m.t, width: f.pw, height: f.ph }, cp);
    const g = el("g", { "clip-path": "url(#" + clip + ")" }, svg);
    for (const s of o.series) {
      const pts = s.points.filter(p => isFinite(p[0]) && isFinite(p[1]));
      if (!pts.length) continue;
      const d = pts.map((p, i) => (i ? "L" : "M") + f.sx(p[0]).toFixed(1) + " " + f.sy(p[1]).toFixed(1)).join("");
      el("path", { d: d, fill: "none", stroke: s.color, "stroke-width": 2, "stroke-dasharray": s.dash || null, "stroke-linejoin": "round" }, g);
      if (s.markers) for (const p of pts) el("circle", { cx: f.sx(p[0]), cy: f.sy(p[1]), r: 2.6, fill: s.color }, g);
    }
    if (o.legend !== false) legend(svg, f, (o.legendItems || o.series).slice(0, 14));
    return svg;
  }

  // bars draws one bar per category [{name, value, color}], with optional
  // error bars [lo, hi].
  function bars(o) {
    o = Object.assign({ categorical: true, height: 380 }, o);
    const svg = root(o);
    const vals = [];
    for (const c of o.data) { vals.push(c.value); if (c.range) vals.push(c.range[0], c.range[1]); }
    const f = frame(svg, o, [0, 1], extent(vals, true));
    const n = o.data.length, bw = f.pw / Math.max(n, 1);
    o.data.forEach((c, i) => {
      const x = f.m.l + i * bw + bw * 0.15, w = bw * 0.7;
      const y0 = f.sy(Math.max(0, f.yt.lo)), y1 = f.sy(c.value);
      el("rect", { x: x, y: Math.min(y0, y1), width: w, height: Math.abs(y0 - y1), fill: c.color || PALETTE[0] }, svg);
      const lab = text(svg, x + w / 2, f.m.t + f.ph + 14, c.name, { "text-anchor": "end", "font-size": 12,
        transform: "rotate(-30 " + (x + w / 2) + " " + (f.m.t + f.ph + 14) + ")" });
      lab.setAttribute("dy", "0.3em");
      text(svg, x + w / 2, Math.min(y0, y1) - 4, o.format ? o.format(c.value) : String(c.value), { "text-anchor": "middle", "font-size": 11, fill: MUTED });
    });
    return svg;
  }

  // scatter draws labelled points [{name, x, y, color, front}] and joins the
  // points on the front with a step line.
  function scatter(o) {
    const svg = root(o);
    const f = frame(svg, o, extent(o.points.map(p => p.x), true), extent(o.points.map(p => p.y), true));
    const front = o.points.filter(p => p.front).sort((a, b) => a.x - b.x);
    if (front.length > 1) {
      const d = front.map((p, i) => (i ? "L" : "M") + f.sx(p.x).toFixed(1) + " " + f.sy(p.y).toFixed(1)).join("");
      el("path", { d: d, fill: "none", stroke: INK, "stroke-width": 1.5, "stroke-dasharray": "5 3" }, svg);
    }
    // Labels: right of the point, moved down (then up) past labels
    // already placed, so that clustered candidates stay readable.
    const placed = [];
    const hits = (b) => placed.some(q => b.x < q.x + q.w && q.x < b.x + b.w && b.y < q.y + q.h && q.y < b.y + b.h);
    const order = o.points.slice().sort((a, b) => f.sy(a.y) - f.sy(b.y));
    for (const p of order) {
      const cx = f.sx(p.x), cy = f.sy(p.y);
      if (p.front) el("circle", { cx: cx, cy: cy, r: 7.5, fill: "none", stroke: INK, "stroke-width": 1.5 }, svg);
      el("circle", { cx: cx, cy: cy, r: 4.5, fill: p.color || PALETTE[0] }, svg);
      const w = 6.8 * p.name.length + 4, hgt = 13;
      let x = cx + 9;
      if (x + w > f.m.l + f.pw) x = cx - 9 - w;
      let y = cy - 6, tries = 0;
      while (hits({ x: x, y: y - hgt + 3, w: w, h: hgt }) && tries < 40) { y += (tries % 2 ? -1 : 1) * (tries + 1) * 7; tries++; }
      placed.push({ x: x, y: y - hgt + 3, w: w, h: hgt });
      if (Math.abs(y - (cy - 6)) > 10) el("line", { x1: cx, y1: cy, x2: x, y2: y - 4, stroke: GRID, "stroke-width": 1 }, svg);
      text(svg, x, y, p.name, { "font-size": 12 });
    }
    legend(svg, f, [{ name: "on the Pareto front", color: INK, marker: true }, { name: "front (dashed)", color: INK, dash: "5 3" }]);
    return svg;
  }

  // parity draws measured (x) against fitted (y) points [{x, y, color}]
  // with the line y = x; series [{name, color}] name the legend.
  function parity(o) {
    const svg = root(o);
    const vals = [];
    for (const p of o.points) vals.push(p.x, p.y);
    const r = extent(vals, true);
    const f = frame(svg, o, r, r);
    const lo = Math.max(f.xt.lo, f.yt.lo), hi = Math.min(f.xt.hi, f.yt.hi);
    el("line", { x1: f.sx(lo), y1: f.sy(lo), x2: f.sx(hi), y2: f.sy(hi), stroke: MUTED, "stroke-width": 1.2, "stroke-dasharray": "5 3" }, svg);
    for (const p of o.points) if (isFinite(p.x) && isFinite(p.y)) el("circle", { cx: f.sx(p.x), cy: f.sy(p.y), r: 4.5, fill: p.color || PALETTE[0] }, svg);
    legend(svg, f, o.series.map(s => ({ name: s.name, color: s.color, marker: true })).concat([{ name: "fitted = measured", color: MUTED, dash: "5 3" }]));
    return svg;
  }

  // serialise returns standalone SVG text for export.
  function serialise(svg) {
    const c = svg.cloneNode(true);
    c.setAttribute("xmlns", NS);
    c.removeAttribute("class");
    return '<?xml version="1.0" encoding="UTF-8"?>\n' + new XMLSerializer().serializeToString(c);
  }

  // toPNG renders the SVG on a canvas at the given scale; resolves a Blob.
  function toPNG(svg, scale) {
    const src = serialise(svg);
    const url = URL.createObjectURL(new Blob([src], { type: "image/svg+xml" }));
    return new Promise((resolve, reject) => {
      const img = new Image();
      img.onload = () => {
        const vb = svg.viewBox.baseVal, s = scale || 2;
        const cv = document.createElement("canvas");
        cv.width = vb.width * s; cv.height = vb.height * s;
        const cx = cv.getContext("2d");
        cx.fillStyle = "#ffffff"; cx.fillRect(0, 0, cv.width, cv.height);
        cx.drawImage(img, 0, 0, cv.width, cv.height);
        URL.revokeObjectURL(url);
        cv.toBlob(b => b ? resolve(b) : reject(new Error("PNG encoding failed")), "image/png");
      };
      img.onerror = () => { URL.revokeObjectURL(url); reject(new Error("the chart could not be drawn as an image")); };
      img.src = url;
    });
  }

  window.DrawsiftCharts = { line, bars, scatter, parity, serialise, toPNG, niceTicks, PALETTE };
})();
