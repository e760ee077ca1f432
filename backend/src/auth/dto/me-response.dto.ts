import type { Role } from '../../core/roles';

export class MeResponseDto {
  user: { id: string; email: string; name: string };
  firm: { id: string; name: string };
  roles: Role[];
  /** Send back in the x-ampwright-csrf header with every state-changing request. */
  csrfToken: string;
}
