import { Button, Paper, Stack, Typography } from '@mui/material';
import { Link } from 'react-router-dom';
import { PageHeading } from '../components/layout/page-heading';
import { CautionNotice } from '../components/layout/caution-notice';

export function HomePage() {
  return (
    <Stack spacing={3}>
      <PageHeading overline="Calculation notebook">Engineering calculations, checked and signed</PageHeading>
      <Paper sx={{ p: 3 }}>
        <Typography sx={{ maxWidth: 720 }}>
          Write each calculation as ordered cells with units and phasors, have a second engineer check it cell by cell, and issue it as a signed PDF package
          that your client can verify.
        </Typography>
        <Stack direction="row" spacing={1} sx={{ mt: 2 }}>
          <Button variant="contained" color="secondary" component={Link} to="/projects">
            Open projects
          </Button>
          <Button component={Link} to="/verify">
            Verify a package
          </Button>
        </Stack>
      </Paper>
      <CautionNotice />
    </Stack>
  );
}
