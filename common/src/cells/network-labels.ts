/**
 * The network cell's words that the screen and the package share without the engine: what each kind's
 * values are, and the conventions every network cell states.
 */
import type { NetworkElementRow } from '../sheet/sheet-format';

/** What each kind's values are, in order: the headings of the element table and the words of its messages. */
export const ELEMENT_VALUES: Record<NetworkElementRow['kind'], string[]> = {
  resistor: ['R'],
  inductor: ['L'],
  capacitor: ['C'],
  source: ['E (rms, at an angle)', 'Z inside (optional)'],
  supply: ['U (line to line)', 'S_sc', 'X/R'],
  transformer: ['S', 'z', 'X/R', 'U referred to'],
  injection: ['orders h', 'currents I_h (rms)', 'angles (optional)'],
  switch: ['closes at'],
};

export const NETWORK_CONVENTIONS =
  'Per phase, positive sequence, single-phase equivalent: rms phasors; each element’s current flows from its first node to its second, ' +
  'and S = V·I* is what it absorbs, per phase (three times it for the three phases; a source delivering power shows a negative S). A supply is U/√3 behind Z = U²/S_sc, a transformer ' +
  'Z = z·U²/S, both split by X/R at the fundamental and referred to the voltage given; resistances do not change with frequency. ' +
  'Switches are closed in the steady state, scans and harmonic flows; a transient starts from the steady state with them open.';
