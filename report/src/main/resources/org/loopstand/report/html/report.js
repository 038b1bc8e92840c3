// Loopstand report: draws the charts from the inline JSON with uPlot. Runs offline; no network.
(function () {
  "use strict";
  var data = JSON.parse(document.getElementById("report-data").textContent);
  var palette = ["#1f5fa8", "#c0392b", "#2e8b57", "#8e44ad", "#d35400", "#16a085", "#7f8c8d", "#b7950b"];
  var sync = uPlot.sync("loopstand-run");
  var plots = [];
  var timePlots = [];
  var syncing = false;

  function widthOf(el) { return Math.max(320, el.clientWidth); }

  function shareZoom(u, key) {
    if (key !== "x" || syncing) { return; }
    syncing = true;
    timePlots.forEach(function (p) {
      if (p !== u) { p.setScale("x", { min: u.scales.x.min, max: u.scales.x.max }); }
    });
    syncing = false;
  }

  data.charts.forEach(function (c, i) {
    var el = document.getElementById("chart-" + i);
    var series = [{ label: "t (s)", value: function (u, v) { return v == null ? "–" : v.toFixed(1) + " s"; } }];
    c.names.forEach(function (name, k) {
      series.push({
        label: c.units[k] ? name + " [" + c.units[k] + "]" : name,
        stroke: palette[k % palette.length],
        width: 1.5,
        spanGaps: true,
        paths: c.stepped ? uPlot.paths.stepped({ align: 1 }) : undefined
      });
    });
    var opts = {
      width: widthOf(el), height: 210,
      scales: { x: { time: false, range: [0, data.durationS] } },
      cursor: { sync: { key: sync.key } },
      legend: { live: true },
      axes: [{ label: "time since start (s)", labelSize: 20 }, { label: c.yLabel, labelSize: 20, size: 60 }],
      series: series,
      hooks: { setScale: [shareZoom] }
    };
    var p = new uPlot(opts, c.data, el);
    timePlots.push(p);
    plots.push(p);
  });

  data.histograms.forEach(function (h, i) {
    var el = document.getElementById("histogram-" + i);
    var idx = h.labels.map(function (_, k) { return k; });
    var opts = {
      width: widthOf(el), height: 220,
      scales: { x: { time: false, range: [-0.5, Math.max(0.5, idx.length - 0.5)] } },
      axes: [{ label: "upper bound (" + h.unit + ")", labelSize: 20,
               splits: function () { return idx; },
               values: function (u, splits) { return splits.map(function (s) { return h.labels[s] || ""; }); } },
             { label: "count", labelSize: 20, size: 60 }],
      series: [{ label: "bucket", value: function (u, v) { return v == null ? "–" : "≤ " + h.labels[v] + " " + h.unit; } },
               { label: "count", stroke: palette[0], fill: "rgba(31,95,168,0.35)", points: { show: false },
                 paths: uPlot.paths.bars({ size: [0.8, 60] }) }],
      legend: { live: true }
    };
    plots.push(new uPlot(opts, [idx, h.counts], el));
  });

  window.addEventListener("resize", function () {
    plots.forEach(function (p) { p.setSize({ width: widthOf(p.root.parentNode), height: p.height }); });
  });
  document.documentElement.setAttribute("data-charts", String(plots.length));
})();
