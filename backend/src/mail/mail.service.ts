import { Injectable, Logger, OnModuleDestroy } from '@nestjs/common';
import { ConfigService } from '@nestjs/config';
import { createTransport, Transporter } from 'nodemailer';
import type { Environment } from '../config/environment';

export interface OutgoingMail {
  to: string | string[];
  subject: string;
  text: string;
  html: string;
}

/** Sends e-mail over SMTP (locally, the sink started by the scripts). */
@Injectable()
export class MailService implements OnModuleDestroy {
  private readonly logger = new Logger(MailService.name);
  private readonly transporter: Transporter;
  private readonly from: string;

  constructor(config: ConfigService<Environment, true>) {
    this.from = config.get('MAIL_FROM', { infer: true });
    this.transporter = createTransport({
      host: config.get('SMTP_HOST', { infer: true }),
      port: config.get('SMTP_PORT', { infer: true }),
      secure: false,
      ignoreTLS: config.get('NODE_ENV', { infer: true }) !== 'production' || config.get('SMTP_HOST', { infer: true }) === '127.0.0.1',
      connectionTimeout: 3000,
      greetingTimeout: 3000,
    });
  }

  async send(mail: OutgoingMail): Promise<void> {
    await this.transporter.sendMail({ from: this.from, ...mail });
    this.logger.log(`sent "${mail.subject}" to ${[mail.to].flat().length} recipient(s)`);
  }

  /** True when the SMTP server answers a greeting. */
  async isReachable(): Promise<boolean> {
    try {
      return await this.transporter.verify();
    } catch {
      return false;
    }
  }

  onModuleDestroy(): void {
    this.transporter.close();
  }
}
