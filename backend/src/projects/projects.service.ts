import { EntityManager, UniqueConstraintViolationException } from '@mikro-orm/core';
import { HttpStatus, Injectable } from '@nestjs/common';
import { AppException, ErrorCode } from '../core/errors/app-exception';
import type { AuthContext } from '../core/guards/auth.guard';
import { Sheet } from '../sheets/entities/sheet.entity';
import type { CreateProjectDto, ProjectResponseDto, UpdateProjectDto } from './dto/project.dto';
import { Project, ProjectClient } from './entities/project.entity';

export enum ProjectErrorCode {
  JobNumberTaken = 'JOB_NUMBER_TAKEN',
}

@Injectable()
export class ProjectsService {
  constructor(private readonly em: EntityManager) {}

  private async toResponse(p: Project): Promise<ProjectResponseDto> {
    return {
      id: p.id,
      jobNumber: p.jobNumber,
      title: p.title,
      clientOrganisation: p.clientOrganisation,
      site: p.site,
      sheetCount: await this.em.count(Sheet, { project: p }),
      openQueries: await this.openQueries(p),
      createdAt: p.createdAt.toISOString(),
      updatedAt: p.updatedAt.toISOString(),
    };
  }

  /** A project the caller may see: any of the firm's for a member, an invited one for a client; else 404. */
  /** Queries not closed over the project's sheets, each for the revision it is being prepared as. */
  private async openQueries(p: Project): Promise<number> {
    const rows = await this.em.getConnection().execute<{ n: number }[]>(
      'select count(*) as n from cell_query q join sheet s on s.id = q.sheet_id where s.project_id = ? and q.status <> ? and q.revision_number = s.revision_number',
      [p.id, 'closed'],
    );
    return Number(rows[0]?.n ?? 0);
  }

  async find(auth: AuthContext, id: string): Promise<Project> {
    const project = await this.em.findOne(Project, { id, firm: auth.session.firm });
    const visible = project && (!auth.roles.includes('client') || (await this.em.count(ProjectClient, { project, user: auth.session.user })) > 0);
    if (!project || !visible) throw new AppException(ErrorCode.NotFound, 'No such project.', HttpStatus.NOT_FOUND);
    return project;
  }

  async list(auth: AuthContext): Promise<ProjectResponseDto[]> {
    const where = auth.roles.includes('client')
      ? { firm: auth.session.firm, id: { $in: (await this.em.find(ProjectClient, { user: auth.session.user }, { populate: ['project'] })).map((c) => c.project.id) } }
      : { firm: auth.session.firm };
    const projects = await this.em.find(Project, where, { orderBy: { jobNumber: 'asc' } });
    return Promise.all(projects.map((p) => this.toResponse(p)));
  }

  async get(auth: AuthContext, id: string): Promise<ProjectResponseDto> {
    return this.toResponse(await this.find(auth, id));
  }

  private async save<T>(work: () => Promise<T>, jobNumber?: string): Promise<T> {
    try {
      return await work();
    } catch (err) {
      if (err instanceof UniqueConstraintViolationException) {
        throw new AppException(ProjectErrorCode.JobNumberTaken, `Job number ${jobNumber} is used by another project of the firm.`, HttpStatus.CONFLICT, [{ field: 'jobNumber', message: 'this job number is taken' }]);
      }
      throw err;
    }
  }

  async create(auth: AuthContext, dto: CreateProjectDto): Promise<ProjectResponseDto> {
    const project = new Project(auth.session.firm, dto, auth.session.user);
    await this.save(() => this.em.persist(project).flush(), dto.jobNumber);
    return this.toResponse(project);
  }

  async update(auth: AuthContext, id: string, dto: UpdateProjectDto): Promise<ProjectResponseDto> {
    const project = await this.find(auth, id);
    Object.assign(project, Object.fromEntries(Object.entries(dto).filter(([, v]) => v !== undefined)));
    await this.save(() => this.em.flush(), dto.jobNumber);
    return this.toResponse(project);
  }

  async remove(auth: AuthContext, id: string): Promise<void> {
    const project = await this.find(auth, id);
    if (await this.em.count(Sheet, { project, state: 'issued' })) {
      throw new AppException('PROJECT_HAS_ISSUED_SHEETS', 'This project has issued sheets, which are kept for good: it cannot be deleted.', HttpStatus.CONFLICT);
    }
    await this.em.remove(project).flush();
  }
}
