import { Body, Controller, Delete, Get, HttpCode, Param, ParseEnumPipe, ParseUUIDPipe, Post, Put, Query } from '@nestjs/common';
import type { DiffDto, HistoryEventDto, QueryDto, RevisionSummaryDto, SheetDto } from '@ampwright/common';
import { Roles } from '../core/decorators/access.decorator';
import { CurrentAuth } from '../core/decorators/current-auth.decorator';
import { ErrorCode, RequestException } from '../core/errors/app-exception';
import type { AuthContext } from '../core/guards/auth.guard';
import { MEMBER_ROLES, SHEET_EDITORS } from '../core/roles';
import { NoteDto, RaiseQueryDto, ReplyDto, RequestCheckDto } from './dto/review.dto';
import { QueriesService } from './queries.service';
import { RevisionsService, type RevisionSnapshot } from './revisions.service';
import { WorkflowService } from './workflow.service';

const REVISION_REF = /^(draft|[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12})$/;

@Controller()
export class ReviewController {
  constructor(
    private readonly workflow: WorkflowService,
    private readonly queries: QueriesService,
    private readonly revisions: RevisionsService,
  ) {}

  @Roles(...SHEET_EDITORS)
  @Post('sheets/:id/request-check')
  @HttpCode(200)
  requestCheck(@CurrentAuth() auth: AuthContext, @Param('id', ParseUUIDPipe) id: string, @Body() dto: RequestCheckDto): Promise<SheetDto> {
    return this.workflow.requestCheck(auth, id, dto);
  }

  /** A checked or approved sheet back to its checker, evaluated afresh (the approver or an owner). */
  @Roles('approver', 'owner')
  @Post('sheets/:id/return-to-checker')
  @HttpCode(200)
  returnToChecker(@CurrentAuth() auth: AuthContext, @Param('id', ParseUUIDPipe) id: string, @Body() dto: NoteDto): Promise<SheetDto> {
    return this.workflow.returnToChecker(auth, id, dto);
  }

  @Roles('checker')
  @Post('sheets/:id/return')
  @HttpCode(200)
  returnSheet(@CurrentAuth() auth: AuthContext, @Param('id', ParseUUIDPipe) id: string, @Body() dto: NoteDto): Promise<SheetDto> {
    return this.workflow.returnToPreparer(auth, id, dto);
  }

  @Roles('checker')
  @Post('sheets/:id/pass')
  @HttpCode(200)
  pass(@CurrentAuth() auth: AuthContext, @Param('id', ParseUUIDPipe) id: string): Promise<SheetDto> {
    return this.workflow.passCheck(auth, id);
  }

  @Roles('approver')
  @Post('sheets/:id/approve')
  @HttpCode(200)
  approve(@CurrentAuth() auth: AuthContext, @Param('id', ParseUUIDPipe) id: string): Promise<SheetDto> {
    return this.workflow.approve(auth, id);
  }

  @Roles('approver')
  @Post('sheets/:id/issue')
  @HttpCode(200)
  issue(@CurrentAuth() auth: AuthContext, @Param('id', ParseUUIDPipe) id: string): Promise<RevisionSummaryDto> {
    return this.workflow.issue(auth, id);
  }

  @Roles(...SHEET_EDITORS)
  @Post('sheets/:id/new-revision')
  @HttpCode(200)
  newRevision(@CurrentAuth() auth: AuthContext, @Param('id', ParseUUIDPipe) id: string): Promise<SheetDto> {
    return this.workflow.startRevision(auth, id);
  }

  /** The queries of the revision being prepared; `?all=true` for every revision's. */
  @Roles(...MEMBER_ROLES)
  @Get('sheets/:id/queries')
  listQueries(
    @CurrentAuth() auth: AuthContext,
    @Param('id', ParseUUIDPipe) id: string,
    @Query('all', new ParseEnumPipe({ true: 'true', false: 'false' }, { optional: true, errorHttpStatusCode: 400 })) all?: 'true' | 'false',
  ): Promise<QueryDto[]> {
    return this.queries.list(auth, id, all === 'true');
  }

  @Roles('checker')
  @Post('sheets/:id/queries')
  raise(@CurrentAuth() auth: AuthContext, @Param('id', ParseUUIDPipe) id: string, @Body() dto: RaiseQueryDto): Promise<QueryDto> {
    return this.queries.raise(auth, id, dto);
  }

  @Roles('owner', 'engineer', 'checker')
  @Post('queries/:id/replies')
  reply(@CurrentAuth() auth: AuthContext, @Param('id', ParseUUIDPipe) id: string, @Body() dto: ReplyDto): Promise<QueryDto> {
    return this.queries.reply(auth, id, dto);
  }

  @Roles('checker')
  @Post('queries/:id/close')
  @HttpCode(200)
  close(@CurrentAuth() auth: AuthContext, @Param('id', ParseUUIDPipe) id: string, @Body() dto: NoteDto): Promise<QueryDto> {
    return this.queries.close(auth, id, dto);
  }

  @Roles('checker')
  @Put('sheets/:id/cells/:cellId/agreement')
  @HttpCode(204)
  agree(@CurrentAuth() auth: AuthContext, @Param('id', ParseUUIDPipe) id: string, @Param('cellId', ParseUUIDPipe) cellId: string): Promise<void> {
    return this.queries.agree(auth, id, cellId, true);
  }

  @Roles('checker')
  @Delete('sheets/:id/cells/:cellId/agreement')
  @HttpCode(204)
  disagree(@CurrentAuth() auth: AuthContext, @Param('id', ParseUUIDPipe) id: string, @Param('cellId', ParseUUIDPipe) cellId: string): Promise<void> {
    return this.queries.agree(auth, id, cellId, false);
  }

  @Roles(...MEMBER_ROLES)
  @Get('sheets/:id/revisions')
  listRevisions(@CurrentAuth() auth: AuthContext, @Param('id', ParseUUIDPipe) id: string): Promise<RevisionSummaryDto[]> {
    return this.revisions.list(auth, id);
  }

  @Roles(...MEMBER_ROLES)
  @Get('revisions/:id')
  revision(@CurrentAuth() auth: AuthContext, @Param('id', ParseUUIDPipe) id: string): Promise<RevisionSummaryDto & { snapshot: RevisionSnapshot }> {
    return this.revisions.get(auth, id);
  }

  /** Cell by cell, between two revisions (ids) or a revision and `draft`, the sheet as it is now. */
  @Roles(...MEMBER_ROLES)
  @Get('sheets/:id/diff')
  diff(@CurrentAuth() auth: AuthContext, @Param('id', ParseUUIDPipe) id: string, @Query('from') from = '', @Query('to') to = 'draft'): Promise<DiffDto> {
    for (const [name, v] of [
      ['from', from],
      ['to', to],
    ] as const) {
      if (!REVISION_REF.test(v))
        throw new RequestException(ErrorCode.ValidationFailed, `${name} must be a revision id or "draft".`, {
          details: [{ field: name, message: 'a revision id or "draft"' }],
        });
    }
    return this.revisions.diff(auth, id, from, to);
  }

  @Roles(...MEMBER_ROLES)
  @Get('sheets/:id/history')
  history(@CurrentAuth() auth: AuthContext, @Param('id', ParseUUIDPipe) id: string): Promise<HistoryEventDto[]> {
    return this.revisions.history(auth, id);
  }
}
