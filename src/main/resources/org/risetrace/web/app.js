// risetrace workbench: the page. Plain JavaScript and canvas, nothing loaded from elsewhere.
// Coordinates: frame pixels with pixel centres at whole numbers (as board.json's corners_px); board millimetres
// from the marked top-left corner, x right, y down (as board.json's parts).
'use strict';

const $ = (id) => document.getElementById(id);
const CORNER_NAMES = ['top-left', 'top-right', 'bottom-right', 'bottom-left'];

const S = {
  csrf: null, token: sessionStorage.getItem('risetrace-token'), session: null, palette: null,
  root: 0, browsePath: '',
  series: null,            // {root, path, name, width, height, frames: [{i, name, t_s}], ...}
  frameIndex: 0, frame: null, frameCache: new Map(),
  view: { s: 1, ox: 0, oy: 0, fitted: false },
  corners: [], refFrame: null, lastCorner: -1,
  boardW: null, boardH: null, boardName: '',
  rect: null,              // rectified reference frame {w, h, pxPerMm, data, min, max}
  parts: [], selected: -1, boardView: { k: 1, ox: 0, oy: 0 },
  job: null, result: null, riseMap: null,
  tab: 'open',
  dirty: false,            // outline or parts changed since the last save
};
window.rt = S; // for the browser test and for curious users: the page's state

// ------------------------------------------------------------------------------------------------ API

async function api(method, url, body, raw) {
  const headers = {};
  if (S.token) headers['X-Access-Token'] = S.token;
  if (method !== 'GET') headers['X-CSRF-Token'] = S.csrf || '';
  if (body !== undefined && !(body instanceof Blob) && typeof body !== 'string') {
    headers['Content-Type'] = 'application/json';
    body = JSON.stringify(body);
  }
  const res = await fetch(url, { method, headers, body, credentials: 'same-origin' });
  if (!res.ok) {
    let msg = res.status + ' ' + res.statusText;
    try { const j = await res.json(); if (j.error) msg = j.error; } catch (e) { /* not JSON */ }
    const err = new Error(msg); err.status = res.status; throw err;
  }
  if (raw) return res;
  return res.json();
}

async function raster(method, url, body) {
  const res = await api(method, url, body, true);
  const w = +res.headers.get('X-Width'), h = +res.headers.get('X-Height');
  const data = new Float32Array(await res.arrayBuffer());
  return { w, h, data, min: +res.headers.get('X-Min'), max: +res.headers.get('X-Max'),
    pxPerMm: +(res.headers.get('X-Px-Per-Mm') || 0), name: res.headers.get('X-Frame-Name') };
}

const q = (o) => Object.entries(o).map(([k, v]) => encodeURIComponent(k) + '=' + encodeURIComponent(v)).join('&');
const seriesQuery = () => q({ root: S.series.root, path: S.series.path });

function show(msg, info) {
  const m = $('message');
  if (!msg) { m.hidden = true; return; }
  m.textContent = msg; m.className = 'message' + (info ? ' info' : ''); m.hidden = false;
  clearTimeout(show.t);
  if (info) show.t = setTimeout(() => { m.hidden = true; }, 5000);
}

function fmt(v, d) { return v === null || v === undefined || Number.isNaN(v) ? '\u2013' : Number(v).toFixed(d); }
function sig(v, n) { return v === null || v === undefined ? '\u2013' : Number(v).toPrecision(n); }

// ------------------------------------------------------------------------------------------------ start

async function start() {
  try {
    const s = await api('GET', '/api/session');
    S.session = s; S.csrf = s.csrf; S.palette = s.palette;
  } catch (e) {
    if (e.status === 401) { askToken(); return; }
    show(e.message); return;
  }
  for (const id of ['safety-analyse', 'safety-compare']) $(id).textContent = 'Safety: ' + S.session.safety;
  $('safety-foot').textContent = 'Safety: ' + S.session.safety;
  const rs = $('root-select'); rs.innerHTML = '';
  for (const r of S.session.roots) rs.add(new Option(r.index + ': ' + r.name, r.index));
  const ms = $('part-material'); ms.innerHTML = ''; ms.add(new Option('(none: the profile default)', ''));
  for (const m of S.session.materials) ms.add(new Option(m, m));
  wire();
  if (S.session.archive) { $('tab-btn-archive').hidden = false; wireArchive(); }
  await browse(0, '');
}

function askToken() {
  const d = $('token-dialog');
  $('token-form').onsubmit = () => {
    S.token = $('token-input').value.trim();
    sessionStorage.setItem('risetrace-token', S.token);
    setTimeout(start, 0);
  };
  d.showModal();
}

// ------------------------------------------------------------------------------------------------ tabs and keys

function setTab(name) {
  S.tab = name;
  for (const b of document.querySelectorAll('.tabs button')) b.setAttribute('aria-selected', b.dataset.tab === name);
  for (const t of document.querySelectorAll('.tab')) t.hidden = t.id !== 'tab-' + name;
  if (name === 'outline') { S.view.fitted = false; drawFrame(); drawRect(); }
  if (name === 'parts') { drawBoard(); }
  if (name === 'analyse') { drawResults(); }
  if (name === 'archive') { searchCases(); }
}

function typing(e) {
  const t = e.target;
  return t && (t.tagName === 'INPUT' || t.tagName === 'SELECT' || t.tagName === 'TEXTAREA');
}

function onKey(e) {
  if ((e.ctrlKey || e.metaKey) && e.key.toLowerCase() === 's') { e.preventDefault(); saveBoard(); return; }
  if (typing(e) || e.ctrlKey || e.metaKey) return;
  if (document.querySelector('dialog[open]')) return;
  const tabs = ['open', 'outline', 'parts', 'analyse', 'compare'];
  if (S.session && S.session.archive) tabs.push('archive');
  if (!e.altKey && e.key >= '1' && e.key <= String(tabs.length)) { setTab(tabs[+e.key - 1]); e.preventDefault(); return; }
  if (e.key === '?') { $('help').showModal(); e.preventDefault(); return; }
  if (S.tab === 'outline') {
    if (e.altKey && S.lastCorner >= 0 && e.key.startsWith('Arrow')) {
      const c = S.corners[S.lastCorner], d = 0.1;
      if (e.key === 'ArrowLeft') c[0] -= d; if (e.key === 'ArrowRight') c[0] += d;
      if (e.key === 'ArrowUp') c[1] -= d; if (e.key === 'ArrowDown') c[1] += d;
      cornersChanged(); e.preventDefault(); return;
    }
    if (e.key === 'ArrowLeft') { gotoFrame(S.frameIndex - 1); e.preventDefault(); }
    else if (e.key === 'ArrowRight') { gotoFrame(S.frameIndex + 1); e.preventDefault(); }
    else if (e.key === '+' || e.key === '=') zoomBy(1.25);
    else if (e.key === '-') zoomBy(0.8);
    else if (e.key === '0') { S.view.fitted = false; drawFrame(); }
    else if (e.key.toLowerCase() === 'u') { S.corners.pop(); S.lastCorner = S.corners.length - 1; cornersChanged(); }
    else if (e.key.toLowerCase() === 'c') { S.corners = []; S.lastCorner = -1; cornersChanged(); }
  } else if (S.tab === 'parts') {
    const p = S.parts[S.selected];
    if (p && (e.key === 'Delete' || e.key === 'Backspace')) { deletePart(); e.preventDefault(); }
    else if (p && e.key.toLowerCase() === 'r') { p.rotation_deg = (((p.rotation_deg || 0) + 90) % 360); partsChanged(); }
    else if (p && e.altKey && e.key.startsWith('Arrow')) {
      const d = 0.1;
      if (e.key === 'ArrowLeft') p.x_mm -= d; if (e.key === 'ArrowRight') p.x_mm += d;
      if (e.key === 'ArrowUp') p.y_mm -= d; if (e.key === 'ArrowDown') p.y_mm += d;
      partsChanged(); e.preventDefault();
    }
  } else if (S.tab === 'analyse' && e.key.toLowerCase() === 'a') { analyse(); }
}

function wire() {
  for (const b of document.querySelectorAll('.tabs button')) b.onclick = () => setTab(b.dataset.tab);
  document.addEventListener('keydown', onKey);
  $('help-btn').onclick = () => $('help').showModal();
  $('root-select').onchange = () => browse(+$('root-select').value, '');
  $('upload-btn').onclick = upload;
  $('frame-slider').oninput = () => gotoFrame(+$('frame-slider').value);
  $('prev-frame').onclick = () => gotoFrame(S.frameIndex - 1);
  $('next-frame').onclick = () => gotoFrame(S.frameIndex + 1);
  $('zoom-in').onclick = () => zoomBy(1.25);
  $('zoom-out').onclick = () => zoomBy(0.8);
  $('zoom-fit').onclick = () => { S.view.fitted = false; drawFrame(); };
  $('undo-corner').onclick = () => { S.corners.pop(); S.lastCorner = S.corners.length - 1; cornersChanged(); };
  $('clear-corners').onclick = () => { S.corners = []; S.lastCorner = -1; cornersChanged(); };
  $('board-w').oninput = () => { S.boardW = parseFloat($('board-w').value) || null; cornersChanged(); };
  $('board-h').oninput = () => { S.boardH = parseFloat($('board-h').value) || null; cornersChanged(); };
  $('board-name').oninput = () => { S.boardName = $('board-name').value; };
  wireFrameCanvas();
  wireBoardCanvas();
  wirePartEditor();
  $('save-board').onclick = saveBoard;
  $('placement-file').onchange = importPlacement;
  $('analyse-btn').onclick = analyse;
  $('compare-btn').onclick = compare;
  window.addEventListener('resize', () => { S.view.fitted = false; drawFrame(); drawBoard(); });
}

// ------------------------------------------------------------------------------------------------ open

async function browse(root, path) {
  try {
    const b = await api('GET', '/api/browse?' + q({ root, path }));
    S.root = root; S.browsePath = b.path;
    const crumbs = $('crumbs'); crumbs.innerHTML = '';
    const parts = b.path ? b.path.split('/') : [];
    const top = document.createElement('button'); top.textContent = '(root)'; top.onclick = () => browse(root, '');
    crumbs.append(top);
    parts.forEach((p, i) => {
      const c = document.createElement('button'); c.textContent = p;
      c.onclick = () => browse(root, parts.slice(0, i + 1).join('/'));
      crumbs.append(' / ', c);
    });
    const tb = $('folder-table').tBodies[0]; tb.innerHTML = '';
    for (const f of b.folders) {
      const tr = tb.insertRow(); if (f.frames > 0) tr.className = 'series-row';
      const name = tr.insertCell(); const go = document.createElement('button');
      go.textContent = f.name + '/'; go.className = 'linkish'; go.onclick = () => browse(root, f.path);
      go.setAttribute('aria-label', 'Browse ' + f.name);
      name.append(go);
      tr.insertCell().textContent = f.frames > 0 ? f.frames : '';
      tr.insertCell().textContent = f.board ? 'yes' : '';
      const act = tr.insertCell();
      if (f.frames > 0) {
        const o = document.createElement('button'); o.className = 'primary'; o.textContent = 'Open';
        o.dataset.path = f.path; o.onclick = () => openSeries(root, f.path);
        act.append(o);
      }
    }
    const here = $('here-frames'); here.innerHTML = '';
    if (b.frames > 0) {
      here.append(b.frames + ' frame files in this folder. ');
      const o = document.createElement('button'); o.className = 'primary'; o.textContent = 'Open this folder';
      o.onclick = () => openSeries(root, b.path); here.append(o);
    }
    $('upload-folder').value = b.path ? b.path + '/upload' : 'upload';
  } catch (e) { show(e.message); }
}

async function upload() {
  const files = $('upload-files').files, folder = $('upload-folder').value.trim();
  if (!files.length) { show('choose files to upload'); return; }
  let n = 0;
  for (const f of files) {
    if (f.size > S.session.max_upload_bytes) { show(f.name + ' is larger than the upload limit'); return; }
    try {
      $('upload-status').textContent = 'uploading ' + f.name + ' ...';
      await api('POST', '/api/upload?' + q({ root: S.root, path: folder, name: f.name }), f);
      n++;
    } catch (e) { show(f.name + ': ' + e.message); $('upload-status').textContent = n + ' uploaded'; return; }
  }
  $('upload-status').textContent = n + ' file(s) uploaded into ' + folder;
  const parent = folder.includes('/') ? folder.slice(0, folder.lastIndexOf('/')) : '';
  await browse(S.root, parent);
}

async function openSeries(root, path) {
  try {
    show('opening ' + path + ' ...', true);
    const s = await api('GET', '/api/series?' + q({ root, path }));
    S.series = s; S.frameCache.clear(); S.frameIndex = 0; S.result = null; S.riseMap = null; S.rect = null;
    S.corners = []; S.refFrame = null; S.parts = []; S.selected = -1; S.lastCorner = -1;
    S.boardW = null; S.boardH = null; S.boardName = s.name;
    if (s.board) {
      const b = s.board;
      S.boardName = b.name || s.name;
      if (b.size_mm) { S.boardW = b.size_mm[0]; S.boardH = b.size_mm[1]; }
      if (b.outline) {
        S.corners = b.outline.corners_px.map((c) => [c[0], c[1]]);
        const k = s.frames.findIndex((f) => f.name === b.outline.frame);
        if (k >= 0) { S.refFrame = b.outline.frame; S.frameIndex = k; }
      }
      S.parts = (b.parts || []).map((p) => ({ ...p }));
    }
    $('board-w').value = S.boardW ?? ''; $('board-h').value = S.boardH ?? ''; $('board-name').value = S.boardName;
    $('current-series').textContent = s.name + ' \u00b7 ' + s.frames.length + ' frames';
    const sl = $('frame-slider'); sl.max = s.frames.length - 1; sl.value = S.frameIndex;
    const fl = $('frame-list'); fl.innerHTML = '';
    for (const f of s.frames) {
      const li = document.createElement('li'); li.textContent = f.name + '  ' + fmt(f.t_s, 2) + ' s';
      li.tabIndex = 0; li.onclick = () => gotoFrame(f.i);
      li.onkeydown = (e) => { if (e.key === 'Enter') gotoFrame(f.i); };
      fl.append(li);
    }
    for (const id of ['compare-before', 'compare-after']) {
      const sel = $(id); sel.innerHTML = '';
      for (const f of s.frames) sel.add(new Option(f.name + ' (' + fmt(f.t_s, 1) + ' s)', f.i));
    }
    $('compare-after').value = s.frames.length - 1;
    $('analyse-status').textContent = 'Analyses ' + s.name + ' with the saved board.json.';
    $('report-link').hidden = true;
    $('verdict-status').textContent = 'not analysed yet'; $('verdict-ref').textContent = ''; $('verdict-reason').textContent = '';
    $('verdict').dataset.status = '';
    $('ranking').tBodies[0].innerHTML = '';
    const notes = [];
    if (s.board_error) notes.push(s.board_error);
    if (s.warnings.length) notes.push(s.warnings.join('; '));
    if (notes.length) show(notes.join(' \u2014 ')); else show('opened ' + s.name, true);
    cornersChangedQuiet();
    renderPartList();
    S.dirty = false;
    setTab('outline');
    await gotoFrame(S.frameIndex);
    if (S.corners.length === 4) refreshRect();
  } catch (e) { show(e.message); }
}

// ------------------------------------------------------------------------------------------------ frame viewer

async function loadFrame(i) {
  if (S.frameCache.has(i)) return S.frameCache.get(i);
  const r = await raster('GET', '/api/frame?' + seriesQuery() + '&i=' + i);
  const img = colourise(r.data, r.w, r.h, r.min, r.max);
  const f = { ...r, img };
  if (S.frameCache.size > 40) S.frameCache.delete(S.frameCache.keys().next().value);
  S.frameCache.set(i, f);
  return f;
}

/** False colour with the report's own colour table, NaN transparent. */
function colourise(data, w, h, min, max) {
  const c = document.createElement('canvas'); c.width = w; c.height = h;
  const ctx = c.getContext('2d'); const im = ctx.createImageData(w, h);
  const span = max > min ? max - min : 1, pal = S.palette, n = pal.length - 1;
  for (let k = 0; k < data.length; k++) {
    const v = data[k];
    if (Number.isNaN(v)) { im.data[4 * k + 3] = 0; continue; }
    const rgb = pal[Math.max(0, Math.min(n, Math.round((v - min) / span * n)))];
    im.data[4 * k] = rgb >> 16 & 255; im.data[4 * k + 1] = rgb >> 8 & 255; im.data[4 * k + 2] = rgb & 255; im.data[4 * k + 3] = 255;
  }
  ctx.putImageData(im, 0, 0);
  return c;
}

async function gotoFrame(i) {
  if (!S.series) return;
  i = Math.max(0, Math.min(S.series.frames.length - 1, i));
  S.frameIndex = i; $('frame-slider').value = i;
  const f = S.series.frames[i];
  $('frame-label').textContent = f.name + ' \u00b7 t = ' + fmt(f.t_s, 2) + ' s \u00b7 ' + (i + 1) + '/' + S.series.frames.length;
  for (const [k, li] of [...$('frame-list').children].entries()) {
    li.setAttribute('aria-current', k === i);
    if (k === i) { // keep the current frame visible inside the list only (not the whole panel)
      const ol = li.parentElement;
      if (li.offsetTop < ol.scrollTop) ol.scrollTop = li.offsetTop;
      else if (li.offsetTop + li.offsetHeight > ol.scrollTop + ol.clientHeight) ol.scrollTop = li.offsetTop + li.offsetHeight - ol.clientHeight;
    }
  }
  try {
    S.frame = await loadFrame(i);
    if (S.frameIndex === i) drawFrame();
  } catch (e) { show(e.message); }
  if (S.corners.length < 4 || !S.refFrame) updateReferenceLabel();
}

function sizeCanvas(c) {
  const r = c.getBoundingClientRect(), dpr = window.devicePixelRatio || 1;
  const w = Math.max(1, Math.round(r.width * dpr)), h = Math.max(1, Math.round(r.height * dpr));
  if (c.width !== w || c.height !== h) { c.width = w; c.height = h; }
  return { w: r.width, h: r.height, dpr };
}

function drawFrame() {
  const c = $('frame-canvas');
  if (S.tab !== 'outline' || !S.frame) { if (S.frame) drawScale(S.frame.min, S.frame.max); return; }
  const { w, h, dpr } = sizeCanvas(c), f = S.frame, v = S.view;
  if (!v.fitted) {
    v.s = Math.min(w / f.w, h / f.h) * 0.96;
    v.ox = (w - f.w * v.s) / 2 + v.s / 2; v.oy = (h - f.h * v.s) / 2 + v.s / 2; v.fitted = true;
  }
  const ctx = c.getContext('2d');
  ctx.setTransform(dpr, 0, 0, dpr, 0, 0);
  ctx.fillStyle = '#23262b'; ctx.fillRect(0, 0, w, h);
  ctx.imageSmoothingEnabled = false;
  ctx.drawImage(f.img, v.ox - v.s / 2, v.oy - v.s / 2, f.w * v.s, f.h * v.s);
  // the outline: edges, then numbered corner handles
  const pts = S.corners.map((p) => [v.ox + p[0] * v.s, v.oy + p[1] * v.s]);
  if (pts.length > 1) {
    ctx.lineWidth = 2; ctx.strokeStyle = '#00e5ff'; ctx.setLineDash(pts.length === 4 ? [] : [6, 4]);
    ctx.beginPath(); pts.forEach((p, k) => (k ? ctx.lineTo(p[0], p[1]) : ctx.moveTo(p[0], p[1])));
    if (pts.length === 4) ctx.closePath();
    ctx.stroke(); ctx.setLineDash([]);
  }
  pts.forEach((p, k) => {
    ctx.beginPath(); ctx.arc(p[0], p[1], 11, 0, 2 * Math.PI);
    ctx.fillStyle = k === S.lastCorner ? '#ffd400' : '#ffffff'; ctx.fill();
    ctx.lineWidth = 2; ctx.strokeStyle = '#000'; ctx.stroke();
    ctx.fillStyle = '#000'; ctx.font = 'bold 13px system-ui, sans-serif'; ctx.textAlign = 'center'; ctx.textBaseline = 'middle';
    ctx.fillText(String(k + 1), p[0], p[1] + 0.5);
    ctx.beginPath(); ctx.moveTo(p[0] - 3, p[1]); ctx.lineTo(p[0] + 3, p[1]); ctx.moveTo(p[0], p[1] - 3); ctx.lineTo(p[0], p[1] + 3);
  });
  if (S.corners.length < 4) {
    ctx.fillStyle = 'rgba(0,0,0,.7)'; ctx.fillRect(8, 8, 300, 28);
    ctx.fillStyle = '#fff'; ctx.font = '14px system-ui, sans-serif'; ctx.textAlign = 'left'; ctx.textBaseline = 'middle';
    ctx.fillText('Click corner ' + (S.corners.length + 1) + ': ' + CORNER_NAMES[S.corners.length], 16, 22);
  }
  drawScale(f.min, f.max);
}

/** The colour scale: the table from bottom (cold) to top (hot), ticks in degrees Celsius. */
function drawScale(min, max) {
  const c = $('frame-scale'); const { w, h, dpr } = sizeCanvas(c); const ctx = c.getContext('2d');
  ctx.setTransform(dpr, 0, 0, dpr, 0, 0); ctx.clearRect(0, 0, w, h);
  const top = 14, bot = h - 14, x = 6, bw = 18, pal = S.palette;
  for (let y = top; y <= bot; y++) {
    const t = (bot - y) / (bot - top), rgb = pal[Math.round(t * (pal.length - 1))];
    ctx.fillStyle = '#' + rgb.toString(16).padStart(6, '0'); ctx.fillRect(x, y, bw, 1.5);
  }
  ctx.strokeStyle = '#eef0f3'; ctx.strokeRect(x, top, bw, bot - top);
  ctx.fillStyle = '#eef0f3'; ctx.font = '12px system-ui, sans-serif'; ctx.textAlign = 'left'; ctx.textBaseline = 'middle';
  const ticks = niceTicks(min, max, 6);
  for (const t of ticks) {
    const y = bot - (t - min) / ((max - min) || 1) * (bot - top);
    if (y < top - 1 || y > bot + 1) continue;
    ctx.fillRect(x + bw, y, 4, 1); ctx.fillText(t.toFixed(stepDecimals(ticks)), x + bw + 7, y);
  }
  ctx.fillText('\u00b0C', x, 6);
}

function niceTicks(min, max, n) {
  if (!(max > min)) return [min];
  const raw = (max - min) / n, mag = Math.pow(10, Math.floor(Math.log10(raw)));
  const step = [1, 2, 2.5, 5, 10].map((m) => m * mag).find((s) => s >= raw) || raw;
  const out = []; for (let t = Math.ceil(min / step) * step; t <= max + 1e-9; t += step) out.push(+t.toFixed(10));
  return out;
}
function stepDecimals(ticks) {
  if (ticks.length < 2) return 1;
  const st = ticks[1] - ticks[0]; return st >= 1 ? 0 : st >= 0.1 ? 1 : 2;
}

function toFrame(ev) {
  const r = $('frame-canvas').getBoundingClientRect(), v = S.view;
  return [(ev.clientX - r.left - v.ox) / v.s, (ev.clientY - r.top - v.oy) / v.s];
}
/** Where frame point (x, y) is on the frame canvas, CSS pixels from its top-left corner (for tests and tools). */
S.frameToCanvas = (x, y) => [S.view.ox + x * S.view.s, S.view.oy + y * S.view.s];

function zoomBy(k, cx, cy) {
  const v = S.view, c = $('frame-canvas').getBoundingClientRect();
  cx = cx ?? c.width / 2; cy = cy ?? c.height / 2;
  v.ox = cx - (cx - v.ox) * k; v.oy = cy - (cy - v.oy) * k; v.s *= k; drawFrame();
}

function wireFrameCanvas() {
  const c = $('frame-canvas');
  let drag = null;
  c.addEventListener('pointerdown', (ev) => {
    if (!S.frame) return;
    c.focus(); c.setPointerCapture(ev.pointerId);
    const [fx, fy] = toFrame(ev), hitR = 14 / S.view.s;
    const hit = S.corners.findIndex((p) => Math.hypot(p[0] - fx, p[1] - fy) <= hitR);
    drag = { x: ev.clientX, y: ev.clientY, corner: hit, moved: false, ox: S.view.ox, oy: S.view.oy, pan: ev.button !== 0 || ev.shiftKey };
    if (hit >= 0) S.lastCorner = hit;
  });
  c.addEventListener('pointermove', (ev) => {
    if (S.frame) {
      const [fx, fy] = toFrame(ev), i = Math.round(fx), j = Math.round(fy), f = S.frame;
      $('readout').textContent = (i >= 0 && j >= 0 && i < f.w && j < f.h)
        ? 'x ' + fx.toFixed(1) + '  y ' + fy.toFixed(1) + ' px   ' + f.data[j * f.w + i].toFixed(2) + ' \u00b0C   (frame ' + f.name + ')'
        : 'outside the frame';
    }
    if (!drag) return;
    const dx = ev.clientX - drag.x, dy = ev.clientY - drag.y;
    if (Math.hypot(dx, dy) > 3) drag.moved = true;
    if (!drag.moved) return;
    if (drag.corner >= 0 && !drag.pan) {
      S.corners[drag.corner] = toFrame(ev); cornersChangedQuiet(); drawFrame();
    } else { S.view.ox = drag.ox + dx; S.view.oy = drag.oy + dy; drawFrame(); }
  });
  c.addEventListener('pointerup', (ev) => {
    if (!drag) return;
    const d = drag; drag = null;
    if (d.moved) { if (d.corner >= 0 && !d.pan) cornersChanged(); return; }
    if (d.corner < 0 && !d.pan && S.corners.length < 4) {
      S.corners.push(toFrame(ev)); S.lastCorner = S.corners.length - 1;
      S.refFrame = S.series.frames[S.frameIndex].name; cornersChanged();
    }
  });
  c.addEventListener('wheel', (ev) => {
    ev.preventDefault(); const r = c.getBoundingClientRect();
    zoomBy(ev.deltaY < 0 ? 1.2 : 1 / 1.2, ev.clientX - r.left, ev.clientY - r.top);
  }, { passive: false });
  c.addEventListener('contextmenu', (ev) => ev.preventDefault());
}

function updateReferenceLabel() {
  $('reference-label').textContent = S.refFrame
    ? 'Corners marked on frame ' + S.refFrame + (S.series && S.series.frames[S.frameIndex].name !== S.refFrame ? ' (another frame is shown)' : '') + '.'
    : 'Corners go on the frame shown.';
}

function cornersChangedQuiet() {
  const ol = $('corner-list'); ol.innerHTML = '';
  for (let k = 0; k < 4; k++) {
    const li = document.createElement('li'); const p = S.corners[k];
    li.textContent = (k + 1) + ' ' + (CORNER_NAMES[k] + ':').padEnd(14, '\u00a0') + (p ? p[0].toFixed(1) + ', ' + p[1].toFixed(1) : '\u2013');
    if (!p) li.className = 'missing';
    ol.append(li);
  }
  updateReferenceLabel();
}

let rectTimer = null;
function cornersChanged() {
  S.dirty = true;
  cornersChangedQuiet(); drawFrame();
  clearTimeout(rectTimer); rectTimer = setTimeout(refreshRect, 120);
}

/** The board document as board.json holds it. */
function boardDoc(withParts) {
  const d = { name: S.boardName || (S.series ? S.series.name : 'board'), size_mm: [S.boardW, S.boardH],
    outline: { frame: S.refFrame, corners_px: S.corners.map((p) => [round(p[0], 2), round(p[1], 2)]) } };
  if (withParts) d.parts = S.parts.map(cleanPart);
  return d;
}
function round(v, d) { const k = Math.pow(10, d); return Math.round(v * k) / k; }
function cleanPart(p) {
  const o = { ref: p.ref };
  if (p.kind) o.kind = p.kind;
  if (p.material) o.material = p.material;
  o.x_mm = round(p.x_mm, 2); o.y_mm = round(p.y_mm, 2); o.w_mm = round(p.w_mm, 2); o.h_mm = round(p.h_mm, 2);
  if (p.rotation_deg) o.rotation_deg = round(p.rotation_deg, 1);
  return o;
}

async function refreshRect() {
  if (!S.series) return;
  if (S.corners.length < 4 || !(S.boardW > 0) || !(S.boardH > 0)) {
    S.rect = null; drawRect();
    $('rect-status').textContent = S.corners.length < 4 ? 'Mark all four corners.' : 'Type the board\u2019s width and height in mm.';
    return;
  }
  try {
    const r = await raster('POST', '/api/rectify?' + seriesQuery(), boardDoc(false));
    r.img = colourise(r.data, r.w, r.h, r.min, r.max);
    S.rect = r; $('rect-status').textContent = 'Rectified from ' + S.refFrame + ' at ' + r.pxPerMm.toFixed(2) + ' px/mm.';
    drawRect(); drawBoard();
  } catch (e) {
    S.rect = null; drawRect(); $('rect-status').textContent = e.message;
  }
}

function drawRect() {
  const c = $('rect-canvas'), ctx = c.getContext('2d');
  ctx.setTransform(1, 0, 0, 1, 0, 0); ctx.fillStyle = '#23262b'; ctx.fillRect(0, 0, c.width, c.height);
  if (!S.rect) return;
  const k = Math.min(c.width / S.rect.w, c.height / S.rect.h);
  ctx.imageSmoothingEnabled = false;
  ctx.drawImage(S.rect.img, (c.width - S.rect.w * k) / 2, (c.height - S.rect.h * k) / 2, S.rect.w * k, S.rect.h * k);
}

// ------------------------------------------------------------------------------------------------ parts

function boardFit(w, h) {
  const bv = S.boardView, pad = 24;
  bv.k = Math.min((w - 2 * pad) / S.boardW, (h - 2 * pad) / S.boardH);
  bv.ox = (w - S.boardW * bv.k) / 2; bv.oy = (h - S.boardH * bv.k) / 2;
}
/** Where board point (x, y) mm is on the parts canvas, CSS pixels from its top-left corner. */
S.boardToCanvas = (x, y) => [S.boardView.ox + x * S.boardView.k, S.boardView.oy + y * S.boardView.k];

function partCorners(p) {
  const a = -(p.rotation_deg || 0) * Math.PI / 180, c = Math.cos(a), s = Math.sin(a);
  return [[-1, -1], [1, -1], [1, 1], [-1, 1]].map(([u, v]) => {
    const dx = u * p.w_mm / 2, dy = v * p.h_mm / 2;
    return [p.x_mm + dx * c - dy * s, p.y_mm + dx * s + dy * c];
  });
}
function inside(p, x, y) {
  const a = (p.rotation_deg || 0) * Math.PI / 180, dx = x - p.x_mm, dy = y - p.y_mm;
  const u = dx * Math.cos(a) - dy * Math.sin(a), v = dx * Math.sin(a) + dy * Math.cos(a);
  return Math.abs(u) <= p.w_mm / 2 && Math.abs(v) <= p.h_mm / 2;
}

function drawPartsOn(ctx, toScreen, selected, labelColour) {
  S.partsForDrawing().forEach((p, k) => {
    const pts = partCorners(p).map(([x, y]) => toScreen(x, y));
    ctx.beginPath(); pts.forEach((q, n) => (n ? ctx.lineTo(q[0], q[1]) : ctx.moveTo(q[0], q[1]))); ctx.closePath();
    ctx.lineWidth = k === selected ? 3 : 1.6; ctx.strokeStyle = k === selected ? '#ffd400' : '#00e5ff'; ctx.stroke();
    const [cx, cy] = toScreen(p.x_mm, p.y_mm);
    ctx.font = 'bold 12px system-ui, sans-serif'; ctx.textAlign = 'center'; ctx.textBaseline = 'bottom';
    const top = Math.min(...pts.map((q) => q[1]));
    const tw = ctx.measureText(p.ref).width;
    ctx.fillStyle = 'rgba(0,0,0,.72)'; ctx.fillRect(cx - tw / 2 - 3, top - 17, tw + 6, 15);
    ctx.fillStyle = labelColour || '#fff'; ctx.fillText(p.ref, cx, top - 3);
  });
}
S.partsForDrawing = () => S.parts;

function drawBoard() {
  if (S.tab !== 'parts') return;
  const c = $('board-canvas'); const { w, h, dpr } = sizeCanvas(c); const ctx = c.getContext('2d');
  ctx.setTransform(dpr, 0, 0, dpr, 0, 0); ctx.fillStyle = '#23262b'; ctx.fillRect(0, 0, w, h);
  if (!S.rect || !(S.boardW > 0)) {
    ctx.fillStyle = '#eef0f3'; ctx.font = '15px system-ui, sans-serif'; ctx.textAlign = 'center';
    ctx.fillText(S.series ? 'Mark the four corners and the board size first (step 2).' : 'Open a series first (step 1).', w / 2, h / 2);
    return;
  }
  boardFit(w, h); const bv = S.boardView;
  ctx.imageSmoothingEnabled = false;
  ctx.drawImage(S.rect.img, bv.ox, bv.oy, S.boardW * bv.k, S.boardH * bv.k);
  ctx.strokeStyle = '#8d96a2'; ctx.lineWidth = 1; ctx.strokeRect(bv.ox, bv.oy, S.boardW * bv.k, S.boardH * bv.k);
  drawPartsOn(ctx, (x, y) => S.boardToCanvas(x, y), S.selected);
  if (S.drawing) {
    const d = S.drawing, [x0, y0] = S.boardToCanvas(d.x0, d.y0), [x1, y1] = S.boardToCanvas(d.x1, d.y1);
    ctx.setLineDash([5, 3]); ctx.strokeStyle = '#ffd400'; ctx.lineWidth = 2; ctx.strokeRect(x0, y0, x1 - x0, y1 - y0); ctx.setLineDash([]);
  }
}

function toBoard(ev) {
  const r = $('board-canvas').getBoundingClientRect(), bv = S.boardView;
  return [(ev.clientX - r.left - bv.ox) / bv.k, (ev.clientY - r.top - bv.oy) / bv.k];
}
const clampX = (x) => Math.max(0, Math.min(S.boardW, x));
const clampY = (y) => Math.max(0, Math.min(S.boardH, y));

function nextRef() {
  for (let n = 1; ; n++) if (!S.parts.some((p) => p.ref === 'P' + n)) return 'P' + n;
}

function wireBoardCanvas() {
  const c = $('board-canvas'); let drag = null;
  c.addEventListener('pointerdown', (ev) => {
    if (!S.rect) return;
    c.focus(); c.setPointerCapture(ev.pointerId);
    const [x, y] = toBoard(ev);
    let hit = -1;
    for (let k = S.parts.length - 1; k >= 0; k--) if (inside(S.parts[k], x, y)) { hit = k; break; }
    if (hit >= 0) { selectPart(hit); drag = { move: true, x, y, px: S.parts[hit].x_mm, py: S.parts[hit].y_mm }; }
    else drag = { move: false, x: clampX(x), y: clampY(y) };
  });
  c.addEventListener('pointermove', (ev) => {
    if (!S.rect) return;
    const [x, y] = toBoard(ev);
    $('board-readout').textContent = x >= 0 && y >= 0 && x <= S.boardW && y <= S.boardH ? 'x ' + x.toFixed(1) + '  y ' + y.toFixed(1) + ' mm' : '';
    if (!drag) return;
    if (drag.move) {
      const p = S.parts[S.selected];
      p.x_mm = drag.px + (x - drag.x); p.y_mm = drag.py + (y - drag.y); fillEditor(); drawBoard();
    } else { S.drawing = { x0: drag.x, y0: drag.y, x1: clampX(x), y1: clampY(y) }; drawBoard(); }
  });
  c.addEventListener('pointerup', () => {
    const d = drag; drag = null;
    if (!d) return;
    if (d.move) { partsChanged(); return; }
    const r = S.drawing; S.drawing = null;
    if (r && Math.abs(r.x1 - r.x0) > 0.3 && Math.abs(r.y1 - r.y0) > 0.3) {
      S.parts.push({ ref: nextRef(), x_mm: (r.x0 + r.x1) / 2, y_mm: (r.y0 + r.y1) / 2,
        w_mm: Math.abs(r.x1 - r.x0), h_mm: Math.abs(r.y1 - r.y0) });
      selectPart(S.parts.length - 1); partsChanged();
      $('part-ref').focus(); $('part-ref').select();
    } else { selectPart(-1); drawBoard(); }
  });
}

function wirePartEditor() {
  const bind = (id, key, num) => {
    const update = () => {
      const p = S.parts[S.selected]; if (!p) return;
      const v = $(id).value;
      if (num) { const n = parseFloat(v); if (Number.isFinite(n)) p[key] = n; } else p[key] = v.trim();
      partsChanged(true);
    };
    $(id).addEventListener('input', update);
    $(id).addEventListener('change', update);
  };
  bind('part-ref', 'ref'); bind('part-kind', 'kind'); bind('part-material', 'material');
  bind('part-x', 'x_mm', true); bind('part-y', 'y_mm', true); bind('part-w', 'w_mm', true); bind('part-h', 'h_mm', true);
  bind('part-rot', 'rotation_deg', true);
  $('part-delete').onclick = deletePart;
}

function selectPart(k) {
  S.selected = k; fillEditor(); renderPartList(); drawBoard();
}
function fillEditor() {
  const p = S.parts[S.selected], on = !!p;
  for (const el of $('part-editor').querySelectorAll('input, select, button')) el.disabled = !on;
  $('part-ref').value = on ? p.ref : ''; $('part-kind').value = on ? (p.kind || '') : '';
  $('part-material').value = on ? (p.material || '') : '';
  $('part-x').value = on ? round(p.x_mm, 2) : ''; $('part-y').value = on ? round(p.y_mm, 2) : '';
  $('part-w').value = on ? round(p.w_mm, 2) : ''; $('part-h').value = on ? round(p.h_mm, 2) : '';
  $('part-rot').value = on ? (p.rotation_deg || 0) : '';
}
function deletePart() {
  if (S.selected < 0) return;
  S.parts.splice(S.selected, 1); S.selected = Math.min(S.selected, S.parts.length - 1); partsChanged();
}
function partsChanged(fromEditor) {
  S.dirty = true;
  if (!fromEditor) fillEditor();
  renderPartList(); drawBoard();
  $('save-status').textContent = 'Unsaved changes.';
}
function renderPartList() {
  const ol = $('part-list'); ol.innerHTML = '';
  S.parts.forEach((p, k) => {
    const li = document.createElement('li'); li.tabIndex = 0;
    li.textContent = p.ref + (p.kind ? '  ' + p.kind : '') + '  ' + fmt(p.w_mm, 1) + '\u00d7' + fmt(p.h_mm, 1) + ' mm';
    li.setAttribute('aria-current', k === S.selected);
    li.onclick = () => selectPart(k); li.onkeydown = (e) => { if (e.key === 'Enter') selectPart(k); };
    ol.append(li);
  });
  if (S.selected < 0) fillEditor();
}

async function importPlacement() {
  const f = $('placement-file').files[0]; if (!f) return;
  try {
    const params = { units: $('placement-units').value, side: 'top' };
    if (S.boardW > 0 && S.boardH > 0) { params.w_mm = S.boardW; params.h_mm = S.boardH; }
    const r = await api('POST', '/api/placement?' + q(params), await f.text());
    let added = 0, skipped = 0;
    for (const p of r.parts) {
      if (S.parts.some((o) => o.ref === p.ref)) { skipped++; continue; }
      S.parts.push({ ...p }); added++;
    }
    if (!(S.boardW > 0) && r.size_mm) { S.boardW = r.size_mm[0]; S.boardH = r.size_mm[1]; $('board-w').value = S.boardW; $('board-h').value = S.boardH; }
    $('placement-status').textContent = added + ' parts added' + (skipped ? ', ' + skipped + ' already marked' : '') + '. ' + (r.notes || []).join(' ');
    partsChanged();
  } catch (e) { $('placement-status').textContent = e.message; }
  $('placement-file').value = '';
}

async function saveBoard() {
  if (!S.series) { show('open a series first'); return; }
  if (S.corners.length < 4) { show('mark the four corners first (step 2)'); return; }
  if (!(S.boardW > 0 && S.boardH > 0)) { show('type the board\u2019s width and height in mm first (step 2)'); return; }
  try {
    const r = await api('POST', '/api/board?' + seriesQuery(), boardDoc(true));
    const msg = 'Saved ' + r.saved + ' (' + r.parts + ' parts)' + (r.backup ? '; the previous file is kept as ' + r.backup : '') + '.';
    $('save-status').textContent = msg; show(msg, true); S.dirty = false;
  } catch (e) { $('save-status').textContent = 'Not saved: ' + e.message; show('Not saved: ' + e.message); }
}

// ------------------------------------------------------------------------------------------------ analyse

async function analyse() {
  if (!S.series) { show('open a series first'); return; }
  if (S.dirty) { show('the outline or parts changed since the last save: save board.json first (Ctrl+S); the analysis reads the saved file'); return; }
  const btn = $('analyse-btn'), pr = $('analyse-progress');
  btn.disabled = true; pr.hidden = false; pr.removeAttribute('value');
  $('analyse-status').textContent = 'starting ...'; $('report-link').hidden = true;
  try {
    const { job } = await api('POST', '/api/analyse?' + seriesQuery());
    S.job = job;
    for (;;) {
      await new Promise((r) => setTimeout(r, 400));
      const j = await api('GET', '/api/job?' + q({ id: job }));
      if (j.total > 0) { pr.max = j.total; pr.value = j.done; }
      $('analyse-status').textContent = j.state === 'running' ? 'frames ' + j.done + ' of ' + (j.total || '?') : j.state;
      if (j.state === 'failed') throw new Error(j.error);
      if (j.state === 'done') { S.result = j; break; }
    }
    S.riseMap = null;
    if (S.result.rise_map) {
      const m = await raster('GET', '/api/job/map?' + q({ id: job }));
      m.img = colourise(m.data, m.w, m.h, Math.min(0, m.min), m.max);
      S.riseMap = m;
    }
    $('analyse-status').textContent = 'done: results in ' + S.result.output;
    const a = $('report-link'); a.href = '/api/job/report?' + q({ id: job }); a.hidden = false;
    // off loopback a plain link would lack the access token: fetch the report with it and open a copy
    a.onclick = S.token ? async (ev) => {
      ev.preventDefault();
      try {
        const res = await api('GET', a.getAttribute('href'), undefined, true);
        window.open(URL.createObjectURL(new Blob([await res.text()], { type: 'text/html' })), '_blank', 'noopener');
      } catch (e) { show(e.message); }
    } : null;
    drawResults();
  } catch (e) {
    $('analyse-status').textContent = 'failed: ' + e.message; show(e.message);
  } finally { btn.disabled = false; pr.hidden = true; }
}

function verdictInto(prefix, box, v) {
  $(box).dataset.status = v.status;
  $(prefix + '-status').textContent = v.status;
  $(prefix + '-ref').textContent = v.ref || '';
  $(prefix + '-reason').textContent = v.reason || '';
}

function drawResults() {
  const r = S.result; if (!r || S.tab !== 'analyse') return;
  const doc = r.analysis;
  verdictInto('verdict', 'verdict', doc.verdict);
  $('verdict-mode').textContent = doc.mode === 'lock-in'
    ? 'Lock-in analysis (periodic injection in series.json); the table ranks the same frames by their steady rise.'
    : 'Steady analysis: parts ranked by their initial rate of rise.';
  const tb = $('ranking').tBodies[0]; tb.innerHTML = '';
  for (const p of doc.parts || []) {
    const tr = tb.insertRow(); if (doc.verdict.ref === p.ref) tr.className = 'leader';
    tr.dataset.ref = p.ref;
    const cells = [p.rank, p.ref, p.rate_k_per_s === null || p.rate_k_per_s === undefined ? '\u2013' : sig(p.rate_k_per_s, 3) + ' \u00b1 ' + sig(p.rate_se, 2),
      fmt(p.rise_k, 2), fmt(p.onset_s, 1), fmt(p.noise_k, 3), (p.warnings || []).join('; ')];
    for (const c of cells) tr.insertCell().textContent = c;
  }
  drawRiseMap(); drawCurves();
}

function drawRiseMap() {
  const c = $('rise-canvas'), ctx = c.getContext('2d'), W = c.width, H = c.height;
  ctx.setTransform(1, 0, 0, 1, 0, 0); ctx.fillStyle = '#23262b'; ctx.fillRect(0, 0, W, H);
  const m = S.riseMap, board = S.result.board; if (!m || !board) return;
  const bw = board.size_mm[0], bh = board.size_mm[1], sw = 64;
  const k = Math.min((W - sw - 20) / bw, (H - 20) / bh), ox = 10, oy = (H - bh * k) / 2;
  ctx.imageSmoothingEnabled = true;
  ctx.drawImage(m.img, ox, oy, bw * k, bh * k);
  const saved = S.partsForDrawing; S.partsForDrawing = () => board.parts || [];
  drawPartsOn(ctx, (x, y) => [ox + x * k, oy + y * k], (board.parts || []).findIndex((p) => p.ref === S.result.analysis.verdict.ref));
  S.partsForDrawing = saved;
  // scale
  const x = W - sw + 4, top = 16, bot = H - 16, pal = S.palette, lo = Math.min(0, m.min), hi = m.max;
  for (let y = top; y <= bot; y++) {
    const rgb = pal[Math.round((bot - y) / (bot - top) * (pal.length - 1))];
    ctx.fillStyle = '#' + rgb.toString(16).padStart(6, '0'); ctx.fillRect(x, y, 14, 1.5);
  }
  ctx.fillStyle = '#eef0f3'; ctx.font = '12px system-ui, sans-serif'; ctx.textAlign = 'left'; ctx.textBaseline = 'middle';
  const ticks = niceTicks(lo, hi, 5);
  for (const t of ticks) { const y = bot - (t - lo) / ((hi - lo) || 1) * (bot - top); ctx.fillText(t.toFixed(stepDecimals(ticks)), x + 18, y); }
  ctx.fillText('K', x, 7);
}

const SERIES_COLOURS = ['#d62728', '#1f63b4', '#2a9d3a', '#9b4fc2', '#b86e00'];

function drawCurves() {
  const c = $('curve-canvas'), ctx = c.getContext('2d'), W = c.width, H = c.height;
  ctx.setTransform(1, 0, 0, 1, 0, 0); ctx.fillStyle = '#fff'; ctx.fillRect(0, 0, W, H);
  const curves = (S.result.curves || []).slice(0, 5); if (!curves.length) return;
  let t0 = Infinity, t1 = -Infinity, y0 = 0, y1 = 0;
  for (const cv of curves) cv.t_s.forEach((t, n) => {
    t0 = Math.min(t0, t); t1 = Math.max(t1, t);
    for (const v of [cv.rise_k[n], cv.fit_k[n]]) if (v !== null) { y0 = Math.min(y0, v); y1 = Math.max(y1, v); }
  });
  if (!(t1 > t0)) t1 = t0 + 1; if (!(y1 > y0)) y1 = y0 + 1;
  const L = 52, R = 90, T = 14, B = 38, px = (t) => L + (t - t0) / (t1 - t0) * (W - L - R), py = (v) => H - B - (v - y0) / (y1 - y0) * (H - T - B);
  ctx.strokeStyle = '#9aa3ae'; ctx.lineWidth = 1; ctx.fillStyle = '#15181c'; ctx.font = '12px system-ui, sans-serif';
  ctx.textAlign = 'right'; ctx.textBaseline = 'middle';
  for (const v of niceTicks(y0, y1, 5)) { ctx.beginPath(); ctx.moveTo(L, py(v)); ctx.lineTo(W - R, py(v)); ctx.strokeStyle = '#e3e6ea'; ctx.stroke(); ctx.fillText(v.toFixed(1), L - 6, py(v)); }
  ctx.textAlign = 'center'; ctx.textBaseline = 'top';
  for (const t of niceTicks(t0, t1, 6)) ctx.fillText(t.toFixed(0), px(t), H - B + 6);
  ctx.fillText('time, s', (L + W - R) / 2, H - 16);
  ctx.save(); ctx.translate(14, (T + H - B) / 2); ctx.rotate(-Math.PI / 2); ctx.fillText('rise above ambient, K', 0, -6); ctx.restore();
  ctx.strokeStyle = '#4a525c'; ctx.strokeRect(L, T, W - L - R, H - T - B);
  curves.forEach((cv, k) => {
    const col = SERIES_COLOURS[k % SERIES_COLOURS.length];
    ctx.fillStyle = col;
    cv.t_s.forEach((t, n) => { const v = cv.rise_k[n]; if (v !== null) ctx.fillRect(px(t) - 1.5, py(v) - 1.5, 3, 3); });
    ctx.strokeStyle = col; ctx.lineWidth = 2; ctx.setLineDash([6, 4]); ctx.beginPath(); let on = false;
    cv.t_s.forEach((t, n) => { const v = cv.fit_k[n]; if (v === null) { on = false; return; } if (on) ctx.lineTo(px(t), py(v)); else { ctx.moveTo(px(t), py(v)); on = true; } });
    ctx.stroke(); ctx.setLineDash([]);
    ctx.fillStyle = col; ctx.textAlign = 'left'; ctx.textBaseline = 'middle'; ctx.font = 'bold 13px system-ui, sans-serif';
    ctx.fillRect(W - R + 10, T + 10 + k * 20 - 2, 14, 4); ctx.fillText(cv.ref, W - R + 30, T + 10 + k * 20);
  });
}

// ------------------------------------------------------------------------------------------------ compare

async function compare() {
  if (!S.series) { show('open a series first'); return; }
  if (S.dirty) { show('the outline or parts changed since the last save: save board.json first (Ctrl+S)'); return; }
  const before = +$('compare-before').value, after = +$('compare-after').value;
  $('compare-btn').disabled = true; $('compare-info').textContent = 'comparing ...';
  try {
    const r = await api('POST', '/api/compare?' + seriesQuery(), { before, after });
    const doc = r.analysis;
    verdictInto('compare', 'compare-verdict', doc.verdict);
    const tb = $('compare-table').tBodies[0]; tb.innerHTML = '';
    const max = Math.max(1e-9, ...(doc.parts || []).map((p) => Math.abs(p.rise_k || 0)));
    for (const p of doc.parts || []) {
      const tr = tb.insertRow(); if (doc.verdict.ref === p.ref) tr.className = 'leader';
      tr.dataset.ref = p.ref;
      tr.insertCell().textContent = p.rank; tr.insertCell().textContent = p.ref;
      tr.insertCell().textContent = fmt(p.rise_k, 2); tr.insertCell().textContent = fmt(p.noise_k, 3);
      const bar = tr.insertCell(); const d = document.createElement('div');
      d.style.cssText = 'height:10px;background:#0a4f9e;width:' + Math.max(0, (p.rise_k || 0) / max * 160) + 'px';
      bar.append(d);
    }
    $('compare-info').textContent = r.after + ' against ' + r.before + '.';
  } catch (e) { $('compare-info').textContent = e.message; show(e.message); }
  finally { $('compare-btn').disabled = false; }
}

// ------------------------------------------------------------------------------------------------ archive

function wireArchive() {
  $('case-search-btn').onclick = searchCases;
  $('case-search').onkeydown = (e) => { if (e.key === 'Enter') { e.preventDefault(); searchCases(); } };
  $('case-status').onchange = searchCases;
  $('case-add-btn').onclick = addSeriesToCase;
}

async function searchCases() {
  try {
    const r = await api('GET', '/api/archive/cases?' + q({ text: $('case-search').value, status: $('case-status').value }));
    const tb = $('case-table').tBodies[0]; tb.innerHTML = '';
    for (const c of r.cases) {
      const tr = tb.insertRow(); tr.tabIndex = 0; tr.dataset.case = c.caseNumber;
      for (const v of [c.caseNumber, c.customerRef, c.device, c.fault, c.status, (c.openedAt || '').slice(0, 10)])
        tr.insertCell().textContent = v || '\u2013';
      tr.onclick = () => openCase(c.caseNumber);
      tr.onkeydown = (e) => { if (e.key === 'Enter') openCase(c.caseNumber); };
      if (c.caseNumber === S.caseNumber) tr.className = 'leader';
    }
    $('case-info').textContent = r.cases.length + ' case' + (r.cases.length === 1 ? '' : 's')
      + (r.cases.length >= r.limit ? ' (the first ' + r.limit + ')' : '') + '. Click one to open it.';
  } catch (e) { $('case-info').textContent = e.message; show(e.message); }
}

async function openCase(number) {
  try {
    const r = await api('GET', '/api/archive/case?' + q({ number }));
    S.caseNumber = number;
    for (const tr of $('case-table').tBodies[0].rows) tr.className = tr.dataset.case === number ? 'leader' : '';
    const c = r.case;
    $('case-title').textContent = 'Case ' + c.caseNumber + (c.device ? ' \u00b7 ' + c.device : '');
    $('case-summary').textContent = [c.customerRef && 'customer ref. ' + c.customerRef, c.serialNumber && 'serial ' + c.serialNumber,
      c.fault && 'fault: ' + c.fault, c.technician && 'technician ' + c.technician, 'status ' + c.status,
      r.custody_entries + ' custody log entries'].filter(Boolean).join(' \u00b7 ');
    const ts = $('case-series').tBodies[0]; ts.innerHTML = '';
    for (const s of r.series) {
      const tr = ts.insertRow();
      for (const v of [s.name, s.files, (s.added_at || '').replace('T', ' ').slice(0, 16), s.added_by])
        tr.insertCell().textContent = v;
    }
    const ta = $('case-analyses').tBodies[0]; ta.innerHTML = '';
    for (const a of r.analyses) {
      const tr = ta.insertRow();
      for (const v of [a.series, (a.analysed_at || '').replace('T', ' ').slice(0, 16), a.status, a.ref, a.headline || a.reason])
        tr.insertCell().textContent = v || '\u2013';
    }
    if (!r.analyses.length) {
      const cell = ta.insertRow().insertCell(); cell.colSpan = 5;
      cell.textContent = 'none yet: risetrace case analyse ' + number + ' <series> analyses an archived series';
    }
    $('case-detail').hidden = false;
    $('case-add-btn').disabled = !S.series;
    $('case-add-btn').textContent = S.series ? 'Add series \u201c' + S.series.name + '\u201d to case ' + number
      : 'Open a series first (step 1) to add it';
  } catch (e) { show(e.message); }
}

async function addSeriesToCase() {
  if (!S.series || !S.caseNumber) return;
  if (S.dirty) { show('the outline or parts changed since the last save: save board.json first (Ctrl+S)'); return; }
  $('case-add-btn').disabled = true; $('case-info').textContent = 'copying the frames into the archive ...';
  try {
    const r = await api('POST', '/api/archive/add-series', { case: S.caseNumber, root: S.series.root, path: S.series.path });
    $('case-info').textContent = (r.already_present ? 'already in the case, unchanged: ' : 'added: ') + r.series
      + ' (' + r.files + ' files)' + (r.warnings.length ? '; ' + r.warnings.join('; ') : '');
    await openCase(S.caseNumber);
  } catch (e) { $('case-info').textContent = e.message; show(e.message); }
  finally { $('case-add-btn').disabled = !S.series; }
}

window.addEventListener('DOMContentLoaded', start);
// marks are lost with the page: ask before leaving with unsaved ones
window.addEventListener('beforeunload', (ev) => { if (S.dirty) { ev.preventDefault(); ev.returnValue = ''; } });
