// Loopstand live view: server-sent events in, uPlot charts and tables out. No reloads, no outside files.
(function () {
  "use strict";
  const MAX_POINTS = 2400;
  const COLOURS = ["#2f6f62", "#9a4b12", "#4a4f8a", "#7a2f5c", "#5b6b1e", "#1f5f8b"];
  const token = new URLSearchParams(location.search).get("token");
  const q = token ? "?token=" + encodeURIComponent(token) : "";
  const $ = (id) => document.getElementById(id);
  let charts = null;
  let dirty = false;
  let pointCount = 0;
  window.addEventListener("error", (e) => { document.body.dataset.error = e.message; text($("run-state"), "page error: " + e.message); });

  function fmt(v, digits) { return v === null || v === undefined ? "–" : Number(v).toFixed(digits); }

  function text(el, value) { if (el.textContent !== value) { el.textContent = value; } }

  function makeChart(el, names, dashedFrom) {
    const series = [{ label: "scenario s" }];
    names.forEach((n, i) => series.push({
      label: n, stroke: COLOURS[(dashedFrom ? i % dashedFrom : i) % COLOURS.length], width: 1.5,
      dash: dashedFrom && i >= dashedFrom ? [6, 4] : undefined, spanGaps: true, points: { show: false } }));
    const data = series.map(() => []);
    const width = Math.max(240, el.clientWidth || 600);
    const plot = new uPlot({ width: width, height: 180, series: series, scales: { x: { time: false } },
      legend: { show: true }, cursor: { drag: { x: false, y: false } } }, data, el);
    return { plot: plot, data: data, el: el };
  }

  function build(s) {
    const areaNames = s.areas.map((a) => a.id);
    charts = {
      frequency: makeChart($("chart-frequency"), areaNames.concat(areaNames.map((n) => n + " metered")), areaNames.length),
      ace: makeChart($("chart-ace"), areaNames.concat(areaNames.map((n) => n + " controller")), areaNames.length),
      ties: makeChart($("chart-ties"), s.ties.map((t) => t.id + " " + t.fromArea + "→" + t.toArea)),
      units: {}
    };
    const box = $("unit-charts");
    s.units.forEach((u) => {
      const panel = document.createElement("div");
      panel.className = "panel";
      panel.innerHTML = "<h2></h2><div class='chart'></div>";
      panel.querySelector("h2").textContent = "Unit " + u.id + ", MW";
      box.appendChild(panel);
      charts.units[u.id] = makeChart(panel.querySelector(".chart"), ["output", "load reference", "target", "low limit", "high limit"]);
    });
  }

  function push(chart, x, values) {
    chart.data[0].push(x);
    values.forEach((v, i) => chart.data[i + 1].push(v === undefined ? null : v));
    if (chart.data[0].length > MAX_POINTS) { chart.data.forEach((col) => col.shift()); }
  }

  function add(s) {
    if (!charts) { build(s); }
    const t = s.timeS;
    const prev = charts.frequency.data[0];
    if (prev.length && prev[prev.length - 1] === t) { return; } // time stood still (held or finished): no new point
    push(charts.frequency, t, s.areas.map((a) => a.frequencyHz).concat(s.areas.map((a) => a.meteredFrequencyHz)));
    push(charts.ace, t, s.areas.map((a) => a.aceMw).concat(s.areas.map((a) => a.controllerAceMw)));
    push(charts.ties, t, s.ties.map((x) => x.flowMw));
    s.units.forEach((u) => {
      const c = charts.units[u.id];
      if (c) { push(c, t, [u.outputMw, u.loadReferenceMw, u.targetMw, u.regulatingMinMw, u.regulatingMaxMw]); }
    });
    pointCount = charts.frequency.data[0].length;
    dirty = true;
  }

  function show(s) {
    text($("run-state"), s.state);
    $("run-state").className = "state-" + s.state;
    text($("scenario-time"), fmt(s.timeS, 1));
    text($("rate"), fmt(s.rate, 0));
    text($("lateness"), fmt(s.lateness.p99Us / 1000, 1));
    const c = s.controller;
    text($("controller"), c ? c.id + ": " + c.state + (c.reasons.length ? " (" + c.reasons.join("; ") + ")" : "")
      + ", cycle " + c.cycle + ", heard " + fmt(c.ageS, 1) + " s ago"
      + (c.heldAreas.length ? "; holds " + c.heldAreas.join("; ") : "")
      + (c.excludedUnits.length ? "; leaves out " + c.excludedUnits.join("; ") : "") : "no status heard yet");
    const units = $("units-table").tBodies[0];
    units.replaceChildren(...s.units.map((u) => row([u.id, u.mode + (u.online ? "" : ", tripped"), [fmt(u.outputMw, 1)],
      [fmt(u.targetMw, 1)], fmt(u.regulatingMinMw, 0) + "–" + fmt(u.regulatingMaxMw, 0), u.lastCommand || "–", [String(u.refusals)]])));
    const faults = $("faults-table").tBodies[0];
    faults.replaceChildren(...(s.faults.length ? s.faults.map((f) => row([f.id, f.type, f.targets.join(", "), [fmt(f.activeForS, 0)], f.source]))
      : [row(["none", "", "", "", ""])]));
    const checks = $("checks");
    checks.replaceChildren(...(s.checks.length ? s.checks : ["this run has no scenario checks"]).map((line) => {
      const li = document.createElement("li");
      li.textContent = line;
      li.className = /\bPASS/i.test(line) ? "pass" : /\bFAIL/i.test(line) ? "fail" : "";
      return li;
    }));
  }

  function row(cells) {
    const tr = document.createElement("tr");
    cells.forEach((v) => {
      const td = document.createElement("td");
      if (Array.isArray(v)) { td.className = "num"; v = v[0]; }
      td.textContent = v;
      tr.appendChild(td);
    });
    return tr;
  }

  function redraw() {
    if (charts && dirty) {
      dirty = false;
      const all = [charts.frequency, charts.ace, charts.ties].concat(Object.values(charts.units));
      all.forEach((c) => c.plot.setData(c.data));
      document.body.dataset.points = String(pointCount);
    }
  }
  setInterval(redraw, 500);

  window.addEventListener("resize", () => {
    if (!charts) { return; }
    [charts.frequency, charts.ace, charts.ties].concat(Object.values(charts.units))
      .forEach((c) => c.plot.setSize({ width: Math.max(240, c.el.clientWidth), height: 180 }));
  });

  const events = new EventSource("/events" + q);
  events.addEventListener("history", (e) => {
    const list = JSON.parse(e.data);
    list.forEach(add);
    if (list.length) { show(list[list.length - 1]); }
    redraw();
  });
  events.addEventListener("snapshot", (e) => { const s = JSON.parse(e.data); add(s); show(s); });
  events.addEventListener("report", (e) => {
    const link = $("report-link");
    link.href = JSON.parse(e.data) + q;
    link.hidden = false;
  });
  events.onerror = () => { if (!$("report-link").hidden) { text($("run-state"), "ended"); } };

  // fault controls
  let library = null;
  fetch("/api/faults" + q).then((r) => r.json()).then((lib) => {
    library = lib;
    text($("site"), "site " + lib.site);
    if (!lib.controls) { $("no-controls").hidden = false; return; }
    $("fault-panel").hidden = false;
    text($("caution"), lib.caution);
    const select = $("fault-type");
    lib.types.forEach((t) => { const o = document.createElement("option"); o.value = t.name; o.textContent = t.name; select.appendChild(o); });
    select.addEventListener("change", help);
    help();
  });

  function help() {
    const t = library.types.find((x) => x.name === $("fault-type").value);
    text($("fault-help"), t ? t.description + " (targets: " + t.targets.join(", ") + ")"
      + (t.parameterHelp.length ? "; parameters: " + t.parameterHelp.join("; ") : "") : "");
  }

  function send(action, form) {
    const answer = $("fault-answer");
    const body = new URLSearchParams(new FormData(form));
    if (action === "stop") { body.set("name", $("fault-name").value); }
    fetch("/api/faults/" + action + q, { method: "POST", body: body, headers: { "X-Loopstand-Live": "1" } })
      .then((r) => r.text().then((t) => { answer.textContent = t; answer.className = "answer" + (r.ok ? "" : " refused"); }))
      .catch((err) => { answer.textContent = "not sent: " + err; answer.className = "answer refused"; });
  }
  $("fault-form").addEventListener("submit", (e) => { e.preventDefault(); send("start", e.target); });
  $("stop-form").addEventListener("submit", (e) => { e.preventDefault(); send("stop", e.target); });
})();
