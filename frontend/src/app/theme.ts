import { createTheme } from '@mui/material/styles';
import { PALETTE } from '@ampwright/common/plot/palette';

/**
 * Ampwright's look: ink-blue structure on a warm drafting-paper ground, with copper for actions and
 * emphasis. Corners are nearly square (drawings, not bubbles); type is IBM Plex Sans, and expressions
 * are set in IBM Plex Mono.
 */
export const palette = PALETTE;

export const monoFont = '"IBM Plex Mono", ui-monospace, monospace';

export const theme = createTheme({
  palette: {
    mode: 'light',
    primary: { main: palette.ink, light: palette.inkLight, contrastText: '#ffffff' },
    secondary: { main: palette.copper, light: palette.copperLight, contrastText: '#ffffff' },
    success: { main: palette.pass },
    error: { main: palette.fail },
    warning: { main: palette.caution },
    background: { default: palette.paper, paper: palette.sheet },
    divider: palette.rule,
    text: { primary: '#1c2328', secondary: '#4f5a62' },
  },
  shape: { borderRadius: 2 },
  typography: {
    fontFamily: '"IBM Plex Sans", system-ui, sans-serif',
    fontSize: 14,
    h1: { fontSize: '1.9rem', fontWeight: 600, letterSpacing: '-0.01em' },
    h2: { fontSize: '1.5rem', fontWeight: 600 },
    h3: { fontSize: '1.25rem', fontWeight: 600 },
    h4: { fontSize: '1.1rem', fontWeight: 600 },
    overline: { fontWeight: 600, letterSpacing: '0.12em' },
    button: { textTransform: 'none', fontWeight: 600 },
  },
  components: {
    MuiAppBar: { defaultProps: { elevation: 0, color: 'primary' } },
    MuiPaper: { defaultProps: { elevation: 0 }, styleOverrides: { root: { border: `1px solid ${palette.rule}` } } },
    MuiButton: { defaultProps: { disableElevation: true } },
    MuiLink: { defaultProps: { underline: 'hover' } },
  },
});
