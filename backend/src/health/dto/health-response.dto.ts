import type { HealthReport } from '@ampwright/common';

/** The body of GET /api/health (shared with the app). */
export type HealthResponseDto = HealthReport;
