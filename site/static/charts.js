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

  // A label's width in px at 12 px (an estimate: no layout is asked for).
  function textW(str, size) { return 0.6 * (size || 12) * String(str).length; }

  // layoutLegend flows the legend items left to right in rows under the
  // plot (never over the data); returns each item's place and the height.
  function layoutLegend(items, W, x0) {
    const rowH = 17, places = [];
    let x = x0, row = 0;
    for (let it of items) {
      // A name longer than the chart is wide is cut, in full in its tooltip.
      const room = Math.floor((W - x0 - 6 - 40) / textW("m", 12));
      if (it.name.length > room) it = Object.assign({}, it, { full: it.name, name: it.name.slice(0, Math.max(4, room - 1)) + "…" });
      const w = 26 + textW(it.name, 12) + 14;
      if (x > x0 && x + w > W - 6) { row++; x = x0; }
      places.push({ it: it, x: x, row: row });
      x += w;
    }
    return { places: places, height: items.length ? (row + 1) * rowH + 8 : 0, rowH: rowH };
  }

  // ticksFor chooses tick values whose labels fit the axis length.
  function ticksFor(lo, hi, len, perLabel, vertical) {
    let n = Math.max(2, Math.floor(len / (vertical ? 48 : 64)));
    for (;;) {
      const t = niceTicks(lo, hi, n);
      const widest = vertical ? 16 : Math.max(...t.ticks.map(v => textW(fmtTick(v, t.step)))) + perLabel;
      if (n <= 2 || len / Math.max(1, t.ticks.length - 1) >= widest) return t;
      n--;
    }
  }

  // frame draws the plot area, axes, grid and labels and returns scales.
  // The chart is drawn at the width it is shown (o.width, px), so its text
  // keeps its size on a phone; the legend (o.legendItems) goes below the
  // axes, outside the plot area.
  function frame(svg, o, xr, yr, lg) {
    const W = o.width || 560, H = o.height || 360;
    // A title too long for the width breaks at a space into two lines.
    const tSize = W < 420 ? 13 : 15;
    let lines = [o.title];
    if (textW(o.title, tSize) > W - 16) {
      const mid = o.title.length / 2, cuts = [];
      for (let i = 0; i < o.title.length; i++) if (o.title[i] === " ") cuts.push(i);
      if (cuts.length) {
        const c = cuts.reduce((a, b) => Math.abs(b - mid) < Math.abs(a - mid) ? b : a);
        lines = [o.title.slice(0, c), o.title.slice(c + 1)];
      }
    }
    const m = { l: 62, r: 18, t: 34 + 17 * (lines.length - 1), b: (o.categorical ? o.catBottom || 64 : 48) + (lg ? lg.height : 0) };
    const pw = W - m.l - m.r, ph = H - m.t - m.b;
    const xt = ticksFor(xr[0], xr[1], pw, 12, false), yt = ticksFor(yr[0], yr[1], ph, 0, true);
    const sx = v => m.l + (v - xt.lo) / (xt.hi - xt.lo) * pw;
    const sy = v => m.t + ph - (v - yt.lo) / (yt.hi - yt.lo) * ph;
    el("rect", { x: 0, y: 0, width: W, height: H, fill: "#ffffff" }, svg);
    lines.forEach((l, i) => text(svg, 8, 20 + 17 * i, l, { "font-size": tSize, "font-weight": 600 }));
    const g = el("g", { "aria-hidden": "true" }, svg);
    for (const v of yt.ticks) {
      el("line", { x1: m.l, x2: m.l + pw, y1: sy(v), y2: sy(v), stroke: GRID, "stroke-width": 1 }, g);
      text(g, m.l - 6, sy(v) + 4, fmtTick(v, yt.step), { class: "tick", "text-anchor": "end", fill: MUTED, "font-size": 12 });
    }
    if (!o.categorical) {
      for (const v of xt.ticks) {
        el("line", { x1: sx(v), x2: sx(v), y1: m.t, y2: m.t + ph, stroke: GRID, "stroke-width": 1 }, g);
        // The last label ends at the frame's edge rather than past the figure.
        const lab = fmtTick(v, xt.step), half = textW(lab) / 2;
        const anchor = sx(v) + half > W - 2 ? "end" : "middle";
        text(g, anchor === "end" ? Math.min(sx(v) + half, W - 2) : sx(v), m.t + ph + 20, lab, { class: "tick", "text-anchor": anchor, fill: MUTED, "font-size": 12 });
      }
    }
    el("rect", { class: "plot-area", x: m.l, y: m.t, width: pw, height: ph, fill: "none", stroke: INK, "stroke-width": 1 }, g);
    text(svg, m.l + pw / 2, m.t + ph + (o.categorical ? 58 : 38), o.xLabel, { class: "axis-label", "text-anchor": "middle", "font-size": W < 420 ? 12 : 13 });
    const yl = text(svg, 0, 0, o.yLabel, { class: "axis-label", "text-anchor": "middle", "font-size": 13, transform: "translate(16," + (m.t + ph / 2) + ") rotate(-90)" });
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

  // legend draws the laid-out items below the axes (class "legend", so a
  // test or a reader can find it).
  function legend(svg, f, lg) {
    if (!lg || !lg.places.length) return;
    const g = el("g", { class: "legend" }, svg);
    const y0 = f.H - lg.height + 12;
    for (const p of lg.places) {
      const it = p.it, x = p.x, y = y0 + p.row * lg.rowH;
      if (it.bar) el("rect", { x: x, y: y - 8, width: 16, height: 9, fill: it.color, "fill-opacity": 0.45 }, g);
      else if (!it.diamond && !it.dot) el("line", { x1: x, x2: x + 16, y1: y - 4, y2: y - 4, stroke: it.color, "stroke-width": 2.2, "stroke-dasharray": it.dash || null }, g);
      if (it.marker || it.dot) el("circle", { cx: x + 8, cy: y - 4, r: 3.5, fill: it.color }, g);
      if (it.diamond) el("path", { d: "M" + (x + 8) + " " + (y - 9) + "L" + (x + 13) + " " + (y - 4) + "L" + (x + 8) + " " + (y + 1) + "L" + (x + 3) + " " + (y - 4) + "Z", fill: "#ffffff", stroke: it.color, "stroke-width": 1.5 }, g);
      if (it.ring) el("circle", { cx: x + 8, cy: y - 4, r: 6, fill: "none", stroke: it.color, "stroke-width": 1.5 }, g);
      const t = text(g, x + 22, y, it.name, { "font-size": 12 });
      if (it.full) el("title", {}, t).textContent = it.full;
    }
  }
  // withLegend sizes the chart for its legend: o.height is the plot's own
  // height, the legend's rows are added below.
  function withLegend(o, items) {
    const W = o.width || 560;
    const lg = layoutLegend(items, W, 12);
    return { o: Object.assign({}, o, { height: (o.height || Math.round(Math.max(250, Math.min(360, W * 0.64)))) + lg.height }), lg: lg };
  }

  // line draws series [{name, color, dash, points: [[x, y], ...]}].
  function line(o) {
    const L = withLegend(o, o.legend === false ? [] : (o.legendItems || o.series).slice(0, 24));
    o = L.o;
    const svg = root(o);
    const xs = [], ys = [];
    for (const s of o.series) for (const p of s.points) { xs.push(p[0]); ys.push(p[1]); }
    const f = frame(svg, o, extent(xs, o.xZero !== false), extent(ys, o.yZero !== false), L.lg);
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
    legend(svg, f, L.lg);
    return svg;
  }

  // bars draws one bar per category [{name, value, color}], with optional
  // error bars [lo, hi].
  function bars(o) {
    o = Object.assign({ categorical: true }, o);
    if (!o.height) o.height = Math.round(Math.max(280, Math.min(380, (o.width || 560) * 0.68)));
    const svg = root(o);
    const vals = [];
    for (const c of o.data) { vals.push(c.value); if (c.range) vals.push(c.range[0], c.range[1]); }
    // Category names turn steeper where bars are narrow, so neighbours do
    // not overlap; the bottom margin fits the longest name.
    const n = o.data.length, bw0 = ((o.width || 560) - 80) / Math.max(n, 1);
    const angle = bw0 < 34 ? 60 : 30, longest = Math.max(1, ...o.data.map(c => textW(c.name)));
    o.catBottom = Math.max(40, Math.ceil(longest * Math.sin(angle * Math.PI / 180) + 22));
    const f = frame(svg, o, [0, 1], extent(vals, true));
    const bw = f.pw / Math.max(n, 1);
    o.data.forEach((c, i) => {
      const x = f.m.l + i * bw + bw * 0.15, w = bw * 0.7;
      const y0 = f.sy(Math.max(0, f.yt.lo)), y1 = f.sy(c.value);
      const bar = el("rect", { x: x, y: Math.min(y0, y1), width: w, height: Math.abs(y0 - y1), fill: c.color || PALETTE[0] }, svg);
      const val = o.format ? o.format(c.value) : String(c.value);
      el("title", {}, bar).textContent = c.name + ": " + val;
      const lab = text(svg, x + w / 2, f.m.t + f.ph + 14, c.name, { "text-anchor": "end", "font-size": 12,
        transform: "rotate(-" + angle + " " + (x + w / 2) + " " + (f.m.t + f.ph + 14) + ")" });
      lab.setAttribute("dy", "0.3em");
      // The value above its bar where it fits (else in the bar's tooltip).
      if (textW(val, 11) <= bw) text(svg, x + w / 2, Math.min(y0, y1) - 4, val, { "text-anchor": "middle", "font-size": 11, fill: MUTED });
    });
    return svg;
  }

  // scatter draws labelled points [{name, x, y, color, front}] and joins the
  // points on the front with a step line.
  function scatter(o) {
    const L = withLegend(o, [{ name: "ringed: on the Pareto front", color: INK, ring: true }, { name: "dashed: the front", color: INK, dash: "5 3" }]);
    o = L.o;
    const svg = root(o);
    const f = frame(svg, o, extent(o.points.map(p => p.x), true), extent(o.points.map(p => p.y), true), L.lg);
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
      el("circle", { class: "point", "data-name": p.name, cx: cx, cy: cy, r: 4.5, fill: p.color || PALETTE[0] }, svg);
      const w = 6.8 * p.name.length + 4, hgt = 13;
      let x = cx + 9;
      if (x + w > f.m.l + f.pw) x = cx - 9 - w;
      let y = cy - 6, tries = 0;
      while (hits({ x: x, y: y - hgt + 3, w: w, h: hgt }) && tries < 40) { y += (tries % 2 ? -1 : 1) * (tries + 1) * 7; tries++; }
      placed.push({ x: x, y: y - hgt + 3, w: w, h: hgt });
      if (Math.abs(y - (cy - 6)) > 10) el("line", { x1: cx, y1: cy, x2: x, y2: y - 4, stroke: GRID, "stroke-width": 1 }, svg);
      text(svg, x, y, p.name, { "font-size": 12 });
    }
    legend(svg, f, L.lg);
    return svg;
  }

  // intervals draws one row per item [{name, lo, mid, hi, mark, note,
  // color}] on a shared axis from o.from to o.to: a bar from lo to hi, a
  // dot at mid, a diamond at mark, the name on the left and the note on
  // the right. Used for rank intervals (rank 1 on the left).
  function intervals(o) {
    const W = o.width || 560, rowH = 22, n = o.items.length;
    const nameW = Math.min(W * 0.3, 12 + Math.max(...o.items.map(i => textW(i.name)))), noteW = 12 + Math.max(0, ...o.items.map(i => textW(i.note || "")));
    const L = withLegend(Object.assign({}, o, { height: 44 + n * rowH + 44 }), [{ name: o.barLabel || "5th–95th percentile", color: MUTED, bar: true },
      { name: o.midLabel || "median", color: INK, dot: true }, { name: o.markLabel || "nominal", color: INK, diamond: true }]);
    o = L.o;
    const svg = root(o);
    const H = o.height;
    el("rect", { x: 0, y: 0, width: W, height: H, fill: "#ffffff" }, svg);
    text(svg, 8, 20, o.title, { "font-size": W < 420 ? 13 : 15, "font-weight": 600 });
    const m = { l: nameW, r: noteW, t: 36 };
    const pw = W - m.l - m.r, ph = n * rowH;
    const span = Math.max(1, o.to - o.from);
    const sx = v => m.l + (v - o.from) / span * pw;
    const g = el("g", {}, svg);
    const step = Math.max(1, Math.ceil(span / Math.max(2, Math.floor(pw / 28))));
    for (let v = o.from; v <= o.to; v += step) {
      el("line", { x1: sx(v), x2: sx(v), y1: m.t, y2: m.t + ph, stroke: GRID, "stroke-width": 1 }, g);
      text(g, sx(v), m.t + ph + 16, String(v), { class: "tick", "text-anchor": "middle", fill: MUTED, "font-size": 12 });
    }
    el("rect", { class: "plot-area", x: m.l, y: m.t, width: pw, height: ph, fill: "none", stroke: INK, "stroke-width": 1 }, g);
    text(svg, m.l + pw / 2, m.t + ph + 34, o.xLabel, { class: "axis-label", "text-anchor": "middle", "font-size": 12 });
    o.items.forEach((it, i) => {
      const y = m.t + i * rowH + rowH / 2;
      const row = el("g", { class: "interval", "data-name": it.name, "data-lo": it.lo, "data-hi": it.hi }, svg);
      text(row, m.l - 6, y + 4, it.name, { "text-anchor": "end", "font-size": 12 });
      el("rect", { x: sx(it.lo) - 3, y: y - 5, width: Math.max(6, sx(it.hi) - sx(it.lo) + 6), height: 10, rx: 5, fill: it.color || MUTED, "fill-opacity": 0.45 }, row);
      el("circle", { cx: sx(it.mid), cy: y, r: 4, fill: INK }, row);
      const d = 5, cx = sx(it.mark);
      el("path", { d: "M" + cx + " " + (y - d) + "L" + (cx + d) + " " + y + "L" + cx + " " + (y + d) + "L" + (cx - d) + " " + y + "Z", fill: "none", stroke: INK, "stroke-width": 1.5 }, row);
      if (it.note) text(row, W - noteW + 8, y + 4, it.note, { "font-size": 12, fill: MUTED });
    });
    legend(svg, { H: H }, L.lg);
    return svg;
  }

  // parity draws measured (x) against fitted (y) points [{x, y, color}]
  // with the line y = x; series [{name, color}] name the legend.
  function parity(o) {
    const L = withLegend(o, o.series.map(s => ({ name: s.name, color: s.color, marker: true })).concat([{ name: "fitted = measured", color: MUTED, dash: "5 3" }]));
    o = L.o;
    const svg = root(o);
    const vals = [];
    for (const p of o.points) vals.push(p.x, p.y);
    const r = extent(vals, true);
    const f = frame(svg, o, r, r, L.lg);
    const lo = Math.max(f.xt.lo, f.yt.lo), hi = Math.min(f.xt.hi, f.yt.hi);
    el("line", { x1: f.sx(lo), y1: f.sy(lo), x2: f.sx(hi), y2: f.sy(hi), stroke: MUTED, "stroke-width": 1.2, "stroke-dasharray": "5 3" }, svg);
    for (const p of o.points) if (isFinite(p.x) && isFinite(p.y)) el("circle", { cx: f.sx(p.x), cy: f.sy(p.y), r: 4.5, fill: p.color || PALETTE[0] }, svg);
    legend(svg, f, L.lg);
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

  window.DrawsiftCharts = { line, bars, scatter, parity, intervals, serialise, toPNG, niceTicks, PALETTE };
})();
