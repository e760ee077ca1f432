import { Paper, Typography } from '@mui/material';
import { PageHeading } from '../components/layout/page-heading';

export function SignInPage() {
  return (
    <>
      <PageHeading overline="Account">Sign in</PageHeading>
      <Paper sx={{ p: 3, maxWidth: 480 }}>
        <Typography color="text.secondary">Accounts are not available yet in this build.</Typography>
      </Paper>
    </>
  );
}
