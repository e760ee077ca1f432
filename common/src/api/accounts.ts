/** The password rule, enforced by the server and shown by the app's forms. */
export const MIN_PASSWORD_LENGTH = 12;
/** bcrypt reads only the first 72 bytes of a password, so a longer one is refused rather than silently cut short. */
export const MAX_PASSWORD_BYTES = 72;

/** One event of the firm's audit log (GET /api/audit, owners only), newest first. */
export interface AuditEventDto {
  id: string;
  /** What happened, e.g. "login", "sheet.issued". */
  type: string;
  userId: string | null;
  email: string | null;
  detail: Record<string, unknown> | null;
  /** ISO 8601, UTC. */
  at: string;
}
