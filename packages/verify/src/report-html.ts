import { REPORT_CAUTION } from './caution';
import type { Check } from './check';
import type { RunDiff } from './diff';
import { escapeHtml as h } from './escape';
import { percent, significant } from './format';
import { KEY_LABEL, VERIFY_KEYS, keyUnit } from './keys';
import type { ProfileResult, ProfileStatus, RunRecord } from './run';
import { sectionSvg } from './section-svg';
import { formatTolerance } from './tolerance';


/** Failures first: a reader starts with what needs action. */
const ORDER: Record<ProfileStatus, number> = { error: 0, missing: 1, fail: 2, pass: 3 };
const STATUS_TEXT: Record<ProfileStatus, string> = { pass: 'PASS', fail: 'FAIL', error: 'ERROR', missing: 'MISSING' };

/** A number as a datasheet prints it, the power of ten as a superscript. */
function num(v: number | null | undefined, digits = 4): string {
  if (v === null || v === undefined) return '';
  const { mantissa, exponent } = significant(v, digits);
  return exponent ? `${mantissa}×10<sup>${exponent}</sup>` : mantissa;
}

const anchor = (id: string) => `p-${encodeURIComponent(id).replace(/%/g, '_')}`;

const STYLE = `
:root { --fail: #b00020; --pass: #1b5e20; --muted: #555; }
* { box-sizing: border-box; }
body { font: 14px/1.4 system-ui, -apple-system, "Segoe UI", Roboto, "DejaVu Sans", sans-serif; color: #111; margin: 0 auto; max-width: 1100px; padding: 24px; }
h1 { font-size: 22px; margin: 0 0 4px; } h2 { font-size: 17px; margin: 0; } h3 { font-size: 15px; margin: 18px 0 6px; }
.meta, .muted { color: var(--muted); }
.caution { border: 2px solid #333; padding: 8px 12px; font-weight: 600; margin: 12px 0; }
table { border-collapse: collapse; }
th, td { border: 1px solid #bbb; padding: 3px 7px; text-align: left; vertical-align: top; }
td.n { text-align: right; font-variant-numeric: tabular-nums; white-space: nowrap; }
.summary td.n { font-size: 18px; font-weight: 600; }
.badge { display: inline-block; padding: 1px 8px; border: 2px solid currentColor; border-radius: 3px; font-weight: 700; font-size: 12px; }
.status-pass .badge, .pass { color: var(--pass); }
.status-fail .badge, .status-error .badge, .status-missing .badge, .fail { color: var(--fail); }
tr.failed td { background: #fde7ea; font-weight: 600; }
article { border-top: 2px solid #333; padding: 14px 0 18px; }
.profile-body { display: flex; gap: 20px; align-items: flex-start; }
figure { margin: 0; flex: 0 0 280px; }
figcaption { font-size: 12px; color: var(--muted); }
svg.section { width: 280px; height: 280px; border: 1px solid #ccc; background: #fff; }
svg .outline { fill: #cfd8dc; stroke: #263238; stroke-width: 1.2px; }
svg .axis { stroke: #1565c0; stroke-width: 1px; }
svg .axis-2 { stroke-dasharray: 6 3; }
svg .axis-label { fill: #1565c0; font-family: sans-serif; }
svg .centroid { fill: none; stroke: #000; stroke-width: 1.5px; }
svg .shear-centre { fill: #e65100; stroke: #000; stroke-width: 1px; }
.props { font-size: 13px; }
.props td.k { font-family: ui-monospace, "DejaVu Sans Mono", monospace; }
.props tr.unchecked td { color: var(--muted); }
.fault { color: var(--fail); font-weight: 600; }
@media print {
  body { max-width: none; padding: 0; font-size: 10pt; }
  @page { size: A4; margin: 14mm; }
  .profile-body { gap: 4mm; }
  figure { flex: 0 0 42mm; }
  svg.section { width: 42mm; height: 42mm; }
  .props td, .props th { padding: 1px 4px; white-space: nowrap; }
  article { break-inside: avoid-page; }
  .props { font-size: 8.5pt; }
  tr.failed td { background: none; border-width: 2px; }
  a { color: inherit; text-decoration: none; }
}`;

function summaryTable(run: RunRecord): string {
  const s = run.summary;
  const cells: [string, number, string][] = [
    ['Profiles', s.profiles, ''],
    ['Pass', s.pass, 'pass'],
    ['Fail', s.fail, s.fail ? 'fail' : ''],
    ['Drawing errors', s.error, s.error ? 'fail' : ''],
    ['Missing drawings', s.missing, s.missing ? 'fail' : ''],
    ['Unlisted drawings', s.unlisted, ''],
    ['Values checked', s.checks, ''],
    ['Values outside tolerance', s.checksFailed, s.checksFailed ? 'fail' : ''],
  ];
  return `<table class="summary"><tr>${cells.map(([l]) => `<th>${l}</th>`).join('')}</tr><tr>${cells
    .map(([, n, c]) => `<td class="n ${c}">${n}</td>`)
    .join('')}</tr></table>`;
}

function failureList(profiles: readonly ProfileResult[]): string {
  const bad = profiles.filter((p) => p.status !== 'pass');
  if (!bad.length) return '<p class="pass"><strong>Every published value is within tolerance.</strong></p>';
  const items = bad.map((p) => {
    const what = p.fault ? h(p.fault.message) : p.checks.filter((c) => !c.pass).map((c) => `${h(c.key)} (${c.relative === null ? 'no value' : percent(c.relative)})`).join(', ');
    return `<li><a href="#${anchor(p.id)}"><strong>${h(p.id)}</strong></a> <span class="fail">${STATUS_TEXT[p.status]}</span>: ${what}</li>`;
  });
  return `<h3>Needs attention</h3><ul class="failures">${items.join('')}</ul>`;
}

function diffSection(d: RunDiff): string {
  const li = (xs: string[]) => (xs.length ? `<ul>${xs.join('')}</ul>` : '<p class="muted">none</p>');
  const moved = d.moved.map((m) => `<li>${h(m.id)} ${h(m.key)}: ${num(m.from)} → ${num(m.to)} ${h(m.unit)}${m.relative === null ? '' : ` (${percent(m.relative)})`}</li>`);
  const item = (f: { id: string; key: string | null; status: string }) => `<li>${h(f.id)}${f.key ? ` ${h(f.key)}` : ` (${h(f.status)})`}</li>`;
  return `<section class="diff"><h3>Since run ${h(d.from.id)}</h3>
<p>Profiles added: ${d.added.length}; removed: ${d.removed.length}; drawings changed: ${d.drawingsChanged.length}${d.codeChanged ? '; code version changed' : ''}${d.manifestChanged ? '; manifest changed' : ''}.</p>
<h4>Drawings changed</h4>${li(d.drawingsChanged.map((c) => `<li>${h(c.id)} (${h(c.drawing)})</li>`))}
<h4>Values moved beyond tolerance</h4>${li(moved)}
<h4>New failures</h4>${li(d.newFailures.map(item))}<h4>Fixed</h4>${li(d.fixed.map(item))}
${d.added.length ? `<h4>Added</h4>${li(d.added.map((a) => `<li>${h(a.id)}</li>`))}` : ''}${d.removed.length ? `<h4>Removed</h4>${li(d.removed.map((a) => `<li>${h(a.id)}</li>`))}` : ''}</section>`;
}

function propertyRows(p: ProfileResult): string {
  const checks = new Map<string, Check>(p.checks.map((c) => [c.key, c]));
  return VERIFY_KEYS.filter((k) => p.values[k] !== undefined || checks.has(k))
    .map((k) => {
      const c = checks.get(k);
      const cls = c ? (c.pass ? '' : ' class="failed"') : ' class="unchecked"';
      const result = c ? (c.pass ? '<span class="pass">pass</span>' : '<span class="fail">FAIL</span>') : '';
      // The relative difference is what a reader compares with the tolerance; the absolute one only when published is 0.
      const diff = !c || c.difference === null ? '' : c.relative === null ? num(c.difference, 2) : percent(c.relative);
      const unit = keyUnit(k, p.units);
      return `<tr${cls}><td>${h(KEY_LABEL[k])}</td><td class="k">${h(k)}</td><td>${h(unit)}</td><td class="n">${num(p.values[k])}</td><td class="n">${num(c?.published)}</td><td class="n">${diff}</td><td class="n">${c ? h(formatTolerance(c.tolerance, unit)) : ''}</td><td>${result}</td></tr>`;
    })
    .join('\n');
}

function profileArticle(p: ProfileResult, run: RunRecord): string {
  const material = run.materials[p.material];
  const title = `${p.id}${p.description ? `: ${p.description}` : ''}`;
  const meta = [
    `drawing <code>${h(p.drawing)}</code>`,
    p.revision ? `revision ${h(p.revision)}` : '',
    `material ${h(p.material)}${material ? ` (${material.density} kg/m³)` : ''}`,
    `units ${h(p.units)}`,
    p.drawingHash ? `SHA-256 <code>${p.drawingHash.slice(0, 12)}</code>` : '',
    p.reused ? 'values reused from the previous run (drawing unchanged)' : '',
  ].filter(Boolean);
  const body = p.fault
    ? `<p class="fault">${h(p.fault.code)}: ${h(p.fault.message)}</p>`
    : `<div class="profile-body"><figure>${sectionSvg(p, `Section of ${p.id}`)}<figcaption>Outline with holes; ⊕ centroid; ◆ shear centre; principal axes 1 (major, solid) and 2 (minor, dashed).</figcaption></figure>
<table class="props"><thead><tr><th>Property</th><th>Key</th><th>Unit</th><th>Computed</th><th>Published</th><th>Difference</th><th>Tolerance</th><th>Result</th></tr></thead><tbody>
${propertyRows(p)}</tbody></table></div>${p.warnings.map((w) => `<p class="muted">Note: ${h(w)}</p>`).join('')}`;
  return `<article id="${anchor(p.id)}" class="status-${p.status}"><h2><span class="badge">${STATUS_TEXT[p.status]}</span> ${h(title)}</h2>
<p class="meta">${meta.join(' · ')}</p>${body}</article>`;
}

/**
 * The run as one self-contained HTML page (no scripts, no external resources): summary counts, the
 * profiles needing attention, optionally the changes since a previous run, then every profile,
 * failures first, with its section picture and property table; the engineering caution at the top
 * and bottom. Styles make it print on A4 with one profile per block.
 */
export function renderHtmlReport(run: RunRecord, opts: { diff?: RunDiff | null } = {}): string {
  const ordered = run.profiles.map((p, i) => [p, i] as const).sort(([a, i], [b, j]) => ORDER[a.status] - ORDER[b.status] || i - j).map(([p]) => p);
  const unlisted = run.unlisted.length
    ? `<h3>Drawings without a manifest row</h3><ul>${run.unlisted.map((u) => `<li><code>${h(u.drawing)}</code></li>`).join('')}</ul>`
    : '';
  return `<!doctype html>
<html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width, initial-scale=1">
<title>Verification of ${h(run.catalogue.name)}, run ${h(run.id)}</title><style>${STYLE}</style></head>
<body>
<header><h1>Catalogue verification: ${h(run.catalogue.name)}</h1>
<p class="meta">Run ${h(run.id)} · started ${h(run.startedAt)} · finished ${h(run.finishedAt)} · code ${h(run.codeVersion)} · manifest <code>${h(run.manifest.source)}</code> (SHA-256 <code>${run.manifest.hash.slice(0, 12)}</code>) · catalogue <code>${h(run.catalogue.source)}</code></p>
<p class="caution">${REPORT_CAUTION}</p></header>
<section><h3>Summary</h3>${summaryTable(run)}${failureList(ordered)}${unlisted}</section>
${opts.diff ? diffSection(opts.diff) : ''}
<section class="profiles">${ordered.map((p) => profileArticle(p, run)).join('\n')}</section>
<footer><p class="caution">${REPORT_CAUTION}</p><p class="muted">Tolerances marked in the manifest apply as given; others are Keelson's documented defaults. The allowance adds the computation's own error bound.</p></footer>
</body></html>
`;
}
