import { readdirSync, readFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { HttpStatus, Injectable } from '@nestjs/common';
import { parseSheetJson, type SheetFile, type TemplateSummaryDto } from '@ampwright/common';
import { AppException, ErrorCode } from '../core/errors/app-exception';

export type TemplateSummary = TemplateSummaryDto;

/** The sheet templates shipped in templates/ (read once at start-up; each is a valid sheet file). */
@Injectable()
export class TemplatesService {
  private readonly templates = new Map<string, SheetFile>();

  constructor() {
    const dir = process.env.TEMPLATES_DIR ?? resolve(__dirname, '..', '..', '..', 'templates');
    for (const file of readdirSync(dir).filter((f) => f.endsWith('.json')).sort()) {
      const parsed = parseSheetJson(readFileSync(join(dir, file), 'utf8'));
      if (!parsed.ok) throw new Error(`template ${file} is not a valid sheet file: ${parsed.problems.map((p) => `${p.path}: ${p.message}`).join('; ')}`);
      this.templates.set(file.replace(/\.json$/, ''), parsed.sheet);
    }
  }

  list(): TemplateSummary[] {
    return [...this.templates].map(([id, t]) => ({ id, title: t.title, cellCount: t.cells.length }));
  }

  get(id: string): SheetFile {
    const t = this.templates.get(id);
    if (!t) throw new AppException(ErrorCode.NotFound, `No template named ${id}.`, HttpStatus.NOT_FOUND, [{ field: 'templateId', message: 'no such template' }]);
    return structuredClone(t);
  }
}
