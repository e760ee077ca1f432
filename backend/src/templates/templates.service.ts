import { readdirSync, readFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { EntityManager } from '@mikro-orm/core';
import { Injectable } from '@nestjs/common';
import { ConfigService } from '@nestjs/config';
import { parseSheetJson, type SheetFile, type TemplateSummaryDto } from '@ampwright/common';
import type { Environment } from '../config/environment';
import { ErrorCode, RequestException } from '../core/errors/app-exception';
import type { AuthContext } from '../core/guards/auth.guard';
import { User } from '../users/entities/user.entity';
import { Firm } from '../firms/entities/firm.entity';
import { Template } from './entities/template.entity';

export type TemplateSummary = TemplateSummaryDto;

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/;

/**
 * Templates: the built-in ones shipped in templates/ (read once at start-up; each a valid sheet file,
 * with its file name as id), and each firm's own, saved from its sheets (Template, with a uuid).
 */
@Injectable()
export class TemplatesService {
  private readonly builtIn = new Map<string, SheetFile>();

  constructor(
    private readonly em: EntityManager,
    config: ConfigService<Environment, true>,
  ) {
    const dir = config.get('TEMPLATES_DIR', { infer: true }) ?? resolve(__dirname, '..', '..', '..', 'templates');
    for (const file of readdirSync(dir)
      .filter((f) => f.endsWith('.json'))
      .sort()) {
      const parsed = parseSheetJson(readFileSync(join(dir, file), 'utf8'));
      if (!parsed.ok) throw new Error(`template ${file} is not a valid sheet file: ${parsed.problems.map((p) => `${p.path}: ${p.message}`).join('; ')}`);
      this.builtIn.set(file.replace(/\.json$/, ''), parsed.sheet);
    }
  }

  async list(auth: AuthContext): Promise<TemplateSummary[]> {
    const own = await this.em.find(Template, { firm: auth.firm.id }, { orderBy: { title: 'asc' } });
    return [
      ...[...this.builtIn].map(([id, t]) => ({ id, title: t.title, cellCount: t.cells.length, source: 'built-in' as const })),
      ...own.map((t) => ({ id: t.id, title: t.title, cellCount: t.sheet.cells.length, source: 'firm' as const })),
    ];
  }

  async get(auth: AuthContext, id: string): Promise<SheetFile> {
    const builtIn = this.builtIn.get(id);
    if (builtIn) return structuredClone(builtIn);
    const own = UUID.test(id) ? await this.em.findOne(Template, { id, firm: auth.firm.id }) : null;
    if (!own) throw new RequestException(ErrorCode.NotFound, `No template named ${id}.`, { details: [{ field: 'templateId', message: 'no such template' }] });
    return structuredClone(own.sheet);
  }

  async save(auth: AuthContext, title: string, sheet: SheetFile): Promise<TemplateSummary> {
    const t = new Template(this.em.getReference(Firm, auth.firm.id), title, { ...sheet, title }, this.em.getReference(User, auth.user.id));
    await this.em.persist(t).flush();
    return { id: t.id, title: t.title, cellCount: t.sheet.cells.length, source: 'firm' };
  }

  async remove(auth: AuthContext, id: string): Promise<void> {
    const t = await this.em.findOne(Template, { id, firm: auth.firm.id });
    if (!t) throw new RequestException(ErrorCode.NotFound, 'No such template of your firm (built-in templates cannot be removed).');
    await this.em.remove(t).flush();
  }
}
