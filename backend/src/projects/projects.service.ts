import { EntityManager, UniqueConstraintViolationException } from '@mikro-orm/core';
import { Injectable } from '@nestjs/common';
import { Membership } from '../firms/entities/membership.entity';
import { Firm } from '../firms/entities/firm.entity';
import { User } from '../users/entities/user.entity';
import type { ProjectPeopleDto } from '@ampwright/common';
import { ErrorCode, ProjectException, RequestException } from '../core/errors/app-exception';
import type { AuthContext } from '../core/guards/auth.guard';
import { Sheet } from '../sheets/entities/sheet.entity';
import type { CreateProjectDto, ProjectResponseDto, UpdateProjectDto } from './dto/project.dto';
import { Project, ProjectPerson } from './entities/project.entity';
import { ProjectErrorCode } from '@ampwright/common';

export { ProjectErrorCode };

@Injectable()
export class ProjectsService {
  constructor(private readonly em: EntityManager) {}

  /** A project as the API shows it; a client gets no counts of the firm's internal work (drafts, open queries). */
  private async toResponse(p: Project, auth: AuthContext): Promise<ProjectResponseDto> {
    const internal = auth.roles.includes('client') ? {} : { sheetCount: await this.em.count(Sheet, { project: p }), openQueries: await this.openQueries(p) };
    return {
      id: p.id,
      jobNumber: p.jobNumber,
      title: p.title,
      clientOrganisation: p.clientOrganisation,
      site: p.site,
      ...internal,
      createdAt: p.createdAt.toISOString(),
      updatedAt: p.updatedAt.toISOString(),
    };
  }

  /** Queries not closed over the project's sheets (the rule is SheetRepository's). */
  private openQueries(p: Project): Promise<number> {
    return this.em.getRepository(Sheet).openQueriesOfProject(p.id);
  }

  /** A project the caller may see: any of the firm's for a member, an invited one for a client; else 404. */
  async find(auth: AuthContext, id: string): Promise<Project> {
    const project = await this.em.findOne(Project, { id, firm: auth.firm.id });
    const visible =
      project && (!auth.roles.includes('client') || (await this.em.count(ProjectPerson, { project, user: auth.user.id, standing: 'client' })) > 0);
    if (!project || !visible) throw new RequestException(ErrorCode.NotFound, 'No such project.');
    return project;
  }

  async list(auth: AuthContext): Promise<ProjectResponseDto[]> {
    const where = auth.roles.includes('client')
      ? {
          firm: auth.firm.id,
          id: { $in: (await this.em.find(ProjectPerson, { user: auth.user.id, standing: 'client' }, { populate: ['project'] })).map((c) => c.project.id) },
        }
      : { firm: auth.firm.id };
    const projects = await this.em.find(Project, where, { orderBy: { jobNumber: 'asc' } });
    return Promise.all(projects.map((p) => this.toResponse(p, auth)));
  }

  async get(auth: AuthContext, id: string): Promise<ProjectResponseDto> {
    return this.toResponse(await this.find(auth, id), auth);
  }

  private async save<T>(work: () => Promise<T>, jobNumber?: string): Promise<T> {
    try {
      return await work();
    } catch (err) {
      if (err instanceof UniqueConstraintViolationException) {
        throw new ProjectException(ProjectErrorCode.JobNumberTaken, `Job number ${jobNumber} is used by another project of the firm.`, {
          details: [{ field: 'jobNumber', message: 'this job number is taken' }],
        });
      }
      throw err;
    }
  }

  async create(auth: AuthContext, dto: CreateProjectDto): Promise<ProjectResponseDto> {
    const project = new Project(this.em.getReference(Firm, auth.firm.id), dto, this.em.getReference(User, auth.user.id));
    this.em.persist(new ProjectPerson(project, this.em.getReference(User, auth.user.id), 'team'));
    await this.save(() => this.em.persist(project).flush(), dto.jobNumber);
    return this.toResponse(project, auth);
  }

  async update(auth: AuthContext, id: string, dto: UpdateProjectDto): Promise<ProjectResponseDto> {
    const project = await this.find(auth, id);
    Object.assign(project, Object.fromEntries(Object.entries(dto).filter(([, v]) => v !== undefined)));
    await this.save(() => this.em.flush(), dto.jobNumber);
    return this.toResponse(project, auth);
  }

  async remove(auth: AuthContext, id: string): Promise<void> {
    const project = await this.find(auth, id);
    if (await this.em.count(Sheet, { project, $or: [{ state: 'issued' }, { revisionNumber: { $gt: 1 } }] })) {
      throw new ProjectException(ProjectErrorCode.HasIssuedSheets, 'This project has issued sheets, which are kept for good: it cannot be deleted.');
    }
    await this.em.remove(project).flush();
  }

  /** The project's team (members of the firm) and its invited clients. */
  async people(auth: AuthContext, id: string): Promise<ProjectPeopleDto> {
    const project = await this.find(auth, id);
    const team = await this.em.find(ProjectPerson, { project, standing: 'team' }, { populate: ['user'], orderBy: { user: { name: 'asc' } } });
    const roles = new Map((await this.em.find(Membership, { firm: auth.firm.id, user: { $in: team.map((t) => t.user.id) } })).map((m) => [m.user.id, m.roles]));
    const clients = await this.em.find(ProjectPerson, { project, standing: 'client' }, { populate: ['user'], orderBy: { user: { name: 'asc' } } });
    return {
      members: team.map((t) => ({ id: t.user.id, name: t.user.name, email: t.user.email, roles: roles.get(t.user.id) ?? [] })),
      clients: clients.map((c) => ({ id: c.user.id, name: c.user.name, email: c.user.email })),
    };
  }

  /** Sets the team: every id must be a member of the firm (not a client). */
  async setMembers(auth: AuthContext, id: string, userIds: string[]): Promise<ProjectPeopleDto> {
    const project = await this.find(auth, id);
    const memberships = await this.em.find(Membership, { firm: auth.firm.id, user: { $in: userIds } });
    const ok = new Set(memberships.filter((m) => m.roles.some((r) => r !== 'client')).map((m) => m.user.id));
    const bad = [...new Set(userIds)].filter((u) => !ok.has(u));
    if (bad.length)
      throw new RequestException(
        ErrorCode.ValidationFailed,
        `${bad.length === 1 ? 'One person is' : `${bad.length} people are`} not a member of the firm: a project's team is made of the firm's members (clients are invited separately).`,
        { details: bad.map(() => ({ field: 'userIds', message: 'not a member of the firm' })) },
      );
    await this.em.transactional(async (em) => {
      await em.nativeDelete(ProjectPerson, { project: project.id, standing: 'team' });
      for (const u of new Set(userIds)) em.persist(new ProjectPerson(em.getReference(Project, project.id), em.getReference(User, u), 'team'));
    });
    return this.people(auth, id);
  }
}
