/** The command-line contract of PRODUCT.md: the JSON `npm run calc` prints, and its exit status. */
import type { SheetEvaluation } from './evaluate-sheet';
import type { CellResult } from './types';

export interface ContractOutput {
  cells: Record<string, unknown>[];
}

function contractCell(r: CellResult): Record<string, unknown> {
  const base = { kind: r.kind, status: r.status };
  switch (r.kind) {
    case 'calc':
      return {
        ...base,
        values: Object.fromEntries(Object.entries(r.values).map(([k, v]) => [k, { si: v.si, display: v.display }])),
        errors: r.errors,
        warnings: r.warnings,
      };
    case 'check':
      return { ...base, pass: r.pass, utilization: r.utilization, errors: r.errors, warnings: r.warnings };
    case 'table':
      return { ...base, values: Object.fromEntries(Object.entries(r.values).map(([k, v]) => [k, { si: v.si, display: v.display }])), errors: r.errors };
    default: {
      const { warnings, errors, ...rest } = r as CellResult;
      return { ...rest, errors, warnings };
    }
  }
}

export function toContractJson(evaluation: SheetEvaluation): { output: ContractOutput; exitCode: 0 | 1 } {
  const cells = evaluation.cells.map(contractCell);
  const failed = evaluation.cells.some((c) => c.status !== 'ok' || (c.kind === 'check' && c.pass !== true));
  return { output: { cells }, exitCode: failed ? 1 : 0 };
}
