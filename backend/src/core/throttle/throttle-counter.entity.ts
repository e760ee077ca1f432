import { Entity, EntityRepositoryType, PrimaryKey, Property } from '@mikro-orm/core';
import { ThrottleCounterRepository } from './throttle-counter.repository';

/**
 * A shared throttle counter (sign-in, reset, invitation and verification attempts), kept in MariaDB so
 * that every app instance counts the same attempts. Its SQL is ThrottleCounterRepository's.
 */
@Entity({ tableName: 'throttle_counter', repository: () => ThrottleCounterRepository })
export class ThrottleCounter {
  [EntityRepositoryType]?: ThrottleCounterRepository;

  /** The throttler's key for a client address or account (a SHA-256 in hex). */
  @PrimaryKey({ length: 100 })
  trackerKey: string;

  @Property({ type: 'integer', unsigned: true })
  hits: number;

  /** When the counting window ends. */
  @Property({ type: 'datetime', length: 3 })
  expiresAt: Date;

  /** Set when the limit was passed: no attempt is allowed until then. */
  @Property({ type: 'datetime', length: 3, nullable: true })
  blockedUntil?: Date;

  constructor(trackerKey: string, hits: number, expiresAt: Date) {
    this.trackerKey = trackerKey;
    this.hits = hits;
    this.expiresAt = expiresAt;
  }
}
