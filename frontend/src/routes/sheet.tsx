import { Paper, Typography } from '@mui/material';
import { useParams } from 'react-router-dom';
import { PageHeading } from '../components/layout/page-heading';
import { CautionNotice } from '../components/layout/caution-notice';

export function SheetPage() {
  const { projectId, sheetId } = useParams();
  return (
    <>
      <PageHeading overline={`Project ${projectId}`}>Sheet {sheetId}</PageHeading>
      <Paper sx={{ p: 3 }}>
        <Typography color="text.secondary">The sheet editor will open here.</Typography>
      </Paper>
      <CautionNotice />
    </>
  );
}
