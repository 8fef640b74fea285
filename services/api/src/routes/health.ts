import type { FastifyPluginAsyncZod } from 'fastify-type-provider-zod';
import { z } from 'zod';
import type { Context } from '../context';
import { ApiError } from '../errors';
import { ProblemSchema } from '../schemas';

/** Liveness, readiness and Prometheus metrics: no key needed, no rate limit. */
export function healthRoutes(ctx: Context): FastifyPluginAsyncZod {
  return async (app) => {
    const open = { rateLimit: false as const, public: true };
    app.get(
      '/healthz',
      { config: open, schema: { tags: ['service'], summary: 'Liveness: the process answers', response: { 200: z.object({ status: z.literal('ok') }) } } },
      async () => ({ status: 'ok' as const }),
    );
    app.get(
      '/readyz',
      {
        config: open,
        schema: {
          tags: ['service'],
          summary: 'Readiness: the store answers and the service is not shutting down',
          response: { 200: z.object({ status: z.literal('ready'), store: z.string(), workers: z.number() }), 503: ProblemSchema },
        },
      },
      async () => {
        if (ctx.state.shuttingDown) throw new ApiError('SHUTTING_DOWN');
        try {
          await ctx.store.ping();
        } catch (e) {
          throw new ApiError('OVERLOADED', `the store does not answer: ${(e as Error).message}`);
        }
        return { status: 'ready' as const, store: ctx.store.kind, workers: ctx.pool.threads };
      },
    );
    app.get('/metrics', { config: open, schema: { tags: ['service'], summary: 'Prometheus metrics', hide: false } }, async (_req, reply) => {
      ctx.metrics.poolBusy.set(ctx.pool.busy);
      ctx.metrics.poolWaiting.set(ctx.pool.waiting);
      ctx.metrics.queuePending.set(await ctx.store.pendingCount().catch(() => NaN));
      return reply.type(ctx.metrics.registry.contentType).send(await ctx.metrics.registry.metrics());
    });
  };
}
