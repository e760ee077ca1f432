/** A sheet's revisions (who prepared, checked and approved them, and when), a diff between any two, and its audit trail. */
import {
  Alert,
  Box,
  Chip,
  Link as MuiLink,
  MenuItem,
  Paper,
  Stack,
  Table,
  TableBody,
  TableCell,
  TableHead,
  TableRow,
  TextField,
  Typography,
} from '@mui/material';
import { useState } from 'react';
import { Link, useParams } from 'react-router-dom';
import { PageHeading } from '../components/layout/page-heading';
import { monoFont, palette } from '../app/theme';
import { useDiff, useHistory, useRevisions } from '../features/review';
import { useSheet } from '../features/sheets';
import { PackageLink } from '../features/packages';

const when = (iso: string | null) => (iso ? new Date(iso).toLocaleString() : '—');
const show = (v: unknown) => (v === undefined ? '—' : typeof v === 'string' ? v : JSON.stringify(v));

const EVENT_WORDS: Record<string, string> = {
  'check-requested': 'asked for a check',
  'sheet-returned': 'returned the sheet to the preparer',
  'check-passed': 'passed the check',
  'sheet-approved': 'approved the sheet',
  'revision-issued': 'issued a revision',
  'revision-started': 'started the next revision',
  'query-raised': 'raised a query',
  'query-replied': 'replied to a query',
  'query-closed': 'closed a query',
  'cell-agreed': 'agreed a cell',
  'agreement-withdrawn': 'withdrew an agreement',
  'co-preparers-named': 'named the co-preparers',
};

export function SheetHistoryPage() {
  const { projectId = '', sheetId = '' } = useParams();
  const sheet = useSheet(sheetId);
  const revisions = useRevisions(sheetId);
  const history = useHistory(sheetId);
  const list = revisions.data ?? [];
  const [from, setFrom] = useState('');
  const [to, setTo] = useState('draft');
  const fromId = from || list[list.length - 1]?.id || '';
  const diff = useDiff(sheetId, fromId, to);
  const options = [
    ...list.map((r) => ({ id: r.id, label: `Revision ${r.code}` })),
    { id: 'draft', label: sheet.data ? `Now (${sheet.data.state === 'issued' ? 'as issued' : `draft of ${sheet.data.revisionCode}`})` : 'Now' },
  ];
  return (
    <Stack spacing={2}>
      <PageHeading overline={sheet.data ? `Sheet ${sheet.data.number}` : 'Sheet'}>History and revisions</PageHeading>
      <MuiLink component={Link} to={`/projects/${projectId}/sheets/${sheetId}`}>
        Back to the sheet
      </MuiLink>
      <Paper sx={{ p: 2 }}>
        <Typography variant="h3" component="h2" gutterBottom sx={{ fontSize: '1.1rem' }}>
          Issued revisions
        </Typography>
        {revisions.isError && <Alert severity="error">{revisions.error.message}</Alert>}
        {list.length === 0 && revisions.isSuccess && <Typography color="text.secondary">Not issued yet.</Typography>}
        {list.length > 0 && (
          <Table size="small" aria-label="Revisions">
            <TableHead>
              <TableRow>
                <TableCell>Revision</TableCell>
                <TableCell>Prepared by</TableCell>
                <TableCell>Checked by</TableCell>
                <TableCell>Approved by</TableCell>
                <TableCell>Issued</TableCell>
                <TableCell>Snapshot SHA-256</TableCell>
                <TableCell>Package</TableCell>
              </TableRow>
            </TableHead>
            <TableBody>
              {list.map((r) => (
                <TableRow key={r.id}>
                  <TableCell>
                    <strong>{r.code}</strong>
                  </TableCell>
                  <TableCell>
                    {r.preparedBy}
                    <br />
                    <Typography variant="caption">asked for check {when(r.checkRequestedAt)}</Typography>
                  </TableCell>
                  <TableCell>
                    {r.checkedBy}
                    <br />
                    <Typography variant="caption">{when(r.checkedAt)}</Typography>
                  </TableCell>
                  <TableCell>
                    {r.approvedBy}
                    <br />
                    <Typography variant="caption">{when(r.approvedAt)}</Typography>
                  </TableCell>
                  <TableCell>{when(r.issuedAt)}</TableCell>
                  <TableCell sx={{ fontFamily: monoFont, fontSize: 11 }} title={r.snapshotSha256}>
                    {r.snapshotSha256.slice(0, 20)}…
                  </TableCell>
                  <TableCell>
                    <PackageLink revisionId={r.id} canRetry />
                  </TableCell>
                </TableRow>
              ))}
            </TableBody>
          </Table>
        )}
      </Paper>

      {list.length > 0 && (
        <Paper component="section" aria-label="Differences" sx={{ p: 2 }}>
          <Typography variant="h3" component="h2" gutterBottom sx={{ fontSize: '1.1rem' }}>
            Differences, cell by cell
          </Typography>
          <Stack direction="row" spacing={2} sx={{ mb: 2 }}>
            <TextField select size="small" label="From" value={fromId} onChange={(e) => setFrom(e.target.value)} sx={{ minWidth: 200 }}>
              {options.map((o) => (
                <MenuItem key={o.id} value={o.id}>
                  {o.label}
                </MenuItem>
              ))}
            </TextField>
            <TextField select size="small" label="To" value={to} onChange={(e) => setTo(e.target.value)} sx={{ minWidth: 200 }}>
              {options.map((o) => (
                <MenuItem key={o.id} value={o.id}>
                  {o.label}
                </MenuItem>
              ))}
            </TextField>
          </Stack>
          {diff.isError && <Alert severity="error">{diff.error.message}</Alert>}
          {diff.data && diff.data.cells.every((c) => c.status === 'same') && (
            <Typography>
              No differences between {diff.data.from} and {diff.data.to}.
            </Typography>
          )}
          <Stack spacing={1.5}>
            {diff.data?.cells
              .filter((c) => c.status !== 'same')
              .map((c) => (
                <Box
                  key={c.id}
                  data-testid="diff-cell"
                  sx={{ borderLeft: `3px solid ${c.status === 'added' ? palette.pass : c.status === 'removed' ? palette.fail : palette.copper}`, pl: 1.5 }}
                >
                  <Typography variant="overline">
                    Cell {c.position + 1} · {c.kind} · <Chip size="small" label={c.status} />
                  </Typography>
                  {c.inputs.map((f) => (
                    <Box
                      key={f.field}
                      sx={{ display: 'grid', gridTemplateColumns: '120px 1fr 1fr', gap: 1, fontFamily: monoFont, fontSize: 12 }}
                      data-testid="diff-input"
                    >
                      <span>{f.field}</span>
                      <Box component="pre" sx={{ m: 0, bgcolor: '#fbeaea', whiteSpace: 'pre-wrap' }}>
                        {show(f.before)}
                      </Box>
                      <Box component="pre" sx={{ m: 0, bgcolor: '#eaf5ec', whiteSpace: 'pre-wrap' }}>
                        {show(f.after)}
                      </Box>
                    </Box>
                  ))}
                  {c.results.length > 0 && (
                    <Table size="small" aria-label={`Changed results of cell ${c.position + 1}`} sx={{ width: 'auto', mt: 0.5 }}>
                      <TableBody>
                        {c.results.map((r) => (
                          <TableRow key={r.name} data-testid={`diff-result-${r.name}`}>
                            <TableCell>{r.name}</TableCell>
                            <TableCell>{r.before ?? '—'}</TableCell>
                            <TableCell>→</TableCell>
                            <TableCell>
                              <strong>{r.after ?? '—'}</strong>
                            </TableCell>
                          </TableRow>
                        ))}
                      </TableBody>
                    </Table>
                  )}
                </Box>
              ))}
          </Stack>
        </Paper>
      )}

      <Paper component="section" aria-label="Audit trail" sx={{ p: 2 }}>
        <Typography variant="h3" component="h2" gutterBottom sx={{ fontSize: '1.1rem' }}>
          Audit trail
        </Typography>
        {history.isError && <Alert severity="error">{history.error.message}</Alert>}
        <Table size="small">
          <TableBody>
            {history.data?.map((e) => (
              <TableRow key={e.id}>
                <TableCell sx={{ whiteSpace: 'nowrap' }}>{when(e.createdAt)}</TableCell>
                <TableCell>
                  {e.who ?? '—'} {EVENT_WORDS[e.type] ?? e.type}
                  {e.detail?.revision ? ` ${String(e.detail.revision)}` : ''}
                  {e.detail?.note ? `: ${String(e.detail.note)}` : ''}
                </TableCell>
              </TableRow>
            ))}
          </TableBody>
        </Table>
      </Paper>
    </Stack>
  );
}
