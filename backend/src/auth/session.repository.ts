import { EntityRepository } from '@mikro-orm/mariadb';
import type { Session } from './entities/session.entity';

/** A session with its user, firm and membership, as one row (snake_case columns, `u_`, `f_`, `m_` for the joined rows). */
export interface SessionRow {
  token_hash: string;
  user_id: string;
  firm_id: string;
  csrf_token: string;
  created_at: Date;
  expires_at: Date;
  u_email: string;
  u_name: string;
  u_password_hash: string;
  u_created_at: Date;
  f_name: string;
  f_created_at: Date;
  m_id: string;
  m_roles: unknown;
  m_created_at: Date;
}

/** The SQL of sessions: the read every signed-in request makes, and the sliding of its end. */
export class SessionRepository extends EntityRepository<Session> {
  /** The session of a token hash with its user, firm and membership, in one query (undefined when there is none). */
  async live(tokenHash: string): Promise<SessionRow | undefined> {
    const [row] = await this.em.execute<SessionRow[]>(
      `select s.token_hash, s.user_id, s.firm_id, s.csrf_token, s.created_at, s.expires_at,
              u.email as u_email, u.name as u_name, u.password_hash as u_password_hash, u.created_at as u_created_at,
              f.name as f_name, f.created_at as f_created_at, m.id as m_id, m.roles as m_roles, m.created_at as m_created_at
         from session s
         join app_user u on u.id = s.user_id
         join firm f on f.id = s.firm_id
         join membership m on m.firm_id = s.firm_id and m.user_id = s.user_id
        where s.token_hash = ?`,
      [tokenHash],
    );
    return row;
  }

  /** Moves the session's end to `idleMinutes` from now, never past `hours` from sign-in. */
  async slide(tokenHash: string, hours: number, idleMinutes: number): Promise<void> {
    await this.em.execute(
      'update session set expires_at = least(created_at + interval ? hour, now(3) + interval ? minute) where token_hash = ?',
      [hours, idleMinutes, tokenHash],
      'run',
    );
  }
}
