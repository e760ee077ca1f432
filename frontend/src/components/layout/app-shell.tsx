import { AppBar, Box, Button, Chip, Container, Stack, Toolbar, Tooltip, Typography } from '@mui/material';
import { NavLink, Outlet } from 'react-router-dom';
import { useHealth } from '../../features/health/api/get-health';
import { palette } from '../../app/theme';

const NAV = [
  { to: '/projects', label: 'Projects' },
  { to: '/portal', label: 'Client portal' },
  { to: '/verify', label: 'Verify a package' },
];

function ServiceStatus() {
  const { data, isError } = useHealth();
  const state = isError ? 'unreachable' : data?.status;
  const label = state === 'ok' ? 'Server ready' : state === 'degraded' ? 'Server degraded' : state === 'down' ? 'Database down' : state === 'unreachable' ? 'Server unreachable' : 'Connecting';
  const colour = state === 'ok' ? palette.pass : state ? palette.fail : palette.inkLight;
  const detail = data ? `database ${data.checks.database}, mail ${data.checks.mail}, files ${data.checks.objectStore}; app ${data.version}, engine ${data.engineVersion}` : '';
  return (
    <Tooltip title={detail}>
      <Chip size="small" label={label} data-testid="service-status" sx={{ bgcolor: 'transparent', color: '#fff', border: `1px solid ${colour}`, '& .MuiChip-label': { px: 1 } }} />
    </Tooltip>
  );
}

export function AppShell() {
  return (
    <Box sx={{ minHeight: '100vh', display: 'flex', flexDirection: 'column' }}>
      <AppBar position="static">
        <Toolbar variant="dense" sx={{ gap: 3 }}>
          <Typography component={NavLink} to="/" variant="h4" sx={{ color: '#fff', textDecoration: 'none', letterSpacing: '0.02em' }}>
            Amp<Box component="span" sx={{ color: palette.copperLight }}>wright</Box>
          </Typography>
          <Stack direction="row" component="nav" aria-label="Main" spacing={0.5} sx={{ flexGrow: 1 }}>
            {NAV.map((item) => (
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
          <Button component={NavLink} to="/sign-in" variant="outlined" color="inherit" size="small">
            Sign in
          </Button>
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
