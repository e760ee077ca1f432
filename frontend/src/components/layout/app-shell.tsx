import { AppBar, Box, Button, Chip, Container, Stack, Toolbar, Tooltip, Typography } from '@mui/material';
import { NavLink, Outlet, useNavigate } from 'react-router-dom';
import { isMember, useMe, useSignOut } from '../../features/auth';
import { ROLE_LABELS } from '../../features/members';
import { useHealth } from '../../features/health';
import { useNotifications } from '../../features/review';
import { palette } from '../../app/theme';

const NAV = [
  { to: '/projects', label: 'Projects', members: true },
  { to: '/members', label: 'Members', members: true },
  { to: '/portal', label: 'Client portal', members: false },
  { to: '/verify', label: 'Verify a package', members: false },
];

/** Who is signed in, in which firm, with which roles; or the way to sign in. */
function Account() {
  const { data: me } = useMe();
  const signOut = useSignOut();
  const navigate = useNavigate();
  if (!me) {
    return (
      <Button component={NavLink} to="/sign-in" variant="outlined" color="inherit" size="small">
        Sign in
      </Button>
    );
  }
  return (
    <Stack direction="row" spacing={1} sx={{ alignItems: 'center' }} data-testid="account">
      <Unread />
      <Box sx={{ textAlign: 'right', lineHeight: 1.1 }}>
        <Typography component={NavLink} to="/profile" variant="body2" sx={{ color: '#fff', textDecoration: 'none', fontWeight: 600, display: 'block' }}>
          {me.user.name}
        </Typography>
        <Typography variant="caption" sx={{ color: 'rgba(255,255,255,0.75)' }} data-testid="firm-and-roles">
          {me.firm.name} · {me.roles.map((r) => ROLE_LABELS[r]).join(', ')}
        </Typography>
      </Box>
      <Button size="small" color="inherit" variant="outlined" onClick={() => signOut.mutate(undefined, { onSettled: () => navigate('/sign-in') })}>
        Sign out
      </Button>
    </Stack>
  );
}

/** The count of unread notifications, linking to them. */
function Unread() {
  const { data } = useNotifications(true);
  const unread = data?.filter((n) => !n.readAt).length ?? 0;
  return (
    <Button component={NavLink} to="/notifications" size="small" color="inherit" aria-label={`Notifications: ${unread} unread`} sx={{ color: '#fff' }}>
      Notices{unread ? <Chip size="small" label={unread} sx={{ ml: 0.75, height: 18, bgcolor: palette.copper, color: '#fff' }} /> : null}
    </Button>
  );
}

function ServiceStatus() {
  const { data, isError } = useHealth();
  const state = isError ? 'unreachable' : data?.status;
  const label =
    state === 'ok'
      ? 'Server ready'
      : state === 'degraded'
        ? 'Server degraded'
        : state === 'down'
          ? 'Database down'
          : state === 'unreachable'
            ? 'Server unreachable'
            : 'Connecting';
  const colour = state === 'ok' ? palette.pass : state ? palette.fail : palette.inkLight;
  const detail = data
    ? `database ${data.checks.database}, mail ${data.checks.mail}, files ${data.checks.objectStore}; app ${data.version}, engine ${data.engineVersion}`
    : '';
  return (
    <Tooltip title={detail}>
      <Chip
        size="small"
        label={label}
        data-testid="service-status"
        sx={{ bgcolor: 'transparent', color: '#fff', border: `1px solid ${colour}`, '& .MuiChip-label': { px: 1 } }}
      />
    </Tooltip>
  );
}

export function AppShell() {
  const { data: me } = useMe();
  const nav = NAV.filter((item) => !item.members || !me || isMember(me));
  return (
    <Box sx={{ minHeight: '100vh', display: 'flex', flexDirection: 'column' }}>
      <AppBar position="static">
        <Toolbar variant="dense" sx={{ gap: 3 }}>
          <Typography component={NavLink} to="/" variant="h4" sx={{ color: '#fff', textDecoration: 'none', letterSpacing: '0.02em' }}>
            Amp
            <Box component="span" sx={{ color: palette.copperLight }}>
              wright
            </Box>
          </Typography>
          <Stack direction="row" component="nav" aria-label="Main" spacing={0.5} sx={{ flexGrow: 1 }}>
            {nav.map((item) => (
              <Button
                key={item.to}
                component={NavLink}
                to={item.to}
                sx={{ color: 'rgba(255,255,255,0.82)', '&.active': { color: '#fff', boxShadow: `inset 0 -2px 0 ${palette.copperLight}` } }}
              >
                {item.label}
              </Button>
            ))}
          </Stack>
          <ServiceStatus />
          <Account />
        </Toolbar>
      </AppBar>
      <Container component="main" maxWidth="lg" sx={{ py: 4, flexGrow: 1 }}>
        <Outlet />
      </Container>
      <Box component="footer" sx={{ py: 2, textAlign: 'center', color: 'text.secondary', fontSize: 12, borderTop: 1, borderColor: 'divider' }}>
        Ampwright — calculation packages you can check, sign and verify
      </Box>
    </Box>
  );
}
