import { Alert, Button, Link as MuiLink, Paper, Stack, Table, TableBody, TableCell, TableRow, Typography } from '@mui/material';
import { Link } from 'react-router-dom';
import { PageHeading } from '../components/layout/page-heading';
import { useMarkAllRead, useNotifications } from '../features/review';

export function NotificationsPage() {
  const list = useNotifications(true);
  const readAll = useMarkAllRead();
  return (
    <Stack spacing={2}>
      <PageHeading overline="For you">Notifications</PageHeading>
      {list.isError && <Alert severity="error">{list.error.message}</Alert>}
      <Button sx={{ alignSelf: 'flex-start' }} onClick={() => readAll.mutate()} disabled={!list.data?.some((n) => !n.readAt)}>
        Mark all as read
      </Button>
      <Paper sx={{ overflowX: 'auto' }}>
        <Table size="small" aria-label="Notifications">
          <TableBody>
            {list.data?.map((n) => (
              <TableRow key={n.id} sx={{ fontWeight: n.readAt ? 400 : 600 }}>
                <TableCell sx={{ whiteSpace: 'nowrap' }}>{new Date(n.createdAt).toLocaleString()}</TableCell>
                <TableCell>
                  <MuiLink component={Link} to={n.link} sx={{ fontWeight: n.readAt ? 400 : 600 }}>
                    {n.text}
                  </MuiLink>
                </TableCell>
              </TableRow>
            ))}
            {list.data?.length === 0 && (
              <TableRow>
                <TableCell>
                  <Typography color="text.secondary">Nothing yet.</Typography>
                </TableCell>
              </TableRow>
            )}
          </TableBody>
        </Table>
      </Paper>
    </Stack>
  );
}
