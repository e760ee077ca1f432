import { randomUUID } from 'node:crypto';
import { Entity, EntityRepositoryType, Index, ManyToOne, Opt, PrimaryKey, Property } from '@mikro-orm/core';
import { Revision } from '../../review/entities/revision.entity';
import { PackageJobRepository } from '../package-job.repository';

export type PackageJobStatus = 'queued' | 'running' | 'done' | 'failed';

/** Making a revision's signed package, off the request path: kept in MariaDB so any app instance can run it. */
@Entity({ tableName: 'package_job', repository: () => PackageJobRepository })
@Index({ properties: ['status', 'createdAt'] })
export class PackageJob {
  [EntityRepositoryType]?: PackageJobRepository;

  @PrimaryKey({ type: 'uuid' })
  id: string & Opt = randomUUID();

  @ManyToOne(() => Revision, { deleteRule: 'cascade', unique: true })
  revision: Revision;

  @Property({ length: 10 })
  status: PackageJobStatus & Opt = 'queued';

  @Property({ type: 'integer' })
  percent: number & Opt = 0;

  @Property({ type: 'integer' })
  attempts: number & Opt = 0;

  @Property({ length: 500, nullable: true })
  error?: string;

  /** Which app instance runs it, and since when (a job left by a dead instance is taken over). */
  @Property({ length: 64, nullable: true })
  lockedBy?: string;

  @Property({ type: 'datetime', length: 3, nullable: true })
  lockedAt?: Date;

  /** The claim this run holds: every write the run makes is conditional on it, so a run whose claim was taken over writes nothing. */
  @Property({ length: 36, nullable: true })
  claimToken?: string;

  /** Refreshed while the package is being made; a job whose heartbeat stopped is taken over. */
  @Property({ type: 'datetime', length: 3, nullable: true })
  heartbeatAt?: Date;

  /** The id of the request that queued it (issue, or try again): the job's log lines carry it. */
  @Property({ length: 64, nullable: true })
  requestId?: string;

  @Property({ type: 'datetime', length: 3 })
  createdAt: Date & Opt = new Date();

  @Property({ type: 'datetime', length: 3, onUpdate: () => new Date() })
  updatedAt: Date & Opt = new Date();

  constructor(revision: Revision, requestId?: string) {
    this.revision = revision;
    this.requestId = requestId;
  }
}
