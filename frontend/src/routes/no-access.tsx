import { PageHeading } from '../components/layout/page-heading';
import { Alert, Button, Stack } from '@mui/material';
import { Link } from 'react-router-dom';

export function NoAccessPage() {
  return (
    <Stack spacing={2} sx={{ maxWidth: 560 }}>
      <PageHeading>No access to that page</PageHeading>
      <Alert severity="warning">Your roles in this firm do not give access to that page. The firm's owner can change your roles.</Alert>
      <Button component={Link} to="/" sx={{ alignSelf: 'flex-start' }}>
        Go to the start page
      </Button>
    </Stack>
  );
}
