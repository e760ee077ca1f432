import { Module } from '@nestjs/common';
import { AuthModule } from '../auth/auth.module';
import { MailModule } from '../mail/mail.module';
import { InvitationsController } from './invitations.controller';
import { InvitationsService } from './invitations.service';

@Module({ imports: [AuthModule, MailModule], controllers: [InvitationsController], providers: [InvitationsService] })
export class InvitationsModule {}
