import { mkdir, writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import type { FastifyPluginAsyncZod } from 'fastify-type-provider-zod';
import { z } from 'zod';
import { VerifyError, diffRuns, parseCron, renderHtmlReport, verificationCsv, verificationJson } from '@keelson/verify';
import { FileRunHistory, SourceError, catalogueKey, loadCatalogue } from '@keelson/verify-io';
import type { Context } from '../context';
import { ApiError } from '../errors';
import { ProblemSchema } from '../schemas';
import { poolCompute } from './compute';
import { allowedFolder, allowedFolders } from './folders';
import { CatalogueRegistry, type CatalogueRecord } from './registry';
import { VerificationRunner } from './runner';

const Schedule = z.object({ cron: z.string().min(1).max(200), timezone: z.string().max(100).optional() }).nullable();
const Webhook = z.object({ url: z.url({ protocol: /^https?$/ }), secret: z.string().min(16).max(500) }).nullable();
const CatalogueId = z.object({ id: z.string().regex(/^cat_[0-9a-f]{12}$/) });
const RunId = z.object({ id: z.string().regex(/^[0-9]{8}T[0-9]{6}Z-[0-9a-f]{6}$/) });

const CatalogueView = z
  .object({
    id: z.string(),
    name: z.string(),
    kind: z.enum(['folder', 'upload']),
    folder: z.string().nullable().describe('The server folder (folder catalogues only).'),
    schedule: z.object({ cron: z.string(), timezone: z.string().optional() }).nullable(),
    nextRun: z.string().nullable(),
    running: z.boolean(),
    webhook: z.object({ url: z.string() }).nullable().describe('The secret is never shown again.'),
    createdAt: z.string(),
    links: z.object({ self: z.string(), runs: z.string() }),
  })
  .meta({ id: 'Catalogue' });

const RunEntryView = z.object({ id: z.string(), startedAt: z.string(), summary: z.record(z.string(), z.number()), links: z.object({ report: z.string(), diff: z.string() }) });

/** Refusals of bad catalogues and manifests: the one line the command line prints, as a 422. */
function invalid(e: unknown): never {
  if (e instanceof SourceError || e instanceof VerifyError) throw new ApiError('INVALID_CATALOGUE', e.message, { reason: e.code });
  throw e as Error;
}

/**
 * Catalogue verification over HTTP: register a catalogue (a server folder an admin allowed, or an
 * uploaded ZIP with its manifest), set its cron schedule and webhook, start runs, list them, fetch a
 * run's report (HTML, CSV, JSON) and the diff between two runs, and the webhook delivery log.
 * Catalogues belong to the tenant that registered them.
 */
export function verificationRoutes(ctx: Context): FastifyPluginAsyncZod {
  return async (app) => {
    const dir = join(ctx.cfg.dataDir, 'verify');
    const registry = new CatalogueRegistry(dir);
    await registry.load();
    const history = new FileRunHistory(ctx.cfg.dataDir);
    const folders = allowedFolders();
    let baseUrl: string | undefined;
    const runner = new VerificationRunner({ registry, history, compute: poolCompute(ctx.pool, ctx.cfg.maxUploadBytes), log: app.log, baseUrl: () => baseUrl });
    app.addHook('onReady', async () => runner.startSchedules());
    app.addHook('onListen', async () => {
      const a = app.server.address();
      if (a && typeof a === 'object') baseUrl = `http://${a.family === 'IPv6' ? `[${a.address}]` : a.address}:${a.port}`;
    });
    app.addHook('preClose', async () => runner.stop());

    const view = (c: CatalogueRecord): z.infer<typeof CatalogueView> => ({
      id: c.id,
      name: c.name,
      kind: c.kind,
      folder: c.kind === 'folder' ? c.path : null,
      schedule: c.schedule,
      nextRun: runner.nextRun(c.id)?.toISOString() ?? null,
      running: runner.isRunning(c.id),
      webhook: c.webhook ? { url: c.webhook.url } : null,
      createdAt: c.createdAt,
      links: { self: `/v1/catalogues/${c.id}`, runs: `/v1/catalogues/${c.id}/runs` },
    });
    const catalogueOf = (tenant: string, id: string) => {
      const c = registry.get(tenant, id);
      if (!c) throw new ApiError('CATALOGUE_NOT_FOUND', `no catalogue ${id}`);
      return c;
    };
    const checkSchedule = (s: z.infer<typeof Schedule> | undefined) => {
      if (!s) return;
      try {
        parseCron(s.cron, s.timezone);
      } catch (e) {
        throw new ApiError('BAD_REQUEST', (e as Error).message, { errors: [{ field: 'schedule.cron', message: (e as Error).message }] });
      }
    };
    /** A run the tenant may see: one of its catalogues' histories. */
    const runOf = async (tenant: string, id: string) => {
      const missing = (e: unknown) => {
        if (e instanceof SourceError) throw new ApiError('RUN_NOT_FOUND', `no run ${id}`);
        throw e as Error;
      };
      const key = await history.keyOf(id).catch(missing);
      if (!registry.list(tenant).some((c) => c.historyKey === key)) throw new ApiError('RUN_NOT_FOUND', `no run ${id}`);
      return history.load(id).catch(missing);
    };
    const register = async (tenant: string, c: Omit<CatalogueRecord, 'tenant' | 'createdAt'>) => {
      const record: CatalogueRecord = { ...c, tenant, createdAt: new Date().toISOString() };
      await registry.put(record);
      await runner.schedule(record);
      return view(record);
    };

    app.post(
      '/v1/catalogues',
      {
        schema: {
          tags: ['verification'],
          summary: 'Register a server folder as a catalogue (an admin allows folders with KEELSON_CATALOGUE_FOLDERS)',
          body: z.object({ name: z.string().min(1).max(200), folder: z.string().min(1).max(4096), schedule: Schedule.optional(), webhook: Webhook.optional() }).strict(),
          response: { 201: CatalogueView, '4XX': ProblemSchema },
        },
      },
      async (req, reply) => {
        const folder = await allowedFolder(req.body.folder, folders);
        if (!folder) throw new ApiError('FOLDER_NOT_ALLOWED', `${req.body.folder} is not inside a folder the administrator allowed (KEELSON_CATALOGUE_FOLDERS)`);
        checkSchedule(req.body.schedule);
        await loadCatalogue(folder).catch(invalid);
        const id = CatalogueRegistry.newId();
        const v = await register(req.tenant, { id, name: req.body.name, kind: 'folder', path: folder, historyKey: catalogueKey(folder), schedule: req.body.schedule ?? null, webhook: req.body.webhook ?? null });
        return reply.code(201).header('location', v.links.self).send(v);
      },
    );

    app.post(
      '/v1/catalogues/uploads',
      {
        schema: {
          tags: ['verification'],
          summary: 'Register an uploaded ZIP catalogue (drawings and manifest.csv or manifest.json inside)',
          description: 'multipart/form-data: `file` (the ZIP), `name`; optional `cron`, `timezone`, `webhookUrl`, `webhookSecret`.',
          consumes: ['multipart/form-data'],
          response: { 201: CatalogueView, '4XX': ProblemSchema },
        },
      },
      async (req, reply) => {
        if (!req.isMultipart()) throw new ApiError('MALFORMED_UPLOAD', 'send the catalogue as multipart/form-data, the ZIP in the field "file"');
        const fields: Record<string, string> = {};
        let bytes: Buffer | null = null;
        try {
          for await (const part of req.parts({ limits: { fileSize: ctx.cfg.maxUploadBytes, files: 1, fields: 8, fieldSize: 1024 } })) {
            if (part.type === 'file') bytes = part.fieldname === 'file' ? await part.toBuffer() : (part.file.resume(), bytes);
            else if (typeof part.value === 'string') fields[part.fieldname] = part.value;
          }
        } catch (e) {
          if ((e as { code?: string }).code === 'FST_REQ_FILE_TOO_LARGE') throw new ApiError('UPLOAD_TOO_LARGE');
          throw new ApiError('MALFORMED_UPLOAD', (e as Error).message);
        }
        if (!bytes?.length) throw new ApiError('EMPTY_UPLOAD', 'no ZIP in the field "file"');
        const f = z
          .object({ name: z.string().min(1).max(200), cron: z.string().max(200).optional(), timezone: z.string().max(100).optional(), webhookUrl: z.url({ protocol: /^https?$/ }).optional(), webhookSecret: z.string().min(16).max(500).optional() })
          .strict()
          .safeParse(fields);
        if (!f.success) throw new ApiError('BAD_REQUEST', 'invalid form fields', { errors: f.error.issues.map((i) => ({ field: i.path.join('.'), message: i.message })) });
        if (!!f.data.webhookUrl !== !!f.data.webhookSecret) throw new ApiError('BAD_REQUEST', 'webhookUrl and webhookSecret go together');
        const schedule = f.data.cron ? { cron: f.data.cron, timezone: f.data.timezone } : null;
        checkSchedule(schedule);
        const id = CatalogueRegistry.newId();
        // Stored before the answer, and read back as the runs will read it.
        const path = join(dir, 'uploads', `${id}.zip`);
        await mkdir(join(dir, 'uploads'), { recursive: true });
        await writeFile(path, bytes);
        await loadCatalogue(path).catch(invalid);
        const webhook = f.data.webhookUrl ? { url: f.data.webhookUrl, secret: f.data.webhookSecret! } : null;
        const v = await register(req.tenant, { id, name: f.data.name, kind: 'upload', path, historyKey: `upload-${id}`, schedule, webhook });
        return reply.code(201).header('location', v.links.self).send(v);
      },
    );

    app.get('/v1/catalogues', { schema: { tags: ['verification'], summary: "Your tenant's catalogues", response: { 200: z.object({ catalogues: z.array(CatalogueView) }) } } }, async (req) => ({
      catalogues: registry.list(req.tenant).map(view),
    }));

    app.get(
      '/v1/catalogues/:id',
      { schema: { tags: ['verification'], summary: 'A catalogue: schedule, next run, whether a run is going', params: CatalogueId, response: { 200: CatalogueView, '4XX': ProblemSchema } } },
      async (req) => view(catalogueOf(req.tenant, req.params.id)),
    );

    app.patch(
      '/v1/catalogues/:id',
      {
        schema: {
          tags: ['verification'],
          summary: 'Change the name, the cron schedule (null: none) or the webhook (null: none)',
          params: CatalogueId,
          body: z.object({ name: z.string().min(1).max(200).optional(), schedule: Schedule.optional(), webhook: Webhook.optional() }).strict(),
          response: { 200: CatalogueView, '4XX': ProblemSchema },
        },
      },
      async (req) => {
        const c = catalogueOf(req.tenant, req.params.id);
        checkSchedule(req.body.schedule);
        const next: CatalogueRecord = {
          ...c,
          name: req.body.name ?? c.name,
          schedule: req.body.schedule === undefined ? c.schedule : req.body.schedule,
          webhook: req.body.webhook === undefined ? c.webhook : req.body.webhook,
        };
        await registry.put(next);
        await runner.schedule(next);
        return view(next);
      },
    );

    app.post(
      '/v1/catalogues/:id/runs',
      {
        schema: {
          tags: ['verification'],
          summary: 'Start a verification run now (409 while one is going)',
          params: CatalogueId,
          response: { 202: z.object({ id: z.string(), status: z.literal('running'), links: z.object({ runs: z.string(), report: z.string() }) }), '4XX': ProblemSchema },
        },
      },
      async (req, reply) => {
        const c = catalogueOf(req.tenant, req.params.id);
        const id = runner.runNow(c);
        if (!id) throw new ApiError('RUN_IN_PROGRESS', `a run of ${c.id} is going; one at a time per catalogue`);
        return reply.code(202).send({ id, status: 'running' as const, links: { runs: `/v1/catalogues/${c.id}/runs`, report: `/v1/runs/${id}/report` } });
      },
    );

    app.get(
      '/v1/catalogues/:id/runs',
      { schema: { tags: ['verification'], summary: 'Finished runs of a catalogue, oldest first', params: CatalogueId, response: { 200: z.object({ running: z.boolean(), runs: z.array(RunEntryView) }), '4XX': ProblemSchema } } },
      async (req) => {
        const c = catalogueOf(req.tenant, req.params.id);
        const runs = await history.list(c.historyKey);
        return {
          running: runner.isRunning(c.id),
          runs: runs.map((r) => ({ id: r.id, startedAt: r.startedAt, summary: { ...r.summary }, links: { report: `/v1/runs/${r.id}/report`, diff: `/v1/runs/${r.id}/diff` } })),
        };
      },
    );

    app.get(
      '/v1/runs/:id',
      { schema: { tags: ['verification'], summary: 'A run as JSON: every value with its unit, and the check where published', params: RunId, response: { '4XX': ProblemSchema } } },
      async (req, reply) => reply.type('application/json').send(verificationJson(await runOf(req.tenant, req.params.id)) as never),
    );

    app.get(
      '/v1/runs/:id/report',
      {
        schema: {
          tags: ['verification'],
          summary: 'The run\'s report: HTML (default), CSV (stable columns, units in the header) or JSON',
          params: RunId,
          querystring: z.object({ format: z.enum(['html', 'csv', 'json']).default('html'), units: z.enum(['mm', 'cm', 'm', 'in']).default('mm').describe('CSV only: unit of all columns.') }),
          response: { '4XX': ProblemSchema },
        },
      },
      async (req, reply) => {
        const run = await runOf(req.tenant, req.params.id);
        if (req.query.format === 'csv') return reply.type('text/csv; charset=utf-8').send(verificationCsv(run, req.query.units) as never);
        if (req.query.format === 'json') return reply.type('application/json').send(verificationJson(run) as never);
        const before = await history.previous(run.id);
        const diff = before && before.catalogue.name === run.catalogue.name ? diffRuns(before, run) : null;
        return reply.type('text/html; charset=utf-8').send(renderHtmlReport(run, { diff }) as never);
      },
    );

    app.get(
      '/v1/runs/:id/diff',
      {
        schema: {
          tags: ['verification'],
          summary: 'What changed since another run of the catalogue (default: the run before)',
          params: RunId,
          querystring: z.object({ against: RunId.shape.id.optional() }),
          response: { 200: z.record(z.string(), z.unknown()).describe('from, to, codeChanged, manifestChanged, added, removed, drawingsChanged, moved, newFailures, fixed'), '4XX': ProblemSchema },
        },
      },
      async (req) => {
        const run = await runOf(req.tenant, req.params.id);
        const before = req.query.against ? await runOf(req.tenant, req.query.against) : await history.previous(run.id);
        if (!before) throw new ApiError('RUN_NOT_FOUND', `${run.id} is the first run of its catalogue: nothing to compare with`);
        try {
          return { ...diffRuns(before, run) };
        } catch (e) {
          if (e instanceof VerifyError) throw new ApiError('BAD_REQUEST', e.message);
          throw e;
        }
      },
    );

    app.get(
      '/v1/runs/:id/deliveries',
      {
        schema: {
          tags: ['verification'],
          summary: 'Webhook delivery log of a run: every attempt, its status and outcome',
          params: RunId,
          response: { 200: z.object({ deliveries: z.array(z.record(z.string(), z.unknown())) }), '4XX': ProblemSchema },
        },
      },
      async (req) => {
        const run = await runOf(req.tenant, req.params.id);
        return { deliveries: (await history.deliveries(run.id)).map((a) => ({ ...a })) };
      },
    );
  };
}
