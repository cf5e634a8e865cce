/**
 * review.html: one self-contained page for a design review — the pictures inlined as data URLs, no
 * network, no external fonts, a strict Content Security Policy. A before/after slider over the frame
 * and the percept, switches for the detail map, reach, audience and side-by-side views, the label
 * table with verdicts and fixes, the fixations of a gaze list, the setup, viewer and models, and the
 * cautions. It prints to PDF with every view shown one after another.
 */

export interface ReviewImage {
  /** PNG bytes. */
  png: Uint8Array;
  width: number;
  height: number;
}

export interface ReviewLabelRow {
  id: string;
  text: string;
  role: string;
  verdict: string;
  limitedBy: string;
  margins: string;
  fix: string;
  audience: string;
}

export interface ReviewInput {
  title: string;
  caption: string;
  frame: ReviewImage;
  percept: ReviewImage;
  perceptTitle: string;
  detailMap: ReviewImage;
  reach: ReviewImage;
  audience: ReviewImage;
  compare: ReviewImage;
  labels?: ReviewLabelRow[];
  labelRule?: string;
  labelSummary?: string;
  fixations?: { given: string; gazePx: [number, number]; summary: string; jpeg?: Uint8Array }[];
  facts: [string, string][];
  models: { stage: string; name: string; source: string }[];
  cautions: readonly string[];
  generatedBy: string;
}

const esc = (s: string): string => s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;');
const dataUrl = (img: ReviewImage): string => `data:image/png;base64,${Buffer.from(img.png).toString('base64')}`;

/** The page's style: our own calm palette (dark ink on paper, one accent), readable printed. */
const STYLE = `
:root { --ink: #1d2126; --muted: #5b6470; --paper: #f7f6f2; --line: #d9dbd6; --accent: #0072b2; --fail: #b8326a; --ok: #1f7a4d; }
* { box-sizing: border-box; }
body { margin: 0; font: 15px/1.45 system-ui, -apple-system, "Segoe UI", Roboto, sans-serif; color: var(--ink); background: var(--paper); }
header, main, footer { max-width: 1280px; margin: 0 auto; padding: 0 20px; }
header { padding-top: 20px; }
h1 { font-size: 22px; margin: 0 0 4px; }
h2 { font-size: 17px; margin: 28px 0 8px; border-bottom: 1px solid var(--line); padding-bottom: 4px; }
.caption { color: var(--muted); margin: 0 0 12px; }
.caution { background: #fff4d6; border-left: 4px solid #e6a100; padding: 8px 12px; margin: 12px 0; }
nav.views { display: flex; gap: 6px; flex-wrap: wrap; margin: 12px 0; }
nav.views button { font: inherit; padding: 6px 12px; border: 1px solid var(--line); background: #fff; border-radius: 4px; cursor: pointer; }
nav.views button[aria-pressed="true"] { background: var(--accent); color: #fff; border-color: var(--accent); }
.view { display: none; }
.view.shown { display: block; }
.slider { position: relative; width: 100%; line-height: 0; user-select: none; }
.slider img { width: 100%; height: auto; display: block; }
.slider .after { position: absolute; inset: 0; clip-path: inset(0 0 0 50%); }
.slider .handle { position: absolute; top: 0; bottom: 0; left: 50%; width: 2px; background: #fff; box-shadow: 0 0 0 1px #000; pointer-events: none; }
.slider-labels { display: flex; justify-content: space-between; color: var(--muted); font-size: 13px; margin-top: 4px; }
input[type=range] { width: 100%; margin: 8px 0 0; }
figure { margin: 0; }
figure img { max-width: 100%; height: auto; display: block; border: 1px solid var(--line); }
figcaption { color: var(--muted); font-size: 13px; margin-top: 4px; }
table { border-collapse: collapse; width: 100%; font-size: 13px; }
th, td { text-align: left; vertical-align: top; padding: 5px 8px; border-bottom: 1px solid var(--line); }
th { background: #eceae4; position: sticky; top: 0; }
td.verdict-readable { color: var(--ok); font-weight: 600; }
td.verdict-readable::before { content: "✓ "; }
td.verdict-legible { color: #8a5a00; font-weight: 600; }
td.verdict-legible::before { content: "– "; }
td.verdict-not-legible { color: var(--fail); font-weight: 600; }
td.verdict-not-legible::before { content: "✗ "; }
dl.facts { display: grid; grid-template-columns: max-content 1fr; gap: 2px 16px; margin: 0; }
dl.facts dt { color: var(--muted); }
dl.facts dd { margin: 0; }
footer { color: var(--muted); font-size: 12px; padding: 24px 20px 40px; }
@media print {
  body { background: #fff; font-size: 11px; }
  nav.views, input[type=range], .slider .handle, .slider-labels { display: none; }
  .view { display: block !important; break-inside: avoid; margin-bottom: 16px; }
  figure.fixation { display: block !important; }
  .slider .after { position: static; clip-path: none; margin-top: 8px; }
  th { position: static; }
}
`;

const SCRIPT = `
(function () {
  var range = document.getElementById('slider-range');
  var after = document.getElementById('slider-after');
  var handle = document.getElementById('slider-handle');
  function set(v) { after.style.clipPath = 'inset(0 0 0 ' + v + '%)'; handle.style.left = v + '%'; }
  range.addEventListener('input', function () { set(range.value); });
  set(range.value);
  var steps = document.querySelectorAll('button.fix');
  steps.forEach(function (b) {
    b.addEventListener('click', function () {
      steps.forEach(function (o) { o.setAttribute('aria-pressed', String(o === b)); });
      document.querySelectorAll('figure.fixation').forEach(function (f) { f.hidden = f.id !== 'fixation-' + b.dataset.fix; });
    });
  });
  var buttons = document.querySelectorAll('nav.views button:not(.fix)');
  buttons.forEach(function (b) {
    b.addEventListener('click', function () {
      buttons.forEach(function (o) { o.setAttribute('aria-pressed', String(o === b)); });
      document.querySelectorAll('.view').forEach(function (v) { v.classList.toggle('shown', v.id === b.dataset.view); });
    });
  });
})();
`;

export function renderReviewPage(r: ReviewInput): string {
  const csp = "default-src 'none'; img-src data:; style-src 'unsafe-inline'; script-src 'unsafe-inline'; base-uri 'none'; form-action 'none'";
  const stepping = (r.fixations ?? []).filter((f) => f.jpeg);
  const views: [string, string][] = [['view-slider', 'Frame ⇄ percept'], ['view-detail', 'Detail map'], ['view-reach', 'Reach'], ['view-audience', 'Audience'], ['view-compare', 'Side by side'], ...(stepping.length > 1 ? [['view-fixations', `Fixations (${stepping.length})`] as [string, string]] : [])];
  const labelTable = r.labels?.length ? `
<h2>Labels</h2>
<p>${esc(r.labelSummary ?? '')}</p>
<table id="labels">
<thead><tr><th>label</th><th>text</th><th>role</th><th>verdict</th><th>limited by</th><th>margins</th><th>what would fix it</th><th>audience reading it</th></tr></thead>
<tbody>
${r.labels.map((l) => `<tr data-id="${esc(l.id)}"><td>${esc(l.id)}</td><td>${esc(l.text)}</td><td>${esc(l.role)}</td><td class="verdict-${esc(l.verdict.replace(/\s+/g, '-'))}">${esc(l.verdict)}</td><td>${esc(l.limitedBy)}</td><td>${esc(l.margins)}</td><td>${esc(l.fix)}</td><td>${esc(l.audience)}</td></tr>`).join('\n')}
</tbody>
</table>
<p class="caption">${esc(r.labelRule ?? '')}</p>` : '<h2>Labels</h2><p>No labels were judged.</p>';
  const fixations = r.fixations && r.fixations.length > 1 ? `
<h2>Fixations</h2>
<table id="fixations"><thead><tr><th>gaze</th><th>frame px</th><th>labels</th></tr></thead><tbody>
${r.fixations.map((f) => `<tr><td>${esc(f.given)}</td><td>${f.gazePx.join(', ')}</td><td>${esc(f.summary)}</td></tr>`).join('\n')}
</tbody></table><p class="caption">The pictures show the first fixation.</p>` : '';
  return `<!doctype html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta http-equiv="Content-Security-Policy" content="${csp}">
<meta name="viewport" content="width=device-width, initial-scale=1">
<title>${esc(r.title)}</title>
<style>${STYLE}</style>
</head>
<body>
<header>
<h1>${esc(r.title)}</h1>
<p class="caption">${esc(r.caption)}</p>
<p class="caution">${esc(r.cautions[0] ?? '')} ${r.cautions.slice(1).map(esc).join(' ')}</p>
</header>
<main>
<nav class="views" aria-label="views">
${views.map(([id, name], i) => `<button type="button" data-view="${id}" aria-pressed="${i === 0}">${esc(name)}</button>`).join('\n')}
</nav>
<section class="view shown" id="view-slider" aria-label="frame and percept">
<div class="slider">
<img src="${dataUrl(r.frame)}" width="${r.frame.width}" height="${r.frame.height}" alt="the frame as displayed">
<img class="after" id="slider-after" src="${dataUrl(r.percept)}" width="${r.percept.width}" height="${r.percept.height}" alt="${esc(r.perceptTitle)}">
<div class="handle" id="slider-handle"></div>
</div>
<input type="range" id="slider-range" min="0" max="100" value="50" aria-label="move the divide between frame and percept">
<div class="slider-labels"><span>← the frame as displayed</span><span>${esc(r.perceptTitle)} →</span></div>
</section>
<section class="view" id="view-detail" aria-label="detail map"><figure><img src="${dataUrl(r.detailMap)}" alt="detail map"><figcaption>Smallest legible capital height at every place, on a fixed scale in arcmin; label outlines show the verdicts.</figcaption></figure></section>
<section class="view" id="view-reach" aria-label="reach"><figure><img src="${dataUrl(r.reach)}" alt="reach of glance labels"><figcaption>Where the gaze can rest for each glance label to be read without moving the eyes.</figcaption></figure></section>
<section class="view" id="view-audience" aria-label="audience"><figure><img src="${dataUrl(r.audience)}" alt="audience share by capital height"><figcaption>Share of an audience that reads text when looking at it, by capital height.</figcaption></figure></section>
<section class="view" id="view-compare" aria-label="side by side"><figure><img src="${dataUrl(r.compare)}" alt="frame and percept side by side"><figcaption>Frame and percept side by side, with rings at 2, 5, 10, 20 and 30° from the gaze.</figcaption></figure></section>
${stepping.length > 1 ? `<section class="view" id="view-fixations" aria-label="fixations">
<p class="caption">The percept with the gaze at each fixation of the list, in order (step with the buttons).</p>
<nav class="views" aria-label="fixations">${stepping.map((f, i) => `<button type="button" class="fix" data-fix="${i}" aria-pressed="${i === 0}">${esc(f.given)}</button>`).join('')}</nav>
${stepping.map((f, i) => `<figure class="fixation" id="fixation-${i}"${i ? ' hidden' : ''}><img src="data:image/jpeg;base64,${Buffer.from(f.jpeg!).toString('base64')}" alt="percept with the gaze at ${esc(f.given)}"><figcaption>gaze ${esc(f.given)} (${f.gazePx.join(', ')} px): ${esc(f.summary)}</figcaption></figure>`).join('\n')}
</section>` : ''}
${labelTable}
${fixations}
<h2>Setup and viewer</h2>
<dl class="facts">
${r.facts.map(([k, v]) => `<dt>${esc(k)}</dt><dd>${esc(v)}</dd>`).join('\n')}
</dl>
<h2>Models</h2>
<table id="models"><thead><tr><th>stage</th><th>model</th><th>source</th></tr></thead><tbody>
${r.models.map((m) => `<tr><td>${esc(m.stage)}</td><td>${esc(m.name)}</td><td>${esc(m.source)}</td></tr>`).join('\n')}
</tbody></table>
<h2>Cautions</h2>
<ul>${r.cautions.map((c) => `<li>${esc(c)}</li>`).join('')}</ul>
</main>
<footer>${esc(r.generatedBy)}</footer>
<script>${SCRIPT}</script>
</body>
</html>
`;
}
