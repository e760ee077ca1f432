/** Beside a cell: its queries as threads, and for the checker the means to raise, close and agree. */
import { Alert, Box, Button, Chip, Stack, TextField, Typography } from '@mui/material';
import { useState } from 'react';
import type { CellDto, QueryDto } from '@ampwright/common';
import { palette } from '../../../app/theme';
import { useAgreement } from '../api/set-agreement';
import { useCloseQuery } from '../api/close-query';
import { useRaiseQuery } from '../api/raise-query';
import { useReply } from '../api/reply-to-query';

export interface ReviewContext {
  sheetId: string;
  /** The signed-in person is the sheet's assigned checker and the sheet is with them. */
  checking: boolean;
  /** The signed-in person prepared the sheet and it is still open to answers. */
  answering: boolean;
}

const STATUS_COLOUR = { open: 'warning', answered: 'info', closed: 'default' } as const;

function Thread({ q, ctx }: { q: QueryDto; ctx: ReviewContext }) {
  const reply = useReply(ctx.sheetId);
  const close = useCloseQuery(ctx.sheetId);
  const [text, setText] = useState('');
  const mayReply = q.status !== 'closed' && (ctx.checking || ctx.answering);
  return (
    <Box data-testid="query" sx={{ borderLeft: `3px solid ${q.status === 'closed' ? palette.rule : palette.caution}`, pl: 1.5, py: 0.5 }}>
      <Stack direction="row" spacing={1} sx={{ alignItems: 'center' }}>
        <Chip
          size="small"
          color={STATUS_COLOUR[q.status]}
          label={q.status === 'open' ? 'Open' : q.status === 'answered' ? 'Answered' : 'Closed'}
          data-testid="query-status"
        />
        <Typography variant="caption" color="text.secondary">
          {q.line ? `Line ${q.line} · ` : ''}raised by {q.raisedBy}
          {q.closedBy ? ` · closed by ${q.closedBy}` : ''}
        </Typography>
      </Stack>
      {q.messages.map((m) => (
        <Typography key={m.id} variant="body2" sx={{ mt: 0.5 }}>
          <strong>{m.author}:</strong> {m.text}
        </Typography>
      ))}
      {mayReply && (
        <Stack direction="row" spacing={1} sx={{ mt: 0.5 }}>
          <TextField size="small" label={ctx.answering ? 'Answer' : 'Reply'} value={text} onChange={(e) => setText(e.target.value)} sx={{ flex: 1 }} />
          <Button
            size="small"
            disabled={!text.trim() || reply.isPending}
            onClick={() => reply.mutate({ id: q.id, text: text.trim() }, { onSuccess: () => setText('') })}
          >
            Send
          </Button>
          {ctx.checking && (
            <Button
              size="small"
              color="success"
              disabled={close.isPending}
              onClick={() => close.mutate({ id: q.id, note: text.trim() || undefined }, { onSuccess: () => setText('') })}
            >
              Close the query
            </Button>
          )}
        </Stack>
      )}
      {(reply.isError || close.isError) && (
        <Alert severity="error" sx={{ mt: 0.5 }}>
          {(reply.error ?? close.error)?.message}
        </Alert>
      )}
    </Box>
  );
}

export function CellReview({ cell, queries, ctx }: { cell: CellDto; queries: QueryDto[]; ctx: ReviewContext }) {
  const raise = useRaiseQuery(ctx.sheetId);
  const agreement = useAgreement(ctx.sheetId);
  const [raising, setRaising] = useState(false);
  const [text, setText] = useState('');
  const [line, setLine] = useState('');
  if (!queries.length && !ctx.checking && !cell.agreedBy && !cell.changedAfterAgreement) return null;
  const lines = cell.kind === 'calc' ? String(cell.fields.source ?? '').split('\n').length : 0;
  return (
    <Box component="aside" aria-label="Review of this cell" sx={{ mt: 1.5, pt: 1, borderTop: `1px dashed ${palette.rule}` }}>
      <Stack direction="row" spacing={1} sx={{ alignItems: 'center', mb: queries.length ? 1 : 0, flexWrap: 'wrap' }}>
        {cell.agreedBy && <Chip size="small" color="success" variant="outlined" label={`Agreed by ${cell.agreedBy}`} data-testid="agreed" />}
        {cell.changedAfterAgreement && <Chip size="small" color="warning" label="Changed since the checker agreed it" data-testid="changed-after-agreement" />}
        {ctx.checking && (
          <>
            <Button size="small" onClick={() => setRaising((r) => !r)}>
              Raise a query
            </Button>
            <Button size="small" color="success" onClick={() => agreement.mutate({ cellId: cell.id, agreed: !cell.agreedBy })}>
              {cell.agreedBy ? 'Withdraw agreement' : 'Agree this cell'}
            </Button>
          </>
        )}
      </Stack>
      {raising && (
        <Stack direction={{ xs: 'column', sm: 'row' }} spacing={1} sx={{ mb: 1 }}>
          <TextField size="small" label="Query" value={text} onChange={(e) => setText(e.target.value)} sx={{ flex: 1 }} autoFocus />
          {lines > 1 && (
            <TextField
              size="small"
              label="Line (optional)"
              value={line}
              onChange={(e) => setLine(e.target.value.replace(/\D/g, ''))}
              sx={{ width: 130 }}
              helperText={`1 to ${lines}`}
            />
          )}
          <Button
            variant="contained"
            size="small"
            disabled={!text.trim() || raise.isPending}
            onClick={() =>
              raise.mutate(
                { cellId: cell.id, text: text.trim(), ...(line ? { line: Number(line) } : {}) },
                { onSuccess: () => (setText(''), setLine(''), setRaising(false)) },
              )
            }
          >
            Raise
          </Button>
        </Stack>
      )}
      {raise.isError && (
        <Alert severity="error" sx={{ mb: 1 }}>
          {raise.error.message}
        </Alert>
      )}
      {agreement.isError && (
        <Alert severity="error" sx={{ mb: 1 }}>
          {agreement.error.message}
        </Alert>
      )}
      <Stack spacing={1}>
        {queries.map((q) => (
          <Thread key={q.id} q={q} ctx={ctx} />
        ))}
      </Stack>
    </Box>
  );
}
