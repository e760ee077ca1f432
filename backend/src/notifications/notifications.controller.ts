import { Controller, Get, HttpCode, Param, ParseUUIDPipe, Post } from '@nestjs/common';
import type { NotificationDto } from '@ampwright/common';
import { SignedIn } from '../core/decorators/access.decorator';
import { CurrentAuth } from '../core/decorators/current-auth.decorator';
import type { AuthContext } from '../core/guards/auth.guard';
import { NotificationsService } from './notifications.service';

@Controller('notifications')
export class NotificationsController {
  constructor(private readonly notifications: NotificationsService) {}

  @SignedIn()
  @Get()
  list(@CurrentAuth() auth: AuthContext): Promise<NotificationDto[]> {
    return this.notifications.list(auth);
  }

  @SignedIn()
  @Post('read-all')
  @HttpCode(204)
  readAll(@CurrentAuth() auth: AuthContext): Promise<void> {
    return this.notifications.markAllRead(auth);
  }

  @SignedIn()
  @Post(':id/read')
  @HttpCode(200)
  read(@CurrentAuth() auth: AuthContext, @Param('id', ParseUUIDPipe) id: string): Promise<NotificationDto> {
    return this.notifications.markRead(auth, id);
  }
}
