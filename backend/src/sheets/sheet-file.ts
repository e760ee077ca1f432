import type { SheetFile } from '@ampwright/common';
import type { Project } from '../projects/entities/project.entity';
import type { User } from '../users/entities/user.entity';
import { Cell } from './entities/cell.entity';
import { Sheet } from './entities/sheet.entity';

/** A new sheet and its cells from a sheet file; top-level fields we do not know are kept for export. */
export function sheetFromFile(project: Project, number: string, title: string, file: SheetFile | undefined, preparer: User): { sheet: Sheet; cells: Cell[] } {
  const sheet = new Sheet(project, number, title, preparer);
  if (!file) return { sheet, cells: [] };
  // format and title are the sheet's own columns; everything else we do not know is kept in `extra`.
  const { format, title: fileTitle, settings, cells, ...extra } = file;
  void format;
  void fileTitle;
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
