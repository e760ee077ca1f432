import { Alert, Button, CircularProgress, FormControlLabel, Stack, Switch, Typography } from '@mui/material';
import { useMemo, useState } from 'react';
import { useParams } from 'react-router-dom';
import { CautionNotice } from '../components/layout/caution-notice';
import { PageHeading } from '../components/layout/page-heading';
import { actorOf, useMe } from '../features/auth';
import { EDITABLE_STATES, editRefusal, factsOfSheet, WorkflowCode } from '@ampwright/common/review/workflow';
import { CellReview, type ReviewContext, useSheetQueries, WorkflowBar } from '../features/review';
import { AttachmentsPanel, KeyboardHelp, type ReviewSlot, SheetEditor, STATE_LABELS, useSaveAsTemplate, useSheet } from '../features/sheets';

/**
 * A sheet: its review bar, then its cells, edited and evaluated in place by those who may (the
 * preparer's side), read-only for everyone else; the checker sees each cell's queries beside it.
 */
export function SheetPage() {
  const { sheetId = '' } = useParams();
  const { data: me } = useMe();
  const sheet = useSheet(sheetId);
  const queries = useSheetQueries(sheetId);
  const [openOnly, setOpenOnly] = useState(false);
  const [keysOpen, setKeysOpen] = useState(false);
  const saveTemplate = useSaveAsTemplate();
  const s = sheet.data;
  const uid = me?.user.id;
  const review: ReviewContext = useMemo(
    () => ({
      sheetId,
      checking: !!s && s.state === 'with-checker' && s.checker?.id === uid,
      answering: !!s && EDITABLE_STATES.includes(s.state) && s.preparer.id === uid,
    }),
    [sheetId, s, uid],
  );
  // The route composes the editor and the review: each cell's queries are drawn beside it.
  const Review: ReviewSlot = useMemo(
    () =>
      ({ cell, queries: q }) => <CellReview cell={cell} queries={q} ctx={review} />,
    [review],
  );
  if (sheet.isPending) return <CircularProgress aria-label="Loading" />;
  if (sheet.isError) return <Alert severity="error">{sheet.error.message}</Alert>;
  if (!s || !me) return null;
  const mayEdit = me.roles.some((r) => r === 'owner' || r === 'engineer');
  const reviewing = (s.checker?.id === uid || s.approver?.id === uid) && s.preparer.id !== uid;
  // Who may change the cells, and why not: the workflow rulebook the server enforces (only the preparer
  // and the co-preparers the preparer named, never the checker or approver, while the sheet is open).
  const refusal = editRefusal(factsOfSheet(s), actorOf(me));
  const editable = !refusal;
  return (
    <Stack spacing={2}>
      <PageHeading overline={`Sheet ${s.number}`}>{s.title}</PageHeading>
      <WorkflowBar sheet={s} me={me} />
      <Stack direction="row" spacing={1} sx={{ alignItems: 'center', flexWrap: 'wrap' }}>
        <Typography variant="body2" color="text.secondary">
          Version {s.version}
          {s.engineVersion ? ` · engine ${s.engineVersion}` : ''}
        </Typography>
        <Button size="small" href={`/api/sheets/${s.id}/export`} download={`${s.number}.json`}>
          Export as a sheet file
        </Button>
        {mayEdit && (
          <Button size="small" disabled={saveTemplate.isPending} onClick={() => saveTemplate.mutate({ sheetId: s.id })}>
            Save as a template
          </Button>
        )}
        <Button size="small" onClick={() => setKeysOpen(true)} aria-haspopup="dialog">
          Keys
        </Button>
        <FormControlLabel
          control={<Switch size="small" checked={openOnly} onChange={(e) => setOpenOnly(e.target.checked)} />}
          label="Only cells with open queries"
        />
      </Stack>
      {saveTemplate.isSuccess && (
        <Alert severity="success" onClose={() => saveTemplate.reset()}>
          Saved as the firm template “{saveTemplate.data.title}”: new sheets can start from it.
        </Alert>
      )}
      {saveTemplate.isError && (
        <Alert severity="error" onClose={() => saveTemplate.reset()}>
          {saveTemplate.error.message}
        </Alert>
      )}
      {mayEdit && !reviewing && refusal?.code === WorkflowCode.ReadOnly && (
        <Alert severity="info">This sheet is {STATE_LABELS[s.state].toLowerCase()} and can no longer be edited.</Alert>
      )}
      {!reviewing && refusal?.code === WorkflowCode.NotPreparer && (
        <Alert severity="info">{s.preparer.name} prepares this sheet: only they and the co-preparers they name edit it.</Alert>
      )}
      {reviewing && EDITABLE_STATES.includes(s.state) && (
        <Alert severity="info">You review this sheet, so you do not edit it: raise queries on its cells for the preparer.</Alert>
      )}
      {editable && (
        <Typography variant="caption" color="text.secondary">
          Changes are saved and evaluated as you type. F1 (or ? when not typing, or Keys above) lists the keys.
        </Typography>
      )}
      <CautionNotice />
      {queries.isError && <Alert severity="error">The queries could not be loaded: {queries.error.message}</Alert>}
      <SheetEditor
        sheet={s}
        editable={editable}
        queries={queries.data ?? []}
        Review={Review}
        checking={review.checking}
        openOnly={openOnly}
        onShowKeys={() => setKeysOpen(true)}
      />
      <KeyboardHelp open={keysOpen} onClose={() => setKeysOpen(false)} />
      <AttachmentsPanel sheetId={s.id} editable={editable} />
    </Stack>
  );
}
