/** The live preview's page: HTML, style and script, served from memory (no inline script, for a strict CSP). */

export const PREVIEW_HTML = `<!doctype html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<title>eyeproof live preview</title>
<link rel="stylesheet" href="/app.css">
<link rel="icon" href="data:,">
</head>
<body>
<header>
<h1>eyeproof live preview</h1>
<p class="caution" id="caution">Average-eye model from published population data — not a medical device or diagnosis.</p>
</header>
<main>
<aside>
<section id="open">
<label class="drop" id="drop">Open a frame: drop a PNG, JPEG or WebP here or <input type="file" id="file" accept="image/png,image/jpeg,image/webp"></label>
</section>
<section id="controls" aria-label="viewer and display">
<label>display <select id="display"></select></label>
<label>distance <input type="range" id="distance" min="200" max="3000" step="10" value="700"> <output id="distance-out">700 mm</output></label>
<label>age <input type="range" id="age" min="20" max="80" step="1" value="25"> <output id="age-out">25 y</output></label>
<label>refraction <input type="range" id="sphere" min="-6" max="4" step="0.25" value="0"> <output id="sphere-out">0.00 D</output></label>
<label>pupil <select id="pupil"><option value="auto">by light and age</option><option>2</option><option>3</option><option>4</option><option>5</option><option>6</option></select></label>
<label>light <select id="light"><option value="auto">from the frame</option><option value="1">1 cd/m² (dim)</option><option value="10">10 cd/m²</option><option value="100">100 cd/m²</option><option value="300">300 cd/m²</option></select></label>
</section>
<section id="status" aria-live="polite">Open a frame to begin.</section>
<section id="verdicts" aria-label="label verdicts"><h2>Labels</h2><ul id="verdict-list"></ul></section>
</aside>
<section id="stage" aria-label="percept">
<div id="view"><img id="percept" alt="what the viewer resolves"><div id="gaze-mark" hidden></div></div>
<p class="hint">Click or drag on the picture to move the gaze. The percept shows what this viewer resolves with the gaze held there.</p>
</section>
</main>
<script src="/app.js"></script>
</body>
</html>
`;

export const PREVIEW_CSS = `
:root { --ink: #1d2126; --muted: #5b6470; --paper: #f7f6f2; --line: #d9dbd6; --accent: #0072b2; --fail: #b8326a; --ok: #1f7a4d; }
* { box-sizing: border-box; }
body { margin: 0; font: 14px/1.4 system-ui, -apple-system, "Segoe UI", Roboto, sans-serif; color: var(--ink); background: var(--paper); }
header { padding: 10px 16px; border-bottom: 1px solid var(--line); }
h1 { font-size: 18px; margin: 0; }
h2 { font-size: 15px; margin: 12px 0 6px; }
.caution { color: var(--muted); margin: 2px 0 0; font-size: 12px; }
main { display: grid; grid-template-columns: 320px 1fr; gap: 16px; padding: 12px 16px; }
aside label { display: block; margin: 8px 0; }
aside input[type=range] { width: 160px; vertical-align: middle; }
.drop { border: 2px dashed var(--line); padding: 14px; border-radius: 6px; background: #fff; }
.drop.over { border-color: var(--accent); }
#status { color: var(--muted); margin: 10px 0; min-height: 2.8em; }
#verdict-list { list-style: none; padding: 0; margin: 0; max-height: 50vh; overflow: auto; font-size: 13px; }
#verdict-list li { padding: 3px 0; border-bottom: 1px solid var(--line); }
.v-readable { color: var(--ok); }
.v-legible { color: #8a5a00; }
.v-not-legible { color: var(--fail); }
#view { position: relative; display: inline-block; max-width: 100%; cursor: crosshair; touch-action: none; }
#percept { max-width: 100%; height: auto; display: block; background: #ddd; min-width: 320px; min-height: 180px; }
#gaze-mark { position: absolute; width: 22px; height: 22px; margin: -11px 0 0 -11px; border: 2px solid #fff; border-radius: 50%; box-shadow: 0 0 0 2px #000; pointer-events: none; }
.hint { color: var(--muted); font-size: 12px; }
`;

export const PREVIEW_JS = `
(function () {
  'use strict';
  var state = { frameId: null, width: 0, height: 0, gaze: null, inFlight: false, pending: false };
  var $ = function (id) { return document.getElementById(id); };
  var img = $('percept');
  var mark = $('gaze-mark');
  function settings() {
    return {
      frameId: state.frameId, gazePx: state.gaze, display: $('display').value, distanceMm: Number($('distance').value),
      ageYears: Number($('age').value), sphereD: Number($('sphere').value),
      pupilMm: $('pupil').value === 'auto' ? 'auto' : Number($('pupil').value),
      lightCdM2: $('light').value === 'auto' ? 'auto' : Number($('light').value)
    };
  }
  function status(text) { $('status').textContent = text; }
  function showVerdicts(labels) {
    var list = $('verdict-list');
    list.textContent = '';
    labels.forEach(function (l) {
      var li = document.createElement('li');
      li.className = 'v-' + l.verdict.replace(/\\s+/g, '-');
      li.dataset.id = l.id;
      li.dataset.verdict = l.verdict;
      var sign = l.verdict === 'readable' ? '✓ ' : l.verdict === 'legible' ? '– ' : '✗ ';
      li.textContent = sign + l.id + ' (' + l.letterHeightPx + ' px, ' + l.eccentricityDeg + '° from the gaze): ' + l.verdict + (l.verdict === 'readable' ? '' : ', limited by ' + l.limitedBy);
      if (l.fix) li.title = l.fix;
      list.appendChild(li);
    });
  }
  function placeMark() {
    if (!state.gaze) return;
    mark.hidden = false;
    mark.style.left = (100 * (state.gaze[0] + 0.5) / state.width) + '%';
    mark.style.top = (100 * (state.gaze[1] + 0.5) / state.height) + '%';
  }
  // One request in flight; a change while it runs is sent when it returns (the latest wins).
  function look() {
    if (!state.frameId) return;
    if (state.inFlight) { state.pending = true; return; }
    state.inFlight = true;
    fetch('/api/look', { method: 'POST', headers: { 'Content-Type': 'application/json' }, body: JSON.stringify(settings()) })
      .then(function (r) { return r.json().then(function (b) { if (!r.ok) throw new Error(b.error || r.statusText); return b; }); })
      .then(function (b) {
        img.src = b.percept;
        img.dataset.gaze = b.gazePx.join(',');
        showVerdicts(b.labels);
        status((b.prepared ? 'Prepared the viewer and looked' : 'Looked') + ' in ' + b.ms + ' ms · pupil ' + b.eye.pupilMm.toFixed(1) + ' mm, defocus ' + b.eye.defocusD.toFixed(2) + ' D, smallest letter at the gaze ' + b.eye.smallestLetterArcmin.toFixed(1) + '′');
        document.body.dataset.looks = String(Number(document.body.dataset.looks || 0) + 1);
      })
      .catch(function (e) { status('Could not update: ' + e.message); })
      .then(function () { state.inFlight = false; if (state.pending) { state.pending = false; look(); } });
  }
  function openFrame(file) {
    status('Opening ' + file.name + '…');
    fetch('/api/frame', { method: 'POST', headers: { 'Content-Type': 'application/octet-stream' }, body: file })
      .then(function (r) { return r.json().then(function (b) { if (!r.ok) throw new Error(b.error || r.statusText); return b; }); })
      .then(function (b) {
        state.frameId = b.frameId; state.width = b.width; state.height = b.height;
        state.gaze = [Math.floor(b.width / 2), Math.floor(b.height / 2)];
        img.width = b.width; img.height = b.height;
        placeMark();
        status('Opened ' + file.name + ' (' + b.fullSize.join('×') + (b.fullSize[0] !== b.width ? ', previewed at ' + b.width + '×' + b.height : '') + ', ' + b.labels + ' text runs found). Preparing…');
        look();
      })
      .catch(function (e) { status('Could not open the frame: ' + e.message); });
  }
  function gazeFrom(ev) {
    var r = img.getBoundingClientRect();
    var x = Math.round((ev.clientX - r.left) / r.width * state.width - 0.5);
    var y = Math.round((ev.clientY - r.top) / r.height * state.height - 0.5);
    state.gaze = [Math.max(0, Math.min(state.width - 1, x)), Math.max(0, Math.min(state.height - 1, y))];
    placeMark();
    look();
  }
  var dragging = false;
  $('view').addEventListener('pointerdown', function (ev) { if (!state.frameId) return; dragging = true; gazeFrom(ev); });
  $('view').addEventListener('pointermove', function (ev) { if (dragging) gazeFrom(ev); });
  window.addEventListener('pointerup', function () { dragging = false; });
  $('file').addEventListener('change', function () { if (this.files[0]) openFrame(this.files[0]); });
  var drop = $('drop');
  drop.addEventListener('dragover', function (ev) { ev.preventDefault(); drop.classList.add('over'); });
  drop.addEventListener('dragleave', function () { drop.classList.remove('over'); });
  drop.addEventListener('drop', function (ev) { ev.preventDefault(); drop.classList.remove('over'); if (ev.dataTransfer.files[0]) openFrame(ev.dataTransfer.files[0]); });
  [['distance', ' mm', 0], ['age', ' y', 0], ['sphere', ' D', 2]].forEach(function (c) {
    var input = $(c[0]);
    var out = $(c[0] + '-out');
    input.addEventListener('input', function () { out.textContent = Number(input.value).toFixed(c[2]) + c[1]; });
    input.addEventListener('change', look);
  });
  ['display', 'pupil', 'light'].forEach(function (id) { $(id).addEventListener('change', look); });
  fetch('/api/displays').then(function (r) { return r.json(); }).then(function (list) {
    var select = $('display');
    list.forEach(function (d) {
      var o = document.createElement('option');
      o.value = d.name; o.textContent = d.name + ' — ' + d.summary; o.dataset.distance = d.distanceMm || '';
      select.appendChild(o);
    });
    select.addEventListener('change', function () {
      var mm = select.selectedOptions[0].dataset.distance;
      $('distance').disabled = !mm;
      if (mm) { $('distance').value = mm; $('distance-out').textContent = mm + ' mm'; }
    });
    document.body.dataset.ready = 'true';
  });
})();
`;
