import { randomUUID } from 'node:crypto';
import Fastify, { type FastifyError, type FastifyInstance, type FastifyReply, type FastifyRequest, type FastifyServerOptions } from 'fastify';
import multipart from '@fastify/multipart';
import rateLimit from '@fastify/rate-limit';
import swagger from '@fastify/swagger';
import { hasZodFastifySchemaValidationErrors, jsonSchemaTransform, serializerCompiler, validatorCompiler } from 'fastify-type-provider-zod';
import { KeyRing } from './auth';
import { Computer } from './computer';
import { DEFAULTS, type Config } from './config';
import type { Context } from './context';
import { ApiError, problemOf } from './errors';
import { createMetrics } from './metrics';
import { ComputePool } from './pool/pool';
import { LocalQueue } from './queue';
import { computeRoutes } from './routes/compute';
import { docsPage, openApiDocument } from './routes/docs';
import { healthRoutes } from './routes/health';
import { jobRoutes } from './routes/jobs';
import { verificationRoutes } from './verify/routes';
import { openStore, type Store } from './store';

export interface BuildOptions {
  /** Settings over the defaults (tests); the server passes `configFromEnv()`. */
  readonly config?: Partial<Config>;
  /** A store to use instead of opening one from the config; the caller closes it. */
  readonly store?: Store;
  readonly logger?: FastifyServerOptions['logger'];
  /** Start dispatching jobs on ready (default true). */
  readonly startQueue?: boolean;
}

declare module 'fastify' {
  interface FastifyInstance {
    keelson: Context;
  }
  interface FastifyContextConfig {
    /** Route answers without a key (health, metrics, docs). */
    public?: boolean;
  }
}

const REQUEST_ID = /^[A-Za-z0-9._:-]{1,100}$/;

/** Any error to the problem it is, from the catalogue; stack traces stay in the log. */
function toApiError(err: FastifyError): ApiError {
  if (err instanceof ApiError) return err;
  if (hasZodFastifySchemaValidationErrors(err))
    return new ApiError('BAD_REQUEST', 'invalid request', {
      errors: err.validation.map((v) => ({ field: `${err.validationContext ?? ''}${v.instancePath.replace(/\//g, '.')}`, message: v.message })),
    });
  switch (err.code) {
    case 'FST_ERR_CTP_INVALID_MEDIA_TYPE':
      return new ApiError('UNSUPPORTED_MEDIA_TYPE', 'send the drawing as multipart/form-data, in the field "file"');
    case 'FST_ERR_CTP_BODY_TOO_LARGE':
    case 'FST_REQ_FILE_TOO_LARGE':
      return new ApiError('UPLOAD_TOO_LARGE');
  }
  const status = err.statusCode ?? 500;
  if (status === 429) return new ApiError('RATE_LIMITED');
  if (status === 404) return new ApiError('NOT_FOUND');
  if (status >= 400 && status < 500) return new ApiError('BAD_REQUEST', err.message);
  return new ApiError('INTERNAL', 'an internal error occurred; the log has it under this request id');
}

function sendProblem(e: ApiError, req: FastifyRequest, reply: FastifyReply, ctx: Context): FastifyReply {
  ctx.metrics.errors.inc({ code: e.code });
  return reply
    .code(e.status)
    .headers(e.headers)
    .type('application/problem+json')
    .serializer((p: unknown) => JSON.stringify(p))
    .send(problemOf(e, req.id));
}

/**
 * The HTTP service: plugins, hooks and routes over a store, a pool of computation threads and the
 * job queue. Closing the app (SIGTERM in server.ts) stops accepting work, lets running drawings
 * finish within the grace period, hands the rest back to the queue, then closes threads and store.
 */
export async function build(opts: BuildOptions = {}): Promise<FastifyInstance> {
  const cfg: Config = { ...DEFAULTS, ...opts.config };
  const store = opts.store ?? (await openStore(cfg));
  const app = Fastify({
    logger: opts.logger ?? false,
    genReqId: (req) => {
      const given = req.headers['x-request-id'];
      return typeof given === 'string' && REQUEST_ID.test(given) ? given : randomUUID();
    },
    return503OnClosing: false,
    forceCloseConnections: 'idle',
  });
  app.setValidatorCompiler(validatorCompiler);
  app.setSerializerCompiler(serializerCompiler);

  const metrics = createMetrics();
  const pool = new ComputePool({ threads: cfg.workers, timeoutMs: cfg.drawingTimeoutMs, memoryMb: cfg.workerMemoryMb, maxWaiting: cfg.maxWaiting });
  const computer = new Computer(store, pool, metrics, cfg);
  const queue = new LocalQueue(store, pool, computer, metrics, cfg, app.log);
  const keys = new KeyRing(cfg.apiKeys);
  const ctx: Context = { cfg, store, pool, computer, queue, metrics, keys, state: { shuttingDown: false } };
  app.decorate('keelson', ctx);
  app.decorateRequest('tenant', '');

  app.setErrorHandler((err: FastifyError, req, reply) => {
    const e = toApiError(err);
    if (e.status >= 500) req.log.error({ err }, 'internal error');
    else req.log.info({ code: e.code, detail: e.message }, 'request refused');
    return sendProblem(e, req, reply, ctx);
  });
  app.setNotFoundHandler((req, reply) => sendProblem(new ApiError('NOT_FOUND', `no route ${req.method} ${req.url.split('?')[0]}`), req, reply, ctx));

  // Who is asking, before anything else (the rate limit counts per tenant); refused in preParsing,
  // after the rate limit has counted the attempt against the caller's address.
  const refusals = new WeakMap<FastifyRequest, ApiError>();
  app.addHook('onRequest', async (req, reply) => {
    reply.header('x-request-id', req.id);
    if (req.routeOptions.config?.public) return;
    if (ctx.state.shuttingDown) throw new ApiError('SHUTTING_DOWN', 'the service is shutting down', {}, { 'retry-after': '5', connection: 'close' });
    const t = keys.tenantOf(req.headers.authorization);
    if (t instanceof ApiError) refusals.set(req, t);
    else req.tenant = t;
  });
  app.addHook('preParsing', async (req) => {
    const refusal = refusals.get(req);
    if (refusal) throw refusal;
  });
  app.addHook('onResponse', async (req, reply) => {
    metrics.requestSeconds.observe({ method: req.method, route: req.routeOptions.url ?? 'none', status: String(reply.statusCode) }, reply.elapsedTime / 1000);
  });

  await app.register(rateLimit, {
    global: true,
    max: cfg.rateLimitPerMinute,
    timeWindow: 60_000,
    hook: 'onRequest',
    keyGenerator: (req) => (req.tenant ? `tenant:${req.tenant}` : `ip:${req.ip}`),
    errorResponseBuilder: (_req, c) =>
      new ApiError('RATE_LIMITED', `more than ${c.max} requests in ${c.after}; retry in ${Math.ceil(c.ttl / 1000)} s`, {}, { 'retry-after': String(Math.ceil(c.ttl / 1000)) }),
  });
  await app.register(multipart, {
    limits: { fileSize: cfg.maxUploadBytes, files: 1, fields: 16, fieldSize: 1024, parts: 17 },
    throwFileSizeLimit: true,
  });
  await app.register(swagger, {
    openapi: {
      openapi: '3.0.3',
      info: {
        title: 'Keelson API',
        version: '0.1.0',
        description: 'Section properties of cross-section profiles from DXF drawings. Errors are RFC 9457 problem documents with a stable `code` (see /docs).',
      },
      components: { securitySchemes: { bearer: { type: 'http', scheme: 'bearer', description: 'API key (KEELSON_API_KEYS), when configured' } } },
      security: [{ bearer: [] }],
    },
    transform: jsonSchemaTransform,
  });

  await app.register(healthRoutes(ctx));
  await app.register(computeRoutes(ctx));
  await app.register(jobRoutes(ctx));
  await app.register(verificationRoutes(ctx));
  app.get('/openapi.json', { config: { public: true, rateLimit: false }, schema: { hide: true } }, async () => openApiDocument(app));
  for (const path of ['/docs', '/docs/errors'])
    app.get(path, { config: { public: true, rateLimit: false }, schema: { hide: true } }, async (_req, reply) => reply.type('text/html; charset=utf-8').send(docsPage()));

  if (opts.startQueue !== false) app.addHook('onReady', async () => queue.start());
  app.addHook('preClose', async () => {
    ctx.state.shuttingDown = true;
  });
  app.addHook('onClose', async () => {
    ctx.state.shuttingDown = true;
    await queue.stop(cfg.shutdownGraceMs);
    await pool.close();
    if (!opts.store) await store.close();
  });
  return app;
}
