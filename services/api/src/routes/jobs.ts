import type { FastifyPluginAsyncZod } from 'fastify-type-provider-zod';
import { z } from 'zod';
import type { OutputUnit } from '@keelson/geometry';
import type { Entry } from '../computer';
import type { Context } from '../context';
import { profilesCsv } from '../csv';
import { ApiError } from '../errors';
import { createJob } from '../jobs';
import { JobAccepted, JobIdParams, JobList, JobResults, JobSchema, ProblemSchema, wireEntries } from '../schemas';
import { settingsOf } from '../settings';
import type { ItemRecord, JobRecord } from '../store';
import { drawingsOf, readUpload } from '../uploads';

const iso = (t: number | null) => (t === null ? null : new Date(t).toISOString());
const links = (id: string) => ({ self: `/v1/jobs/${id}`, results: `/v1/jobs/${id}/results` });

function view(j: JobRecord, items?: readonly ItemRecord[]) {
  return {
    id: j.id,
    status: j.status,
    createdAt: iso(j.createdAt)!,
    finishedAt: iso(j.finishedAt),
    cancelledAt: iso(j.cancelledAt),
    upload: { name: j.upload.name, kind: j.upload.kind, bytes: j.upload.bytes, sha256: j.upload.sha256 },
    settings: j.settings,
    counts: j.counts,
    ...(items ? { errors: items.filter((i) => i.status === 'failed').map(errorOf) } : {}),
    links: links(j.id),
  };
}

const errorOf = (i: ItemRecord) => ({ index: i.idx, name: i.name, source: i.source, code: i.error?.code ?? 'INTERNAL', message: i.error?.message ?? '' });

/** Cursor of the page after `j`: opaque to clients. */
const cursorOf = (j: JobRecord) => Buffer.from(JSON.stringify([j.createdAt, j.id])).toString('base64url');
function parseCursor(c: string): { createdAt: number; id: string } {
  try {
    const [createdAt, id] = JSON.parse(Buffer.from(c, 'base64url').toString()) as [unknown, unknown];
    if (typeof createdAt === 'number' && typeof id === 'string') return { createdAt, id };
  } catch {
    // fall through
  }
  throw new ApiError('BAD_REQUEST', 'invalid cursor', { errors: [{ field: 'cursor', message: 'not a cursor this service gave' }] });
}

/** Prefers CSV when `Accept` names text/csv before (or without) JSON; 406 when it allows neither. */
function wantsCsv(accept: string | undefined): boolean {
  if (!accept) return false;
  const ranges = accept
    .split(',')
    .map((r, i) => {
      const [type, ...params] = r.trim().toLowerCase().split(';');
      const q = params.map((p) => /^\s*q=([\d.]+)/.exec(p)?.[1]).find(Boolean);
      return { type: type!.trim(), q: q === undefined ? 1 : Number(q), i };
    })
    .filter((r) => r.q > 0)
    .sort((a, b) => b.q - a.q || a.i - b.i);
  for (const r of ranges) {
    if (r.type === 'text/csv') return true;
    if (['application/json', 'application/*', '*/*', 'application/problem+json'].includes(r.type)) return false;
  }
  throw new ApiError('NOT_ACCEPTABLE', 'results are application/json or text/csv');
}

/** The background jobs: create, look at, list, fetch results, cancel. */
export function jobRoutes(ctx: Context): FastifyPluginAsyncZod {
  return async (app) => {
    const notFound = (id: string) => new ApiError('JOB_NOT_FOUND', `no job ${id}`);

    app.post(
      '/v1/jobs',
      {
        schema: {
          tags: ['jobs'],
          summary: 'Start a job: a DXF or a ZIP catalogue, computed in the background',
          description:
            'multipart/form-data as for /v1/compute. The upload is stored before the answer: a 202 means the job survives a crash of the service.',
          response: { 202: JobAccepted, '4XX': ProblemSchema, '5XX': ProblemSchema },
        },
      },
      async (req, reply) => {
        const up = await readUpload(req, ctx.cfg);
        const { kind, drawings } = await drawingsOf(up, ctx.cfg);
        const id = await createJob(ctx, req.tenant, { name: up.filename, bytes: up.bytes, kind }, drawings, settingsOf(up.fields));
        req.log.info({ job: id, drawings: drawings.length }, 'job accepted');
        return reply.code(202).header('location', `/v1/jobs/${id}`).send({ id, status: 'queued', links: links(id) });
      },
    );

    app.get(
      '/v1/jobs',
      {
        schema: {
          tags: ['jobs'],
          summary: "List your tenant's jobs, newest first",
          querystring: z.object({ limit: z.coerce.number().int().min(1).max(100).default(20), cursor: z.string().max(200).optional() }),
          response: { 200: JobList, '4XX': ProblemSchema },
        },
      },
      async (req) => {
        const before = req.query.cursor ? parseCursor(req.query.cursor) : undefined;
        const jobs = await ctx.store.listJobs(req.tenant, { limit: req.query.limit, before });
        return { jobs: jobs.map((j) => view(j)), next: jobs.length === req.query.limit ? cursorOf(jobs.at(-1)!) : null };
      },
    );

    app.get(
      '/v1/jobs/:id',
      {
        schema: {
          tags: ['jobs'],
          summary: 'Status of a job: counts of drawings done, failed, pending, and each failure',
          params: JobIdParams,
          response: { 200: JobSchema, '4XX': ProblemSchema },
        },
      },
      async (req) => {
        const job = await ctx.store.getJob(req.tenant, req.params.id);
        if (!job) throw notFound(req.params.id);
        return view(job, job.counts.failed ? await ctx.store.listItems(req.tenant, job.id, { status: 'failed' }) : []);
      },
    );

    app.get(
      '/v1/jobs/:id/results',
      {
        schema: {
          tags: ['jobs'],
          summary: 'Profiles computed so far, as JSON or, with Accept: text/csv, as CSV with the unit in every header',
          params: JobIdParams,
          querystring: z.object({ units: z.enum(['mm', 'cm', 'm', 'in']).optional().describe('CSV only: unit of all rows (default: the first profile\'s).') }),
          response: {
            200: JobResults.describe('JSON; or text/csv: name,source,units,A [mm²],… one row per profile'),
            '4XX': ProblemSchema,
          },
        },
      },
      async (req, reply) => {
        const csv = wantsCsv(req.headers.accept);
        const job = await ctx.store.getJob(req.tenant, req.params.id);
        if (!job) throw notFound(req.params.id);
        const items = await ctx.store.listItems(req.tenant, job.id);
        const entries = items.flatMap((i): Entry[] =>
          i.status === 'done' && i.result && 'profiles' in i.result
            ? (i.result.profiles as Entry[])
            : i.status === 'failed'
              ? [{ name: i.name, source: i.source, error: i.error ?? { code: 'INTERNAL', message: '' } }]
              : [],
        );
        if (csv) {
          // As the CLI's --csv: profiles only; failed drawings are listed by GET /v1/jobs/{id}.
          const profiles = entries.filter((e): e is Exclude<Entry, { error: unknown }> => !('error' in e));
          const units = (req.query.units ?? (job.settings.units as OutputUnit | undefined) ?? profiles[0]?.units ?? 'mm') as OutputUnit;
          return reply
            .type('text/csv; charset=utf-8')
            .header('content-disposition', `attachment; filename="keelson-${job.id}.csv"`)
            .header('x-keelson-units', units)
            .serializer((s: unknown) => s as string)
            .send(profilesCsv(profiles, units) as never);
        }
        return { id: job.id, status: job.status, counts: job.counts, profiles: wireEntries(entries) };
      },
    );

    app.delete(
      '/v1/jobs/:id',
      {
        schema: {
          tags: ['jobs'],
          summary: 'Cancel a job: drawings not yet computed are dropped, those computed are kept',
          params: JobIdParams,
          response: { 200: JobSchema, '4XX': ProblemSchema },
        },
      },
      async (req) => {
        const job = await ctx.store.cancelJob(req.tenant, req.params.id, Date.now());
        if (!job) throw notFound(req.params.id);
        ctx.queue.cancel(job.id);
        ctx.metrics.jobsCancelled.inc();
        req.log.info({ job: job.id }, 'job cancelled');
        return view(job);
      },
    );
  };
}
