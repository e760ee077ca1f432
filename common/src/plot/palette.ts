/**
 * Ampwright's colours, one list for the screen (frontend theme), the charts (common/plot) and the signed
 * package: ink-blue structure on a warm drafting-paper ground, copper for actions and emphasis.
 */
export const PALETTE = {
  ink: '#16324a',
  inkLight: '#3c5b74',
  copper: '#a34b17',
  copperLight: '#e08a3c',
  paper: '#f4efe6',
  sheet: '#fffdf8',
  rule: '#d9d1c3',
  text: '#1c2328',
  muted: '#4f5a62',
  grey: '#8c857a',
  pass: '#2e6b3a',
  fail: '#a3261b',
  caution: '#8a5a00',
} as const;
