/**
 * What the app measures, in Prometheus's text format (prom-client): the process (CPU, memory, event-loop lag,
 * garbage collection), every request's time by method, route pattern and status, every evaluation's outcome
 * and time, the evaluation queue's length, saves by path, and every package job's time and outcome. One registry per
 * process; each app instance is scraped on its own.
 */
import { collectDefaultMetrics, Counter, Gauge, Histogram, Registry } from 'prom-client';

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

export const evaluationDuration = new Histogram({
  name: 'ampwright_evaluation_duration_seconds',
  help: 'Time from handing work to the evaluation processes to its answer (waiting in the queue included), by kind and outcome.',
  labelNames: ['kind', 'outcome'] as const,
  buckets: [0.005, 0.01, 0.025, 0.05, 0.1, 0.25, 0.5, 1, 2.5, 5, 10],
  registers: [registry],
});

let queueLength: () => number = () => 0;
/** The evaluation pool says how to read its queue; the gauge reads it at each scrape. */
export function measureEvaluationQueue(read: () => number): void {
  queueLength = read;
}

// Registered with the registry; read at each scrape.
new Gauge({
  name: 'ampwright_evaluation_queue_length',
  help: 'Evaluation tasks waiting for a free evaluation process.',
  registers: [registry],
  collect() {
    this.set(queueLength());
  },
});

export const packageJobDuration = new Histogram({
  name: 'ampwright_package_job_duration_seconds',
  help: "Time to make, sign and store one revision's package, by outcome (done, failed, retried, taken over).",
  labelNames: ['outcome'] as const,
  buckets: [0.25, 0.5, 1, 2.5, 5, 10, 30, 60, 120],
  registers: [registry],
});

export const packageJobs = new Counter({
  name: 'ampwright_package_jobs_total',
  help: 'Package jobs run, by outcome: done; failed for good; failed and queued again (retried); taken over by another run.',
  labelNames: ['outcome'] as const,
  registers: [registry],
});

export const sheetSaves = new Counter({
  name: 'ampwright_sheet_saves_total',
  help: "Saved changes to sheets, by path: one-cell (only the edited cell sent to the process keeping the sheet's evaluation) or whole-sheet.",
  labelNames: ['path'] as const,
  registers: [registry],
});
