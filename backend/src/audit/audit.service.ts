import { EntityManager } from '@mikro-orm/core';
import { Injectable } from '@nestjs/common';
import { AuditEvent, type AuditType } from './entities/audit-event.entity';

@Injectable()
export class AuditService {
  constructor(private readonly em: EntityManager) {}

  /** Records an event in its own flush, so it is kept even when the caller's work then fails. */
  async record(type: AuditType, fields: ConstructorParameters<typeof AuditEvent>[1] = {}): Promise<void> {
    const em = this.em.fork();
    em.persist(new AuditEvent(type, fields));
    await em.flush();
  }

  async forFirm(firmId: string, limit = 200): Promise<AuditEvent[]> {
    return this.em.find(AuditEvent, { firmId }, { orderBy: { createdAt: 'desc' }, limit });
  }
}
