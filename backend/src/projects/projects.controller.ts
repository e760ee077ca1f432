import { Body, Controller, Delete, Get, HttpCode, Param, ParseUUIDPipe, Patch, Post, Put } from '@nestjs/common';
import type { ProjectPeopleDto } from '@ampwright/common';
import { Roles, SignedIn } from '../core/decorators/access.decorator';
import { CurrentAuth } from '../core/decorators/current-auth.decorator';
import type { AuthContext } from '../core/guards/auth.guard';
import { MEMBER_ROLES } from '../core/roles';
import { CreateProjectDto, ProjectMembersDto, UpdateProjectDto, type ProjectResponseDto } from './dto/project.dto';
import { ProjectsService } from './projects.service';

@Controller('projects')
export class ProjectsController {
  constructor(private readonly projects: ProjectsService) {}

  /** The firm's projects for a member; the projects they were invited to for a client. */
  @SignedIn()
  @Get()
  list(@CurrentAuth() auth: AuthContext): Promise<ProjectResponseDto[]> {
    return this.projects.list(auth);
  }

  @Roles('owner', 'engineer')
  @Post()
  create(@CurrentAuth() auth: AuthContext, @Body() dto: CreateProjectDto): Promise<ProjectResponseDto> {
    return this.projects.create(auth, dto);
  }

  @Roles(...MEMBER_ROLES)
  @Get(':id')
  get(@CurrentAuth() auth: AuthContext, @Param('id', ParseUUIDPipe) id: string): Promise<ProjectResponseDto> {
    return this.projects.get(auth, id);
  }

  @Roles('owner', 'engineer')
  @Patch(':id')
  update(@CurrentAuth() auth: AuthContext, @Param('id', ParseUUIDPipe) id: string, @Body() dto: UpdateProjectDto): Promise<ProjectResponseDto> {
    return this.projects.update(auth, id, dto);
  }

  /** The project's team and its invited clients. */
  @Roles(...MEMBER_ROLES)
  @Get(':id/people')
  people(@CurrentAuth() auth: AuthContext, @Param('id', ParseUUIDPipe) id: string): Promise<ProjectPeopleDto> {
    return this.projects.people(auth, id);
  }

  @Roles('owner', 'engineer')
  @Put(':id/members')
  setMembers(@CurrentAuth() auth: AuthContext, @Param('id', ParseUUIDPipe) id: string, @Body() dto: ProjectMembersDto): Promise<ProjectPeopleDto> {
    return this.projects.setMembers(auth, id, dto.userIds);
  }

  @Roles('owner')
  @Delete(':id')
  @HttpCode(204)
  remove(@CurrentAuth() auth: AuthContext, @Param('id', ParseUUIDPipe) id: string): Promise<void> {
    return this.projects.remove(auth, id);
  }
}
