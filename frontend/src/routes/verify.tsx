import { Paper, Typography } from '@mui/material';
import { PageHeading } from '../components/layout/page-heading';

export function VerifyPage() {
  return (
    <>
      <PageHeading overline="Anyone">Verify a package</PageHeading>
      <Paper sx={{ p: 3 }}>
        <Typography color="text.secondary">Upload a PDF to learn whether it is an unaltered package issued through Ampwright.</Typography>
      </Paper>
    </>
  );
}
