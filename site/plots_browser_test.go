//go:build !js

package site_test

import (
	"fmt"
	"strings"
	"testing"

	"github.com/chromedp/cdproto/emulation"
	"github.com/chromedp/chromedp"
)

// jsPlotFaults lists what is wrong with each chart on the page, measured
// from the rendered boxes: a legend over the plot area, a point or curve
// (the top-ranked candidate's point included) under the legend, a chart
// wider than its figure or the figure wider than the panel, tick labels
// smaller than 10 px or overlapping their neighbours, text outside the
// figure, an axis label without a unit.
const jsPlotFaults = `(() => {
	const faults = [], meet = (a, b) => a.left < b.right - 0.5 && b.left < a.right - 0.5 && a.top < b.bottom - 0.5 && b.top < a.bottom - 0.5;
	const panel = document.getElementById("results-area").getBoundingClientRect();
	const top = document.querySelector("#ranking tbody tr") && document.querySelector("#ranking tbody tr").dataset.solute;
	for (const fig of document.querySelectorAll("#plots figure, #sweep-plot figure")) {
		const key = fig.dataset.plot, svg = fig.querySelector("svg"), sb = svg.getBoundingClientRect(), fb = fig.getBoundingClientRect();
		if (sb.right > fb.right + 1 || sb.left < fb.left - 1) faults.push(key + ": chart " + Math.round(sb.width) + " px in a figure of " + Math.round(fb.width));
		if (fb.right > panel.right + 1) faults.push(key + ": figure runs past the panel by " + Math.round(fb.right - panel.right) + " px");
		const area = svg.querySelector(".plot-area").getBoundingClientRect(), lg = svg.querySelector(".legend");
		if (lg) {
			const lb = lg.getBoundingClientRect();
			if (meet(lb, area)) faults.push(key + ": the legend lies over the plot area");
			for (const p of svg.querySelectorAll("circle.point, g[clip-path] path")) if (meet(p.getBoundingClientRect(), lb)) faults.push(key + ": data under the legend");
		}
		const tp = top && svg.querySelector('circle.point[data-name="' + CSS.escape(top) + '"]');
		if (key === "tradeoff" && !tp) faults.push("tradeoff: no point for the top-ranked " + top);
		if (tp && lg && meet(tp.getBoundingClientRect(), lg.getBoundingClientRect())) faults.push("tradeoff: the top-ranked point is under the legend");
		const ticks = Array.from(svg.querySelectorAll("text.tick")).map(t => t.getBoundingClientRect());
		if (!ticks.length) faults.push(key + ": no ticks");
		for (const b of ticks) if (b.height < 10) { faults.push(key + ": tick text " + b.height.toFixed(1) + " px high"); break; }
		for (let i = 0; i < ticks.length; i++) for (let j = i + 1; j < ticks.length; j++) if (meet(ticks[i], ticks[j])) { faults.push(key + ": tick labels overlap"); i = ticks.length; break; }
		for (const t of svg.querySelectorAll("text")) {
			const b = t.getBoundingClientRect();
			if (b.width && (b.left < sb.left - 1 || b.right > sb.right + 1 || b.top < sb.top - 1 || b.bottom > sb.bottom + 1)) { faults.push(key + ": text " + JSON.stringify(t.textContent) + " outside the chart"); break; }
		}
		const labels = Array.from(svg.querySelectorAll("text.axis-label")).map(t => t.textContent).filter(s => s);
		if (!labels.length || labels.some(s => !/\(.+\)/.test(s))) faults.push(key + ": axis labels without units " + JSON.stringify(labels));
	}
	return faults;
})()`

// TestPagePlotsFit: at 360, 768 and 1,400 px every chart (the four of the
// ranking and a sweep) fits its figure, keeps its legend off the data,
// and keeps axis labels with units and ticks at a readable size that do
// not overlap. The charts are drawn at the width they are shown.
func TestPagePlotsFit(t *testing.T) {
	b, _ := openServed(t)
	b.do(t, chromedp.Click(chromedp.ID("tab-plots")))
	b.waitPlots(t)
	b.do(t, chromedp.Click(chromedp.ID("btn-sweep")))
	b.waitFor(t, `document.body.dataset.sweep === "done" || document.body.dataset.sweep === "failed"`)
	if st := eval[string](t, b, `document.body.dataset.sweep`); st != "done" {
		t.Fatalf("the sweep ended %s", st)
	}
	for _, w := range []int64{360, 768, 1400} {
		if _, err := chromedp.Call(b.ctx, emulation.SetDeviceMetricsOverride, emulation.SetDeviceMetricsOverrideParams{Width: w, Height: 900, DeviceScaleFactor: 1}); err != nil {
			t.Fatal(err)
		}
		b.waitFor(t, fmt.Sprintf(`innerWidth === %d`, w))
		// The charts are redrawn for the new width: wait until each is shown
		// within 15 %% of the width it was drawn at, and the plots are done.
		b.waitFor(t, `(d => d.plots === d.run)(document.body.dataset) && document.querySelectorAll("#plots figure svg").length === 4 && !!document.querySelector("#sweep-plot svg") &&
			Array.from(document.querySelectorAll("#plots svg, #sweep-plot svg")).every(s => Math.abs(s.getBoundingClientRect().width / s.viewBox.baseVal.width - 1) < 0.15)`)
		if faults := eval[[]string](t, b, jsPlotFaults); len(faults) > 0 {
			t.Errorf("at %d px: %v", w, faults)
		}
		b.screenshot(t, fmt.Sprintf("%dpx", w))
	}
}

// TestPageRobustnessChart: the robustness run draws each candidate's rank
// interval (5th–95th percentile), median and nominal rank beside P(top 3),
// matching the table, fitting its figure at 360 and 1,400 px, and the
// chart goes into the printed report.
func TestPageRobustnessChart(t *testing.T) {
	b, _ := openServed(t)
	b.do(t, chromedp.SetValue(chromedp.ID("unc-samples"), "200"),
		chromedp.Evaluate[chromedp.Void](`document.getElementById("unc-samples").dispatchEvent(new Event("input", {bubbles: true}))`))
	b.settle(t)
	robustRun(t, b)
	b.waitFor(t, `document.body.dataset.robust === "done" || document.body.dataset.robust === "error"`)
	chart := eval[[][]string](t, b, `Array.from(document.querySelectorAll('#robust-chart g.interval')).map(g => [g.dataset.name, g.dataset.lo, g.dataset.hi])`)
	table := eval[[][]string](t, b, `Array.from(document.querySelectorAll('#robust-table tbody tr')).map(tr => [tr.dataset.solute, tr.cells[4].textContent, tr.cells[6].textContent])`)
	if len(chart) == 0 || fmt.Sprint(chart) != fmt.Sprint(table) {
		t.Errorf("chart rows %v, table %v", chart, table)
	}
	for _, w := range []int64{360, 1400} {
		if _, err := chromedp.Call(b.ctx, emulation.SetDeviceMetricsOverride, emulation.SetDeviceMetricsOverrideParams{Width: w, Height: 900, DeviceScaleFactor: 1}); err != nil {
			t.Fatal(err)
		}
		b.waitFor(t, fmt.Sprintf(`innerWidth === %d`, w))
		b.do(t, chromedp.Evaluate[chromedp.Void](`window.DrawsiftPage.renderRobust()`))
		faults := eval[[]string](t, b, strings.Replace(jsPlotFaults, `"#plots figure, #sweep-plot figure"`, `"#robust-chart figure"`, 1))
		if len(faults) > 0 {
			t.Errorf("at %d px: %v", w, faults)
		}
	}
	b.do(t, chromedp.Evaluate[chromedp.Void](`window.dispatchEvent(new Event("beforeprint"))`))
	if n := eval[int](t, b, `document.querySelectorAll("#rp-plots g.interval").length`); n != len(table) {
		t.Errorf("the report's robustness chart has %d rows, want %d", n, len(table))
	}
}
