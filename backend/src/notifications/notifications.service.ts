import { EntityManager } from '@mikro-orm/core';
import { Injectable, Logger } from '@nestjs/common';
import { ConfigService } from '@nestjs/config';
import type { NotificationDto } from '@ampwright/common';
import type { Environment } from '../config/environment';
import { ErrorCode, RequestException } from '../core/errors/app-exception';
import type { AuthContext } from '../core/guards/auth.guard';
import { mailTemplates } from '../mail/mail-templates';
import { MailService, type OutgoingMail } from '../mail/mail.service';
import { User } from '../users/entities/user.entity';
import { Notification } from './entities/notification.entity';

export interface NoticeTarget {
  user: User;
  /** The e-mail to send instead of the standard one (e.g. the client's portal link). */
  mail?: OutgoingMail;
}

const view = (n: Notification): NotificationDto => ({
  id: n.id,
  kind: n.kind,
  text: n.text,
  link: n.link,
  readAt: n.readAt?.toISOString() ?? null,
  createdAt: n.createdAt.toISOString(),
});

/** Tells people in the app and by e-mail. A mail server that is down never undoes the action itself. */
@Injectable()
export class NotificationsService {
  private readonly logger = new Logger(NotificationsService.name);
  private readonly appUrl: string;

  constructor(
    private readonly em: EntityManager,
    private readonly mail: MailService,
    config: ConfigService<Environment, true>,
  ) {
    this.appUrl = config.get('APP_URL', { infer: true }).replace(/\/$/, '');
  }

  url(path: string): string {
    return `${this.appUrl}${path}`;
  }

  async notify(targets: NoticeTarget[], notice: { kind: string; subject: string; text: string; link: string; firm: string }): Promise<void> {
    const unique = [...new Map(targets.map((t) => [t.user.id, t])).values()];
    const em = this.em.fork();
    for (const t of unique) em.persist(new Notification(em.getReference(User, t.user.id), notice.kind, notice.text, notice.link));
    await em.flush();
    await Promise.all(
      unique.map((t) =>
        this.mail
          .send(
            t.mail ??
              mailTemplates.sheetEvent({ to: t.user.email, firm: notice.firm, subject: notice.subject, sentence: notice.text, url: this.url(notice.link) }),
          )
          .catch((err: Error) => this.logger.warn(`could not e-mail ${t.user.email} (${notice.kind}): ${err.message}; the notice is in the app`)),
      ),
    );
  }

  async list(auth: AuthContext): Promise<NotificationDto[]> {
    const rows = await this.em.find(Notification, { user: auth.user.id }, { orderBy: { createdAt: 'desc' }, limit: 100 });
    return rows.map(view);
  }

  async markRead(auth: AuthContext, id: string): Promise<NotificationDto> {
    const n = await this.em.findOne(Notification, { id, user: auth.user.id });
    if (!n) throw new RequestException(ErrorCode.NotFound, 'No such notification.');
    n.readAt ??= new Date();
    await this.em.flush();
    return view(n);
  }

  async markAllRead(auth: AuthContext): Promise<void> {
    await this.em.nativeUpdate(Notification, { user: auth.user.id, readAt: null }, { readAt: new Date() });
  }
}
