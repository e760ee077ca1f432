/**
 * What the app measures, in Prometheus's text format (prom-client): the process (CPU, memory, event-loop lag,
 * garbage collection), every request's time by method, route pattern and status, and every evaluation's
 * outcome. One registry per process; each app instance is scraped on its own.
 */
import { collectDefaultMetrics, Counter, Histogram, Registry } from 'prom-client';

export const registry = new Registry();
collectDefaultMetrics({ register: registry, prefix: 'ampwright_' });

export const httpDuration = new Histogram({
  name: 'ampwright_http_request_duration_seconds',
  help: 'Time from a request to its answer, by method, route pattern and status.',
  labelNames: ['method', 'route', 'status'] as const,
  buckets: [0.005, 0.01, 0.025, 0.05, 0.1, 0.25, 0.5, 1, 2.5, 5, 10],
  registers: [registry],
});

export const evaluations = new Counter({
  name: 'ampwright_evaluations_total',
  help: 'Work given to the evaluation processes (sheets, CSV imports, certificate files), by kind and outcome.',
  labelNames: ['kind', 'outcome'] as const,
  registers: [registry],
});
