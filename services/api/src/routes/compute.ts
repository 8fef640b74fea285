import type { FastifyPluginAsyncZod } from 'fastify-type-provider-zod';
import type { Context } from '../context';
import type { Entry } from '../computer';
import { ApiError } from '../errors';
import { PoolFullError } from '../pool/pool';
import { ComputeResponse, ProblemSchema, wireEntries } from '../schemas';
import { settingsOf } from '../settings';
import { drawingsOf, readUpload } from '../uploads';

/** A single drawing's fault as the problem to answer: 415 if it is not DXF after all, 422 otherwise, 500 for ours. */
function drawingProblem(e: { code: string; message: string }, internal?: boolean): ApiError {
  if (internal || e.code === 'INTERNAL') return new ApiError('INTERNAL', 'computing the drawing failed inside the service');
  if (e.code === 'NOT_DXF') return new ApiError('UNSUPPORTED_MEDIA_TYPE', e.message, { drawingCode: e.code });
  if (e.code === 'DRAWING_TIMEOUT' || e.code === 'DRAWING_MEMORY') return new ApiError(e.code, e.message);
  return new ApiError('UNPROCESSABLE_DRAWING', e.message, { drawingCode: e.code });
}

/** POST /v1/compute: a DXF or a small ZIP in, the CLI's JSON out, while the client waits. */
export function computeRoutes(ctx: Context): FastifyPluginAsyncZod {
  return async (app) => {
    app.post(
      '/v1/compute',
      {
        schema: {
          tags: ['compute'],
          summary: 'Compute the section properties of a DXF drawing or a small ZIP catalogue',
          description:
            'multipart/form-data with the drawing in `file` (DXF, or ZIP of DXF) and optional fields named as the CLI\'s options: `units`, `drawingUnits`, ' +
            '`split`, `layers`, `excludeLayers`, `hiddenLayers`, `joinTolerance`, `torsion`, `accuracy`. Answers with the command line\'s JSON. ' +
            'A repeated upload is answered from the store.',
          response: { 200: ComputeResponse, '4XX': ProblemSchema, '5XX': ProblemSchema },
        },
      },
      async (req) => {
        const up = await readUpload(req, ctx.cfg);
        const settings = settingsOf(up.fields);
        const { kind, drawings } = await drawingsOf(up, ctx.cfg, ctx.cfg.maxComputeDrawings);
        const results = await Promise.all(
          drawings.map(async (d) => {
            if ('error' in d) return { d, out: { error: d.error } };
            try {
              return { d, out: await ctx.computer.compute(req.tenant, d, settings, { path: 'compute' }) };
            } catch (e) {
              if (e instanceof PoolFullError) throw new ApiError('OVERLOADED', e.message, {}, { 'retry-after': '5' });
              throw e;
            }
          }),
        );
        const internal = (out: object) => 'internal' in out && out.internal === true;
        for (const { out } of results) if ('error' in out && internal(out)) req.log.error({ detail: out.error.message }, 'internal fault computing a drawing');
        if (kind === 'dxf') {
          const out = results[0]!.out;
          if ('error' in out) throw drawingProblem(out.error, internal(out));
          return { profiles: wireEntries(out.profiles) };
        }
        const entries: Entry[] = results.flatMap(({ d, out }) => ('profiles' in out ? out.profiles : [{ name: d.name, source: d.source, error: out.error }]));
        if (!entries.some((e) => !('error' in e))) {
          const first = entries.find((e) => 'error' in e) as { error: { message: string } } | undefined;
          throw new ApiError('UNPROCESSABLE_DRAWING', `${up.filename}: no drawing of the archive could be computed (first: ${first?.error.message ?? '—'})`, {
            profiles: entries,
          });
        }
        return { profiles: wireEntries(entries) };
      },
    );
  };
}
