/** Where the sheet is in its review, and the next step for whoever may take it. */
import { Alert, Box, Button, Chip, MenuItem, Paper, Stack, TextField, Typography } from '@mui/material';
import { useState } from 'react';
import { Link } from 'react-router-dom';
import type { SheetDto } from '@ampwright/common';
import { allowedMoves, factsOfSheet, isEditable, refusalOf, WorkflowCode } from '@ampwright/common/review/workflow';
import { actorOf, type Me } from '../../auth';
import { useMembers } from '../../members';
import { STATE_LABELS } from '../../sheets';
import { useSheetAction, type SheetAction } from '../api/sheet-action';
import { useRequestCheck } from '../api/request-check';
import { useCoPreparers } from '../api/set-co-preparers';

function RequestCheck({ sheet, onDone }: { sheet: SheetDto; onDone: () => void }) {
  const members = useMembers();
  const request = useRequestCheck(sheet.id);
  const [checkerId, setChecker] = useState(sheet.checker?.id ?? '');
  const [approverId, setApprover] = useState(sheet.approver?.id ?? '');
  // Independent checking: nobody who prepared or edited this revision checks or approves it, and the
  // approver is not the checker (the server enforces the same rules).
  const independent = (members.data ?? []).filter((m) => !sheet.authorIds.includes(m.user.id));
  const checkers = independent.filter((m) => m.roles.includes('checker') && m.user.id !== approverId);
  const approvers = independent.filter((m) => m.roles.includes('approver') && m.user.id !== checkerId);
  const fieldError = (f: string) =>
    request.error && 'details' in request.error
      ? (request.error as { details: { field?: string; message: string }[] }).details.find((d) => d.field === f)?.message
      : undefined;
  return (
    <Stack
      direction={{ xs: 'column', sm: 'row' }}
      spacing={1.5}
      sx={{ alignItems: { sm: 'flex-start' }, mt: 1 }}
      component="form"
      onSubmit={(e) => (e.preventDefault(), request.mutate({ checkerId, ...(approverId ? { approverId } : {}) }, { onSuccess: onDone }))}
    >
      <TextField
        select
        size="small"
        label="Checker"
        value={checkerId}
        onChange={(e) => setChecker(e.target.value)}
        sx={{ minWidth: 220 }}
        required
        error={!!fieldError('checkerId')}
        helperText={fieldError('checkerId') ?? 'Nobody who prepared or edited this revision'}
      >
        {checkers.map((m) => (
          <MenuItem key={m.user.id} value={m.user.id}>
            {m.user.name}
          </MenuItem>
        ))}
      </TextField>
      <TextField
        select
        size="small"
        label="Approver (optional)"
        value={approverId}
        onChange={(e) => setApprover(e.target.value)}
        sx={{ minWidth: 220 }}
        helperText={fieldError('approverId') ?? 'Not the checker; any approver if left empty'}
      >
        <MenuItem value="">Any approver</MenuItem>
        {approvers.map((m) => (
          <MenuItem key={m.user.id} value={m.user.id}>
            {m.user.name}
          </MenuItem>
        ))}
      </TextField>
      <Button type="submit" variant="contained" disabled={!checkerId || request.isPending}>
        Send for checking
      </Button>
      <Button onClick={onDone}>Cancel</Button>
      {request.isError && !fieldError('checkerId') && <Alert severity="error">{request.error.message}</Alert>}
    </Stack>
  );
}

/** The preparer's list of co-preparers: engineers of the firm who may edit this revision. */
function CoPreparers({ sheet, onDone }: { sheet: SheetDto; onDone: () => void }) {
  const members = useMembers();
  const save = useCoPreparers(sheet.id);
  const [chosen, setChosen] = useState<string[]>(sheet.coPreparers.map((p) => p.id));
  const engineers = (members.data ?? []).filter(
    (m) => m.roles.includes('engineer') && m.user.id !== sheet.preparer.id && m.user.id !== sheet.checker?.id && m.user.id !== sheet.approver?.id,
  );
  return (
    <Stack
      direction={{ xs: 'column', sm: 'row' }}
      spacing={1.5}
      sx={{ alignItems: { sm: 'flex-start' }, mt: 1 }}
      component="form"
      onSubmit={(e) => (e.preventDefault(), save.mutate({ userIds: chosen }, { onSuccess: onDone }))}
    >
      <TextField
        select
        size="small"
        label="Co-preparers"
        value={chosen}
        onChange={(e) => setChosen(typeof e.target.value === 'string' ? e.target.value.split(',') : (e.target.value as string[]))}
        slotProps={{ select: { multiple: true } }}
        sx={{ minWidth: 260 }}
        helperText="They may edit this revision, and then cannot check or approve it"
      >
        {engineers.map((m) => (
          <MenuItem key={m.user.id} value={m.user.id}>
            {m.user.name}
          </MenuItem>
        ))}
      </TextField>
      <Button type="submit" variant="contained" disabled={save.isPending}>
        Save co-preparers
      </Button>
      <Button onClick={onDone}>Cancel</Button>
      {save.isError && <Alert severity="error">{save.error.message}</Alert>}
    </Stack>
  );
}

export function WorkflowBar({ sheet, me }: { sheet: SheetDto; me: Me }) {
  const action = useSheetAction(sheet.id);
  const [asking, setAsking] = useState(false);
  const [naming, setNaming] = useState(false);
  const [returning, setReturning] = useState(false);
  const [note, setNote] = useState('');
  // The rulebook the server enforces says which moves to offer (common/src/review/workflow.ts).
  const facts = factsOfSheet(sheet);
  const actor = actorOf(me);
  const may = new Set(allowedMoves(facts, actor));
  // Pass is shown to the checker while queries are open, disabled, so they see what stands in the way.
  const passRefusal = refusalOf('pass', facts, actor);
  const showPass = !passRefusal || passRefusal.code === WorkflowCode.OpenQueries;
  const isPreparer = sheet.preparer.id === me.user.id;
  const act = (a: SheetAction, n?: string) => action.mutate({ action: a, note: n });
  const issued = sheet.state === 'issued';
  return (
    <Paper component="section" aria-label="Review" sx={{ p: 1.5 }}>
      <Stack direction="row" spacing={1} sx={{ alignItems: 'center', flexWrap: 'wrap', rowGap: 1 }}>
        <Chip
          label={STATE_LABELS[sheet.state]}
          color={issued ? 'success' : sheet.state === 'with-checker' ? 'secondary' : 'default'}
          data-testid="sheet-state"
        />
        <Typography variant="body2">
          Revision {sheet.revisionCode}
          {issued ? '' : ' (draft)'}
        </Typography>
        <Typography variant="body2" color="text.secondary">
          Prepared by {sheet.preparer.name}
          {sheet.coPreparers.length ? ` with ${sheet.coPreparers.map((p) => p.name).join(', ')}` : ''}
          {sheet.checker ? ` · checker ${sheet.checker.name}` : ''}
          {sheet.approver ? ` · approver ${sheet.approver.name}` : ''}
        </Typography>
        {sheet.openQueries > 0 && (
          <Chip size="small" color="warning" label={`${sheet.openQueries} open ${sheet.openQueries === 1 ? 'query' : 'queries'}`} data-testid="open-queries" />
        )}
        <Box sx={{ flex: 1 }} />
        <Button size="small" component={Link} to="history">
          History and revisions
        </Button>
        {isEditable(sheet.state) && isPreparer && !naming && (
          <Button size="small" onClick={() => setNaming(true)}>
            Co-preparers
          </Button>
        )}
        {may.has('request-check') && !asking && (
          <Button variant="contained" size="small" onClick={() => setAsking(true)}>
            Ask for a check
          </Button>
        )}
        {may.has('return') && (
          <Button size="small" variant="outlined" onClick={() => setReturning(true)}>
            Return to the preparer
          </Button>
        )}
        {showPass && (
          <Button size="small" variant="contained" color="success" disabled={!!passRefusal} onClick={() => act('pass')} title={passRefusal?.message}>
            Pass the check
          </Button>
        )}
        {may.has('approve') && (
          <Button size="small" variant="contained" onClick={() => act('approve')}>
            Approve
          </Button>
        )}
        {may.has('return-to-checker') && (
          <Button size="small" variant="outlined" onClick={() => act('return-to-checker')}>
            Return to the checker
          </Button>
        )}
        {may.has('issue') && (
          <Button size="small" variant="contained" color="secondary" onClick={() => act('issue')}>
            Issue revision {sheet.revisionCode}
          </Button>
        )}
        {may.has('new-revision') && (
          <Button size="small" variant="outlined" onClick={() => act('new-revision')}>
            Start the next revision
          </Button>
        )}
      </Stack>
      {naming && <CoPreparers sheet={sheet} onDone={() => setNaming(false)} />}
      {asking && <RequestCheck sheet={sheet} onDone={() => setAsking(false)} />}
      {returning && (
        <Stack direction="row" spacing={1} sx={{ mt: 1 }}>
          <TextField size="small" label="Why (optional)" value={note} onChange={(e) => setNote(e.target.value)} sx={{ flex: 1 }} />
          <Button variant="contained" onClick={() => (act('return', note.trim() || undefined), setReturning(false))}>
            Return
          </Button>
          <Button onClick={() => setReturning(false)}>Cancel</Button>
        </Stack>
      )}
      {action.isError && (
        <Alert severity="error" sx={{ mt: 1 }} onClose={() => action.reset()}>
          {action.error.message}
        </Alert>
      )}
    </Paper>
  );
}
