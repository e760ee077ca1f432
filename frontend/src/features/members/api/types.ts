import type { Role } from '../../auth';

export interface Member {
  id: string;
  user: { id: string; email: string; name: string };
  roles: Role[];
  since: string;
}

export interface Invitation {
  id: string;
  email: string;
  roles: Role[];
  expiresAt: string;
  acceptedAt: string | null;
  revokedAt: string | null;
}

export const ROLE_LABELS: Record<Role, string> = { owner: 'Owner', engineer: 'Engineer', checker: 'Checker', approver: 'Approver', client: 'Client' };
