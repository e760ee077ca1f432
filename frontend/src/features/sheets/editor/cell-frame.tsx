/** One cell on the sheet: its header with the save state and tools, its editor or source, and its results. */
import { Alert, Box, Button, Chip, Menu, MenuItem, Paper, Stack, Tooltip, Typography } from '@mui/material';
import { memo, useDeferredValue, useRef, useState, type ComponentType } from 'react';
import type { CellDto, CellKind, CellResult, QueryDto } from '@ampwright/common';
import { palette } from '../../../app/theme';
import { cellInputs, KIND_LABELS, kindFacts, kindLabel } from '@ampwright/common/cells/kinds';
import { CellPresentation, SourceText } from '../components/cell-results';
import { commandOf, type SheetCommand } from './keyboard';
import { KIND_EDITORS, type KindEditorProps } from './cell-editors';
import { useCellDraft, type SaveState } from './use-cell-draft';
import { useCellPreview, usePreviewDraft } from '../preview/use-sheet-preview';
import { useOnScreen } from './use-on-screen';

const SAVE_LABELS: Record<SaveState, string> = {
  saved: 'Saved',
  unsaved: 'Editing — not saved yet',
  saving: 'Saving and evaluating…',
  invalid: 'Not saved: fix the cell',
  failed: 'Not saved',
  conflict: 'Conflict',
};

export interface CellActions {
  activate: (id: string | null) => void;
  neighbour: (id: string, step: -1 | 1) => void;
  /** Opens the keyboard help. */
  showKeys: () => void;
  add: (position: number, kind: CellKind) => void;
  importCsv: (position: number) => void;
  move: (id: string, position: number) => void;
  remove: (id: string) => void;
  scopeBefore: (position: number) => { label: string; detail?: string }[];
}

interface CellFrameProps {
  sheetId: string;
  cell: CellDto;
  index: number;
  count: number;
  active: boolean;
  editable: boolean;
  actions: CellActions;
  queries: QueryDto[];
  /** What the route puts beside each cell for its review (the queries); stable, so cells stay memoised. */
  Review?: ReviewSlot;
  /** Marks a cell changed after the checker agreed it (shown to the checker). */
  markChangedAfterAgreement: boolean;
}

/** A component the route gives the editor to draw a cell's review; the editor does not know the review feature. */
export type ReviewSlot = ComponentType<{ cell: CellDto; queries: QueryDto[] }>;

export function AddCellMenu({ onAdd, onImportCsv, label = 'Add a cell' }: { onAdd: (kind: CellKind) => void; onImportCsv: () => void; label?: string }) {
  const [anchor, setAnchor] = useState<HTMLElement | null>(null);
  return (
    <>
      <Button size="small" onClick={(e) => setAnchor(e.currentTarget)} aria-haspopup="menu">
        {label}
      </Button>
      {/* Mounted only while open: a closed menu in each of a hundred cells is work for every render of them. */}
      {anchor && (
        <Menu anchorEl={anchor} open onClose={() => setAnchor(null)}>
          {(Object.keys(KIND_LABELS) as CellKind[]).map((kind) => (
            <MenuItem key={kind} onClick={() => (setAnchor(null), onAdd(kind))}>
              {KIND_LABELS[kind]}
            </MenuItem>
          ))}
          <MenuItem onClick={() => (setAnchor(null), onImportCsv())}>Table from a CSV file…</MenuItem>
        </Menu>
      )}
    </>
  );
}

function CellFrameInner({ sheetId, cell, index, count, active, editable, actions, queries, Review, markChangedAfterAgreement }: CellFrameProps) {
  const d = useCellDraft(sheetId, cell);
  // The draft is evaluated in the browser as it is typed (preview/); the parts below that show a result subscribe to it themselves.
  usePreviewDraft(cell.id, d.dirty ? d.value : null);
  const r = cell.results;
  const Editor = KIND_EDITORS[cell.kind as CellKind] as (typeof KIND_EDITORS)[CellKind] | undefined;
  const editing = editable && active && !!Editor;
  const stale = d.dirty || d.state === 'saving';
  // The cell's inputs as text (calc source, check condition, a sweep's or a transient's settings); '' where the content is the presentation.
  const inputs = cellInputs(cell.kind, d.value);
  // The presentation follows the draft (a note's preview) without holding up typing.
  const fields = useDeferredValue(d.value);
  const { previewWhileEditing } = kindFacts(cell.kind);
  // A click on the cell's text opens its editor, where it may be edited.
  const open = editable && Editor ? () => actions.activate(cell.id) : undefined;
  // The sheet's keys (keyboard.ts), from the code editor or from anywhere else in the cell.
  const onCommand = (command: SheetCommand) => {
    if (command === 'keysHelp') return actions.showKeys();
    if (!editable) return;
    d.flush();
    if (command === 'nextCell' || command === 'previousCell') actions.neighbour(cell.id, command === 'nextCell' ? 1 : -1);
    else if (command === 'moveDown' && index < count - 1) actions.move(cell.id, index + 1);
    else if (command === 'moveUp' && index > 0) actions.move(cell.id, index - 1);
    else if (command === 'newCalcBelow') actions.add(index + 1, 'calc');
  };
  const onKeyDown = (e: React.KeyboardEvent) => {
    const command = e.defaultPrevented ? undefined : commandOf(e);
    if (!command) return;
    e.preventDefault();
    onCommand(command);
  };
  const failed = r?.status === 'error';
  const checkFailed = r?.kind === 'check' && r.pass === false;
  return (
    <Paper
      component="section"
      aria-label={`Cell ${index + 1}: ${kindLabel(cell.kind)}`}
      data-cell-id={cell.id}
      onKeyDown={onKeyDown}
      sx={{
        p: 2,
        borderLeft: `3px solid ${failed || checkFailed ? palette.fail : cell.kind === 'check' ? palette.copper : palette.ink}`,
        ...(cell.changedAfterAgreement && markChangedAfterAgreement ? { bgcolor: '#fff6e5' } : {}),
        outline: active ? `1px solid ${palette.inkLight}` : undefined,
        contentVisibility: active ? undefined : 'auto',
        containIntrinsicSize: 'auto 160px',
      }}
    >
      <CellHeader
        cellId={cell.id}
        kind={cell.kind}
        index={index}
        count={count}
        active={active}
        editable={editable}
        hasEditor={!!Editor}
        state={d.state}
        flush={d.flush}
        actions={actions}
      />
      {d.conflict && (
        <Alert
          severity="warning"
          sx={{ mb: 1 }}
          action={
            <Stack direction="row" spacing={1}>
              <Button size="small" onClick={() => d.resolve('mine')}>
                Keep mine
              </Button>
              <Button size="small" onClick={() => d.resolve('theirs')}>
                Take theirs
              </Button>
            </Stack>
          }
        >
          {d.conflict.message}
          {d.conflict.theirs && (
            <SourceText text={cellInputs(d.conflict.theirs.kind, d.conflict.theirs.fields) || String(d.conflict.theirs.fields.text ?? '')} />
          )}
        </Alert>
      )}
      {d.state === 'failed' && !d.conflict && (
        <Alert
          severity="error"
          sx={{ mb: 1 }}
          action={
            <Button size="small" onClick={d.retry}>
              Retry
            </Button>
          }
        >
          Your change was not saved: {d.error?.message}. The text is kept here.
        </Alert>
      )}
      {d.invalid && (
        <Alert severity="error" sx={{ mb: 1 }}>
          {d.invalid}
        </Alert>
      )}
      {editing ? (
        <PreviewedEditor
          Editor={Editor}
          cellId={cell.id}
          stored={cell.results}
          dirty={d.dirty}
          value={d.value}
          onChange={d.edit}
          scopeNames={() => actions.scopeBefore(index)}
          label={`Cell ${index + 1}`}
          onCommand={onCommand}
        />
      ) : (
        inputs && (
          <Box onClick={open} sx={{ cursor: open && 'text' }}>
            <SourceText text={inputs} />
          </Box>
        )
      )}
      {(!editing || previewWhileEditing) && (
        <CellOutput
          cellId={cell.id}
          kind={cell.kind}
          fields={fields}
          stored={cell.results}
          active={active}
          dimmed={stale && !!inputs}
          busy={stale}
          // A note, a table or a figure is its presentation: a click on it edits it.
          onOpen={inputs || editing ? undefined : open}
        />
      )}
      {Review && <Review cell={cell} queries={queries} />}
    </Paper>
  );
}

export const CellFrame = memo(CellFrameInner);

/**
 * The cell's header: its number and kind, its save state and its tools. Apart from the cell's content and
 * results, so a new result (a keystroke's preview, a save's answer for a hundred cells) does not draw it again.
 */
const CellHeader = memo(function CellHeader({
  cellId,
  kind,
  index,
  count,
  active,
  editable,
  hasEditor,
  state,
  flush,
  actions,
}: {
  cellId: string;
  kind: string;
  index: number;
  count: number;
  active: boolean;
  editable: boolean;
  hasEditor: boolean;
  state: SaveState;
  flush: () => void;
  actions: CellActions;
}) {
  return (
    <Stack direction="row" spacing={1} sx={{ alignItems: 'center', mb: 1, flexWrap: 'wrap' }}>
      <Typography variant="overline" color="text.secondary">
        {index + 1} · {kindLabel(kind)}
      </Typography>
      {editable && (
        <Chip
          size="small"
          variant="outlined"
          label={SAVE_LABELS[state]}
          color={state === 'saved' ? 'default' : state === 'saving' || state === 'unsaved' ? 'primary' : 'error'}
          // A live region: a screen reader hears the cell's save state as it changes.
          role="status"
          aria-label={`Cell ${index + 1}: ${SAVE_LABELS[state]}`}
          data-testid="save-state"
        />
      )}
      <Box sx={{ flex: 1 }} />
      {editable && (
        <>
          {!active && hasEditor && (
            <Button size="small" onClick={() => actions.activate(cellId)}>
              Edit
            </Button>
          )}
          {active && (
            <Button size="small" onClick={() => (flush(), actions.activate(null))}>
              Done
            </Button>
          )}
          <Tooltip title="Move up">
            <span>
              <Button size="small" disabled={index === 0} onClick={() => actions.move(cellId, index - 1)} aria-label="Move up">
                ↑
              </Button>
            </span>
          </Tooltip>
          <Tooltip title="Move down">
            <span>
              <Button size="small" disabled={index === count - 1} onClick={() => actions.move(cellId, index + 1)} aria-label="Move down">
                ↓
              </Button>
            </span>
          </Tooltip>
          <AddCellMenu label="Add below" onAdd={(k) => actions.add(index + 1, k)} onImportCsv={() => actions.importCsv(index + 1)} />
          <Button size="small" color="error" onClick={() => actions.remove(cellId)}>
            Delete
          </Button>
        </>
      )}
    </Stack>
  );
});

/** The kind's editor, with the problems of the preview underlined while the draft is ahead of the server. */
function PreviewedEditor({
  Editor,
  cellId,
  stored,
  dirty,
  ...props
}: Omit<KindEditorProps, 'errors' | 'warnings'> & {
  Editor: (p: KindEditorProps) => React.ReactElement;
  cellId: string;
  stored: CellResult | null;
  dirty: boolean;
}) {
  const view = useCellPreview(cellId, stored);
  const known = !dirty || view.preview;
  return <Editor {...props} errors={known ? (view.result?.errors ?? []) : []} warnings={known ? (view.result?.warnings ?? []) : []} />;
}

/**
 * What the cell shows under its inputs: the preview's result while it is ahead of the stored one, else the stored
 * one; and a stored result that differs from the preview, said. Only this part follows the preview, so a
 * change to a hundred cells' results draws a hundred of these, not a hundred cells. Off screen it follows in
 * the background (a deferred render that gives way to typing), so the cells being looked at are not held up.
 */
const CellOutput = memo(function CellOutput({
  cellId,
  kind,
  fields,
  stored,
  active,
  dimmed,
  busy,
  onOpen,
}: {
  cellId: string;
  kind: string;
  fields: Record<string, unknown>;
  stored: CellResult | null;
  active: boolean;
  dimmed: boolean;
  busy: boolean;
  onOpen?: () => void;
}) {
  const latest = useCellPreview(cellId, stored);
  const box = useRef<HTMLElement>(null);
  const onScreen = useOnScreen(box);
  const deferred = useDeferredValue(latest);
  const view = onScreen || active ? latest : deferred;
  return (
    <>
      {view.preview && (
        <Typography
          variant="caption"
          title="Evaluated in your browser as you type; the server's stored result replaces it once saved"
          sx={{ display: 'inline-block', mt: 1, px: 0.75, border: `1px solid ${palette.copper}`, borderRadius: 2, color: palette.copper }}
          data-testid="preview-mark"
        >
          Preview
        </Typography>
      )}
      {view.differs && (
        <Alert severity="warning" sx={{ mt: 1 }} data-testid="preview-differs">
          The server's stored result differs from the preview shown while you typed; the stored result stands. {view.differs}
        </Alert>
      )}
      <Box
        ref={box}
        onClick={onOpen}
        sx={{ opacity: dimmed && !view.preview ? 0.55 : 1, transition: 'opacity 120ms', mt: 1, cursor: onOpen ? 'text' : undefined }}
        aria-busy={busy && !view.preview}
        data-testid="cell-results"
      >
        <CellPresentation kind={kind} fields={fields} result={view.result} />
      </Box>
    </>
  );
});
