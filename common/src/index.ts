export * from './sheet/sheet-format';
export { ENGINE_VERSION } from './version';
export type { HealthReport, Reachability } from './api/health';
export { evaluateSheet, unevaluatedResults, definitionsOf, displayOptionsOf, type EvaluationCache, type SheetEvaluation } from './cells/evaluate-sheet';
export type * from './cells/types';
export { formatValue, formatNumber, DEFAULT_DISPLAY } from './units/display';
export { CIRCUIT_FUNCTION_NAMES } from './circuits/functions';
export { analyticSolution, numericSolution, dampingOf } from './circuits/transient';
export { toContractJson, type ContractOutput } from './cells/contract';
export { gridValue, readPastedBlock, type GridValue, type PastedBlock } from './sheet/pasted-block';
export { readDecimal, type DecimalMark } from './sheet/decimal';
export { cellJson, sealCell } from './sheet/sealed-cells';
export { csvToTableCell, describeDetected, type CsvDetected, type CsvTableResult } from './sheet/csv-table';
export type {
  AttachmentDto,
  CoPreparersBody,
  ProjectPeopleDto,
  CellDto,
  ProjectDto,
  SaveResultDto,
  ImportResultDto,
  SheetContentsDto,
  SheetDto,
  SheetState,
  SheetSummaryDto,
  TemplateSummaryDto,
} from './api/projects';
export { MAX_PASSWORD_BYTES, MIN_PASSWORD_LENGTH, type AuditEventDto } from './api/accounts';
export { PALETTE } from './plot/palette';
export {
  CELL_KIND_REGISTRY,
  KIND_LABELS,
  kindLabel,
  kindFacts,
  newCellFields,
  presentCell,
  cellInputs,
  resultFigures,
  type CellKindDefinition,
  type CellOf,
  type FieldsOf,
  type ResultOf,
} from './cells/kinds';
export {
  checkPresentation,
  transientSummary,
  CAUTION_UTILISATION,
  type BlockOf,
  type BlockType,
  type CheckPresentation,
  type PresentationBlock,
  type SummaryRow,
  type Tone,
} from './cells/presentation';
export type { QueryDto, QueryMessageDto, QueryStatus, RevisionSummaryDto, DiffDto, HistoryEventDto, NotificationDto } from './api/review';
export { diffCells, type CellDiff, type SnapshotCell } from './review/diff';
export { revisionCode, canonicalJson } from './review/revision-code';
export type { PackageStatusDto, PortalRevisionDto, VerdictDto, CertificateDto, PackageSettingsDto } from './api/packages';
export { runWithDeadline } from './language/deadline';
export { parseNote, linkText, type NoteBlock, type NoteInline } from './notes/markdown';
export {
  ROLES,
  MEMBER_ROLES,
  SHEET_EDITORS,
  STATE_WORDS,
  EDITABLE_STATES,
  MOVES,
  WorkflowCode,
  factsOfSheet,
  allowedMoves,
  checkerRefusal,
  editRefusal,
  independenceRefusal,
  stateRefusal,
  isEditable,
  mayEdit,
  refusalOf,
  type Actor,
  type Person,
  type Refusal,
  type Role,
  type SheetFacts,
  type WorkflowMove,
} from './review/workflow';
export { CAUTION_TEXT, CAUTION_SHORT } from './api/cautions';
export {
  ErrorCode,
  AuthErrorCode,
  MemberErrorCode,
  InvitationErrorCode,
  ProjectErrorCode,
  PackageErrorCode,
  SheetErrorCode,
  EvaluationErrorCode,
} from './api/error-codes';
export type { Plot, PlotAxis, PlotData } from './plot/charts';
export { ELEMENT_VALUES, NETWORK_CONVENTIONS } from './cells/network-labels';
export { prepare as prepareNetwork, steadyState, frequencyScan, harmonicFlow } from './network/ac';
export { networkTransient } from './network/transient';
export type { Network, NetworkElement } from './network/model';
