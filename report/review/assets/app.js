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
  let editSeq = 0;
  function edit(e) {
    window.review.pending = true;
    if (busy) {
      const last = queue[queue.length - 1];
      if (last && e.gesture && last.gesture === e.gesture && last.op === e.op) queue[queue.length - 1] = e;
      else queue.push(e);
      return;
    }
    busy = true;
    e.patch = true;
    e.later = true; // with own ranges the curve comes after painting (loadCurve)
    const seq = ++editSeq;
    const t0 = performance.now();
    let t1 = 0, t2 = 0;
    fetch("/api/edit", { method: "POST", headers: { "Content-Type": "application/json" }, body: JSON.stringify(e) })
      .then(async (r) => {
        const text = await r.text();
        t1 = performance.now();
        const b = JSON.parse(text);
        t2 = performance.now();
        if (!r.ok) throw new Error(b.error || r.statusText);
        return b;
      })
      .then((s) => withDevices(s))
      .then((s) => {
        lastRoundTripMs = t1 - t0;
        const t3 = performance.now();
        setState(s);
        const t4 = performance.now();
        // the frame with the new plan is painted before a task queued in
        // the next animation frame callback runs
        requestAnimationFrame(() => { const tf = performance.now(); setTimeout(() => {
          const t5 = performance.now();
          window.review.timing = { seq: seq, op: e.op, totalMs: t5 - t0, fetchMs: t1 - t0, serverMs: s.computeMs,
            parseMs: t2 - t1, setStateMs: t4 - t3, drawMs: window.review.drawMs, frameWaitMs: tf - t4, paintMs: t5 - tf, redrawMs: t5 - t1 };
          loadCurve();
        }, 0); });
      }).catch((err) => {
        toast(err.message);
        draw();
      }).finally(() => {
        busy = false;
        if (queue.length) edit(queue.shift());
        else window.review.pending = false;
      });
    return seq;
  }

  // loadCurve fetches the coverage curve an edit's answer left out
  // (figures.curvePending: own ranges) once the new plan is painted, unless
  // another edit is on its way (its answer asks again), and draws it if the
  // plan is still the one it belongs to.
  function loadCurve() {
    if (!state.figures.curvePending || busy || queue.length) return;
    const v = state.version;
    window.review.curveLoading = true;
    getJSON("/api/curve").then((c) => {
      if (c.version !== v || state.version !== v) return;
      state.figures.curve = c.curve;
      state.figures.curvePending = false;
      drawCurve();
    }).catch((err) => toast(err.message)).finally(() => { window.review.curveLoading = false; });
  }

  // withDevices gives an answer its device list: the answer's own, the
  // previous list (a range edit), or the previous list patched
  // (devicePatch); when the patch is not of the list this page holds
  // (another page edited meanwhile) the whole state is fetched.
  async function withDevices(s) {
    const p = s.devicePatch;
    if (s.devices) return s;
    if (!p) { s.devices = state.devices; return s; }
    if (p.base !== state.version) { const full = await getJSON("/api/state"); full.computeMs = s.computeMs; return full; }
    const devs = state.devices.slice();
    if (p.removed >= 0) devs.splice(p.removed, 1);
    p.set.forEach((i, k) => { devs[i] = p.rows[k]; });
    devs.length = p.count;
    s.devices = devs;
    return s;
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
  // Layers, bottom to top (index.html): cv-base holds the site area,
  // exclusions and context, drawn only when the view changes; cv-disks the
  // union of the disks, painted opaque and shown at 16 % opacity by CSS;
  // cv the service areas, gaps and disk rims; cv-dev the devices, drawn
  // only when the device list, the view or the dot size changes; above
  // them the SVG (gap numbers, labels, the selected and the dragged device,
  // scale bar, north arrow). Geometry is kept as Path2D objects in local
  // metres, built once per scene (area) or per answer (gaps, cells), and
  // copied to the screen with the view's matrix (Path2D.addPath), so a
  // redraw parses nothing. Headless Chromium paints in software: what
  // costs is pixels and path segments, so every layer is one path per
  // style, and the devices are stamped into an ImageData (below).
  const cvBase = $("cv-base"), cvDisks = $("cv-disks"), cv = $("cv"), cvDev = $("cv-dev");
  let areaPath = null, ctxPath = null, exclPath = null; // per scene, metres
  let gapPaths = [], gapsPath = null;                      // per answer, metres
  let cellsPath = null;                                    // per /api/cells answer
  let baseKey = "", devKey = "", devDrawn = null;

  // ring and flat-ring paths, in metres
  function addRing(p, ring) {
    for (let i = 0; i < ring.length; i++) i ? p.lineTo(ring[i][0], ring[i][1]) : p.moveTo(ring[i][0], ring[i][1]);
    p.closePath();
  }
  function addFlat(p, polys) {
    for (const poly of polys) for (const r of poly) {
      p.moveTo(r[0], r[1]);
      for (let i = 2; i < r.length; i += 2) p.lineTo(r[i], r[i + 1]);
      p.closePath();
    }
  }
  function scenePaths() {
    areaPath = new Path2D(); exclPath = new Path2D(); ctxPath = new Path2D();
    for (const poly of scene.area) poly.forEach((ring, i) => { addRing(areaPath, ring); if (i) addRing(exclPath, ring); });
    for (const poly of scene.context) for (const ring of poly) addRing(ctxPath, ring);
  }
  // gapPathsOf builds one path per gap (hover and click) with its bounding
  // box, and one path of all gaps (drawing).
  function gapPathsOf(gaps) {
    gapPaths = []; gapsPath = new Path2D();
    for (const gp of gaps) {
      const p = new Path2D(); addFlat(p, gp.outline); gapsPath.addPath(p);
      let b = [Infinity, Infinity, -Infinity, -Infinity];
      for (const poly of gp.outline) { const r = poly[0]; for (let i = 0; i < r.length; i += 2) { b[0] = Math.min(b[0], r[i]); b[1] = Math.min(b[1], r[i + 1]); b[2] = Math.max(b[2], r[i]); b[3] = Math.max(b[3], r[i + 1]); } }
      gapPaths.push({ id: gp.id, path: p, b: b });
    }
  }
  // screenMatrix maps metres to CSS pixels of the view.
  const screenMatrix = () => new DOMMatrix([view.k, 0, 0, -view.k, view.w / 2 - view.cx * view.k, view.h / 2 + view.cy * view.k]);
  function onScreen(p) { const q = new Path2D(); q.addPath(p, screenMatrix()); return q; }
  // prep sizes a layer to the view at res device pixels per CSS pixel
  // (default: the device's), clears it and sets CSS-pixel units.
  function prep(c, res) {
    const dpr = res || window.devicePixelRatio || 1;
    const W = Math.round(view.w * dpr), H = Math.round(view.h * dpr);
    if (c.width !== W || c.height !== H) { c.width = W; c.height = H; }
    const x = c.getContext("2d");
    x.setTransform(1, 0, 0, 1, 0, 0);
    x.clearRect(0, 0, W, H);
    x.setTransform(dpr, 0, 0, dpr, 0, 0);
    return x;
  }
  // hatch returns a repeating pattern of diagonal lines (the exclusions'
  // and the gaps' hatching of the PNG maps).
  const hatches = {};
  function hatch(x, bg, fg, s, w, down) {
    const key = bg + fg + s + down;
    if (!hatches[key]) {
      const t = document.createElement("canvas"); t.width = t.height = s;
      const c = t.getContext("2d");
      c.fillStyle = bg; c.fillRect(0, 0, s, s); c.strokeStyle = fg; c.lineWidth = w;
      for (const o of [-s, 0, s]) { c.beginPath(); if (down) { c.moveTo(o, 0); c.lineTo(o + s, s); } else { c.moveTo(o, s); c.lineTo(o + s, 0); } c.stroke(); }
      hatches[key] = t;
    }
    return x.createPattern(hatches[key], "repeat");
  }
  const viewKey = () => [view.cx, view.cy, view.k, view.w, view.h, window.devicePixelRatio].join();

  function draw() {
    if (!scene || !state) return;
    const t0 = performance.now();
    drawBase();
    drawDisks();
    drawMain();
    drawDevLayer();
    drawMarks();
    drawDevices();
    drawOverlay();
    drawLegend();
    window.review.drawMs = performance.now() - t0;
  }

  function drawBase() {
    const key = viewKey() + $("show-context").checked;
    if (key === baseKey) return;
    baseKey = key;
    const c = prep(cvBase);
    const a = onScreen(areaPath);
    c.fillStyle = "#fbfaf4"; c.fill(a, "evenodd");
    c.fillStyle = hatch(c, "#ffffff", "#8c8c8c", 8, 2, false); c.fill(onScreen(exclPath));
    c.strokeStyle = "#6b6b6b"; c.lineWidth = 1; c.stroke(onScreen(exclPath));
    c.strokeStyle = "#2b2b2b"; c.lineWidth = 1.5; c.stroke(a);
    if (!$("show-context").checked) return;
    if (scene.context.length) { const p = onScreen(ctxPath); c.fillStyle = "#c7c7c7"; c.fill(p); c.strokeStyle = "#8a8a8a"; c.lineWidth = 0.8; c.stroke(p); }
    c.fillStyle = "#8a8a8a";
    for (const p of scene.contextPoints) { c.beginPath(); c.arc(sx(p[0]), sy(p[1]), 2.5, 0, 2 * Math.PI); c.fill(); }
  }

  // rangeOf is device i's range (m) at the state's range.
  function rangeOf(i) {
    const f = state.figures;
    if (!f.growthM2 && f.growthM2 !== 0) return f.rangeM;
    return Math.sqrt(Math.max(0, state.devices[i].range * state.devices[i].range + f.growthM2));
  }

  // The disks. A dense plan (over DENSE devices) paints their union as
  // the site area less the gaps (one even-odd path: inside the area the
  // union is exactly what is not a gap, up to the gap outlines' 1 %
  // chords), and only the disks that may reach beyond the area or over an
  // exclusion as circles: those whose device is nearer than its range to
  // the outside, found in a distance map of the area (insideMap).
  // The layer has half the device's resolution (a quarter of the pixels to
  // paint): shown at 16 % opacity under the crisp gap outlines, the
  // softer edge does not show.
  const DENSE = 2000;
  function drawDisks() {
    const c = prep(cvDisks, (window.devicePixelRatio || 1) / 2);
    if (!$("show-disks").checked) return;
    const devs = state.devices, dense = devs.length > DENSE, k = view.k;
    c.fillStyle = "#56B4E9";
    const p = new Path2D();
    if (dense) { p.addPath(areaPath); p.addPath(gapsPath); }
    const circ = new Path2D(), m = insideMap();
    let nc = 0;
    for (let i = 0; i < devs.length; i++) {
      const d = devs[i];
      if (!d.on || i === dragging.device) continue;
      const r = rangeOf(i);
      if (dense && m.inside(d.x, d.y, r)) continue;
      circ.moveTo(d.x + r, d.y); circ.arc(d.x, d.y, r, 0, 2 * Math.PI);
      nc++;
    }
    if (dense) c.fill(onScreen(p), "evenodd");
    c.fill(onScreen(circ));
    window.review.diskCircles = circ;
    window.review.diskCount = nc;
  }

  // insideMap is a distance map of the site area, made once per scene:
  // the area is rasterised on a grid of at most MAP cells a side, and each
  // cell inside holds the distance (m) from its centre to the nearest
  // cell centre outside (exact Euclidean distance transform, Felzenszwalb
  // and Huttenlocher, Theory of Computing 8, 2012). A disk is certainly
  // inside the area when that distance less two cells' width exceeds its
  // radius. An exclusion thinner than a cell may be missed: the disks
  // over it are then not tinted, below a pixel at the fitted view.
  const MAP = 1024;
  let imap = null;
  function insideMap() {
    if (imap) return imap;
    const b = scene.bound, pad = 4;
    const h = Math.max(b[2] - b[0], b[3] - b[1], 1e-6) / (MAP - 2 * pad);
    const nx = Math.min(MAP, Math.ceil((b[2] - b[0]) / h) + 2 * pad), ny = Math.min(MAP, Math.ceil((b[3] - b[1]) / h) + 2 * pad);
    const x0 = b[0] - pad * h, y0 = b[1] - pad * h;
    const t = document.createElement("canvas"); t.width = nx; t.height = ny;
    const c = t.getContext("2d", { willReadFrequently: true });
    c.setTransform(1 / h, 0, 0, 1 / h, -x0 / h, -y0 / h);
    c.fillStyle = "#000"; c.fill(areaPath, "evenodd");
    const px = c.getImageData(0, 0, nx, ny).data;
    const INF = 1e20, f = new Float64Array(nx * ny);
    for (let i = 0; i < nx * ny; i++) f[i] = px[4 * i + 3] === 255 ? INF : 0; // partly covered cells count as outside
    edt(f, nx, ny);
    imap = {
      inside(x, y, r) {
        const i = Math.floor((x - x0) / h), j = Math.floor((y - y0) / h);
        if (i < 0 || j < 0 || i >= nx || j >= ny) return false;
        return Math.sqrt(f[j * nx + i]) * h - 2 * h > r;
      },
    };
    return imap;
  }
  // edt squares-distance-transforms f (0 outside, INF inside) in place,
  // rows then columns, each by the lower envelope of parabolas.
  function edt(f, nx, ny) {
    const n = Math.max(nx, ny), g = new Float64Array(n), d = new Float64Array(n), v = new Int32Array(n), z = new Float64Array(n + 1);
    const line = (get, set, len) => {
      for (let q = 0; q < len; q++) g[q] = get(q);
      let k = 0; v[0] = 0; z[0] = -Infinity; z[1] = Infinity;
      for (let q = 1; q < len; q++) {
        let s;
        for (;;) { const p = v[k]; s = ((g[q] + q * q) - (g[p] + p * p)) / (2 * q - 2 * p); if (s <= z[k] && k > 0) k--; else break; }
        if (s <= z[k]) { v[0] = q; z[0] = -Infinity; z[1] = Infinity; k = 0; continue; }
        k++; v[k] = q; z[k] = s; z[k + 1] = Infinity;
      }
      k = 0;
      for (let q = 0; q < len; q++) { while (z[k + 1] < q) k++; const dq = q - v[k]; d[q] = dq * dq + g[v[k]]; }
      for (let q = 0; q < len; q++) set(q, d[q]);
    };
    for (let j = 0; j < ny; j++) line((q) => f[j * nx + q], (q, x) => { f[j * nx + q] = x; }, nx);
    for (let i = 0; i < nx; i++) line((q) => f[q * nx + i], (q, x) => { f[q * nx + i] = x; }, ny);
  }

  // drawMain draws the service areas, the gaps and (plans up to DENSE
  // devices) the disk rims.
  function drawMain() {
    const c = prep(cv);
    if ($("show-cells").checked && cellsPath) {
      c.strokeStyle = "#009E73"; c.lineWidth = 1.4; c.setLineDash([5, 3]); c.stroke(onScreen(cellsPath)); c.setLineDash([]);
    }
    if ($("show-disks").checked && state.devices.length <= DENSE && window.review.diskCircles) {
      c.strokeStyle = "rgba(0,114,178,0.45)"; c.lineWidth = 1; c.stroke(onScreen(window.review.diskCircles));
    }
    const gaps = state.figures.gaps;
    if (!gaps.length) return;
    const g = onScreen(gapsPath);
    // a hatch is slow to paint when there are hundreds of gaps
    if (gaps.length > MAX_MARKED) { c.globalAlpha = 0.6; c.fillStyle = "#D55E00"; } else { c.globalAlpha = 0.9; c.fillStyle = hatch(c, "#f3b98f", "#D55E00", 7, 2.2, true); }
    c.fill(g, "evenodd");
    c.globalAlpha = 1;
    c.strokeStyle = "#D55E00"; c.lineWidth = 1.2; c.stroke(g);
    const sel = selected && selected.kind === "gap" && gapPaths.find((p) => p.id === selected.id);
    if (sel) { c.strokeStyle = "#000"; c.lineWidth = 2.2; c.stroke(onScreen(sel.path)); }
  }

  // drawDevLayer stamps the devices into the cv-dev layer: a dot (or, off,
  // a white dot with a cross) rendered once, copied by pixel into an
  // ImageData with "over" blending, one putImageData. For 10 000 devices
  // this is a few milliseconds where as many arcs take a hundred.
  function drawDevLayer() {
    const dpr = window.devicePixelRatio || 1, rad = devRadius(), devs = state.devices;
    const key = viewKey() + "|" + rad + "|" + dragging.device;
    if (key === devKey && devs === devDrawn) return;
    devKey = key; devDrawn = devs;
    const c = prep(cvDev);
    const W = cvDev.width, H = cvDev.height;
    const on = stamp(rad, dpr, true), off = stamp(rad, dpr, false);
    if (!devImg || devImg.width !== W || devImg.height !== H) devImg = c.createImageData(W, H);
    else new Uint32Array(devImg.data.buffer).fill(0);
    const img = devImg, px = img.data;
    for (let i = 0; i < devs.length; i++) {
      const d = devs[i];
      if (i === dragging.device) continue;
      const s = d.on ? on : off;
      const x0 = Math.round(sx(d.x) * dpr) - s.c, y0 = Math.round(sy(d.y) * dpr) - s.c;
      if (x0 + s.n <= 0 || y0 + s.n <= 0 || x0 >= W || y0 >= H) continue;
      for (let j = 0; j < s.n; j++) {
        const y = y0 + j;
        if (y < 0 || y >= H) continue;
        for (let i2 = 0; i2 < s.n; i2++) {
          const x = x0 + i2, q = 4 * (j * s.n + i2), sa = s.px[q + 3];
          if (sa === 0 || x < 0 || x >= W) continue;
          const o = 4 * (y * W + x);
          if (sa === 255 || px[o + 3] === 0) { px[o] = s.px[q]; px[o + 1] = s.px[q + 1]; px[o + 2] = s.px[q + 2]; px[o + 3] = sa; continue; }
          const da = px[o + 3] * (255 - sa) / 255, a = sa + da;
          for (let ch = 0; ch < 3; ch++) px[o + ch] = (s.px[q + ch] * sa + px[o + ch] * da) / a;
          px[o + 3] = a;
        }
      }
    }
    c.putImageData(img, 0, 0);
  }
  let devImg = null; // the ImageData of cv-dev, kept between redraws
  const stamps = {};
  function stamp(rad, dpr, on) {
    const key = rad + "|" + dpr + "|" + on;
    if (stamps[key]) return stamps[key];
    const half = Math.ceil((on ? rad + 1.5 : Math.max(rad + 1.5, 5)) * dpr) + 1, n = 2 * half + 1;
    const t = document.createElement("canvas"); t.width = t.height = n;
    const c = t.getContext("2d", { willReadFrequently: true });
    c.setTransform(dpr, 0, 0, dpr, (half + 0.5), (half + 0.5));
    c.beginPath(); c.arc(0, 0, rad, 0, 2 * Math.PI);
    c.lineWidth = 1.5;
    if (on) { c.fillStyle = "#0072B2"; c.fill(); if (rad >= 3) { c.strokeStyle = "#ffffff"; c.stroke(); } }
    else {
      c.fillStyle = "#ffffff"; c.fill(); c.strokeStyle = "#444444"; c.stroke();
      c.beginPath(); c.moveTo(-4, -4); c.lineTo(4, 4); c.moveTo(-4, 4); c.lineTo(4, -4); c.stroke();
    }
    return (stamps[key] = { px: c.getImageData(0, 0, n, n).data, n: n, c: half });
  }

  // drawMarks numbers the deepest gaps (all when few) and marks the
  // points that need the full-cover range.
  function drawMarks() {
    const m = clear("l-marks");
    for (const gp of state.figures.gaps) {
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

  // gapAt returns the id of the gap under the screen point, or null.
  const hitCtx = document.createElement("canvas").getContext("2d");
  function gapAt(px, py) {
    const x = wx(px), y = wy(py);
    for (const g of gapPaths) {
      if (x < g.b[0] || x > g.b[2] || y < g.b[1] || y > g.b[3]) continue;
      if (hitCtx.isPointInPath(g.path, x, y, "evenodd")) return g.id;
    }
    return null;
  }

  function drawDevices() {
    const g = clear("l-devices");
    const lab = clear("l-labels");
    const labels = $("show-labels").checked;
    // the devices themselves are in cv-dev (drawDevLayer); here only their
    // labels, the selected one and the dragged one
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

  // devRadius is the dot radius (px): dots shrink when the disks are small
  // on screen (dense plans). It follows the range the page started with,
  // so that sliding the range does not repaint the devices.
  function devRadius() { return Math.round(2 * Math.min(6, Math.max(1.5, 0.2 * startRange * view.k))) / 2; }
  let startRange = 1;

  // drawDragged draws the device being dragged, with its disk, at the
  // pointer.
  function drawDragged() {
    const g = clear("l-drag");
    if (dragging.device === null || !dragging.pos) return;
    const x = sx(dragging.pos[0]), y = sy(dragging.pos[1]);
    if ($("show-disks").checked) el("circle", { cx: x, cy: y, r: rangeOf(dragging.device) * view.k, class: "disk" }, g);
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
      // the last label keeps inside the chart
      const t = el("text", { x: Math.min(X(r), W - 2), y: H - 8, "text-anchor": X(r) > W - R - 12 ? "end" : "middle" }, c);
      t.textContent = r + " m";
    }
    // the curve is drawn over the slider's domain only: with own ranges it
    // starts at the slider's least value (shaded below it)
    const lo = +$("range").min || 0;
    if (lo > 0) el("rect", { x: L, y: T, width: X(lo) - L, height: Y(0) - T, class: "curve-out" }, c);
    let d = "";
    const pts = f.curve ? clipCurve(f.curve, lo) : []; // none while pending (loadCurve)
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

  // clipCurve returns the points of the curve c at ranges ≥ lo, opening
  // with its value at lo (linear between the samples, as drawn).
  function clipCurve(c, lo) {
    const k = c.findIndex((p) => p[0] >= lo);
    if (k < 0) return [];
    const out = c.slice(k);
    if (k > 0 && c[k][0] > lo) {
      const a = c[k - 1], b = c[k];
      out.unshift([lo, a[1] + (b[1] - a[1]) * (lo - a[0]) / (b[0] - a[0])]);
    }
    return out;
  }

  // ---------- figures ----------
  function setState(s) {
    s.figures.gaps.forEach((g, k) => { g.outline = s.outlines[k]; });
    gapPathsOf(s.figures.gaps);
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
    // a device-range edit switches a common-range plan to own ranges, and
    // its undo back: the slider's labels and domain follow the state
    if (!scene.lifeSafety) {
      $("caution-banner").textContent = "Coverage is modelled as disks of " + (ranged() ? "each device's own range" : "one common range") +
        ": a planning aid, not a guarantee. Follow local codes and licensed practice.";
    }
    $("range-label").textContent = ranged() ? "Largest range" : "Range";
    $("fullcover-label").textContent = ranged() ? "Full cover at largest range" : "Full-cover range";
    $("range-note").hidden = !ranged();
    $("range").min = ranged() ? String(Math.ceil(2 * (f.leastRangeM + 0.01)) / 2) : "0.5";
    if (ranged()) {
      $("range-note").textContent = "Devices have their own ranges. The slider grows them all together by uniform power growth: " +
        "each range becomes √(r² + t) with one t, the slider showing the largest (the power diagram, so the service areas, stays the same). " +
        "Hidden devices: " + (f.hidden ? f.hidden.length : 0) + ".";
    }
    typeControls();
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
    if ($("show-cells").checked) loadCells(); else cellsPath = null;
    hideTip(); // the hovered element may be gone
    draw();
    drawCurve();
    showSelection();
  }

  function loadCells() {
    getJSON("/api/cells").then((c) => {
      cellsPath = new Path2D();
      for (const cell of c) addFlat(cellsPath, cell.outline);
      draw();
    }).catch((e) => toast(e.message));
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

  const ranged = () => state && state.figures.growthM2 !== undefined;
  function gapHTML(gp) {
    return "<h3>Gap " + gp.id + (gp.touchesBoundary ? " (reaches the edge)" : " (enclosed)") + "</h3><table>" +
      row("area", fmtArea(gp.areaM2)) + row(ranged() ? "closes at largest range" : "closes at range", fmtM(gp.closingRangeM)) +
      (gp.aloneDevice !== undefined ? row("or alone", devName(gp.aloneDevice) + " at " + fmtM(gp.aloneRangeM)) : "") +
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
      if (dv.rangeM !== undefined) {
        h += (dv.type ? row("type", esc(dv.type)) : "") + row("range", fmtM(dv.rangeM));
        if (dv.hidden) h += row("hidden", "its disk is covered by others; its failure costs nothing");
        else if (dv.on && dv.servedM2 !== undefined) {
          h += row("serves", fmtArea(dv.servedM2) + " (" + fmtPct(dv.servedShare) + " of the area; power cell)") +
            (dv.withinRangeM2 !== undefined ? row("within its range", fmtArea(dv.withinRangeM2)) : "") +
            row("farthest point served", fmtM(dv.farthestM)) + failRows(dv, true);
        } else if (dv.shared) h += row("note", "stands on another device's spot") + failRows(dv, true);
        d.innerHTML = h + "</table>" + rangeControl("dev-range", "Set this device's range", dv.rangeM);
        $("dev-range-set").addEventListener("click", () => setRange({ op: "device-range", device: i }, "dev-range"));
        return;
      }
      if (dv.on) {
        h += row("serves", fmtArea(dv.servedM2) + " (" + fmtPct(dv.servedShare) + " of the area)") +
          row("farthest point served", fmtM(dv.farthestM)) + failRows(dv, false) +
          (dv.shared ? row("note", "stands on another device's spot") : "");
      }
      // on a common-range plan, setting one device's range switches the
      // plan to ranges per device (every other device keeps the range)
      d.innerHTML = h + "</table>" + rangeControl("dev-range", "Set this device's own range", state.figures.rangeM);
      $("dev-range-set").addEventListener("click", () => setRange({ op: "device-range", device: i }, "dev-range"));
    }).catch((e) => toast(e.message));
  }
  // failRows are the rows of the loss if a device fails; with own ranges
  // the closing is the largest range (the slider's value) and the range
  // the device taking over needs to reach the deepest point.
  function failRows(dv, own) {
    const closes = dv.failClosingRangeM === undefined ? (dv.servedM2 === 0 ? "nothing to close" : "no device left") :
      (own ? "largest range " : "") + fmtM(dv.failClosingRangeM);
    return row("if it fails: uncovered +", fmtArea(dv.failAddedUncoveredM2)) +
      row("if it fails: closes at", closes) +
      (dv.failBackup !== undefined ? row("takes over", devName(dv.failBackup) +
        (own && dv.failBackupRangeM !== undefined ? " (needs " + fmtM(dv.failBackupRangeM) + " to reach the deepest point)" : "")) : "");
  }

  // rangeControl is a number field with a Set button (own ranges).
  function rangeControl(id, label, v) {
    return '<div class="rangectl"><label for="' + id + '">' + label + '</label> <input type="number" id="' + id +
      '" min="0.1" step="0.5" value="' + fx(v, 2) + '"> m <button class="btn" id="' + id + '-set">Set</button></div>';
  }
  // setRange sends a device-range or type-range edit with the field's
  // value; the server checks it (a positive, finite, plausible length).
  function setRange(e, id) {
    const v = $(id).valueAsNumber;
    if (!isFinite(v) || v <= 0) { toast("a range must be a positive number of metres"); return; }
    e.range = v;
    edit(e);
  }
  // typeControls shows one range field per device type (own ranges).
  function typeControls() {
    const f = state.figures, box = $("type-ranges");
    box.hidden = !ranged() || !f.types;
    if (box.hidden || box.contains(document.activeElement)) return;
    box.innerHTML = "";
    f.types.forEach((t, k) => {
      const i = state.devices.findIndex((d) => d.type === t);
      box.insertAdjacentHTML("beforeend", rangeControl("type-range-" + k, "Every " + esc(t), i >= 0 ? rangeOf(i) : f.rangeM));
      $("type-range-" + k + "-set").addEventListener("click", () => setRange({ op: "type-range", type: t }, "type-range-" + k));
    });
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
    tip.textContent = "Gap " + gp.id + ": " + fmtArea(gp.areaM2) + ", closes at " + (ranged() ? "largest range " : "") + fmtM(gp.closingRangeM);
    tip.hidden = false; moveTip(ev);
  }
  // hover shows the tooltip of the device or gap under the pointer.
  function hover(ev) {
    const b = svg.getBoundingClientRect();
    const i = deviceAt(ev.clientX - b.left, ev.clientY - b.top);
    if (i >= 0) { hoverDevice(i, ev); return; }
    const gid = gapAt(ev.clientX - b.left, ev.clientY - b.top);
    const gp = gid !== null && state.figures.gaps.find((g) => g.id === gid);
    if (gp) hoverGap(gp, ev); else hideTip();
  }
  // hoverDevice shows the device's name, then (one request per device and
  // state, kept while the pointer stays) what it serves and what its
  // failure would leave uncovered.
  const hoverFig = { key: "", text: "" };
  function hoverDevice(i, ev) {
    if (dragging.device !== null) return;
    const d = state.devices[i], key = state.version + ":" + i;
    const name = "Device #" + i + (d.label ? " " + d.label : "") + (d.on ? "" : " (off)");
    tip.textContent = name + (hoverFig.key === key ? hoverFig.text : "");
    tip.hidden = false; moveTip(ev);
    if (hoverFig.key === key || !d.on) return;
    hoverFig.key = key; hoverFig.text = "";
    getJSON("/api/device/" + i).then((dv) => {
      if (hoverFig.key !== key) return;
      if (dv.hidden) hoverFig.text = ": hidden — its disk is covered by others; its failure costs nothing";
      else if (dv.failAddedUncoveredM2 !== undefined) {
        hoverFig.text = (dv.servedM2 !== undefined ? ": serves " + fmtArea(dv.servedM2) : "") +
          "; if it fails, uncovered + " + fmtArea(dv.failAddedUncoveredM2);
      }
      if (!tip.hidden && tip.textContent === name) tip.textContent = name + hoverFig.text;
    }).catch(() => {});
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
      dragging.target = gapAt(ev.clientX - b.left, ev.clientY - b.top);
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
      if (first) { drawDisks(); drawMain(); drawDevLayer(); drawDevices(); } else drawDragged();
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
      const gid = dragging.target;
      if (!dragging.moved && gid !== null) select("gap", gid);
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
  $("show-cells").addEventListener("change", () => { if ($("show-cells").checked) loadCells(); else { cellsPath = null; draw(); } });

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
    scenePaths();
    startRange = st.figures.rangeM;
    document.title = "Review: " + sc.title;
    $("title").textContent = sc.title;
    const cl = $("cautions");
    for (const c of sc.cautions) { const li = document.createElement("li"); li.textContent = c; cl.appendChild(li); }
    const ban = $("caution-banner");
    ban.hidden = false;
    if (sc.lifeSafety) {
      ban.className = "life";
      ban.textContent = "Life-safety devices: " + sc.cautions.join(" ");
    }
    if (!sc.canReport) { $("write-report").disabled = true; $("report-out").textContent = "Start with --out to write the full report."; }
    else $("report-out").textContent = "into " + sc.outDir;
    $("range").max = sc.curveTopM.toString();
    fit();
    setState(st);
    document.body.dataset.ready = "1";
  }).catch((e) => toast("cannot load the plan: " + e.message));
})();
