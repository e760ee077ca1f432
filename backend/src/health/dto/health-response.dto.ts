import type { HealthReport } from '@ampwright/common';

export class HealthResponseDto implements HealthReport {
  status: HealthReport['status'];
  version: string;
  engineVersion: string;
  checks: HealthReport['checks'];
}
