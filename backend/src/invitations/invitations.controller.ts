import { BadRequestException, Body, Controller, Delete, Get, HttpCode, Param, ParseUUIDPipe, Post, Query, Req, Res } from '@nestjs/common';
import { Throttle } from '@nestjs/throttler';
import type { Request, Response } from 'express';
import { Public, Roles } from '../core/decorators/access.decorator';
import { CurrentAuth } from '../core/decorators/current-auth.decorator';
import type { AuthContext } from '../core/guards/auth.guard';
import { AUTH_THROTTLE } from '../core/throttle/throttlers';
import { AcceptInvitationDto, CreateInvitationDto, InvitationResponseDto } from './dto/invitation.dto';
import { InvitationsService, type InvitationAccepted, type InvitationPreview } from './invitations.service';

@Controller('invitations')
export class InvitationsController {
  constructor(private readonly invitations: InvitationsService) {}

  @Roles('owner')
  @Throttle(AUTH_THROTTLE)
  @Post()
  invite(@CurrentAuth() auth: AuthContext, @Body() dto: CreateInvitationDto): Promise<InvitationResponseDto> {
    return this.invitations.invite(auth, dto);
  }

  @Roles('owner')
  @Get()
  list(@CurrentAuth() auth: AuthContext): Promise<InvitationResponseDto[]> {
    return this.invitations.list(auth);
  }

  /** Withdraws an invitation that has not been accepted. */
  @Roles('owner')
  @Delete(':id')
  revoke(@CurrentAuth() auth: AuthContext, @Param('id', ParseUUIDPipe) id: string): Promise<InvitationResponseDto> {
    return this.invitations.revoke(auth, id);
  }

  @Public()
  @Get('preview')
  preview(@Query('token') token: unknown): Promise<InvitationPreview> {
    if (typeof token !== 'string' || token.length < 20 || token.length > 200) throw new BadRequestException('token is not a valid invitation token');
    return this.invitations.preview(token);
  }

  @Public()
  @Throttle(AUTH_THROTTLE)
  @Post('accept')
  @HttpCode(200)
  accept(@Body() dto: AcceptInvitationDto, @Req() req: Request, @Res({ passthrough: true }) res: Response): Promise<InvitationAccepted> {
    return this.invitations.accept(dto, res, req.ip);
  }
}
