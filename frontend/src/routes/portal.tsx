import { Paper, Typography } from '@mui/material';
import { PageHeading } from '../components/layout/page-heading';

export function PortalPage() {
  return (
    <>
      <PageHeading overline="For clients">Client portal</PageHeading>
      <Paper sx={{ p: 3 }}>
        <Typography color="text.secondary">Issued calculation packages of your projects will be listed here.</Typography>
      </Paper>
    </>
  );
}
