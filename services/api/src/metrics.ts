import { Counter, Gauge, Histogram, Registry, collectDefaultMetrics } from 'prom-client';

/** Prometheus metrics of one service instance (its own registry: tests build many apps in one process). */
export function createMetrics() {
  const registry = new Registry();
  collectDefaultMetrics({ register: registry, prefix: 'keelson_' });
  return {
    registry,
    jobsCreated: new Counter({ name: 'keelson_jobs_created_total', help: 'Jobs accepted', registers: [registry] }),
    jobsCancelled: new Counter({ name: 'keelson_jobs_cancelled_total', help: 'Jobs cancelled', registers: [registry] }),
    drawings: new Counter({
      name: 'keelson_drawings_total',
      help: 'Drawings handled, by path (compute, job) and outcome (done, failed, cached)',
      labelNames: ['path', 'outcome'] as const,
      registers: [registry],
    }),
    drawingSeconds: new Histogram({
      name: 'keelson_drawing_duration_seconds',
      help: 'Wall time of one drawing in a worker thread, waiting excluded',
      labelNames: ['path'] as const,
      buckets: [0.005, 0.01, 0.025, 0.05, 0.1, 0.25, 0.5, 1, 2.5, 5, 10, 30, 60],
      registers: [registry],
    }),
    requestSeconds: new Histogram({
      name: 'keelson_http_request_duration_seconds',
      help: 'HTTP request duration by route and status',
      labelNames: ['method', 'route', 'status'] as const,
      buckets: [0.005, 0.01, 0.025, 0.05, 0.1, 0.25, 0.5, 1, 2.5, 5, 10, 30],
      registers: [registry],
    }),
    errors: new Counter({ name: 'keelson_errors_total', help: 'Problem responses by code', labelNames: ['code'] as const, registers: [registry] }),
    poolBusy: new Gauge({ name: 'keelson_pool_busy_threads', help: 'Worker threads computing a drawing', registers: [registry] }),
    poolWaiting: new Gauge({ name: 'keelson_pool_waiting_drawings', help: 'Drawings waiting for a worker thread', registers: [registry] }),
    queuePending: new Gauge({ name: 'keelson_queue_pending_drawings', help: 'Drawings of jobs not yet claimed (all processes)', registers: [registry] }),
  };
}

export type Metrics = ReturnType<typeof createMetrics>;
