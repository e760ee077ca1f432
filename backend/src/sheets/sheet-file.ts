import type { SheetFile } from '@ampwright/common';
import type { Project } from '../projects/entities/project.entity';
import type { User } from '../users/entities/user.entity';
import { Cell } from './entities/cell.entity';
import { Sheet } from './entities/sheet.entity';

/** A new sheet and its cells from a sheet file; top-level fields we do not know are kept for export. */
export function sheetFromFile(project: Project, number: string, title: string, file: SheetFile | undefined, preparer: User): { sheet: Sheet; cells: Cell[] } {
  const sheet = new Sheet(project, number, title, preparer);
  if (!file) return { sheet, cells: [] };
  const { format: _format, title: _title, settings, cells, ...extra } = file;
  void _format;
  void _title;
  sheet.settings = (settings as Record<string, unknown>) ?? {};
  sheet.extra = extra;
  return {
    sheet,
    cells: cells.map((c, i) => {
      const { kind, ...fields } = c as Record<string, unknown> & { kind: string };
      return new Cell(sheet, i, kind, fields, preparer);
    }),
  };
}
