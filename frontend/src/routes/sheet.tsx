import { Alert, Chip, CircularProgress, Stack, Typography } from '@mui/material';
import { useParams } from 'react-router-dom';
import { CautionNotice } from '../components/layout/caution-notice';
import { PageHeading } from '../components/layout/page-heading';
import { STATE_LABELS, useSheet } from '../features/sheets/api/sheets';
import { CellView } from '../features/sheets/components/cell-view';

/** A sheet with every cell and the results the server stored (the editor builds on this view). */
export function SheetPage() {
  const { sheetId = '' } = useParams();
  const sheet = useSheet(sheetId);
  if (sheet.isPending) return <CircularProgress aria-label="Loading" />;
  if (sheet.isError) return <Alert severity="error">{sheet.error.message}</Alert>;
  const s = sheet.data;
  return (
    <Stack spacing={2}>
      <PageHeading overline={`Sheet ${s.number}`}>{s.title}</PageHeading>
      <Stack direction="row" spacing={1} sx={{ alignItems: 'center' }}>
        <Chip size="small" label={STATE_LABELS[s.state]} />
        <Typography variant="body2" color="text.secondary">Prepared by {s.preparer.name} · version {s.version}{s.engineVersion ? ` · engine ${s.engineVersion}` : ''}</Typography>
      </Stack>
      <CautionNotice />
      {s.cells.map((cell, i) => <CellView key={cell.id} cell={cell} index={i} />)}
      {s.cells.length === 0 && <Typography color="text.secondary">This sheet has no cells yet.</Typography>}
    </Stack>
  );
}
