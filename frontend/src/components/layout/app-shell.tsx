import { AppBar, Box, Button, Chip, Container, Divider, Drawer, Stack, Toolbar, Tooltip, Typography, useMediaQuery, useTheme } from '@mui/material';
import { useState } from 'react';
import { NavLink, Outlet, useNavigate } from 'react-router-dom';
import { isMember, useMe, useSignOut } from '../../features/auth';
import { ROLE_LABELS } from '../../features/members';
import { useHealth } from '../../features/health';
import { useNotifications } from '../../features/review';
import { palette } from '../../app/theme';

const VISUALLY_HIDDEN = { position: 'absolute', width: 1, height: 1, overflow: 'hidden', clip: 'rect(0 0 0 0)', whiteSpace: 'nowrap' } as const;

const NAV = [
  { to: '/projects', label: 'Projects', members: true },
  { to: '/members', label: 'Members', members: true },
  { to: '/portal', label: 'Client portal', members: false },
  { to: '/verify', label: 'Verify a package', members: false },
];

/** Who is signed in, in which firm, with which roles; or the way to sign in. */
function Account({ compact = false }: { compact?: boolean }) {
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
    <Stack direction={compact ? 'column' : 'row'} spacing={1} sx={{ alignItems: compact ? 'flex-start' : 'center' }} data-testid="account">
      <Unread />
      <Box sx={{ textAlign: compact ? 'left' : 'right', lineHeight: 1.1 }}>
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
    <Button component={NavLink} to="/notifications" size="small" color="inherit" sx={{ color: '#fff' }}>
      Notices{unread ? <Chip size="small" label={unread} sx={{ ml: 0.75, height: 18, bgcolor: palette.copper, color: '#fff' }} /> : null}
      {/* Read out as "Notices 2 unread": the name is the visible text and a word for screen readers only. */}
      <Box component="span" sx={VISUALLY_HIDDEN}>
        {unread ? ' unread' : ', none unread'}
      </Box>
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

/** The pages one may go to, as links: in the bar, or in the menu on a narrow screen. */
function MainNav({ column = false, onGo }: { column?: boolean; onGo?: () => void }) {
  const { data: me } = useMe();
  const nav = NAV.filter((item) => !item.members || !me || isMember(me));
  return (
    <Stack
      direction={column ? 'column' : 'row'}
      component="nav"
      aria-label="Main"
      spacing={0.5}
      sx={{ flexGrow: 1, alignItems: column ? 'flex-start' : 'center' }}
    >
      {nav.map((item) => (
        <Button
          key={item.to}
          component={NavLink}
          to={item.to}
          onClick={onGo}
          sx={{ color: 'rgba(255,255,255,0.82)', '&.active': { color: '#fff', boxShadow: `inset 0 -2px 0 ${palette.copperLight}` } }}
        >
          {item.label}
        </Button>
      ))}
    </Stack>
  );
}

export function AppShell() {
  // On a phone-sized screen the bar keeps the name and a Menu button; the pages, the server's state and
  // the account open in a panel, so nothing runs off the side.
  const narrow = useMediaQuery(useTheme().breakpoints.down('md'));
  const [menu, setMenu] = useState(false);
  const close = () => setMenu(false);
  return (
    <Box sx={{ minHeight: '100vh', display: 'flex', flexDirection: 'column' }}>
      <AppBar position="static">
        <Toolbar variant="dense" sx={{ gap: narrow ? 1 : 3 }}>
          <Typography component={NavLink} to="/" variant="h4" sx={{ color: '#fff', textDecoration: 'none', letterSpacing: '0.02em', flexGrow: narrow ? 1 : 0 }}>
            Amp
            <Box component="span" sx={{ color: palette.copperLight }}>
              wright
            </Box>
          </Typography>
          {narrow ? (
            <Button color="inherit" variant="outlined" size="small" onClick={() => setMenu(true)} aria-haspopup="dialog" aria-expanded={menu}>
              Menu
            </Button>
          ) : (
            <>
              <MainNav />
              <ServiceStatus />
              <Account />
            </>
          )}
        </Toolbar>
      </AppBar>
      {narrow && (
        <Drawer anchor="right" open={menu} onClose={close} slotProps={{ paper: { sx: { bgcolor: palette.ink, color: '#fff', p: 2, width: 280 } } }}>
          <Stack spacing={2} role="dialog" aria-label="Menu">
            <MainNav column onGo={close} />
            <Divider sx={{ borderColor: 'rgba(255,255,255,0.3)' }} />
            <ServiceStatus />
            <Account compact />
            <Button color="inherit" onClick={close}>
              Close the menu
            </Button>
          </Stack>
        </Drawer>
      )}
      <Container component="main" maxWidth="lg" sx={{ py: { xs: 2, md: 4 }, px: { xs: 1.5, sm: 3 }, flexGrow: 1 }}>
        <Outlet />
      </Container>
      <Box component="footer" sx={{ py: 2, px: 1, textAlign: 'center', color: 'text.secondary', fontSize: 12, borderTop: 1, borderColor: 'divider' }}>
        Ampwright — calculation packages you can check, sign and verify
      </Box>
    </Box>
  );
}
