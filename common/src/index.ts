export * from './sheet/sheet-format';
export { ENGINE_VERSION } from './version';
export type { HealthReport, Reachability } from './api/health';
