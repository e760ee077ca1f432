/** A CodeMirror 6 editor for one calc source, kept in step with React's value. */
import { defaultKeymap, history, historyKeymap } from '@codemirror/commands';
import { lintGutter, setDiagnostics } from '@codemirror/lint';
import { EditorState, type Extension } from '@codemirror/state';
import { EditorView, keymap, placeholder as cmPlaceholder } from '@codemirror/view';
import { Box } from '@mui/material';
import { useEffect, useLayoutEffect, useRef } from 'react';
import type { Diagnostic } from '@ampwright/common';
import { monoFont, palette } from '../../../app/theme';
import { calcCompletion, calcHighlighting, calcLanguage, toCmDiagnostics } from './calc-language';
import { KEYBOARD, type SheetCommand } from './keyboard';

/** What the sheet's keys (keyboard.ts) do in this editor; a command left out does nothing here. */
export type EditorKeys = { onCommand?: (command: SheetCommand) => void };

export interface CodeEditorProps extends EditorKeys {
  value: string;
  onChange: (value: string) => void;
  label: string;
  /** Server errors for this exact text (none while the text is being edited). */
  errors?: Diagnostic[];
  warnings?: Diagnostic[];
  scopeNames?: () => { label: string; detail?: string }[];
  autoFocus?: boolean;
  singleLine?: boolean;
  placeholder?: string;
  readOnly?: boolean;
}

const theme = EditorView.theme({
  '&': { fontSize: '13px', backgroundColor: palette.paper, border: `1px solid ${palette.rule}` },
  '&.cm-focused': { outline: `2px solid ${palette.inkLight}` },
  '.cm-content': { fontFamily: monoFont, padding: '6px 0' },
  '.cm-gutters': { backgroundColor: palette.paper, borderRight: `1px solid ${palette.rule}` },
  '.cm-tooltip-autocomplete ul li[aria-selected]': { backgroundColor: palette.ink },
});

/** The one replacement that turns `from` into `to` (their common start and end kept); null when they are equal. */
export function textChange(from: string, to: string): { from: number; to: number; insert: string } | null {
  if (from === to) return null;
  let start = 0;
  while (start < from.length && start < to.length && from[start] === to[start]) start++;
  let end = 0;
  while (end < from.length - start && end < to.length - start && from[from.length - 1 - end] === to[to.length - 1 - end]) end++;
  return { from: start, to: from.length - end, insert: to.slice(start, to.length - end) };
}

export function CodeEditor(props: CodeEditorProps) {
  const host = useRef<HTMLDivElement>(null);
  const view = useRef<EditorView | null>(null);
  const latest = useRef(props);
  // The editor's handlers read the latest props; set after each render, before the browser paints.
  useLayoutEffect(() => {
    latest.current = props;
  });

  useEffect(() => {
    const command = (c: SheetCommand) => () => (latest.current.onCommand?.(c), true);
    const keys = keymap.of([
      ...KEYBOARD.map((k) => ({ key: k.key, run: command(k.command), preventDefault: true })),
      // A one-line field (a check's condition) saves on Enter, where a new line has no place.
      ...(latest.current.singleLine ? [{ key: 'Enter', run: command('saveNow') }] : []),
    ]);
    const extensions: Extension[] = [
      keys,
      history(),
      keymap.of([...defaultKeymap, ...historyKeymap]),
      calcLanguage,
      calcHighlighting,
      calcCompletion(() => latest.current.scopeNames?.() ?? []),
      lintGutter(),
      theme,
      EditorView.lineWrapping,
      EditorView.contentAttributes.of({ 'aria-label': latest.current.label }),
      EditorState.readOnly.of(!!latest.current.readOnly),
      EditorView.updateListener.of((u) => {
        if (u.docChanged) latest.current.onChange(u.state.doc.toString());
      }),
    ];
    if (latest.current.placeholder) extensions.push(cmPlaceholder(latest.current.placeholder));
    view.current = new EditorView({ parent: host.current!, state: EditorState.create({ doc: latest.current.value, extensions }) });
    if (latest.current.autoFocus) view.current.focus();
    return () => view.current?.destroy();
  }, []);

  // A value from outside (the other person's text taken, a restore) replaces what differs, as one change
  // (the cursor stays where it is outside it), before anything else can reach the editor: a keystroke
  // between this render and a later effect would otherwise be overwritten.
  useLayoutEffect(() => {
    const v = view.current;
    if (v) {
      const change = textChange(v.state.doc.toString(), props.value);
      if (change) v.dispatch({ changes: change });
    }
  }, [props.value]);

  useEffect(() => {
    const v = view.current;
    if (!v) return;
    const doc = v.state.doc;
    v.dispatch(setDiagnostics(v.state, [...toCmDiagnostics(doc, props.errors ?? [], 'error'), ...toCmDiagnostics(doc, props.warnings ?? [], 'warning')]));
  }, [props.errors, props.warnings]);

  return <Box ref={host} data-testid="code-editor" sx={{ '& .cm-editor': { maxHeight: 480 } }} />;
}
