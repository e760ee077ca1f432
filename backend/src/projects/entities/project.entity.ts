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

/** A client invited to a project. */
@Entity({ tableName: 'project_client' })
@Unique({ properties: ['project', 'user'] })
export class ProjectClient {
  @PrimaryKey({ type: 'uuid' })
  id: string & Opt = randomUUID();

  @ManyToOne(() => Project, { deleteRule: 'cascade' })
  project: Project;

  @ManyToOne(() => User, { deleteRule: 'cascade' })
  user: User;

  constructor(project: Project, user: User) {
    this.project = project;
    this.user = user;
  }
}

/** A member of the firm on a project's team (its preparers, checkers and approver). */
@Entity({ tableName: 'project_member' })
@Unique({ properties: ['project', 'user'] })
export class ProjectMember {
  @PrimaryKey({ type: 'uuid' })
  id: string & Opt = randomUUID();

  @ManyToOne(() => Project, { deleteRule: 'cascade' })
  project: Project;

  @ManyToOne(() => User, { deleteRule: 'cascade' })
  user: User;

  constructor(project: Project, user: User) {
    this.project = project;
    this.user = user;
  }
}
