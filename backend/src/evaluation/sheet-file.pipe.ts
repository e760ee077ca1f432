import { Injectable, PipeTransform } from '@nestjs/common';
import { parseSheetFile, type SheetFile } from '@ampwright/common';
import { ErrorCode, RequestException } from '../core/errors/app-exception';

/** Validates a body against the sheet file format (the shared schema in common/), field by field. */
@Injectable()
export class SheetFilePipe implements PipeTransform<unknown, SheetFile> {
  transform(value: unknown): SheetFile {
    const result = parseSheetFile(value);
    if (result.ok) return result.sheet;
    const details = result.problems.map((p) => ({ field: p.path, message: p.message }));
    throw new RequestException(ErrorCode.ValidationFailed, `The sheet is not valid: ${details.map((d) => `${d.field}: ${d.message}`).join('; ')}`, {
      details,
    });
  }
}
