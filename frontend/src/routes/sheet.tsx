import { Alert, Button, Chip, CircularProgress, Stack, Typography } from '@mui/material';
import { useParams } from 'react-router-dom';
import { CautionNotice } from '../components/layout/caution-notice';
import { PageHeading } from '../components/layout/page-heading';
import { useMe } from '../features/auth/api/get-me';
import { STATE_LABELS, useSheet } from '../features/sheets/api/sheets';
import { SheetEditor } from '../features/sheets/editor/sheet-editor';
import { AttachmentsPanel } from '../features/sheets/components/attachments-panel';

const EDITABLE_STATES = ['being-prepared', 'with-checker'];

/** A sheet: its cells, edited and evaluated in place by those who may, read-only for everyone else. */
export function SheetPage() {
  const { sheetId = '' } = useParams();
  const { data: me } = useMe();
  const sheet = useSheet(sheetId);
  if (sheet.isPending) return <CircularProgress aria-label="Loading" />;
  if (sheet.isError) return <Alert severity="error">{sheet.error.message}</Alert>;
  const s = sheet.data;
  const mayEdit = !!me?.roles.some((r) => r === 'owner' || r === 'engineer');
  const editable = mayEdit && EDITABLE_STATES.includes(s.state);
  return (
    <Stack spacing={2}>
      <PageHeading overline={`Sheet ${s.number}`}>{s.title}</PageHeading>
      <Stack direction="row" spacing={1} sx={{ alignItems: 'center', flexWrap: 'wrap' }}>
        <Chip size="small" label={STATE_LABELS[s.state]} />
        <Typography variant="body2" color="text.secondary">Prepared by {s.preparer.name} · version {s.version}{s.engineVersion ? ` · engine ${s.engineVersion}` : ''}</Typography>
        <Button size="small" href={`/api/sheets/${s.id}/export`} download={`${s.number}.json`}>Export as a sheet file</Button>
      </Stack>
      {mayEdit && !editable && <Alert severity="info">This sheet is {STATE_LABELS[s.state].toLowerCase()} and can no longer be edited.</Alert>}
      {editable && <Typography variant="caption" color="text.secondary">Changes are saved and evaluated as you type. Keys: Ctrl+Enter evaluates now, Alt+Enter adds a cell below, Alt+↑ and Alt+↓ move between cells.</Typography>}
      <CautionNotice />
      <SheetEditor sheet={s} editable={editable} />
      <AttachmentsPanel sheetId={s.id} editable={editable} />
    </Stack>
  );
}
