import type { FastifyInstance } from 'fastify';
import { DRAWING_CODES, ERRORS } from '../errors';

const esc = (s: string) => s.replace(/[&<>"]/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;' })[c]!);
const md = (s: string) => esc(s).replace(/`([^`]+)`/g, '<code>$1</code>');

const upload = (summary: string) => ({
  required: true,
  content: {
    'multipart/form-data': {
      schema: {
        type: 'object',
        required: ['file'],
        properties: {
          file: { type: 'string', format: 'binary', description: 'An ASCII DXF drawing, or a ZIP archive of them.' },
          units: { type: 'string', enum: ['mm', 'cm', 'm', 'in'], description: "Unit of the results (default: the drawing's own; feet report in inches)." },
          drawingUnits: { type: 'string', enum: ['mm', 'cm', 'm', 'in', 'ft'], description: 'Unit of drawings whose $INSUNITS is missing or 0.' },
          split: { type: 'string', enum: ['none', 'blocks', 'layers', 'islands'], description: 'How each drawing becomes profiles (default none: one profile a drawing), as --split.' },
          layers: { type: 'string', description: 'Layer name patterns to read, comma-separated (`*`, `?`), as --layers.' },
          excludeLayers: { type: 'string', description: 'Layer name patterns to leave out, as --exclude-layers.' },
          hiddenLayers: { type: 'string', enum: ['true', 'false'], description: 'Read frozen and switched-off layers too.' },
          joinTolerance: { type: 'number', description: 'Segment ends closer than this join, in drawing units.' },
          torsion: { type: 'string', enum: ['true', 'false'], description: 'Compute J, Cw and the shear centre (default true).' },
          accuracy: { type: 'number', description: 'Relative error wanted on J, (0, 0.1] (default 1e-3).' },
        },
      },
      encoding: { file: { contentType: 'application/dxf, application/zip, application/octet-stream' } },
    },
  },
  description: summary,
});

/**
 * The OpenAPI document: route schemas from zod, plus what they cannot say: the multipart upload
 * bodies (streamed, validated by hand), the bearer scheme and the error catalogue.
 */
export function openApiDocument(app: FastifyInstance): Record<string, unknown> {
  const doc = structuredClone(app.swagger()) as unknown as { paths: Record<string, Record<string, Record<string, unknown>>> } & Record<string, unknown>;
  doc.paths['/v1/compute']!.post!.requestBody = upload('The drawing (or a ZIP of at most the compute limit of drawings) and options.');
  doc.paths['/v1/jobs']!.post!.requestBody = upload('The catalogue (ZIP) or drawing, and options applying to every drawing.');
  for (const p of ['/healthz', '/readyz', '/metrics', '/openapi.json']) for (const op of Object.values(doc.paths[p] ?? {})) op.security = [];
  return doc;
}

const ROUTES: readonly [string, string, string][] = [
  ['GET', '/healthz', 'liveness'],
  ['GET', '/readyz', 'readiness (store reachable, not shutting down)'],
  ['POST', '/v1/compute', 'multipart `file` (DXF or small ZIP) + optional `units`, `drawingUnits`, `split`, `layers`, `excludeLayers`, `hiddenLayers`, `joinTolerance`, `torsion`, `accuracy` → `{"profiles":[…]}`'],
  ['POST', '/v1/jobs', 'same upload, computed in the background → `202 {"id"}`'],
  ['GET', '/v1/jobs', 'your jobs, newest first, `?limit=&cursor=`'],
  ['GET', '/v1/jobs/{id}', 'status and counts (done, failed, total…) and each failed drawing'],
  ['GET', '/v1/jobs/{id}/results', 'profiles as JSON, or CSV with `Accept: text/csv` (unit in every header; `?units=`)'],
  ['DELETE', '/v1/jobs/{id}', 'cancel'],
  ['GET', '/metrics', 'Prometheus metrics'],
  ['GET', '/openapi.json', 'OpenAPI 3 document'],
];

/** A small page: the routes, how to call them, and every error code with its meaning (anchors #CODE). */
export function docsPage(): string {
  const rows = ROUTES.map(([m, p, d]) => `<tr><td><code>${m}</code></td><td><code>${esc(p)}</code></td><td>${md(d)}</td></tr>`).join('\n');
  const api = Object.entries(ERRORS)
    .map(([code, e]) => `<tr id="${code}"><td><code>${code}</code></td><td>${e.status}</td><td>${esc(e.title)}</td><td>${md(e.doc)}</td></tr>`)
    .join('\n');
  const drawing = Object.entries(DRAWING_CODES)
    .map(([code, d]) => `<tr id="drawing-${code}"><td><code>${code}</code></td><td>${md(d)}</td></tr>`)
    .join('\n');
  return `<!doctype html>
<html lang="en"><head><meta charset="utf-8"><title>Keelson API</title>
<style>body{font:15px/1.5 system-ui,sans-serif;max-width:60rem;margin:2rem auto;padding:0 1rem;color:#222}
table{border-collapse:collapse;width:100%;margin:1rem 0}td,th{border-bottom:1px solid #ddd;padding:.3rem .5rem;text-align:left;vertical-align:top}
code{background:#f4f4f4;padding:0 .2rem}pre{background:#f4f4f4;padding:.8rem;overflow:auto}</style></head>
<body>
<h1>Keelson API</h1>
<p>DXF drawings of cross-section profiles in, exact section properties out. Machine-readable: <a href="/openapi.json">/openapi.json</a> (OpenAPI 3).</p>
<p>With API keys configured, send <code>Authorization: Bearer &lt;key&gt;</code>; each key belongs to a tenant, which sees only its own jobs.</p>
<pre>curl -F file=@profile.dxf -F units=mm http://127.0.0.1:8080/v1/compute
curl -F file=@catalogue.zip http://127.0.0.1:8080/v1/jobs
curl -H 'Accept: text/csv' http://127.0.0.1:8080/v1/jobs/&lt;id&gt;/results</pre>
<h2>Routes</h2>
<table><tr><th>Method</th><th>Path</th><th>What</th></tr>
${rows}
</table>
<h2 id="errors">Errors</h2>
<p>Every error is an RFC 9457 problem document (<code>application/problem+json</code>) with a stable <code>code</code>.</p>
<table><tr><th>code</th><th>status</th><th>title</th><th>meaning</th></tr>
${api}
</table>
<h2 id="drawing-codes">Faults of a drawing</h2>
<p>Per drawing in job results and ZIP answers (<code>code</code>), and as <code>drawingCode</code> of <code>UNPROCESSABLE_DRAWING</code>.</p>
<table><tr><th>code</th><th>meaning</th></tr>
${drawing}
</table>
<p><small>Computed geometric properties only; structural adequacy must be checked by a licensed engineer under local codes.</small></p>
</body></html>
`;
}
