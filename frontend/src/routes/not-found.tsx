import { Button, Stack, Typography } from '@mui/material';
import { Link, useLocation } from 'react-router-dom';

export function NotFoundPage() {
  const { pathname } = useLocation();
  return (
    <Stack spacing={2}>
      <Typography variant="overline" color="secondary">
        404
      </Typography>
      <Typography variant="h1">No page at this address</Typography>
      <Typography color="text.secondary">
        There is nothing at <code>{pathname}</code>. The link may be mistyped, or the item may have moved.
      </Typography>
      <Button component={Link} to="/" variant="contained" sx={{ alignSelf: 'flex-start' }}>
        Go to the start page
      </Button>
    </Stack>
  );
}
