import { Alert, Button, Stack, Typography } from '@mui/material';
import { isRouteErrorResponse, Link, useRouteError } from 'react-router-dom';

/** The error boundary of the route tree: a page that failed says so and offers a way on. */
export function RouteError() {
  const error = useRouteError();
  const message = isRouteErrorResponse(error) ? `${error.status} ${error.statusText}` : error instanceof Error ? error.message : 'Unknown error';
  return (
    <Stack spacing={2} sx={{ p: 4, maxWidth: 640 }} role="alert">
      <Typography variant="h2">This page failed to load</Typography>
      <Alert severity="error">{message}</Alert>
      <Typography color="text.secondary">Nothing you saved is affected. Reload the page, or go back to your projects.</Typography>
      <Stack direction="row" spacing={1}>
        <Button variant="contained" onClick={() => window.location.reload()}>
          Reload
        </Button>
        <Button component={Link} to="/projects">
          Projects
        </Button>
      </Stack>
    </Stack>
  );
}
