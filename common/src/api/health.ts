/** The body of GET /api/health, shared by the server that builds it and the app that shows it. */
export type Reachability = 'up' | 'down';

export interface HealthReport {
  /** ok: all up; degraded: a side service is down; down: the database is down (answered with 503). */
  status: 'ok' | 'degraded' | 'down';
  version: string;
  engineVersion: string;
  checks: { database: Reachability; mail: Reachability; objectStore: Reachability };
}
