import { randomUUID } from 'node:crypto';
import { Entity, ManyToOne, Opt, PrimaryKey, Property, Unique } from '@mikro-orm/core';
import { Firm } from '../../firms/entities/firm.entity';
import { User } from '../../users/entities/user.entity';

/** A job of the firm: its calculation sheets, and the clients invited to see its issued packages. */
@Entity({ tableName: 'project' })
@Unique({ properties: ['firm', 'jobNumber'] })
export class Project {
  @PrimaryKey({ type: 'uuid' })
  id: string & Opt = randomUUID();

  @ManyToOne(() => Firm, { deleteRule: 'cascade' })
  firm: Firm;

  @Property({ length: 40 })
  jobNumber: string;

  @Property({ length: 200 })
  title: string;

  @Property({ length: 200 })
  clientOrganisation: string;

  @Property({ length: 200 })
  site: string;

  @ManyToOne(() => User, { deleteRule: 'set null', nullable: true })
  createdBy?: User;

  @Property({ type: 'datetime' })
  createdAt: Date & Opt = new Date();

  @Property({ type: 'datetime', onUpdate: () => new Date() })
  updatedAt: Date & Opt = new Date();

  constructor(firm: Firm, fields: Pick<Project, 'jobNumber' | 'title' | 'clientOrganisation' | 'site'>, createdBy?: User) {
    this.firm = firm;
    Object.assign(this, fields);
    this.createdBy = createdBy;
  }
}

/** How a person stands on a project: on its team (a member of the firm), or its client (reads its issued revisions). */
export type ProjectStanding = 'team' | 'client';

/**
 * A person linked to a project: a member of the firm on its team (its preparers, checkers and approver), or
 * a client invited to it. One entity for both links (they differ only in `standing`).
 */
@Entity({ tableName: 'project_person' })
@Unique({ properties: ['project', 'user', 'standing'] })
export class ProjectPerson {
  @PrimaryKey({ type: 'uuid' })
  id: string & Opt = randomUUID();

  @ManyToOne(() => Project, { deleteRule: 'cascade' })
  project: Project;

  @ManyToOne(() => User, { deleteRule: 'cascade' })
  user: User;

  @Property({ length: 10 })
  standing: ProjectStanding;

  constructor(project: Project, user: User, standing: ProjectStanding) {
    this.project = project;
    this.user = user;
    this.standing = standing;
  }
}
