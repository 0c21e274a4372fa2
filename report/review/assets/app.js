// sitecover review page: plan view (SVG) of the local plane, the figures,
// the range slider with the coverage curve, and the edit tools. Every
// figure shown comes from the server (package coverage); this script only
// draws and sends edits. Plain JavaScript, no library.
"use strict";

(function () {
  const NS = "http://www.w3.org/2000/svg";
  const MAX_MARKED = 40; // gaps numbered on the plan (by closing range)
  const $ = (id) => document.getElementById(id);
  const svg = $("map");

  let scene = null;   // /api/scene
  let state = null;   // /api/state
  let cells = null;   // /api/cells when shown
  let tool = "drag";
  let selected = null; // {kind: "gap"|"device", id}
  // view: screen = ((x - cx) * k + w/2, (cy - y) * k + h/2)
  const view = { cx: 0, cy: 0, k: 1, w: 800, h: 600 };
  let gestureSeq = 0;
  let busy = false, queued = null; // one edit in flight; the latest queued
  let lastRoundTripMs = 0;

  // ---------- numbers ----------
  const fx = (v, d) => (v === null || v === undefined || !isFinite(v)) ? "–" : v.toFixed(d);
  const fmtM = (v) => fx(v, 2) + " m";
  const fmtArea = (v) => fx(v, 1) + " m²";
  const fmtPct = (f) => fx(100 * f, 2) + " %";

  // ---------- API ----------
  async function getJSON(url) {
    const r = await fetch(url, { cache: "no-store" });
    const b = await r.json();
    if (!r.ok) throw new Error(b.error || r.statusText);
    return b;
  }
  async function postJSON(url, body) {
    const r = await fetch(url, { method: "POST", headers: { "Content-Type": "application/json" }, body: JSON.stringify(body) });
    const b = await r.json();
    if (!r.ok) throw new Error(b.error || r.statusText);
    return b;
  }

  // edit sends one edit. One edit is in flight at a time; the edits that
  // follow wait in a queue, where consecutive edits of one gesture (a drag,
  // the slider) collapse into the latest.
  const queue = [];
  function edit(e) {
    window.review.pending = true;
    if (busy) {
      const last = queue[queue.length - 1];
      if (last && e.gesture && last.gesture === e.gesture && last.op === e.op) queue[queue.length - 1] = e;
      else queue.push(e);
      return;
    }
    busy = true;
    const t0 = performance.now();
    postJSON("/api/edit", e).then((s) => {
      lastRoundTripMs = performance.now() - t0;
      const t1 = performance.now();
      setState(s);
      window.review.setStateMs = performance.now() - t1;
      window.review.fetchMs = lastRoundTripMs;
    }).catch((err) => {
      toast(err.message);
      draw();
    }).finally(() => {
      busy = false;
      if (queue.length) edit(queue.shift());
      else window.review.pending = false;
    });
  }

  function toast(msg) {
    const t = $("toast");
    t.textContent = msg;
    t.hidden = false;
    clearTimeout(toast.timer);
    toast.timer = setTimeout(() => { t.hidden = true; }, 5000);
  }

  // ---------- geometry helpers ----------
  const sx = (x) => (x - view.cx) * view.k + view.w / 2;
  const sy = (y) => (view.cy - y) * view.k + view.h / 2;
  const wx = (px) => (px - view.w / 2) / view.k + view.cx;
  const wy = (py) => view.cy - (py - view.h / 2) / view.k;

  function ringPath(ring) {
    let d = "";
    for (let i = 0; i < ring.length; i++) {
      d += (i ? "L" : "M") + sx(ring[i][0]).toFixed(1) + " " + sy(ring[i][1]).toFixed(1);
    }
    return d + "Z";
  }
  function polysPath(polys) {
    let d = "";
    for (const poly of polys) for (const ring of poly) d += ringPath(ring);
    return d;
  }
  function el(name, attrs, parent) {
    const e = document.createElementNS(NS, name);
    for (const k in attrs) e.setAttribute(k, attrs[k]);
    if (parent) parent.appendChild(e);
    return e;
  }
  function clear(id) { const g = $(id); while (g.firstChild) g.removeChild(g.firstChild); return g; }

  function fit() {
    const r = svg.getBoundingClientRect();
    view.w = r.width; view.h = r.height;
    const b = scene.bound;
    const pad = 40;
    const kx = (view.w - 2 * pad) / Math.max(b[2] - b[0], 1e-9);
    const ky = (view.h - 2 * pad - 40) / Math.max(b[3] - b[1], 1e-9);
    view.k = Math.min(kx, ky);
    view.cx = (b[0] + b[2]) / 2;
    view.cy = (b[1] + b[3]) / 2 - 10 / view.k;
  }

  // ---------- drawing ----------
  function draw() {
    if (!scene || !state) return;
    const t0 = performance.now();
    drawArea();
    drawCanvas();
    drawCells();
    drawGaps();
    drawDevices();
    drawOverlay();
    drawLegend();
    window.review.drawMs = performance.now() - t0;
  }

  function drawArea() {
    const g = clear("l-area");
    for (const poly of scene.area) {
      el("path", { d: polysPath([poly]), class: "area" }, g);
      for (let i = 1; i < poly.length; i++) el("path", { d: ringPath(poly[i]), class: "excl" }, g);
    }
    const c = clear("l-context");
    if (!$("show-context").checked) return;
    if (scene.context.length) el("path", { d: polysPath(scene.context), class: "ctx" }, c);
    for (const p of scene.contextPoints) el("circle", { cx: sx(p[0]), cy: sy(p[1]), r: 2.5, class: "ctxpt" }, c);
  }

  // The disks and the devices are painted on a canvas between the area
  // (SVG below) and the gaps (SVG above): an SVG element, or even one SVG
  // path, per device is far too slow to paint for thousands of devices.
  // A device is never inside a gap (its own spot is covered), so the gaps
  // may lie above the devices. Pointer events find devices by distance
  // (deviceAt).
  const cv = $("cv");
  const disksCv = document.createElement("canvas");
  function drawCanvas() {
    const dpr = window.devicePixelRatio || 1;
    const W = Math.round(view.w * dpr), H = Math.round(view.h * dpr);
    for (const c of [cv, disksCv]) if (c.width !== W || c.height !== H) { c.width = W; c.height = H; }
    const ctx = cv.getContext("2d");
    ctx.setTransform(1, 0, 0, 1, 0, 0);
    ctx.clearRect(0, 0, W, H);
    ctx.setTransform(dpr, 0, 0, dpr, 0, 0);
    const devs = state.devices;
    // on dense plans the disk rims and device outlines are left out: they
    // merge into a blur anyway and cost most of the painting
    const dense = devs.length > DENSE;
    if ($("show-disks").checked) {
      // the union of the disks, tinted once: painted opaque apart, then
      // laid on with the tint's opacity
      const r = state.figures.rangeM * view.k;
      const dc = disksCv.getContext("2d");
      dc.setTransform(1, 0, 0, 1, 0, 0);
      dc.clearRect(0, 0, W, H);
      dc.setTransform(dpr, 0, 0, dpr, 0, 0);
      dc.fillStyle = "#56B4E9";
      const rims = circles(devs, r, (d) => d.on, (p) => dc.fill(p));
      ctx.globalAlpha = 0.16;
      ctx.drawImage(disksCv, 0, 0, view.w, view.h);
      ctx.globalAlpha = 1;
      if (!dense) {
        ctx.strokeStyle = "rgba(0,114,178,0.45)";
        ctx.lineWidth = 1;
        for (const p of rims) ctx.stroke(p);
      }
    }
    const rad = devRadius();
    ctx.lineWidth = 1.5;
    ctx.fillStyle = "#0072B2"; ctx.strokeStyle = "#ffffff";
    circles(devs, rad, (d) => d.on, (p) => { ctx.fill(p); if (!dense) ctx.stroke(p); });
    const crosses = new Path2D();
    const off = circles(devs, rad, (d) => !d.on, () => {});
    devs.forEach((d, i) => {
      if (d.on || i === dragging.device) return;
      const x = sx(d.x), y = sy(d.y);
      crosses.moveTo(x - 4, y - 4); crosses.lineTo(x + 4, y + 4); crosses.moveTo(x - 4, y + 4); crosses.lineTo(x + 4, y - 4);
    });
    ctx.fillStyle = "#ffffff"; ctx.strokeStyle = "#444444";
    for (const p of off) { ctx.fill(p); ctx.stroke(p); }
    ctx.stroke(crosses);
  }

  // circles builds the circles of radius r (px) around the devices that
  // pass keep, in batches of CIRCLE_BATCH (one path of thousands of
  // overlapping circles is slow to fill), calls paint on each batch and
  // returns the batches. The dragged device is left out.
  const CIRCLE_BATCH = 256;
  const DENSE = 2000;
  function circles(devs, r, keep, paint) {
    const out = [];
    let p = null, n = 0;
    devs.forEach((d, i) => {
      if (!keep(d) || i === dragging.device) return;
      if (!p || n === CIRCLE_BATCH) { if (p) paint(p); p = new Path2D(); out.push(p); n = 0; }
      const x = sx(d.x), y = sy(d.y);
      p.moveTo(x + r, y);
      p.arc(x, y, r, 0, 2 * Math.PI);
      n++;
    });
    if (p) paint(p);
    return out;
  }

  function drawCells() {
    const g = clear("l-cells");
    if (!$("show-cells").checked || !cells) return;
    let d = "";
    for (const c of cells) d += polysPath(c.outline);
    el("path", { d: d, class: "cell" }, g);
  }

  function drawGaps() {
    const g = clear("l-gaps");
    const m = clear("l-marks");
    // a hatch pattern per gap is slow to paint when there are hundreds
    const dense = state.figures.gaps.length > MAX_MARKED ? " solid" : "";
    for (const gp of state.figures.gaps) {
      const p = el("path", { d: polysPath(gp.outline), class: "gap" + dense + (isSel("gap", gp.id) ? " sel" : ""), "fill-rule": "evenodd", "data-gap": gp.id }, g);
      // Number and mark only the deepest gaps when there are many, unless
      // one is selected.
      if (gp.id > MAX_MARKED && !isSel("gap", gp.id)) continue;
      const x = sx(gp.deepest[0]), y = sy(gp.deepest[1]), s = 4;
      el("path", { d: `M${x - s} ${y - s}L${x + s} ${y + s}M${x - s} ${y + s}L${x + s} ${y - s}`, class: "deep" }, m);
      const t = el("text", { x: x + 6, y: y - 5, class: "gapnum" }, m);
      t.textContent = gp.id;
    }
    for (const p of state.figures.fullCoverPoints) {
      const x = sx(p[0]), y = sy(p[1]);
      el("path", { d: `M${x} ${y - 7}L${x + 6} ${y}L${x} ${y + 7}L${x - 6} ${y}Z`, class: "worst" }, m);
    }
  }

  function drawDevices() {
    const g = clear("l-devices");
    const lab = clear("l-labels");
    const labels = $("show-labels").checked;
    // the devices themselves are on the canvas (drawCanvas); here only
    // their labels, the selected one and the dragged one
    const rad = devRadius();
    if (labels) {
      state.devices.forEach((d, i) => {
        if (i === dragging.device || !d.label) return;
        const t = el("text", { x: sx(d.x) + 8, y: sy(d.y) + 4, class: "lab" }, lab);
        t.textContent = d.label;
      });
    }
    if (selected && selected.kind === "device" && state.devices[selected.id] && selected.id !== dragging.device) {
      const d = state.devices[selected.id];
      el("circle", { cx: sx(d.x), cy: sy(d.y), r: rad, class: "dev sel" + (d.on ? "" : " off") }, g);
    }
    drawDragged();
  }

  // devRadius is the dot radius: dots shrink when the disks are small on
  // screen (dense plans).
  function devRadius() { return Math.min(6, Math.max(1.5, 0.2 * state.figures.rangeM * view.k)); }

  // drawDragged draws the device being dragged, with its disk, at the
  // pointer.
  function drawDragged() {
    const g = clear("l-drag");
    if (dragging.device === null || !dragging.pos) return;
    const x = sx(dragging.pos[0]), y = sy(dragging.pos[1]);
    if ($("show-disks").checked) el("circle", { cx: x, cy: y, r: state.figures.rangeM * view.k, class: "disk" }, g);
    el("circle", { cx: x, cy: y, r: devRadius(), class: "dev sel" }, g);
  }

  // deviceAt returns the device nearest the screen point (px, py) within
  // reach of a pointer, or -1.
  function deviceAt(px, py) {
    const reach = Math.max(devRadius() + 3, 7);
    let best = -1, bd = reach * reach;
    state.devices.forEach((d, i) => {
      const dx = sx(d.x) - px, dy = sy(d.y) - py, e = dx * dx + dy * dy;
      if (e <= bd) { bd = e; best = i; }
    });
    return best;
  }

  function niceLength(maxM) {
    const p = Math.pow(10, Math.floor(Math.log10(maxM)));
    for (const m of [5, 2, 1]) if (m * p <= maxM) return m * p;
    return p;
  }

  function drawOverlay() {
    const g = clear("overlay");
    // scale bar, bottom right
    const len = niceLength(150 / view.k);
    const px = len * view.k;
    const sb = el("g", { class: "scale", transform: `translate(${view.w - px - 34},${view.h - 42})` }, g);
    el("rect", { x: -10, y: -16, width: px + 28, height: 34, rx: 4, class: "bg" }, sb);
    el("rect", { x: 0, y: 4, width: px / 2, height: 6, fill: "#1b1b1b" }, sb);
    el("rect", { x: px / 2, y: 4, width: px / 2, height: 6, fill: "#ffffff", stroke: "#1b1b1b" }, sb);
    const t = el("text", { x: 0, y: -3 }, sb);
    t.textContent = "0";
    const t2 = el("text", { x: px, y: -3, "text-anchor": "end" }, sb);
    t2.textContent = len >= 1000 ? (len / 1000) + " km" : len + " m";
    // north arrow, top right
    const na = el("g", { class: "north", transform: `translate(${view.w - 36},56)` }, g);
    el("path", { d: "M0 -22L9 8L0 2L-9 8Z", fill: "#1b1b1b" }, na);
    const nt = el("text", { x: 0, y: 24, "text-anchor": "middle" }, na);
    nt.textContent = "N";
  }

  // drawLegend draws the legend in the side panel (it would hide part of
  // the plan).
  function drawLegend() {
    const items = [
      ["area", "site area"], ["excl", "needs no coverage"], ["disk", "device range"],
      ["dev", "device"], ["off", "switched off"], ["gap", "gap (numbered)"], ["deep", "deepest point"],
      ["worst", "needs full-cover range"],
    ];
    if (scene.context.length || scene.contextPoints.length) items.push(["ctx", "context"]);
    if ($("show-cells").checked) items.push(["cell", "service area"]);
    const lg = $("legend");
    while (lg.firstChild) lg.removeChild(lg.firstChild);
    const rows = Math.ceil(items.length / 2);
    lg.setAttribute("viewBox", `0 0 320 ${18 * rows + 4}`);
    items.forEach(([k, label], i) => {
      const y = 14 + 18 * (i % rows), x = 10 + 160 * Math.floor(i / rows);
      if (k === "dev") el("circle", { cx: x, cy: y - 4, r: 5, class: "dev" }, lg);
      else if (k === "off") { el("circle", { cx: x, cy: y - 4, r: 5, class: "dev off" }, lg); el("path", { d: `M${x - 3.5} ${y - 7.5}L${x + 3.5} ${y - 0.5}M${x - 3.5} ${y - 0.5}L${x + 3.5} ${y - 7.5}`, class: "offx" }, lg); }
      else if (k === "deep") el("path", { d: `M${x - 4} ${y - 8}L${x + 4} ${y}M${x - 4} ${y}L${x + 4} ${y - 8}`, class: "deep" }, lg);
      else if (k === "worst") el("path", { d: `M${x} ${y - 11}L${x + 6} ${y - 4}L${x} ${y + 3}L${x - 6} ${y - 4}Z`, class: "worst" }, lg);
      else if (k === "disk") el("circle", { cx: x, cy: y - 4, r: 7, class: "disk" }, lg);
      else if (k === "cell") el("path", { d: `M${x - 9} ${y - 4}L${x + 9} ${y - 4}`, class: "cell" }, lg);
      else el("rect", { x: x - 9, y: y - 10, width: 18, height: 12, class: k }, lg);
      const tt = el("text", { x: x + 18, y: y }, lg);
      tt.textContent = label;
    });
  }

  // ---------- curve ----------
  let curveMax = 1;
  function drawCurve() {
    const c = $("curve");
    while (c.firstChild) c.removeChild(c.firstChild);
    const f = state.figures;
    const W = 320, H = 150, L = 34, R = 8, T = 8, B = 24;
    curveMax = +$("range").max;
    const X = (r) => L + (W - L - R) * r / curveMax;
    const Y = (p) => T + (H - T - B) * (1 - p);
    for (const p of [0, 0.25, 0.5, 0.75, 1]) {
      el("line", { x1: L, x2: W - R, y1: Y(p), y2: Y(p), class: "curve-grid" }, c);
      const t = el("text", { x: L - 4, y: Y(p) + 3, "text-anchor": "end" }, c);
      t.textContent = (100 * p) + "%";
    }
    el("line", { x1: L, x2: W - R, y1: Y(0), y2: Y(0), class: "curve-axis" }, c);
    const step = niceLength(curveMax / 3);
    for (let r = 0; r <= curveMax + 1e-9; r += step) {
      const t = el("text", { x: X(r), y: H - 8, "text-anchor": "middle" }, c);
      t.textContent = r + " m";
    }
    let d = "";
    const pts = f.curve.slice();
    if (pts.length && pts[pts.length - 1][0] < curveMax) pts.push([curveMax, 1]);
    pts.forEach((p, i) => { d += (i ? "L" : "M") + X(p[0]).toFixed(1) + " " + Y(p[1]).toFixed(1); });
    el("path", { d: d, class: "curve-line" }, c);
    if (f.fullCoverRangeM <= curveMax) el("line", { x1: X(f.fullCoverRangeM), x2: X(f.fullCoverRangeM), y1: T, y2: Y(0), class: "curve-full" }, c);
    el("line", { x1: X(f.rangeM), x2: X(f.rangeM), y1: T, y2: Y(0), class: "curve-now" }, c);
    el("circle", { cx: X(f.rangeM), cy: Y(f.coveredFraction), r: 4, fill: "#D55E00" }, c);
    c.onclick = (ev) => {
      const b = c.getBoundingClientRect();
      const px = (ev.clientX - b.left) * W / b.width;
      const r = Math.max(+$("range").min, Math.min(curveMax, (px - L) / (W - L - R) * curveMax));
      $("range").value = r;
      sendRange(+$("range").value, 0);
    };
  }

  // ---------- figures ----------
  function setState(s) {
    if (!s.devices) s.devices = state.devices; // a range edit leaves them as they were
    s.figures.gaps.forEach((g, k) => { g.outline = s.outlines[k]; });
    // while a device is dragged, it stays under the pointer
    if (dragging.device !== null && dragging.pos && s.devices[dragging.device]) {
      s.devices[dragging.device].x = dragging.pos[0]; s.devices[dragging.device].y = dragging.pos[1];
    }
    state = s;
    window.review.state = s;
    const f = s.figures;
    $("fig-covered").textContent = fmtPct(f.coveredFraction);
    $("fig-uncovered").textContent = fmtArea(f.uncoveredM2);
    $("fig-gaps").textContent = f.gaps.length + (f.gaps.length ? " (" + f.enclosedGaps + " enclosed)" : "");
    $("fig-fullcover").textContent = fmtM(f.fullCoverRangeM);
    $("fig-devices").textContent = f.devicesOn + " of " + s.devices.length;
    $("fig-holes").textContent = f.openHoles + " / " + f.pieces;
    $("range-out").textContent = fmtM(f.rangeM);
    if (!dragging.slider) $("range").value = f.rangeM;
    $("undo").disabled = !s.canUndo;
    $("status").textContent = s.version === 0 && !s.computeMs ? "ready" : "updated in " + s.computeMs.toFixed(1) + " ms (server)" +
      (lastRoundTripMs ? ", " + lastRoundTripMs.toFixed(0) + " ms round trip" : "");
    const tb = $("gaps").tBodies[0];
    while (tb.firstChild) tb.removeChild(tb.firstChild);
    f.gaps.slice(0, 60).forEach((gp) => {
      const tr = document.createElement("tr");
      if (isSel("gap", gp.id)) tr.className = "sel";
      for (const v of [gp.id, fx(gp.areaM2, 1), fmtM(gp.closingRangeM), gp.touchesBoundary ? "edge" : "enclosed"]) {
        const td = document.createElement("td"); td.textContent = v; tr.appendChild(td);
      }
      tr.addEventListener("click", () => select("gap", gp.id));
      tb.appendChild(tr);
    });
    if (selected && selected.kind === "gap" && !f.gaps.some((g) => g.id === selected.id)) selected = null;
    if (selected && selected.kind === "device" && selected.id >= s.devices.length) selected = null;
    if ($("show-cells").checked) loadCells(); else cells = null;
    hideTip(); // the hovered element may be gone
    draw();
    drawCurve();
    showSelection();
  }

  function loadCells() {
    getJSON("/api/cells").then((c) => { cells = c; drawCells(); }).catch((e) => toast(e.message));
  }

  // ---------- selection and hover ----------
  const isSel = (kind, id) => selected && selected.kind === kind && selected.id === id;
  function select(kind, id) { selected = { kind, id }; draw(); setStateTableSel(); showSelection(); }
  function setStateTableSel() {
    for (const tr of $("gaps").tBodies[0].rows) tr.className = isSel("gap", +tr.cells[0].textContent) ? "sel" : "";
  }
  function row(k, v) { return "<tr><td>" + k + "</td><td>" + v + "</td></tr>"; }
  function esc(s) { return String(s).replace(/[&<>"']/g, (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" }[c])); }
  function devName(i) { const d = state.devices[i]; return "#" + i + (d && d.label ? " " + esc(d.label) : ""); }

  function gapHTML(gp) {
    return "<h3>Gap " + gp.id + (gp.touchesBoundary ? " (reaches the edge)" : " (enclosed)") + "</h3><table>" +
      row("area", fmtArea(gp.areaM2)) + row("closes at range", fmtM(gp.closingRangeM)) +
      row("deepest point", "x " + fx(gp.deepest[0], 1) + ", y " + fx(gp.deepest[1], 1) + " m") +
      row("bordering devices", gp.devices.slice(0, 12).map(devName).join(", ") + (gp.devices.length > 12 ? " +" + (gp.devices.length - 12) : "")) +
      "</table>";
  }
  let devSeq = 0;
  function showSelection() {
    const d = $("detail");
    if (!selected) { d.innerHTML = '<p class="hint">Hover or click a gap or a device for its figures.</p>'; return; }
    if (selected.kind === "gap") {
      const gp = state.figures.gaps.find((g) => g.id === selected.id);
      if (gp) d.innerHTML = gapHTML(gp);
      return;
    }
    const i = selected.id, seq = ++devSeq;
    getJSON("/api/device/" + i).then((dv) => {
      if (seq !== devSeq) return;
      let h = "<h3>Device " + devName(i) + (dv.on ? "" : " (switched off)") + "</h3><table>" +
        row("position", "x " + fx(dv.x, 1) + ", y " + fx(dv.y, 1) + " m");
      if (dv.on) {
        h += row("serves", fmtArea(dv.servedM2) + " (" + fmtPct(dv.servedShare) + " of the area)") +
          row("farthest point served", fmtM(dv.farthestM)) +
          row("if it fails: uncovered +", fmtArea(dv.failAddedUncoveredM2)) +
          row("if it fails: closes at", dv.failClosingRangeM === undefined ? "no device left" : fmtM(dv.failClosingRangeM)) +
          (dv.failBackup !== undefined ? row("takes over", devName(dv.failBackup)) : "") +
          (dv.shared ? row("note", "stands on another device's spot") : "");
      }
      d.innerHTML = h + "</table>";
    }).catch((e) => toast(e.message));
  }

  const tip = $("tip");
  function moveTip(ev) {
    const b = svg.getBoundingClientRect();
    tip.style.left = (ev.clientX - b.left + 14) + "px";
    tip.style.top = (ev.clientY - b.top + 14) + "px";
  }
  function hideTip() { tip.hidden = true; }
  function hoverGap(gp, ev) {
    if (dragging.device !== null) return;
    tip.textContent = "Gap " + gp.id + ": " + fmtArea(gp.areaM2) + ", closes at " + fmtM(gp.closingRangeM);
    tip.hidden = false; moveTip(ev);
  }
  // hover shows the tooltip of the device or gap under the pointer.
  function hover(ev) {
    const b = svg.getBoundingClientRect();
    const i = deviceAt(ev.clientX - b.left, ev.clientY - b.top);
    if (i >= 0) { hoverDevice(i, ev); return; }
    const gid = ev.target.getAttribute && ev.target.getAttribute("data-gap");
    const gp = gid && state.figures.gaps.find((g) => g.id === +gid);
    if (gp) hoverGap(gp, ev); else hideTip();
  }
  function hoverDevice(i, ev) {
    if (dragging.device !== null) return;
    const d = state.devices[i];
    tip.textContent = "Device #" + i + (d.label ? " " + d.label : "") + (d.on ? "" : " (off)");
    tip.hidden = false; moveTip(ev);
  }

  // ---------- interaction ----------
  const dragging = { device: null, pan: null, moved: false, gesture: 0, slider: false };

  function devicePointerDown(ev, i) {
    ev.stopPropagation();
    if (tool === "remove") { edit({ op: "remove", device: i }); if (isSel("device", i)) selected = null; return; }
    if (tool === "toggle") { edit({ op: state.devices[i].on ? "off" : "on", device: i }); return; }
    if (tool !== "drag") return;
    svg.setPointerCapture(ev.pointerId);
    dragging.device = i; dragging.moved = false; dragging.gesture = ++gestureSeq;
    dragging.start = [ev.clientX, ev.clientY];
    hideTip();
  }

  function localXY(ev) {
    const b = svg.getBoundingClientRect();
    return [wx(ev.clientX - b.left), wy(ev.clientY - b.top)];
  }

  svg.addEventListener("pointerdown", (ev) => {
    const b = svg.getBoundingClientRect();
    const hit = deviceAt(ev.clientX - b.left, ev.clientY - b.top);
    if (hit >= 0 && tool !== "add") { devicePointerDown(ev, hit); return; }
    if (tool === "add") {
      const [x, y] = localXY(ev);
      edit({ op: "add", points: [{ x: x, y: y }] });
      return;
    }
    if (tool === "drag") {
      svg.setPointerCapture(ev.pointerId);
      dragging.pan = [ev.clientX, ev.clientY, view.cx, view.cy];
      dragging.moved = false;
      dragging.target = ev.target;
    }
  });
  svg.addEventListener("pointermove", (ev) => {
    if (dragging.device !== null) {
      const i = dragging.device;
      if (!dragging.moved && Math.hypot(ev.clientX - dragging.start[0], ev.clientY - dragging.start[1]) < 3) return;
      const first = !dragging.moved;
      dragging.moved = true;
      const [x, y] = localXY(ev);
      dragging.pos = [x, y];
      // move the device and its disk at once; the figures follow the server
      if (first) { drawCanvas(); drawDevices(); } else drawDragged();
      edit({ op: "move", device: i, x: x, y: y, gesture: dragging.gesture });
    } else if (!dragging.pan) {
      hover(ev);
    } else {
      const [x0, y0, cx, cy] = dragging.pan;
      if (Math.hypot(ev.clientX - x0, ev.clientY - y0) > 2) dragging.moved = true;
      view.cx = cx - (ev.clientX - x0) / view.k;
      view.cy = cy + (ev.clientY - y0) / view.k;
      draw();
    }
  });
  svg.addEventListener("pointerleave", hideTip);
  svg.addEventListener("pointerup", (ev) => {
    if (dragging.device !== null) {
      const i = dragging.device;
      if (dragging.moved) {
        const [x, y] = localXY(ev);
        edit({ op: "move", device: i, x: x, y: y, gesture: dragging.gesture });
      }
      dragging.device = null; dragging.pos = null;
      select("device", i);
    } else if (dragging.pan) {
      dragging.pan = null;
      const gid = dragging.target && dragging.target.getAttribute && dragging.target.getAttribute("data-gap");
      if (!dragging.moved && gid) select("gap", +gid);
      else if (!dragging.moved && selected) { selected = null; draw(); showSelection(); }
    }
  });
  svg.addEventListener("wheel", (ev) => {
    ev.preventDefault();
    const b = svg.getBoundingClientRect();
    const px = ev.clientX - b.left, py = ev.clientY - b.top;
    const x = wx(px), y = wy(py);
    view.k *= Math.exp(-ev.deltaY * 0.0015);
    view.cx = x - (px - view.w / 2) / view.k;
    view.cy = y + (py - view.h / 2) / view.k;
    draw();
  }, { passive: false });

  function setTool(t) {
    tool = t;
    for (const b of document.querySelectorAll("#tools [data-tool]")) b.classList.toggle("on", b.dataset.tool === t);
    svg.setAttribute("class", "tool-" + t);
  }
  for (const b of document.querySelectorAll("#tools [data-tool]")) b.addEventListener("click", () => setTool(b.dataset.tool));
  $("undo").addEventListener("click", () => edit({ op: "undo" }));
  $("fit").addEventListener("click", () => { fit(); draw(); });
  document.addEventListener("keydown", (ev) => {
    if (ev.target.tagName === "INPUT" && ev.target.type !== "checkbox" && ev.target.type !== "range") return;
    if ((ev.ctrlKey || ev.metaKey) && ev.key === "z") { ev.preventDefault(); edit({ op: "undo" }); return; }
    const k = { v: "drag", a: "add", r: "remove", o: "toggle" }[ev.key.toLowerCase()];
    if (k && !ev.ctrlKey && !ev.metaKey && !ev.altKey) setTool(k);
    if (ev.key === "f" || ev.key === "F") { fit(); draw(); }
  });

  let sliderGesture = 0;
  function sendRange(r, gesture) { edit({ op: "range", range: r, gesture: gesture }); }
  $("range").addEventListener("pointerdown", () => { dragging.slider = true; sliderGesture = ++gestureSeq; });
  $("range").addEventListener("input", () => {
    $("range-out").textContent = fmtM(+$("range").value);
    if (!sliderGesture) sliderGesture = ++gestureSeq;
    sendRange(+$("range").value, sliderGesture);
  });
  $("range").addEventListener("change", () => {
    dragging.slider = false;
    sendRange(+$("range").value, sliderGesture);
    sliderGesture = 0;
  });
  for (const id of ["show-disks", "show-labels", "show-context"]) $(id).addEventListener("change", draw);
  $("show-cells").addEventListener("change", () => { if ($("show-cells").checked) loadCells(); else { cells = null; draw(); } });

  $("write-report").addEventListener("click", () => {
    $("report-out").textContent = "writing…";
    postJSON("/api/report", {}).then((r) => {
      $("report-out").textContent = "Wrote " + r.files.length + " files to " + r.dir + ": " + r.files.join(", ");
    }).catch((e) => { $("report-out").textContent = ""; toast(e.message); });
  });

  window.addEventListener("resize", () => { const k = view.k; const c = [view.cx, view.cy]; const r = svg.getBoundingClientRect(); view.w = r.width; view.h = r.height; view.k = k; view.cx = c[0]; view.cy = c[1]; draw(); });

  // hooks for the browser test: screen position of a device, busy flag.
  window.review = {
    state: null, pending: false,
    screenOf(i) {
      const b = svg.getBoundingClientRect(); const d = state.devices[i];
      return [b.left + sx(d.x), b.top + sy(d.y)];
    },
    screenOfPoint(x, y) { const b = svg.getBoundingClientRect(); return [b.left + sx(x), b.top + sy(y)]; },
    setTool: setTool,
    edit: edit,
  };

  // ---------- start ----------
  Promise.all([getJSON("/api/scene"), getJSON("/api/state")]).then(([sc, st]) => {
    scene = sc;
    document.title = "Review: " + sc.title;
    $("title").textContent = sc.title;
    const cl = $("cautions");
    for (const c of sc.cautions) { const li = document.createElement("li"); li.textContent = c; cl.appendChild(li); }
    const ban = $("caution-banner");
    ban.hidden = false;
    if (sc.lifeSafety) {
      ban.className = "life";
      ban.textContent = "Life-safety devices: " + sc.cautions.join(" ");
    } else {
      ban.textContent = "Coverage is modelled as disks of one common range: a planning aid, not a guarantee. Follow local codes and licensed practice.";
    }
    if (!sc.canReport) { $("write-report").disabled = true; $("report-out").textContent = "Start with --out to write the full report."; }
    else $("report-out").textContent = "into " + sc.outDir;
    const r = $("range");
    r.max = sc.curveTopM.toString();
    r.min = "0.5";
    fit();
    setState(st);
    document.body.dataset.ready = "1";
  }).catch((e) => toast("cannot load the plan: " + e.message));
})();
