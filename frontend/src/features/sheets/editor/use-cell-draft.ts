/**
 * One cell's edit in progress: the draft the user is typing, saved 250 ms after typing stops (so the
 * server's results arrive within about 300 ms), or at once on Mod-Enter. The draft is never thrown
 * away by a failed save: it stays in the editor, the save is retried, and a conflict shows both texts.
 */
import { useCallback, useEffect, useLayoutEffect, useMemo, useRef, useState } from 'react';
import { useBeforeUnload } from 'react-router-dom';
import type { CellDto } from '@ampwright/common';
import { cellSchema } from '@ampwright/common/sheet/sheet-format';
import { cellBody, EditConflict, sameCell, useCellChange, type CellBody } from '../api/change-sheet';

export const SAVE_DELAY_MS = 250;

export type SaveState = 'saved' | 'unsaved' | 'saving' | 'invalid' | 'failed' | 'conflict';

export function useCellDraft(sheetId: string, cell: CellDto) {
  const change = useCellChange(sheetId);
  // Stable (useMutation's result is a new object each render), so flush is, and the cell's header is not drawn again.
  const { mutate } = change;
  // The same object while the cell's content is (mergeSave keeps its fields), so what is drawn from it is not drawn again.
  const { kind, fields } = cell;
  const server = useMemo(() => cellBody({ kind, fields }), [kind, fields]);
  const [draft, setDraftState] = useState<CellBody | null>(null);
  const [conflict, setConflict] = useState<EditConflict | null>(null);
  const [invalid, setInvalid] = useState<string | null>(null);
  const draftRef = useRef<CellBody | null>(null);
  // The content the server holds (or will hold, once the queued saves are through) for this cell.
  const base = useRef<CellBody>(server);
  // Follows the server while nothing is being edited or saved; read by this render's comparisons.
  // eslint-disable-next-line react-hooks/refs -- the base must be current within this render, not after it
  if (draft === null && !change.isPending && !sameCell(base.current, server)) base.current = server;
  const timer = useRef<ReturnType<typeof setTimeout>>(undefined);
  // The cell as this render shows it, and a saved draft waiting for the cell on screen to show it. The
  // save's answer is merged into the cache before the save settles, but this component may still be
  // given the cell as it was: dropping the draft then would show the old text for a render (the editor
  // taking it, and the cursor moved) before the new one arrives.
  const shown = useRef(server);
  useLayoutEffect(() => {
    shown.current = server;
  });
  const [landed, setLanded] = useState<CellBody | null>(null);

  const setDraft = (body: CellBody | null) => {
    draftRef.current = body;
    setDraftState(body);
  };

  // A saved draft is dropped once the cell given to this component holds it (and nothing was typed since),
  // in this render (React's way of adjusting state to a new prop), so no render shows the old text.
  if (landed && sameCell(server, landed)) {
    setLanded(null);
    if (draft && sameCell(draft, landed)) setDraftState(null);
  }
  useLayoutEffect(() => {
    draftRef.current = draft;
  }, [draft]);

  const flush = useCallback(() => {
    clearTimeout(timer.current);
    const body = draftRef.current;
    if (!body || conflict) return;
    const parsed = cellSchema.safeParse(body);
    if (!parsed.success) {
      setInvalid(parsed.error.issues.map((i) => i.message).join('; '));
      return;
    }
    setInvalid(null);
    if (sameCell(body, base.current)) {
      setDraft(null);
      return;
    }
    const from = base.current;
    base.current = body;
    mutate(
      { type: 'update', cellId: cell.id, cell: body, base: from },
      {
        onSuccess: () => {
          if (!draftRef.current || !sameCell(draftRef.current, body)) return;
          if (sameCell(shown.current, body)) setDraft(null);
          else setLanded(body);
        },
        onError: (err) => {
          base.current = from;
          if (err instanceof EditConflict) setConflict(err);
        },
      },
    );
  }, [cell.id, mutate, conflict]);

  const edit = useCallback(
    (body: CellBody) => {
      setDraft(body);
      clearTimeout(timer.current);
      timer.current = setTimeout(flush, SAVE_DELAY_MS);
    },
    [flush],
  );

  useEffect(() => () => clearTimeout(timer.current), []);
  useBeforeUnload(
    useCallback((e) => {
      if (draftRef.current) e.preventDefault();
    }, []),
  );

  /** Settle a conflict: keep the user's text (saved over theirs) or take theirs. */
  const resolve = (keep: 'mine' | 'theirs') => {
    const theirs = conflict?.theirs;
    setConflict(null);
    change.reset();
    if (theirs) base.current = cellBody(theirs);
    if (keep === 'theirs') setDraft(null);
    else setTimeout(flush, 0);
  };

  const unsaved = draft !== null && !(landed && sameCell(draft, landed));
  const state: SaveState = conflict
    ? 'conflict'
    : invalid
      ? 'invalid'
      : change.isPending
        ? 'saving'
        : change.isError
          ? 'failed'
          : unsaved
            ? 'unsaved'
            : 'saved';
  return { value: draft ?? server, dirty: draft !== null, edit, flush, state, error: change.error, invalid, conflict, resolve, retry: flush };
}
